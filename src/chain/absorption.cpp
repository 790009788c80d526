#include "chain/absorption.hpp"

#include "core/error.hpp"

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

}  // namespace overshoot
