#include "race/pairs.hpp"

#include <algorithm>

#include "chain/series.hpp"
#include "core/limits.hpp"

namespace overshoot {

std::uint64_t pair_programme_memory(int n, int za, int zb) {
    std::uint64_t cells = static_cast<std::uint64_t>(n - za) * static_cast<std::uint64_t>(n - zb);
    return cells * 2 * sizeof(PairValue) + static_cast<std::uint64_t>(n) * 64;
}

PairTable pair_programme(const Chain& A, const Chain& B, int za, int zb, bool a_first) {
    const int n = A.length;
    limits::check_memory(pair_programme_memory(n, za, zb), "the pair programme on this board");
    PairTable t;
    t.za = za;
    t.zb = zb;
    t.n = n;
    const int wb = n - zb;
    t.cell.assign(static_cast<std::size_t>(n - za) * wb, PairValue{});
    // G(a', b): value after A has moved to a' (not finished) and before B moves.
    std::vector<PairValue> g(static_cast<std::size_t>(n - za) * wb);
    std::vector<PairValue> x(wb);
    // H(b): value once A has just finished and B (maybe) still moves this round.
    std::vector<PairValue> h(wb);
    for (int b = zb; b < n; ++b) {
        PairValue& v = h[b - zb];
        if (a_first) {
            v.win = 1;
        } else {
            v.win = static_cast<long double>(B.denominator - B.finish_weight[b]) / B.denominator;
            v.tie = B.finish[b];
        }
    }
    for (int a = n - 1; a >= za; --a) {
        std::fill(x.begin(), x.end(), PairValue{});
        for (auto k = A.row_start[a]; k < A.row_start[a + 1]; ++k) {
            const int d = A.dest[k];
            if (d == a) continue;
            const long double p = A.prob[k];
            const PairValue* src = d == n ? h.data() : &g[static_cast<std::size_t>(d - za) * wb];
            for (int j = 0; j < wb; ++j) {
                x[j].win += p * src[j].win;
                x[j].loss += p * src[j].loss;
                x[j].tie += p * src[j].tie;
                x[j].rounds += p * src[j].rounds;
            }
        }
        PairValue* row = &t.cell[static_cast<std::size_t>(a - za) * wb];
        PairValue* grow = &g[static_cast<std::size_t>(a - za) * wb];
        const long double sa = A.stay[a], la = A.leave[a];
        for (int b = n - 1; b >= zb; --b) {
            PairValue y{};
            for (auto k = B.row_start[b]; k < B.row_start[b + 1]; ++k) {
                const int d = B.dest[k];
                if (d == b) continue;
                const long double p = B.prob[k];
                if (d == n) {
                    y.loss += p;
                } else {
                    const PairValue& f = row[d - zb];
                    y.win += p * f.win;
                    y.loss += p * f.loss;
                    y.tie += p * f.tie;
                    y.rounds += p * f.rounds;
                }
            }
            const long double sb = B.stay[b];
            // 1 - sa sb written as la + sa lb: no cancellation for heavy options.
            const long double den = la + sa * B.leave[b];
            PairValue f{};
            const PairValue& xv = x[b - zb];
            if (den > 0) {
                f.win = (xv.win + sa * y.win) / den;
                f.loss = (xv.loss + sa * y.loss) / den;
                f.tie = (xv.tie + sa * y.tie) / den;
                f.rounds = (f.win + f.loss + f.tie + xv.rounds + sa * y.rounds) / den;
            }
            row[b - zb] = f;
            PairValue& gv = grow[b - zb];
            gv.win = sb * f.win + y.win;
            gv.loss = sb * f.loss + y.loss;
            gv.tie = sb * f.tie + y.tie;
            gv.rounds = sb * f.rounds + y.rounds;
        }
    }
    // Depth of the programme (hops that change a or b) times the rounding of one hop.
    const int m = std::max(A.max_move, B.max_move) + 1;
    t.relative_rounding = static_cast<long double>((n - za) + (n - zb) + 2) * gamma_ld(m + 10);
    return t;
}

}  // namespace overshoot

namespace overshoot {

long double outcome_programme_bound(const Chain& A, const Chain& B, int za, int zb) {
    const int n = A.length;
    const int m = std::max(std::min(A.max_move, n - za), std::min(B.max_move, n - zb)) + 1;
    return static_cast<long double>((n - za) + (n - zb) + 2) * gamma_d(m + 10);
}

OutcomeTable outcome_programme(const Chain& A, const Chain& B, int za, int zb, bool a_first) {
    const int n = A.length;
    limits::check_memory(static_cast<std::uint64_t>(n - za) * static_cast<std::uint64_t>(n - zb) * 48,
                         "the pair programme on this board");
    OutcomeTable t;
    t.za = za;
    t.zb = zb;
    t.n = n;
    const int wb = n - zb;
    const std::size_t cells = static_cast<std::size_t>(n - za) * wb;
    t.win.assign(cells, 0.0);
    t.loss.assign(cells, 0.0);
    t.tie.assign(cells, 0.0);
    std::vector<double> gw(cells), gl(cells), gt(cells);
    std::vector<double> xw(wb), xl(wb), xt(wb), hw(wb), ht(wb, 0.0);
    for (int b = zb; b < n; ++b) {
        if (a_first) {
            hw[b - zb] = 1;
        } else {
            hw[b - zb] = static_cast<double>(static_cast<long double>(B.denominator - B.finish_weight[b]) / B.denominator);
            ht[b - zb] = static_cast<double>(B.finish[b]);
        }
    }
    std::vector<double> stay_b(wb), leave_b(wb);
    for (int b = zb; b < n; ++b) {
        stay_b[b - zb] = static_cast<double>(B.stay[b]);
        leave_b[b - zb] = static_cast<double>(B.leave[b]);
    }
    for (int a = n - 1; a >= za; --a) {
        std::fill(xw.begin(), xw.end(), 0.0);
        std::fill(xl.begin(), xl.end(), 0.0);
        std::fill(xt.begin(), xt.end(), 0.0);
        for (auto k = A.row_start[a]; k < A.row_start[a + 1]; ++k) {
            const int d = A.dest[k];
            if (d == a) continue;
            const double p = A.prob_d[k];
            if (d == n) {
                for (int j = 0; j < wb; ++j) {
                    xw[j] += p * hw[j];
                    xt[j] += p * ht[j];
                }
                continue;
            }
            const std::size_t base = static_cast<std::size_t>(d - za) * wb;
            const double* sw = &gw[base];
            const double* sl = &gl[base];
            const double* st = &gt[base];
            for (int j = 0; j < wb; ++j) {
                xw[j] += p * sw[j];
                xl[j] += p * sl[j];
                xt[j] += p * st[j];
            }
        }
        const std::size_t row = static_cast<std::size_t>(a - za) * wb;
        double* fw = &t.win[row];
        double* fl = &t.loss[row];
        double* ft = &t.tie[row];
        const double sa = static_cast<double>(A.stay[a]), la = static_cast<double>(A.leave[a]);
        for (int b = n - 1; b >= zb; --b) {
            double yw = 0, yl = 0, yt = 0;
            for (auto k = B.row_start[b]; k < B.row_start[b + 1]; ++k) {
                const int d = B.dest[k];
                if (d == b) continue;
                const double p = B.prob_d[k];
                if (d == n) {
                    yl += p;
                } else {
                    yw += p * fw[d - zb];
                    yl += p * fl[d - zb];
                    yt += p * ft[d - zb];
                }
            }
            const int j = b - zb;
            const double den = la + sa * leave_b[j];
            double w = 0, l = 0, ti = 0;
            if (den > 0) {
                w = (xw[j] + sa * yw) / den;
                l = (xl[j] + sa * yl) / den;
                ti = (xt[j] + sa * yt) / den;
            }
            fw[j] = w;
            fl[j] = l;
            ft[j] = ti;
            const double sb = stay_b[j];
            gw[row + j] = sb * w + yw;
            gl[row + j] = sb * l + yl;
            gt[row + j] = sb * ti + yt;
        }
    }
    t.relative_rounding = outcome_programme_bound(A, B, za, zb);
    return t;
}

}  // namespace overshoot
