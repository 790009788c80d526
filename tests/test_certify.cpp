// Tests of src/certify: writing certificates, reading them back and checking
// them by the independent algorithms (fractions modulo primes through the
// one-round product-chain equations, the claim by proven intervals), and
// tampering, which must make the check fail.
#include <catch2/catch.hpp>

#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "certify/certificate.hpp"
#include "core/error.hpp"
#include "race/duel.hpp"
#include "render/certificate.hpp"

#include "support.hpp"

using namespace overshoot;

namespace {

using testing::opts;

Claim claim_of(ClaimKind k, const std::vector<Option>& o, int at = 0) {
    Claim c;
    c.kind = k;
    c.at = at;
    for (const auto& x : o) c.options.push_back(x.name);
    return c;
}

std::string write(const Certificate& c) { return render::certificate_json(c).dump(1); }

CheckReport recheck(const std::string& text) { return check_certificate(parse_certificate(text, "test"), text, 2); }

std::string read_file(const std::string& path) {
    std::ifstream in(path);
    std::stringstream ss;
    ss << in.rdbuf();
    return ss.str();
}

// Changes one digit in the middle of a string value at `pointer`.
std::string tamper_digit(const std::string& text, const std::string& pointer) {
    auto j = nlohmann::json::parse(text);
    std::string s = j[nlohmann::json::json_pointer(pointer)].get<std::string>();
    std::size_t i = s.size() / 3;
    while (s[i] < '0' || s[i] > '9') ++i;
    s[i] = s[i] == '7' ? '3' : '7';
    j[nlohmann::json::json_pointer(pointer)] = s;
    return j.dump(1);
}

}  // namespace

TEST_CASE("crossover of 1d6 and 2d6 at 116 squares is certified and checked", "[certify]") {
    // Fact of the trade, no published source: on a stay board one die beats two
    // dice up to 115 squares and loses from 116 (simultaneous turns).
    auto o = opts({"1d6", "2d6"});
    Board b = make_board(116, Overshoot::stay, {});
    Certificate c = certify(claim_of(ClaimKind::crossover, o, 116), b, Order::simultaneous, o, 2);
    REQUIRE(c.duels.size() == 2);
    CHECK(c.duels[0].length == 115);
    CHECK(c.duels[0].verdict == Verdict::a_beats_b);
    CHECK(c.duels[1].length == 116);
    CHECK(c.duels[1].verdict == Verdict::b_beats_a);
    const std::string text = write(c);
    CheckReport r = recheck(text);
    INFO(r.failure);
    CHECK(r.holds);
    // Tampering: the board length (the crossover no longer sits at the board's length).
    auto j = nlohmann::json::parse(text);
    j["board"]["length"] = 117;
    CHECK_FALSE(recheck(j.dump()).holds);
    // A crossover claimed one square later is false and is not certified.
    Board b2 = make_board(117, Overshoot::stay, {});
    CHECK_THROWS_AS(certify(claim_of(ClaimKind::crossover, o, 117), b2, Order::simultaneous, o, 2), ClaimFailure);
}

TEST_CASE("the 600-square cycle certificate in docs/examples holds and resists tampering", "[certify]") {
    // Fact of the trade, no published source: on 600 squares (stay, simultaneous)
    // 2d6 beats 1d6, 1d6 beats 3d6 and 3d6 beats 2d6.
    const std::string text = read_file(std::string(OVERSHOOT_DATA_DIR) + "/../docs/examples/cycle-600.json");
    REQUIRE_FALSE(text.empty());
    Certificate c = parse_certificate(text, "cycle-600.json");
    CHECK(c.board.length == 600);
    CHECK(c.claim.options == std::vector<std::string>{"2d6", "1d6", "3d6"});
    CheckReport r = check_certificate(c, text, 2);
    INFO(r.failure);
    REQUIRE(r.holds);
    // One changed digit in a fraction.
    CheckReport t1 = recheck(tamper_digit(text, "/duels/1/p_b_wins/exact"));
    CHECK_FALSE(t1.holds);
    // Two options swapped in the cycle (the statement kept or regenerated).
    auto j = nlohmann::json::parse(text);
    std::swap(j["claim"]["options"][0], j["claim"]["options"][1]);
    CHECK_FALSE(recheck(j.dump()).holds);
    // The board length changed.
    auto k = nlohmann::json::parse(text);
    k["board"]["length"] = 601;
    CHECK_FALSE(recheck(k.dump()).holds);
    // A missing field is unreadable, and the error names it.
    auto m = nlohmann::json::parse(text);
    m["duels"][2].erase("p_tie");
    CHECK_THROWS_WITH(recheck(m.dump()), Catch::Contains("duels[2].p_tie"));
}

TEST_CASE("small certificates: winner, cycle refusal, every kind of edit", "[certify]") {
    auto o = opts({"2d6", "1d6", "1d4"});
    Board b = make_board(40, Overshoot::stay, {{7, 15}});
    Claim w = claim_of(ClaimKind::winner, o);
    // Whether 2d6 wins here is not known beforehand: compute, then check both ways.
    Certificate c;
    bool holds = true;
    try {
        c = certify(w, b, Order::simultaneous, o, 2);
    } catch (const ClaimFailure&) {
        holds = false;
    }
    if (holds) {
        const std::string text = write(c);
        REQUIRE(recheck(text).holds);
        CHECK_FALSE(recheck(tamper_digit(text, "/duels/0/p_a_wins/exact")).holds);
        CHECK_FALSE(recheck(tamper_digit(text, "/duels/0/margin/exact")).holds);
        CHECK_FALSE(recheck(tamper_digit(text, "/duels/1/p_neither/exact")).holds);
        auto j = nlohmann::json::parse(text);
        j["duels"][0]["verdict"] = "b beats a";
        CHECK_FALSE(recheck(j.dump()).holds);
        auto k = nlohmann::json::parse(text);
        k["options"][1]["moves"][0][1] = 2;
        k["options"][1]["denominator"] = 7;
        CHECK_FALSE(recheck(k.dump()).holds);  // the distribution no longer matches its spec
        auto l = nlohmann::json::parse(text);
        l["board"]["jumps"] = nlohmann::json::array();
        CHECK_FALSE(recheck(l.dump()).holds);
    }
    // Some ordering of three options on this board is not a cycle: both
    // orientations cannot hold at once, so at most one certificate is written.
    int cycles = 0;
    for (auto order : {std::vector<Option>{o[0], o[1], o[2]}, std::vector<Option>{o[0], o[2], o[1]}}) {
        try {
            certify(claim_of(ClaimKind::cycle, order), b, Order::simultaneous, order, 2);
            ++cycles;
        } catch (const ClaimFailure&) {
        }
    }
    CHECK(cycles <= 1);
    CHECK_THROWS_AS(parse_certificate("{\"schema\": \"overshoot.certificate/1\"}", "x"), InputError);
    CHECK_THROWS_WITH(parse_certificate("not json", "x"), Catch::Contains("not valid JSON"));
}

TEST_CASE("certificates on boards where pieces move backward use exact elimination or residual proofs", "[certify]") {
    auto o = opts({"1d6", "2d6"});
    Board small = make_board(10, Overshoot::bounce, {{8, 2}});
    Board large = make_board(60, Overshoot::bounce, {});
    for (const Board* b : {&small, &large}) {
        int certified = 0;
        for (auto pair : {std::vector<Option>{o[0], o[1]}, std::vector<Option>{o[1], o[0]}}) {
            Certificate c;
            try {
                c = certify(claim_of(ClaimKind::winner, pair), *b, Order::simultaneous, pair, 2);
            } catch (const ClaimFailure&) {
                continue;
            }
            CHECK(c.duels[0].exact_method == (b == &small ? "exact elimination" : ""));
            CHECK(c.duels[0].residual.has_value() == (b == &large));
            const std::string text = write(c);
            CheckReport r = recheck(text);
            INFO(r.failure);
            CHECK(r.holds);
            ++certified;
        }
        CHECK(certified == 1);  // one of the two orientations holds, never both
    }
}

// Hidden by default (about 20 s of CPU, more on a loaded machine): run with
//   build/tests/overshoot_tests "[certify-slow]"
TEST_CASE("the 600-square cycle certificate is reproduced byte for byte", "[.][certify-slow]") {
    // Fact of the trade, no published source: 2d6 > 1d6 > 3d6 > 2d6 on 600 squares.
    auto o = opts({"2d6", "1d6", "3d6"});
    Board b = make_board(600, Overshoot::stay, {});
    Certificate c = certify(claim_of(ClaimKind::cycle, o), b, Order::simultaneous, o, 2);
    const std::string text = render::certificate_json(c).dump(1) + "\n";
    CHECK(text == read_file(std::string(OVERSHOOT_DATA_DIR) + "/../docs/examples/cycle-600.json"));
    CheckReport r = check_certificate(c, text, 2);
    INFO(r.failure);
    CHECK(r.holds);
}

TEST_CASE("certificates carry head starts, and the check re-derives them", "[certify][head-start]") {
    auto o = opts({"1d6", "2d6"});
    for (const Board& b : {make_board(30, Overshoot::stay, {{4, 9}}), make_board(14, Overshoot::bounce, {{11, 3}})}) {
        // Who wins with a head start of 4 for 2d6 is computed, then certified that way round.
        const Chain x = build_chain(b, o[0]), y = build_chain(b, o[1], 4);
        const bool first = duel(x, y, Order::simultaneous).a_beats_b();
        std::vector<Option> w = first ? o : std::vector<Option>{o[1], o[0]};
        std::vector<int> starts = first ? std::vector<int>{0, 4} : std::vector<int>{4, 0};
        const Certificate c = certify(claim_of(ClaimKind::winner, w), b, Order::simultaneous, w, 2, false, starts);
        CHECK(c.statement.find("2d6 starts on 4") != std::string::npos);
        const std::string text = write(c);
        REQUIRE(recheck(text).holds);
        CHECK(parse_certificate(text, "t").starts == starts);
        // Another head start, statement mended to match: the numbers no longer hold.
        auto j = nlohmann::json::parse(text);
        j["board"]["head_starts"]["2d6"] = 3;
        const std::string st = j["claim"]["statement"];
        j["claim"]["statement"] = st.substr(0, st.find("2d6 starts on 4")) + "2d6 starts on 3)";
        CHECK_FALSE(recheck(j.dump()).holds);
        // Without its head start the statement differs.
        auto k = nlohmann::json::parse(text);
        k["board"].erase("head_starts");
        CHECK_FALSE(recheck(k.dump()).holds);
        // Malformed head starts: an unknown option, a square off the board.
        auto m = nlohmann::json::parse(text);
        m["board"]["head_starts"]["3d6"] = 2;
        CHECK_THROWS_AS(parse_certificate(m.dump(), "t"), InputError);
        auto n = nlohmann::json::parse(text);
        n["board"]["head_starts"]["2d6"] = 99;
        CHECK_THROWS_AS(parse_certificate(n.dump(), "t"), InputError);
    }
}
