// The zone tail of the all-lengths engine (src/lengths/zone_tail.cpp).
#include <gmpxx.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <string>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "core/option.hpp"
#include "lengths/distance.hpp"
#include "lengths/lengths.hpp"
#include "lengths/zone_tail.hpp"
#include "race/exact.hpp"
#include "support.hpp"
#include "support_lengths.hpp"

using namespace overshoot;

namespace {

using testing::every_pair;
using testing::opts;
using testing::run_lengths;

// The zone tail (with the series below it) against a method built on other
// ideas, length by length: within the sum of the two bounds. Returns how many
// lengths the zone tail gave.
int require_agree(const std::vector<Option>& o, Overshoot rule, Order order, int L, LengthMethod other) {
    auto tail = run_lengths(o, rule, order, L, LengthMethod::zone_tail);
    auto ref = run_lengths(o, rule, order, L, other);
    int covered = 0;
    for (std::size_t k = 0; k < tail.size(); ++k) {
        if (tail[k].method == LengthMethod::zone_tail) covered += L + 1 - tail[k].tail_from;
        for (int d = 1; d <= L; ++d) {
            const LengthOutcome& x = tail[k].by_length[d];
            const LengthOutcome& y = ref[k].by_length[d];
            INFO(o[tail[k].a].name << " vs " << o[tail[k].b].name << " at " << d);
            testing::require_within_bounds(x, y);
            if (tail[k].method == LengthMethod::zone_tail && d >= tail[k].tail_from) REQUIRE(x.bound < 5e-13);
        }
    }
    return covered;
}

}  // namespace

TEST_CASE("the zone tail agrees with the series and with the pair programme", "[lengths][zone_tail]") {
    // The three options of the speed issue, every order; the pair programme
    // has no truncation at all, the series none of the zone tail's terms.
    for (Order order : {Order::simultaneous, Order::coin, Order::a_first, Order::b_first}) {
        INFO("order " << static_cast<int>(order));
        REQUIRE(require_agree(opts({"1d6", "2d6", "3d6"}), Overshoot::stay, order, 1500, LengthMethod::pairs) > 2000);
    }
    REQUIRE(require_agree(opts({"1d6", "2d6", "3d6"}), Overshoot::stay, Order::simultaneous, 4000,
                          LengthMethod::series) > 9000);
    // The rule pass (no stays: the fast piece's zone time is at most z rounds),
    // custom dice, the faster piece in either seat.
    for (Overshoot rule : {Overshoot::stay, Overshoot::pass})
        REQUIRE(require_agree(opts({"1d4", "1d8", "[1,2,2,7]", "2d4+1"}), rule, Order::coin, 1200,
                              LengthMethod::pairs) > 0);
}

TEST_CASE("the zone tail holds the exact duel inside its bound", "[lengths][zone_tail]") {
    // Exact fractions (GMP, race/exact.cpp) at lengths the zone tail gives.
    for (auto names : {std::vector<const char*>{"1d2", "3d6"}, std::vector<const char*>{"2d6", "[1,1,2]"}}) {
        const auto o = opts({names[0], names[1]});
        const int L = 60;
        for (Order order : {Order::simultaneous, Order::a_first, Order::b_first}) {
            auto res = run_lengths(o, Overshoot::stay, order, L, LengthMethod::zone_tail);
            REQUIRE(res[0].method == LengthMethod::zone_tail);
            REQUIRE(res[0].tail_from <= 45);
            testing::require_exact_inside(o, order, res[0], {res[0].tail_from, 45, 52, 60});
        }
    }
}

TEST_CASE("where the zone tail does not apply the series keeps every length", "[lengths][zone_tail]") {
    // A move of 0, equal stay probabilities in the fast piece's zone ([1,1,4]:
    // distances 1 to 3 all stay with 1/3), and pieces too close in speed.
    REQUIRE_FALSE(lengths_engine::zone_tail_applies(parse_option("[0,2,5]"), parse_option("2d6")));
    auto equal_stays = run_lengths(opts({"1d2", "[1,1,4]"}), Overshoot::stay, Order::simultaneous, 400, LengthMethod::zone_tail);
    REQUIRE(equal_stays[0].method == LengthMethod::series);
    auto close = run_lengths(opts({"2d4", "1d10"}), Overshoot::stay, Order::simultaneous, 1000, LengthMethod::automatic);
    REQUIRE(close[0].method == LengthMethod::series);
    // `series` keeps the series alone; auto takes the zone tail on long boards.
    auto old = run_lengths(opts({"1d6", "3d6"}), Overshoot::stay, Order::simultaneous, 2000, LengthMethod::series);
    REQUIRE(old[0].method == LengthMethod::series);
    auto fresh = run_lengths(opts({"1d6", "3d6"}), Overshoot::stay, Order::simultaneous, 2000, LengthMethod::automatic);
    REQUIRE(fresh[0].method == LengthMethod::zone_tail);
    REQUIRE(parse_length_method("zone-tail") == LengthMethod::zone_tail);
    REQUIRE(to_string(LengthMethod::zone_tail) == "zone-tail");
}

TEST_CASE("the zone tail meets the 1e-12 target where the series does not", "[lengths][zone_tail]") {
    // The series' rounding bound grows with the turns it steps (about 2e-11 at
    // length 10000 for 1d6 against 3d6); the zone tail's does not.
    auto res = run_lengths(opts({"1d6", "3d6"}), Overshoot::stay, Order::simultaneous, 10000, LengthMethod::automatic);
    REQUIRE(res[0].method == LengthMethod::zone_tail);
    REQUIRE(res[0].by_length[10000].error_bound() < 1e-12);
    auto old = run_lengths(opts({"1d6", "3d6"}), Overshoot::stay, Order::simultaneous, 10000, LengthMethod::series);
    REQUIRE(old[0].by_length[10000].error_bound() > 1e-11);
    REQUIRE(std::fabs(res[0].by_length[10000].margin() - old[0].by_length[10000].margin()) <=
            res[0].by_length[10000].error_bound() + old[0].by_length[10000].error_bound());
}
