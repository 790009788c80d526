// Tests of src/race/long_duel.*: the separated method (finishing windows
// proven apart, closed by each piece's absorption) against the zone method
// stepped turn by turn, and against exact fractions; where it must refuse.
#include <catch2/catch.hpp>

#include <gmpxx.h>

#include <cmath>
#include <string>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "core/error.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"
#include "race/exact.hpp"
#include "race/long_duel.hpp"

using namespace overshoot;

namespace {

constexpr Order kOrders[] = {Order::simultaneous, Order::a_first, Order::b_first, Order::coin};

// `fresh` (the new route, method `method`) and `old` agree within their bounds.
void agree(const DuelResult& fresh, const DuelResult& old, DuelMethod method = DuelMethod::separated) {
    const long double b = fresh.bound + old.bound;
    CHECK(fresh.method.first == method);
    CHECK(std::fabs(fresh.p_a_wins - old.p_a_wins) <= b);
    CHECK(std::fabs(fresh.p_b_wins - old.p_b_wins) <= b);
    CHECK(std::fabs(fresh.p_tie - old.p_tie) <= b);
    CHECK(std::fabs(fresh.p_neither - old.p_neither) <= b);
    CHECK(fresh.bound < 1e-13L);
    CHECK(std::fabs(fresh.mean_rounds - old.mean_rounds) <= 1e-9 * old.mean_rounds);
    REQUIRE(fresh.median_resolved);
    REQUIRE(old.median_resolved);
    CHECK(fresh.median_rounds == old.median_rounds);
}

struct Setting {
    int length;
    Overshoot rule;
    std::vector<Jump> jumps;
    int start_a, start_b;
};

}  // namespace

TEST_CASE("separated agrees with the zone method on long boards, every order", "[race][long-duel]") {
    // The zone method (series stepped every turn, closed by the pair programme)
    // is the old engine; both carry proven bounds, so they must overlap.
    // Under stay, 3d6 lingers at distance 3 (one roll in 216 finishes), so only
    // 1d6 against 2d6 is apart at 20000 squares; under pass every pair is.
    const std::vector<Setting> settings = {
        {2000, Overshoot::pass, {}, 0, 0},
        {5000, Overshoot::pass, {{4990, 4995}, {4993, 4998}}, 0, 0},  // jumps near the end
        {4000, Overshoot::pass, {}, 300, 0},                          // a head start for A
        {20000, Overshoot::stay, {{19990, 19995}}, 0, 40},  // a jump near the end, a head start for B
        {5000, Overshoot::bounce, {}, 0, 0},                // pieces move backward: refused
        {5000, Overshoot::stay, {{4996, 4980}}, 0, 0},      // a jump back: refused
    };
    const std::pair<const char*, const char*> pairs[] = {{"1d6", "2d6"}, {"3d6", "1d6"}, {"1d4+1d8", "3d6"}};
    int separated = 0;
    for (const Setting& st : settings) {
        const Board board = make_board(st.length, st.rule, st.jumps);
        for (auto [sa, sb] : pairs) {
            const Option a = parse_option(sa), b = parse_option(sb);
            const Chain ca = build_chain(board, a, st.start_a), cb = build_chain(board, b, st.start_b);
            for (Order order : kOrders) {
                CAPTURE(st.length, to_string(st.rule), sa, sb, to_string(order), st.start_a);
                DuelSettings ds;
                ds.method = DuelMethod::separated;
                if (!board.forward_only()) {
                    CHECK_FALSE(separated_duel(board, a, b, st.start_a, st.start_b, ds));
                    CHECK_THROWS_AS(duel_on_board(board, a, b, st.start_a, st.start_b, order, ds), InputError);
                    continue;
                }
                const auto fresh = separated_duel(board, a, b, st.start_a, st.start_b, ds);
                if (!fresh) continue;
                ++separated;
                DuelSettings zs;
                zs.method = DuelMethod::zone;
                agree(*fresh, duel(ca, cb, order, zs));
                // auto from the board takes the same route.
                const DuelResult viaboard = duel_on_board(board, a, b, st.start_a, st.start_b, order);
                CHECK(viaboard.method.first == DuelMethod::separated);
                CHECK(viaboard.p_a_wins == fresh->p_a_wins);
            }
        }
    }
    CHECK(separated == 4 * (3 * 3 + 1));  // every pair under pass, 1d6 against 2d6 under stay
}

TEST_CASE("separated with the faster piece's series jumped and stepped (3d6 lingers at distance 3)",
          "[race][long-duel]") {
    // On 40,000 squares under stay the decay bound over the end rows is too weak
    // for 3d6 ((215/216)^6400 ~ 1e-13 at distance 3), so the faster piece's
    // series, jumped by powering in long double, is stepped until its live mass
    // is below 1e-15, before 1d6 can arrive. The zone method is the old engine.
    const Board board = make_board(40000, Overshoot::stay, {});
    const Option a = parse_option("3d6"), b = parse_option("1d6");
    const auto fresh = separated_duel(board, a, b, 0, 0);
    REQUIRE(fresh);
    DuelSettings zs;
    zs.method = DuelMethod::zone;
    agree(*fresh, duel(build_chain(board, a), build_chain(board, b), Order::simultaneous, zs));
    // 3d6 can end stuck, 1d6 cannot: neither finishes with probability 0.
    CHECK(fresh->p_neither == 0);
}

TEST_CASE("separated: the exact fractions lie inside its bound", "[race][long-duel]") {
    // Exact fractions by the GMP pair programme (race/exact*), a different method.
    const Board board = make_board(400, Overshoot::pass, {});
    const Option a = parse_option("1d4"), b = parse_option("4d6");
    const auto fresh = separated_duel(board, a, b, 0, 0);
    REQUIRE(fresh);
    for (Order order : {Order::simultaneous, Order::coin}) {  // coin holds both alternating orders
        CAPTURE(to_string(order));
        const ExactDuel e = exact_duel(build_chain(board, a), build_chain(board, b), order);
        const long double bound = fresh->bound;
        CHECK(std::fabs(fresh->p_a_wins - static_cast<long double>(e.p_a_wins.get_d())) <= bound + 1e-16L);
        CHECK(std::fabs(fresh->p_b_wins - static_cast<long double>(e.p_b_wins.get_d())) <= bound + 1e-16L);
        CHECK(std::fabs(fresh->p_tie - static_cast<long double>(e.p_tie.get_d())) <= bound + 1e-16L);
        CHECK(std::fabs(fresh->p_neither - static_cast<long double>(e.p_neither.get_d())) <= bound + 1e-16L);
    }
}

TEST_CASE("separated refuses boards where it cannot prove the windows apart", "[race][long-duel]") {
    // Same speed: 1d6 against itself finishes in one window.
    const Board board = make_board(50000, Overshoot::stay, {});
    CHECK_FALSE(separated_duel(board, parse_option("1d6"), parse_option("1d6"), 0, 0));
    // Short board: the faster piece's end-zone tail overlaps the slower's window.
    CHECK_FALSE(separated_duel(make_board(300, Overshoot::stay, {}), parse_option("1d6"), parse_option("2d6"), 0, 0));
    // A jump early on the slower piece's path: it could be done at once.
    CHECK_FALSE(separated_duel(make_board(50000, Overshoot::stay, {{10, 49990}}), parse_option("1d6"),
                               parse_option("2d6"), 0, 0));
    // Under auto the board entry falls back to the chains' duel.
    const DuelResult r = duel_on_board(make_board(3000, Overshoot::stay, {}), parse_option("1d6"), parse_option("1d6"),
                                       0, 0, Order::simultaneous);
    CHECK(r.method.first != DuelMethod::separated);
    CHECK(std::fabs(r.margin()) <= r.error_bound());
    // duel() on built chains cannot run it.
    DuelSettings ds;
    ds.method = DuelMethod::separated;
    const Board small = make_board(20, Overshoot::stay, {});
    CHECK_THROWS_AS(duel(build_chain(small, parse_option("1d6")), build_chain(small, parse_option("2d6")),
                         Order::simultaneous, ds),
                    InputError);
}

TEST_CASE("separated on a million squares: a median from the faster piece, a bound below 1e-12", "[race][long-duel]") {
    // The finishing window of 2d6 (mean 7) lies near 10^6 / 7 turns, that of 1d6 near 10^6 / 3.5.
    const Board board = make_board(1'000'000, Overshoot::stay, {});
    const auto r = separated_duel(board, parse_option("1d6"), parse_option("2d6"), 0, 0);
    REQUIRE(r);
    CHECK(r->bound < 5e-13L);
    CHECK(r->p_neither == 0);  // 1d6 can always finish: never stuck
    REQUIRE(r->median_resolved);
    REQUIRE(r->median_rounds);
    CHECK(std::abs(*r->median_rounds - 1'000'000 / 7) < 1000);
    CHECK(std::fabs(r->p_a_wins - 0.335688649974L) < 1e-11L);  // the same at 100,000 squares by the zone method
}

TEST_CASE("zone method jumped by the free walk agrees with the whole pair programme", "[race][long-duel]") {
    // The zone method now starts each series at the last turn its walk surely
    // stays on plain squares (binary powering, long double); the pair programme
    // (no series at all) is the independent reference. Close speeds included:
    // there the finishing windows overlap and only the zone method applies.
    struct Case {
        int length;
        Overshoot rule;
        std::vector<Jump> jumps;
        int start_a;
        const char *a, *b;
    };
    const Case cases[] = {
        {1500, Overshoot::stay, {}, 0, "1d6", "1d6"},
        {1500, Overshoot::stay, {{1490, 1495}}, 0, "1d4+1d8", "3d6"},
        {1500, Overshoot::pass, {}, 100, "2d6", "1d6"},
    };
    for (const Case& c : cases) {
        const Board board = make_board(c.length, c.rule, c.jumps);
        const Chain ca = build_chain(board, parse_option(c.a), c.start_a), cb = build_chain(board, parse_option(c.b));
        for (Order order : {Order::simultaneous, Order::coin}) {  // coin holds both alternating orders
            CAPTURE(c.length, c.a, c.b, to_string(order));
            DuelSettings zs, ps;
            zs.method = DuelMethod::zone;
            ps.method = DuelMethod::pairs;
            agree(duel(ca, cb, order, zs), duel(ca, cb, order, ps), DuelMethod::zone);
        }
    }
}

TEST_CASE("zone method jumped by the free walk: the exact fractions lie inside its bound", "[race][long-duel]") {
    // 1d4 against 1d6 on 520 squares: both walks jump (to turns 158 and 105),
    // the windows overlap (neither is separated). Exact fractions by the GMP pair
    // programme (race/exact*), a different method.
    const Board board = make_board(520, Overshoot::stay, {{515, 517}});
    const Chain ca = build_chain(board, parse_option("1d4")), cb = build_chain(board, parse_option("1d6"));
    for (Order order : {Order::simultaneous, Order::coin}) {
        CAPTURE(to_string(order));
        DuelSettings zs;
        zs.method = DuelMethod::zone;
        const DuelResult z = duel(ca, cb, order, zs);
        const ExactDuel e = exact_duel(ca, cb, order);
        CHECK(std::fabs(z.p_a_wins - static_cast<long double>(e.p_a_wins.get_d())) <= z.bound + 1e-16L);
        CHECK(std::fabs(z.p_b_wins - static_cast<long double>(e.p_b_wins.get_d())) <= z.bound + 1e-16L);
        CHECK(std::fabs(z.p_tie - static_cast<long double>(e.p_tie.get_d())) <= z.bound + 1e-16L);
        CHECK(std::fabs(z.p_neither - static_cast<long double>(e.p_neither.get_d())) <= z.bound + 1e-16L);
        CHECK(z.bound < 1e-13L);
    }
}
