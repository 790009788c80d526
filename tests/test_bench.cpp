// Tests of src/bench: the signature is the checksum of the results it lists,
// and the results are those of the engine called directly.
#include <catch2/catch.hpp>
#include <fmt/format.h>

#include <cstdint>
#include <string>

#include "bench/bench.hpp"
#include "chain/chain.hpp"
#include "core/board.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"

using namespace overshoot;

TEST_CASE("bench: the signature is FNV-1a of the listed results, and they are the engine's", "[bench]") {
    const BenchReport rep = run_bench();
    REQUIRE(rep.items.size() >= 5);
    // FNV-1a, 64 bits, written out here apart from core/hash.hpp: the prime
    // 1099511628211 is Fowler, Noll and Vo's published one (from memory); the
    // start value is the project's own (see core/hash.hpp).
    std::uint64_t h = 1469598103934665603ULL;
    for (const BenchItem& item : rep.items) {
        CHECK(!item.result.empty());
        // Short items run several times; the time shown is the median, never below the fastest run.
        CHECK(item.runs >= 1);
        CHECK(item.fastest <= item.milliseconds);
        for (unsigned char c : item.name + "=" + item.result + ";") {
            h ^= c;
            h *= 1099511628211ULL;
        }
    }
    CHECK(h == rep.signature);
    // The first item is one duel; its four probabilities to 12 decimal places.
    REQUIRE(rep.items.front().name == "duel 1d6 2d6 on 600");
    Board board = make_board(600, Overshoot::stay, {});
    const DuelResult d = duel(build_chain(board, parse_option("1d6")), build_chain(board, parse_option("2d6")),
                              Order::simultaneous);
    auto digits = [](long double x) { return fmt::format("{:.12f}", static_cast<double>(x)); };
    CHECK(rep.items.front().result ==
          digits(d.p_a_wins) + " " + digits(d.p_b_wins) + " " + digits(d.p_tie) + " " + digits(d.p_neither));
}
