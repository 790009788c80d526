#include "lengths/diagonal.hpp"

#include <algorithm>
#include <cstdint>

#include "core/limits.hpp"
#include "lengths/closure.hpp"
#include "lengths/method.hpp"
#include "lengths/rows.hpp"
#include "lengths/tallies.hpp"

namespace overshoot::lengths_engine {

namespace {

// The pair programme in distance coordinates for one ordered race, keeping
// max-move + 1 rows (rows.cpp); returns (win, loss) of every diagonal start (d, d).
void diagonal_programme(const DistanceModel& A, const DistanceModel& B, bool a_first, int L, std::vector<double>& dw,
                        std::vector<double>& dl, std::vector<double>& bound, std::atomic<bool>* cancel,
                        DiagonalKind kind, int threads) {
    dw.assign(L + 1, 0);
    dl.assign(L + 1, 0);
    bound.assign(L + 1, 0);
    std::vector<double> depth(L + 1, 0.0), cut(L + 1, 0.0);
    if (kind == DiagonalKind::closure)
        closure_rows(A, B, a_first, L, dw.data(), dl.data(), depth, cut, cancel, threads);
    else
        diagonal_rows(A, B, a_first, L, dw.data(), dl.data(), kind == DiagonalKind::rows, cancel);
    // Depth of the programme (hops that change a or b) times one hop's rounding;
    // the closure adds its own roundings on every path and the mass it trimmed.
    const int m = std::max(A.row_terms, B.row_terms) + 10;
    for (int a = 1; a <= L; ++a)
        bound[a] = gamma_d(static_cast<double>(2 * a + 2) * m + depth[a]) + cut[a] + A.ever_never_error +
                   B.ever_never_error;
}

}  // namespace

std::vector<LengthOutcome> diagonal_duels(const DistanceModel& A, const DistanceModel& B, Order order, int L,
                                       std::atomic<bool>* cancel, DiagonalKind kind, int threads) {
    if (kind == DiagonalKind::closure && !closure_applies(A, B)) kind = DiagonalKind::rows;
    Tallies sim, af, bf;
    std::vector<double> bound(L + 1, 0), b1, b2;
    std::vector<double> neither(L + 1, 0);
    for (int d = 1; d <= L; ++d) neither[d] = A.p_never[d] * B.p_never[d];
    OrderedRaces r = needed_races(order);
    if (r.simultaneous) {
        sim.init(L);
        diagonal_programme(A, B, false, L, sim.win, sim.loss, bound, cancel, kind, threads);
        for (int d = 1; d <= L; ++d) sim.tie[d] = std::max(0.0, 1.0 - sim.win[d] - sim.loss[d] - neither[d]);
        for (int d = 1; d <= L; ++d) bound[d] += 4 * unit_d;
    }
    if (r.a_first) {
        af.init(L);
        diagonal_programme(A, B, true, L, af.win, af.loss, b1, cancel, kind, threads);
        for (int d = 1; d <= L; ++d) bound[d] = std::max(bound[d], b1[d]);
    }
    if (r.b_first) {
        bf.init(L);
        diagonal_programme(B, A, true, L, bf.loss, bf.win, b2, cancel, kind, threads);
        for (int d = 1; d <= L; ++d) bound[d] = std::max(bound[d], b2[d]);
    }
    // The tie of a simultaneous race is what is left: its bound is the sum of the others'.
    if (r.simultaneous)
        for (int d = 1; d <= L; ++d) bound[d] *= 3;
    return combine(order, L, sim, af, bf, neither, bound);
}

}  // namespace overshoot::lengths_engine
