#include "render/search.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>

#include "render/figures.hpp"
#include "render/document.hpp"
#include "render/format.hpp"
#include "render/tournament.hpp"

namespace overshoot::render {

namespace {

std::string cycle_name(const std::vector<std::size_t>& cycle, const std::vector<Option>& options) {
    std::string s;
    for (std::size_t i : cycle) s += options[i].name + " > ";
    return s + options[cycle.front()].name;
}

std::string target_sentence(const SearchSpec& spec) {
    switch (spec.target) {
        case SearchTarget::cycle:
            return fmt::format("make the cycle {} hold, as strongly as possible (score: its smallest margin)",
                               cycle_name(spec.cycle, spec.options));
        case SearchTarget::no_winner:
            return "leave no option that beats every other (score: the smallest, over options, of the largest margin "
                   "by which another option beats it)";
        case SearchTarget::top_cycle:
            return "put every option in the top cycle (score: the largest margin t such that the arcs of margin t or "
                   "more still join every option to every other)";
        case SearchTarget::fair:
            return "make every duel as even as possible (score: minus the largest |margin| of any pair)";
    }
    return "";
}

std::string jump_list(const std::vector<Jump>& js) {
    if (js.empty()) return "none";
    std::string s;
    for (const auto& j : js) s += fmt::format("{}{}:{}", s.empty() ? "" : " ", j.from, j.to);
    return s;
}

// A shell word: quoted when it holds anything but plain characters.
std::string shell_word(const std::string& w) {
    const bool plain = std::all_of(w.begin(), w.end(), [](char c) {
        return std::isalnum(static_cast<unsigned char>(c)) || c == '+' || c == '-' || c == '_' || c == '.' || c == ':';
    });
    if (plain && !w.empty()) return w;
    std::string q = "'";
    for (char c : w) q += c == '\'' ? std::string("'\\''") : std::string(1, c);
    return q + "'";
}

std::vector<std::string> names_of(const std::vector<Option>& options) {
    std::vector<std::string> v;
    for (const auto& o : options) v.push_back(o.name);
    return v;
}

// What the search changed: "jumps 97:20; head starts 2d6 on 4".
std::string change_list(const FoundBoard& f, const SearchSpec& spec) {
    std::string s = "jumps " + jump_list(f.added);
    const std::vector<int> base = spec.starts.empty() ? std::vector<int>(spec.options.size(), 0) : spec.starts;
    std::string moved;
    for (std::size_t i = 0; i < f.starts.size(); ++i)
        if (f.starts[i] != base[i]) moved += fmt::format("{}{} on {}", moved.empty() ? "" : ", ", spec.options[i].name, f.starts[i]);
    if (!moved.empty()) s += "; head starts " + moved;
    return s;
}

std::string arcs_line(const FoundBoard& f, const SearchSpec& spec) {
    const Tournament& t = f.verified;
    const std::size_t n = t.size();
    std::vector<std::string> parts;
    if (spec.target == SearchTarget::cycle) {
        for (std::size_t k = 0; k < spec.cycle.size(); ++k) {
            const std::size_t a = spec.cycle[k], b = spec.cycle[(k + 1) % spec.cycle.size()];
            parts.push_back(fmt::format("{} {} {} by {}", t.name(a), t.beats[a * n + b] ? ">" : "does not beat", t.name(b),
                                        points(t.margin[a * n + b])));
        }
    } else {
        for (const auto& arc : t.arcs)
            parts.push_back(fmt::format("{} > {} by {}", t.name(arc.from), t.name(arc.to), points(arc.margin)));
        for (const auto& [a, b] : t.undecided) parts.push_back(fmt::format("{} ~ {} undecided", t.name(a), t.name(b)));
    }
    std::string s;
    for (const auto& p : parts) s += (s.empty() ? "" : "; ") + p;
    return s;
}

double largest_bound(const Tournament& t) {
    double b = 0;
    for (double x : t.matrix.bound) b = std::max(b, x);
    return b;
}

std::string verdict(const FoundBoard& f, const SearchSpec& spec) {
    if (spec.target == SearchTarget::fair) return "";
    return f.holds ? "holds" : "does not hold";
}

nlohmann::json found_json(const FoundBoard& f, const SearchSpec& spec) {
    nlohmann::json j;
    j["board"] = board_json(f.board, spec.order);
    if (any_head_start(f.starts)) j["board"]["head_starts"] = head_starts_json(names_of(spec.options), f.starts);
    nlohmann::json added = nlohmann::json::array();
    for (const auto& a : f.added) added.push_back({a.from, a.to});
    j["added_jumps"] = added;
    j["score"] = f.score;
    j["holds"] = f.holds;
    j["bounds_proven"] = f.verified.matrix.bounds_proven;
    j["largest_error_bound"] = largest_bound(f.verified);
    nlohmann::json arcs = nlohmann::json::array();
    for (const auto& a : f.verified.arcs)
        arcs.push_back({{"from", f.verified.name(a.from)}, {"to", f.verified.name(a.to)}, {"margin", a.margin},
                        {"error_bound", a.bound}});
    j["arcs"] = arcs;
    j["condorcet_winner"] = f.verified.condorcet_winner ? nlohmann::json(f.verified.name(*f.verified.condorcet_winner))
                                                         : nlohmann::json(nullptr);
    nlohmann::json top = nlohmann::json::array();
    for (std::size_t i : f.verified.top_cycle) top.push_back(f.verified.name(i));
    j["top_cycle"] = top;
    j["flags"] = board_flags(f.board, spec.order) + head_start_flags(spec.options, f.starts, false);
    return j;
}

}  // namespace

std::string board_flags(const Board& board, Order order) {
    std::string s = fmt::format("--length {}", board.length);
    if (board.rule != Overshoot::stay) s += fmt::format(" --overshoot {}", to_string(board.rule));
    for (const auto& j : board.jumps) s += fmt::format(" --jump {}:{}", j.from, j.to);
    if (order != Order::simultaneous) s += fmt::format(" --order {}", to_string(order));
    return s;
}

std::string head_start_flags(const std::vector<Option>& options, const std::vector<int>& starts, bool by_spec) {
    std::string s;
    for (std::size_t i = 0; i < options.size() && i < starts.size(); ++i)
        if (starts[i] != 0)
            s += " --head-start " + shell_word(fmt::format("{}:{}", by_spec ? options[i].spec : options[i].name, starts[i]));
    return s;
}

std::vector<std::pair<std::string, int>> start_marks(const std::vector<Option>& options, const std::vector<int>& starts) {
    std::vector<std::pair<std::string, int>> out;
    for (std::size_t i = 0; i < options.size() && i < starts.size(); ++i)
        if (starts[i] != 0) out.emplace_back(options[i].name, starts[i]);
    return out;
}

std::string scenario_toml(const Board& board, Order order, const std::vector<Option>& options,
                          const std::vector<int>& starts) {
    auto quoted = [](const std::string& s) {
        std::string q = "\"";
        for (char c : s) {
            if (c == '"' || c == '\\') q += '\\';
            q += c;
        }
        return q + "\"";
    };
    std::string s = "[board]\n";
    s += fmt::format("length = {}\n", board.length);
    s += fmt::format("overshoot = \"{}\"\n", to_string(board.rule));
    s += "jumps = [";
    for (std::size_t i = 0; i < board.jumps.size(); ++i)
        s += fmt::format("{}[{}, {}]", i ? ", " : "", board.jumps[i].from, board.jumps[i].to);
    s += "]\n\n[race]\n";
    s += fmt::format("order = \"{}\"\n\n[options]\n", to_string(order));
    for (const auto& o : options) s += fmt::format("{} = {}\n", quoted(o.name), quoted(o.spec));
    if (any_head_start(starts)) {
        s += "\n[head_starts]\n";
        for (std::size_t i = 0; i < options.size() && i < starts.size(); ++i)
            if (starts[i] != 0) s += fmt::format("{} = {}\n", quoted(options[i].name), starts[i]);
    }
    return s;
}

std::string search_text(const SearchResult& r, const SearchSpec& spec) {
    std::string out = fmt::format("Board search. Target: {}.\n", target_sentence(spec));
    out += fmt::format("Board changed: {}, overshoot {}, {} turns, jumps {}", plural(spec.board.length, "square"),
                       to_string(spec.board.rule), to_string(spec.order), jump_list(spec.board.jumps));
    if (any_head_start(spec.starts)) out += "; " + head_starts_text(names_of(spec.options), spec.starts);
    if (spec.head_start_max > 0) out += fmt::format("; head starts on squares 0..{} searched", spec.head_start_max);
    if (r.lengths.size() > 1) out += fmt::format("; lengths {}..{} searched", r.lengths.front(), r.lengths.back());
    out += ".\n";
    const bool heads = spec.head_start_max > 0;
    if (r.start_grid)
        out += fmt::format("Searched: every assignment of a start square 0..{} to every option (exhaustive): {} boards "
                           "raced, {} refused (a start whose jump leads to the finish).\n",
                           spec.head_start_max, r.boards_raced, r.boards_invalid);
    else if (r.exhaustive)
        out += fmt::format("Searched: {} (exhaustive): {} boards raced, {} refused ({}).\n",
                           spec.max_jumps == 0 && !heads ? "no change"
                           : heads                      ? "every single head start"
                                                        : "every single added jump",
                           r.boards_raced, r.boards_invalid, heads ? "a start whose jump leads to the finish" : "a loop of jumps");
    else
        out += fmt::format(
            "Searched: up to {} added jumps{} by a seeded beam search (seed {}, beam {}, {} changes tried per board "
            "and level, then local moves): {} boards raced, {} refused. This is a search, not a proof that no "
            "better board exists; every single change ({}) was tried exhaustively.\n",
            spec.max_jumps, heads ? fmt::format(" and head starts 0..{}", spec.head_start_max) : std::string(),
            spec.seed, spec.beam, spec.sample, r.boards_raced, r.boards_invalid,
            heads ? "one added jump or one head start" : "one added jump");
    if (!spec.from_squares.empty() || !spec.to_squares.empty())
        out += fmt::format("Allowed squares: jumps from {} to {}.\n",
                           spec.from_squares.empty() ? std::string("any") : fmt::format("{}", fmt::join(spec.from_squares, ",")),
                           spec.to_squares.empty() ? std::string("any") : fmt::format("{}", fmt::join(spec.to_squares, ",")));
    out += "Every board below was raced again by the duel engine (automatic method, proven bounds).\n\n";
    if (r.base) {
        out += fmt::format("Unchanged board ({}): score {}{}.\n  {}\n\n", plural(r.base->board.length, "square"), points(r.base->score),
                           verdict(*r.base, spec).empty() ? "" : "; the target " + verdict(*r.base, spec),
                           arcs_line(*r.base, spec));
    }
    out += "Best boards, then runners-up:\n";
    for (std::size_t i = 0; i < r.best.size(); ++i) {
        const FoundBoard& f = r.best[i];
        out += fmt::format("{:2}. {}: score {}{} (largest error bound {:.1e}{})\n", i + 1, change_list(f, spec),
                           points(f.score), verdict(f, spec).empty() ? "" : "; the target " + verdict(f, spec),
                           largest_bound(f.verified), f.verified.matrix.bounds_proven ? "" : ", not proven");
        out += fmt::format("    {}\n", arcs_line(f, spec));
        out += fmt::format("    board: {}{}\n", board_flags(f.board, spec.order), head_start_flags(spec.options, f.starts, false));
    }
    if (!r.best.empty()) {
        std::string names;
        for (const auto& o : spec.options) names += " " + shell_word(o.spec);
        const FoundBoard& f = r.best.front();
        const std::string flags = board_flags(f.board, spec.order) + head_start_flags(spec.options, f.starts, true);
        out += fmt::format("\nCheck the best board:  overshoot tournament{} {}\n", names, flags);
        if (spec.target == SearchTarget::cycle && f.holds) {
            // certify cycle reads the cycle from the order of its options.
            std::string in_order;
            for (std::size_t i : spec.cycle) in_order += " " + shell_word(spec.options[i].spec);
            out += fmt::format("Certify its cycle:     overshoot certify cycle{} {} -o cycle.json\n", in_order, flags);
        }
    }
    return out;
}

std::string search_section_html(const SearchResult& r, const SearchSpec& spec) {
    using svg::escape;
    std::string h = "<section id=\"search\"><h2>Board search</h2>\n<p class=\"note\">";
    h += escape(fmt::format("Target: {}. ", target_sentence(spec)));
    std::string space = fmt::format("up to {} added jump{}", spec.max_jumps, spec.max_jumps == 1 ? "" : "s");
    if (spec.head_start_max > 0) space += fmt::format(", head starts on squares 0..{}", spec.head_start_max);
    if (r.lengths.size() > 1) space += fmt::format(", lengths {}..{}", r.lengths.front(), r.lengths.back());
    h += escape(fmt::format("Searched {}: {} boards raced, {}. ", space, r.boards_raced,
                            r.exhaustive ? "exhaustively"
                                         : "by a seeded beam search (a search, not a proof that no better board exists)"));
    h += "Every board listed was raced again by the duel engine with proven bounds.</p>\n";
    if (r.base)
        h += "<p>" + escape(fmt::format("Unchanged board: score {}{}. {}", points(r.base->score),
                                        verdict(*r.base, spec).empty() ? "" : "; the target " + verdict(*r.base, spec),
                                        arcs_line(*r.base, spec))) +
             "</p>\n";
    if (r.best.empty()) return h + "<p>No board was found.</p>\n</section>\n";
    const FoundBoard& best = r.best.front();
    h += "<figure>" +
         board_figure(best.board, best.added, fmt::format("Best board of the search ({})", to_string(spec.target)),
                      start_marks(spec.options, best.starts))
             .str() +
         "<figcaption>" +
         escape(fmt::format("The best board: {}; added jumps bold, head starts labelled on their squares.",
                            change_list(best, spec))) +
         "</figcaption></figure>\n";
    h += "<table><thead><tr><th>rank</th><th>changes</th><th>score</th><th>target</th><th>margins</th>"
         "<th>board flags</th></tr></thead><tbody>\n";
    for (std::size_t i = 0; i < r.best.size(); ++i) {
        const FoundBoard& f = r.best[i];
        h += fmt::format("<tr><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td><code>{}</code></td></tr>\n",
                         i + 1, escape(change_list(f, spec)), escape(points(f.score)),
                         escape(verdict(f, spec).empty() ? "-" : verdict(f, spec)), escape(arcs_line(f, spec)),
                         escape(board_flags(f.board, spec.order) + head_start_flags(spec.options, f.starts, false)));
    }
    h += "</tbody></table>\n</section>\n";
    return h;
}

nlohmann::json search_json(const SearchResult& r, const SearchSpec& spec) {
    nlohmann::json j = document("search", 1);
    j["target"] = std::string(to_string(spec.target));
    if (spec.target == SearchTarget::cycle) {
        nlohmann::json c = nlohmann::json::array();
        for (std::size_t i : spec.cycle) c.push_back(spec.options[i].name);
        j["cycle"] = c;
    }
    nlohmann::json opts = nlohmann::json::array();
    for (const auto& o : spec.options) opts.push_back({{"name", o.name}, {"spec", o.spec}});
    j["options"] = opts;
    j["board"] = board_json(spec.board, spec.order);
    if (any_head_start(spec.starts)) j["board"]["head_starts"] = head_starts_json(names_of(spec.options), spec.starts);
    j["lengths"] = r.lengths;
    j["max_added_jumps"] = spec.max_jumps;
    j["max_head_start"] = spec.head_start_max;
    j["exhaustive"] = r.exhaustive;
    j["start_grid"] = r.start_grid;
    if (!r.exhaustive) j["beam_search"] = {{"seed", spec.seed}, {"beam", spec.beam}, {"sample", spec.sample}};
    j["from_squares"] = spec.from_squares;
    j["to_squares"] = spec.to_squares;
    j["boards_raced"] = r.boards_raced;
    j["boards_refused"] = r.boards_invalid;
    j["unchanged"] = r.base ? found_json(*r.base, spec) : nlohmann::json(nullptr);
    nlohmann::json best = nlohmann::json::array();
    for (const auto& f : r.best) best.push_back(found_json(f, spec));
    j["best"] = best;
    return j;
}

svg::Element board_figure(const Board& board, const std::vector<Jump>& added, const std::string& title,
                          const std::vector<std::pair<std::string, int>>& marks) {
    const int per_row = 10;
    const double cell = 36, margin = 24;
    const int rows = board.length / per_row + 1;  // squares 0..length
    const double w = 2 * margin + per_row * cell, h = 2 * margin + rows * cell + 28;
    // Square s sits in row s / 10 counted from the bottom, snaking left and right.
    auto centre = [&](int s) {
        const int row = s / per_row, col = s % per_row;
        const int x = row % 2 == 0 ? col : per_row - 1 - col;
        return std::pair<double, double>(margin + (x + 0.5) * cell, margin + (rows - 1 - row + 0.5) * cell);
    };
    std::string desc = fmt::format("A board of {}; jumps {}.", plural(board.length, "square"), jump_list(board.jumps));
    svg::Element root = svg::document(w, h, title, desc);
    root.add(svg::rect(0, 0, w, h, paper));
    for (int s = 0; s <= board.length; ++s) {
        auto [x, y] = centre(s);
        svg::Element r = svg::rect(x - cell / 2 + 1, y - cell / 2 + 1, cell - 2, cell - 2,
                                   s == 0 || s == board.length ? "#e8e4d8" : "#ffffff");
        r.set("stroke", muted).set("stroke-width", 0.5);
        root.add(r);
        svg::Element t = svg::text(x - cell / 2 + 3, y - cell / 2 + 11, std::to_string(s), 9, "start");
        t.set("fill", muted);
        root.add(t);
    }
    const auto& colours = palette();
    for (const auto& j : board.jumps) {
        const bool bold = std::find(added.begin(), added.end(), j) != added.end();
        auto [x1, y1] = centre(j.from);
        auto [x2, y2] = centre(j.to);
        const std::string colour = j.to > j.from ? colours[2] : colours[1];
        // A gentle curve: the control point pushed sideways from the middle.
        const double mx = (x1 + x2) / 2 - (y2 - y1) * 0.2, my = (y1 + y2) / 2 + (x2 - x1) * 0.2;
        svg::Element p("path");
        p.set("d", fmt::format("M {} {} Q {} {} {} {}", svg::num(x1), svg::num(y1), svg::num(mx), svg::num(my),
                               svg::num(x2), svg::num(y2)));
        p.set("fill", "none").set("stroke", colour).set("stroke-width", bold ? 3.5 : 2);
        if (!bold) p.set("stroke-dasharray", "5 3");
        p.add(svg::Element("title").content(fmt::format("jump {} -> {}{}", j.from, j.to, bold ? " (added)" : "")));
        root.add(p);
        root.add(svg::circle(x2, y2, 4, colour));
    }
    // Head starts: the option's name on its start square, one line per piece there.
    std::map<int, int> on_square;
    for (const auto& [name, square] : marks) {
        auto [x, y] = centre(square);
        const int k = on_square[square]++;
        svg::Element t = svg::text(x, y + 4 + 9 * k, name, 8, "middle");
        t.set("fill", ink);
        t.add(svg::Element("title").content(fmt::format("{} starts on square {}", name, square)));
        root.add(t);
    }
    svg::Element legend = svg::text(margin, h - 12,
                                     "jumps: forward and backward in two colours; bold = added by the search, "
                                     "a dot marks where a jump lands",
                                     10, "start");
    legend.set("fill", ink);
    root.add(legend);
    return root;
}

}  // namespace overshoot::render
