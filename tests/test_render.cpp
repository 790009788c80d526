// Tests of src/render (words): the board in words and CSV cells. The figures
// and the report are tested in test_render_figures.cpp.
#include <catch2/catch.hpp>

#include <string>

#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "core/board.hpp"
#include "core/option.hpp"
#include "render/document.hpp"
#include "render/format.hpp"
#include "render/profile.hpp"

using namespace overshoot;

TEST_CASE("render: the board in words, with and without the turn order", "[render]") {
    const Board plain = make_board(100, Overshoot::stay, {});
    CHECK(render::describe(plain, Order::simultaneous) ==
          "board of 100 squares, overshoot stay, simultaneous turns, no jumps");
    CHECK(render::describe_board(plain) == "board of 100 squares, overshoot stay, no jumps");
    const Board jumpy = make_board(40, Overshoot::bounce, {{3, 11}, {27, 9}});
    CHECK(render::describe(jumpy, Order::coin) == "board of 40 squares, overshoot bounce, coin turns, jumps 3->11 27->9");
    CHECK(render::jumps_text(jumpy.jumps) == "jumps 3->11 27->9");
}

TEST_CASE("render: CSV cells are quoted when a reader would misread them", "[render]") {
    // Common practice for CSV (no published source): a cell with a comma, a
    // quote or a line break is quoted and its quotes doubled.
    CHECK(render::csv_cell("1d6") == "1d6");
    CHECK(render::csv_cell("{1:1,2:1}") == "\"{1:1,2:1}\"");
    CHECK(render::csv_cell("say \"hi\"") == "\"say \"\"hi\"\"\"");
    CHECK(render::csv_cell("two\nlines") == "\"two\nlines\"");
    // Our matrix reader also treats '#' as a comment and trims spaces.
    CHECK(render::csv_cell("#1") == "\"#1\"");
    CHECK(render::csv_cell(" padded") == "\" padded\"");
    CHECK(render::csv_cell("") == "\"\"");
}

TEST_CASE("render: the distribution CSV quotes option names", "[render]") {
    // A custom die's name holds commas; unquoted, a CSV reader would split it.
    const Board b = make_board(12, Overshoot::stay, {});
    Option o = parse_option("{1:1,2:1}");
    const Chain c = build_chain(b, o);
    const std::string csv = render::distribution_csv({{&o, distribution(c, 1e-12, 1000)}});
    CHECK(csv.rfind("option,turn,p,cumulative\n\"{1:1,2:1}\",1,", 0) == 0);
    CHECK(csv.find("\n\"{1:1,2:1}\",never,") != std::string::npos);
    CHECK(csv.find("\n{1:1") == std::string::npos);
}
