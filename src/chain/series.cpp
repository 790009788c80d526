#include "chain/series.hpp"

#include <limits>

namespace overshoot {

long double gamma_ld(double n) {
    const long double u = std::numeric_limits<long double>::epsilon() / 2;
    long double nu = static_cast<long double>(n) * u;
    return nu / (1 - nu);
}

Series::Series(const Chain& c, int start, bool keep_stuck)
    : c_(&c), v_(c.length, 0), next_(c.length, 0), keep_stuck_(keep_stuck) {
    lo_ = hi_ = start;
    if (c.stuck[start] && !keep_stuck) {
        stuck_ = 1;
        alive_ = 0;
    } else {
        v_[start] = 1;
    }
    // Each destination sums at most max_in_degree products, each product has one
    // rounding, and the probabilities themselves carry one: gamma_{d+2} per turn.
    gamma_ = gamma_ld(c.max_in_degree + 2);
}

long double Series::step() {
    const Chain& c = *c_;
    const int n = c.length;
    ++t_;
    if (alive_ == 0) return 0;
    int nlo = n, nhi = -1;
    long double fin = 0, st = 0, processed = 0;
    for (int s = lo_; s <= hi_; ++s) {
        long double m = v_[s];
        if (m == 0) continue;
        v_[s] = 0;
        processed += m;
        for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k) {
            int d = c.dest[k];
            long double x = m * c.prob[k];
            if (d == n) {
                fin += x;
            } else if (c.stuck[d] && !keep_stuck_) {
                st += x;  // never finishes: set aside instead of carrying it
            } else {
                next_[d] += x;
                if (d < nlo) nlo = d;
                if (d > nhi) nhi = d;
            }
        }
        work_ += static_cast<std::uint64_t>(c.row_start[s + 1] - c.row_start[s]);
    }
    std::swap(v_, next_);
    long double alive = 0;
    if (nhi >= 0) {
        for (int s = nlo; s <= nhi; ++s) alive += v_[s];
        lo_ = nlo;
        hi_ = nhi;
    } else {
        lo_ = hi_ = 0;
    }
    finished_ += fin;
    stuck_ += st;
    alive_ = alive;
    // Rounding of this turn's products and sums, plus the three running sums.
    rounding_ += gamma_ * processed + gamma_ld(hi_ - lo_ + 5) * (finished_ + stuck_ + alive_);
    return fin;
}

long double Series::alive_below(int square) const {
    long double s = 0;
    for (int i = lo_; i <= hi_ && i < square; ++i) s += v_[i];
    return s;
}

}  // namespace overshoot
