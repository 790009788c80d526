// Board search targets (src/search/target.cpp): the score of each target on
// hand-made margin matrices, and the cycle as written.
#include <catch2/catch.hpp>

#include <vector>

#include "core/error.hpp"
#include "search/target.hpp"
#include "support.hpp"

using namespace overshoot;
using overshoot::testing::opts;

namespace {

// Margins of a 3 x 3 matrix from its upper triangle (antisymmetric).
std::vector<double> margins3(double ab, double ac, double bc) {
    return {0, ab, ac, -ab, 0, bc, -ac, -bc, 0};
}

}  // namespace

TEST_CASE("search: the score of each target", "[search]") {
    // A > B by 0.1, B > C by 0.2, C > A by 0.05: a cycle of strength 0.05 (its weakest arc).
    const auto m = margins3(0.1, -0.05, 0.2);
    CHECK(score_of(SearchTarget::cycle, {0, 1, 2}, 3, m) == Approx(0.05));
    // The reverse orientation runs every arc backwards: its weakest is -0.2.
    CHECK(score_of(SearchTarget::cycle, {0, 2, 1}, 3, m) == Approx(-0.2));
    // Each option is beaten: A by C (0.05), B by A (0.1), C by B (0.2): no winner by 0.05.
    CHECK(score_of(SearchTarget::no_winner, {}, 3, m) == Approx(0.05));
    // With three options, strong connectivity needs the whole cycle: its weakest arc.
    CHECK(score_of(SearchTarget::top_cycle, {}, 3, m) == Approx(0.05));
    CHECK(score_of(SearchTarget::fair, {}, 3, m) == Approx(-0.2));
    // A transitive digraph: A beats both, so the no-winner score is negative
    // (A's best beater wins by -0.1); for strong connectivity C must reach
    // someone, and its best arc is C -> B at -0.2.
    const auto t = margins3(0.1, 0.3, 0.2);
    CHECK(score_of(SearchTarget::no_winner, {}, 3, t) == Approx(-0.1));
    CHECK(score_of(SearchTarget::top_cycle, {}, 3, t) == Approx(-0.2));
}

TEST_CASE("search: the target cycle as written", "[search]") {
    const auto o = opts({"1d6", "2d6", "3d6"});
    CHECK(parse_cycle("1d6 > 2d6 > 3d6 > 1d6", o) == std::vector<std::size_t>{0, 1, 2});
    CHECK(parse_cycle("3d6>2d6>1d6", o) == std::vector<std::size_t>{2, 1, 0});
    CHECK_THROWS_AS(parse_cycle("1d6 > 2d6 > 1d6", o), InputError);    // two options
    CHECK_THROWS_AS(parse_cycle("1d6 > 4d6 > 3d6", o), InputError);    // unknown name
    CHECK_THROWS_AS(parse_cycle("1d6 > 2d6 > 2d6 > 3d6", o), InputError);  // repeated
    CHECK_THROWS_AS(parse_cycle("1d6 >> 2d6 > 3d6", o), InputError);   // empty name
}

