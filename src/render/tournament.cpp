#include "render/tournament.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "render/format.hpp"
#include "render/document.hpp"

namespace overshoot::render {

namespace {

constexpr std::size_t shown_cycles = 20;  // text, Markdown: the rest is in --json

std::string heading(const Tournament& t, const TournamentSource& src) {
    std::string out;
    if (src.board) {
        out = describe(*src.board, src.order);
        if (any_head_start(src.starts)) {
            std::vector<std::string> names;
            for (const Option& o : src.options) names.push_back(o.name);
            out += "\n" + head_starts_text(names, src.starts);
        }
    } else
        out = fmt::format("win matrix from {}, error bound {} on every margin", src.matrix_file,
                          src.tolerance == 0 ? std::string("0") : fmt::format("{:g}", src.tolerance));
    out += "\n" + plural(static_cast<long long>(t.size()), "option");
    return out;
}

std::vector<std::string> names_of(const Tournament& t, const std::vector<std::size_t>& idx) {
    std::vector<std::string> v;
    for (std::size_t i : idx) v.push_back(t.name(i));
    return v;
}

std::string join(const std::vector<std::string>& v, const std::string& sep) {
    std::string out;
    for (std::size_t i = 0; i < v.size(); ++i) out += (i ? sep : "") + v[i];
    return out;
}

// "A, B and C"
std::string and_list(const std::vector<std::string>& v) {
    if (v.empty()) return "none";
    if (v.size() == 1) return v[0];
    return join(std::vector<std::string>(v.begin(), v.end() - 1), ", ") + " and " + v.back();
}

std::string arrow_form(const Tournament& t, const Cycle& c) {
    return join(names_of(t, c.options), " -> ") + " -> " + t.name(c.options.front());
}

// A sentence a puzzle writer can quote.
std::string cycle_sentence(const Tournament& t, const Cycle& c) {
    const std::size_t n = t.size();
    std::vector<std::string> parts;
    for (std::size_t k = 0; k < c.options.size(); ++k) {
        std::size_t a = c.options[k], b = c.options[(k + 1) % c.options.size()];
        parts.push_back(fmt::format("{} beats {} by {}", t.name(a), t.name(b), points(t.margin[a * n + b])));
    }
    std::string s = join(std::vector<std::string>(parts.begin(), parts.end() - 1), ", ") + ", and " + parts.back();
    return s + fmt::format(" (strength {})", points(c.strength));
}

std::string cell_percent(const Tournament& t, const std::vector<double>& m, std::size_t i, std::size_t j) {
    return i == j ? std::string("-") : percent(m[i * t.size() + j]);
}

bool any_positive(const Tournament& t, const std::vector<double>& m) {
    const std::size_t n = t.size();
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = 0; j < n; ++j)
            if (i != j && m[i * n + j] > 0) return true;
    return false;
}

std::string matrix_table(const Tournament& t, const std::vector<double>& m) {
    std::vector<std::string> header{"option"};
    for (std::size_t j = 0; j < t.size(); ++j) header.push_back(t.name(j));
    std::vector<std::vector<std::string>> rows;
    for (std::size_t i = 0; i < t.size(); ++i) {
        std::vector<std::string> r{t.name(i)};
        for (std::size_t j = 0; j < t.size(); ++j) r.push_back(cell_percent(t, m, i, j));
        rows.push_back(std::move(r));
    }
    return table(header, rows, max_text_width);
}

std::string score(double s) { return s == std::floor(s) ? fmt::format("{}", s) : fmt::format("{:.1f}", s); }

std::string counter_sentence(const Tournament& t, std::size_t j) {
    const Counter& c = t.counters[j];
    if (!c.counter) return fmt::format("Nothing beats {}: it has no counter.", t.name(j));
    return fmt::format("Against {}, choose {}: it wins by {}.", t.name(j), t.name(*c.counter), points(c.margin));
}

nlohmann::json cycle_json(const Tournament& t, const Cycle& c) {
    return {{"options", names_of(t, c.options)}, {"strength", c.strength}, {"length", c.options.size()}};
}

nlohmann::json matrix_json(const Tournament& t, const std::vector<double>& m, bool null_diagonal) {
    nlohmann::json rows = nlohmann::json::array();
    for (std::size_t i = 0; i < t.size(); ++i) {
        nlohmann::json r = nlohmann::json::array();
        for (std::size_t j = 0; j < t.size(); ++j)
            r.push_back(i == j && null_diagonal ? nlohmann::json(nullptr) : nlohmann::json(m[i * t.size() + j]));
        rows.push_back(r);
    }
    return rows;
}

std::string dot_quote(const std::string& s) {
    std::string out = "\"";
    for (char c : s) {
        if (c == '"' || c == '\\') out += '\\';
        out += c;
    }
    return out + "\"";
}

}  // namespace

std::string tournament_text(const Tournament& t, const TournamentSource& src) {
    const std::size_t n = t.size();
    std::string out = heading(t, src) + "\n\n";
    out += "P(row wins against column):\n" + matrix_table(t, t.matrix.win);
    if (any_positive(t, t.matrix.tie))
        out += std::string(src.board ? "\nP(tie: a shared finish):\n" : "\nP(neither wins: 1 - both win probabilities):\n") +
               matrix_table(t, t.matrix.tie);
    if (any_positive(t, t.matrix.neither)) out += "\nP(neither piece ever finishes):\n" + matrix_table(t, t.matrix.neither);

    out += "\nDominance digraph (an arc A -> B when A beats B by more than the error bound):\n";
    if (t.arcs.empty()) out += "  no arcs\n";
    std::size_t wide_from = 0, wide_to = 0, wide_by = 0;
    for (const Arc& a : t.arcs) {
        wide_from = std::max(wide_from, t.name(a.from).size());
        wide_to = std::max(wide_to, t.name(a.to).size());
        wide_by = std::max(wide_by, points(a.margin).size());
    }
    for (const Arc& a : t.arcs)
        out += fmt::format("  {:<{}} -> {:<{}}  by {:>{}}  (bound {:.2g})\n", t.name(a.from), wide_from, t.name(a.to),
                           wide_to, points(a.margin), wide_by, a.bound);
    if (t.undecided.empty()) {
        out += "Undecided pairs (margin within the error bound): none.\n";
    } else {
        out += "Undecided pairs (margin within the error bound, counted as half a point each):\n";
        for (auto [i, j] : t.undecided)
            out += fmt::format("  {} and {}: margin {}, bound {:.2g}\n", t.name(i), t.name(j), points(t.margin[i * n + j]),
                               std::max(t.matrix.bound[i * n + j], t.matrix.bound[j * n + i]));
    }

    out += "\nCopeland scores: ";
    for (std::size_t i = 0; i < n; ++i) out += (i ? ", " : "") + fmt::format("{} {}", t.name(i), score(t.copeland[i]));
    out += ".\n";
    out += t.condorcet_winner ? fmt::format("Condorcet winner: {} beats every other option.\n", t.name(*t.condorcet_winner))
                              : std::string("Condorcet winner: none (no option beats every other).\n");
    out += t.condorcet_loser ? fmt::format("Condorcet loser: {} is beaten by every other option.\n", t.name(*t.condorcet_loser))
                             : std::string("Condorcet loser: none.\n");
    std::vector<std::string> comps;
    for (const auto& c : t.components) comps.push_back("{" + join(names_of(t, c), ", ") + "}");
    out += "Strongly connected components: " + join(comps, ", ") + ".\n";
    out += "Top cycle (Smith set, undecided pairs as ties): " + and_list(names_of(t, t.top_cycle)) + ".\n";
    long long triples = n >= 3 ? static_cast<long long>(n) * (n - 1) * (n - 2) / 6 : 0;
    out += fmt::format("Cyclic triads: {} of {} sets of three. The digraph is {}{}.\n", t.cyclic_triads, triples,
                       t.transitive ? "transitive" : "not transitive", t.acyclic ? " and has no cycle" : "");

    out += fmt::format("\nCycles of up to {} options, strongest first: ", t.settings.max_cycle_length);
    if (t.cycles.empty()) {
        out += t.cap_hit ? "none listed (the cap is 0).\n" : "none.\n";
    } else {
        out += fmt::format("{} listed{}.\n", t.cycles.size(),
                           t.cap_hit ? fmt::format(", and the cap of {} cut the list: more exist", t.settings.cycle_cap) : "");
        for (std::size_t k = 0; k < t.cycles.size() && k < shown_cycles; ++k)
            out += fmt::format("  {}. {}.\n", k + 1, cycle_sentence(t, t.cycles[k]));
        if (t.cycles.size() > shown_cycles)
            out += fmt::format("  ... {} more in --json.\n", t.cycles.size() - shown_cycles);
    }
    if (t.strongest_cycle)
        out += fmt::format("Strongest cycle of any length: {}, strength {}.\n", arrow_form(t, *t.strongest_cycle),
                           points(t.strongest_cycle->strength));
    else
        out += "Strongest cycle of any length: none; the digraph has no cycle.\n";
    if (!t.acyclic) {
        out += "Strongest cycle through each option:\n";
        std::size_t wide_name = 0, wide_cycle = 0;
        for (std::size_t i = 0; i < n; ++i) {
            wide_name = std::max(wide_name, t.name(i).size());
            if (t.strongest_through[i]) wide_cycle = std::max(wide_cycle, arrow_form(t, *t.strongest_through[i]).size());
        }
        for (std::size_t i = 0; i < n; ++i) {
            const auto& c = t.strongest_through[i];
            std::string line = fmt::format("  {:<{}}  {:<{}}  {}", t.name(i), wide_name,
                                           c ? arrow_form(t, *c) : std::string("on no cycle"), wide_cycle,
                                           c ? "strength " + points(c->strength) : std::string(""));
            while (!line.empty() && line.back() == ' ') line.pop_back();
            out += line + "\n";
        }
    }

    out += "\nCounters (you choose first, I answer with the option that beats yours by the most):\n";
    for (std::size_t j = 0; j < n; ++j) out += "  " + counter_sentence(t, j) + "\n";
    std::vector<std::string> unbeatable;
    for (std::size_t j = 0; j < n; ++j)
        if (!t.counters[j].counter) unbeatable.push_back(t.name(j));
    out += unbeatable.empty() ? "Every option has a counter: whoever chooses second can always win on average.\n"
                              : fmt::format("No counter for {}.\n", and_list(unbeatable));

    out += "\nEquilibrium mix (both choose at random, payoff = margin):\n";
    std::vector<std::vector<std::string>> mix;
    for (std::size_t i = 0; i < n; ++i)
        mix.push_back({"  " + t.name(i), percent(t.equilibrium.weight[i]), signed_points(t.equilibrium.guaranteed[i])});
    std::string tab = table({"  option", "weight", "mix against it (points)"}, mix);
    out += tab;
    // The worst expected margin is 0 up to rounding when the game is symmetric: fixed notation, no "-6.94e-16".
    out += fmt::format("Support: {}. The mix loses to no pure option: its worst expected margin is {} points.\n",
                       and_list(names_of(t, t.equilibrium.support)),
                       signed_points(*std::min_element(t.equilibrium.guaranteed.begin(), t.equilibrium.guaranteed.end())));
    if (!t.matrix.bounds_proven)
        out += "\nWarning: some error bounds are estimates, not proven; arcs near their bound may be wrong.\n";
    return out;
}

nlohmann::json tournament_json(const Tournament& t, const TournamentSource& src) {
    const std::size_t n = t.size();
    nlohmann::json j = document("tournament", 1);
    if (src.board) {
        j["board"] = board_json(*src.board, src.order);
        if (any_head_start(src.starts)) {
            std::vector<std::string> names;
            for (const Option& o : src.options) names.push_back(o.name);
            j["board"]["head_starts"] = head_starts_json(names, src.starts);
        }
        nlohmann::json specs = nlohmann::json::array();
        for (const Option& o : src.options) specs.push_back({{"name", o.name}, {"spec", o.spec}});
        j["option_specs"] = specs;
    } else {
        j["matrix_file"] = {{"path", src.matrix_file}, {"tolerance", src.tolerance}};
    }
    j["options"] = t.matrix.names;
    j["wins"] = matrix_json(t, t.matrix.win, true);
    j["ties"] = matrix_json(t, t.matrix.tie, true);
    j["neither"] = matrix_json(t, t.matrix.neither, true);
    j["margins"] = matrix_json(t, t.margin, false);
    nlohmann::json bounds = nlohmann::json::array();
    for (std::size_t a = 0; a < n; ++a) {
        nlohmann::json r = nlohmann::json::array();
        for (std::size_t b = 0; b < n; ++b)
            r.push_back(a == b ? 0.0 : std::max(t.matrix.bound[a * n + b], t.matrix.bound[b * n + a]));
        bounds.push_back(r);
    }
    j["error_bounds"] = bounds;
    j["bounds_proven"] = t.matrix.bounds_proven;
    nlohmann::json arcs = nlohmann::json::array();
    for (const Arc& a : t.arcs)
        arcs.push_back({{"from", t.name(a.from)}, {"to", t.name(a.to)}, {"margin", a.margin}, {"error_bound", a.bound}});
    j["arcs"] = arcs;
    nlohmann::json und = nlohmann::json::array();
    for (auto [a, b] : t.undecided) und.push_back({t.name(a), t.name(b)});
    j["undecided"] = und;
    nlohmann::json cop = nlohmann::json::object();
    for (std::size_t i = 0; i < n; ++i) cop[t.name(i)] = t.copeland[i];
    j["copeland"] = cop;
    j["condorcet_winner"] = t.condorcet_winner ? nlohmann::json(t.name(*t.condorcet_winner)) : nlohmann::json(nullptr);
    j["condorcet_loser"] = t.condorcet_loser ? nlohmann::json(t.name(*t.condorcet_loser)) : nlohmann::json(nullptr);
    nlohmann::json comps = nlohmann::json::array();
    for (const auto& c : t.components) comps.push_back(names_of(t, c));
    j["components"] = comps;
    j["top_cycle"] = names_of(t, t.top_cycle);
    j["cyclic_triads"] = t.cyclic_triads;
    j["transitive"] = t.transitive;
    j["acyclic"] = t.acyclic;
    nlohmann::json cycles = nlohmann::json::array();
    for (const Cycle& c : t.cycles) cycles.push_back(cycle_json(t, c));
    j["cycles"] = cycles;
    j["cycle_search"] = {{"max_length", t.settings.max_cycle_length},
                         {"cap", t.settings.cycle_cap},
                         {"cap_hit", t.cap_hit},
                         {"listed", t.cycles.size()}};
    j["strongest_cycle"] = t.strongest_cycle ? cycle_json(t, *t.strongest_cycle) : nlohmann::json(nullptr);
    nlohmann::json through = nlohmann::json::object();
    for (std::size_t i = 0; i < n; ++i)
        through[t.name(i)] = t.strongest_through[i] ? cycle_json(t, *t.strongest_through[i]) : nlohmann::json(nullptr);
    j["strongest_cycle_through"] = through;
    nlohmann::json counters = nlohmann::json::object();
    for (std::size_t i = 0; i < n; ++i) {
        const Counter& c = t.counters[i];
        counters[t.name(i)] = {{"counter", c.counter ? nlohmann::json(t.name(*c.counter)) : nlohmann::json(nullptr)},
                               {"margin", c.counter ? nlohmann::json(c.margin) : nlohmann::json(nullptr)}};
    }
    j["counters"] = counters;
    nlohmann::json eq = nlohmann::json::object(), guaranteed = nlohmann::json::object();
    for (std::size_t i = 0; i < n; ++i) {
        eq[t.name(i)] = t.equilibrium.weight[i];
        guaranteed[t.name(i)] = t.equilibrium.guaranteed[i];
    }
    j["equilibrium"] = eq;
    j["equilibrium_support"] = names_of(t, t.equilibrium.support);
    j["equilibrium_value"] = t.equilibrium.value;
    j["equilibrium_guaranteed"] = guaranteed;
    return j;
}

std::string tournament_markdown(const Tournament& t, const TournamentSource& src) {
    const std::size_t n = t.size();
    std::string h = heading(t, src);
    std::string out = md_escape(h.substr(0, h.find('\n'))) + "\n\n";
    out += "| P(row wins) |";
    for (std::size_t j = 0; j < n; ++j) out += " " + md_escape(t.name(j)) + " |";
    out += "\n|---|";
    for (std::size_t j = 0; j < n; ++j) out += "---:|";
    out += "\n";
    for (std::size_t i = 0; i < n; ++i) {
        out += "| " + md_escape(t.name(i)) + " |";
        for (std::size_t j = 0; j < n; ++j) out += " " + cell_percent(t, t.matrix.win, i, j) + " |";
        out += "\n";
    }
    out += "\n**Arcs** (A beats B by more than the error bound):\n\n";
    if (t.arcs.empty()) out += "- none\n";
    for (const Arc& a : t.arcs)
        out += fmt::format("- {} → {} by {}\n", md_escape(t.name(a.from)), md_escape(t.name(a.to)), points(a.margin));
    out += fmt::format("\n**Condorcet winner:** {}. **Top cycle:** {}.\n",
                       t.condorcet_winner ? md_escape(t.name(*t.condorcet_winner)) : std::string("none"),
                       md_escape(and_list(names_of(t, t.top_cycle))));
    out += fmt::format("\n**Cycles** of up to {} options, strongest first{}:\n\n", t.settings.max_cycle_length,
                       t.cap_hit ? fmt::format(" (the cap of {} cut the list)", t.settings.cycle_cap) : "");
    if (t.cycles.empty()) out += "- none\n";
    for (std::size_t k = 0; k < t.cycles.size() && k < shown_cycles; ++k)
        out += "- " + md_escape(cycle_sentence(t, t.cycles[k])) + ".\n";
    if (t.cycles.size() > shown_cycles) out += fmt::format("- ... {} more\n", t.cycles.size() - shown_cycles);
    out += "\n| option | Copeland | counter | counter's margin | equilibrium weight |\n|---|---:|---|---:|---:|\n";
    for (std::size_t i = 0; i < n; ++i) {
        const Counter& c = t.counters[i];
        out += fmt::format("| {} | {} | {} | {} | {} |\n", md_escape(t.name(i)), score(t.copeland[i]),
                           c.counter ? md_escape(t.name(*c.counter)) : std::string("none"),
                           c.counter ? points(c.margin) : std::string("-"), percent(t.equilibrium.weight[i]));
    }
    return out;
}

std::string tournament_latex(const Tournament& t, const TournamentSource& src) {
    const std::size_t n = t.size();
    std::string h = heading(t, src);
    std::string out = "% " + h.substr(0, h.find('\n')) + "\n% needs \\usepackage{booktabs}\n";
    out += "\\begin{tabular}{l" + std::string(n, 'r') + "}\n\\toprule\n";
    out += "$P(\\text{row wins})$";
    for (std::size_t j = 0; j < n; ++j) out += " & " + latex_escape(t.name(j));
    out += " \\\\\n\\midrule\n";
    auto pct = [](double p) { return fmt::format("{:.4f}\\%", 100 * p); };
    for (std::size_t i = 0; i < n; ++i) {
        out += latex_escape(t.name(i));
        for (std::size_t j = 0; j < n; ++j) out += " & " + (i == j ? std::string("--") : pct(t.matrix.win[i * n + j]));
        out += " \\\\\n";
    }
    out += "\\bottomrule\n\\end{tabular}\n\n";
    out += "\\begin{tabular}{lrlrr}\n\\toprule\n";
    out += "option & Copeland & counter & margin (points) & equilibrium weight \\\\\n\\midrule\n";
    for (std::size_t i = 0; i < n; ++i) {
        const Counter& c = t.counters[i];
        out += fmt::format("{} & {} & {} & {} & {} \\\\\n", latex_escape(t.name(i)), score(t.copeland[i]),
                           c.counter ? latex_escape(t.name(*c.counter)) : std::string("none"),
                           c.counter ? fmt::format("{:.4f}", 100 * c.margin) : std::string("--"),
                           pct(t.equilibrium.weight[i]));
    }
    out += "\\bottomrule\n\\end{tabular}\n";
    return out;
}

std::string tournament_csv(const Tournament& t) {
    const std::size_t n = t.size();
    std::string out = "option";
    for (std::size_t j = 0; j < n; ++j) out += "," + csv_cell(t.name(j));
    out += "\n";
    for (std::size_t i = 0; i < n; ++i) {
        out += csv_cell(t.name(i));
        for (std::size_t j = 0; j < n; ++j) out += i == j ? std::string(",-") : fmt::format(",{:.17g}", t.matrix.win[i * n + j]);
        out += "\n";
    }
    return out;
}

std::string tournament_dot(const Tournament& t, const TournamentSource& src) {
    std::string h = heading(t, src);
    std::string out = "// " + h.substr(0, h.find('\n')) + "\n";
    out += "// an arc A -> B when A beats B (label: margin in points); dashed: undecided; double ring: top cycle\n";
    out += "digraph tournament {\n  node [shape=ellipse];\n";
    std::vector<char> top(t.size(), 0);
    for (std::size_t i : t.top_cycle) top[i] = 1;
    for (std::size_t i = 0; i < t.size(); ++i)
        out += "  " + dot_quote(t.name(i)) + (top[i] ? " [peripheries=2]" : "") + ";\n";
    for (const Arc& a : t.arcs)
        out += fmt::format("  {} -> {} [label=\"{:.4f}\"];\n", dot_quote(t.name(a.from)), dot_quote(t.name(a.to)),
                           100 * a.margin);
    for (auto [a, b] : t.undecided)
        out += fmt::format("  {} -> {} [dir=none, style=dashed];\n", dot_quote(t.name(a)), dot_quote(t.name(b)));
    out += "}\n";
    return out;
}

}  // namespace overshoot::render
