// Tests of src/core/family: the family grammar of hunts.
#include <catch2/catch.hpp>
#include <algorithm>
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
#include "render/sweep.hpp"
#include "hunt/checkpoint.hpp"
#include "core/constraint_family.hpp"
#include "core/family.hpp"
#include "hunt/hunt.hpp"
#include "lengths/lengths.hpp"
#include "sweep/sweep.hpp"
#include "tournament/cycles.hpp"
#include "tournament/tournament.hpp"

#include "support.hpp"

using namespace overshoot;

namespace {

std::string temp_path(const char* name) {
    return std::string("/tmp/overshoot-test-family-") + std::to_string(::getpid()) + "-" + name;
}

}  // namespace

TEST_CASE("families expand ranges, lists and files", "[core]") {
    auto f = parse_family("dice(count=1..6, sides=4,6,8,10,12,20)");
    REQUIRE(f.size() == 36);
    REQUIRE(f.front().name == "1d4");
    REQUIRE(f[1].name == "1d6");
    REQUIRE(f.back().name == "6d20");
    REQUIRE(parse_family("d2..4").size() == 3);
    REQUIRE(parse_family("2..3d6; [0,2,4]").size() == 3);
    const std::string path = temp_path("family.txt");
    {
        FILE* fp = std::fopen(path.c_str(), "w");
        std::fputs("# invented dice\nsteady = [2,3,3,4]\n\n{1:1,5:1}  # a spinner\n", fp);
        std::fclose(fp);
    }
    auto g = parse_family("@" + path);
    REQUIRE(g.size() == 2);
    REQUIRE(g[0].name == "steady");
    REQUIRE(g[1].name == "{1:1,5:1}");
    std::remove(path.c_str());
    REQUIRE_THROWS_AS(parse_family("1..0d6"), InputError);
    REQUIRE_THROWS_AS(parse_family("dice(count=1..3, sides=4,x)"), InputError);
    // 1d6 twice: one distribution, kept once and counted as merged.
    const FamilyOptions twice = expand_families({"1d6", "1..2d6"});
    REQUIRE(twice.options.size() == 2);
    REQUIRE(twice.merged == 1);
    REQUIRE_THROWS_AS(parse_families({"a = 1d6", "a = 2d6"}), InputError);  // not specs: a bad item
    REQUIRE_THROWS_AS(parse_family("@/nonexistent/dice.txt"), InputError);
}

TEST_CASE("families by constraint: custom dice, spinners, sums, merging, refusals", "[core]") {
    // Efron's four dice (M. Gardner, Scientific American 223(6), 1970): six faces from 0..6,
    // so each is a member of custom(faces=6, values=0..6), whose size is C(7+6-1, 6) = 924
    // multisets (a handbook closed form; the Python enumeration is tests/scripts/check_custom_dice.py).
    const auto six = parse_family("custom(faces=6, values=0..6)");
    REQUIRE(six.size() == 924);
    for (const char* efron : {"[4,4,4,4,0,0]", "[3,3,3,3,3,3]", "[6,6,2,2,2,2]", "[5,5,5,1,1,1]"}) {
        const Option e = parse_option(efron);
        INFO(efron);
        CHECK(std::count_if(six.begin(), six.end(), [&](const Option& o) {
                  return o.weight == e.weight && o.denominator == e.denominator;
              }) == 1);
    }
    // Members are named by their spec, faces ascending.
    CHECK(six.front().name == "[0,0,0,0,0,0]");
    CHECK(six[1].name == "[0,0,0,0,0,1]");
    // Proper dice (faces 1..n summing to n(n+1)/2; Conrey, Gabbard, Grant, Liu and
    // Morrison, Math. Mag. 89 (2016) 133-143): for n = 4 the multisets of four of 1..4
    // summing to 10 are 1144, 1234, 1333, 2233, 2224 -- five, counted by hand.
    CHECK(parse_family("custom(faces=4, values=1..4, sum=10)").size() == 5);
    CHECK(count_multisets(4, {1, 2, 3, 4}, 10) == 5);
    // A mean: 5/2 over four faces is the sum 10, the same family.
    CHECK(parse_family("custom(faces=4, values=1..4, mean=5/2)").size() == 5);
    CHECK(parse_family("custom(faces=4, values=1..4, mean=2.5)").size() == 5);
    // Sums of copies: count=2 gives 2[...], the sum of two such dice.
    const auto two = parse_family("custom(faces=2, values=0..1, count=2)");
    REQUIRE(two.size() == 3);
    CHECK(two[1].name == "2[0,1]");
    CHECK(two[1].weight == parse_option("2[0,1]").weight);
    // Spinners with equal sectors: named as weighted spinners.
    const auto sp = parse_family("spinner(sectors=3, moves=1..2)");
    REQUIRE(sp.size() == 4);
    CHECK(sp[1].name == "{1:2,2:1}");
    // Different numbers of faces can give one distribution: [1,2] and [1,1,2,2].
    const FamilyOptions merged = expand_families({"custom(faces=2..4, values=1..2)"});
    // Two faces: 3 dice; three: [1,1,2] and [1,2,2] new, [1,1,1] and [2,2,2] merged;
    // four: [1,1,1,2] and [1,2,2,2] new, [1,1,1,1], [1,1,2,2] and [2,2,2,2] merged.
    CHECK(merged.options.size() == 7);
    CHECK(merged.merged == 5);
    // Dice sums by count and sides (the old braces are refused with the new spelling).
    CHECK(parse_family("dice(count=2, sides=4..6)").size() == 3);
    CHECK_THROWS_WITH(parse_family("1..6d{4,6,8}"), Catch::Contains("dice(count="));
    // Refused up front with the size: 7 values over 12 faces is C(18, 12) = 18564 dice.
    CHECK_THROWS_WITH(parse_family("custom(faces=12, values=0..6)"), Catch::Contains("18564"));
    CHECK_THROWS_AS(parse_family("custom(faces=12, values=0..6)"), LimitError);
    for (const char* bad : {"custom(faces=3)", "custom(faces=3, values=0..4, sum=3, mean=1)", "custom(faces=0, values=1)",
                            "custom(faces=3, values=0..4, colour=2)", "custom(faces=3, values=0..4", "dice(sides=4, sides=6)",
                            "custom(faces=3, values=4..2)", "custom(faces=2, values=1..3, mean=1/3)",
                            "custom(faces=2, values=1..3, sum=100)", "spinner(sectors=2, values=1..3)"}) {
        INFO(bad);
        CHECK_THROWS_AS(parse_family(bad), InputError);
    }
}
