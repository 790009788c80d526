// Races of several pieces, choice games and balancing ([multi]).
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <map>

#include "chain/chain.hpp"
#include "core/error.hpp"
#include "core/option.hpp"
#include "race/choice.hpp"
#include "race/duel.hpp"
#include "race/multi.hpp"
#include "render/multi.hpp"
#include "sweep/balance.hpp"

using namespace overshoot;

namespace {

struct Pieces {
    Board board;
    std::vector<Chain> chains;
    std::vector<const Chain*> ptr;
    Pieces(Board b, const std::vector<std::string>& specs) : board(std::move(b)) {
        for (const auto& s : specs) chains.push_back(build_chain(board, parse_option(s)));
        for (const auto& c : chains) ptr.push_back(&c);
    }
};

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
        INFO(c.k << " x " << c.spec << " on " << c.length << " method " << r.method);
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
        CHECK(a.method == "series+zone");
        CHECK(b.method == "series");
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

// Balance: the reported assignment is verified by re-running the race, and a
// brute-force search over every assignment on a small board finds none fairer.
TEST_CASE("head starts: verified and not beaten by brute force", "[multi]") {
    for (RaceOrder order : {RaceOrder::simultaneous, RaceOrder::seated}) {
        Pieces p(make_board(24, Overshoot::stay, {{6, 13}}), {"1d6", "2d6", "3d4"});
        RaceCache cache(p.board, p.ptr, order);
        HeadStartResult h = balance_starts(cache, 3, 0, 9, 3);
        REQUIRE(!h.best.empty());
        const StartAssignment& best = h.best.front();
        std::vector<int> resolved;
        for (int s : best.starts) resolved.push_back(resolve_start(p.board, s));
        RaceResult again = race(p.ptr, resolved, order);
        CHECK(std::fabs(static_cast<double>(deviation(again) - best.deviation)) <= static_cast<double>(2 * (again.bound + best.race.bound)) + 1e-15);
        long double brute = 1;
        std::vector<int> arg;
        for (int a = 0; a <= 9; ++a)
            for (int b = 0; b <= 9; ++b)
                for (int c = 0; c <= 9; ++c) {
                    if (p.board.resolve[a] >= 24 || p.board.resolve[b] >= 24 || p.board.resolve[c] >= 24) continue;
                    RaceResult r = race(p.ptr, {p.board.resolve[a], p.board.resolve[b], p.board.resolve[c]}, order);
                    const long double dv = deviation(r);
                    if (dv < brute) {
                        brute = dv;
                        arg = {a, b, c};
                    }
                }
        INFO("order " << to_string(order) << " brute force best " << arg[0] << "," << arg[1] << "," << arg[2]);
        CHECK(best.deviation <= brute + 1e-12L);
        CHECK(best.deviation <= h.from_zero.deviation);
        // The pruned search and the unpruned one agree.
        RaceCache cache2(p.board, p.ptr, order);
        HeadStartResult u = balance_starts(cache2, 3, 0, 9, 3, false);
        CHECK(u.pruned == 0);
        CHECK(u.best.front().starts == best.starts);
    }
}

TEST_CASE("fairest lengths and single jumps", "[multi]") {
    std::vector<Option> opts{parse_option("1d6"), parse_option("2d6"), parse_option("3d6")};
    Board base = make_board(20, Overshoot::stay, {});
    LengthsResult l = balance_lengths(base, opts, RaceOrder::simultaneous, 10, 30, 3);
    REQUIRE(l.lengths.size() == 21);
    for (const auto& x : l.lengths) CHECK(l.lengths[l.fairest[0]].deviation <= x.deviation);
    // The reported length re-raced from scratch.
    const int len = l.lengths[l.fairest[0]].length;
    Pieces p(make_board(len, Overshoot::stay, {}), {"1d6", "2d6", "3d6"});
    CHECK(std::fabs(static_cast<double>(deviation(race(p.ptr, {}, RaceOrder::simultaneous)) - l.lengths[l.fairest[0]].deviation)) < 1e-13);

    Board small = make_board(12, Overshoot::stay, {});
    std::vector<Option> two{parse_option("1d6"), parse_option("2d6")};
    JumpSearchResult j = search_jumps(small, two, RaceOrder::simultaneous, 4);
    REQUIRE(!j.fairest.empty());
    // Brute force over every jump: none is fairer than the reported one, and
    // its board re-raced gives the same deviation.
    long double brute = 1;
    for (int from = 1; from < 12; ++from)
        for (int to = 0; to <= 12; ++to) {
            if (to == from) continue;
            Pieces q(make_board(12, Overshoot::stay, {{from, to}}), {"1d6", "2d6"});
            brute = std::min(brute, deviation(race(q.ptr, {}, RaceOrder::simultaneous)));
        }
    CHECK(j.fairest.front().deviation <= brute + 1e-12L);
    Pieces q(make_board(12, Overshoot::stay, {j.fairest.front().jump}), {"1d6", "2d6"});
    CHECK(std::fabs(static_cast<double>(deviation(race(q.ptr, {}, RaceOrder::simultaneous)) - j.fairest.front().deviation)) < 1e-13);
    for (std::size_t i = 1; i < j.fairest.size(); ++i) CHECK(j.fairest[i - 1].deviation <= j.fairest[i].deviation);
    CHECK(j.tried == 11 * 12);
    if (j.dominant_before)
        for (const auto& c : j.removing_dominant) CHECK(!c.dominant);
    CHECK_THROWS_AS(search_jumps(make_board(81, Overshoot::stay, {}), two, RaceOrder::simultaneous), LimitError);
}
