#pragma once
// Profile of one option on one board: chance of finishing, moments of the
// finishing time (absorbing-chain equations, Eigen sparse LU), quantiles and
// the listed distribution (per-turn series).
#include <cstdint>
#include <optional>
#include <vector>

#include "chain/chain.hpp"

namespace overshoot {

struct Quantile {
    double q = 0;
    std::optional<long long> turns;  // null when P(finish) < q, or unresolved
    bool resolved = true;            // false when the work limit stopped the series first
};

struct Profile {
    double p_finish = 0;                 // from square 0
    double p_stuck = 0;                  // = 1 - p_finish: every non-finisher ends stuck
    double mean_turns_given_finish = 0;  // NaN when p_finish == 0
    double sd_turns_given_finish = 0;
    std::vector<Quantile> quantiles;     // median first when asked for 0.5
    std::vector<int> stuck_squares;
    double residual = 0;                 // max residual of the linear solves (self-check)
};

struct ProfileSettings {
    std::vector<double> quantiles{0.5};
    std::uint64_t work_limit = 4'000'000'000ULL;  // transitions the quantile series may apply
};

// Absorption probabilities and first two moments of T given finishing, per
// square, by sparse LU of (I - Q) on the squares that can still finish.
struct Moments {
    std::vector<double> h;   // P(finish | square)
    std::vector<double> g;   // E[T 1{finish} | square]
    std::vector<double> k;   // E[T^2 1{finish} | square]
    double residual = 0;
};
Moments solve_moments(const Chain& chain);

Profile profile(const Chain& chain, const ProfileSettings& settings = {});

struct DistributionRow {
    long long turn = 0;
    long double p = 0;          // P(T = turn)
    long double cumulative = 0; // P(T <= turn)
};

struct Distribution {
    std::vector<DistributionRow> rows;
    long double remaining_finish = 0;  // P(turn < T < infinity) after the last row
    long double never = 0;             // P(T = infinity)
    long double rounding_bound = 0;
    bool row_cap_hit = false;
};

// Lists P(T = t) until the remaining finishing mass is below `bound`, or
// `max_rows` rows (then row_cap_hit says so).
Distribution distribution(const Chain& chain, double bound, long long max_rows);

}  // namespace overshoot
