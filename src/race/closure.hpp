#pragma once
// The end of a race closed on the end zones, shared by duel() (the zone
// method) and duel_matrix(): after t0 rounds of the per-turn series, the rest
// of the race is the pair programme's value weighted by where both pieces
// stand, plus the exact terms of a piece stuck for good (the other wins
// exactly when it finishes). docs/method.md gives the formulas and the bound.
#include <vector>

#include "chain/absorption.hpp"
#include "chain/series.hpp"
#include "race/pairs.hpp"

namespace overshoot {

struct ZoneSums {
    long double win = 0, loss = 0, tie = 0, rounds = 0;
};

// One piece after t0 rounds: its mass per square on lo..hi (the table covers
// them), the mass on squares that never finish, and its absorption.
template <class Real>
struct ZoneMass {
    const std::vector<Real>& v;
    int lo = 0, hi = -1;
    long double stuck = 0;
    const Absorption& absorption;
};

// Both pieces on their zones: sum of v_a(i) v_b(j) cell(i, j), with the rounds
// measured from the start (t0 + the table's rounds) when `rounds` is set.
// `cell(i, j)` returns the PairValue of the pair programme at (i, j).
template <class Real, class Cell>
ZoneSums weigh_zones(const ZoneMass<Real>& a, const ZoneMass<Real>& b, long double t0, bool rounds, Cell&& cell) {
    ZoneSums r;
    for (int i = a.lo; i <= a.hi; ++i) {
        if (a.v[i] == 0) continue;
        long double w = 0, l = 0, ti = 0, e = 0;
        for (int j = b.lo; j <= b.hi; ++j) {
            if (b.v[j] == 0) continue;
            const PairValue c = cell(i, j);
            w += b.v[j] * c.win;
            l += b.v[j] * c.loss;
            ti += b.v[j] * c.tie;
            if (rounds) e += b.v[j] * (c.rounds + t0 * (c.win + c.loss + c.tie));
        }
        r.win += a.v[i] * w;
        r.loss += a.v[i] * l;
        r.tie += a.v[i] * ti;
        r.rounds += a.v[i] * e;
    }
    return r;
}

// One piece stuck for good: the other wins exactly when it finishes. Adds
// those terms (and their rounds) to `r`.
template <class Real>
void add_stuck_terms(ZoneSums& r, const ZoneMass<Real>& a, const ZoneMass<Real>& b, long double t0) {
    auto lone = [&](const ZoneMass<Real>& x, long double& fin, long double& time) {
        for (int i = x.lo; i <= x.hi; ++i) {
            fin += x.v[i] * x.absorption.h[i];
            time += x.v[i] * (x.absorption.g[i] + t0 * x.absorption.h[i]);
        }
    };
    long double fa = 0, ta = 0, fb = 0, tb = 0;
    lone(a, fa, ta);
    lone(b, fb, tb);
    r.win += b.stuck * fa;
    r.loss += a.stuck * fb;
    r.rounds += b.stuck * ta + a.stuck * tb;
}

// Rounding of the closure beyond the table's own: the absorption pass has the
// depth of the pair programme, and the weighting sums `support` products over
// `turns` rounds.
inline long double closure_rounding(int length, int max_move, int support, int turns) {
    return static_cast<long double>(2 * length + 2) * gamma_ld(max_move + 4) + gamma_ld(support + 2 * turns + 8);
}

}  // namespace overshoot
