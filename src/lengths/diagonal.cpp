#include "lengths/diagonal.hpp"

#include <algorithm>
#include <cstdint>

#include "core/limits.hpp"
#include "lengths/method.hpp"
#include "lengths/tallies.hpp"

namespace overshoot::lengths_engine {

namespace {

// The pair programme in distance coordinates for one ordered race, keeping
// max-move + 1 rows; returns (win, loss) of every diagonal start (d, d).
void diagonal_programme(const DistanceModel& A, const DistanceModel& B, bool a_first, int L, std::vector<double>& dw,
                        std::vector<double>& dl, std::vector<double>& bound, std::atomic<bool>* cancel) {
    const int ring = A.max_move + 1;
    limits::check_memory(static_cast<std::uint64_t>(ring + 4) * (L + 1) * 2 * sizeof(double),
                         "the pair programme of this sweep");
    std::vector<double> gw(static_cast<std::size_t>(ring) * (L + 1), 0), gl(gw.size(), 0);
    std::vector<double> xw(L + 1), xl(L + 1), vw(L + 1, 0), vl(L + 1, 0), hw(L + 1);
    for (int b = 1; b <= L; ++b) hw[b] = a_first ? 1.0 : B.no_finish[b];
    dw.assign(L + 1, 0);
    dl.assign(L + 1, 0);
    bound.assign(L + 1, 0);
    for (int a = 1; a <= L; ++a) {
        if (cancel && (a & 15) == 0 && cancel->load(std::memory_order_relaxed)) throw Cancelled{};
        std::fill(xw.begin(), xw.end(), 0.0);
        std::fill(xl.begin(), xl.end(), 0.0);
        auto add_row = [&](int to, double p) {
            if (to == 0) {
                axpy(xw.data() + 1, hw.data() + 1, p, L);
            } else {
                const std::size_t off = static_cast<std::size_t>(to % ring) * (L + 1);
                axpy(xw.data() + 1, gw.data() + off + 1, p, L);
                axpy(xl.data() + 1, gl.data() + off + 1, p, L);
            }
        };
        if (a <= A.zone) {
            for (int e = A.zone_row[a]; e < A.zone_row[a + 1]; ++e) add_row(A.zone_to[e], A.zone_p[e]);
        } else {
            for (std::size_t i = 0; i < A.moves.size(); ++i) add_row(a - A.moves[i], A.move_p[i]);
        }
        const double sa = A.stay[a], la = A.leave[a];
        double* rw = gw.data() + static_cast<std::size_t>(a % ring) * (L + 1);
        double* rl = gl.data() + static_cast<std::size_t>(a % ring) * (L + 1);
        for (int b = 1; b <= L; ++b) {
            double yw = 0, yl = 0;
            if (b <= B.zone) {
                for (int e = B.zone_row[b]; e < B.zone_row[b + 1]; ++e) {
                    const int to = B.zone_to[e];
                    const double p = B.zone_p[e];
                    if (to == 0) {
                        yl += p;
                    } else {
                        yw += p * vw[to];
                        yl += p * vl[to];
                    }
                }
            } else {
                const int* mv = B.moves.data();
                const double* mp = B.move_p.data();
                const std::size_t nm = B.moves.size();
                // Four partial sums: the loop is bound by the latency of one
                // chain of additions otherwise (the bound does not depend on the order).
                double w0 = 0, w1 = 0, w2 = 0, w3 = 0, l0 = 0, l1 = 0, l2 = 0, l3 = 0;
                std::size_t i = 0;
                for (; i + 4 <= nm; i += 4) {
                    w0 += mp[i] * vw[b - mv[i]];
                    l0 += mp[i] * vl[b - mv[i]];
                    w1 += mp[i + 1] * vw[b - mv[i + 1]];
                    l1 += mp[i + 1] * vl[b - mv[i + 1]];
                    w2 += mp[i + 2] * vw[b - mv[i + 2]];
                    l2 += mp[i + 2] * vl[b - mv[i + 2]];
                    w3 += mp[i + 3] * vw[b - mv[i + 3]];
                    l3 += mp[i + 3] * vl[b - mv[i + 3]];
                }
                for (; i < nm; ++i) {
                    w0 += mp[i] * vw[b - mv[i]];
                    l0 += mp[i] * vl[b - mv[i]];
                }
                yw = (w0 + w1) + (w2 + w3);
                yl = (l0 + l1) + (l2 + l3);
            }
            // 1 - sa sb written as la + sa lb: no cancellation for heavy options.
            const double den = la + sa * B.leave[b];
            double w = 0, l = 0;
            if (den > 0) {
                w = (xw[b] + sa * yw) / den;
                l = (xl[b] + sa * yl) / den;
            }
            vw[b] = w;
            vl[b] = l;
            rw[b] = B.stay[b] * w + yw;
            rl[b] = B.stay[b] * l + yl;
        }
        dw[a] = vw[a];
        dl[a] = vl[a];
        // Depth of the programme (hops that change a or b) times one hop's rounding.
        const int m = std::max(A.row_terms, B.row_terms) + 10;
        bound[a] = gamma_d(static_cast<double>(2 * a + 2) * m) + A.ever_never_error + B.ever_never_error;
    }
}

}  // namespace

std::vector<LengthOutcome> diagonal_duels(const DistanceModel& A, const DistanceModel& B, Order order, int L,
                                       std::atomic<bool>* cancel) {
    Tallies sim, af, bf;
    std::vector<double> bound(L + 1, 0), b1, b2;
    std::vector<double> neither(L + 1, 0);
    for (int d = 1; d <= L; ++d) neither[d] = A.p_never[d] * B.p_never[d];
    OrderedRaces r = needed_races(order);
    if (r.simultaneous) {
        sim.init(L);
        diagonal_programme(A, B, false, L, sim.win, sim.loss, bound, cancel);
        for (int d = 1; d <= L; ++d) sim.tie[d] = std::max(0.0, 1.0 - sim.win[d] - sim.loss[d] - neither[d]);
        for (int d = 1; d <= L; ++d) bound[d] += 4 * unit_d;
    }
    if (r.a_first) {
        af.init(L);
        diagonal_programme(A, B, true, L, af.win, af.loss, b1, cancel);
        for (int d = 1; d <= L; ++d) bound[d] = std::max(bound[d], b1[d]);
    }
    if (r.b_first) {
        bf.init(L);
        diagonal_programme(B, A, true, L, bf.loss, bf.win, b2, cancel);
        for (int d = 1; d <= L; ++d) bound[d] = std::max(bound[d], b2[d]);
    }
    // The tie of a simultaneous race is what is left: its bound is the sum of the others'.
    if (r.simultaneous)
        for (int d = 1; d <= L; ++d) bound[d] *= 3;
    return combine(order, L, sim, af, bf, neither, bound);
}

}  // namespace overshoot::lengths_engine
