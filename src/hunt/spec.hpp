#pragma once
// What a hunt is asked: a family of options, a grid of lengths, rule
// variants, the wanted cycle size and strength; and the fingerprint of what
// its pairwise data depends on (checkpoints carry it).
#include <atomic>
#include <cstddef>
#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "core/option.hpp"
#include "lengths/lengths.hpp"
#include "sweep/sweep.hpp"

namespace overshoot {

struct HuntSpec {
    std::vector<Option> options;
    LengthGrid grid;
    std::vector<Variant> variants{Variant{}};  // simultaneous or coin only
    std::vector<Jump> jumps;                    // on the longest board of the grid; none: the all-lengths engine
    JumpAnchor anchor = JumpAnchor::start;      // where the jumps stay on shorter boards
    std::size_t merged_options = 0;             // family members dropped as equal to earlier ones (reported)
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

// Throws InputError when the spec cannot be hunted.
void validate_hunt(const HuntSpec& spec);
// What the pairwise data depends on: options, lengths, rules, jumps and the method.
std::uint64_t hunt_fingerprint(const HuntSpec& spec);

}  // namespace overshoot
