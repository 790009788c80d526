// Tests of src/sweep: crossovers, cycle intervals and sweeps with jumps, across lengths.
#include <fmt/format.h>

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
#include "sweep/stretches.hpp"
#include "sweep/sweep.hpp"
#include "tournament/cycles.hpp"
#include "tournament/tournament.hpp"

#include "support.hpp"

using namespace overshoot;

namespace {

using testing::opts;

std::string temp_path(const char* name) {
    return std::string("/tmp/overshoot-test-sweep-") + std::to_string(::getpid()) + "-" + name;
}

}  // namespace

TEST_CASE("1d6 against 2d6 over 100..130 crosses over once, at 116", "[sweep]") {
    // Fact of the trade, no published source: one die is preferred up to 115
    // squares, two dice from 116 on (stay rule, simultaneous turns).
    SweepSpec spec;
    spec.options = opts({"1d6", "2d6"});
    spec.grid = parse_lengths("100..130", 1);
    SweepResult r = run_sweep(spec);
    REQUIRE(r.variants.size() == 1);
    const auto& cr = r.variants[0].crossovers;
    REQUIRE(cr.size() == 1);
    REQUIRE(cr[0].length().has_value());
    REQUIRE(*cr[0].length() == 116);
    REQUIRE(cr[0].before == 115);
    REQUIRE(r.options[cr[0].preferred_before].name == "1d6");
    REQUIRE(r.options[cr[0].preferred_after].name == "2d6");
    REQUIRE(cr[0].margin_before > cr[0].bound_before);
    REQUIRE(-cr[0].margin_after > cr[0].bound_after);
    // The JSON contract: "length" is the first length with the new preference.
    auto j = render::sweep_json(r);
    REQUIRE(j["crossovers"].size() == 1);
    REQUIRE(j["crossovers"][0]["length"] == 116);
    REQUIRE(j["crossovers"][0]["a"] == "1d6");
    REQUIRE(j["crossovers"][0]["b"] == "2d6");
}

TEST_CASE("with a step or undecided lengths a crossover is an interval", "[sweep]") {
    SweepSpec spec;
    spec.options = opts({"1d6", "2d6"});
    spec.grid = parse_lengths("100..130", 4);  // 100, 104, ..., 128
    SweepResult r = run_sweep(spec);
    const auto& cr = r.variants[0].crossovers;
    REQUIRE(cr.size() == 1);
    REQUIRE(cr[0].before == 112);
    REQUIRE(cr[0].after == 116);
    REQUIRE_FALSE(cr[0].length().has_value());  // never a guess
    auto j = render::sweep_json(r);
    REQUIRE(j["crossovers"][0]["length"].is_null());
    REQUIRE(j["crossovers"][0]["interval"] == nlohmann::json::array({113, 116}));
}

TEST_CASE("sweeps with jumps go board by board with anchored jumps", "[sweep]") {
    std::mt19937 rng(7);
    for (JumpAnchor anchor : {JumpAnchor::start, JumpAnchor::finish}) {
        const int hi = 50;
        std::vector<Jump> jumps = {{4, 15}, {33, 12}, {41, 47}};
        SweepSpec spec;
        spec.options = opts({"1d6", "2d4"});
        spec.grid = parse_lengths("30..50", 1);
        spec.jumps = jumps;
        spec.anchor = anchor;
        spec.variants = {{Overshoot::stay, Order::simultaneous}, {Overshoot::bounce, Order::coin}};
        SweepResult r = run_sweep(spec);
        REQUIRE(r.variants.size() == 2);
        for (std::size_t v = 0; v < 2; ++v) {
            const auto& vs = r.variants[v];
            for (int k = 0; k < 3; ++k) {
                const std::size_t idx = rng() % vs.lengths.size();
                const int len = vs.lengths[idx];
                // The anchored board, written out by hand.
                std::vector<Jump> expect;
                for (const Jump& j : jumps) {
                    Jump m = anchor == JumpAnchor::start ? j : Jump{len - (hi - j.from), len - (hi - j.to)};
                    if (m.from >= 1 && m.from < len && m.to >= 0 && m.to <= len) expect.push_back(m);
                }
                REQUIRE(anchored_jumps(jumps, anchor, hi, len) == expect);
                Board board = make_board(len, vs.variant.rule, expect);
                Chain ca = build_chain(board, spec.options[0]), cb = build_chain(board, spec.options[1]);
                DuelSettings ds;
                ds.want_median = false;
                ds.method = DuelMethod::product;  // an independent method (sparse LU)
                DuelResult d = duel(ca, cb, vs.variant.order, ds);
                const LengthOutcome& o = vs.pairs[0].at[idx];
                REQUIRE(vs.pairs[0].method == LengthMethod::board);
                REQUIRE(std::fabs(o.p_a_wins - static_cast<double>(d.p_a_wins)) <= o.bound + static_cast<double>(d.bound));
                REQUIRE(std::fabs(o.p_b_wins - static_cast<double>(d.p_b_wins)) <= o.bound + static_cast<double>(d.bound));
            }
        }
    }
}

TEST_CASE("the cycle 2d6 > 1d6 > 3d6 > 2d6 holds on an interval containing 600", "[sweep]") {
    SweepSpec spec;
    spec.options = opts({"1d6", "2d6", "3d6"});
    spec.grid = parse_lengths("400..1400", 1);
    SweepResult r = run_sweep(spec);
    const auto& cycles = r.variants[0].cycles;
    // Named from the option first in the input: 1d6 > 3d6 > 2d6 > 1d6.
    const std::vector<std::size_t> want = {0, 2, 1};
    const CycleSpan* span = nullptr;
    for (const auto& c : cycles)
        if (c.options == want) span = &c;
    REQUIRE(span != nullptr);
    std::pair<int, int> around{0, 0};
    for (auto iv : span->intervals)
        if (iv.first <= 600 && 600 <= iv.second) around = iv;
    REQUIRE(around.first > 400);  // the sweep sees both ends
    REQUIRE(around.second < 1400);
    // The ends verified one by one with the single-board tournament; just
    // outside the interval the cycle does not hold.
    auto holds = [&](int len) {
        Board board = make_board(len, Overshoot::stay, {});
        Tournament t = analyse(race_matrix(board, Order::simultaneous, spec.options));
        const auto& b = t.beats;
        return b[0 * 3 + 2] && b[2 * 3 + 1] && b[1 * 3 + 0];
    };
    INFO("interval " << around.first << ".." << around.second);
    REQUIRE(holds(around.first));
    REQUIRE(holds(around.second));
    REQUIRE_FALSE(holds(around.first - 1));
    REQUIRE_FALSE(holds(around.second + 1));
    // The JSON lists it with its intervals.
    auto j = render::sweep_json(r);
    bool listed = false;
    for (const auto& c : j["cycles"])
        if (c["options"] == nlohmann::json::array({"1d6", "3d6", "2d6"})) listed = true;
    REQUIRE(listed);
}

TEST_CASE("bad sweep and hunt input is refused with a clear error", "[sweep]") {
    REQUIRE_THROWS_AS(parse_lengths("10..5", 1), InputError);
    REQUIRE_THROWS_AS(parse_lengths("0..5", 1), InputError);
    REQUIRE_THROWS_AS(parse_lengths("5..x", 1), InputError);
    REQUIRE_THROWS_AS(parse_lengths("5..9", 0), InputError);
    SweepSpec spec;
    spec.options = opts({"1d6", "2d6", "3d6"});
    spec.grid = parse_lengths("10..20", 1);
    spec.variants = {{Overshoot::stay, Order::a_first}};
    REQUIRE_THROWS_AS(run_sweep(spec), InputError);  // seat-dependent for 3 options
    HuntSpec h;
    h.options = opts({"1d6", "2d6"});
    h.grid = parse_lengths("10..20", 1);
    REQUIRE_THROWS_AS(run_hunt(h), InputError);  // fewer options than the cycle length
    const std::string path = temp_path("junk.ckpt");
    {
        FILE* fp = std::fopen(path.c_str(), "w");
        std::fputs("not a checkpoint\n", fp);
        std::fclose(fp);
    }
    REQUIRE_THROWS_AS(load_checkpoint(path), InputError);
    std::remove(path.c_str());
}

TEST_CASE("stretches: who is preferred over which lengths, with the smallest and largest margin", "[sweep]") {
    // Made-up outcomes: a wins by 0.3 and 0.1, one length within its bound, then b wins by 0.2.
    PairSweep p;
    p.a = 0;
    p.b = 1;
    auto at = [](double a, double b, double bound) {
        LengthOutcome o;
        o.p_a_wins = a;
        o.p_b_wins = b;
        o.p_tie = 1 - a - b;
        o.bound = bound;
        return o;
    };
    p.at = {at(0.6, 0.3, 1e-15), at(0.5, 0.4, 1e-15), at(0.45, 0.45 + 1e-16, 1e-15), at(0.3, 0.5, 1e-15)};
    const std::vector<Stretch> s = preference_stretches(p, {10, 11, 12, 13});
    REQUIRE(s.size() == 3);
    CHECK((s[0].first == 10 && s[0].last == 11 && s[0].verdict == 1 && s[0].count == 2));
    CHECK(s[0].least == Approx(0.1));
    CHECK(s[0].most == Approx(0.3));
    CHECK((s[1].first == 12 && s[1].last == 12 && s[1].verdict == 0));
    CHECK((s[2].first == 13 && s[2].verdict == -1));
    CHECK(s[2].least == Approx(0.2));
    // The largest bound of a sweep, and where it is.
    SweepResult r;
    r.options = {parse_option("1d6"), parse_option("2d6")};
    VariantSweep v;
    v.lengths = {10, 11, 12, 13};
    p.at[2].bound = 2e-12;
    v.pairs = {p};
    r.variants = {v};
    const LargestBound b = largest_bound(r);
    CHECK(b.bound > 4e-12);
    CHECK(b.length == 12);
    CHECK(render::sweep_bound_note(r).find("at length 12") != std::string::npos);
}

TEST_CASE("a zone-tail pair says where the series hands over, and keeps the series' verdicts", "[sweep]") {
    // 1d6 against 3d6 on 1..1500 (stay, simultaneous): the series gives the
    // short lengths, the zone tail the long ones (docs/sweep.md, "Zone tail").
    SweepSpec spec;
    spec.options = opts({"1d6", "3d6"});
    spec.grid = parse_lengths("1..1500", 1);
    SweepResult r = run_sweep(spec);
    const PairSweep& p = r.variants[0].pairs[0];
    REQUIRE(p.method == LengthMethod::zone_tail);
    REQUIRE(p.tail_from > 7);
    REQUIRE(p.tail_from < 200);
    const std::string text = render::sweep_text(r);
    REQUIRE(text.find(fmt::format("1d6 vs 3d6: series to {}, zone tail from {}", p.tail_from - 1, p.tail_from)) !=
            std::string::npos);
    const auto j = render::sweep_json(r);
    REQUIRE(j["variants"][0]["methods"][0]["method"] == "zone-tail");
    REQUIRE(j["variants"][0]["methods"][0]["zone_tail_from"] == p.tail_from);
    // The CSV names the method of each row.
    const std::string csv = render::sweep_csv(r);
    REQUIRE(csv.find(fmt::format(",{},1d6,3d6,", p.tail_from - 1)) != std::string::npos);
    const auto row = [&](int len) {
        const auto at = csv.find(fmt::format("simultaneous,{},1d6,3d6,", len));
        return csv.substr(at, csv.find('\n', at) - at);
    };
    REQUIRE(row(p.tail_from - 1).substr(row(p.tail_from - 1).rfind(',') + 1) == "series");
    REQUIRE(row(p.tail_from).substr(row(p.tail_from).rfind(',') + 1) == "zone-tail");
    // The series alone: the same single crossover (the series gives it at 1279).
    SweepSpec old = spec;
    old.engine.method = LengthMethod::series;
    SweepResult s = run_sweep(old);
    REQUIRE(s.variants[0].pairs[0].method == LengthMethod::series);
    REQUIRE(r.variants[0].crossovers.size() == 1);
    REQUIRE(s.variants[0].crossovers.size() == 1);
    REQUIRE(r.variants[0].crossovers[0].after == 1279);
    REQUIRE(s.variants[0].crossovers[0].after == 1279);
}
