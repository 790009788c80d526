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
