#include "lengths/distance.hpp"

#include <algorithm>
#include <cmath>

#include "chain/chain.hpp"
#include "chain/series.hpp"

namespace overshoot::lengths_engine {

DistanceModel build_distance_model(const Option& o, Overshoot rule, int L) {
    DistanceModel d;
    d.max_length = L;
    d.max_move = o.max_move();
    const int Lz = std::min(L, d.max_move + 1);
    d.zone = std::min(L, d.max_move);
    const long double den = static_cast<long double>(o.denominator);
    for (int m = 1; m <= d.max_move; ++m)
        if (o.weight[m] != 0) {
            d.moves.push_back(m);
            d.move_p.push_back(static_cast<double>(static_cast<long double>(o.weight[m]) / den));
        }
    d.p_zero = static_cast<double>(static_cast<long double>(o.weight[0]) / den);
    d.mean = o.mean();
    {
        long double s = 0;
        for (int m = 0; m <= d.max_move; ++m) s += static_cast<long double>(o.weight[m]) * (m - d.mean) * (m - d.mean);
        d.variance = static_cast<double>(s / den);
    }
    Chain c = build_chain(make_board(Lz, rule, {}), o);
    d.stay.assign(L + 1, d.p_zero);
    d.leave.assign(L + 1, static_cast<double>(static_cast<long double>(o.denominator - o.weight[0]) / den));
    d.no_finish.assign(L + 1, 1.0);
    d.zone_row.assign(d.zone + 2, 0);
    std::vector<long double> zpl;
    for (int dist = 1; dist <= d.zone; ++dist) {
        const int s = Lz - dist;
        d.zone_row[dist] = static_cast<int>(d.zone_to.size());
        for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k) {
            const int dest = c.dest[k];
            if (dest == s) continue;
            d.zone_to.push_back(dest == Lz ? 0 : Lz - dest);
            d.zone_p.push_back(static_cast<double>(c.prob[k]));
            zpl.push_back(c.prob[k]);
        }
        d.stay[dist] = static_cast<double>(c.stay[s]);
        d.leave[dist] = static_cast<double>(c.leave[s]);
        d.no_finish[dist] = static_cast<double>(static_cast<long double>(o.denominator - c.finish_weight[s]) / den);
        d.row_terms = std::max(d.row_terms, static_cast<int>(c.row_start[s + 1] - c.row_start[s]) + 1);
    }
    d.zone_row[d.zone + 1] = static_cast<int>(d.zone_to.size());
    d.row_terms = std::max(d.row_terms, static_cast<int>(d.moves.size()) + 1);
    // R and K by the time-free programme in long double, subtraction-free.
    std::vector<long double> R(L + 1, 0), K(L + 1, 0);
    R[0] = 1;
    std::vector<long double> mpl(d.moves.size());
    for (std::size_t i = 0; i < d.moves.size(); ++i) mpl[i] = static_cast<long double>(o.weight[d.moves[i]]) / den;
    const long double leave_free = static_cast<long double>(o.denominator - o.weight[0]) / den;
    for (int dist = 1; dist <= L; ++dist) {
        long double r = 0, k = 0, lv;
        if (dist <= d.zone) {
            for (int e = d.zone_row[dist]; e < d.zone_row[dist + 1]; ++e) {
                r += zpl[e] * R[d.zone_to[e]];
                k += zpl[e] * K[d.zone_to[e]];
            }
            lv = c.leave[Lz - dist];
        } else {
            for (std::size_t i = 0; i < d.moves.size(); ++i) {
                r += mpl[i] * R[dist - d.moves[i]];
                k += mpl[i] * K[dist - d.moves[i]];
            }
            lv = leave_free;
        }
        if (lv > 0) {
            R[dist] = r / lv;
            K[dist] = k / lv;
        } else {
            R[dist] = 0;
            K[dist] = 1;
        }
    }
    d.p_ever.resize(L + 1);
    d.p_never.resize(L + 1);
    for (int i = 0; i <= L; ++i) {
        d.p_ever[i] = static_cast<double>(R[i]);
        d.p_never[i] = static_cast<double>(K[i]);
    }
    // Each level of the programme: one sum of row_terms products and a division.
    d.ever_never_error = static_cast<double>(gamma_ld(static_cast<double>(d.row_terms + 4) * L)) + 2 * unit_d;
    double max_stay = d.p_zero;
    for (int dist = 1; dist <= d.zone; ++dist)
        if (d.p_ever[dist] > 0) max_stay = std::max(max_stay, d.stay[dist]);
    d.tail_rate = max_stay > 0 ? -std::log(max_stay) : 1e300;
    return d;
}

// The two-vector kernels of step_two; axpy itself is in core/kernels.
__attribute__((target_clones("avx2", "default"), optimize("O3", "tree-vectorize"))) void axpy2(
    double* __restrict d1, const double* __restrict s1, double* __restrict d2, const double* __restrict s2, double p,
    int n) {
    for (int i = 0; i < n; ++i) {
        d1[i] += p * s1[i];
        d2[i] += p * s2[i];
    }
}
__attribute__((target_clones("avx2", "default"), optimize("O3", "tree-vectorize"))) void scale2(
    double* __restrict d1, const double* __restrict s1, double* __restrict d2, const double* __restrict s2, double p,
    int n) {
    for (int i = 0; i < n; ++i) {
        d1[i] = p * s1[i];
        d2[i] = p * s2[i];
    }
}

// (df, dg) = P (sf, sg) on distances lo..top (P: one turn, finishing mass dropped).
void step_two(const DistanceModel& o, const double* sf, const double* sg, double* df, double* dg, int lo, int top) {
    const int zt = std::min(top, o.zone);
    for (int d = lo; d <= zt; ++d) {
        double a = o.stay[d] * sf[d], b = o.stay[d] * sg[d];
        for (int e = o.zone_row[d]; e < o.zone_row[d + 1]; ++e)
            if (o.zone_to[e] > 0) {
                a += o.zone_p[e] * sf[o.zone_to[e]];
                b += o.zone_p[e] * sg[o.zone_to[e]];
            }
        df[d] = a;
        dg[d] = b;
    }
    const int a = std::max(lo, o.zone + 1);
    if (a > top) return;
    const int n = top - a + 1;
    scale2(df + a, sf + a, dg + a, sg + a, o.p_zero, n);
    for (std::size_t i = 0; i < o.moves.size(); ++i)
        axpy2(df + a, sf + a - o.moves[i], dg + a, sg + a - o.moves[i], o.move_p[i], n);
}

}  // namespace overshoot::lengths_engine
