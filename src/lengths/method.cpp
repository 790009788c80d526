#include "lengths/method.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "core/error.hpp"
#include "lengths/closure.hpp"
#include "lengths/distance.hpp"

namespace overshoot {

std::string_view to_string(LengthMethod m) {
    switch (m) {
        case LengthMethod::automatic: return "auto";
        case LengthMethod::series: return "series";
        case LengthMethod::pairs: return "pairs";
        case LengthMethod::board: return "board";
        case LengthMethod::pairs_scalar: return "pairs-scalar";
        case LengthMethod::closure: return "closure";
        case LengthMethod::zone_tail: return "zone-tail";
    }
    return "?";
}

LengthMethod parse_length_method(std::string_view t) {
    for (auto m : {LengthMethod::automatic, LengthMethod::series, LengthMethod::pairs, LengthMethod::pairs_scalar,
                   LengthMethod::closure, LengthMethod::zone_tail})
        if (t == to_string(m)) return m;
    throw InputError(fmt::format("method '{}': expected auto, series, pairs, pairs-scalar, closure or zone-tail", t));
}

namespace lengths_engine {

namespace {

double bulk_turns(double mu, double var, int L) {
    mu = std::max(mu, 1e-9);
    return L / mu + 8 * std::sqrt(L * std::max(var, 1.0) / (mu * mu * mu)) + 8;
}

}  // namespace

double turns_estimate(const DistanceModel& a, const DistanceModel& b, double target) {
    const double bulk = std::max(bulk_turns(a.mean, a.variance, a.max_length), bulk_turns(b.mean, b.variance, b.max_length));
    const double rate = std::min(1e300, a.tail_rate + b.tail_rate);
    return bulk + std::log(2 / target) / rate;
}

bool series_chosen(LengthMethod method, double turns, int max_length) {
    switch (method) {
        case LengthMethod::series: return true;
        case LengthMethod::pairs:
        case LengthMethod::pairs_scalar:
        case LengthMethod::closure: return false;
        // Measured (docs/sweep.md): the series costs about 2 T (kA + kB) L
        // against 1.3 L^2 (kA + kB) for the programme.
        // zone_tail: auto's choice for pairs the zone tail cannot take (all_lengths).
        case LengthMethod::automatic:
        case LengthMethod::zone_tail: return turns <= 0.6 * max_length;
        case LengthMethod::board: break;  // not a method of the all-lengths engine
    }
    throw InternalError("series_chosen: board is not an all-lengths method");
}

bool closure_chosen(LengthMethod method, const DistanceModel& a, const DistanceModel& b, int max_length) {
    if (!closure_applies(a, b)) return false;
    if (method == LengthMethod::closure) return true;
    if (method != LengthMethod::automatic && method != LengthMethod::zone_tail) return false;
    // The whole programme does 2 L^2 (kA + kB) multiply-adds (both orders of a
    // coin race alike); the closure's are estimated the same way.
    const double L = max_length;
    const double whole = 2 * L * L * (static_cast<double>(a.moves.size() + b.moves.size()) + 2);
    return closure_work(a, b, max_length) < whole;
}

}  // namespace lengths_engine

double series_turns_estimate(const Option& a, const Option& b, Overshoot rule, int max_length) {
    lengths_engine::DistanceModel da = lengths_engine::build_distance_model(a, rule, std::min(max_length, a.max_move() + 1));
    lengths_engine::DistanceModel db = lengths_engine::build_distance_model(b, rule, std::min(max_length, b.max_move() + 1));
    da.max_length = db.max_length = max_length;
    return lengths_engine::turns_estimate(da, db, 1e-15);
}

PairCost estimate_pair_cost(const Option& a, const Option& b, Overshoot rule, Order order, int max_length,
                            const LengthSettings& s) {
    lengths_engine::DistanceModel da = lengths_engine::build_distance_model(a, rule, std::min(max_length, a.max_move() + 1));
    lengths_engine::DistanceModel db = lengths_engine::build_distance_model(b, rule, std::min(max_length, b.max_move() + 1));
    da.max_length = db.max_length = max_length;
    PairCost c;
    c.turns = lengths_engine::turns_estimate(da, db, s.close_target);
    c.series = lengths_engine::series_chosen(s.method, c.turns, max_length);
    const double races = needed_races(order).count();
    const double ka = static_cast<double>(da.moves.size()) + 1, kb = static_cast<double>(db.moves.size()) + 1;
    const double L = max_length;
    if (c.series) {
        // step_two steps two vectors per option; each race adds three terms per start.
        c.step_work = c.turns * L * 2 * (ka + kb);
        c.work = c.step_work + c.turns * L * 3 * races;
    } else if (lengths_engine::closure_chosen(s.method, da, db, max_length)) {
        c.closure = true;
        c.work = lengths_engine::closure_cost(da, db, max_length) * races;
    } else {
        c.work = 1.3 * L * L * (ka + kb) * races;
    }
    return c;
}

}  // namespace overshoot
