#pragma once
// How the all-lengths engine solves a pair, and what it would cost: the
// method (per-turn series or diagonal pair programme), the ordered races a
// turn order needs, and the work estimates that choose between the methods
// and plan hunts (docs/sweep.md gives the measured costs).
#include <atomic>
#include <string_view>

#include "core/board.hpp"
#include "core/option.hpp"
#include "race/outcome.hpp"

namespace overshoot {

// How the duels of a pair over lengths are computed. `board` (one length at a
// time through duel(), for jumps and the rule bounce) is what a result says,
// never a setting: parse_length_method accepts auto, series, pairs and
// pairs-scalar, closure, zone-tail. pairs: the diagonal programme in row form (vectorised);
// pairs_scalar: the same programme cell by cell, the same bits, kept to be
// timed side by side (its results say pairs).
// closure: the programme on the end zones only, closed by the free walk
// (docs/sweep.md, "End-zone closure"); auto takes it where it is estimated
// cheaper than the whole programme.
// zone_tail: the series on the short lengths and, from the length where its
// proven bound meets the target, the zone-tail sums (zone_tail.hpp); auto
// takes it for every series pair where it covers some length, `series`
// keeps the series alone; zone_tail forces it on every pair it applies to
// (auto's choice for the others).
enum class LengthMethod { automatic, series, pairs, pairs_scalar, board, closure, zone_tail };

std::string_view to_string(LengthMethod m);
LengthMethod parse_length_method(std::string_view text);

struct LengthSettings {
    LengthMethod method = LengthMethod::automatic;
    double close_target = 1e-15;  // a series start closes when G^A G^B is below this
    int threads = 0;              // 0: every core
    std::atomic<bool>* cancel = nullptr;  // set to stop early (results marked not done)
};

// Estimated turns the series needs for a pair on lengths up to max_length
// (bulk of the slower option plus the product tail), for choosing the method.
double series_turns_estimate(const Option& a, const Option& b, Overshoot rule, int max_length);

// A planning estimate for one pair on lengths up to max_length: the method the
// settings pick (the automatic choice of all_lengths) and its work in
// multiply-adds, with the series' option stepping counted for this pair alone.
struct PairCost {
    bool series = false;
    bool closure = false;    // a programme pair done by the end-zone closure
    double turns = 0;        // estimated turns of the series
    double work = 0;         // whole pair
    double step_work = 0;    // of that, stepping the two options (shared between pairs of a group)
};
PairCost estimate_pair_cost(const Option& a, const Option& b, Overshoot rule, Order order, int max_length,
                            const LengthSettings& settings = {});

namespace lengths_engine {

struct DistanceModel;

// Estimated turns of the series for two distance models (their max_length).
double turns_estimate(const DistanceModel& a, const DistanceModel& b, double target);

// The method's choice for a pair whose series would take `turns` turns.
bool series_chosen(LengthMethod method, double turns, int max_length);

// For a pair that takes the programme: whether the end-zone closure does it.
bool closure_chosen(LengthMethod method, const DistanceModel& a, const DistanceModel& b, int max_length);

}  // namespace lengths_engine

}  // namespace overshoot
