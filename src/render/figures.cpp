#include "render/figures.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <set>

#include "render/format.hpp"

namespace overshoot::render {

namespace {

constexpr double pi = 3.14159265358979323846;
using Points = std::vector<std::pair<double, double>>;

// Breaks a list of words into lines of at most `width` characters.
std::vector<std::string> wrap(const std::vector<std::string>& words, const std::string& sep, std::size_t width) {
    std::vector<std::string> lines;
    std::string cur;
    for (std::size_t i = 0; i < words.size(); ++i) {
        std::string piece = words[i] + (i + 1 < words.size() ? sep : "");
        if (!cur.empty() && cur.size() + piece.size() > width) {
            lines.push_back(cur);
            cur.clear();
        }
        cur += piece;
    }
    if (!cur.empty()) lines.push_back(cur);
    return lines;
}

// Text with a halo of paper colour, readable over lines.
svg::Element halo_text(double x, double y, std::string s, double size, std::string_view anchor) {
    svg::Element e = svg::text(x, y, std::move(s), size, anchor);
    e.set("fill", ink).set("stroke", paper).set("stroke-width", 3).set("paint-order", "stroke");
    return e;
}

svg::Element background(double w, double h) {
    svg::Element r = svg::rect(0, 0, w, h, paper);
    r.set("rx", 6);
    return r;
}

svg::Element tooltip(std::string s) { return svg::Element("title").content(std::move(s)); }

}  // namespace

// 1, 2 or 5 times a power of ten, giving about `count` steps over `range`.
double nice_step(double range, int count) {
    if (!(range > 0)) return 1;
    double raw = range / count;
    double p = std::pow(10.0, std::floor(std::log10(raw)));
    for (double m : {1.0, 2.0, 5.0, 10.0})
        if (m * p >= raw) return m * p;
    return 10 * p;
}

const std::vector<std::string>& palette() {
    // Okabe & Ito, "Color Universal Design" (2008): distinguishable with the
    // common colour-vision deficiencies. Yellow last: weak on a light paper.
    static const std::vector<std::string> p{"#0072b2", "#e69f00", "#009e73", "#cc79a7",
                                            "#56b4e9", "#d55e00", "#000000", "#f0e442"};
    return p;
}

std::string figure_percent(double p) {
    if (p != 0 && std::fabs(p) < 0.00005) return p > 0 ? "<0.01%" : ">-0.01%";
    return fmt::format("{:.2f}%", 100.0 * p);
}

std::string figure_points_number(double margin) {
    const double p = 100.0 * margin;
    if (p != 0 && std::fabs(p) < 0.005) return p > 0 ? "<0.01" : ">-0.01";
    const std::string s = fmt::format("{:.2f}", p);
    return s == "-0.00" ? "0.00" : s;
}

std::string figure_points(double margin) { return figure_points_number(margin) + " points"; }

namespace {

struct Box {
    double x0, y0, x1, y1;
    bool overlaps(const Box& o) const { return x0 < o.x1 && o.x0 < x1 && y0 < o.y1 && o.y0 < y1; }
    double overlap_area(const Box& o) const {
        const double w = std::min(x1, o.x1) - std::max(x0, o.x0), h = std::min(y1, o.y1) - std::max(y0, o.y0);
        return w > 0 && h > 0 ? w * h : 0;
    }
};

// The box a text of `size` takes around its anchor point (x, baseline y):
// about 0.62 em per character (the digits of a sans font are 0.56 em), the
// ascent and descent, and the 1.5-unit halo on every side.
Box text_box(double x, double y, const std::string& s, double size, std::string_view anchor) {
    const double w = 0.62 * size * static_cast<double>(s.size()) + 3;
    const double left = anchor == "middle" ? x - w / 2 : anchor == "end" ? x - w : x;
    return {left, y - 0.8 * size - 1.5, left + w, y + 0.25 * size + 1.5};
}

}  // namespace

// ---------------------------------------------------------------- digraph

svg::Element digraph_figure(const Tournament& t) {
    const std::size_t n = t.size();
    const double W = 760, plot = 500, cx = 250, cy = 262, R = n > 1 ? 165 : 0, node_r = n > 24 ? 7 : 13;
    std::vector<double> x(n), y(n), ang(n);
    for (std::size_t i = 0; i < n; ++i) {
        ang[i] = -pi / 2 + 2 * pi * static_cast<double>(i) / static_cast<double>(std::max<std::size_t>(n, 1));
        x[i] = cx + R * std::cos(ang[i]);
        y[i] = cy + R * std::sin(ang[i]);
    }
    std::set<std::pair<std::size_t, std::size_t>> in_cycle;
    if (t.strongest_cycle) {
        const auto& c = t.strongest_cycle->options;
        for (std::size_t k = 0; k < c.size(); ++k) in_cycle.insert({c[k], c[(k + 1) % c.size()]});
    }
    double mmax = 0;
    for (const Arc& a : t.arcs) mmax = std::max(mmax, a.margin);
    if (!(mmax > 0)) mmax = 1;

    // Legend lines first: they decide the height.
    std::vector<std::string> cycle_lines;
    if (t.strongest_cycle) {
        std::vector<std::string> names;
        for (auto i : t.strongest_cycle->options) names.push_back(t.name(i));
        names.push_back(t.name(t.strongest_cycle->options.front()));
        cycle_lines = wrap(names, " \u2192 ", 34);
    }
    const double H = std::max(plot + 30, 170.0 + 18.0 * static_cast<double>(cycle_lines.size()) + 150);

    std::string desc = fmt::format("{} on a circle; {}, {}", plural(static_cast<long long>(n), "option"),
                                   plural(static_cast<long long>(t.arcs.size()), "arc"),
                                   plural(static_cast<long long>(t.undecided.size()), "undecided pair"));
    svg::Element root = svg::document(W, H, "Dominance digraph", desc);
    root.add(background(W, H));
    root.add(svg::text(20, 28, "Dominance digraph", 16).set("font-weight", "bold").set("fill", ink));

    const bool labels = n <= 8;
    svg::Element undecided("g");
    undecided.set("stroke-dasharray", "6 4");
    for (auto [i, j] : t.undecided) undecided.add(svg::line(x[i], y[i], x[j], y[j], muted, 1.4));
    root.add(std::move(undecided));

    // Where each option's name goes (outside its disc, away from the centre).
    const double name_size = n > 24 ? 10 : 13;
    std::vector<double> name_x(n), name_y(n);
    std::vector<std::string> name_anchor(n);
    for (std::size_t i = 0; i < n; ++i) {
        const double c = std::cos(ang[i]), s = std::sin(ang[i]);
        name_anchor[i] = n == 1 ? "middle" : c > 0.3 ? "start" : c < -0.3 ? "end" : "middle";
        name_x[i] = n == 1 ? cx : x[i] + c * (node_r + 10);
        name_y[i] = n == 1 ? cy + node_r + 16 : y[i] + s * (node_r + 12) + 4 + (std::fabs(c) <= 0.3 ? s * 6 : 0);
    }
    struct Label {
        double sx, sy, bx, by, ux, uy;
        std::string text;
    };
    std::vector<Label> to_label;
    svg::Element arcs("g");
    svg::Element margin_labels("g");
    margin_labels.set("class", "margin-labels");
    // Cycle arcs last, so they sit on top.
    std::vector<const Arc*> order;
    for (const Arc& a : t.arcs) if (!in_cycle.count({a.from, a.to})) order.push_back(&a);
    for (const Arc& a : t.arcs) if (in_cycle.count({a.from, a.to})) order.push_back(&a);
    for (const Arc* a : order) {
        const bool hot = in_cycle.count({a->from, a->to}) > 0;
        const std::string colour = hot ? highlight : palette()[0];
        const double w = 1.2 + 4.8 * a->margin / mmax;
        const double dx = x[a->to] - x[a->from], dy = y[a->to] - y[a->from];
        const double d = std::hypot(dx, dy);
        if (!(d > 0)) continue;
        const double ux = dx / d, uy = dy / d;
        const double alen = 9 + 1.6 * w, hw = 4 + 0.9 * w;
        const double sx = x[a->from] + ux * (node_r + 2), sy = y[a->from] + uy * (node_r + 2);
        const double tx = x[a->to] - ux * (node_r + 2), ty = y[a->to] - uy * (node_r + 2);
        const double bx = tx - ux * alen, by = ty - uy * alen;
        svg::Element g("g");
        g.add(tooltip(t.name(a->from) + " beats " + t.name(a->to) + " by " + figure_points(a->margin)));
        g.add(svg::line(sx, sy, bx, by, colour, w).set("stroke-linecap", "round"));
        g.add(svg::polygon({{tx, ty}, {bx - uy * hw, by + ux * hw}, {bx + uy * hw, by - ux * hw}}, colour));
        arcs.add(std::move(g));
        if (labels) to_label.push_back({sx, sy, bx, by, ux, uy, figure_points_number(a->margin)});
    }
    root.add(std::move(arcs));
    // Margin labels along their arcs, each where it meets no label placed
    // before it, no option's disc or name and not the legend: the middle of the
    // arc first, then further along it and further to either side.
    std::vector<Box> taken;
    for (std::size_t i = 0; i < n; ++i) {
        taken.push_back({x[i] - node_r - 2, y[i] - node_r - 2, x[i] + node_r + 2, y[i] + node_r + 2});
        if (n <= 40) taken.push_back(text_box(name_x[i], name_y[i], t.name(i), name_size, name_anchor[i]));
    }
    const Box area{4, 40, 496, H - 4};
    for (const auto& l : to_label) {
        double best_x = 0, best_y = 0, best_cost = -1;
        for (double f : {0.5, 0.4, 0.6, 0.32, 0.68, 0.25, 0.75, 0.18, 0.82}) {
            for (double side : {11.0, -11.0, 0.0, 21.0, -21.0}) {
                const double mx = l.sx + (l.bx - l.sx) * f - l.uy * side;
                const double my = l.sy + (l.by - l.sy) * f + l.ux * side + 4;
                const Box b = text_box(mx, my, l.text, 10, "middle");
                double cost = 0;
                for (const Box& o : taken) cost += b.overlap_area(o);
                if (b.x0 < area.x0 || b.x1 > area.x1 || b.y0 < area.y0 || b.y1 > area.y1) cost += 1e6;
                if (best_cost < 0 || cost < best_cost) {
                    best_cost = cost;
                    best_x = mx;
                    best_y = my;
                }
            }
            if (best_cost == 0) break;
        }
        taken.push_back(text_box(best_x, best_y, l.text, 10, "middle"));
        margin_labels.add(halo_text(best_x, best_y, l.text, 10, "middle"));
    }
    root.add(std::move(margin_labels));

    svg::Element nodes("g");
    for (std::size_t i = 0; i < n; ++i) {
        nodes.add(svg::circle(x[i], y[i], node_r, palette()[i % palette().size()]).set("stroke", ink).set("stroke-width", 1.5));
        if (n <= 40 || i % ((n + 39) / 40) == 0)
            nodes.add(halo_text(name_x[i], name_y[i], t.name(i), name_size, name_anchor[i]));
    }
    root.add(std::move(nodes));

    // Legend.
    const double lx = 500, lw = 240;
    svg::Element legend("g");
    double ly = 60;
    legend.add(svg::rect(lx, ly - 22, lw, H - ly - 10, "#ffffff").set("stroke", "#d9d6cc").set("rx", 4));
    legend.add(svg::text(lx + 12, ly, "How to read", 13).set("font-weight", "bold").set("fill", ink));
    ly += 24;
    auto arrow_sample = [&](double y0, const std::string& colour, double w) {
        legend.add(svg::line(lx + 12, y0, lx + 38, y0, colour, w));
        legend.add(svg::polygon({{lx + 48, y0}, {lx + 36, y0 - 5 - w / 2}, {lx + 36, y0 + 5 + w / 2}}, colour));
    };
    arrow_sample(ly - 4, palette()[0], 2);
    legend.add(svg::text(lx + 56, ly, "A \u2192 B: A beats B", 11).set("fill", ink));
    ly += 16;
    legend.add(svg::text(lx + 56, ly, labels ? "label: margin in points" : "(margin above its error bound)", 10).set("fill", muted));
    ly += 22;
    arrow_sample(ly - 4, palette()[0], 6);
    legend.add(svg::text(lx + 56, ly, "thicker: larger margin", 11).set("fill", ink));
    ly += 16;
    legend.add(svg::text(lx + 56, ly, "thickest " + figure_points(t.arcs.empty() ? 0 : mmax), 10).set("fill", muted));
    ly += 22;
    legend.add(svg::line(lx + 12, ly - 4, lx + 48, ly - 4, muted, 1.4).set("stroke-dasharray", "6 4"));
    legend.add(svg::text(lx + 56, ly, "undecided pair", 11).set("fill", ink));
    ly += 16;
    legend.add(svg::text(lx + 56, ly, "(margin within its bound)", 10).set("fill", muted));
    ly += 22;
    arrow_sample(ly - 4, highlight, 3);
    if (t.strongest_cycle) {
        legend.add(svg::text(lx + 56, ly, "strongest cycle, strength", 11).set("fill", ink));
        ly += 16;
        legend.add(svg::text(lx + 56, ly, figure_points(t.strongest_cycle->strength), 10).set("fill", muted));
        for (const auto& l : cycle_lines) {
            ly += 16;
            legend.add(svg::text(lx + 12, ly, l, 11).set("fill", highlight));
        }
    } else {
        legend.add(svg::text(lx + 56, ly, "no cycle: the digraph", 11).set("fill", ink));
        ly += 16;
        legend.add(svg::text(lx + 56, ly, "is acyclic", 11).set("fill", ink));
    }
    ly += 26;
    legend.add(svg::text(lx + 12, ly,
                         "Condorcet winner: " + (t.condorcet_winner ? t.name(*t.condorcet_winner) : std::string("none")),
                         11)
                   .set("fill", ink));
    legend.children.front().set("height", ly - 60 + 36);  // the frame ends below the last line
    root.add(std::move(legend));
    return root;
}

// ---------------------------------------------------------------- sweep

namespace {

struct Axes {
    double left, top, width, height;
    double x0, x1, y0, y1;  // data ranges
    double x(double v) const { return x1 > x0 ? left + (v - x0) / (x1 - x0) * width : left + width / 2; }
    double y(double v) const { return y1 > y0 ? top + height - (v - y0) / (y1 - y0) * height : top + height / 2; }
};

// Frame, ticks and tick labels; `ylabel` formats a y tick.
void draw_axes(svg::Element& root, const Axes& a, double xstep, double ystep, const std::string& xtitle,
               const std::string& ytitle, std::string (*ylabel)(double)) {
    svg::Element g("g");
    g.add(svg::rect(a.left, a.top, a.width, a.height, "#ffffff").set("stroke", "#c9c5b9"));
    for (double v = std::ceil(a.x0 / xstep) * xstep; v <= a.x1 + 1e-9; v += xstep) {
        const double px = a.x(v);
        g.add(svg::line(px, a.top, px, a.top + a.height, "#ece9e0", 1));
        g.add(svg::line(px, a.top + a.height, px, a.top + a.height + 5, muted, 1));
        g.add(svg::text(px, a.top + a.height + 18, fmt::format("{}", std::llround(v)), 11, "middle").set("fill", ink));
    }
    for (double v = std::ceil(a.y0 / ystep - 1e-9) * ystep; v <= a.y1 + 1e-12; v += ystep) {
        const double py = a.y(v);
        g.add(svg::line(a.left, py, a.left + a.width, py, "#ece9e0", 1));
        g.add(svg::line(a.left - 5, py, a.left, py, muted, 1));
        g.add(svg::text(a.left - 8, py + 4, ylabel(v), 11, "end").set("fill", ink));
    }
    g.add(svg::text(a.left + a.width / 2, a.top + a.height + 38, xtitle, 12, "middle").set("fill", ink));
    svg::Element yt = svg::text(0, 0, ytitle, 12, "middle");
    yt.set("fill", ink).set("transform", fmt::format("translate({} {}) rotate(-90)", svg::num(a.left - 52),
                                                     svg::num(a.top + a.height / 2)));
    g.add(std::move(yt));
    root.add(std::move(g));
}

std::string margin_tick(double v) { return fmt::format("{}", svg::num(100.0 * v)); }

constexpr std::size_t max_pairs_drawn = 28;
constexpr std::size_t max_crossovers_listed = 30;
const char* cycle_tints[] = {"#f0e442", "#56b4e9", "#cc79a7", "#009e73"};

}  // namespace

svg::Element sweep_figure(const SweepResult& r, std::size_t variant) {
    const VariantSweep& v = r.variants.at(variant);
    const auto& L = v.lengths;
    const double W = 760;
    Axes a{80, 52, 640, 300, L.empty() ? 0.0 : L.front() - 0.5, L.empty() ? 1.0 : L.back() + 0.5, -1, 1};
    const std::size_t pairs = std::min(v.pairs.size(), max_pairs_drawn);
    double ymax = 0;
    for (std::size_t k = 0; k < pairs; ++k)
        for (const auto& o : v.pairs[k].at) ymax = std::max(ymax, std::fabs(o.margin()));
    if (!(ymax > 0)) ymax = 0.01;
    const double ystep = nice_step(2 * ymax, 6);
    ymax = std::ceil(ymax / ystep - 1e-9) * ystep;
    a.y0 = -ymax;
    a.y1 = ymax;
    const std::size_t cycles = std::min<std::size_t>(v.cycles.size(), 4);
    const std::size_t crossings = std::min(v.crossovers.size(), max_crossovers_listed);
    const double legend_top = a.top + a.height + 62;
    const double H = legend_top + 18.0 * static_cast<double>(pairs + (pairs < v.pairs.size()) + 1) +
                     18.0 * static_cast<double>(cycles + 1) + 18.0 * static_cast<double>(crossings + 2) + 16;

    const std::string rules = fmt::format("overshoot {}, {} order", to_string(v.variant.rule), to_string(v.variant.order));
    svg::Element root = svg::document(
        W, H, "Margin against length",
        fmt::format("margin of each pair of options for lengths {} to {} ({}); {} crossovers, {} cycles",
                    L.empty() ? 0 : L.front(), L.empty() ? 0 : L.back(), rules, v.crossovers.size(), v.cycles.size()));
    root.add(background(W, H));
    root.add(svg::text(20, 28, "Margin against length", 16).set("font-weight", "bold").set("fill", ink));
    root.add(svg::text(230, 28, rules, 12).set("fill", muted));
    draw_axes(root, a, nice_step(a.x1 - a.x0, 8), ystep, "board length (squares)",
              "margin, percentage points", margin_tick);

    // Shaded lengths where a cycle holds (half a step either side of each run).
    const double half = r.grid.step / 2.0;
    svg::Element shade("g");
    shade.set("fill-opacity", "0.28");
    for (std::size_t k = 0; k < cycles; ++k)
        for (auto [lo, hi] : v.cycles[k].intervals) {
            const double x0 = a.x(std::max<double>(lo - half, a.x0)), x1 = a.x(std::min<double>(hi + half, a.x1));
            shade.add(svg::rect(x0, a.top + 1, std::max(x1 - x0, 1.0), a.height - 2, cycle_tints[k]));
        }
    root.add(std::move(shade));
    root.add(svg::line(a.left, a.y(0), a.left + a.width, a.y(0), ink, 1.3));

    svg::Element curves("g");
    for (std::size_t k = 0; k < pairs; ++k) {
        Points pts;
        for (std::size_t i = 0; i < L.size() && i < v.pairs[k].at.size(); ++i)
            pts.emplace_back(a.x(L[i]), a.y(v.pairs[k].at[i].margin()));
        svg::Element pl = svg::polyline(pts, palette()[k % palette().size()], 1.8);
        if (k >= palette().size()) pl.set("stroke-dasharray", k >= 2 * palette().size() ? "2 3" : "7 3");
        curves.add(std::move(pl));
    }
    root.add(std::move(curves));

    svg::Element marks("g");
    for (std::size_t k = 0; k < v.crossovers.size(); ++k) {
        const Crossover& c = v.crossovers[k];
        const double px = a.x((c.before + c.after) / 2.0), py = a.y(0);
        marks.add(svg::circle(px, py, 4.5, paper).set("stroke", highlight).set("stroke-width", 2));
        if (k < crossings) {
            const double dy = k % 2 == 0 ? -10 : 19;
            marks.add(halo_text(px, py + dy, fmt::format("{}", k + 1), 10, "middle").set("fill", highlight));
        }
    }
    root.add(std::move(marks));

    // Legend: pairs, cycles, crossovers, as selectable text lines.
    double ly = legend_top;
    svg::Element legend("g");
    legend.set("fill", ink);
    for (std::size_t k = 0; k < pairs; ++k) {
        const auto& p = v.pairs[k];
        svg::Element sw = svg::line(a.left, ly - 4, a.left + 26, ly - 4, palette()[k % palette().size()], 2.5);
        if (k >= palette().size()) sw.set("stroke-dasharray", k >= 2 * palette().size() ? "2 3" : "7 3");
        legend.add(std::move(sw));
        legend.add(svg::text(a.left + 34, ly, fmt::format("{} vs {} (above zero: {} ahead)", r.options[p.a].name,
                                                          r.options[p.b].name, r.options[p.a].name), 11));
        ly += 18;
    }
    if (pairs < v.pairs.size()) {
        legend.add(svg::text(a.left, ly, fmt::format("... {} more pairs not drawn (see sweep --json)", v.pairs.size() - pairs), 11));
        ly += 18;
    }
    ly += 4;
    if (v.cycles.empty()) {
        legend.add(svg::text(a.left, ly, "No cycle at any swept length.", 11));
        ly += 18;
    }
    for (std::size_t k = 0; k < cycles; ++k) {
        const CycleSpan& c = v.cycles[k];
        legend.add(svg::rect(a.left, ly - 11, 26, 12, cycle_tints[k]).set("fill-opacity", "0.5"));
        std::string names;
        for (auto i : c.options) names += r.options[i].name + " \u2192 ";
        names += r.options[c.options.front()].name;
        std::string runs;
        for (std::size_t q = 0; q < c.intervals.size() && q < 6; ++q)
            runs += (q ? ", " : "") + (c.intervals[q].first == c.intervals[q].second
                                           ? fmt::format("{}", c.intervals[q].first)
                                           : fmt::format("{}..{}", c.intervals[q].first, c.intervals[q].second));
        if (c.intervals.size() > 6) runs += fmt::format(", ... ({} runs)", c.intervals.size());
        legend.add(svg::text(a.left + 34, ly, fmt::format("cycle {} holds at lengths {}", names, runs), 11));
        ly += 18;
    }
    if (v.cycles.size() > cycles) {
        legend.add(svg::text(a.left, ly, fmt::format("... {} more cycles not shaded", v.cycles.size() - cycles), 11));
        ly += 18;
    }
    ly += 8;
    legend.add(svg::text(a.left, ly, v.crossovers.empty() ? "Crossovers: none." : "Crossovers (circles on the zero line):", 11)
                   .set("font-weight", "bold"));
    ly += 18;
    for (std::size_t k = 0; k < crossings; ++k) {
        const Crossover& c = v.crossovers[k];
        const std::string where = c.length() ? fmt::format("at {}", *c.length())
                                             : fmt::format("in {}..{}", c.before + 1, c.after);
        std::string line = fmt::format("{}. crossover {}: {} vs {}: {} ahead up to {}, {} ahead from {}", k + 1, where,
                                       r.options[c.a].name, r.options[c.b].name, r.options[c.preferred_before].name,
                                       c.before, r.options[c.preferred_after].name, c.after);
        if (!c.undecided.empty()) line += fmt::format(" (undecided at {} lengths between)", c.undecided.size());
        legend.add(svg::text(a.left, ly, line, 11));
        ly += 18;
    }
    if (v.crossovers.size() > crossings) {
        legend.add(svg::text(a.left, ly, fmt::format("... {} more crossovers (see sweep --json)", v.crossovers.size() - crossings), 11));
    }
    root.add(std::move(legend));
    return root;
}

// ---------------------------------------------------------------- distribution

svg::Element distribution_figure(const std::vector<std::string>& names, const std::vector<Distribution>& dist) {
    const std::size_t n = std::min(names.size(), dist.size());
    // Cut the time axis where every option has 99% of its finishing mass (or its list ends).
    long long tmax = 1;
    double pmax = 0;
    for (std::size_t i = 0; i < n; ++i) {
        const Distribution& d = dist[i];
        const long double total = (d.rows.empty() ? 0.0L : d.rows.back().cumulative) + d.remaining_finish;
        long long cut = d.rows.empty() ? 1 : d.rows.back().turn;
        for (const auto& row : d.rows)
            if (row.cumulative >= 0.99L * total) {
                cut = row.turn;
                break;
            }
        tmax = std::max(tmax, cut);
    }
    for (std::size_t i = 0; i < n; ++i)
        for (const auto& row : dist[i].rows)
            if (row.turn <= tmax) pmax = std::max(pmax, static_cast<double>(row.p));
    if (!(pmax > 0)) pmax = 1;
    const double ystep = nice_step(pmax, 5);
    pmax = std::ceil(pmax / ystep - 1e-9) * ystep;

    const double W = 760;
    Axes a{80, 52, 450, 280, 0, static_cast<double>(tmax), 0, pmax};
    const double legend_top = a.top + a.height + 62;
    const double H = std::max(legend_top + 18.0 * static_cast<double>(n) + 4, a.top + 60 + 34.0 * static_cast<double>(n) + 40);
    svg::Element root = svg::document(W, H, "Finishing-time distribution",
                                      fmt::format("P(finishing on turn t) for {} options, turns 1 to {}; "
                                                  "the chance of never finishing beside it", n, tmax));
    root.add(background(W, H));
    root.add(svg::text(20, 28, "Finishing-time distribution", 16).set("font-weight", "bold").set("fill", ink));
    draw_axes(root, a, nice_step(static_cast<double>(tmax), 8), ystep, "turn",
              "P(finishing on this turn), %", margin_tick);

    // Bucket the turns so a long axis keeps at most 1200 points, keeping each bucket's peak.
    const long long bucket = std::max<long long>(1, (tmax + 1199) / 1200);
    svg::Element curves("g");
    for (std::size_t i = 0; i < n; ++i) {
        Points pts;
        pts.emplace_back(a.x(0), a.y(0));
        double peak = 0;
        long long peak_turn = 0, start = 1;
        for (const auto& row : dist[i].rows) {
            if (row.turn > tmax) break;
            if (static_cast<double>(row.p) >= peak) {
                peak = static_cast<double>(row.p);
                peak_turn = row.turn;
            }
            if (row.turn - start + 1 >= bucket) {
                pts.emplace_back(a.x(static_cast<double>(peak_turn)), a.y(peak));
                peak = 0;
                start = row.turn + 1;
            }
        }
        if (peak > 0) pts.emplace_back(a.x(static_cast<double>(peak_turn)), a.y(peak));
        svg::Element pl = svg::polyline(pts, palette()[i % palette().size()], 1.8);
        if (i >= palette().size()) pl.set("stroke-dasharray", "7 3");
        curves.add(std::move(pl));
    }
    root.add(std::move(curves));

    // Beside the plot: the chance of never finishing, as bars on 0..100%.
    const double bx = 575, bw = 160;
    svg::Element side("g");
    side.set("fill", ink);
    side.add(svg::text(bx, a.top - 8, "P(never finishing)", 12).set("font-weight", "bold"));
    for (std::size_t i = 0; i < n; ++i) {
        const double y0 = a.top + 12 + 34.0 * static_cast<double>(i);
        const double never = static_cast<double>(dist[i].never);
        side.add(svg::text(bx, y0, names[i], 11));
        side.add(svg::rect(bx, y0 + 5, bw, 10, "#ece9e0"));
        side.add(svg::rect(bx, y0 + 5, std::max(bw * never, never > 0 ? 1.0 : 0.0), 10,
                           palette()[i % palette().size()]));
        side.add(svg::text(bx + bw, y0, figure_percent(never), 10, "end"));
    }
    root.add(std::move(side));

    double ly = legend_top;
    svg::Element legend("g");
    legend.set("fill", ink);
    for (std::size_t i = 0; i < n; ++i) {
        const Distribution& d = dist[i];
        long double beyond = d.remaining_finish;
        for (const auto& row : d.rows)
            if (row.turn > tmax) beyond += row.p;
        svg::Element sw = svg::line(a.left, ly - 4, a.left + 26, ly - 4, palette()[i % palette().size()], 2.5);
        if (i >= palette().size()) sw.set("stroke-dasharray", "7 3");
        legend.add(std::move(sw));
        legend.add(svg::text(a.left + 34, ly,
                             fmt::format("{}: finishes after turn {} with chance {}", names[i], tmax,
                                         figure_percent(static_cast<double>(beyond))), 11));
        ly += 18;
    }
    root.add(std::move(legend));
    return root;
}

}  // namespace overshoot::render
