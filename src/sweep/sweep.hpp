#pragma once
// A sweep: the same options raced over a range of lengths and rule variants.
// Per length: the arcs, Condorcet winner, top cycle and cycles (the tournament
// analysis). Across lengths: crossovers, the intervals where each cycle holds,
// and the lengths where no option dominates.
#include <cstddef>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "lengths/lengths.hpp"
#include "tournament/tournament.hpp"

namespace overshoot {

struct Variant {
    Overshoot rule = Overshoot::stay;
    Order order = Order::simultaneous;
};

struct LengthGrid {
    int lo = 1, hi = 1, step = 1;
    std::vector<int> lengths() const;
};

// "LO..HI" (or a single length); throws InputError naming the text.
LengthGrid parse_lengths(std::string_view text, int step);

struct SweepSpec {
    std::vector<Option> options;
    LengthGrid grid;
    std::vector<Variant> variants{Variant{}};
    std::vector<Jump> jumps;
    JumpAnchor anchor = JumpAnchor::start;
    LengthSettings engine;
    int max_cycle_length = 6;
};

struct LengthSummary {
    int length = 0;
    std::vector<Arc> arcs;
    std::vector<std::pair<std::size_t, std::size_t>> undecided;
    std::optional<std::size_t> condorcet_winner;
    std::vector<std::size_t> top_cycle;
    std::vector<Cycle> cycles;
    bool cap_hit = false;
};

struct PairSweep {
    std::size_t a = 0, b = 0;
    LengthMethod method = LengthMethod::series;
    int tail_from = 0;              // zone_tail: the first length it gives, the series below
    std::vector<LengthOutcome> at;  // one per swept length, in grid order
};

// Between two consecutive decided lengths the preference of a over b changes
// sign; `undecided` lists the swept lengths between them.
struct Crossover {
    std::size_t a = 0, b = 0;
    int before = 0, after = 0;  // last length with the old preference, first with the new
    std::vector<int> undecided;
    std::size_t preferred_before = 0, preferred_after = 0;
    double margin_before = 0, bound_before = 0, margin_after = 0, bound_after = 0;  // margin of a over b
    // The crossover length when it is pinned down (after == before + 1).
    std::optional<int> length() const {
        return after == before + 1 ? std::optional<int>(after) : std::nullopt;
    }
};

struct CycleSpan {
    std::vector<std::size_t> options;  // as in Cycle
    std::vector<std::pair<int, int>> intervals;  // runs of consecutive swept lengths
    double weakest = 0;                 // smallest strength over the lengths where it holds
    double strongest = 0;
    int strongest_length = 0;
    std::size_t count = 0;              // swept lengths where it holds
};

struct VariantSweep {
    Variant variant;
    std::vector<int> lengths;
    std::vector<PairSweep> pairs;  // i < j, row-major
    std::vector<LengthSummary> per_length;
    std::vector<Crossover> crossovers;
    std::vector<CycleSpan> cycles;  // strongest first
    std::vector<std::pair<int, int>> no_dominant;  // runs of lengths without a Condorcet winner
    bool cycles_cap_hit = false;
};

struct SweepResult {
    std::vector<Option> options;
    LengthGrid grid;
    std::vector<Jump> jumps;
    JumpAnchor anchor = JumpAnchor::start;
    std::vector<VariantSweep> variants;
};

// Refuses a-first and b-first for three or more options (the matrix would
// depend on the seat), duplicate option names, and an empty grid.
SweepResult run_sweep(const SweepSpec& spec);

// The analysis of one variant from its pairwise results (exposed for hunts and tests).
VariantSweep analyse_variant(const std::vector<Option>& options, const Variant& v, const std::vector<int>& lengths,
                             std::vector<PairSweep> pairs, int max_cycle_length);

// Runs of consecutive grid lengths, from a sorted list of lengths on the grid.
std::vector<std::pair<int, int>> runs_of(const std::vector<int>& lengths, int step);

}  // namespace overshoot
