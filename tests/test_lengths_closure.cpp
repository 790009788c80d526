// The end-zone closure of the all-lengths engine (src/lengths/closure.cpp).
#include <gmpxx.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <string>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "core/option.hpp"
#include "lengths/lengths.hpp"
#include "race/exact.hpp"
#include "support.hpp"
#include "support_lengths.hpp"

using namespace overshoot;

namespace {

using testing::every_pair;
using testing::opts;
using testing::run_lengths;

// Closure and whole programme agree within the sum of their bounds, and the
// closure's bound is at most twice the programme's.
void require_agree(const std::vector<Option>& o, Overshoot rule, Order order, int L) {
    auto closure = run_lengths(o, rule, order, L, LengthMethod::closure);
    auto whole = run_lengths(o, rule, order, L, LengthMethod::pairs);
    REQUIRE(closure.size() == whole.size());
    for (std::size_t k = 0; k < closure.size(); ++k) {
        REQUIRE(closure[k].method == LengthMethod::closure);
        REQUIRE(whole[k].method == LengthMethod::pairs);
        for (int d = 1; d <= L; ++d) {
            const LengthOutcome& x = closure[k].by_length[d];
            const LengthOutcome& y = whole[k].by_length[d];
            INFO(o[closure[k].a].name << " vs " << o[closure[k].b].name << " at " << d);
            testing::require_within_bounds(x, y);
            REQUIRE(x.bound <= 2 * y.bound);
        }
    }
}

}  // namespace

TEST_CASE("the closure agrees with the whole programme on heavy pairs over lengths 1..2000", "[lengths][closure]") {
    // Every pair of 5d12, 4d10, 3d20 and 6d20: the faster piece enters its zone
    // first from either seat, and 4d10 against 3d20 are close in speed (both
    // bands of the closure are read).
    require_agree(opts({"5d12", "4d10", "3d20", "6d20"}), Overshoot::stay, Order::simultaneous, 2000);
}

TEST_CASE("the closure agrees with the whole programme on pairs far apart in speed over 1..2000", "[lengths][closure]") {
    // K is built eight offset rows at a time and its first and last rows that
    // survive the trimming set the strip's extent: pieces of very different
    // speeds leave many empty rows at both ends of K, and light ones many rounds.
    require_agree(opts({"2d4", "6d20", "1d20", "5d4"}), Overshoot::stay, Order::simultaneous, 2000);
}

TEST_CASE("the closure agrees with the whole programme for every order and both rules", "[lengths][closure]") {
    for (Overshoot rule : {Overshoot::stay, Overshoot::pass})
        for (Order order : {Order::coin, Order::a_first, Order::b_first}) {
            INFO("rule " << static_cast<int>(rule) << " order " << static_cast<int>(order));
            // Slow and light pieces too: many rounds of convolution powers,
            // custom dice, a constant added, zones of different widths.
            require_agree(opts({"6d20", "2d4", "[1,3,8]", "1d6+2", "3d6"}), rule, order, 400);
        }
}

TEST_CASE("the closure holds the exact duel inside its bound beyond the end zones", "[lengths][closure]") {
    // Exact fractions (GMP, race/exact.cpp) at lengths past both zones, where
    // the closure's free-walk sums give the result.
    for (auto names : {std::vector<const char*>{"2d4", "3d6"}, std::vector<const char*>{"[1,3,8]", "2d6"}}) {
        std::vector<Option> o;
        for (const char* n : names) o.push_back(parse_option(n));
        const int L = 44;
        for (Order order : {Order::simultaneous, Order::a_first}) {
            auto res = run_lengths(o, Overshoot::stay, order, L, LengthMethod::closure);
            REQUIRE(res[0].method == LengthMethod::closure);
            testing::require_exact_inside(o, order, res[0], {5, 19, 25, 37, 44});
        }
    }
}

TEST_CASE("auto takes the closure for fast heavy pairs and the whole programme for slow ones", "[lengths][closure]") {
    auto fast = run_lengths(opts({"6d20", "5d12"}), Overshoot::stay, Order::simultaneous, 2000, LengthMethod::automatic);
    REQUIRE(fast[0].method == LengthMethod::closure);
    // A move of 0 leaves the free walk with a stay: the closure does not apply.
    auto idle = run_lengths(opts({"[0,5,9]", "5d12"}), Overshoot::stay, Order::simultaneous, 300, LengthMethod::closure);
    REQUIRE(idle[0].method == LengthMethod::pairs);
    REQUIRE(parse_length_method("closure") == LengthMethod::closure);
    REQUIRE(to_string(LengthMethod::closure) == "closure");
}

TEST_CASE("the closure gives the same bits on one thread and on two", "[lengths][closure]") {
    // A lone pair shares the building of K and the band sums between the
    // threads; each block of offsets sums on its own and blocks add in order.
    const auto o = opts({"6d20", "5d12"});
    for (Order order : {Order::simultaneous, Order::coin}) {
        LengthSettings one, two;
        one.method = two.method = LengthMethod::closure;
        one.threads = 1;
        two.threads = 2;
        auto a = all_lengths(o, Overshoot::stay, order, 700, every_pair(2), one);
        auto b = all_lengths(o, Overshoot::stay, order, 700, every_pair(2), two);
        for (int d = 1; d <= 700; ++d) {
            REQUIRE(a[0].by_length[d].p_a_wins == b[0].by_length[d].p_a_wins);
            REQUIRE(a[0].by_length[d].p_b_wins == b[0].by_length[d].p_b_wins);
            REQUIRE(a[0].by_length[d].p_tie == b[0].by_length[d].p_tie);
            REQUIRE(a[0].by_length[d].bound == b[0].by_length[d].bound);
        }
    }
}
