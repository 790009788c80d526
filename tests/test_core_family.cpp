// Tests of src/core/family: the family grammar of hunts.
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
#include "render/sweep.hpp"
#include "hunt/checkpoint.hpp"
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
    auto f = parse_family("1..6d{4,6,8,10,12,20}");
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
    REQUIRE_THROWS_AS(parse_family("1..3d{4,x}"), InputError);
    REQUIRE_THROWS_AS(parse_families({"1d6", "1..2d6"}), InputError);  // 1d6 twice
    REQUIRE_THROWS_AS(parse_family("@/nonexistent/dice.txt"), InputError);
}
