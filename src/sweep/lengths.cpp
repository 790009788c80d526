#include "sweep/lengths.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <mutex>
#include <thread>

#include "chain/chain.hpp"
#include "chain/series.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "race/duel.hpp"

namespace overshoot {

std::string_view to_string(LengthMethod m) {
    switch (m) {
        case LengthMethod::automatic: return "auto";
        case LengthMethod::series: return "series";
        case LengthMethod::pairs: return "pairs";
    }
    return "?";
}

LengthMethod parse_length_method(std::string_view t) {
    for (auto m : {LengthMethod::automatic, LengthMethod::series, LengthMethod::pairs})
        if (t == to_string(m)) return m;
    throw InputError(fmt::format("method '{}': expected auto, series or pairs", t));
}

JumpAnchor parse_anchor(std::string_view t) {
    if (t == "start") return JumpAnchor::start;
    if (t == "finish") return JumpAnchor::finish;
    throw InputError(fmt::format("--anchor '{}': expected start or finish", t));
}

bool all_lengths_applies(Overshoot rule, bool has_jumps) { return !has_jumps && rule != Overshoot::bounce; }

std::vector<Jump> anchored_jumps(const std::vector<Jump>& jumps, JumpAnchor anchor, int reference, int length) {
    std::vector<Jump> out;
    for (const Jump& j : jumps) {
        Jump k = j;
        if (anchor == JumpAnchor::finish) {
            k.from = length - (reference - j.from);
            k.to = length - (reference - j.to);
        }
        if (k.from >= 1 && k.from <= length - 1 && k.to >= 0 && k.to <= length && k.from != k.to) out.push_back(k);
    }
    return out;
}

namespace {

constexpr double unit_d = std::numeric_limits<double>::epsilon() / 2;
double gamma_d(double n) { return n * unit_d / (1 - n * unit_d); }

// Trimming threshold: masses below it are dropped, and the drop is bounded.
constexpr double trim_mass = 1e-30;

// One option in distance coordinates 1..L (0 = finished). Distances up to
// Z = min(L, max move) have explicit rows from the chain; beyond that every
// move m >= 1 lands on d - m and a move of 0 is a turn in place.
struct DistOption {
    int L = 0, M = 0, Z = 0;
    double p0 = 0;
    std::vector<int> mv;      // moves >= 1 with weight
    std::vector<double> mp;   // their probabilities
    std::vector<int> zrow;    // zone rows: entries zrow[d]..zrow[d+1]-1 for d in 1..Z
    std::vector<int> zto;     // destination distance (0 = finish), never d itself
    std::vector<double> zp;
    std::vector<double> stay, leave, nofinish;  // per distance 0..L
    std::vector<double> R, K;  // P(ever finish), P(never finish)
    double err_rk = 0;         // relative error of R and K
    int row_terms = 1;         // most terms in one row, self included
    double mu = 1, var = 0;
    double tail_rate = 1e300;  // -log of the largest stay on a square that can still finish
};

DistOption build_dist(const Option& o, Overshoot rule, int L) {
    DistOption d;
    d.L = L;
    d.M = o.max_move();
    const int Lz = std::min(L, d.M + 1);
    d.Z = std::min(L, d.M);
    const long double den = static_cast<long double>(o.denominator);
    for (int m = 1; m <= d.M; ++m)
        if (o.weight[m] != 0) {
            d.mv.push_back(m);
            d.mp.push_back(static_cast<double>(static_cast<long double>(o.weight[m]) / den));
        }
    d.p0 = static_cast<double>(static_cast<long double>(o.weight[0]) / den);
    d.mu = o.mean();
    {
        long double s = 0;
        for (int m = 0; m <= d.M; ++m) s += static_cast<long double>(o.weight[m]) * (m - d.mu) * (m - d.mu);
        d.var = static_cast<double>(s / den);
    }
    Chain c = build_chain(make_board(Lz, rule, {}), o);
    d.stay.assign(L + 1, d.p0);
    d.leave.assign(L + 1, static_cast<double>(static_cast<long double>(o.denominator - o.weight[0]) / den));
    d.nofinish.assign(L + 1, 1.0);
    d.zrow.assign(d.Z + 2, 0);
    std::vector<long double> zpl;
    for (int dist = 1; dist <= d.Z; ++dist) {
        const int s = Lz - dist;
        d.zrow[dist] = static_cast<int>(d.zto.size());
        for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k) {
            const int dest = c.dest[k];
            if (dest == s) continue;
            d.zto.push_back(dest == Lz ? 0 : Lz - dest);
            d.zp.push_back(static_cast<double>(c.prob[k]));
            zpl.push_back(c.prob[k]);
        }
        d.stay[dist] = static_cast<double>(c.stay[s]);
        d.leave[dist] = static_cast<double>(c.leave[s]);
        d.nofinish[dist] = static_cast<double>(static_cast<long double>(o.denominator - c.finish_weight[s]) / den);
        d.row_terms = std::max(d.row_terms, static_cast<int>(c.row_start[s + 1] - c.row_start[s]) + 1);
    }
    d.zrow[d.Z + 1] = static_cast<int>(d.zto.size());
    d.row_terms = std::max(d.row_terms, static_cast<int>(d.mv.size()) + 1);
    // R and K by the time-free programme in long double, subtraction-free.
    std::vector<long double> R(L + 1, 0), K(L + 1, 0);
    R[0] = 1;
    std::vector<long double> mpl(d.mv.size());
    for (std::size_t i = 0; i < d.mv.size(); ++i) mpl[i] = static_cast<long double>(o.weight[d.mv[i]]) / den;
    const long double leave_free = static_cast<long double>(o.denominator - o.weight[0]) / den;
    for (int dist = 1; dist <= L; ++dist) {
        long double r = 0, k = 0, lv;
        if (dist <= d.Z) {
            for (int e = d.zrow[dist]; e < d.zrow[dist + 1]; ++e) {
                r += zpl[e] * R[d.zto[e]];
                k += zpl[e] * K[d.zto[e]];
            }
            lv = c.leave[Lz - dist];
        } else {
            for (std::size_t i = 0; i < d.mv.size(); ++i) {
                r += mpl[i] * R[dist - d.mv[i]];
                k += mpl[i] * K[dist - d.mv[i]];
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
    d.R.resize(L + 1);
    d.K.resize(L + 1);
    for (int i = 0; i <= L; ++i) {
        d.R[i] = static_cast<double>(R[i]);
        d.K[i] = static_cast<double>(K[i]);
    }
    // Each level of the programme: one sum of row_terms products and a division.
    d.err_rk = static_cast<double>(gamma_ld(static_cast<double>(d.row_terms + 4) * L)) + 2 * unit_d;
    double max_stay = d.p0;
    for (int dist = 1; dist <= d.Z; ++dist)
        if (d.R[dist] > 0) max_stay = std::max(max_stay, d.stay[dist]);
    d.tail_rate = max_stay > 0 ? -std::log(max_stay) : 1e300;
    return d;
}

// dst[i] += p * src[i]; restrict lets the compiler use vector instructions,
// and the AVX2 clone (no FMA contraction in ISO mode) gives the same bits.
__attribute__((target_clones("avx2", "default"), optimize("O3", "tree-vectorize"))) void axpy(
    double* __restrict dst, const double* __restrict src, double p, int n) {
    for (int i = 0; i < n; ++i) dst[i] += p * src[i];
}
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
void apply2(const DistOption& o, const double* sf, const double* sg, double* df, double* dg, int lo, int top) {
    const int zt = std::min(top, o.Z);
    for (int d = lo; d <= zt; ++d) {
        double a = o.stay[d] * sf[d], b = o.stay[d] * sg[d];
        for (int e = o.zrow[d]; e < o.zrow[d + 1]; ++e)
            if (o.zto[e] > 0) {
                a += o.zp[e] * sf[o.zto[e]];
                b += o.zp[e] * sg[o.zto[e]];
            }
        df[d] = a;
        dg[d] = b;
    }
    const int a = std::max(lo, o.Z + 1);
    if (a > top) return;
    const int n = top - a + 1;
    scale2(df + a, sf + a, dg + a, sg + a, o.p0, n);
    for (std::size_t i = 0; i < o.mv.size(); ++i)
        axpy2(df + a, sf + a - o.mv[i], dg + a, sg + a - o.mv[i], o.mp[i], n);
}

double bulk_turns(double mu, double var, int L) {
    mu = std::max(mu, 1e-9);
    return L / mu + 8 * std::sqrt(L * std::max(var, 1.0) / (mu * mu * mu)) + 8;
}

double turns_estimate(const DistOption& a, const DistOption& b, double target) {
    const double bulk = std::max(bulk_turns(a.mu, a.var, a.L), bulk_turns(b.mu, b.var, b.L));
    const double rate = std::min(1e300, a.tail_rate + b.tail_rate);
    return bulk + std::log(2 / target) / rate;
}

// The races a pair needs for an order: simultaneous, A first, B first.
struct Races {
    bool sim = false, af = false, bf = false;
};
Races races_for(Order order) {
    Races r;
    switch (order) {
        case Order::simultaneous: r.sim = true; break;
        case Order::a_first: r.af = true; break;
        case Order::b_first: r.bf = true; break;
        case Order::coin: r.af = r.bf = true; break;
    }
    return r;
}

struct Acc {
    std::vector<double> win, loss, tie;
    void init(int L) {
        win.assign(L + 1, 0);
        loss.assign(L + 1, 0);
        tie.assign(L + 1, 0);
    }
};

// Combines the ordered races of one pair into the requested order.
std::vector<LengthOutcome> combine(Order order, int L, const Acc& sim, const Acc& af, const Acc& bf,
                                   const std::vector<double>& neither, const std::vector<double>& bound) {
    std::vector<LengthOutcome> out(L + 1);
    for (int d = 1; d <= L; ++d) {
        LengthOutcome& o = out[d];
        o.neither = neither[d];
        o.bound = bound[d];
        switch (order) {
            case Order::simultaneous:
                o.win = sim.win[d];
                o.loss = sim.loss[d];
                o.tie = sim.tie[d];
                break;
            case Order::a_first:
                o.win = af.win[d];
                o.loss = af.loss[d];
                break;
            case Order::b_first:
                o.win = bf.win[d];
                o.loss = bf.loss[d];
                break;
            case Order::coin:
                o.win = (af.win[d] + bf.win[d]) / 2;
                o.loss = (af.loss[d] + bf.loss[d]) / 2;
                o.bound += 2 * unit_d;
                break;
        }
    }
    return out;
}

struct Cancelled {};

// ---------------------------------------------------------------- series

struct SeriesOption {
    const DistOption* o = nullptr;
    std::vector<double> f[2], g[2];
    int written[2] = {0, 0};  // highest index of f written in each buffer
    int cur = 0, lo = 1, hi = 1;
    bool used = false;
};

struct SeriesPair {
    std::size_t index = 0;  // into the request list
    SeriesOption *A = nullptr, *B = nullptr;
    Races races;
    Acc sim, af, bf;
    std::vector<char> closed;
    std::vector<double> close_bound;
    std::vector<int> close_turn;
    int plo = 1;
    int last_turn = 0;  // the turn it closed: its bound depends on no other pair
    double cap = 0;
    bool active = true, failed = false;
};

// Runs the series for a group of pairs; pairs it cannot close within their
// turn cap come back with failed set (the caller uses the pair programme).
void run_series(std::vector<SeriesOption>& opts, std::vector<SeriesPair>& pairs, int L, double target,
                std::atomic<bool>* cancel) {
    for (auto& so : opts) {
        if (!so.used) continue;
        const DistOption& o = *so.o;
        for (int b = 0; b < 2; ++b) {
            so.f[b].assign(L + 1, 0.0);
            so.g[b] = o.R;
        }
        // t = 1: f_1 = finishing probability, G_1 = P R.
        for (int d = 1; d <= o.Z; ++d) so.f[1][d] = 1.0 - o.nofinish[d];
        for (int d = 1; d <= o.Z; ++d) {  // exact from integers where it matters
            double s = 0;
            for (int e = o.zrow[d]; e < o.zrow[d + 1]; ++e)
                if (o.zto[e] == 0) s += o.zp[e];
            so.f[1][d] = s;
        }
        std::vector<double> scratch(L + 1, 0.0);  // P f_0 = 0: only G_1 = P R is kept
        apply2(o, so.f[0].data(), so.g[0].data(), scratch.data(), so.g[1].data(), 1, L);
        so.cur = 1;
        so.written[1] = o.Z;
        so.lo = 1;
        so.hi = std::max(1, o.Z);
    }
    for (auto& p : pairs) {
        if (p.races.sim) p.sim.init(L);
        if (p.races.af) p.af.init(L);
        if (p.races.bf) p.bf.init(L);
        p.closed.assign(L + 2, 0);
        p.closed[L + 1] = 1;
        p.close_bound.assign(L + 1, 0);
        p.close_turn.assign(L + 1, 0);
    }
    int t = 1;
    while (true) {
        // Accumulate turn t for every active pair.
        bool any = false;
        for (auto& p : pairs) {
            if (!p.active) continue;
            SeriesOption& A = *p.A;
            SeriesOption& B = *p.B;
            const double* fa = A.f[A.cur].data();
            const double* fb = B.f[B.cur].data();
            const double* ga = A.g[A.cur].data();
            const double* gb = B.g[B.cur].data();
            const double* gao = A.g[1 - A.cur].data();
            const double* gbo = B.g[1 - B.cur].data();
            const double* ka = A.o->K.data();
            const double* kb = B.o->K.data();
            const int phi = std::min(L, std::max(A.hi, B.hi));
            for (int d = p.plo; d <= phi; ++d) {
                if (p.closed[d]) continue;
                const double sa = ga[d] + ka[d], sb = gb[d] + kb[d];
                if (p.races.sim) {
                    p.sim.win[d] += fa[d] * sb;
                    p.sim.loss[d] += fb[d] * sa;
                    p.sim.tie[d] += fa[d] * fb[d];
                }
                if (p.races.af) {
                    p.af.win[d] += fa[d] * (gbo[d] + kb[d]);
                    p.af.loss[d] += fb[d] * sa;
                }
                if (p.races.bf) {
                    p.bf.win[d] += fa[d] * sb;
                    p.bf.loss[d] += fb[d] * (gao[d] + ka[d]);
                }
                const double prod = ga[d] * gb[d];
                if (prod <= target) {
                    // What is left: A finishes later while B never does (exact),
                    // the mirror, and both finish later (split evenly, bounded).
                    const double half = prod / 2;
                    auto close = [&](Acc& acc) {
                        acc.win[d] += ga[d] * kb[d] + half;
                        acc.loss[d] += gb[d] * ka[d] + half;
                    };
                    if (p.races.sim) close(p.sim);
                    if (p.races.af) close(p.af);
                    if (p.races.bf) close(p.bf);
                    p.closed[d] = 1;
                    p.close_bound[d] = prod;  // the tie's share may be anything in [0, prod]
                    p.close_turn[d] = t;
                }
            }
            while (p.plo <= L && p.closed[p.plo]) ++p.plo;
            if (p.plo > L) {
                p.active = false;
                p.last_turn = t;
            } else if (t > p.cap) {
                p.active = false;
                p.failed = true;
            } else {
                any = true;
            }
        }
        if (!any) break;
        if (cancel && cancel->load(std::memory_order_relaxed)) throw Cancelled{};
        ++t;
        // Which options are still needed.
        for (auto& so : opts) so.used = false;
        for (auto& p : pairs)
            if (p.active) p.A->used = p.B->used = true;
        for (auto& so : opts) {
            if (!so.used) continue;
            const DistOption& o = *so.o;
            const int nw = 1 - so.cur;
            const int top = std::min(L, so.hi + o.M);
            double* fn = so.f[nw].data();
            double* gn = so.g[nw].data();
            apply2(o, so.f[so.cur].data(), so.g[so.cur].data(), fn, gn, so.lo, top);
            for (int d = top + 1; d <= so.written[nw]; ++d) fn[d] = 0;
            so.written[nw] = top;
            so.cur = nw;
            int hi = top;
            while (hi > so.lo && fn[hi] < trim_mass) fn[hi--] = 0;
            so.hi = hi;
            while (so.lo < so.hi && fn[so.lo] < trim_mass && gn[so.lo] < trim_mass) {
                for (int b = 0; b < 2; ++b) so.f[b][so.lo] = so.g[b][so.lo] = 0;
                ++so.lo;
            }
        }
    }
    // Bounds: closing + rounding of every turn + trimming.
    for (auto& p : pairs) {
        if (p.failed) continue;
        const DistOption& a = *p.A->o;
        const DistOption& b = *p.B->o;
        const double tp = p.last_turn;
        const double trim = 4.0 * (tp + 2.0) * (tp + 2.0) * trim_mass;
        for (int d = 1; d <= L; ++d) {
            const double turns = p.close_turn[d];
            p.close_bound[d] = p.close_bound[d] * (1 + 1e-12) +
                               gamma_d((a.row_terms + b.row_terms + 8) * turns + 16) + 2 * (a.err_rk + b.err_rk) +
                               trim;
        }
    }
}

// ---------------------------------------------------------------- pairs

// The pair programme in distance coordinates for one ordered race, keeping
// max-move + 1 rows; returns (win, loss) of every diagonal start (d, d).
void diagonal_programme(const DistOption& A, const DistOption& B, bool a_first, int L, std::vector<double>& dw,
                        std::vector<double>& dl, std::vector<double>& bound, std::atomic<bool>* cancel) {
    const int ring = A.M + 1;
    limits::check_memory(static_cast<std::uint64_t>(ring + 4) * (L + 1) * 2 * sizeof(double),
                         "the pair programme of this sweep");
    std::vector<double> gw(static_cast<std::size_t>(ring) * (L + 1), 0), gl(gw.size(), 0);
    std::vector<double> xw(L + 1), xl(L + 1), vw(L + 1, 0), vl(L + 1, 0), hw(L + 1);
    for (int b = 1; b <= L; ++b) hw[b] = a_first ? 1.0 : B.nofinish[b];
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
        if (a <= A.Z) {
            for (int e = A.zrow[a]; e < A.zrow[a + 1]; ++e) add_row(A.zto[e], A.zp[e]);
        } else {
            for (std::size_t i = 0; i < A.mv.size(); ++i) add_row(a - A.mv[i], A.mp[i]);
        }
        const double sa = A.stay[a], la = A.leave[a];
        double* rw = gw.data() + static_cast<std::size_t>(a % ring) * (L + 1);
        double* rl = gl.data() + static_cast<std::size_t>(a % ring) * (L + 1);
        for (int b = 1; b <= L; ++b) {
            double yw = 0, yl = 0;
            if (b <= B.Z) {
                for (int e = B.zrow[b]; e < B.zrow[b + 1]; ++e) {
                    const int to = B.zto[e];
                    const double p = B.zp[e];
                    if (to == 0) {
                        yl += p;
                    } else {
                        yw += p * vw[to];
                        yl += p * vl[to];
                    }
                }
            } else {
                const int* mv = B.mv.data();
                const double* mp = B.mp.data();
                const std::size_t nm = B.mv.size();
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
        bound[a] = gamma_d(static_cast<double>(2 * a + 2) * m) + A.err_rk + B.err_rk;
    }
}

std::vector<LengthOutcome> pair_method(const DistOption& A, const DistOption& B, Order order, int L,
                                       std::atomic<bool>* cancel) {
    Acc sim, af, bf;
    std::vector<double> bound(L + 1, 0), b1, b2;
    std::vector<double> neither(L + 1, 0);
    for (int d = 1; d <= L; ++d) neither[d] = A.K[d] * B.K[d];
    Races r = races_for(order);
    if (r.sim) {
        sim.init(L);
        diagonal_programme(A, B, false, L, sim.win, sim.loss, bound, cancel);
        for (int d = 1; d <= L; ++d) sim.tie[d] = std::max(0.0, 1.0 - sim.win[d] - sim.loss[d] - neither[d]);
        for (int d = 1; d <= L; ++d) bound[d] += 4 * unit_d;
    }
    if (r.af) {
        af.init(L);
        diagonal_programme(A, B, true, L, af.win, af.loss, b1, cancel);
        for (int d = 1; d <= L; ++d) bound[d] = std::max(bound[d], b1[d]);
    }
    if (r.bf) {
        bf.init(L);
        diagonal_programme(B, A, true, L, bf.loss, bf.win, b2, cancel);
        for (int d = 1; d <= L; ++d) bound[d] = std::max(bound[d], b2[d]);
    }
    // The tie of a simultaneous race is what is left: its bound is the sum of the others'.
    if (r.sim)
        for (int d = 1; d <= L; ++d) bound[d] *= 3;
    return combine(order, L, sim, af, bf, neither, bound);
}

int thread_count(int requested) {
    if (requested > 0) return requested;
    return static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
}

}  // namespace

double series_turns_estimate(const Option& a, const Option& b, Overshoot rule, int max_length) {
    DistOption da = build_dist(a, rule, std::min(max_length, a.max_move() + 1));
    DistOption db = build_dist(b, rule, std::min(max_length, b.max_move() + 1));
    da.L = db.L = max_length;
    return turns_estimate(da, db, 1e-15);
}

PairCost estimate_pair_cost(const Option& a, const Option& b, Overshoot rule, Order order, int max_length,
                            const LengthSettings& s) {
    DistOption da = build_dist(a, rule, std::min(max_length, a.max_move() + 1));
    DistOption db = build_dist(b, rule, std::min(max_length, b.max_move() + 1));
    da.L = db.L = max_length;
    PairCost c;
    c.turns = turns_estimate(da, db, s.close_target);
    switch (s.method) {
        case LengthMethod::series: c.series = true; break;
        case LengthMethod::pairs: c.series = false; break;
        case LengthMethod::automatic: c.series = c.turns <= 0.6 * max_length; break;
    }
    const Races r = races_for(order);
    const double races = (r.sim ? 1 : 0) + (r.af ? 1 : 0) + (r.bf ? 1 : 0);
    const double ka = static_cast<double>(da.mv.size()) + 1, kb = static_cast<double>(db.mv.size()) + 1;
    const double L = max_length;
    if (c.series) {
        // apply2 steps two vectors per option; each race adds three terms per start.
        c.step_work = c.turns * L * 2 * (ka + kb);
        c.work = c.step_work + c.turns * L * 3 * races;
    } else {
        c.work = 1.3 * L * L * (ka + kb) * races;
    }
    return c;
}

std::vector<PairLengths> all_lengths(const std::vector<Option>& options, Overshoot rule, Order order,
                                     int max_length, const std::vector<PairRequest>& requests,
                                     const LengthSettings& s, const std::function<void(const PairLengths&)>& on_done) {
    if (rule == Overshoot::bounce)
        throw InternalError("all_lengths: the rule bounce goes board by board");
    const int L = max_length;
    if (L < 1) throw InputError("the longest length of a sweep must be at least 1");
    // Which options take part.
    std::vector<char> needed(options.size(), 0);
    for (const auto& r : requests) needed[r.a] = needed[r.b] = 1;
    std::vector<DistOption> dist(options.size());
    for (std::size_t i = 0; i < options.size(); ++i) {
        if (!needed[i]) continue;
        limits::check_memory(static_cast<std::uint64_t>(L + 1) * 8 * 10 + chain_memory_estimate(make_board(std::min(L, options[i].max_move() + 1), rule, {}), options[i]),
                             "the all-lengths engine");
        dist[i] = build_dist(options[i], rule, L);
    }
    std::vector<PairLengths> out(requests.size());
    std::vector<char> to_series(requests.size(), 0);
    for (std::size_t k = 0; k < requests.size(); ++k) {
        out[k].a = requests[k].a;
        out[k].b = requests[k].b;
        if (requests[k].a == requests[k].b) throw InternalError("all_lengths: a pair of one option with itself");
        const DistOption& A = dist[requests[k].a];
        const DistOption& B = dist[requests[k].b];
        const double est = turns_estimate(A, B, s.close_target);
        switch (s.method) {
            case LengthMethod::series: to_series[k] = 1; break;
            case LengthMethod::pairs: to_series[k] = 0; break;
            // Measured (docs/sweep.md): the series costs about 2 T (kA + kB) L
            // against 1.3 L^2 (kA + kB) for the programme.
            case LengthMethod::automatic: to_series[k] = est <= 0.6 * L ? 1 : 0; break;
        }
    }
    std::mutex done_mutex;
    auto finish = [&](std::size_t k, std::vector<LengthOutcome> v, const char* method) {
        std::lock_guard<std::mutex> lock(done_mutex);
        out[k].by_length = std::move(v);
        out[k].method = method;
        out[k].done = true;
        if (on_done) on_done(out[k]);
    };
    // Jobs: the series group first (it shares option vectors), then one per programme pair.
    std::vector<std::size_t> pp_jobs;
    std::vector<std::size_t> series_list;
    for (std::size_t k = 0; k < requests.size(); ++k) (to_series[k] ? series_list : pp_jobs).push_back(k);
    std::vector<std::size_t> fallback;  // series pairs that hit their cap
    std::mutex fallback_mutex;
    std::atomic<std::size_t> next{0};
    std::exception_ptr failure;
    std::mutex failure_mutex;
    std::atomic<bool> series_done{series_list.empty()};
    auto series_job = [&] {
        std::vector<SeriesOption> opts(options.size());
        for (std::size_t i = 0; i < options.size(); ++i) opts[i].o = &dist[i];
        std::vector<SeriesPair> sp(series_list.size());
        for (std::size_t q = 0; q < series_list.size(); ++q) {
            const std::size_t k = series_list[q];
            sp[q].index = k;
            sp[q].A = &opts[requests[k].a];
            sp[q].B = &opts[requests[k].b];
            sp[q].A->used = sp[q].B->used = true;
            sp[q].races = races_for(order);
            const double est = turns_estimate(dist[requests[k].a], dist[requests[k].b], s.close_target);
            sp[q].cap = 3 * est + 2000;
        }
        run_series(opts, sp, L, s.close_target, s.cancel);
        for (auto& p : sp) {
            if (p.failed) {
                std::lock_guard<std::mutex> lock(fallback_mutex);
                fallback.push_back(p.index);
                continue;
            }
            std::vector<double> neither(L + 1, 0);
            for (int d = 1; d <= L; ++d) neither[d] = p.A->o->K[d] * p.B->o->K[d];
            finish(p.index, combine(order, L, p.sim, p.af, p.bf, neither, p.close_bound), "series");
        }
    };
    auto work = [&](bool first) {
        try {
            if (first && !series_list.empty()) {
                series_job();
                series_done = true;
            }
            for (std::size_t j; (j = next.fetch_add(1)) < pp_jobs.size();) {
                const std::size_t k = pp_jobs[j];
                finish(k, pair_method(dist[requests[k].a], dist[requests[k].b], order, L, s.cancel), "pairs");
            }
        } catch (const Cancelled&) {
            next.store(pp_jobs.size());
        } catch (...) {
            std::lock_guard<std::mutex> lock(failure_mutex);
            if (!failure) failure = std::current_exception();
            next.store(pp_jobs.size());
        }
    };
    const int threads = thread_count(s.threads);
    std::vector<std::thread> pool;
    for (int i = 1; i < threads; ++i) pool.emplace_back(work, false);
    work(true);
    for (auto& th : pool) th.join();
    if (failure) std::rethrow_exception(failure);
    // Series pairs that did not close in time: the programme, exact whatever the cap.
    std::sort(fallback.begin(), fallback.end());
    for (std::size_t k : fallback) {
        if (s.cancel && s.cancel->load()) break;
        try {
            finish(k, pair_method(dist[requests[k].a], dist[requests[k].b], order, L, s.cancel), "pairs");
        } catch (const Cancelled&) {
            break;
        }
    }
    return out;
}

std::vector<PairLengths> board_by_board(const std::vector<Option>& options, Overshoot rule, Order order,
                                        const std::vector<Jump>& jumps, JumpAnchor anchor,
                                        const std::vector<int>& lengths, const std::vector<PairRequest>& requests,
                                        const LengthSettings& s) {
    const int top = lengths.empty() ? 0 : *std::max_element(lengths.begin(), lengths.end());
    std::vector<PairLengths> out(requests.size());
    for (std::size_t k = 0; k < requests.size(); ++k) {
        out[k].a = requests[k].a;
        out[k].b = requests[k].b;
        out[k].method = "board";
        out[k].by_length.assign(top + 1, LengthOutcome{});
    }
    std::atomic<std::size_t> next{0};
    std::atomic<bool> stopped{false};
    std::exception_ptr failure;
    std::mutex failure_mutex;
    DuelSettings ds;
    ds.want_median = false;
    auto work = [&] {
        try {
            for (std::size_t j; (j = next.fetch_add(1)) < lengths.size();) {
                if (s.cancel && s.cancel->load()) {
                    stopped = true;
                    break;
                }
                const int len = lengths[j];
                Board board = make_board(len, rule, anchored_jumps(jumps, anchor, top, len));
                std::vector<Chain> chains(options.size());
                std::vector<char> built(options.size(), 0);
                for (const auto& r : requests)
                    for (std::size_t i : {r.a, r.b})
                        if (!built[i]) {
                            chains[i] = build_chain(board, options[i]);
                            built[i] = 1;
                        }
                for (std::size_t k = 0; k < requests.size(); ++k) {
                    DuelResult r = duel(chains[requests[k].a], chains[requests[k].b], order, ds);
                    LengthOutcome& o = out[k].by_length[len];
                    o.win = static_cast<double>(r.p_a_wins);
                    o.loss = static_cast<double>(r.p_b_wins);
                    o.tie = static_cast<double>(r.p_tie);
                    o.neither = static_cast<double>(r.p_neither);
                    // Rounded to double here: widen the bound by that rounding.
                    o.bound = static_cast<double>(r.bound) + 2 * unit_d;
                    if (!r.bound_proven || !r.target_met) o.bound = std::numeric_limits<double>::infinity();
                }
            }
        } catch (...) {
            std::lock_guard<std::mutex> lock(failure_mutex);
            if (!failure) failure = std::current_exception();
            next.store(lengths.size());
        }
    };
    const int threads = thread_count(s.threads);
    std::vector<std::thread> pool;
    for (int i = 1; i < threads; ++i) pool.emplace_back(work);
    work();
    for (auto& th : pool) th.join();
    if (failure) std::rethrow_exception(failure);
    for (auto& p : out) p.done = !stopped;
    return out;
}

}  // namespace overshoot
