#pragma once
// A hunt: over a family of options, a range of lengths and rule variants, the
// intransitive sets of a wanted size (cycles of the dominance digraph), each
// listed once (in the rotation that starts from its first option in the input),
// ranked by strength, with the lengths where it holds.
#include <atomic>
#include <cstddef>
#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "core/option.hpp"
#include "sweep/checkpoint.hpp"
#include "sweep/lengths.hpp"
#include "sweep/sweep.hpp"

namespace overshoot {

struct HuntSpec {
    std::vector<Option> options;
    LengthGrid grid;
    std::vector<Variant> variants{Variant{}};  // simultaneous or coin only
    int cycle_length = 3;                       // 3 or more
    double min_strength = 0;                    // keep cycles whose strength is at least this
    std::optional<std::size_t> required;        // an option every cycle must contain
    std::size_t max_listed = 100;               // most sets listed (totals count them all)
    LengthSettings engine;
    std::string checkpoint;                     // file, or empty for none
    bool resume = false;                        // continue from `checkpoint`
    std::atomic<bool>* cancel = nullptr;
    long long stop_after_pairs = -1;            // stop (as if interrupted) after this many new pairs
    std::function<void(std::size_t done, std::size_t total)> progress;  // cells (pair x length) of this process; may be empty
    std::function<void(const struct HuntPlan&)> on_plan;                 // called before any work; may be empty
};

struct HuntCycle {
    std::size_t variant = 0;
    std::vector<std::size_t> options;  // each beats the next, the last beats the first
    std::vector<std::pair<int, int>> intervals;
    double strongest = 0;   // its best strength over the lengths
    int strongest_length = 0;
    double weakest = 0;
    std::size_t count = 0;  // lengths where it holds
};

struct HuntResult {
    bool complete = true;          // false when interrupted: only cycles whose pairs are all known
    std::size_t pairs_total = 0, pairs_known = 0;  // per variant times variants
    std::size_t lengths_examined = 0;              // swept lengths times variants (complete runs)
    unsigned long long sets_examined = 0;          // option sets of the wanted size, per length and variant
    unsigned long long cycles_found = 0;           // (cycle, length) instances meeting the wishes
    std::size_t distinct = 0;                      // distinct (variant, cycle)
    std::vector<HuntCycle> cycles;                 // ranked, at most max_listed
};

// One process: loads the checkpoint when resuming, computes every unknown
// pair (threads from spec.engine), saves the checkpoint, searches the cycles.
HuntResult run_hunt(const HuntSpec& spec);

// The pieces run_hunt is made of; a hunt run as MPI ranks (src/cluster) calls
// them in its own order. Every piece gives the same bytes whoever runs it.

// Throws InputError when the spec cannot be hunted.
void validate_hunt(const HuntSpec& spec);
// What the pairwise data depends on: options, lengths, rules and the method.
std::uint64_t hunt_fingerprint(const HuntSpec& spec);

// The pairwise data of a hunt: margin and bound per (variant, pair, swept
// length), and which cells are known.
struct HuntStore {
    std::size_t n = 0, nv = 0, nl = 0, np = 0;
    std::vector<std::vector<double>> margin, bound;  // per slot; empty until a cell is known
    std::vector<std::vector<char>> have;             // per slot, per swept length
    std::vector<std::size_t> have_count;             // per slot

    HuntStore() = default;
    HuntStore(std::size_t options, std::size_t variants, std::size_t lengths);
    std::size_t slot(std::size_t v, std::size_t a, std::size_t b) const;  // a < b
    bool known(std::size_t v, std::size_t a, std::size_t b) const { return have_count[slot(v, a, b)] == nl; }
    bool known(std::size_t v, std::size_t a, std::size_t b, std::size_t k) const;
    std::size_t pairs_known() const;
    // Cells first .. first+count-1 of one pair; throws InputError naming
    // `where` when the record does not fit this hunt.
    void put(const CheckpointRecord& r, const std::string& where);
    void merge(const Checkpoint& c, const std::string& where);
    // Every known cell, as records of consecutive lengths, in slot order.
    Checkpoint checkpoint(std::uint64_t fingerprint) const;
};

// A unit of work for the plan: some pairs of one variant, on some swept
// lengths (indices into the grid). Variants that the all-lengths engine
// handles get every length in one go, so their shards split pairs only;
// board-by-board variants (bounce) split lengths into blocks.
struct HuntShard {
    std::size_t id = 0;
    std::size_t variant = 0;
    std::string method;                // "series", "pairs" or "board"
    std::vector<PairRequest> pairs;
    std::size_t first = 0, count = 0;  // swept lengths first .. first+count-1
    double cost = 0;                   // estimated multiply-adds
    int rank = 0;                      // who computes it
};

struct HuntPlan {
    int ranks = 1;
    std::vector<HuntShard> shards;     // unfinished work only
    std::vector<double> rank_cost;     // estimated multiply-adds per rank
    std::size_t pairs_total = 0, pairs_known = 0;
};

// Splits the unknown cells of `store` into shards sized for balance over
// `ranks` ranks with `threads` threads each, and gives each shard a rank by
// longest-first greedy assignment. Deterministic.
HuntPlan plan_hunt(const HuntSpec& spec, const HuntStore& store, int ranks, int threads);

// Loads spec.checkpoint and every FILE.rank<r> beside it (resume), or an
// empty store. Throws InputError naming the file that does not fit.
HuntStore load_hunt_store(const HuntSpec& spec);
// The checkpoint file of one MPI rank: FILE.rank<r>, beside FILE.
std::string rank_checkpoint_file(const std::string& checkpoint, int rank);
// The rank files beside a checkpoint (FILE.rank0, FILE.rank1, ...), sorted.
std::vector<std::string> rank_checkpoint_files(const std::string& checkpoint);
// Removes them: stale ones before a fresh run, merged ones after a finished run.
void remove_rank_checkpoint_files(const std::string& checkpoint);

// Computes the shards of `plan` that belong to `rank` into `out` (cells that
// `out` already knows are not redone). `save` (may be empty) is called with
// the store lock held at most every few seconds, after each finished shard
// and at the end. Returns false when stopped (spec.cancel or stop_after_pairs).
bool compute_shards(const HuntSpec& spec, const HuntPlan& plan, int rank, HuntStore& out,
                    const std::function<void(const HuntStore&)>& save);

// The cycle search over the known pairs, length by length, in grid order.
HuntResult search_cycles(const HuntSpec& spec, const HuntStore& store);

}  // namespace overshoot
