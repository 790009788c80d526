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

namespace {

struct Rect {
    double x0, y0, x1, y1;
};

double attribute(const std::string& tag, const std::string& name) {
    const auto p = tag.find(" " + name + "=\"");
    REQUIRE(p != std::string::npos);
    return std::stod(tag.substr(p + name.size() + 3));
}

// The box of a <text> line as a reader sees it: 0.6 em per character (the
// digits of a sans font are 0.56 em wide, common practice, no published
// source), cap height above the baseline, and the halo around it.
Rect text_rect(const std::string& line) {
    const auto open = line.find('>'), close = line.find("</text>");
    const std::string content = line.substr(open + 1, close - open - 1);
    const double x = attribute(line, "x"), y = attribute(line, "y"), size = attribute(line, "font-size");
    const double w = 0.6 * size * static_cast<double>(content.size());
    const double left = line.find("text-anchor=\"middle\"") != std::string::npos ? x - w / 2
                        : line.find("text-anchor=\"end\"") != std::string::npos ? x - w
                                                                                  : x;
    return {left - 1, y - 0.75 * size - 1, left + w + 1, y + 0.2 * size + 1};
}

bool meet(const Rect& a, const Rect& b) { return a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1; }

}  // namespace

TEST_CASE("digraph figure: with 8 options no margin label overlaps another, a disc or a name", "[render]") {
    // Eight options on 60 squares give 20 or more arcs, many of them crossing near the centre.
    const std::vector<std::string> specs{"1d4", "1d6", "1d8", "2d4", "2d6", "3d6", "1d10", "2d8"};
    std::vector<Option> opts;
    for (const auto& s : specs) opts.push_back(parse_option(s));
    Tournament t = analyse(race_matrix(make_board(60, Overshoot::stay, {}), Order::simultaneous, opts, {}, 1));
    REQUIRE(t.arcs.size() >= 20);
    const std::string svg = render::digraph_figure(t).str();
    std::vector<std::string> lines;
    for (std::size_t p = 0, q; p < svg.size(); p = q + 1) {
        q = svg.find('\n', p);
        if (q == std::string::npos) q = svg.size();
        lines.push_back(svg.substr(p, q - p));
    }
    std::vector<Rect> labels, discs, names;
    bool in_labels = false, in_nodes = false;
    for (const auto& l : lines) {
        if (l.find("<g class=\"margin-labels\">") != std::string::npos) in_labels = true;
        else if (in_labels && l.find("</g>") != std::string::npos) in_labels = false, in_nodes = true;
        else if (in_labels && l.find("<text") != std::string::npos) labels.push_back(text_rect(l));
        else if (in_nodes && l.find("<circle") != std::string::npos) {
            const double cx = attribute(l, "cx"), cy = attribute(l, "cy"), r = attribute(l, "r");
            discs.push_back({cx - r, cy - r, cx + r, cy + r});
        } else if (in_nodes && l.find("<text") != std::string::npos) names.push_back(text_rect(l));
        else if (in_nodes && l.find("</g>") != std::string::npos) in_nodes = false;
    }
    CHECK(labels.size() == t.arcs.size());
    CHECK(discs.size() == specs.size());
    CHECK(names.size() == specs.size());
    for (std::size_t i = 0; i < labels.size(); ++i) {
        INFO("label " << i << " at " << labels[i].x0 << "," << labels[i].y0);
        for (std::size_t j = i + 1; j < labels.size(); ++j) CHECK_FALSE(meet(labels[i], labels[j]));
        for (const Rect& d : discs) CHECK_FALSE(meet(labels[i], d));
        for (const Rect& n : names) CHECK_FALSE(meet(labels[i], n));
        CHECK(labels[i].x1 < 500);  // the legend starts at x = 500
    }
}

TEST_CASE("figures show margins in points, never a negative zero", "[render]") {
    CHECK(render::figure_points(0.288707) == "28.87 points");
    CHECK(render::figure_points(-0.0) == "0.00 points");
    CHECK(render::figure_points(-1e-18) == ">-0.01 points");
    CHECK(render::figure_points_number(1e-7) == "<0.01");
    Tournament t = tournament_on(600);
    const std::string s = render::digraph_figure(t).str();
    CHECK(s.find("beats") != std::string::npos);
    CHECK(s.find(" points") != std::string::npos);
    // Percent signs belong to probabilities; the digraph shows none.
    CHECK(s.find('%') == std::string::npos);
}
