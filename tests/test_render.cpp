// Tests of src/render (words): the board in words, CSV cells, margins in
// points, plurals, escaping, wide tables, duels and profiles in words. The figures
// and the report are tested in test_render_figures.cpp.
#include <catch2/catch.hpp>

#include <algorithm>
#include <string>
#include <vector>

#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "race/duel.hpp"
#include "race/exact.hpp"
#include "render/duel.hpp"
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

// ------------------------------------------------------------- wording (issue 17)

TEST_CASE("render: margins in points, never a negative zero", "[render]") {
    CHECK(render::points(0.288707) == "28.8707 points");
    CHECK(render::points(-0.0) == "0.0000 points");
    CHECK(render::points(0.0) == "0.0000 points");
    CHECK(render::points(2e-8) == "2e-06 points");  // tiny margins keep three digits
    // What an equilibrium mix guarantees is 0 up to rounding: fixed, unsigned zero.
    CHECK(render::signed_points(-6.94e-18) == "0.0000");
    CHECK(render::signed_points(-0.0) == "0.0000");
    CHECK(render::signed_points(0.156431) == "+15.6431");
    CHECK(render::signed_points(-0.156431) == "-15.6431");
    CHECK(render::fixed(-0.00001, 4) == "0.0000");
    CHECK(render::fixed(-0.5, 1) == "-0.5");
}

TEST_CASE("render: plurals", "[render]") {
    CHECK(render::plural(1, "square") == "1 square");
    CHECK(render::plural(0, "arc") == "0 arcs");
    CHECK(render::plural(2, "cycle") == "2 cycles");
    CHECK(render::describe_board(make_board(1, Overshoot::stay, {})) == "board of 1 square, overshoot stay, no jumps");
}

TEST_CASE("render: LaTeX and Markdown escaping is complete", "[render]") {
    // The ten special characters of LaTeX (Lamport, "LaTeX: A Document Preparation System", 2nd ed. 1994, sec. 2.2.1)
    // and < > | which the default OT1 font encoding prints as other glyphs.
    CHECK(render::latex_escape("#$%&_{}") == "\\#\\$\\%\\&\\_\\{\\}");
    CHECK(render::latex_escape("~^\\") == "\\textasciitilde{}\\textasciicircum{}\\textbackslash{}");
    CHECK(render::latex_escape("a<b>c|d") == "a\\textless{}b\\textgreater{}c\\textbar{}d");
    CHECK(render::latex_escape("2d6") == "2d6");
    // CommonMark 0.30, sec. 2.4: any ASCII punctuation may be backslash-escaped.
    CHECK(render::md_escape("a|b*c_d`e[f]g<h>i") == "a\\|b\\*c\\_d\\`e\\[f\\]g\\<h\\>i");
    CHECK(render::md_escape("{1:3,4:1}") == "\\{1:3,4:1\\}");
    CHECK(render::md_escape("&amp; $x$ ~~s~~ !x #") == "\\&amp; \\$x\\$ \\~\\~s\\~\\~ \\!x \\#");
    // At the start of a line: a bullet, an underline or an ordered-list number.
    CHECK(render::md_escape("- x") == "\\- x");
    CHECK(render::md_escape("+ x") == "\\+ x");
    CHECK(render::md_escape("12. x") == "12\\. x");
    CHECK(render::md_escape("3) x") == "3\\) x");
    CHECK(render::md_escape("1d6 - 2d6.") == "1d6 - 2d6.");  // inside a line they mean nothing
}

TEST_CASE("render: a table wider than 100 characters is cut into column blocks", "[render]") {
    std::vector<std::string> header{"option"};
    std::vector<std::vector<std::string>> rows;
    for (int j = 0; j < 20; ++j) header.push_back("{0:1," + std::to_string(j + 1) + ":1}");
    for (int i = 0; i < 20; ++i) {
        std::vector<std::string> r{header[i + 1]};
        for (int j = 0; j < 20; ++j) r.push_back(i == j ? "-" : "12.3456%");
        rows.push_back(r);
    }
    const std::string wide = render::table(header, rows);
    const std::string cut = render::table(header, rows, render::max_text_width);
    std::size_t widest = 0, blocks = 1, first_column = 0;
    std::size_t start = 0;
    for (std::size_t p = cut.find('\n'); p != std::string::npos; start = p + 1, p = cut.find('\n', start)) {
        const std::string line = cut.substr(start, p - start);
        widest = std::max(widest, line.size());
        blocks += line.empty();
        first_column += line.rfind("{0:1,7:1}", 0) == 0;  // every block repeats the row names
    }
    CHECK(wide.find('\n') > 100);
    CHECK(widest <= 100);
    CHECK(blocks >= 3);
    CHECK(first_column == blocks);
    // Every cell is still there.
    std::size_t cells = 0;
    for (auto p = cut.find("12.3456%"); p != std::string::npos; p = cut.find("12.3456%", p + 1)) ++cells;
    CHECK(cells == 20 * 19);
}

namespace {

struct Seats {
    Board board = make_board(20, Overshoot::stay, {});
    Option a, b;
    DuelResult r;
    Seats(const char* sa, const char* sb, Order order) : a(parse_option(sa)), b(parse_option(sb)) {
        r = duel(build_chain(board, a), build_chain(board, b), order);
    }
};

}  // namespace

TEST_CASE("render: one option in both seats is told apart, and called even when it is", "[render]") {
    Seats s("2d6", "2d6", Order::simultaneous);
    const std::string text = render::duel_text(s.board, Order::simultaneous, s.a, s.b, s.r);
    CHECK_THAT(text, Catch::Contains("2d6 (A) wins"));
    CHECK_THAT(text, Catch::Contains("2d6 (B) wins"));
    CHECK_THAT(text, Catch::Contains("are even"));
    CHECK_THAT(text, !Catch::Contains("undecided"));
    CHECK(render::duel_json(s.board, Order::simultaneous, s.a, s.b, s.r)["verdict"] == "even");
    // Under a-first the seats differ: A, moving first, beats the same option.
    Seats f("2d6", "2d6", Order::a_first);
    CHECK_THAT(render::duel_text(f.board, Order::a_first, f.a, f.b, f.r), Catch::Contains("2d6 (A) beats 2d6 (B) by"));
    // Different names stay as they are.
    Seats d("1d6", "2d6", Order::simultaneous);
    CHECK_THAT(render::duel_text(d.board, Order::simultaneous, d.a, d.b, d.r), Catch::Contains("\n1d6 wins"));
}

TEST_CASE("render: an exact margin of 0 is even, not undecided; a non-zero one decides", "[render]") {
    Seats s("[1,2,3]", "{1:1,2:1,3:1}", Order::simultaneous);  // one distribution, spelled two ways
    const ExactDuel e = exact_duel(build_chain(s.board, s.a), build_chain(s.board, s.b), Order::simultaneous);
    REQUIRE(sgn(e.margin()) == 0);
    const std::string without = render::duel_text(s.board, Order::simultaneous, s.a, s.b, s.r);
    CHECK_THAT(without, Catch::Contains("undecided"));  // floating point alone cannot tell
    const std::string with = render::duel_text(s.board, Order::simultaneous, s.a, s.b, s.r, {}, &e);
    CHECK_THAT(with, Catch::Contains("are even: the exact margin is 0."));
    CHECK_THAT(with, !Catch::Contains("undecided"));
    CHECK(render::duel_json(s.board, Order::simultaneous, s.a, s.b, s.r, {}, &e)["verdict"] == "even");
    CHECK_THAT(render::duel_markdown(s.board, Order::simultaneous, s.a, s.b, s.r, {}, &e), Catch::Contains("even"));
    CHECK_THAT(render::duel_latex(s.board, Order::simultaneous, s.a, s.b, s.r, {}, &e), Catch::Contains("even"));
}

TEST_CASE("render: the duel in Markdown and LaTeX escapes names and shows points", "[render]") {
    Board board = make_board(20, Overshoot::stay, {});
    Option a = parse_option("1d6", "a<b>_|"), b = parse_option("2d6", "c*d");
    DuelResult r = duel(build_chain(board, a), build_chain(board, b), Order::simultaneous);
    const std::string md = render::duel_markdown(board, Order::simultaneous, a, b, r);
    CHECK_THAT(md, Catch::Contains("a\\<b\\>\\_\\| wins"));
    CHECK_THAT(md, Catch::Contains(" points"));
    const std::string tex = render::duel_latex(board, Order::simultaneous, a, b, r);
    CHECK_THAT(tex, Catch::Contains("a\\textless{}b\\textgreater{}\\_\\textbar{} wins"));
    CHECK_THAT(tex, Catch::Contains("\\begin{tabular}"));
}

TEST_CASE("render: profile labels what its median and mean count; a certain finish prints as 100% (certain)",
          "[render]") {
    Board board = make_board(100, Overshoot::stay, {});
    Option one = parse_option("1d6"), two = parse_option("2d6");
    Profile p1 = profile(build_chain(board, one)), p2 = profile(build_chain(board, two));
    CHECK(p1.p_finish == 1.0);  // no stuck square: exactly 1, not 0.9999999999999998
    CHECK(p1.p_stuck == 0.0);
    CHECK(p2.p_finish < 1.0);  // 2d6 can stick at distance 1
    const std::string text = render::profile_text(board, Order::simultaneous, {{&one, p1}, {&two, p2}});
    CHECK_THAT(text, Catch::Contains("mean turns (finishers)"));
    CHECK_THAT(text, Catch::Contains("median (all races)"));
    CHECK_THAT(text, Catch::Contains("100% (certain)"));
    CHECK_THAT(text, Catch::Contains("66.4311%"));
}
