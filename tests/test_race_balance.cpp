// Tests of src/race/balance: head starts, lengths and single jumps that make a
// race of several options fair ([balance]).
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

}  // namespace

// Balance: the reported assignment is verified by re-running the race, and a
// brute-force search over every assignment on a small board finds none fairer.
TEST_CASE("head starts: verified and not beaten by brute force", "[balance]") {
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
                    if (p.board.after_jumps[a] >= 24 || p.board.after_jumps[b] >= 24 || p.board.after_jumps[c] >= 24) continue;
                    RaceResult r = race(p.ptr, {p.board.after_jumps[a], p.board.after_jumps[b], p.board.after_jumps[c]}, order);
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

TEST_CASE("fairest lengths and single jumps", "[balance]") {
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
