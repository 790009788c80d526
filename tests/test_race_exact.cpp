// Tests of src/race/exact: exact duel fractions. Cross-checks: a handbook
// closed form (geometric series), the floating-point engine's proven
// intervals on random boards, and the independent modular formulation of
// src/certify/modular. The comparison with Python's fractions module is in
// tests/scripts/check_exact_fractions.py.
#include <catch2/catch.hpp>

#include <random>

#include "certify/modular.hpp"
#include "chain/chain.hpp"
#include "core/error.hpp"
#include "race/duel.hpp"
#include "core/fraction.hpp"
#include "race/exact.hpp"

using namespace overshoot;

namespace {

ExactDuel exact_on(const Board& b, const char* x, const char* y, Order order) {
    return exact_duel(build_chain(b, parse_option(x)), build_chain(b, parse_option(y)), order);
}

bool reduced(const mpq_class& q) {
    mpz_class g;
    mpz_gcd(g.get_mpz_t(), q.get_num().get_mpz_t(), q.get_den().get_mpz_t());
    return g == 1 && q.get_den() > 0;
}

bool inside(const mpq_class& q, long double p, long double bound) {
    // Compare exactly: the interval ends as exact rationals, widened one ulp of
    // double for the conversion from long double.
    const double lo = std::nextafter(static_cast<double>(p - bound), -HUGE_VAL);
    const double hi = std::nextafter(static_cast<double>(p + bound), HUGE_VAL);
    return q >= mpq_class(lo) && q <= mpq_class(hi);
}

}  // namespace

TEST_CASE("exact duel on one square matches the geometric series", "[exact]") {
    // Handbook closed form (geometric series): two 1d6 pieces on a 1-square
    // stay board each finish with probability p = 1/6 per round, so
    // P(A wins) = p q / (1 - q^2) = 5/11 and P(tie) = p^2 / (1 - q^2) = 1/11, q = 5/6.
    Board b = make_board(1, Overshoot::stay, {});
    ExactDuel e = exact_on(b, "1d6", "1d6", Order::simultaneous);
    CHECK(e.p_a_wins == mpq_class(5, 11));
    CHECK(e.p_b_wins == mpq_class(5, 11));
    CHECK(e.p_tie == mpq_class(1, 11));
    CHECK(e.p_neither == 0);
    // A moving first: A wins at round t with q^(2t-2) p, so P = p / (1 - q^2) = 6/11.
    ExactDuel f = exact_on(b, "1d6", "1d6", Order::a_first);
    CHECK(f.p_a_wins == mpq_class(6, 11));
    CHECK(f.p_b_wins == mpq_class(5, 11));
    // Coin: the mean of the two alternating orders, 1/2 each by symmetry.
    ExactDuel g = exact_on(b, "1d6", "1d6", Order::coin);
    CHECK(g.p_a_wins == mpq_class(1, 2));
}

TEST_CASE("exact duels with pieces that can never finish", "[exact]") {
    // 2d6 at distance 1 never moves (stay rule): from square N-1 nobody finishes.
    // On a 1-square board both start there: P(neither) = 1 (common practice, no published source).
    Board b = make_board(1, Overshoot::stay, {});
    ExactDuel e = exact_on(b, "2d6", "2d6", Order::simultaneous);
    CHECK(e.p_neither == 1);
    CHECK(e.p_a_wins == 0);
    // 1d6 against it: 1d6 finishes surely (probability 1/6 per round, forever), 2d6 never.
    ExactDuel f = exact_on(b, "1d6", "2d6", Order::simultaneous);
    CHECK(f.p_a_wins == 1);
}

TEST_CASE("exact fractions lie inside the proven intervals on random boards", "[exact]") {
    // Source: the floating-point engine's proven bound (race/duel.hpp); an
    // independent algorithm (series / pair programme in floating point).
    std::mt19937 rng(20261201);
    const char* specs[] = {"1d6", "2d6", "1d4", "2d4", "3d4", "{0:1,1:2,4:1}", "[1,1,3]", "d8", "1d3+1"};
    const Overshoot rules[] = {Overshoot::stay, Overshoot::pass};
    const Order orders[] = {Order::simultaneous, Order::a_first, Order::b_first, Order::coin};
    for (int round = 0; round < 40; ++round) {
        int n = std::uniform_int_distribution<int>(2, 45)(rng);
        std::vector<Jump> jumps;
        if (n > 6 && rng() % 2) {
            int from = std::uniform_int_distribution<int>(1, n - 3)(rng);
            jumps.push_back({from, std::uniform_int_distribution<int>(from + 1, n)(rng)});
        }
        Board b = make_board(n, rules[rng() % 2], jumps);
        const char* x = specs[rng() % 9];
        const char* y = specs[rng() % 9];
        Order order = orders[rng() % 4];
        Chain ca = build_chain(b, parse_option(x)), cb = build_chain(b, parse_option(y));
        ExactDuel e = exact_duel(ca, cb, order);
        DuelResult r = duel(ca, cb, order);
        INFO(x << " vs " << y << " on " << n << " " << to_string(b.rule) << " " << to_string(order));
        REQUIRE(r.bound_proven);
        CHECK(e.p_a_wins + e.p_b_wins + e.p_tie + e.p_neither == 1);
        CHECK(reduced(e.p_a_wins));
        CHECK(reduced(e.p_tie));
        CHECK(inside(e.p_a_wins, r.p_a_wins, r.bound));
        CHECK(inside(e.p_b_wins, r.p_b_wins, r.bound));
        CHECK(inside(e.p_tie, r.p_tie, r.bound));
        CHECK(inside(e.p_neither, r.p_neither, r.bound));
        // The one-round modular formulation agrees modulo a prime.
        const std::uint64_t p = next_prime(std::uint64_t{1} << 60);
        auto m = modular_duel(ca, cb, order, p);
        REQUIRE(m);
        auto res = [&](const mpq_class& q) {
            mpz_class num = q.get_num() % mpz_class(static_cast<unsigned long>(p));
            if (num < 0) num += static_cast<unsigned long>(p);
            mpz_class den = q.get_den() % mpz_class(static_cast<unsigned long>(p));
            mpz_class inv;
            mpz_invert(inv.get_mpz_t(), den.get_mpz_t(), mpz_class(static_cast<unsigned long>(p)).get_mpz_t());
            return static_cast<std::uint64_t>(mpz_class(num * inv % static_cast<unsigned long>(p)).get_ui());
        };
        CHECK(res(e.p_a_wins) == (*m)[0]);
        CHECK(res(e.p_b_wins) == (*m)[1]);
        CHECK(res(e.p_tie) == (*m)[2]);
    }
}

TEST_CASE("exact elimination on small boards where pieces move backward", "[exact]") {
    // Source: the floating-point series (proven bound) on bounce boards with
    // backward jumps; the exact elimination must fall inside its interval.
    std::mt19937 rng(7);
    for (int round = 0; round < 8; ++round) {
        int n = std::uniform_int_distribution<int>(3, exact_elimination_max_squares)(rng);
        Board b = make_board(n, Overshoot::bounce, {{n - 1, 1}});
        Chain ca = build_chain(b, parse_option("1d4")), cb = build_chain(b, parse_option("2d3"));
        Order order = round % 2 ? Order::simultaneous : Order::a_first;
        ExactDuel e = exact_duel(ca, cb, order);
        CHECK(e.method == ExactMethod::elimination);
        DuelSettings s;
        s.method = DuelMethod::series;
        DuelResult r = duel(ca, cb, order, s);
        INFO("length " << n);
        CHECK(inside(e.p_a_wins, r.p_a_wins, r.bound));
        CHECK(inside(e.p_b_wins, r.p_b_wins, r.bound));
        CHECK(inside(e.p_tie, r.p_tie, r.bound));
        auto m = modular_duel(ca, cb, order, next_prime(std::uint64_t{1} << 59));
        REQUIRE(m);
    }
}

TEST_CASE("exact mode refuses large boards where pieces move backward, naming the way out", "[exact]") {
    Board b = make_board(40, Overshoot::bounce, {});
    Chain ca = build_chain(b, parse_option("1d6")), cb = build_chain(b, parse_option("2d6"));
    CHECK_FALSE(exact_refusal(ca, cb).empty());
    CHECK_THROWS_AS(exact_duel(ca, cb, Order::simultaneous), LimitError);
    CHECK_THROWS_WITH(exact_duel(ca, cb, Order::simultaneous), Catch::Contains("proven error bound"));
}

TEST_CASE("fractions and decimals are written and read exactly", "[exact]") {
    mpq_class half(2, 4);
    half.canonicalize();
    CHECK(fraction_string(half) == "1/2");
    CHECK(fraction_string(mpq_class(0)) == "0/1");
    CHECK(decimal_string(mpq_class(1, 3), 6) == "0.333333");
    CHECK(decimal_string(mpq_class(2, 3), 6) == "0.666667");
    CHECK(decimal_string(mpq_class(1, 8), 2) == "0.13");  // ties away from zero
    CHECK(decimal_string(mpq_class(-1, 8), 2) == "-0.13");
    CHECK(decimal_string(mpq_class(-1, 1000), 2) == "0.00");
    CHECK(decimal_string(mpq_class(1), 6) == "1.000000");
    mpq_class q = parse_fraction("-12/34", "x");
    CHECK(fraction_string(q) == "-12/34");  // read as written; reducing is the caller's choice
    q.canonicalize();
    CHECK(q == mpq_class(-6, 17));
    CHECK_THROWS_AS(parse_fraction("1/0", "x"), InputError);
    CHECK_THROWS_AS(parse_fraction("1.5", "x"), InputError);
    CHECK_THROWS_AS(parse_fraction("/3", "x"), InputError);
}

TEST_CASE("exact 1d6 against 2d6 on 100 squares agrees with the float engine", "[exact]") {
    // The fraction itself is compared with Python's fractions in
    // tests/scripts/check_exact_fractions.py (numerator and denominator); the
    // decimal below is that reference value rounded to 6 places.
    Board b = make_board(100, Overshoot::stay, {});
    ExactDuel e = exact_on(b, "1d6", "2d6", Order::simultaneous);
    CHECK(e.p_neither == 0);
    CHECK(e.margin() > 0);
    CHECK(decimal_string(e.p_a_wins, 6) == "0.511864");
}

TEST_CASE("exact matrix of a few options equals the single exact duels", "[exact]") {
    Board b = make_board(30, Overshoot::stay, {{4, 9}});
    std::vector<Chain> cs;
    for (const char* s : {"1d6", "2d6", "1d4+1"}) cs.push_back(build_chain(b, parse_option(s)));
    for (Order order : {Order::simultaneous, Order::a_first}) {
        auto m = exact_matrix(cs, order, 2);
        for (std::size_t i = 0; i < 3; ++i)
            for (std::size_t j = 0; j < 3; ++j) {
                if (i == j) {
                    CHECK_FALSE(m[i * 3 + j].has_value());
                    continue;
                }
                REQUIRE(m[i * 3 + j].has_value());
                ExactDuel e = exact_duel(cs[i], cs[j], order);
                CHECK(m[i * 3 + j]->p_a_wins == e.p_a_wins);
                CHECK(m[i * 3 + j]->p_b_wins == e.p_b_wins);
            }
    }
}
