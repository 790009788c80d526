// Figures and the HTML report: escaping, number formatting, determinism
// (byte-identical output for the same input) and content of each figure.
#include <catch2/catch.hpp>

#include <string>

#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "core/board.hpp"
#include "core/option.hpp"
#include "render/figures.hpp"
#include "render/report.hpp"
#include "render/svg.hpp"
#include "sweep/sweep.hpp"
#include "tournament/tournament.hpp"

using namespace overshoot;

namespace {

std::size_t count(const std::string& s, const std::string& what) {
    std::size_t n = 0;
    for (auto p = s.find(what); p != std::string::npos; p = s.find(what, p + 1)) ++n;
    return n;
}

std::vector<Option> three() {
    return {parse_option("1d6", "walker"), parse_option("2d6", "trotter"), parse_option("3d6", "gall<o>per")};
}

Tournament tournament_on(int length) {
    Board b = make_board(length, Overshoot::stay, {});
    auto opts = three();
    return analyse(race_matrix(b, Order::simultaneous, opts, {}, 1));
}

SweepResult small_sweep() {
    SweepSpec spec;
    spec.options = three();
    spec.grid = parse_lengths("100..130", 1);  // walker and trotter cross at 116 (docs/examples/crossover-116.md)
    spec.engine.threads = 1;
    return run_sweep(spec);
}

}  // namespace

TEST_CASE("svg layer: escaping and fixed number formatting", "[render]") {
    using render::svg::escape;
    using render::svg::num;
    CHECK(escape("a<b & \"c\" 'd'>") == "a&lt;b &amp; &quot;c&quot; &#39;d&#39;&gt;");
    CHECK(escape(std::string("x\x01y")) == "x y");
    CHECK(num(2.0) == "2");
    CHECK(num(1.5) == "1.5");
    CHECK(num(1.23456) == "1.23");
    CHECK(num(-0.001) == "0");
    CHECK(num(-12.3456) == "-12.35");
    CHECK(num(1.0 / 0.0) == "0");
    render::svg::Element e("g");
    e.set("id", "a\"b").add(render::svg::text(1, 2, "<T>"));
    CHECK(e.str() == "<g id=\"a&quot;b\">\n  <text x=\"1\" y=\"2\" font-size=\"12\">&lt;T&gt;</text>\n</g>\n");
}

TEST_CASE("digraph figure: deterministic, every option named, one arrowhead per arc", "[render]") {
    // On 600 squares 1d6 -> 2d6 -> 3d6 -> 1d6 is a cycle (docs/examples/cycle-600.md).
    Tournament t1 = tournament_on(600), t2 = tournament_on(600);
    const std::string a = render::svg::file(render::digraph_figure(t1));
    const std::string b = render::svg::file(render::digraph_figure(t2));
    CHECK(a == b);
    CHECK(a.rfind("<?xml", 0) == 0);
    CHECK(a.find("walker") != std::string::npos);
    CHECK(a.find("trotter") != std::string::npos);
    CHECK(a.find("gall&lt;o&gt;per") != std::string::npos);  // escaped, never raw
    CHECK(a.find("gall<o>per") == std::string::npos);
    // Arrowheads: one polygon per arc plus three legend samples.
    CHECK(count(a, "<polygon") == t1.arcs.size() + 3);
    REQUIRE(t1.strongest_cycle.has_value());
    CHECK(count(a, std::string("fill=\"") + render::highlight + "\"") >= t1.strongest_cycle->options.size());
    CHECK(a.find("strongest cycle") != std::string::npos);
}

TEST_CASE("digraph figure: undecided pairs are dashed, no arrowhead", "[render]") {
    PairwiseMatrix m;
    m.names = {"north", "south"};
    m.win = {0, 0.4, 0.4, 0};
    m.tie = {0, 0.2, 0.2, 0};
    m.neither = {0, 0, 0, 0};
    m.bound = {0, 1e-9, 1e-9, 0};
    Tournament t = analyse(m);
    REQUIRE(t.undecided.size() == 1);
    const std::string s = render::digraph_figure(t).str();
    CHECK(count(s, "<polygon") == 3);  // the legend samples only
    CHECK(count(s, "stroke-dasharray=\"6 4\"") == 2);  // the pair's group and the legend sample
    CHECK(s.find("no cycle") != std::string::npos);
}

TEST_CASE("sweep figure: deterministic, every crossover listed with its length", "[render]") {
    SweepResult r1 = small_sweep(), r2 = small_sweep();
    const std::string a = render::sweep_figure(r1).str();
    CHECK(a == render::sweep_figure(r2).str());
    const VariantSweep& v = r1.variants.front();
    REQUIRE(!v.crossovers.empty());
    for (const Crossover& c : v.crossovers) {
        const std::string where = c.length() ? "at " + std::to_string(*c.length())
                                             : "in " + std::to_string(c.before + 1) + ".." + std::to_string(c.after);
        CHECK(a.find("crossover " + where + ": " + render::svg::escape(r1.options[c.a].name)) != std::string::npos);
    }
    // One polyline per pair.
    CHECK(count(a, "<polyline") == v.pairs.size());
}

TEST_CASE("distribution figure: deterministic, never finishing shown", "[render]") {
    Board b = make_board(5, Overshoot::stay, {});
    std::vector<Option> opts{parse_option("1d2", "small"), parse_option("[2]", "evens")};
    std::vector<Distribution> d1, d2;
    for (const auto& o : opts) {
        Chain c = build_chain(b, o);
        d1.push_back(distribution(c, 1e-12, 10000));
        d2.push_back(distribution(c, 1e-12, 10000));
    }
    const std::string a = render::distribution_figure({"small", "evens"}, d1).str();
    CHECK(a == render::distribution_figure({"small", "evens"}, d2).str());
    // "evens" moves 2 a turn from 0 on a 5-square board: 0, 2, 4, then every move overshoots.
    CHECK(d1[1].never == Approx(1.0L));
    CHECK(a.find(">100.00%<") != std::string::npos);
    CHECK(a.find(">0.00%<") != std::string::npos);  // "small" always finishes
    CHECK(a.find("P(never finishing)") != std::string::npos);
}

TEST_CASE("report: self-contained HTML, same bytes for the same input", "[render]") {
    Board b = make_board(60, Overshoot::stay, {});
    auto opts = three();
    Tournament t = analyse(race_matrix(b, Order::simultaneous, opts, {}, 1));
    SweepResult sw = small_sweep();
    render::ReportInput in;
    in.board = &b;
    in.options = &opts;
    in.source = "test";
    for (const auto& o : opts) {
        Chain c = build_chain(b, o);
        in.profiles.push_back(profile(c));
        in.distributions.push_back(distribution(c, 1e-9, 100000));
    }
    in.tournament = &t;
    in.sweep = &sw;
    const std::string h = render::report_html(in);
    CHECK(h.rfind("<!DOCTYPE html>", 0) == 0);
    CHECK(count(h, "<svg ") == 3);
    CHECK(h.find("<script") == std::string::npos);
    CHECK(h.find("https://") == std::string::npos);
    // The only http:// is the SVG namespace name (never fetched).
    CHECK(count(h, "http://") == count(h, "http://www.w3.org/2000/svg"));
    CHECK(h.find("<title>overshoot report: walker, trotter, gall&lt;o&gt;per on 60 squares</title>") != std::string::npos);
    for (const char* sec : {"id=\"rules\"", "id=\"profiles\"", "id=\"matrix\"", "id=\"digraph\"", "id=\"cycles\"",
                            "id=\"counters\"", "id=\"equilibrium\"", "id=\"sweep\""})
        CHECK(h.find(sec) != std::string::npos);
    CHECK(h.find("id=\"race\"") == std::string::npos);  // not asked for
}
