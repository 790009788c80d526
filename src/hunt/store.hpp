#pragma once
// The pairwise data of a hunt (margin and bound per variant, pair and swept
// length) and the checkpoint files it is saved in and loaded from.
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "hunt/checkpoint.hpp"
#include "hunt/spec.hpp"

namespace overshoot {

// The pairwise data of a hunt: margin and bound per (variant, pair, swept
// length), and which cells are known.
struct HuntStore {
    std::size_t option_count = 0, variant_count = 0, length_count = 0, pair_count = 0;
    std::vector<std::vector<double>> margin, bound;  // per slot; empty until a cell is known
    std::vector<std::vector<char>> have;             // per slot, per swept length
    std::vector<std::size_t> have_count;             // per slot

    HuntStore() = default;
    HuntStore(std::size_t options, std::size_t variants, std::size_t lengths);
    std::size_t slot(std::size_t v, std::size_t a, std::size_t b) const;  // a < b
    bool known(std::size_t v, std::size_t a, std::size_t b) const { return have_count[slot(v, a, b)] == length_count; }
    bool known(std::size_t v, std::size_t a, std::size_t b, std::size_t k) const;
    std::size_t pairs_known() const;
    // Cells first .. first+count-1 of one pair; throws InputError naming
    // `where` when the record does not fit this hunt.
    void put(const CheckpointRecord& r, const std::string& where);
    void merge(const Checkpoint& c, const std::string& where);
    // Every known cell, as records of consecutive lengths, in slot order.
    Checkpoint checkpoint(std::uint64_t fingerprint) const;
};

// Loads spec.checkpoint and every FILE.rank<r> beside it (resume), or an
// empty store. Throws InputError naming the file that does not fit.
HuntStore load_hunt_store(const HuntSpec& spec);
// The checkpoint file of one MPI rank: FILE.rank<r>, beside FILE.
std::string rank_checkpoint_file(const std::string& checkpoint, int rank);
// The rank files beside a checkpoint (FILE.rank0, FILE.rank1, ...), sorted.
std::vector<std::string> rank_checkpoint_files(const std::string& checkpoint);
// Removes them: stale ones before a fresh run, merged ones after a finished run.
void remove_rank_checkpoint_files(const std::string& checkpoint);

}  // namespace overshoot
