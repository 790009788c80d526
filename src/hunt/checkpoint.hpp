#pragma once
// Checkpoints of long hunts: the pairwise results already computed, so that
// --resume continues without redoing them. Written atomically (core/io.hpp):
// an interrupted write never leaves a broken file. The same bytes carry a
// rank's results to rank 0 in a hunt run as MPI ranks (src/hunt/mpi).
//
// Format 2 (docs/sweep.md): a text header
//   overshoot hunt checkpoint 2
//   fingerprint <16 hex digits>
//   lengths <count>
//   records <count>
// then, per record, little-endian binary: variant, a, b, first, count (uint32
// each) and <count> pairs of IEEE doubles (margin of a over b, bound on the
// margin) for the swept lengths first .. first+count-1 (indices into the
// hunt's grid). Format 1 (no first and count: every record holds every
// length) is still read.
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace overshoot {

struct CheckpointRecord {
    std::uint32_t variant = 0, a = 0, b = 0;
    std::uint32_t first = 0;            // index of the first swept length held
    std::vector<double> margin, bound;  // one per swept length held
};

struct Checkpoint {
    std::uint64_t fingerprint = 0;
    std::uint32_t lengths = 0;
    std::vector<CheckpointRecord> records;
};

std::string encode_checkpoint(const Checkpoint& c);
// Throws InputError naming `where` when the bytes are foreign or damaged.
Checkpoint decode_checkpoint(std::string_view data, const std::string& where);

void save_checkpoint(const std::string& path, const Checkpoint& c);
// Throws InputError naming the file when it is missing, foreign or damaged.
Checkpoint load_checkpoint(const std::string& path);

}  // namespace overshoot
