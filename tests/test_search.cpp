// Board search (src/search/search.cpp): exhaustive single jumps and head
// starts against loops written here, the beam search's determinism, refusals.
// The Python brute force over every jump is tests/scripts/check_search_brute.py.
#include <catch2/catch.hpp>

#include <algorithm>
#include <array>
#include <limits>

#include "chain/chain.hpp"
#include "race/duel.hpp"

#include "core/board.hpp"
#include "core/error.hpp"
#include "render/search.hpp"
#include "search/screen.hpp"
#include "search/search.hpp"
#include "support.hpp"
#include "tournament/tournament.hpp"

using namespace overshoot;
using overshoot::testing::opts;

namespace {

// Runs a search on one thread and on two: the JSON must be the same (the
// one-thread result is returned).
SearchResult same_on_one_and_two_threads(SearchSpec spec) {
    spec.threads = 1;
    const SearchResult a = search_board(spec);
    spec.threads = 2;
    const SearchResult b = search_board(spec);
    CHECK(render::search_json(a, spec).dump() == render::search_json(b, spec).dump());
    return a;
}

}  // namespace

TEST_CASE("search: one added jump is every jump, ranked by the tournament's margins", "[search]") {
    SearchSpec spec;
    spec.board = make_board(9, Overshoot::stay, {});
    spec.options = opts({"1d3", "2d2", "[1,1,4]"});
    spec.target = SearchTarget::cycle;
    spec.cycle = {0, 1, 2};
    spec.keep = 4;
    spec.threads = 2;
    const SearchResult r = search_board(spec);
    CHECK(r.exhaustive);
    // Every FROM 1..8 with every TO 0..9 but FROM, one board without a change; no loop is possible.
    CHECK(r.boards_raced == 8 * 9 + 1);
    CHECK(r.boards_invalid == 0);
    // The best score by a loop over every jump, each raced with race_matrix here.
    double best = -std::numeric_limits<double>::infinity();
    for (int f = 1; f < 9; ++f)
        for (int t = 0; t <= 9; ++t) {
            if (t == f) continue;
            const Board b = make_board(9, Overshoot::stay, {{f, t}});
            const Tournament tt = analyse(race_matrix(b, Order::simultaneous, spec.options));
            best = std::max(best, score_of(SearchTarget::cycle, spec.cycle, 3, tt.margin));
        }
    REQUIRE(r.best.size() == 4);
    CHECK(r.best.front().score == Approx(best).margin(1e-12));
    for (std::size_t i = 1; i < r.best.size(); ++i) CHECK(r.best[i - 1].score >= r.best[i].score);
    // What is reported holds exactly when every arc of the cycle is an arc of the verified tournament.
    for (const auto& f : r.best) {
        const bool all = f.verified.beats[0 * 3 + 1] && f.verified.beats[1 * 3 + 2] && f.verified.beats[2 * 3 + 0];
        CHECK(f.holds == all);
        CHECK(f.added.size() <= 1);
    }
}

TEST_CASE("search: a beam search is the same for the same seed, whatever the threads", "[search]") {
    SearchSpec spec;
    spec.board = make_board(14, Overshoot::bounce, {{5, 9}});
    spec.options = opts({"1d4", "2d3", "[0,2,5]"});
    spec.target = SearchTarget::no_winner;
    spec.max_jumps = 2;
    spec.beam = 3;
    spec.sample = 20;
    spec.keep = 3;
    spec.seed = 7;
    const SearchResult a = same_on_one_and_two_threads(spec);
    CHECK_FALSE(a.exhaustive);
    // The board's own jump stays; the search only adds.
    for (const auto& f : a.best) CHECK(std::find(f.board.jumps.begin(), f.board.jumps.end(), Jump{5, 9}) != f.board.jumps.end());
    // At least as good as the best single jump: the beam starts from those boards.
    spec.max_jumps = 1;
    const SearchResult one = search_board(spec);
    CHECK(a.best.front().score >= one.best.front().score);
}

TEST_CASE("search: allowed squares and lengths", "[search]") {
    SearchSpec spec;
    spec.board = make_board(12, Overshoot::stay, {});
    spec.options = opts({"1d3", "2d2"});
    spec.target = SearchTarget::fair;
    spec.from_squares = {4, 5};
    spec.to_squares = {0, 1, 2};
    spec.length_lo = 11;
    spec.length_hi = 12;
    const SearchResult r = search_board(spec);
    // Two lengths, each unchanged or with one of 2 x 3 jumps.
    CHECK(r.boards_raced == 2 * (1 + 6));
    for (const auto& f : r.best) {
        CHECK((f.board.length == 11 || f.board.length == 12));
        for (const auto& j : f.added) {
            CHECK((j.from == 4 || j.from == 5));
            CHECK(j.to <= 2);
        }
    }
    spec.from_squares = {12};
    CHECK_THROWS_AS(search_board(spec), InputError);
}

TEST_CASE("search: refusals", "[search]") {
    SearchSpec spec;
    spec.board = make_board(12, Overshoot::stay, {});
    spec.options = opts({"1d3", "2d2", "1d4"});
    spec.target = SearchTarget::cycle;
    CHECK_THROWS_AS(search_board(spec), InputError);  // no cycle named
    spec.target = SearchTarget::no_winner;
    spec.order = Order::a_first;
    CHECK_THROWS_AS(search_board(spec), InputError);  // the matrix would depend on the seat
    spec.order = Order::coin;
    spec.max_jumps = 9;
    CHECK_THROWS_AS(search_board(spec), InputError);
    CHECK_THROWS_AS(parse_search_target("fairest"), InputError);
}

TEST_CASE("search: the scenario file and the drawing", "[search]") {
    const Board b = make_board(23, Overshoot::bounce, {{3, 11}, {20, 2}});
    const std::string toml = render::scenario_toml(b, Order::coin, opts({"1d6", "[0,3,3,5]"}));
    CHECK(toml.find("length = 23") != std::string::npos);
    CHECK(toml.find("jumps = [[3, 11], [20, 2]]") != std::string::npos);
    CHECK(toml.find("\"[0,3,3,5]\" = \"[0,3,3,5]\"") != std::string::npos);
    CHECK(render::board_flags(b, Order::coin) == "--length 23 --overshoot bounce --jump 3:11 --jump 20:2 --order coin");
    const std::string svg = render::svg::file(render::board_figure(b, {{20, 2}}, "t"));
    CHECK(svg.find("jump 20 -&gt; 2 (added)") != std::string::npos);
    CHECK(svg.find("jump 3 -&gt; 11</title>") != std::string::npos);
}

TEST_CASE("search: screening margins agree with the duel engine", "[search]") {
    // The screening is only a ranking aid, but a wrong ranking would hide good
    // boards: on random boards (forward and backward jumps, every rule, both
    // orders) its margins must match duel() (proven bounds below 1e-12) to 1e-9.
    const auto options = opts({"1d6", "2d6", "3d6", "[0,1,5]", "{1:3,4:1}"});
    std::uint64_t state = 12345;
    auto next = [&](int n) {
        state = state * 6364136223846793005ULL + 1442695040888963407ULL;
        return static_cast<int>((state >> 33) % static_cast<std::uint64_t>(n));
    };
    int boards = 0;
    while (boards < 40) {
        const int L = 20 + next(60);
        const Overshoot rule = std::array{Overshoot::stay, Overshoot::bounce, Overshoot::pass}[next(3)];
        std::vector<Jump> js;
        for (int k = next(3); k > 0; --k) js.push_back({1 + next(L - 1), next(L + 1)});
        Board b;
        try {
            b = make_board(L, rule, js);
        } catch (const InputError&) {
            continue;
        }
        ++boards;
        const Order order = next(2) ? Order::coin : Order::simultaneous;
        const std::size_t i = static_cast<std::size_t>(next(5)), j = (i + 1 + static_cast<std::size_t>(next(4))) % 5;
        const Chain a = build_chain(b, options[i]), c = build_chain(b, options[j]);
        const DuelResult d = duel(a, c, order);
        INFO("board " << L << " " << to_string(rule) << " jumps " << js.size() << " " << options[i].name << " vs "
                      << options[j].name);
        REQUIRE(d.error_bound() < 1e-12);
        CHECK(screen_margin(screen_track(a), screen_track(c), order) == Approx(d.margin()).margin(1e-9));
    }
}

TEST_CASE("search: head starts alone are every assignment, each raced with race_matrix here", "[search][head-start]") {
    SearchSpec spec;
    spec.board = make_board(13, Overshoot::stay, {{4, 8}});
    spec.options = opts({"1d3", "2d2", "1d4"});
    spec.target = SearchTarget::cycle;
    spec.cycle = {0, 1, 2};
    spec.max_jumps = 0;
    spec.head_start_max = 4;
    spec.keep = 3;
    spec.threads = 2;
    const SearchResult r = search_board(spec);
    CHECK(r.exhaustive);
    CHECK(r.start_grid);
    CHECK(r.boards_raced == 5 * 5 * 5);  // no start on 0..4 has a jump into the finish
    double best = -std::numeric_limits<double>::infinity();
    for (int x = 0; x <= 4; ++x)
        for (int y = 0; y <= 4; ++y)
            for (int z = 0; z <= 4; ++z) {
                const Tournament t = analyse(race_matrix(spec.board, Order::simultaneous, spec.options, {}, 1, {x, y, z}));
                best = std::max(best, score_of(SearchTarget::cycle, spec.cycle, 3, t.margin));
            }
    REQUIRE(r.best.size() == 3);
    CHECK(r.best.front().score == Approx(best).margin(1e-12));
    // Each reported board is what race_matrix gives with its start squares
    // (the search's settings: no race lengths, so the shared-series method).
    DuelSettings quick;
    quick.want_median = false;
    for (const auto& f : r.best) {
        REQUIRE(f.starts.size() == 3);
        const Tournament t = analyse(race_matrix(f.board, Order::simultaneous, spec.options, quick, 1, f.starts));
        CHECK(score_of(SearchTarget::cycle, spec.cycle, 3, t.margin) == f.score);
    }
    // The printed flags and the scenario file carry the head starts.
    const auto& f = r.best.front();
    std::string flags;
    for (std::size_t i = 0; i < 3; ++i)
        if (f.starts[i]) flags += " --head-start " + spec.options[i].name + ":" + std::to_string(f.starts[i]);
    CHECK(render::search_json(r, spec)["best"][0]["flags"] == render::board_flags(f.board, spec.order) + flags);
    if (!flags.empty()) CHECK(render::scenario_toml(f.board, spec.order, spec.options, f.starts).find("[head_starts]") != std::string::npos);
}

TEST_CASE("search: head starts with jumps are a seeded beam, the same whatever the threads", "[search][head-start]") {
    SearchSpec spec;
    spec.board = make_board(20, Overshoot::stay, {});
    spec.options = opts({"1d3", "2d2", "[1,1,4]"});
    spec.target = SearchTarget::no_winner;
    spec.max_jumps = 1;
    spec.head_start_max = 5;
    spec.beam = 3;
    spec.sample = 25;
    spec.keep = 4;
    const SearchResult a = same_on_one_and_two_threads(spec);
    CHECK_FALSE(a.exhaustive);
    for (const auto& f : a.best) {
        CHECK(f.added.size() <= 1);
        for (int s : f.starts) CHECK((s >= 0 && s <= 5));
    }
    // No worse than head starts alone or one jump alone: the beam begins with every single change.
    spec.max_jumps = 0;
    CHECK(a.best.front().score >= search_board(spec).best.front().score);
    spec.max_jumps = 1;
    spec.head_start_max = 0;
    CHECK(a.best.front().score >= search_board(spec).best.front().score);
    // A head start bound off the board is refused.
    spec.head_start_max = 20;
    CHECK_THROWS_AS(search_board(spec), InputError);
}
