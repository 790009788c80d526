// Tests of src/chain/free_walk.* and of the pieces it joins: the distribution
// of a sum of moves by powering against plain turn-by-turn convolution, the
// Chernoff tails against exact tails, the chain-free absorption against the
// chain's, a series started from a given turn against one stepped from 0.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "chain/absorption.hpp"
#include "chain/chain.hpp"
#include "chain/free_walk.hpp"
#include "chain/series.hpp"
#include "core/board.hpp"
#include "core/option.hpp"

using namespace overshoot;

namespace {

// P(S_t = k) for k = 0..t max_move by t plain convolutions in long double
// (an independent computation: no powering, no trimming).
std::vector<long double> plain_walk(const Option& o, int t) {
    std::vector<long double> v{1.0L};
    for (int i = 0; i < t; ++i) {
        std::vector<long double> w(v.size() + o.max_move(), 0.0L);
        for (std::size_t k = 0; k < v.size(); ++k)
            for (int m = 0; m <= o.max_move(); ++m) w[k + m] += v[k] * o.probability(m);
        v.swap(w);
    }
    return v;
}

const char* const kSpecs[] = {"1d6", "2d6", "3d6", "1d4+1d8", "[0,1,3]", "{2:1,5:3}", "1d20"};

}  // namespace

TEST_CASE("free walk: powering agrees with plain convolution within its bound", "[chain][free-walk]") {
    for (const char* spec : kSpecs) {
        const Option o = parse_option(spec);
        for (int t : {1, 2, 3, 7, 64, 100, 333, 1000}) {
            CAPTURE(spec, t);
            const WalkMass w = walk_mass(o, t, 1e-25);
            const auto exact = plain_walk(o, t);
            long double dist = 0, total = 0;
            for (std::size_t k = 0; k < exact.size(); ++k) {
                const long long i = static_cast<long long>(k) - w.low;
                const long double got = i >= 0 && i < static_cast<long long>(w.mass.size()) ? w.mass[i] : 0.0L;
                dist += std::fabs(got - exact[k]);
                total += got;
            }
            CHECK(dist <= w.error + 1e-17L);  // the long double reference is itself rounded
            CHECK(w.error < 1e-11L);
            CHECK(std::fabs(total - 1) <= w.error + 1e-15L);
            // In long double the bound is about 2^11 times narrower.
            const auto wl = walk_mass<long double>(o, t, 1e-25);
            long double dist_l = 0;
            for (std::size_t k = 0; k < exact.size(); ++k) {
                const long long i = static_cast<long long>(k) - wl.low;
                const long double got = i >= 0 && i < static_cast<long long>(wl.mass.size()) ? wl.mass[i] : 0.0L;
                dist_l += std::fabs(got - exact[k]);
            }
            // The reference: t plain convolutions, each exact to gamma_{m+2} in the 1-norm.
            CHECK(dist_l <= wl.error + t * (o.max_move() + 3) * 5.5e-20L);
            CHECK(wl.error < 1e-14L);
        }
    }
}

TEST_CASE("free walk: Chernoff tails bound the exact tails and are not trivial", "[chain][free-walk]") {
    // The bound P(S >= d) <= exp(t K(theta) - theta d) for every theta >= 0 is
    // Chernoff's (Annals of Mathematical Statistics, 1952; cited from memory).
    for (const char* spec : kSpecs) {
        const Option o = parse_option(spec);
        for (int t : {1, 5, 40, 300}) {
            const auto exact = plain_walk(o, t);
            std::vector<long double> above(exact.size() + 1, 0.0L);  // above[k] = P(S >= k)
            for (int k = static_cast<int>(exact.size()) - 1; k >= 0; --k) above[k] = above[k + 1] + exact[k];
            for (std::size_t d = 0; d <= exact.size(); ++d) {
                CAPTURE(spec, t, d);
                const long double up = walk_at_least(o, t, static_cast<long long>(d));
                const long double down = walk_below(o, t, static_cast<long long>(d));
                CHECK(above[d] <= up * (1 + 1e-12L) + 1e-30L);
                CHECK(1 - above[d] <= down * (1 + 1e-12L) + 1e-15L);
                CHECK(up <= 1);
                CHECK(down <= 1);
            }
        }
    }
    // Far out the bound is tiny: 1000 rolls of 1d6 summing to 4500 or more.
    CHECK(walk_at_least(parse_option("1d6"), 1000, 4500) < 1e-30L);
    CHECK(walk_below(parse_option("1d6"), 1000, 2500) < 1e-30L);
}

TEST_CASE("free walk: the turn searches are the last and first turns of their bound", "[chain][free-walk]") {
    const Option o = parse_option("2d6");
    const auto last = last_turn_short_of(o, 10000, 1e-16L);
    REQUIRE(last);
    CHECK(walk_at_least(o, *last, 10000) <= 1e-16L);
    CHECK(walk_at_least(o, *last + 1, 10000) > 1e-16L);
    const auto first = first_turn_past(o, 10000, 1e-16L);
    REQUIRE(first);
    CHECK(walk_below(o, *first, 10000) <= 1e-16L);
    CHECK(walk_below(o, *first - 1, 10000) > 1e-16L);
    CHECK(*last < 10000 / 7);
    CHECK(*first > 10000 / 7);
    CHECK_FALSE(last_turn_short_of(parse_option("{0:1}"), 10, 1e-16L));  // never moves
    CHECK(first_irregular_square(make_board(100, Overshoot::stay, {{10, 20}, {50, 60}}), 10) == 50);
    CHECK(first_irregular_square(make_board(100, Overshoot::stay, {}), 0) == 100);
}

TEST_CASE("absorption from a start, chain-free, agrees with the chain's backward pass", "[chain][free-walk]") {
    struct Case {
        int length;
        Overshoot rule;
        std::vector<Jump> jumps;
        int start;
    };
    const Case cases[] = {{300, Overshoot::stay, {}, 0},
                          {300, Overshoot::pass, {}, 0},
                          {400, Overshoot::stay, {{17, 90}, {391, 399}, {250, 300}}, 0},
                          {400, Overshoot::stay, {{391, 395}}, 40},
                          {500, Overshoot::pass, {{497, 500}, {3, 4}}, 3}};
    for (const Case& c : cases) {
        const Board board = make_board(c.length, c.rule, c.jumps);
        for (const char* spec : kSpecs) {
            CAPTURE(c.length, spec, c.start);
            const Option o = parse_option(spec);
            const int start = resolve_start(board, c.start);
            const Chain chain = build_chain(board, o, c.start);
            const Absorption full = forward_absorption(chain);
            const StartAbsorption a = absorption_from(board, o, start);
            const long double h = chain.stuck[start] ? 0.0L : full.h[start];
            CHECK(std::fabs(a.finish - h) <= a.finish_error + 1e-16L);
            CHECK(std::fabs(a.finish + a.stuck - 1) <= a.finish_error + a.stuck_error + 1e-18L);
            CHECK(std::fabs(a.time - static_cast<double>(full.g[start])) <=
                  1e-9 * (1 + static_cast<double>(full.g[start])));
            CHECK(a.finish_error < 1e-15L);
            CHECK((a.stuck == 0) == (certain_to_finish(chain)[start] == 1));
        }
    }
}

TEST_CASE("a series started from a later turn continues the series stepped from 0", "[chain][free-walk]") {
    const Board board = make_board(500, Overshoot::stay, {{480, 490}});
    for (const char* spec : {"1d6", "2d6", "[0,1,3]"}) {
        CAPTURE(spec);
        const Option o = parse_option(spec);
        const Chain c = build_chain(board, o, 0);
        Series from0(c);
        for (int t = 0; t < 40; ++t) from0.step();
        std::vector<long double> mass(from0.mass().begin() + from0.low(), from0.mass().begin() + from0.high() + 1);
        Series later(c, mass, from0.low(), 40, from0.rounding_bound());
        CHECK(later.turn() == 40);
        CHECK(std::fabs(later.alive() - from0.alive()) <= 1e-18L);
        const long double before = from0.finished(), stuck_before = from0.stuck();
        for (int t = 0; t < 300; ++t) {
            from0.step();
            later.step();
        }
        CHECK(std::fabs((later.finished() + before) - from0.finished()) <=
              later.rounding_bound() + from0.rounding_bound());
        CHECK(std::fabs(later.stuck() + stuck_before - from0.stuck()) <= later.rounding_bound() + from0.rounding_bound());
    }
}

TEST_CASE("first turn at a level: the jumped walk finds the turn the plain series finds", "[chain][free-walk]") {
    for (const char* spec : {"1d6", "2d6", "1d4+1d8"}) {
        for (int length : {3000, 12000}) {
            const Board board = make_board(length, Overshoot::stay, {{length - 5, length - 2}});
            const Option o = parse_option(spec);
            const Chain c = build_chain(board, o, 0);
            for (long double level : {0.1L, 0.3L, 0.5L}) {
                CAPTURE(spec, length, level);
                FastSeries s(c);
                while (s.finished() < level) s.step();
                const LevelTurn got = first_turn_at_level(board, o, 0, level, 1e-15L, 1'000'000'000ULL);
                REQUIRE(got.resolved);
                REQUIRE(got.turn);
                CHECK(*got.turn == s.turn());
            }
            // A level above P(finish) is never reached.
            const LevelTurn never = first_turn_at_level(board, o, 0, 0.999L, 1e-15L, 1'000'000'000ULL);
            if (forward_absorption(c).h[0] < 0.99L) {
                CHECK(never.resolved);
                CHECK_FALSE(never.turn);
            }
        }
    }
}
