#include "chain/absorption.hpp"

#include <algorithm>

#include "chain/series.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"

namespace overshoot {

Absorption forward_absorption(const Chain& c) {
    if (!c.forward_only) throw InternalError("forward_absorption on a board where pieces move backward");
    const int n = c.length;
    Absorption a;
    a.h.assign(n, 0.0L);
    a.g.assign(n, 0.0L);
    // Every destination other than s itself lies ahead of s, so a descending
    // pass sees it solved; the self-loop is divided out by the exact leave weight.
    for (int s = n - 1; s >= 0; --s) {
        if (c.stuck[s] || c.leave[s] == 0) continue;
        long double h = c.finish[s], g = 0;
        for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k) {
            const int d = c.dest[k];
            if (d == s || d == n) continue;
            h += c.prob[k] * a.h[d];
            g += c.prob[k] * a.g[d];
        }
        a.h[s] = h / c.leave[s];
        a.g[s] = (a.h[s] + g) / c.leave[s];
    }
    return a;
}

StartAbsorption absorption_from(const Board& board, const Option& o, int start) {
    if (!board.forward_only()) throw InternalError("absorption_from on a board where pieces move backward");
    const int n = board.length;
    limits::check_memory(static_cast<std::uint64_t>(n - start) * 64, "the absorption of this option on this board");
    const std::size_t size = static_cast<std::size_t>(n - start);
    // Per square s (index s - start): P(finish), P(stuck), E[T 1{finish}], and the
    // error weights U = value + sum_d P_J(s, d) U(d) of the bound (see below).
    std::vector<long double> h(size), q(size);
    std::vector<double> g(size), uh(size), uq(size);
    std::vector<char> can(size);
    // The moves with non-zero weight, their weights converted once.
    struct Move {
        int m;
        std::uint64_t w;
        long double wl;
        double wd;
    };
    std::vector<Move> list;
    for (int m = 0; m <= o.max_move(); ++m)
        if (o.weight[m] != 0)
            list.push_back({m, o.weight[m], static_cast<long double>(o.weight[m]), static_cast<double>(o.weight[m])});
    const int moves = static_cast<int>(list.size());
    const long double den = static_cast<long double>(o.denominator);
    for (int s = n - 1; s >= start; --s) {
        const std::size_t i = static_cast<std::size_t>(s - start);
        std::uint64_t stay = 0;
        long double hs = 0, qs = 0;
        double gs = 0, uhs = 0, uqs = 0;
        bool reach = false;
        const bool inside = s + o.max_move() < n;  // no move overshoots: only jumps to follow
        for (const Move& mv : list) {
            const int d = inside ? board.after_jumps[s + mv.m] : move_destination(board, s, mv.m);
            const long double wl = mv.wl;
            if (d == s) {
                stay += mv.w;
            } else if (d == n) {
                hs += wl;
                reach = true;
            } else {  // d > s: every arc other than a stay leads forward
                const std::size_t j = static_cast<std::size_t>(d - start);
                if (can[j]) {
                    reach = true;
                    const double wd = mv.wd;
                    hs += wl * h[j];
                    qs += wl * q[j];
                    gs += wd * g[j];
                    uhs += wd * uh[j];
                    uqs += wd * uq[j];
                } else {
                    qs += wl;  // lands on a stuck square
                }
            }
        }
        can[i] = reach ? 1 : 0;
        if (!reach) {
            q[i] = 1;
            continue;
        }
        // The stay is divided out by the exact leave weight (integers).
        const long double leave = static_cast<long double>(o.denominator - stay);
        h[i] = hs / leave;
        q[i] = qs / leave;
        const double dleave = static_cast<double>(leave);
        g[i] = (static_cast<double>(den * h[i]) + gs) / dleave;
        uh[i] = static_cast<double>(h[i]) + uhs / dleave;
        uq[i] = static_cast<double>(q[i]) + uqs / dleave;
    }
    // Each value is a sum of at most `moves` non-negative products by exact
    // integer weights, divided by an exact integer: relative error gamma_{moves+2}
    // per square. The errors travel along the jump chain P_J (no self-loops), so
    // |error(start)| <= gamma/(1-gamma) * sum_s G_J(start, s) value(s) = ... * U(start);
    // U itself is computed in double to a relative 1e-9 at 1e6 squares (weights
    // up to 2^62 rounded to double once more: 2^-53), covered by 1.01.
    const long double gm = gamma_ld(moves + 2);
    StartAbsorption r;
    r.finish = h[0];
    r.stuck = q[0];
    r.time = g[0];
    r.finish_error = gm / (1 - gm) * 1.01L * uh[0];
    r.stuck_error = gm / (1 - gm) * 1.01L * uq[0];
    return r;
}

}  // namespace overshoot
