#pragma once
// The time-free pair programme: the value of the race from every pair of
// squares (a, b) in a rectangle [za, N) x [zb, N), for boards where pieces never
// move backward. Each cell's self-loop is solved in closed form and the
// programme is subtraction-free, so heavy tails cost nothing extra.
#include <vector>

#include "chain/chain.hpp"

namespace overshoot {

struct PairValue {
    long double win = 0;   // A finishes first alone
    long double loss = 0;  // B finishes first alone
    long double tie = 0;   // both finish in the same round (simultaneous only)
    long double rounds = 0;  // E[R 1{someone finishes}], R = rounds to the first finish
};

struct PairTable {
    int za = 0, zb = 0, n = 0;
    std::vector<PairValue> cell;  // (a - za) * (n - zb) + (b - zb)
    const PairValue& at(int a, int b) const { return cell[static_cast<std::size_t>(a - za) * (n - zb) + (b - zb)]; }
    // Bound on the relative rounding error of every cell (docs/method.md).
    long double relative_rounding = 0;
};

// a_first: A moves first in each round and wins as soon as it lands;
// otherwise the round is simultaneous. The rectangle must be closed under
// moves (true for any za, zb on a forward-only board).
PairTable pair_programme(const Chain& a, const Chain& b, int za, int zb, bool a_first);

std::uint64_t pair_programme_memory(int n, int za, int zb);

}  // namespace overshoot

namespace overshoot {

// The same programme for the three outcome probabilities only, in double
// precision with one array per outcome (vectorises), for tournaments where a
// pair's zones are small enough that double's rounding bound stays tiny.
struct OutcomeTable {
    int za = 0, zb = 0, n = 0;
    std::vector<double> win, loss, tie;  // (a - za) * (n - zb) + (b - zb)
    long double relative_rounding = 0;
    std::size_t index(int a, int b) const { return static_cast<std::size_t>(a - za) * (n - zb) + (b - zb); }
};

OutcomeTable outcome_programme(const Chain& a, const Chain& b, int za, int zb, bool a_first);

// The rounding bound outcome_programme would prove for these zones.
long double outcome_programme_bound(const Chain& a, const Chain& b, int za, int zb);

}  // namespace overshoot
