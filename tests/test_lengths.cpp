// Tests of src/lengths: the all-lengths engine against single-board duels, its
// methods, and the same bits whatever the thread count.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <set>
#include <string>
#include <unistd.h>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "core/error.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"
#include "race/exact.hpp"
#include "render/sweep.hpp"
#include "hunt/checkpoint.hpp"
#include "core/family.hpp"
#include "hunt/hunt.hpp"
#include "lengths/lengths.hpp"
#include "sweep/sweep.hpp"
#include "tournament/cycles.hpp"
#include "tournament/tournament.hpp"

#include "support.hpp"
#include "support_lengths.hpp"

using namespace overshoot;

namespace {

using testing::opts;
using testing::every_pair;

// |sweep figure - duel figure| must be within the sum of both proven bounds.
void require_agrees(const LengthOutcome& o, const DuelResult& r, const std::string& what) {
    const double allowed = o.bound + static_cast<double>(r.bound) + 1e-15;
    INFO(what << " win " << o.p_a_wins << " vs " << static_cast<double>(r.p_a_wins) << " loss " << o.p_b_wins << " vs "
              << static_cast<double>(r.p_b_wins) << " bounds " << o.bound << " + " << static_cast<double>(r.bound));
    REQUIRE(std::fabs(o.p_a_wins - static_cast<double>(r.p_a_wins)) <= allowed);
    REQUIRE(std::fabs(o.p_b_wins - static_cast<double>(r.p_b_wins)) <= allowed);
    REQUIRE(std::fabs(o.p_tie - static_cast<double>(r.p_tie)) <= allowed);
    REQUIRE(std::fabs(o.p_neither - static_cast<double>(r.p_neither)) <= allowed);
    REQUIRE(o.bound < 1e-9);
}

}  // namespace

TEST_CASE("every per-length figure equals the single-board duel on random jump-free boards", "[lengths]") {
    // Internal consistency: the single-board duel (race/duel.cpp) is a
    // different computation (per-turn series closed by the pair programme on
    // the end zone, or the whole pair programme).
    std::mt19937 rng(20261201);
    const char* pool[] = {"1d6", "2d6", "3d6", "1d4", "2d4", "[0,1,3]", "{1:3,4:1}", "1d3+1", "[2,2,5]", "4d6", "1d12"};
    for (int round = 0; round < 6; ++round) {
        std::vector<Option> o;
        std::uniform_int_distribution<int> pick(0, 10);
        int a = pick(rng), b = pick(rng);
        while (b == a) b = pick(rng);
        o.push_back(parse_option(pool[a]));
        o.push_back(parse_option(pool[b]));
        const Overshoot rule = round % 3 == 2 ? Overshoot::pass : Overshoot::stay;
        const Order order = round % 4 == 0 ? Order::simultaneous
                            : round % 4 == 1 ? Order::coin
                            : round % 4 == 2 ? Order::a_first
                                             : Order::b_first;
        const int L = 60 + static_cast<int>(rng() % 80);
        for (LengthMethod m : {LengthMethod::series, LengthMethod::pairs, LengthMethod::closure}) {
            LengthSettings s;
            s.method = m;
            s.threads = 1;
            auto res = all_lengths(o, rule, order, L, every_pair(2), s);
            REQUIRE(res.size() == 1);
            REQUIRE(res[0].done);
            for (int len : {1, 2, 3, 7, L / 3, L - 1, L}) {
                Board board = make_board(len, rule, {});
                Chain ca = build_chain(board, o[0]), cb = build_chain(board, o[1]);
                DuelSettings ds;
                ds.want_median = false;
                require_agrees(res[0].by_length[len], duel(ca, cb, order, ds),
                               std::string(pool[a]) + " vs " + pool[b] + " " + std::string(to_string(m)) +
                                   " length " + std::to_string(len));
            }
        }
    }
}

TEST_CASE("heavy options: the series closes stuck and lingering pieces exactly", "[lengths]") {
    // 3d6 is stuck at distances 1 and 2 and lingers at 3; 5d12 lingers for
    // about 250,000 turns at distance 5 (DESIGN.md, heavy tails).
    auto o = opts({"2d6", "3d6", "5d12"});
    LengthSettings s;
    s.threads = 2;
    auto res = all_lengths(o, Overshoot::stay, Order::simultaneous, 90, every_pair(3), s);
    for (const auto& p : res) {
        REQUIRE(p.done);
        for (int len : {1, 3, 5, 6, 40, 90}) {
            Board board = make_board(len, Overshoot::stay, {});
            Chain ca = build_chain(board, o[p.a]), cb = build_chain(board, o[p.b]);
            DuelSettings ds;
            ds.want_median = false;
            require_agrees(p.by_length[len], duel(ca, cb, Order::simultaneous, ds),
                           o[p.a].name + " vs " + o[p.b].name + " at " + std::to_string(len) + " by " + std::string(to_string(p.method)));
        }
    }
}

TEST_CASE("the engine gives the same bits whatever the thread count", "[lengths]") {
    auto o = opts({"1d6", "2d6", "3d6", "1d4", "2d8"});
    LengthSettings one, two;
    one.threads = 1;
    two.threads = 2;
    auto a = all_lengths(o, Overshoot::stay, Order::coin, 300, every_pair(5), one);
    auto b = all_lengths(o, Overshoot::stay, Order::coin, 300, every_pair(5), two);
    REQUIRE(a.size() == b.size());
    for (std::size_t k = 0; k < a.size(); ++k) {
        REQUIRE(a[k].method == b[k].method);
        for (int d = 1; d <= 300; ++d) {
            REQUIRE(a[k].by_length[d].p_a_wins == b[k].by_length[d].p_a_wins);
            REQUIRE(a[k].by_length[d].p_b_wins == b[k].by_length[d].p_b_wins);
            REQUIRE(a[k].by_length[d].bound == b[k].by_length[d].bound);
        }
    }
}

TEST_CASE("the row form gives the bits of the cell-by-cell programme", "[lengths]") {
    // The row form adds, in every lane, the terms of the cell loop in the same
    // order (docs/sweep.md, "Row form"): the results must be equal, not merely
    // within their bounds. Heavy pairs (blocks of four and two rows), the pool
    // of the random-board test (moves of 0, zone rows, blocks of one), every
    // order, both rules.
    const std::vector<std::vector<const char*>> sets = {
        {"5d12", "4d10", "3d20", "6d20"}, {"2d6", "[0,1,3]", "{1:3,4:1}", "1d3+1"}, {"[2,2,5]", "4d6", "1d12", "2d4"}};
    for (const auto& names : sets)
        for (Overshoot rule : {Overshoot::stay, Overshoot::pass})
            for (Order order : {Order::simultaneous, Order::coin, Order::a_first}) {
                std::vector<Option> o;
                for (const char* n : names) o.push_back(parse_option(n));
                LengthSettings rows, cells;
                rows.method = LengthMethod::pairs;
                cells.method = LengthMethod::pairs_scalar;
                rows.threads = cells.threads = 2;
                const int L = 260;
                auto a = all_lengths(o, rule, order, L, every_pair(o.size()), rows);
                auto b = all_lengths(o, rule, order, L, every_pair(o.size()), cells);
                REQUIRE(a.size() == b.size());
                for (std::size_t k = 0; k < a.size(); ++k)
                    for (int d = 1; d <= L; ++d) {
                        INFO(o[a[k].a].name << " vs " << o[a[k].b].name << " at " << d);
                        REQUIRE(a[k].by_length[d].p_a_wins == b[k].by_length[d].p_a_wins);
                        REQUIRE(a[k].by_length[d].p_b_wins == b[k].by_length[d].p_b_wins);
                        REQUIRE(a[k].by_length[d].p_tie == b[k].by_length[d].p_tie);
                        REQUIRE(a[k].by_length[d].bound == b[k].by_length[d].bound);
                    }
            }
}

TEST_CASE("the row form on heavy pairs holds the exact duel inside its bound", "[lengths]") {
    // Exact fractions (GMP, race/exact.cpp) on short boards: 4d10 against 3d20
    // and 6d20 against 5d12, every length up to 24 (blocks of two and four rows).
    for (auto names : {std::vector<const char*>{"4d10", "3d20"}, std::vector<const char*>{"6d20", "5d12"}}) {
        std::vector<Option> o;
        for (const char* n : names) o.push_back(parse_option(n));
        LengthSettings s;
        s.method = LengthMethod::pairs;
        s.threads = 1;
        const int L = 24;
        auto res = all_lengths(o, Overshoot::stay, Order::simultaneous, L, every_pair(2), s);
        for (int len : {1, 5, 12, 23, 24}) {
            Board board = make_board(len, Overshoot::stay, {});
            ExactDuel e = exact_duel(build_chain(board, o[0]), build_chain(board, o[1]), Order::simultaneous);
            const LengthOutcome& x = res[0].by_length[len];
            INFO(names[0] << " vs " << names[1] << " at " << len);
            // Compared as fractions: a double converts to mpq_class exactly.
            const mpq_class bound(x.bound);
            REQUIRE(abs(mpq_class(x.p_a_wins) - e.p_a_wins) <= bound);
            REQUIRE(abs(mpq_class(x.p_b_wins) - e.p_b_wins) <= bound);
            REQUIRE(abs(mpq_class(x.p_tie) - e.p_tie) <= bound);
        }
    }
}
