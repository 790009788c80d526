#pragma once
// What a duel's outcome means, in one place for every engine (duel(),
// duel_matrix(), exact duels, the all-lengths engine, the modular check):
// which ordered races a turn order needs and how they combine, the bound on a
// margin rounded to double, and the "decided" rule (DESIGN.md: A beats B when
// the margin exceeds its error bound; otherwise the pair is undecided).
#include <cmath>

#include "core/board.hpp"
#include "core/error.hpp"

namespace overshoot {

// The ordered races a pair needs for a turn order (coin needs both seats).
struct OrderedRaces {
    bool simultaneous = false, a_first = false, b_first = false;
    int count() const { return (simultaneous ? 1 : 0) + (a_first ? 1 : 0) + (b_first ? 1 : 0); }
};

inline OrderedRaces needed_races(Order order) {
    OrderedRaces r;
    switch (order) {
        case Order::simultaneous: r.simultaneous = true; break;
        case Order::a_first: r.a_first = true; break;
        case Order::b_first: r.b_first = true; break;
        case Order::coin: r.a_first = r.b_first = true; break;
    }
    return r;
}

// The outcome in the requested turn order from ordered races:
// solve(seats_swapped, alternating) is the race with B in seat A (and A in
// seat B) when seats_swapped, moving in turns (the first seat first) when
// alternating, else simultaneously; swap(x) exchanges the two seats' results;
// coin(x, y) is the mean of the a-first race x and the b-first race y.
template <class Solve, class Swap, class Coin>
auto by_turn_order(Order order, Solve&& solve, Swap&& swap, Coin&& coin) {
    switch (order) {
        case Order::simultaneous: return solve(false, false);
        case Order::a_first: return solve(false, true);
        case Order::b_first: return swap(solve(true, true));
        case Order::coin: return coin(solve(false, true), swap(solve(true, true)));
    }
    throw InternalError("by_turn_order: unknown turn order");
}

// +1 when A beats B, -1 when B beats A, 0 when the pair is undecided.
inline int decided(double margin, double error_bound) {
    return margin > error_bound ? 1 : (-margin > error_bound ? -1 : 0);
}

// The error bound of a margin taken in double from two probabilities: their
// bound `error_bound` plus the rounding of the subtraction itself (4 units of
// 2^-53, the rounding of two values below 1 and of their difference).
inline double rounded_margin_bound(double error_bound) { return error_bound + 4 * std::ldexp(1.0, -53); }

// A probability's bound after one more rounding to double (of the value or of
// a mean of two values below 1): 2 units of 2^-53.
inline double bound_after_rounding(double bound) { return bound + 2 * std::ldexp(1.0, -53); }

}  // namespace overshoot
