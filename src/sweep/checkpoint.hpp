#pragma once
// Checkpoints of long hunts: the pairwise results already computed, so that
// --resume continues without redoing them. Written atomically (core/io.hpp):
// an interrupted write never leaves a broken file.
//
// Format (docs/sweep.md): a text header
//   overshoot hunt checkpoint 1
//   fingerprint <16 hex digits>
//   lengths <count>
//   records <count>
// then, per record, little-endian binary: variant, a, b (uint32 each) and
// <lengths> pairs of IEEE doubles (margin of a over b, bound on the margin).
#include <cstdint>
#include <string>
#include <vector>

namespace overshoot {

struct CheckpointRecord {
    std::uint32_t variant = 0, a = 0, b = 0;
    std::vector<double> margin, bound;  // one per swept length
};

struct Checkpoint {
    std::uint64_t fingerprint = 0;
    std::uint32_t lengths = 0;
    std::vector<CheckpointRecord> records;
};

void save_checkpoint(const std::string& path, const Checkpoint& c);
// Throws InputError naming the file when it is missing, foreign or damaged.
Checkpoint load_checkpoint(const std::string& path);

// FNV-1a over bytes, for fingerprints.
std::uint64_t fingerprint_bytes(std::uint64_t h, const void* data, std::size_t size);
std::uint64_t fingerprint_text(std::uint64_t h, const std::string& s);

}  // namespace overshoot
