#include "chain/profile.hpp"

#include <Eigen/Sparse>
#include <Eigen/SparseLU>
#include <algorithm>
#include <cmath>
#include <limits>

#include "chain/series.hpp"
#include "core/error.hpp"
#include "core/selfcheck.hpp"

namespace overshoot {

Moments solve_moments(const Chain& c) {
    const int n = c.length;
    std::vector<int> index(n, -1);
    int live = 0;
    for (int s = 0; s < n; ++s)
        if (!c.stuck[s]) index[s] = live++;
    Moments m;
    m.h.assign(n, 0.0);
    m.g.assign(n, 0.0);
    m.k.assign(n, 0.0);
    if (live == 0) return m;
    std::vector<Eigen::Triplet<double>> trip;
    Eigen::VectorXd r(live);
    for (int s = 0; s < n; ++s) {
        if (index[s] < 0) continue;
        // Diagonal from exact integers (leave = 1 - stay without subtracting).
        trip.emplace_back(index[s], index[s], static_cast<double>(c.leave[s]));
        for (auto e = c.row_start[s]; e < c.row_start[s + 1]; ++e) {
            int d = c.dest[e];
            if (d == n || d == s || c.stuck[d]) continue;
            trip.emplace_back(index[s], index[d], -static_cast<double>(c.prob[e]));
        }
        r[index[s]] = static_cast<double>(c.finish[s]);
    }
    Eigen::SparseMatrix<double> a(live, live);
    a.setFromTriplets(trip.begin(), trip.end());
    a.makeCompressed();
    Eigen::VectorXd h, g, k;
    auto solve_with = [&](auto& lu) {
        lu.compute(a);
        if (lu.info() != Eigen::Success) throw InternalError("sparse LU of the absorbing chain failed");
        h = lu.solve(r);
        g = lu.solve(h);
        k = lu.solve(2.0 * g - h);
    };
    if (c.forward_only) {
        // Upper triangular already: the natural order has no fill, and the
        // fill-reducing analysis would cost more than the factorisation.
        Eigen::SparseLU<Eigen::SparseMatrix<double>, Eigen::NaturalOrdering<int>> lu;
        solve_with(lu);
    } else {
        Eigen::SparseLU<Eigen::SparseMatrix<double>, Eigen::COLAMDOrdering<int>> lu;
        solve_with(lu);
    }
    const std::vector<char> certain = certain_to_finish(c);
    m.residual = std::max({(a * h - r).lpNorm<Eigen::Infinity>(), (a * g - h).lpNorm<Eigen::Infinity>() /
                                                                       std::max(1.0, g.lpNorm<Eigen::Infinity>())});
    for (int s = 0; s < n; ++s) {
        if (index[s] < 0) continue;
        // The clamp below only absorbs rounding; a NaN or a value far outside
        // [0, 1] is a failed solve, not a probability.
        selfcheck::check_probability(h[index[s]], selfcheck::solve_slack, "P(finish) from the absorbing-chain solve");
        // A square that can reach no stuck square finishes for sure: 1, not 1 - 2e-16.
        m.h[s] = certain[s] ? 1.0 : std::clamp(h[index[s]], 0.0, 1.0);
        m.g[s] = g[index[s]];
        m.k[s] = k[index[s]];
    }
    return m;
}

Profile profile(const Chain& c, const ProfileSettings& settings) {
    Profile p;
    Moments m = solve_moments(c);
    p.residual = m.residual;
    p.p_finish = m.h[0];
    p.p_stuck = 1.0 - p.p_finish;
    if (p.p_finish > 0) {
        p.mean_turns_given_finish = m.g[0] / m.h[0];
        double var = m.k[0] / m.h[0] - p.mean_turns_given_finish * p.mean_turns_given_finish;
        p.sd_turns_given_finish = std::sqrt(std::max(0.0, var));
    } else {
        p.mean_turns_given_finish = std::numeric_limits<double>::quiet_NaN();
        p.sd_turns_given_finish = std::numeric_limits<double>::quiet_NaN();
    }
    p.stuck_squares = stuck_squares(c);

    // Quantiles: smallest t with P(T <= t) >= q, null when P(finish) < q.
    std::vector<double> qs = settings.quantiles;
    p.quantiles.resize(qs.size());
    for (std::size_t i = 0; i < qs.size(); ++i) p.quantiles[i].q = qs[i];
    std::vector<std::size_t> pending;
    for (std::size_t i = 0; i < qs.size(); ++i) {
        if (qs[i] <= p.p_finish) pending.push_back(i);
    }
    if (!pending.empty()) {
        Series s(c);
        while (!pending.empty()) {
            s.step();
            for (auto it = pending.begin(); it != pending.end();) {
                if (s.finished() >= static_cast<long double>(qs[*it])) {
                    p.quantiles[*it].turns = s.turn();
                    it = pending.erase(it);
                } else {
                    ++it;
                }
            }
            if (s.alive() == 0 || s.work() > settings.work_limit) break;
        }
        for (std::size_t i : pending) p.quantiles[i].resolved = s.alive() == 0;
        // Two methods, one number: the series brackets P(finish) by what has
        // finished and what is still alive.
        selfcheck::check_within(p.p_finish, s.finished() - s.rounding_bound(),
                                s.finished() + s.alive() + s.rounding_bound(), selfcheck::solve_slack,
                                "P(finish) from the solve against the per-turn series");
    }
    return p;
}

Distribution distribution(const Chain& c, double bound, long long max_rows) {
    Distribution d;
    Moments m = solve_moments(c);
    Series s(c);
    auto remaining = [&] {
        long double r = 0;
        const auto& v = s.mass();
        for (int i = s.low(); i <= s.high(); ++i) r += v[i] * static_cast<long double>(m.h[i]);
        return r;
    };
    long double rem = m.h[0];
    while (rem >= bound && s.alive() > 0) {
        if (static_cast<long long>(d.rows.size()) >= max_rows) {
            d.row_cap_hit = true;
            break;
        }
        long double f = s.step();
        d.rows.push_back({s.turn(), f, s.finished()});
        rem = remaining();
    }
    d.remaining_finish = std::max(0.0L, rem);
    d.never = std::max(0.0L, 1.0L - static_cast<long double>(m.h[0]));
    d.rounding_bound = s.rounding_bound();
    // The listed rows, the remaining finishing mass and never finishing partition the space.
    selfcheck::check_distribution({s.finished(), d.remaining_finish, d.never}, d.rounding_bound + selfcheck::solve_slack,
                                  "the listed distribution of T");
    return d;
}

}  // namespace overshoot
