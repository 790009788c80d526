// Tests of src/core: the option spec parser, board validation and the
// scenario loader. Expected distributions are worked out by hand from the
// spec grammar in DESIGN.md (counting faces), not read back from the code.
#include <catch2/catch.hpp>

#include <sys/stat.h>
#include <unistd.h>

#include <cstdint>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "core/board.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "core/limits.hpp"
#include "core/option.hpp"
#include "core/scenario.hpp"
#include "core/setup.hpp"

using namespace overshoot;
using W = std::vector<std::uint64_t>;

namespace {

// Probability of each move as a double, for comparing specs with equal meaning.
std::vector<double> probs(const Option& o) {
    std::vector<double> p(o.weight.size());
    for (std::size_t m = 0; m < p.size(); ++m) p[m] = static_cast<double>(o.probability(static_cast<int>(m)));
    return p;
}

bool same_distribution(const Option& a, const Option& b) {
    return a.weight == b.weight && a.denominator == b.denominator;
}

// Message of the InputError thrown by f, or "" when none is thrown.
template <class F>
std::string input_error(F&& f) {
    try {
        f();
    } catch (const InputError& e) {
        return e.what();
    }
    return "";
}

}  // namespace

// ---------------------------------------------------------------- options

TEST_CASE("NdS is the sum of N fair dice with faces 1..S", "[core]") {
    // Counting: one d6 has one way per face 1..6.
    Option one = parse_option("1d6");
    CHECK(one.weight == W{0, 1, 1, 1, 1, 1, 1});
    CHECK(one.denominator == 6);
    CHECK(one.name == "1d6");
    CHECK(one.spec == "1d6");
    CHECK(one.min_move() == 1);
    CHECK(one.max_move() == 6);
    CHECK(one.mean() == Approx(3.5));
    // Two d6: 1,2,3,4,5,6,5,4,3,2,1 ways for sums 2..12 over 36.
    Option two = parse_option("2d6");
    CHECK(two.weight == W{0, 0, 1, 2, 3, 4, 5, 6, 5, 4, 3, 2, 1});
    CHECK(two.denominator == 36);
    CHECK(two.mean() == Approx(7.0));
    // Three d6: 27 ways to roll 10 (and 11) of 216, the well-known peak.
    Option three = parse_option("3d6");
    CHECK(three.denominator == 216);
    CHECK(three.weight[10] == 27);
    CHECK(three.weight[11] == 27);
    CHECK(three.weight[3] == 1);
    CHECK(three.weight[18] == 1);
}

TEST_CASE("dS means 1dS and the d may be upper case; whitespace is ignored", "[core]") {
    CHECK(same_distribution(parse_option("d6"), parse_option("1d6")));
    CHECK(same_distribution(parse_option("2D6"), parse_option("2d6")));
    CHECK(same_distribution(parse_option(" 2 d 6 "), parse_option("2d6")));
    // The name defaults to the spec exactly as typed, spaces included.
    CHECK(parse_option(" 2 d 6 ").name == " 2 d 6 ");
    CHECK(parse_option("2d6", "bold").name == "bold");
    CHECK(parse_option("2d6", "bold").spec == "2d6");
}

TEST_CASE("custom dice: listed faces, 0 and repeats allowed, gcd-reduced", "[core]") {
    Option o = parse_option("[0,2]");
    CHECK(o.weight == W{1, 0, 1});
    CHECK(o.denominator == 2);
    // Repeats count twice: faces 1,1,3 -> P(1) = 2/3, P(3) = 1/3.
    Option r = parse_option("[1,1,3]");
    CHECK(r.weight == W{0, 2, 0, 1});
    CHECK(r.denominator == 3);
    // [2,2,4,4] is the same distribution as [2,4] after reduction.
    CHECK(same_distribution(parse_option("[2,2,4,4]"), parse_option("[2,4]")));
    // Two copies: [1,3] + [1,3] gives 2:1, 4:2, 6:1 over 4.
    Option two = parse_option("2[1,3]");
    CHECK(two.weight == W{0, 0, 1, 0, 2, 0, 1});
    CHECK(two.denominator == 4);
    // A die with faces 1..6 listed is 1d6.
    CHECK(same_distribution(parse_option("[1,2,3,4,5,6]"), parse_option("1d6")));
}

TEST_CASE("weighted moves, constants and sums", "[core]") {
    Option s = parse_option("{1:2,3:1}");
    CHECK(s.weight == W{0, 2, 0, 1});
    CHECK(s.denominator == 3);
    Option k = parse_option("4");
    CHECK(k.weight == W{0, 0, 0, 0, 1});
    CHECK(k.denominator == 1);
    // 1d6+[0,2]: each sum 1..8; 1,2 and 7,8 have one way, 3..6 two ways, over 12.
    Option sum = parse_option("1d6+[0,2]");
    CHECK(sum.weight == W{0, 1, 1, 2, 2, 2, 2, 1, 1});
    CHECK(sum.denominator == 12);
    // A constant shifts: 1d6+2 moves 3..8 uniformly.
    CHECK(parse_option("1d6+2").weight == W{0, 0, 0, 1, 1, 1, 1, 1, 1});
    // Sums commute and 2d6 = 1d6+1d6.
    CHECK(same_distribution(parse_option("1d6+1d6"), parse_option("2d6")));
    CHECK(same_distribution(parse_option("[0,2]+1d6"), parse_option("1d6+[0,2]")));
    // Spinner weights are kept exactly: {0:1,5:999} has denominator 1000.
    Option heavy = parse_option("{0:1,5:999}");
    CHECK(heavy.denominator == 1000);
    CHECK(heavy.weight[0] == 1);
    CHECK(heavy.weight[5] == 999);
    auto p = probs(heavy);
    CHECK(p[0] == Approx(0.001));
}

TEST_CASE("5d12 is kept exactly over 12^5", "[core]") {
    Option o = parse_option("5d12");
    CHECK(o.denominator == 248832);  // 12^5
    CHECK(o.weight[5] == 1);         // only 1+1+1+1+1
    CHECK(o.weight[60] == 1);
    std::uint64_t total = 0;
    for (auto w : o.weight) total += w;
    CHECK(total == o.denominator);
}

TEST_CASE("malformed spec 0d6", "[core]") {
    auto m = input_error([] { parse_option("0d6"); });
    CHECK_THAT(m, Catch::Contains("0d6") && Catch::Contains("at least 1"));
}
TEST_CASE("malformed spec 2d0", "[core]") {
    auto m = input_error([] { parse_option("2d0"); });
    CHECK_THAT(m, Catch::Contains("2d0") && Catch::Contains("side"));
}
TEST_CASE("malformed spec d", "[core]") {
    CHECK_THAT(input_error([] { parse_option("d"); }), Catch::Contains("sides"));
}
TEST_CASE("malformed spec 3d", "[core]") {
    CHECK_THAT(input_error([] { parse_option("3d"); }), Catch::Contains("sides"));
}
TEST_CASE("malformed spec [] (no faces)", "[core]") {
    CHECK_THAT(input_error([] { parse_option("[]"); }), Catch::Contains("face"));
}
TEST_CASE("malformed spec [1,-2] (negative face)", "[core]") {
    CHECK_THAT(input_error([] { parse_option("[1,-2]"); }), Catch::Contains("negative"));
}
TEST_CASE("malformed spec: unbalanced brackets", "[core]") {
    CHECK_THAT(input_error([] { parse_option("[1,2"); }), Catch::Contains("']'"));
    CHECK_THAT(input_error([] { parse_option("1,2]"); }), Catch::Contains("unexpected"));
    CHECK_THAT(input_error([] { parse_option("{1:2"); }), Catch::Contains("'}'"));
    CHECK_THAT(input_error([] { parse_option("[[1]]"); }), Catch::Contains("face"));
    CHECK_THAT(input_error([] { parse_option("1d6]"); }), Catch::Contains("unexpected"));
}
TEST_CASE("malformed spec: absurdly large counts", "[core]") {
    // Above the documented limits of core/limits.hpp, or a denominator beyond 2^62.
    CHECK_THROWS_AS(parse_option("99999999999999999999d6"), InputError);
    CHECK_THAT(input_error([] { parse_option("5000d6"); }), Catch::Contains("dice"));
    CHECK_THAT(input_error([] { parse_option("2d999999999"); }), Catch::Contains("limit"));
    CHECK_THAT(input_error([] { parse_option("1000d1000"); }), Catch::Contains("2^62"));
    CHECK_THAT(input_error([] { parse_option("[1,200000]"); }), Catch::Contains("limit"));
    CHECK_THAT(input_error([] { parse_option("{1:4611686018427387904,2:1}"); }), Catch::Contains("2^62"));
}
TEST_CASE("malformed spec: other errors name the column", "[core]") {
    CHECK_THAT(input_error([] { parse_option(""); }), Catch::Contains("empty"));
    CHECK_THAT(input_error([] { parse_option("1d6+"); }), Catch::Contains("column 5"));
    CHECK_THAT(input_error([] { parse_option("x"); }), Catch::Contains("column 1"));
    CHECK_THAT(input_error([] { parse_option("{1:0}"); }), Catch::Contains("weight"));
    CHECK_THAT(input_error([] { parse_option("{1:1,1:2}"); }), Catch::Contains("twice"));
    CHECK_THAT(input_error([] { parse_option("2{1:1}"); }), Catch::Contains("count"));
}

// ---------------------------------------------------------------- boards

TEST_CASE("board: jumps are followed in chains and may finish", "[core]") {
    Board b = make_board(20, Overshoot::stay, {{3, 11}, {11, 15}, {17, 2}, {19, 20}});
    CHECK(b.after_jumps[3] == 15);   // 3 -> 11 -> 15
    CHECK(b.after_jumps[11] == 15);
    CHECK(b.after_jumps[17] == 2);
    CHECK(b.after_jumps[19] == 20);  // a jump onto the finish finishes
    CHECK(b.after_jumps[5] == 5);
    CHECK(b.after_jumps[0] == 0);
    CHECK_FALSE(b.forward_only());  // 17 -> 2 moves backward
    CHECK(make_board(20, Overshoot::stay, {{3, 11}}).forward_only());
    CHECK(make_board(20, Overshoot::pass, {}).forward_only());
    CHECK_FALSE(make_board(20, Overshoot::bounce, {}).forward_only());
    // Jumps are kept sorted by source.
    CHECK(b.jumps.front() == Jump{3, 11});
}

TEST_CASE("bad board: jump from square 0", "[core]") {
    CHECK_THAT(input_error([] { make_board(10, Overshoot::stay, {{0, 5}}); }),
               Catch::Contains("0:5") && Catch::Contains("square 0"));
}
TEST_CASE("bad board: jump from the finish", "[core]") {
    CHECK_THAT(input_error([] { make_board(10, Overshoot::stay, {{10, 3}}); }),
               Catch::Contains("10:3") && Catch::Contains("finish"));
}
TEST_CASE("bad board: jump outside the board", "[core]") {
    CHECK_THAT(input_error([] { make_board(10, Overshoot::stay, {{11, 3}}); }), Catch::Contains("outside"));
    CHECK_THAT(input_error([] { make_board(10, Overshoot::stay, {{3, 11}}); }), Catch::Contains("outside"));
    CHECK_THAT(input_error([] { make_board(10, Overshoot::stay, {{3, -1}}); }), Catch::Contains("outside"));
    CHECK_THAT(input_error([] { make_board(10, Overshoot::stay, {{-2, 4}}); }), Catch::Contains("-2:4"));
}
TEST_CASE("bad board: two jumps from one square", "[core]") {
    CHECK_THAT(input_error([] { make_board(10, Overshoot::stay, {{3, 5}, {3, 7}}); }),
               Catch::Contains("square 3 already has a jump"));
}
TEST_CASE("bad board: a jump loop", "[core]") {
    CHECK_THAT(input_error([] { make_board(10, Overshoot::stay, {{3, 5}, {5, 3}}); }), Catch::Contains("loop"));
    CHECK_THAT(input_error([] { make_board(10, Overshoot::stay, {{2, 6}, {6, 8}, {8, 2}}); }),
               Catch::Contains("loop"));
    CHECK_THAT(input_error([] { make_board(10, Overshoot::stay, {{4, 4}}); }), Catch::Contains("another square"));
}
TEST_CASE("bad board: length 0 or beyond the documented maximum", "[core]") {
    CHECK_THAT(input_error([] { make_board(0, Overshoot::stay, {}); }), Catch::Contains("length 0"));
    CHECK_THROWS_AS(make_board(-5, Overshoot::stay, {}), InputError);
    CHECK_THROWS_AS(make_board(limits::max_length + 1, Overshoot::stay, {}), LimitError);
    CHECK_NOTHROW(make_board(1, Overshoot::stay, {}));
}
TEST_CASE("rule, order and jump words", "[core]") {
    CHECK(parse_overshoot("bounce") == Overshoot::bounce);
    CHECK(parse_order("b-first") == Order::b_first);
    CHECK(parse_jump("3:11") == Jump{3, 11});
    CHECK_THAT(input_error([] { parse_overshoot("wrap"); }), Catch::Contains("wrap"));
    CHECK_THAT(input_error([] { parse_order("fast"); }), Catch::Contains("fast"));
    CHECK_THAT(input_error([] { parse_jump("3-5"); }), Catch::Contains("3-5"));
    CHECK_THROWS_AS(parse_jump("3:"), InputError);
    CHECK_THROWS_AS(parse_jump(":3"), InputError);
    CHECK_THROWS_AS(parse_jump("3:4x"), InputError);
}

// ---------------------------------------------------------------- scenarios

TEST_CASE("scenario: every key of DESIGN.md, options in file order", "[core]") {
    Scenario s = parse_scenario(R"(
[board]
length = 40
overshoot = "bounce"
jumps = [[3, 11], [27, 9]]

[race]
order = "a-first"

[options]
zebra = "1d6"
apple = "2d6"
mango = "[0,2]+1d6"
)",
                                "inline.toml");
    REQUIRE(s.length);
    CHECK(*s.length == 40);
    CHECK(*s.rule == Overshoot::bounce);
    REQUIRE(s.jumps);
    CHECK(s.jumps->size() == 2);
    CHECK((*s.jumps)[1] == Jump{27, 9});
    CHECK(*s.order == Order::a_first);
    REQUIRE(s.options.size() == 3);
    // File order, not alphabetical.
    CHECK(s.options[0].name == "zebra");
    CHECK(s.options[1].name == "apple");
    CHECK(s.options[2].spec == "[0,2]+1d6");
}

TEST_CASE("scenario: every field is optional", "[core]") {
    Scenario s = parse_scenario("[options]\na = \"1d6\"\n", "x.toml");
    CHECK_FALSE(s.length);
    CHECK_FALSE(s.rule);
    CHECK_FALSE(s.jumps);
    CHECK_FALSE(s.order);
    CHECK(s.options.size() == 1);
}

TEST_CASE("bad scenario: unknown keys", "[core]") {
    CHECK_THAT(input_error([] { parse_scenario("[board]\nlength = 10\nsize = 3\n", "u.toml"); }),
               Catch::Contains("u.toml:3") && Catch::Contains("unknown key 'size'"));
    CHECK_THAT(input_error([] { parse_scenario("[rules]\nx = 1\n", "u.toml"); }), Catch::Contains("'rules'"));
    CHECK_THAT(input_error([] { parse_scenario("[race]\nturns = \"coin\"\n", "u.toml"); }),
               Catch::Contains("'turns'"));
}

TEST_CASE("bad scenario: wrong value types", "[core]") {
    CHECK_THAT(input_error([] { parse_scenario("[board]\nlength = \"ten\"\n", "t.toml"); }),
               Catch::Contains("t.toml:2") && Catch::Contains("integer"));
    CHECK_THAT(input_error([] { parse_scenario("[board]\nlength = 10.5\n", "t.toml"); }),
               Catch::Contains("integer"));
    CHECK_THAT(input_error([] { parse_scenario("[board]\novershoot = 1\n", "t.toml"); }),
               Catch::Contains("string"));
    CHECK_THAT(input_error([] { parse_scenario("[board]\njumps = [3, 11]\n", "t.toml"); }),
               Catch::Contains("pair"));
    CHECK_THAT(input_error([] { parse_scenario("[board]\njumps = [[3, \"x\"]]\n", "t.toml"); }),
               Catch::Contains("integer"));
    CHECK_THAT(input_error([] { parse_scenario("[board]\njumps = 4\n", "t.toml"); }), Catch::Contains("array"));
    CHECK_THAT(input_error([] { parse_scenario("[options]\nsteady = 6\n", "t.toml"); }),
               Catch::Contains("'steady'") && Catch::Contains("string"));
    CHECK_THAT(input_error([] { parse_scenario("board = 3\n", "t.toml"); }), Catch::Contains("table"));
    CHECK_THAT(input_error([] { parse_scenario("[race]\norder = \"fast\"\n", "t.toml"); }),
               Catch::Contains("t.toml:2") && Catch::Contains("fast"));
}

TEST_CASE("bad scenario: length 0 or beyond the maximum, malformed TOML", "[core]") {
    CHECK_THAT(input_error([] { parse_scenario("[board]\nlength = 0\n", "l.toml"); }),
               Catch::Contains("l.toml:2"));
    CHECK_THROWS_AS(parse_scenario("[board]\nlength = 1000001\n", "l.toml"), InputError);
    CHECK_THAT(input_error([] { parse_scenario("[board\nlength = 3\n", "l.toml"); }), Catch::Contains("l.toml:1"));
    CHECK_THAT(input_error([] { load_scenario("/nonexistent/dir/none.toml"); }), Catch::Contains("cannot open"));
    CHECK_THAT(input_error([] { load_scenario(OVERSHOOT_DATA_DIR); }), Catch::Contains("folder"));
}

TEST_CASE("bad scenario: an empty option name", "[core]") {
    CHECK_THAT(input_error([] { parse_scenario("[options]\n\"\" = \"1d6\"\n", "e.toml"); }),
               Catch::Contains("e.toml:2") && Catch::Contains("empty"));
}

TEST_CASE("bad scenario: a control character in an option name is refused at load, shown escaped", "[core]") {
    // ESC [ 2 J clears a terminal's screen; U+009B is the one-byte form of ESC [.
    const std::string msg =
        input_error([] { parse_scenario("[options]\n\"\\u001b[2Jx\" = \"1d6\"\n", "c.toml"); });
    CHECK_THAT(msg, Catch::Contains("c.toml:2") && Catch::Contains("control character") &&
                        Catch::Contains("'\\x1b[2Jx'"));
    CHECK(msg.find('\x1b') == std::string::npos);
    CHECK_THAT(input_error([] { parse_scenario("[options]\n\"a\\u009b2J\" = \"1d6\"\n", "c.toml"); }),
               Catch::Contains("'a\\xc2\\x9b2J'"));
    CHECK_THAT(input_error([] { parse_scenario("[options]\n\"tab\\there\" = \"1d6\"\n", "c.toml"); }),
               Catch::Contains("'tab\\x09here'"));
    // A spec typed with a control character is refused the same way; printable names pass.
    CHECK_THAT(input_error([] { parse_option("1d6\x07"); }), Catch::Contains("'1d6\\x07'"));
    CHECK_NOTHROW(parse_option("1d6", "caf\xc3\xa9 \xe2\x86\x92 ok"));  // UTF-8 letters and arrows are text
    CHECK(escape_controls("a\x1b[0mb\x7f") == "a\\x1b[0mb\\x7f");
}

TEST_CASE("bundled example scenarios load and make valid boards", "[core]") {
    for (const char* f : {"garden-path.toml", "long-road.toml", "bounce-yard.toml"}) {
        INFO(f);
        Scenario s = load_scenario(std::string(OVERSHOOT_DATA_DIR) + "/" + f);
        REQUIRE(s.length);
        Board b = make_board(*s.length, s.rule.value_or(Overshoot::stay), s.jumps.value_or(std::vector<Jump>{}));
        CHECK(b.length == *s.length);
        CHECK(s.options.size() >= 3);
        for (const auto& o : s.options) CHECK_NOTHROW(parse_option(o.spec, o.name));
    }
}

// ---------------------------------------------------------------- file output

TEST_CASE("write_atomically: a chain of links is followed to its final target, which keeps its mode", "[core]") {
    namespace fs = std::filesystem;
    const fs::path dir = fs::temp_directory_path() / ("overshoot-io-" + std::to_string(::getpid()));
    fs::remove_all(dir);
    fs::create_directories(dir / "sub");
    auto read = [](const fs::path& p) {
        std::ifstream in(p);
        std::stringstream ss;
        ss << in.rdbuf();
        return ss.str();
    };
    // first -> sub/second -> final (relative texts resolve against each link's folder)
    std::ofstream(dir / "final") << "old";
    fs::permissions(dir / "final", fs::perms::owner_read | fs::perms::owner_write | fs::perms::group_read);
    fs::create_symlink("../final", dir / "sub" / "second");
    fs::create_symlink("sub/second", dir / "first");
    CHECK(link_target((dir / "first").string()) == (dir / "sub" / ".." / "final").string());
    write_atomically((dir / "first").string(), "new\n");
    CHECK(fs::is_symlink(dir / "first"));
    CHECK(fs::is_symlink(dir / "sub" / "second"));
    CHECK(read(dir / "final") == "new\n");
    CHECK(fs::status(dir / "final").permissions() ==
          (fs::perms::owner_read | fs::perms::owner_write | fs::perms::group_read));
    // A dangling link: the file it names is created; the link stays.
    fs::create_symlink("made", dir / "dangling");
    write_atomically((dir / "dangling").string(), "x");
    CHECK(fs::is_symlink(dir / "dangling"));
    CHECK(read(dir / "made") == "x");
    // A folder is refused by name; no temporary file is left anywhere.
    CHECK_THAT(input_error([&] { write_atomically(dir.string(), "x"); }), Catch::Contains(dir.string()));
    for (const auto& e : fs::recursive_directory_iterator(dir))
        CHECK(e.path().filename().string().find(".tmp.") == std::string::npos);
    // A link loop is refused, not followed forever.
    fs::create_symlink("loop2", dir / "loop1");
    fs::create_symlink("loop1", dir / "loop2");
    CHECK_THAT(input_error([&] { write_atomically((dir / "loop1").string(), "x"); }), Catch::Contains("loop1"));
    fs::remove_all(dir);
}

TEST_CASE("head starts: the scenario's [head_starts], the flags, and who takes them", "[core][head-start]") {
    const auto dir = std::filesystem::temp_directory_path() / "overshoot-head-starts";
    std::filesystem::create_directories(dir);
    const auto file = (dir / "h.toml").string();
    {
        std::ofstream out(file);
        out << "[board]\nlength = 30\njumps = [[4, 9]]\n\n[options]\nsteady = \"1d6\"\nbold = \"2d6\"\n\n"
               "[head_starts]\nbold = 4\nsteady = 2\nother = 3\n";
    }
    const Scenario sc = load_scenario(file);
    REQUIRE(sc.head_starts.size() == 3);
    CHECK(sc.head_starts[0] == std::pair<std::string, int>{"bold", 4});  // file order
    SetupRequest r;
    r.scenario = file;
    r.min_options = 2;
    r.max_options = 2;
    r.head_starts_allowed = true;
    // A scenario may name options the command does not race ("other").
    Setup s = resolve_setup(r);
    CHECK(s.starts == std::vector<int>{2, 4});  // as given: 4 is a jump source, taken when the race starts
    CHECK(s.has_head_starts());
    // Flags replace the scenario's list.
    r.head_starts = std::vector<std::string>{"steady:7"};
    CHECK(resolve_setup(r).starts == std::vector<int>{7, 0});
    // Refusals: a command that starts every piece on 0, an unknown option, a
    // square off the board, a jump into the finish, twice, malformed.
    SetupRequest plain = r;
    plain.head_starts_allowed = false;
    CHECK_THROWS_WITH(resolve_setup(plain), Catch::Contains("starts every piece on square 0"));
    for (const char* bad : {"fast:3", "steady:30", "steady", "steady:x", ":3", "steady:-1"}) {
        r.head_starts = std::vector<std::string>{bad};
        CHECK_THROWS_AS(resolve_setup(r), InputError);
    }
    r.head_starts = std::vector<std::string>{"bold:2", "bold:3"};
    CHECK_THROWS_WITH(resolve_setup(r), Catch::Contains("has a head start already"));
    r.head_starts = std::vector<std::string>{"steady:0"};
    CHECK_FALSE(resolve_setup(r).has_head_starts());
    // No head start at all is fine everywhere.
    plain.head_starts = std::vector<std::string>{};
    CHECK_FALSE(resolve_setup(plain).has_head_starts());
    CHECK_THROWS_AS(parse_scenario("[head_starts]\nbold = \"4\"\n", "x"), InputError);
    CHECK_THROWS_AS(parse_scenario("[head_starts]\nbold = -1\n", "x"), InputError);
    std::filesystem::remove_all(dir);
    // A start whose jump leads into the finish is no start.
    CHECK_THROWS_WITH(resolve_start(make_board(10, Overshoot::stay, {{6, 10}}), 6), Catch::Contains("finish"));
}
