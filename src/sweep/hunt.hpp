#pragma once
// A hunt: over a family of options, a range of lengths and rule variants, the
// intransitive sets of a wanted size (cycles of the dominance digraph), each
// listed once (in the rotation that starts from its first option in the input),
// ranked by strength, with the lengths where it holds.
#include <atomic>
#include <cstddef>
#include <functional>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "core/option.hpp"
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
    std::function<void(std::size_t done, std::size_t total)> progress;  // pairs; may be empty
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

HuntResult run_hunt(const HuntSpec& spec);

}  // namespace overshoot
