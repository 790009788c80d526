// Tests of src/race/several_pieces and src/race/choice: races of several
// pieces and choice games ([multi]).
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <map>

#include "chain/chain.hpp"
#include "core/error.hpp"
#include "core/option.hpp"
#include "race/choice.hpp"
#include "race/duel.hpp"
#include "race/several_pieces.hpp"
#include "render/several_pieces.hpp"
#include "race/balance.hpp"

#include "support.hpp"

using namespace overshoot;

namespace {

using testing::Pieces;

long double wins_total(const RaceResult& r) {
    long double s = 0;
    for (long double p : r.p_wins) s += p;
    return s;
}

}  // namespace

// Consistency with the engine: a race of two pieces is a duel (duel(), the
// two-piece engine with its own methods), simultaneous <-> simultaneous and
// seated <-> a-first.
TEST_CASE("two-piece races equal duels", "[multi]") {
    struct Case {
        int length;
        Overshoot rule;
        std::vector<Jump> jumps;
        const char* a;
        const char* b;
    };
    const std::vector<Case> cases{
        {30, Overshoot::stay, {}, "1d6", "2d6"},
        {80, Overshoot::stay, {}, "5d12", "1d6"},   // heavy tail: needs the end-zone closure
        {45, Overshoot::pass, {{7, 19}, {30, 41}}, "3d4", "[0,1,5]"},
        {25, Overshoot::bounce, {{20, 4}}, "1d6", "2d6"},
        {40, Overshoot::stay, {{33, 12}}, "{1:3,4:1}", "2d3"},
    };
    for (const auto& c : cases) {
        Pieces p(make_board(c.length, c.rule, c.jumps), {c.a, c.b});
        for (RaceOrder order : {RaceOrder::simultaneous, RaceOrder::seated}) {
            INFO(c.a << " vs " << c.b << " on " << c.length << " order " << to_string(order));
            RaceResult r = race(p.ptr, {}, order);
            DuelResult d = duel(p.chains[0], p.chains[1], order == RaceOrder::seated ? Order::a_first : Order::simultaneous);
            const double tol = static_cast<double>(r.bound + d.bound) + 1e-15;
            CHECK(r.target_met);
            CHECK(std::fabs(static_cast<double>(r.p_wins[0] - d.p_a_wins)) <= tol);
            CHECK(std::fabs(static_cast<double>(r.p_wins[1] - d.p_b_wins)) <= tol);
            CHECK(std::fabs(static_cast<double>(r.p_tie - d.p_tie)) <= tol);
            CHECK(std::fabs(static_cast<double>(r.p_neither - d.p_neither)) <= tol + 1e-14);
        }
    }
}

// Symmetry (common practice, no published source): k identical options in
// simultaneous order each win with probability (1 - P(tie) - P(neither)) / k.
TEST_CASE("identical pieces share the wins equally", "[multi]") {
    struct Case {
        int length;
        const char* spec;
        int k;
    };
    for (const auto& c : std::vector<Case>{{40, "1d6", 3}, {60, "2d6", 4}, {30, "[0,1,3]", 6}, {80, "5d12", 3}, {50, "3d6", 5}}) {
        std::vector<std::string> specs(c.k, c.spec);
        Pieces p(make_board(c.length, Overshoot::stay, {}), specs);
        RaceResult r = race(p.ptr, {}, RaceOrder::simultaneous);
        INFO(c.k << " x " << c.spec << " on " << c.length << " method " << to_string(r.method));
        CHECK(r.target_met);
        const long double share = (1 - r.p_tie - r.p_neither) / c.k;
        for (int i = 0; i < c.k; ++i) CHECK(std::fabs(static_cast<double>(r.p_wins[i] - share)) <= 4 * r.bound + 1e-15);
        // Outcomes partition the space.
        CHECK(std::fabs(static_cast<double>(wins_total(r) + r.p_tie + r.p_neither - 1)) <= 8 * r.bound + 1e-15);
    }
}

// Seated order has no shared finishes, and an earlier seat helps identical
// pieces (it lands first in the round where both could).
TEST_CASE("seated races: no ties, earlier seats ahead", "[multi]") {
    Pieces p(make_board(35, Overshoot::stay, {}), {"1d6", "1d6", "1d6"});
    RaceResult r = race(p.ptr, {}, RaceOrder::seated);
    CHECK(r.p_tie == 0);
    CHECK(r.p_wins[0] > r.p_wins[1]);
    CHECK(r.p_wins[1] > r.p_wins[2]);
    CHECK(std::fabs(static_cast<double>(wins_total(r) + r.p_neither - 1)) <= 8 * r.bound + 1e-15);
}

// The end-zone closure and the plain series are two methods for one race.
TEST_CASE("closure agrees with the plain series", "[multi]") {
    Pieces p(make_board(60, Overshoot::stay, {{9, 21}}), {"3d6", "1d6", "2d4"});
    std::vector<int> starts{0, 4, 2};
    for (RaceOrder order : {RaceOrder::simultaneous, RaceOrder::seated}) {
        RaceResult a = race(p.ptr, starts, order);
        RaceSettings plain;
        plain.allow_closure = false;
        RaceResult b = race(p.ptr, starts, order, plain);
        CHECK(a.method == RaceMethod::series_zone);
        CHECK(b.method == RaceMethod::series);
        for (int i = 0; i < 3; ++i)
            CHECK(std::fabs(static_cast<double>(a.p_wins[i] - b.p_wins[i])) <= static_cast<double>(a.bound + b.bound));
        for (std::size_t m = 0; m < a.p_shared.size(); ++m)
            CHECK(std::fabs(static_cast<double>(a.p_shared[m] - b.p_shared[m])) <= static_cast<double>(a.bound + b.bound));
    }
}

TEST_CASE("races from recorded tracks equal direct races", "[multi]") {
    Pieces p(make_board(50, Overshoot::stay, {}), {"1d6", "2d6", "3d4"});
    RaceCache cache(p.board, p.ptr, RaceOrder::simultaneous);
    RaceResult a = cache.run({0, 1, 2, 1}, {3, 0, 7, 11});
    // The cache answered from the recorded tracks, not by a full race():
    // otherwise this would compare race() with itself.
    REQUIRE(cache.full_races() == 0);
    RaceResult b = race({p.ptr[0], p.ptr[1], p.ptr[2], p.ptr[1]}, {3, 0, 7, 11}, RaceOrder::simultaneous);
    for (int i = 0; i < 4; ++i)
        CHECK(std::fabs(static_cast<double>(a.p_wins[i] - b.p_wins[i])) <= static_cast<double>(a.bound + b.bound));
    CHECK(std::fabs(static_cast<double>(a.p_tie - b.p_tie)) <= static_cast<double>(a.bound + b.bound));
}

TEST_CASE("race input errors", "[multi]") {
    Board b = make_board(20, Overshoot::stay, {{5, 20}});
    std::vector<Chain> c;
    for (int i = 0; i < 7; ++i) c.push_back(build_chain(b, parse_option("1d6")));
    std::vector<const Chain*> seven;
    for (const auto& x : c) seven.push_back(&x);
    CHECK_THROWS_AS(race(seven, {}, RaceOrder::simultaneous), InputError);
    std::vector<const Chain*> one{seven[0]};
    CHECK_THROWS_AS(race(one, {}, RaceOrder::simultaneous), InputError);
    CHECK_THROWS_AS(resolve_start(b, 20), InputError);
    CHECK_THROWS_AS(resolve_start(b, 5), InputError);  // jumps into the finish
    CHECK_THROWS_AS(parse_race_order("a-first"), InputError);
    CHECK(render::unique_names({"1d6", "2d6", "1d6", "1d6"}) == std::vector<std::string>{"1d6", "2d6", "1d6#2", "1d6#3"});
}

// Backward induction checked against a direct search over every pick pair
// (two players), and the symmetric case: identical options give equal chances.
TEST_CASE("choice game by backward induction", "[multi]") {
    Pieces p(make_board(30, Overshoot::stay, {}), {"1d6", "2d6", "3d6", "4d6"});
    RaceCache cache(p.board, p.ptr, RaceOrder::simultaneous);
    ChoiceResult c = solve_choice(cache, 4, 2, false);
    // Independent: player 2 answers each first pick with the best race; player 1
    // takes the first pick whose answered race is best for it.
    int best1 = -1;
    long double v1 = -1;
    std::vector<int> answer(4);
    for (int a = 0; a < 4; ++a) {
        long double best2 = -1;
        for (int b = 0; b < 4; ++b) {
            RaceResult r = race({p.ptr[a], p.ptr[b]}, {}, RaceOrder::simultaneous);
            if (r.p_wins[1] > best2 + 1e-12L) {
                best2 = r.p_wins[1];
                answer[a] = b;
            }
        }
        RaceResult r = race({p.ptr[a], p.ptr[answer[a]]}, {}, RaceOrder::simultaneous);
        if (r.p_wins[0] > v1 + 1e-12L) {
            v1 = r.p_wins[0];
            best1 = a;
        }
    }
    REQUIRE(c.equilibrium.picks.size() == 2);
    CHECK(c.equilibrium.picks[0] == best1);
    CHECK(c.equilibrium.picks[1] == answer[best1]);
    CHECK(std::fabs(static_cast<double>(c.equilibrium.chances[0] - v1)) < 1e-12);
    for (int a = 0; a < 4; ++a) CHECK(c.after_first_pick[a].picks[1] == answer[a]);

    // Distinct picks: nobody repeats an option.
    ChoiceResult d = solve_choice(cache, 4, 3, true);
    auto picks = d.equilibrium.picks;
    std::sort(picks.begin(), picks.end());
    CHECK(std::adjacent_find(picks.begin(), picks.end()) == picks.end());
    CHECK_THROWS_AS(solve_choice(cache, 2, 3, true), InputError);

    // One option only: every player has the same chance (symmetry).
    Pieces q(make_board(25, Overshoot::stay, {}), {"2d6"});
    RaceCache qc(q.board, q.ptr, RaceOrder::simultaneous);
    ChoiceResult e = solve_choice(qc, 1, 3, false);
    CHECK(std::fabs(static_cast<double>(e.equilibrium.chances[0] - e.equilibrium.chances[2])) < 1e-14);
    CHECK(e.last_always_at_least_first);
}
