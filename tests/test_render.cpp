// Tests of src/render (words): the board in words and CSV cells. The figures
// and the report are tested in test_render_figures.cpp.
#include <catch2/catch.hpp>

#include <string>

#include "core/board.hpp"
#include "render/document.hpp"
#include "render/format.hpp"

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
