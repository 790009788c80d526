#pragma once
// The end-zone closure of the diagonal programme (docs/sweep.md, "End-zone
// closure"). Outside their end zones both pieces walk freely: no finishing,
// no stay, every move m goes from d to d - m. So the race from (d, d) is
// decided by where the pair first lands in R = {a <= za} u {b <= zb} (a piece
// in its zone), and
//
//   V(d, d) = sum over free cells (x, y) of K(d - x, d - y) phi(x, y),
//   K(u, v) = sum_s p_A^{*s}(u) p_B^{*s}(v)   (the free walk's visits),
//
// with phi the value of the round that lands in R (the strip, rows.cpp).
// The strip costs O((za + zb) L k), K is built from the convolution powers,
// and each start reads phi only near the zone it enters, over the spread of
// the other piece: O(z L sigma sqrt(L / mu)) instead of O(L^2 k).
// Internal to src/lengths/.
#include <atomic>
#include <cstdint>
#include <vector>

#include "lengths/distance.hpp"

namespace overshoot::lengths_engine {

// True when the closure applies: both pieces move at least 1 square every turn.
bool closure_applies(const DistanceModel& A, const DistanceModel& B);

// Its multiply-adds, estimated, for choosing it (method.cpp).
double closure_work(const DistanceModel& A, const DistanceModel& B, int L);

// Its cost for planning a hunt, per ordered race, in the unit of the plan's
// other estimates (the series' multiply-adds): each part of closure_work
// weighted by the time it was measured to take (closure.cpp).
double closure_cost(const DistanceModel& A, const DistanceModel& B, int L);

struct ClosureCounts {
    std::uint64_t multiply_adds = 0;
    int rounds = 0;  // convolution powers used
};

// Win and loss of every diagonal start of the ordered race (A first when
// a_first), as diagonal_rows, and per start what the bound adds to the
// programme's: `depth` extra roundings on every path, `cut` the mass left out
// by trimming the convolution powers (both per start d, L + 1 entries).
// `threads` share the building of K and the band sums (the same bits for any number).
ClosureCounts closure_rows(const DistanceModel& A, const DistanceModel& B, bool a_first, int L, double* dw, double* dl,
                           std::vector<double>& depth, std::vector<double>& cut, std::atomic<bool>* cancel,
                           int threads = 1);

}  // namespace overshoot::lengths_engine
