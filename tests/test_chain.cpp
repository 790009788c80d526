// Tests of src/chain: the one-turn transitions, stuck squares, the per-turn
// series, the absorbing-chain moments and the profile. Each check against the
// outside world names its source beside it.
#include <catch2/catch.hpp>

#include <Eigen/Dense>
#include <cmath>
#include <map>
#include <vector>

#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "chain/series.hpp"
#include "core/board.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/option.hpp"

using namespace overshoot;

namespace {

Chain chain_of(const char* spec, int length, Overshoot rule = Overshoot::stay, std::vector<Jump> jumps = {}) {
    return build_chain(make_board(length, rule, std::move(jumps)), parse_option(spec));
}

// An option on a board, for the tests that run one check over many boards.
struct BoardCase {
    const char* spec;
    int length;
    Overshoot rule;
    std::vector<Jump> jumps;
};

// One turn from square s as {destination: probability}.
std::map<int, double> row(const Chain& c, int s) {
    std::map<int, double> r;
    for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k) r[c.dest[k]] += static_cast<double>(c.prob[k]);
    return r;
}

bool near(const std::map<int, double>& a, const std::map<int, double>& b) {
    if (a.size() != b.size()) return false;
    for (auto& [k, v] : a) {
        auto it = b.find(k);
        if (it == b.end() || std::fabs(it->second - v) > 1e-15) return false;
    }
    return true;
}

// Dense fundamental matrix of the absorbing chain (Kemeny and Snell, Finite
// Markov Chains, 1960, ch. III): transient states are the squares that can
// still finish, the absorbing states are "finished" and "stuck" (entering any
// square from which the finish is unreachable).
struct Fundamental {
    std::vector<int> squares;  // transient square of each index
    Eigen::MatrixXd N;         // (I - Q)^{-1}
    Eigen::MatrixXd B;         // N R: columns finish, stuck
    Eigen::VectorXd t;         // N 1: expected turns to absorption
};

Fundamental fundamental(const Chain& c) {
    Fundamental f;
    std::vector<int> index(c.length, -1);
    for (int s = 0; s < c.length; ++s)
        if (!c.stuck[s]) {
            index[s] = static_cast<int>(f.squares.size());
            f.squares.push_back(s);
        }
    const int n = static_cast<int>(f.squares.size());
    Eigen::MatrixXd Q = Eigen::MatrixXd::Zero(n, n), R = Eigen::MatrixXd::Zero(n, 2);
    for (int i = 0; i < n; ++i) {
        const int s = f.squares[i];
        for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k) {
            const int d = c.dest[k];
            // Probabilities from the exact integer weights, independent of prob[].
            const double p = static_cast<double>(c.weight[k]) / static_cast<double>(c.denominator);
            if (d == c.length)
                R(i, 0) += p;
            else if (c.stuck[d])
                R(i, 1) += p;
            else
                Q(i, index[d]) += p;
        }
    }
    f.N = (Eigen::MatrixXd::Identity(n, n) - Q).fullPivLu().inverse();
    f.B = f.N * R;
    f.t = f.N * Eigen::VectorXd::Ones(n);
    return f;
}

}  // namespace

// ---------------------------------------------------------------- transitions

TEST_CASE("one turn under each overshoot rule, by hand", "[chain]") {
    // Board of 10 squares, one d6 on square 7 (distance 3), worked out from the
    // semantics in DESIGN.md.
    const double s = 1.0 / 6;
    CHECK(near(row(chain_of("1d6", 10, Overshoot::stay), 7), {{8, s}, {9, s}, {10, s}, {7, 3 * s}}));
    CHECK(near(row(chain_of("1d6", 10, Overshoot::pass), 7), {{8, s}, {9, s}, {10, 4 * s}}));
    // bounce: 11 -> 9, 12 -> 8, 13 -> 7.
    CHECK(near(row(chain_of("1d6", 10, Overshoot::bounce), 7), {{8, 2 * s}, {9, 2 * s}, {10, s}, {7, s}}));
    // A jump 8 -> 2 is followed in the same turn; a jump 9 -> 10 finishes.
    CHECK(near(row(chain_of("1d6", 10, Overshoot::stay, {{8, 2}, {9, 10}}), 7), {{2, s}, {10, 2 * s}, {7, 3 * s}}));
    // bounce with an excess larger than the length stops on square 0.
    CHECK(near(row(chain_of("{10:1}", 3, Overshoot::bounce), 0), {{0, 1.0}}));
    CHECK(near(row(chain_of("{5:1}", 3, Overshoot::bounce), 0), {{1, 1.0}}));
    CHECK(near(row(chain_of("{5:1}", 3, Overshoot::bounce), 1), {{0, 1.0}}));
    // A move of 0 is a turn spent in place.
    CHECK(near(row(chain_of("[0,1]", 5), 2), {{2, 0.5}, {3, 0.5}}));
}

TEST_CASE("rows are exact: integer weights add up to the denominator", "[chain]") {
    for (auto rule : {Overshoot::stay, Overshoot::bounce, Overshoot::pass}) {
        Chain c = chain_of("2d6+[0,3]", 25, rule, {{4, 17}, {20, 2}, {23, 25}});
        for (int s = 0; s < c.length; ++s) {
            std::uint64_t total = 0;
            for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k) total += c.weight[k];
            CHECK(total == c.denominator);
            CHECK(c.leave[s] + c.stay[s] == Approx(1.0L));
        }
    }
}

// ---------------------------------------------------------------- stuck squares

TEST_CASE("stuck squares", "[chain]") {
    // Two dice never move 1: the last-but-one square is stuck (rule stay).
    CHECK(stuck_squares(chain_of("2d6", 100)) == std::vector<int>{99});
    CHECK(stuck_squares(chain_of("3d6", 100)) == std::vector<int>{98, 99});
    CHECK(stuck_squares(chain_of("1d6", 100)).empty());
    // Under pass or bounce nothing is stuck for two dice.
    CHECK(stuck_squares(chain_of("2d6", 100, Overshoot::pass)).empty());
    CHECK(stuck_squares(chain_of("2d6", 100, Overshoot::bounce)).empty());
    // Even moves only: every odd square is stuck on an even board.
    CHECK(stuck_squares(chain_of("[0,2]", 10)) == std::vector<int>{1, 3, 5, 7, 9});
    // A jump source is never rested on, so it is not listed; its target is.
    Chain j = chain_of("2d6", 30, Overshoot::stay, {{12, 29}});
    CHECK(stuck_squares(j) == std::vector<int>{29});
    // A shortcut from the square before does not help the stuck square itself.
    CHECK(stuck_squares(chain_of("2d6", 30, Overshoot::stay, {{28, 30}})) == std::vector<int>{29});
}

TEST_CASE("2d6 ends stuck on the last-but-one square about 33.5% of the time at every length", "[chain]") {
    // Fact of the trade, no published source (re-derived here under rule stay):
    // about 33.5%, hardly depending on the length.
    std::vector<double> seen;
    for (int length : {30, 60, 100, 150, 250, 600, 1000}) {
        Chain c = chain_of("2d6", length);
        Profile p = profile(c, ProfileSettings{.quantiles = {}});
        INFO("length " << length << " P(stuck) " << p.p_stuck);
        // The only stuck square is the last-but-one, so P(stuck) is the chance of ending there.
        CHECK(p.stuck_squares == std::vector<int>{length - 1});
        CHECK(std::fabs(p.p_stuck - 0.335) < 0.001);
        seen.push_back(p.p_stuck);
    }
    for (double x : seen) CHECK(std::fabs(x - seen.back()) < 5e-4);
}

// ---------------------------------------------------------------- closed forms

TEST_CASE("one fair S-sided die, rule stay: remaining time within S of the finish is geometric with mean S", "[chain]") {
    // Handbook closed form: from distance d <= S exactly one face finishes and
    // every other face keeps the piece within S of the finish, so the turns
    // left are geometric with p = 1/S: mean S, variance S(S-1).
    for (int sides : {2, 6, 13, 20}) {
        const int length = 3 * sides + 7;
        Chain c = chain_of(("1d" + std::to_string(sides)).c_str(), length);
        Moments m = solve_moments(c);
        for (int s = length - sides; s < length; ++s) {
            INFO("S " << sides << " square " << s);
            CHECK(m.h[s] == Approx(1.0).margin(1e-12));
            CHECK(m.g[s] == Approx(static_cast<double>(sides)).epsilon(1e-12));
            CHECK(m.k[s] - m.g[s] * m.g[s] == Approx(static_cast<double>(sides) * (sides - 1)).epsilon(1e-10));
        }
        // The series from such a square follows (1 - 1/S)^(t-1) / S.
        Series se(c, length - sides / 2 - 1);
        for (int t = 1; t <= 40; ++t) {
            const double f = static_cast<double>(se.step());
            CHECK(f == Approx(std::pow(1.0 - 1.0 / sides, t - 1) / sides).epsilon(1e-12));
        }
    }
}

TEST_CASE("moments agree with the fundamental matrix (Kemeny and Snell 1960)", "[chain]") {
    // Absorption probabilities B = N R and expected times t = N 1, with
    // N = (I - Q)^{-1}, dense via Eigen; second moment of the absorption time
    // (2N - I) t (Kemeny and Snell, Finite Markov Chains, 1960, ch. III; the
    // theorem number 3.3.5 is from memory).
    std::vector<BoardCase> cases{
        {"1d6", 30, Overshoot::stay, {}},
        {"1d6", 30, Overshoot::bounce, {{5, 22}, {27, 3}}},
        {"1d4+[0,2]", 25, Overshoot::pass, {{10, 2}, {19, 24}}},
        {"{0:1,1:2,4:1}", 20, Overshoot::bounce, {{7, 1}}},
        {"2d6", 40, Overshoot::stay, {}},                       // stuck square 39
        {"3d4", 35, Overshoot::stay, {{9, 30}, {31, 12}}},       // stuck squares, backward jump
        {"[0,2]+[0,3]", 18, Overshoot::stay, {{16, 4}}},
    };
    for (const auto& cs : cases) {
        INFO(cs.spec << " on " << cs.length << " squares, rule " << to_string(cs.rule));
        Chain c = chain_of(cs.spec, cs.length, cs.rule, cs.jumps);
        Moments m = solve_moments(c);
        Fundamental f = fundamental(c);
        const int n = static_cast<int>(f.squares.size());
        bool no_stuck = n == c.length;
        Eigen::VectorXd h = f.B.col(0);
        // E[T 1{finish}] = sum_k N_ik h_k: expected visits to k times finishing from k.
        Eigen::VectorXd g = f.N * h;
        Eigen::VectorXd k = f.N * (2 * g - h);
        for (int i = 0; i < n; ++i) {
            const int s = f.squares[i];
            CHECK(m.h[s] == Approx(h[i]).margin(1e-12));
            CHECK(m.g[s] == Approx(g[i]).epsilon(1e-10));
            CHECK(m.k[s] == Approx(k[i]).epsilon(1e-9));
            if (no_stuck) {
                CHECK(h[i] == Approx(1.0).margin(1e-12));
                CHECK(m.g[s] == Approx(f.t[i]).epsilon(1e-10));
                Eigen::VectorXd second = (2 * f.N - Eigen::MatrixXd::Identity(n, n)) * f.t;
                CHECK(m.k[s] == Approx(second[i]).epsilon(1e-9));
            }
        }
        // Squares outside the transient set finish with probability 0.
        for (int s = 0; s < c.length; ++s)
            if (c.stuck[s]) CHECK(m.h[s] == 0.0);
        // profile() reports the same numbers from square 0.
        Profile p = profile(c, ProfileSettings{.quantiles = {}});
        if (!c.stuck[0]) {
            CHECK(p.p_finish == Approx(h[0]).margin(1e-12));
            CHECK(p.mean_turns_given_finish == Approx(g[0] / h[0]).epsilon(1e-10));
            CHECK(p.sd_turns_given_finish ==
                  Approx(std::sqrt(k[0] / h[0] - (g[0] / h[0]) * (g[0] / h[0]))).epsilon(1e-8));
        }
    }
}

TEST_CASE("moments from the linear solve agree with the series summed to convergence", "[chain]") {
    std::vector<BoardCase> cases{
        {"1d6", 100, Overshoot::stay, {}},
        {"2d6", 100, Overshoot::stay, {}},
        {"3d6", 73, Overshoot::stay, {{20, 50}, {60, 11}}},
        {"1d6+[0,2]", 60, Overshoot::bounce, {{7, 19}, {44, 28}}},
        {"{1:3,5:1}", 50, Overshoot::pass, {{49, 0}}},
    };
    for (const auto& cs : cases) {
        INFO(cs.spec << " on " << cs.length);
        Chain c = chain_of(cs.spec, cs.length, cs.rule, cs.jumps);
        Moments m = solve_moments(c);
        Series se(c);
        long double m1 = 0, m2 = 0;
        while (se.alive() > 1e-17L && se.turn() < 200000) {
            long double f = se.step();
            long double t = se.turn();
            m1 += t * f;
            m2 += t * t * f;
        }
        REQUIRE(se.alive() <= 1e-17L);
        CHECK(static_cast<double>(se.finished()) == Approx(m.h[0]).margin(1e-12));
        CHECK(static_cast<double>(se.stuck()) == Approx(1 - m.h[0]).margin(1e-12));
        CHECK(static_cast<double>(m1) == Approx(m.g[0]).epsilon(1e-11));
        CHECK(static_cast<double>(m2) == Approx(m.k[0]).epsilon(1e-10));
        // The series' mass is conserved within its own rounding bound.
        CHECK(std::fabs(static_cast<double>(se.finished() + se.stuck() + se.alive() - 1)) <=
              static_cast<double>(se.rounding_bound()) + 1e-18);
    }
}

TEST_CASE("the series' plain block (a convolution, then jumps) equals a step by the merged rows", "[chain]") {
    // The reference multiplies by the chain's rows one square at a time, in long
    // double: the transition matrix itself, independent of the plain block.
    std::vector<BoardCase> cases{
        {"1d6", 100, Overshoot::bounce, {{4, 25}, {21, 42}, {36, 6}, {51, 67}, {62, 19}, {87, 24}}},
        {"1d20", 100, Overshoot::bounce, {{4, 25}, {21, 42}, {36, 6}, {51, 67}, {62, 19}, {87, 24}}},
        {"2d6", 90, Overshoot::stay, {{10, 12}, {30, 90}, {50, 5}}},  // a jump two squares on, one to the finish
        {"1d6+[0,2]", 60, Overshoot::stay, {{7, 19}, {44, 28}}},     // moves of 0
        {"{2:1,4:1}", 41, Overshoot::stay, {}},                      // odd squares never reached; stuck at 1 from the end
        {"{1:3,5:1}", 50, Overshoot::pass, {{49, 0}, {20, 3}}},
    };
    for (const auto& cs : cases) {
        INFO(cs.spec << " on " << cs.length);
        const Chain c = chain_of(cs.spec, cs.length, cs.rule, cs.jumps);
        const int n = c.length;
        std::vector<long double> v(n, 0), next(n, 0);
        v[c.start] = 1;
        long double finished = 0, stuck = 0;
        FastSeries fast(c);
        Series precise(c);
        for (int t = 1; t <= 400; ++t) {
            std::fill(next.begin(), next.end(), 0.0L);
            long double f = 0;
            for (int s = 0; s < n; ++s)
                for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k) {
                    const long double x = v[s] * c.prob[k];
                    if (c.dest[k] == n)
                        f += x;
                    else if (c.stuck[c.dest[k]])
                        stuck += x;
                    else
                        next[c.dest[k]] += x;
                }
            std::swap(v, next);
            finished += f;
            const long double ff = fast.step(), fp = precise.step();
            CHECK(std::fabs(static_cast<double>(ff - f)) <= static_cast<double>(fast.rounding_bound()) + 1e-18);
            CHECK(std::fabs(static_cast<double>(fp - f)) <= static_cast<double>(precise.rounding_bound()) + 1e-18);
            CHECK(std::fabs(static_cast<double>(fast.stuck() - stuck)) <=
                  static_cast<double>(fast.rounding_bound()) + 1e-18);
            long double diff = 0;  // the whole distribution, in the 1-norm
            for (int s = 0; s < n; ++s) diff += std::fabs(precise.mass()[s] - v[s]);
            CHECK(static_cast<double>(diff) <= static_cast<double>(precise.rounding_bound()) + 1e-18);
        }
        CHECK(static_cast<double>(fast.finished()) == Approx(static_cast<double>(finished)).margin(1e-13));
    }
}

// ---------------------------------------------------------------- profile

TEST_CASE("profile: median, quantiles and nulls", "[chain]") {
    // One d6 on 6 squares is geometric(1/6): P(T <= t) = 1 - (5/6)^t, so the
    // median is 4 (0.518) and the 0.9 quantile 13 (0.906), by direct arithmetic.
    Profile p = profile(chain_of("1d6", 6), ProfileSettings{.quantiles = {0.5, 0.9}});
    REQUIRE(p.quantiles.size() == 2);
    CHECK(p.quantiles[0].turns == 4);
    CHECK(p.quantiles[1].turns == 13);
    CHECK(p.mean_turns_given_finish == Approx(6.0));
    // A constant 3 on 10 squares never finishes: median null, mean NaN.
    Profile never = profile(chain_of("3", 10));
    CHECK(never.p_finish == 0.0);
    CHECK_FALSE(never.quantiles[0].turns.has_value());
    CHECK(std::isnan(never.mean_turns_given_finish));
    // 4d6 finishes with probability below 1/2 on a long board: median null.
    Profile four = profile(chain_of("4d6", 300));
    CHECK(four.p_finish < 0.5);
    CHECK_FALSE(four.quantiles[0].turns.has_value());
}

TEST_CASE("listed distribution adds up with its closing rows", "[chain]") {
    Chain c = chain_of("2d6", 50);
    Distribution d = distribution(c, 1e-12, 100000);
    REQUIRE_FALSE(d.row_cap_hit);
    long double total = d.remaining_finish + d.never;
    for (const auto& r : d.rows) total += r.p;
    CHECK(static_cast<double>(total) == Approx(1.0).margin(1e-12));
    CHECK(d.remaining_finish < 1e-12L);
    CHECK(static_cast<double>(d.never) == Approx(1 - solve_moments(c).h[0]).margin(1e-14));
    CHECK(static_cast<double>(d.rows.back().cumulative + d.remaining_finish + d.never) == Approx(1.0).margin(1e-12));
    Distribution capped = distribution(c, 1e-12, 5);
    CHECK(capped.row_cap_hit);
    CHECK(capped.rows.size() == 5);
}

TEST_CASE("spinners 1..n on 100 squares: n = 13 gives the fewest expected turns", "[chain]") {
    // Fact of the trade, no published source (re-derived here: rule stay).
    int best = 0;
    double best_mean = 1e300;
    for (int n = 1; n <= 40; ++n) {
        Profile p = profile(chain_of(("d" + std::to_string(n)).c_str(), 100), ProfileSettings{.quantiles = {}});
        CHECK(p.p_finish == Approx(1.0).margin(1e-12));
        if (p.mean_turns_given_finish < best_mean) {
            best_mean = p.mean_turns_given_finish;
            best = n;
        }
    }
    CHECK(best == 13);
}

TEST_CASE("P(finish) with k dice approaches 1/H_k (a conjecture, checked loosely)", "[chain]") {
    // Conjecture, fact of the trade with no published source and no proof: as the
    // sides and the length grow, P(finish) of kdS tends to 1/H_k (H_k the k-th
    // harmonic number): 1, 2/3, 6/11. Numerical check only, tolerance 2e-3, and
    // the gap must shrink as the dice grow.
    struct Case {
        int k;
        double limit;
    };
    for (Case cs : {Case{1, 1.0}, Case{2, 2.0 / 3}, Case{3, 6.0 / 11}}) {
        double previous_gap = 1;
        for (int sides : {6, 12, 20}) {
            const int length = 25 * sides * cs.k;
            Chain c = chain_of((std::to_string(cs.k) + "d" + std::to_string(sides)).c_str(), length);
            double p = solve_moments(c).h[0];
            double gap = std::fabs(p - cs.limit);
            INFO(cs.k << "d" << sides << " on " << length << ": P(finish) " << p << " vs " << cs.limit);
            CHECK(gap <= previous_gap + 1e-12);
            previous_gap = gap;
        }
        CHECK(previous_gap < 2e-3);
    }
}

TEST_CASE("a chain too large for the memory cap is refused before allocating", "[chain]") {
    const auto saved = limits::memory_bytes();
    limits::set_memory_bytes(std::uint64_t{1} << 20);
    Board b = make_board(200000, Overshoot::stay, {});
    Option o = parse_option("1d6");
    CHECK(chain_memory_estimate(b, o) > (std::uint64_t{1} << 20));
    CHECK_THROWS_AS(build_chain(b, o), LimitError);
    limits::set_memory_bytes(saved);
    CHECK_NOTHROW(build_chain(make_board(1000, Overshoot::stay, {}), o));
}

TEST_CASE("a heavy tail: moves of 1 with probability 1/100000 on 10 squares", "[chain]") {
    // Handbook closed form: T is a sum of r = 10 geometric(p = 1e-5) waits, a
    // negative binomial: mean r/p, variance r(1-p)/p^2, and P(T <= t) =
    // P(Binomial(t, p) >= r). The series must reach the median (near 9.7e5
    // turns) without a step cap deciding it.
    Chain c = chain_of("{0:99999,1:1}", 10);
    Profile p = profile(c);
    const double r = 10, q = 1e-5;
    CHECK(p.p_finish == Approx(1.0).margin(1e-12));
    CHECK(p.mean_turns_given_finish == Approx(r / q).epsilon(1e-9));
    CHECK(p.sd_turns_given_finish == Approx(std::sqrt(r * (1 - q)) / q).epsilon(1e-8));
    auto cdf = [&](long long t) {
        // P(Binomial(t, q) >= 10) = 1 - sum_{k<10} C(t,k) q^k (1-q)^(t-k), in logs.
        long double below = 0;
        for (int k = 0; k < 10; ++k)
            below += std::exp(std::lgamma(t + 1.0L) - std::lgamma(k + 1.0L) - std::lgamma(t - k + 1.0L) +
                              k * std::log(static_cast<long double>(q)) + (t - k) * std::log1p(-static_cast<long double>(q)));
        return 1 - below;
    };
    REQUIRE(p.quantiles.at(0).turns.has_value());
    const long long median = *p.quantiles[0].turns;
    CHECK(cdf(median) >= 0.5L);
    CHECK(cdf(median - 1) < 0.5L);
}
