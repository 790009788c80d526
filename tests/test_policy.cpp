// Tests of src/policy: choosing the option every turn. The outside references
// are in tests/scripts/check_policy_fractions.py (brute-force value iteration
// and exact evaluation, Python fractions) and check_policy_scipy.py (SciPy's
// linear programmes); here: the small matrix games against closed forms, the
// reductions to the ordinary duel, and the consistency of the game.
#include <catch2/catch.hpp>
#include <unistd.h>

#include <cmath>
#include <filesystem>
#include <string>
#include <vector>

#include "chain/absorption.hpp"
#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "core/board.hpp"
#include "core/error.hpp"
#include "core/option.hpp"
#include "policy/alone.hpp"
#include "policy/duel_policy.hpp"
#include "policy/matrix_game.hpp"
#include "race/duel.hpp"
#include "race/exact.hpp"
#include "support.hpp"

using namespace overshoot;

namespace {

constexpr Order kOrders[] = {Order::simultaneous, Order::a_first, Order::b_first, Order::coin};

std::vector<Chain> chains(const Board& b, std::initializer_list<const char*> specs) {
    std::vector<Chain> out;
    for (const char* s : specs) out.push_back(build_chain(b, parse_option(s)));
    return out;
}

}  // namespace

TEST_CASE("policy: matrix games against closed forms", "[policy]") {
    // Matching pennies: value 0, both mix one half each (von Neumann and
    // Morgenstern, 1944, Theory of Games and Economic Behavior; common practice).
    MatrixGameSolution mp = solve_matrix_game(2, 2, {1, -1, -1, 1});
    CHECK(std::fabs(static_cast<double>(mp.value)) < 1e-15);
    CHECK(std::fabs(static_cast<double>(mp.row_mix[0]) - 0.5) < 1e-15);
    CHECK(std::fabs(static_cast<double>(mp.col_mix[1]) - 0.5) < 1e-15);
    // A 2x2 game without a saddle point [[a, b], [c, d]]: value (ad - bc) /
    // (a + d - b - c), row mix (d - c) / (a + d - b - c) (the handbook closed
    // form for 2x2 games; common practice, no published source).
    const long double a = 3, b = -1, c = -2, d = 1;
    MatrixGameSolution g = solve_matrix_game(2, 2, {a, b, c, d});
    CHECK(std::fabs(static_cast<double>(g.value - (a * d - b * c) / (a + d - b - c))) < 1e-15);
    CHECK(std::fabs(static_cast<double>(g.row_mix[0] - (d - c) / (a + d - b - c))) < 1e-15);
    // Rock-paper-scissors: value 0, uniform mix.
    MatrixGameSolution r = solve_matrix_game(3, 3, {0, -1, 1, 1, 0, -1, -1, 1, 0});
    CHECK(std::fabs(static_cast<double>(r.value)) < 1e-15);
    for (int i = 0; i < 3; ++i) CHECK(std::fabs(static_cast<double>(r.row_mix[i]) - 1.0 / 3) < 1e-15);
    // A saddle point at row 1, column 0 (value 2), in a 2x3 game.
    MatrixGameSolution s = solve_matrix_game(2, 3, {1, 5, 0, 2, 3, 4});
    CHECK(static_cast<double>(s.value) == Approx(2).margin(1e-15));
    CHECK(static_cast<double>(s.row_mix[1]) == Approx(1).margin(1e-15));
}

TEST_CASE("policy: a menu of one option is the ordinary duel, exactly", "[policy]") {
    const Board boards[] = {make_board(14, Overshoot::stay, {}), make_board(12, Overshoot::pass, {{3, 7}, {5, 11}})};
    for (const Board& board : boards)
        for (Order order : kOrders) {
            auto a = chains(board, {"2d3"});
            auto b = chains(board, {"1d4"});
            DuelPolicy p = solve_duel_policy(a, b, order, true);
            ExactDuel e = exact_duel(a[0], b[0], order);
            INFO(to_string(order));
            CHECK(p.exact_outcomes.p_a_wins == e.p_a_wins);
            CHECK(p.exact_outcomes.p_b_wins == e.p_b_wins);
            CHECK(p.exact_outcomes.p_tie == e.p_tie);
            CHECK(p.exact_outcomes.p_neither == e.p_neither);
            CHECK(p.exact_value == e.p_a_wins);
            const DuelResult r = duel(a[0], b[0], order, DuelSettings{.want_median = false});
            CHECK(std::fabs(static_cast<double>(p.outcomes.p_a_wins - r.p_a_wins)) <=
                  static_cast<double>(p.outcomes.bound + r.bound));
            CHECK(std::fabs(static_cast<double>(p.outcomes.p_neither - r.p_neither)) <=
                  static_cast<double>(p.outcomes.bound + r.bound));
        }
}

TEST_CASE("policy: a menu holding the opponent's option never does worse than the mirror duel", "[policy]") {
    const Board board = make_board(20, Overshoot::stay, {{4, 9}});
    for (const char* opp : {"1d6", "2d6", "2d3"}) {
        for (Order order : kOrders) {
            auto menu = chains(board, {"1d6", "2d6", "2d3"});
            auto b = chains(board, {opp});
            PolicyComparison c = compare_policies(menu, b, order, true);
            const ExactDuel mirror = exact_duel(b[0], b[0], order);
            INFO(opp << " " << to_string(order));
            CHECK(c.adaptive.exact_outcomes.p_a_wins >= mirror.p_a_wins);
            // And never worse than any fixed option of the menu.
            for (const auto& f : c.fixed) CHECK(c.adaptive.exact_value >= f.exact_value);
            CHECK(*c.exact_worth >= 0);
        }
    }
}

TEST_CASE("policy: the game of two equal menus is fair by symmetry", "[policy]") {
    const Board board = make_board(30, Overshoot::stay, {});
    auto menu = chains(board, {"1d6", "2d6", "3d6"});
    // Simultaneous rounds: the seats are interchangeable, the margin's value is 0.
    DuelPolicy sim = solve_duel_policy(menu, menu, Order::simultaneous, false);
    CHECK(sim.value_low <= 0);
    CHECK(sim.value_high >= 0);
    CHECK(static_cast<double>(sim.value_high - sim.value_low) < 1e-12);
    CHECK(std::fabs(static_cast<double>(sim.outcomes.p_a_wins - sim.outcomes.p_b_wins)) <= 2 * sim.outcomes.bound);
    // Coin: a-first and b-first mirror each other, exactly.
    DuelPolicy coin = solve_duel_policy(menu, menu, Order::coin, true);
    CHECK(coin.exact_value == 0);
    DuelPolicy af = solve_duel_policy(menu, menu, Order::a_first, true);
    DuelPolicy bf = solve_duel_policy(menu, menu, Order::b_first, true);
    CHECK(af.exact_value == -bf.exact_value);
}

TEST_CASE("policy: the found pure policies attain the game's value", "[policy]") {
    // With loops that never end (2d6 near the finish under stay), the choices
    // of both sides evaluated exactly give the value the programme reports.
    const Board board = make_board(16, Overshoot::stay, {});
    auto a = chains(board, {"1d6", "2d6", "[0,1]"});
    auto b = chains(board, {"2d6", "1d3"});
    for (Order order : {Order::a_first, Order::b_first, Order::coin}) {
        DuelPolicy p = solve_duel_policy(a, b, order, true);
        INFO(to_string(order));
        CHECK(p.exact_outcomes.p_a_wins - p.exact_outcomes.p_b_wins == p.exact_value);
        CHECK(p.exact_outcomes.p_a_wins + p.exact_outcomes.p_b_wins + p.exact_outcomes.p_tie +
                  p.exact_outcomes.p_neither ==
              1);
        CHECK(std::fabs(p.exact_value.get_d() - static_cast<double>(p.value)) < 1e-14);
    }
    // B fixed to one option in simultaneous rounds: the same from A's side.
    DuelPolicy s = solve_duel_policy(a, {b[0]}, Order::simultaneous, true);
    CHECK(s.exact_outcomes.p_a_wins == s.exact_value);
}

TEST_CASE("policy: a piece alone", "[policy]") {
    const Board board = make_board(40, Overshoot::stay, {{7, 19}});
    auto menu = chains(board, {"1d6", "2d6"});
    AlonePolicy p = solve_alone(menu, true);
    // Each fixed option against the absorption pass of the chain room.
    for (std::size_t i = 0; i < menu.size(); ++i) {
        Absorption ab = forward_absorption(menu[i]);
        CHECK(std::fabs(static_cast<double>(p.fixed[i].p_finish[0] - ab.h[0])) < 1e-15);
    }
    // 1d6 alone finishes surely: its expected rounds equal E[T 1{finish}].
    CHECK(std::fabs(static_cast<double>(p.fixed[0].rounds[0] - forward_absorption(menu[0]).g[0])) < 1e-12);
    // 2d6 can be stuck (distance 1): infinite expectation.
    CHECK(std::isinf(p.fixed[1].rounds[0]));
    // Choosing is at least as fast and as sure as either option.
    CHECK(p.best.rounds[0] <= p.fixed[0].rounds[0]);
    CHECK(p.exact_p_finish == 1);
    REQUIRE(p.exact_rounds.has_value());
    CHECK(std::fabs(p.exact_rounds->get_d() - static_cast<double>(p.best.rounds[0])) < 1e-12);
    // At distance 1 only 1d6 can finish.
    CHECK(p.fastest[39].option == 0);
    CHECK(!p.fastest[39].indifferent());
    // At distance 2 under stay, both finish surely: the surest choice is indifferent.
    CHECK(p.surest[38].indifferent());
    CHECK(p.surest[38].option == 0);
}

TEST_CASE("policy: on boards with loops a menu of one option is the ordinary duel within the bounds", "[policy]") {
    // Exact references: the duel by exact elimination of the product chain
    // (race/exact.hpp, itself checked against Python fractions in
    // check_duel_fractions.py) and the engine's floating duel.
    const Board boards[] = {make_board(12, Overshoot::bounce, {}), make_board(11, Overshoot::stay, {{9, 3}}),
                            make_board(12, Overshoot::bounce, {{4, 8}, {10, 2}})};
    for (const Board& board : boards)
        for (Order order : kOrders) {
            auto a = chains(board, {"2d3"});
            auto b = chains(board, {"1d4"});
            DuelPolicy p = solve_duel_policy(a, b, order, false);
            ExactDuel e = exact_duel(a[0], b[0], order);
            INFO(to_string(order) << " " << board.length);
            CHECK(p.iterated);
            CHECK(p.outcomes.bound > 0);
            CHECK(p.outcomes.bound < 1e-12);
            CHECK(std::fabs(static_cast<double>(p.outcomes.p_a_wins) - e.p_a_wins.get_d()) <= p.outcomes.bound);
            CHECK(std::fabs(static_cast<double>(p.outcomes.p_b_wins) - e.p_b_wins.get_d()) <= p.outcomes.bound);
            CHECK(std::fabs(static_cast<double>(p.outcomes.p_tie) - e.p_tie.get_d()) <= p.outcomes.bound);
            CHECK(static_cast<double>(p.value_low) <= e.p_a_wins.get_d());
            CHECK(e.p_a_wins.get_d() <= static_cast<double>(p.value_high));
            const DuelResult r = duel(a[0], b[0], order, DuelSettings{.want_median = false});
            CHECK(std::fabs(static_cast<double>(p.outcomes.p_a_wins - r.p_a_wins)) <=
                  static_cast<double>(p.outcomes.bound + r.bound));
        }
}

TEST_CASE("policy: on boards with loops a menu holding the opponent's option never does worse than the mirror duel",
          "[policy]") {
    const Board boards[] = {make_board(24, Overshoot::bounce, {}), make_board(22, Overshoot::stay, {{17, 6}})};
    for (const Board& board : boards)
        for (const char* opp : {"1d6", "2d6"})
            for (Order order : kOrders) {
                auto menu = chains(board, {"1d6", "2d6", "2d3"});
                auto b = chains(board, {opp});
                PolicyComparison c = compare_policies(menu, b, order, false);
                const DuelResult mirror = duel(b[0], b[0], order, DuelSettings{.want_median = false});
                INFO(opp << " " << to_string(order) << " " << board.length);
                // The optimum is at least the mirror duel's P(A wins), and the
                // found policy attains the optimum within the bounds.
                CHECK(c.adaptive.value_high >= mirror.p_a_wins - mirror.bound);
                CHECK(c.adaptive.outcomes.p_a_wins + c.adaptive.outcomes.bound >= mirror.p_a_wins - mirror.bound);
                CHECK(c.adaptive.value_high - c.adaptive.value_low < 1e-11L);
                for (const auto& f : c.fixed)
                    CHECK(c.adaptive.value_high >= f.value - f.outcomes.bound);
                CHECK(c.worth >= -1e-11L);
            }
}

TEST_CASE("policy: on a bounce board the game of two equal menus is fair", "[policy]") {
    const Board board = make_board(20, Overshoot::bounce, {});
    auto menu = chains(board, {"1d6", "2d6", "3d6"});
    DuelPolicy sim = solve_duel_policy(menu, menu, Order::simultaneous, false);
    CHECK(sim.iterated);
    CHECK(sim.value_low <= 0);
    CHECK(sim.value_high >= 0);
    CHECK(static_cast<double>(sim.value_high - sim.value_low) < 1e-12);
    // Alternating: moving first is worth the same to either seat.
    DuelPolicy af = solve_duel_policy(menu, menu, Order::a_first, false);
    DuelPolicy bf = solve_duel_policy(menu, menu, Order::b_first, false);
    CHECK(std::fabs(static_cast<double>(af.value + bf.value)) <= static_cast<double>(af.value_high - af.value_low +
                                                                                     bf.value_high - bf.value_low));
    DuelPolicy coin = solve_duel_policy(menu, menu, Order::coin, false);
    CHECK(coin.value_low <= 0);
    CHECK(coin.value_high >= 0);
}

TEST_CASE("policy: a piece alone on a bounce board", "[policy]") {
    const Board board = make_board(30, Overshoot::bounce, {{20, 11}});
    auto menu = chains(board, {"1d6", "2d6", "3d6"});
    AlonePolicy p = solve_alone(menu, false);
    CHECK(p.iterated);
    // Each fixed option against the chain room's sparse LU (absorbing-chain
    // equations): every option finishes surely here, so its mean given
    // finishing is the expected number of rounds.
    for (std::size_t i = 0; i < menu.size(); ++i) {
        const Profile pr = profile(menu[i]);
        INFO(i);
        CHECK(std::fabs(static_cast<double>(p.fixed[i].p_finish[0]) - pr.p_finish) < 1e-12);
        CHECK(std::fabs(static_cast<double>(p.fixed[i].rounds[0]) - pr.mean_turns_given_finish) <
              1e-9 * pr.mean_turns_given_finish);
        CHECK(p.best.rounds[0] <= p.fixed[i].rounds[0]);
    }
    CHECK(p.bound < 1e-13);
    CHECK(p.relative_bound < 1e-12);
    // A heavy option (5d12 waits about 250,000 rounds near the finish): the
    // block's policy iteration, against the chain room's sparse LU (double,
    // so a looser tolerance).
    const Board plain = make_board(40, Overshoot::bounce, {});
    auto heavy = chains(plain, {"1d6", "5d12"});
    AlonePolicy h = solve_alone(heavy, false);
    const Profile pr = profile(heavy[1]);
    CHECK(std::fabs(static_cast<double>(h.fixed[1].rounds[0]) - pr.mean_turns_given_finish) <
          1e-8 * pr.mean_turns_given_finish);
    CHECK(h.best.rounds[0] <= h.fixed[0].rounds[0]);
    CHECK(h.bound < 1e-9);
}

TEST_CASE("policy: refusals", "[policy]") {
    // Exact mode needs a board where pieces never move backward.
    const Board bounce = make_board(10, Overshoot::bounce, {});
    auto menu = chains(bounce, {"1d6", "2d6"});
    CHECK_THROWS_AS(solve_alone(menu, true), LimitError);
    CHECK_THROWS_AS(solve_duel_policy(menu, menu, Order::a_first, true), LimitError);
    const Board back = make_board(10, Overshoot::stay, {{8, 2}});
    auto m2 = chains(back, {"1d6"});
    CHECK_THROWS_AS(solve_duel_policy(m2, m2, Order::simultaneous, true), LimitError);
    // A loop no choice has to leave ([2,4] from an odd distance under bounce
    // never finishes): no bound on the iteration's error, refused.
    auto loop = chains(bounce, {"[2,4]", "1d6"});
    CHECK_THROWS_AS(solve_alone(loop, false), LimitError);
    auto loop_b = chains(bounce, {"[2,4]"});
    CHECK_THROWS_AS(solve_duel_policy(loop, loop_b, Order::simultaneous, false), LimitError);
    CHECK_THROWS_AS(solve_duel_policy(loop, loop_b, Order::a_first, false), LimitError);
    // The simultaneous game of two menus has no exact mode.
    const Board plain = make_board(10, Overshoot::stay, {});
    auto m3 = chains(plain, {"1d6", "2d6"});
    CHECK_THROWS_AS(solve_duel_policy(m3, m3, Order::simultaneous, true), LimitError);
}

TEST_CASE("policy: a state without a saddle point gets a mixed choice inside its proven interval", "[policy]") {
    // Found by a search over small dice; check_policy_scipy.py checks every
    // state's matrix game of this board with SciPy's linprog.
    const Board board = make_board(10, Overshoot::stay, {});
    auto a = chains(board, {"[2,3]", "[1,4,0,5]"});
    auto b = chains(board, {"[1,1]", "[4,1]", "[4,0,5,2]"});
    DuelPolicy p = solve_duel_policy(a, b, Order::simultaneous, false);
    CHECK(p.mixed_states >= 1);
    CHECK(p.value_low <= p.value);
    CHECK(p.value <= p.value_high);
    CHECK(static_cast<double>(p.value_high - p.value_low) < 1e-12);
    const long double margin = p.outcomes.p_a_wins - p.outcomes.p_b_wins;
    CHECK(std::fabs(static_cast<double>(margin - p.value)) < 1e-12);
}

// ---------------------------------------------------------------- the command

namespace {

overshoot::testing::Run policy_cli(const std::string& args) {
    return overshoot::testing::run_shell(std::string(OVERSHOOT_BINARY) + " policy " + args,
                                         std::filesystem::temp_directory_path() /
                                             ("overshoot-policy-" + std::to_string(::getpid()) + ".err"));
}

}  // namespace

TEST_CASE("policy command: JSON keys, figure and one-line errors", "[policy][cli]") {
    auto r = policy_cli("--length 30 --menu 1d6,2d6,3d6 --against 2d6 --json");
    REQUIRE(r.status == 0);
    auto j = r.json();
    for (const char* key : {"p_a_wins", "p_b_wins", "p_tie", "p_neither", "error_bound", "best_fixed", "policy"})
        CHECK(j.contains(key));
    CHECK(j["best_fixed"].contains("option"));
    CHECK(j["best_fixed"].contains("p_a_wins"));
    CHECK(j["schema"] == "overshoot.policy/1");
    CHECK(j["policy"]["a"].size() == 30);
    const double total = j["p_a_wins"].get<double>() + j["p_b_wins"].get<double>() + j["p_tie"].get<double>() +
                         j["p_neither"].get<double>();
    CHECK(std::fabs(total - 1) < 1e-12);
    // The figure: an SVG file with one legend entry per option.
    const auto svg = std::filesystem::temp_directory_path() / ("overshoot-policy-" + std::to_string(::getpid()) + ".svg");
    r = policy_cli("--length 20 --menu 1d6,[1,1,4] --against 2d6 --format svg -o " + svg.string());
    REQUIRE(r.status == 0);
    const std::string text = overshoot::testing::slurp(svg);
    CHECK(text.rfind("<?xml", 0) == 0);
    CHECK(text.find("[1,1,4]") != std::string::npos);
    std::filesystem::remove(svg);
    for (const char* bad : {"--length 10", "--length 10 --menu 1d6 --against 1d6 --against-menu 1d6,2d6",
                            "--length 10 --menu '[1,2' --against 1d6", "--length 10 --menu 1d6,,2d6",
                            "--length 10 --menu 1d6 --overshoot bounce --exact", "--length 10 --menu [2,4],1d6 --overshoot bounce",
                            "--length 10 --menu 1d6 --order a-first",
                            "--length 10 --menu 1d6,2d6 --against-menu 1d6,2d6 --exact"}) {
        auto e = policy_cli(bad);
        INFO(bad << "\n" << e.err);
        CHECK(e.status == 2);
        CHECK(e.err_lines() == 1);
        CHECK(e.out.empty());
        CHECK(e.err.rfind("overshoot: error: ", 0) == 0);
    }
}
