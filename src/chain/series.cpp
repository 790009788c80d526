#include "chain/series.hpp"

#include <algorithm>
#include <limits>
#include <type_traits>

#include "core/kernels.hpp"

namespace overshoot {

long double gamma_ld(double n) {
    const long double u = std::numeric_limits<long double>::epsilon() / 2;
    long double nu = static_cast<long double>(n) * u;
    return nu / (1 - nu);
}

long double gamma_d(double n) {
    const long double u = std::numeric_limits<double>::epsilon() / 2;
    long double nu = static_cast<long double>(n) * u;
    return nu / (1 - nu);
}

namespace {
template <class Real>
long double gamma_of(double n) {
    if constexpr (std::is_same_v<Real, double>)
        return gamma_d(n);
    else
        return gamma_ld(n);
}
// The chain keeps each table of probabilities in both precisions.
template <class Real>
const Real* in_precision(const std::vector<double>& d, const std::vector<long double>& l) {
    if constexpr (std::is_same_v<Real, double>)
        return d.data();
    else
        return l.data();
}
// dst[i] += p * src[i]: vectorised for double; long double has no vector unit.
inline void add_scaled(double* dst, const double* src, double p, int n) { axpy(dst, src, p, n); }
inline void add_scaled(long double* __restrict dst, const long double* __restrict src, long double p, int n) {
    for (int i = 0; i < n; ++i) dst[i] += p * src[i];
}
}  // namespace

template <class Real>
BasicSeries<Real>::BasicSeries(const Chain& c, int start) : c_(&c), v_(c.length, 0), next_(c.length, 0) {
    if (start < 0) start = c.start;
    lo_ = hi_ = start;
    if (c.stuck[start]) {
        stuck_ = 1;
        alive_ = 0;
    } else {
        v_[start] = 1;
    }
    // Each destination sums at most max_in_moves products (moves applied one at
    // a time in the plain block, merged rows elsewhere: never more terms), each
    // product has one rounding, and the probabilities themselves carry one:
    // gamma_{d+2} per turn (docs/method.md).
    gamma_ = gamma_of<Real>(std::max(c.max_in_degree, c.max_in_moves) + 3);
    trim_ = Real(1e-20L);
}

template <class Real>
BasicSeries<Real>::BasicSeries(const Chain& c, const std::vector<Real>& mass, int low, int turn, long double error)
    : c_(&c), v_(c.length, 0), next_(c.length, 0), t_(turn) {
    gamma_ = gamma_of<Real>(std::max(c.max_in_degree, c.max_in_moves) + 3);  // as above
    trim_ = Real(1e-20L);
    int lo = c.length, hi = -1;
    Real alive = 0, stuck = 0;
    for (std::size_t i = 0; i < mass.size(); ++i) {
        const int s = low + static_cast<int>(i);
        if (mass[i] == 0) continue;
        if (c.stuck[s]) {
            stuck += mass[i];
            continue;
        }
        v_[s] = mass[i];
        alive += mass[i];
        lo = std::min(lo, s);
        hi = std::max(hi, s);
    }
    lo_ = hi >= 0 ? lo : 0;
    hi_ = hi >= 0 ? hi : 0;
    alive_ = alive;
    stuck_ = stuck;
    // The start's own error, and the two sums just taken.
    rounding_ = error + gamma_of<Real>(static_cast<double>(mass.size()) + 1) * (alive_ + stuck_);
}

template <class Real>
long double BasicSeries<Real>::step() {
    const Chain& c = *c_;
    const int n = c.length;
    const Real* prob = in_precision<Real>(c.prob_d, c.prob);
    ++t_;
    if (alive_ == 0) return 0;
    int nlo = n, nhi = -1;
    Real fin = 0, st = 0, processed = 0;
    // The plain block: one multiply-add over the support per move, then the
    // mass that landed on jump sources and stuck squares is moved on.
    int from = lo_;
    const int plain_hi = std::min(hi_, c.plain_end - 1);
    if (lo_ <= plain_hi) {
        const Real* mp = in_precision<Real>(c.move_prob_d, c.move_prob);
        const int width = plain_hi - lo_ + 1;
        for (int s = lo_; s <= plain_hi; ++s) processed += v_[s];
        for (int m = 0; m <= c.max_move; ++m) {
            if (mp[m] == 0) continue;
            add_scaled(next_.data() + lo_ + m, v_.data() + lo_, mp[m], width);
            work_ += static_cast<std::uint64_t>(width);
            nlo = std::min(nlo, lo_ + m);
            nhi = std::max(nhi, plain_hi + m);
        }
        std::fill(v_.begin() + lo_, v_.begin() + plain_hi + 1, Real(0));
        const auto first = std::lower_bound(c.redirects.begin(), c.redirects.end(), nlo,
                                            [](const Chain::Redirect& r, int q) { return r.from < q; });
        for (auto r = first; r != c.redirects.end() && r->from <= nhi; ++r) {
            const Real x = next_[r->from];
            if (x == 0) continue;
            next_[r->from] = 0;
            if (r->to == n) {
                fin += x;
            } else if (r->to < 0) {
                st += x;
            } else {
                next_[r->to] += x;
                nlo = std::min(nlo, r->to);
                nhi = std::max(nhi, r->to);
            }
        }
        from = plain_hi + 1;
    }
    for (int s = from; s <= hi_; ++s) {
        const Real m = v_[s];
        if (m == 0) continue;
        v_[s] = 0;
        processed += m;
        const auto begin = c.row_start[s], end = c.row_start[s + 1];
        work_ += static_cast<std::uint64_t>(end - begin);
        if (c.row_stays_live[s]) {
            // Rows are sorted by destination: the first and last bound the support.
            for (auto k = begin; k < end; ++k) next_[c.dest[k]] += m * prob[k];
            if (c.dest[begin] < nlo) nlo = c.dest[begin];
            if (c.dest[end - 1] > nhi) nhi = c.dest[end - 1];
            continue;
        }
        for (auto k = begin; k < end; ++k) {
            const int d = c.dest[k];
            const Real x = m * prob[k];
            if (d == n) {
                fin += x;
            } else if (c.stuck[d]) {
                st += x;  // never finishes: set aside instead of carrying it
            } else {
                next_[d] += x;
                if (d < nlo) nlo = d;
                if (d > nhi) nhi = d;
            }
        }
    }
    std::swap(v_, next_);
    // Trim the far edges of the support: their mass (at most trim_ per edge per
    // turn) is added to the bound, so the bound stays proven while the support
    // stays as narrow as the distribution really is.
    Real dropped = 0;
    if (nhi >= 0) {
        while (nlo < nhi && dropped + v_[nlo] < trim_) {
            dropped += v_[nlo];
            v_[nlo++] = 0;
        }
        Real top = 0;
        while (nhi > nlo && top + v_[nhi] < trim_) {
            top += v_[nhi];
            v_[nhi--] = 0;
        }
        dropped += top;
    }
    Real alive = 0;
    if (nhi >= 0) {
        for (int s = nlo; s <= nhi; ++s) alive += v_[s];
        lo_ = nlo;
        hi_ = nhi;
    } else {
        lo_ = hi_ = 0;
    }
    dropped_ += dropped;
    finished_ += fin;
    stuck_ += st;
    alive_ = alive;
    // This turn's products and sums, the support sum, the three running totals
    // and the trimmed mass (first-order bounds, docs/method.md).
    // Mass errors accumulate (the chain is substochastic, so old errors never
    // grow); the support sum is recomputed each turn, so its error does not.
    rounding_ += gamma_ * static_cast<long double>(processed) + gamma_ld(2) * (finished_ + stuck_) +
                 static_cast<long double>(dropped) * (1 + gamma_of<Real>(4));
    sum_error_ = std::max(sum_error_, gamma_of<Real>(hi_ - lo_ + 2) * alive_);
    return fin;
}

template <class Real>
long double BasicSeries<Real>::alive_below(int square) const {
    long double s = 0;
    for (int i = lo_; i <= hi_ && i < square; ++i) s += v_[i];
    return s;
}

template class BasicSeries<double>;
template class BasicSeries<long double>;

}  // namespace overshoot
