#include "lengths/series.hpp"

#include <algorithm>

namespace overshoot::lengths_engine {

namespace {

// Trimming threshold: masses below it are dropped, and the drop is bounded.
constexpr double trim_mass = 1e-30;

}  // namespace

// Runs the series for a group of pairs; pairs it cannot close within their
// turn cap come back with failed set (the caller uses the pair programme).
void run_series(std::vector<SeriesOption>& opts, std::vector<SeriesPair>& pairs, int L, double target,
                std::atomic<bool>* cancel) {
    for (auto& so : opts) {
        if (!so.used) continue;
        const DistanceModel& o = *so.o;
        for (int b = 0; b < 2; ++b) {
            so.f[b].assign(L + 1, 0.0);
            so.g[b] = o.p_ever;
        }
        // t = 1: f_1 = finishing probability, G_1 = P R.
        for (int d = 1; d <= o.zone; ++d) so.f[1][d] = 1.0 - o.no_finish[d];
        for (int d = 1; d <= o.zone; ++d) {  // exact from integers where it matters
            double s = 0;
            for (int e = o.zone_row[d]; e < o.zone_row[d + 1]; ++e)
                if (o.zone_to[e] == 0) s += o.zone_p[e];
            so.f[1][d] = s;
        }
        std::vector<double> scratch(L + 1, 0.0);  // P f_0 = 0: only G_1 = P R is kept
        step_two(o, so.f[0].data(), so.g[0].data(), scratch.data(), so.g[1].data(), 1, L);
        so.cur = 1;
        so.written[1] = o.zone;
        so.lo = 1;
        so.hi = std::max(1, o.zone);
    }
    for (auto& p : pairs) {
        if (p.races.simultaneous) p.sim.init(L);
        if (p.races.a_first) p.af.init(L);
        if (p.races.b_first) p.bf.init(L);
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
            const double* ka = A.o->p_never.data();
            const double* kb = B.o->p_never.data();
            const int phi = std::min(L, std::max(A.hi, B.hi));
            for (int d = p.plo; d <= phi; ++d) {
                if (p.closed[d]) continue;
                const double sa = ga[d] + ka[d], sb = gb[d] + kb[d];
                if (p.races.simultaneous) {
                    p.sim.win[d] += fa[d] * sb;
                    p.sim.loss[d] += fb[d] * sa;
                    p.sim.tie[d] += fa[d] * fb[d];
                }
                if (p.races.a_first) {
                    p.af.win[d] += fa[d] * (gbo[d] + kb[d]);
                    p.af.loss[d] += fb[d] * sa;
                }
                if (p.races.b_first) {
                    p.bf.win[d] += fa[d] * sb;
                    p.bf.loss[d] += fb[d] * (gao[d] + ka[d]);
                }
                const double prod = ga[d] * gb[d];
                if (prod <= target) {
                    // What is left: A finishes later while B never does (exact),
                    // the mirror, and both finish later (split evenly, bounded).
                    const double half = prod / 2;
                    auto close = [&](Tallies& acc) {
                        acc.win[d] += ga[d] * kb[d] + half;
                        acc.loss[d] += gb[d] * ka[d] + half;
                    };
                    if (p.races.simultaneous) close(p.sim);
                    if (p.races.a_first) close(p.af);
                    if (p.races.b_first) close(p.bf);
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
            const DistanceModel& o = *so.o;
            const int nw = 1 - so.cur;
            const int top = std::min(L, so.hi + o.max_move);
            double* fn = so.f[nw].data();
            double* gn = so.g[nw].data();
            step_two(o, so.f[so.cur].data(), so.g[so.cur].data(), fn, gn, so.lo, top);
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
        const DistanceModel& a = *p.A->o;
        const DistanceModel& b = *p.B->o;
        const double tp = p.last_turn;
        const double trim = 4.0 * (tp + 2.0) * (tp + 2.0) * trim_mass;
        for (int d = 1; d <= L; ++d) {
            const double turns = p.close_turn[d];
            p.close_bound[d] = p.close_bound[d] * (1 + 1e-12) +
                               gamma_d((a.row_terms + b.row_terms + 8) * turns + 16) + 2 * (a.ever_never_error + b.ever_never_error) +
                               trim;
        }
    }
}

}  // namespace overshoot::lengths_engine
