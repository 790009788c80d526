#include "render/report.hpp"

#include <fmt/format.h>

#include <cmath>

#include "render/figures.hpp"
#include "render/search.hpp"
#include "render/format.hpp"
#include "render/several_pieces.hpp"
#include "render/document.hpp"
#include "render/svg.hpp"

namespace overshoot::render {

namespace {

using svg::escape;

// Our own look: warm paper, slate ink, one accent (the highlight colour of the figures).
constexpr const char* css = R"(
:root { color-scheme: light; }
body { margin: 0; background: #f3f1ea; color: #22262b;
       font: 15px/1.5 'DejaVu Sans', 'Liberation Sans', Arial, sans-serif; }
main { max-width: 820px; margin: 0 auto; padding: 24px 28px 48px; background: #fbfaf6;
       border-left: 1px solid #e2dfd5; border-right: 1px solid #e2dfd5; }
h1 { font-size: 26px; margin: 8px 0 4px; letter-spacing: 0.01em; }
h2 { font-size: 18px; margin: 32px 0 8px; padding-bottom: 4px; border-bottom: 2px solid #d55e00; }
p.lead { color: #4b5058; margin-top: 0; }
.rules { background: #ffffff; border: 1px solid #e2dfd5; border-left: 5px solid #0072b2;
         padding: 10px 16px; border-radius: 4px; }
.rules dt { font-weight: bold; float: left; width: 9em; clear: left; }
.rules dd { margin: 0 0 2px 9.5em; }
table { border-collapse: collapse; margin: 8px 0 4px; font-size: 14px; }
th, td { padding: 4px 10px; border-bottom: 1px solid #e2dfd5; text-align: right; }
th:first-child, td:first-child { text-align: left; }
thead th { background: #efece3; }
td.win { background: #dcebf5; }
td.lose { background: #fbe3d6; }
td.self { color: #9a9ea5; }
figure { margin: 12px 0; }
figure svg { max-width: 100%; height: auto; }
figcaption { font-size: 13px; color: #4b5058; }
code { font-family: 'DejaVu Sans Mono', monospace; font-size: 13px; }
.note { font-size: 13px; color: #4b5058; }
footer { margin-top: 40px; font-size: 12px; color: #6b7078; }
)";

std::string pct(long double p) { return percent(static_cast<double>(p)); }

std::string cell(const std::string& s, const char* cls = nullptr) {
    return cls ? fmt::format("<td class=\"{}\">{}</td>", cls, escape(s)) : "<td>" + escape(s) + "</td>";
}

std::string names_of(const std::vector<Option>& opts, const std::vector<std::size_t>& idx, const char* sep) {
    std::string out;
    for (std::size_t k = 0; k < idx.size(); ++k) out += (k ? sep : "") + opts[idx[k]].name;
    return out;
}

std::string turns(double v) { return std::isfinite(v) ? fmt::format("{:.2f}", v) : "-"; }

void rules_section(std::string& h, const ReportInput& in) {
    const Board& b = *in.board;
    std::string jumps = "none";
    if (!b.jumps.empty()) {
        jumps.clear();
        for (const Jump& j : b.jumps) jumps += (jumps.empty() ? "" : ", ") + fmt::format("{} \u2192 {}", j.from, j.to);
    }
    const char* rule_text = b.rule == Overshoot::stay ? "a move past the finish is not made; the turn is lost"
                            : b.rule == Overshoot::bounce ? "a move past the finish walks the excess back from it"
                                                          : "any move reaching or passing the finish finishes";
    h += "<section id=\"rules\"><h2>Rules</h2><dl class=\"rules\">\n";
    h += fmt::format("<dt>Board</dt><dd>{} to walk; every piece starts on square 0</dd>\n", plural(b.length, "square"));
    h += fmt::format("<dt>Overshoot</dt><dd><code>{}</code>: {}</dd>\n", to_string(b.rule), rule_text);
    h += fmt::format("<dt>Jumps</dt><dd>{}</dd>\n", escape(jumps));
    h += fmt::format("<dt>Turn order</dt><dd><code>{}</code></dd>\n", to_string(in.order));
    h += "<dt>Options</dt><dd>";
    for (std::size_t i = 0; i < in.options->size(); ++i) {
        const Option& o = (*in.options)[i];
        h += (i ? ", " : "") + escape(o.name) + (o.name != o.spec ? " (<code>" + escape(o.spec) + "</code>)" : "");
    }
    h += "</dd>\n";
    h += fmt::format("<dt>Source</dt><dd>{}</dd>\n", escape(in.source));
    h += "</dl>\n<p class=\"note\">A beats B when P(A wins) &minus; P(B wins), the margin, exceeds its proven error "
         "bound; a pair whose margin is within its bound is undecided. Margins are in percentage points (one point "
         "is a difference of 0.01 in probability).</p></section>\n";
}

void profiles_section(std::string& h, const ReportInput& in) {
    const auto& opts = *in.options;
    h += "<section id=\"profiles\"><h2>Profiles</h2>\n<table><thead><tr><th>option</th><th>P(finish)</th>"
         "<th>mean turns (finishers)</th><th>sd (finishers)</th><th>median (all races)</th><th>stuck squares</th></tr>"
         "</thead><tbody>\n";
    for (std::size_t i = 0; i < opts.size() && i < in.profiles.size(); ++i) {
        const Profile& p = in.profiles[i];
        std::string median = "-";
        for (const auto& q : p.quantiles)
            if (q.q == 0.5 && q.turns) median = fmt::format("{}", *q.turns);
        std::string stuck;
        for (std::size_t k = 0; k < p.stuck_squares.size() && k < 12; ++k)
            stuck += (k ? ", " : "") + fmt::format("{}", p.stuck_squares[k]);
        if (p.stuck_squares.size() > 12) stuck += fmt::format(", ... ({} in all)", p.stuck_squares.size());
        if (stuck.empty()) stuck = "none";
        h += "<tr>" + cell(opts[i].name) + cell(finish_chance(p.p_finish)) + cell(turns(p.mean_turns_given_finish)) +
             cell(turns(p.sd_turns_given_finish)) + cell(median) + cell(stuck) + "</tr>\n";
    }
    h += "</tbody></table><p class=\"note\">Means and deviations count only the races that finish; the median "
         "counts every race, one that never finishes as infinitely long, so it is shown when the piece finishes with "
         "chance at least one half. 100% (certain): no stuck square can be reached.</p>\n";
    if (!in.distributions.empty()) {
        std::vector<std::string> names;
        for (const auto& o : opts) names.push_back(o.name);
        h += "<figure>" + distribution_figure(names, in.distributions).str() +
             "<figcaption>Chance of finishing on each turn, and beside it the chance of never finishing.</figcaption>"
             "</figure>\n";
    }
    h += "</section>\n";
}

void tournament_sections(std::string& h, const ReportInput& in) {
    const Tournament& t = *in.tournament;
    const std::size_t n = t.size();
    h += "<section id=\"matrix\"><h2>Win matrix</h2>\n<p class=\"note\">P(row wins against column). Blue: the row "
         "beats the column; orange: the column beats the row.</p>\n<table><thead><tr><th></th>";
    for (std::size_t j = 0; j < n; ++j) h += "<th>" + escape(t.name(j)) + "</th>";
    h += "</tr></thead><tbody>\n";
    for (std::size_t i = 0; i < n; ++i) {
        h += "<tr><th>" + escape(t.name(i)) + "</th>";
        for (std::size_t j = 0; j < n; ++j) {
            if (i == j) {
                h += cell("-", "self");
                continue;
            }
            const char* cls = t.beats[i * n + j] ? "win" : t.beats[j * n + i] ? "lose" : nullptr;
            h += cell(percent(t.matrix.win[i * n + j]), cls);
        }
        h += "</tr>\n";
    }
    h += "</tbody></table></section>\n";

    h += "<section id=\"digraph\"><h2>Dominance digraph</h2>\n<figure>" + digraph_figure(t).str() +
         "<figcaption>An arc A &rarr; B when A beats B; the strongest cycle is drawn in vermillion.</figcaption>"
         "</figure>\n";
    h += fmt::format("<p>Condorcet winner: <b>{}</b>. Top cycle: {}.</p>\n",
                     t.condorcet_winner ? escape(t.name(*t.condorcet_winner)) : "none",
                     t.top_cycle.empty() ? "empty" : escape(names_of(*in.options, t.top_cycle, ", ")));
    h += "</section>\n";

    h += "<section id=\"cycles\"><h2>Cycles</h2>\n";
    if (t.cycles.empty()) {
        h += "<p>No cycle: the options are ordered without an intransitive set.</p>\n";
    } else {
        h += "<table><thead><tr><th>cycle (each beats the next, the last beats the first)</th><th>strength</th>"
             "</tr></thead><tbody>\n";
        for (std::size_t k = 0; k < t.cycles.size() && k < 20; ++k)
            h += "<tr>" + cell(names_of(*in.options, t.cycles[k].options, " \u2192 ")) +
                 cell(points(t.cycles[k].strength)) + "</tr>\n";
        h += "</tbody></table>\n";
        if (t.cycles.size() > 20)
            h += fmt::format("<p class=\"note\">{} more cycles in <code>overshoot tournament --json</code>.</p>\n",
                             t.cycles.size() - 20);
        if (t.cap_hit) h += "<p class=\"note\">The cycle cap cut the list.</p>\n";
    }
    h += "</section>\n";

    h += "<section id=\"counters\"><h2>Counters</h2>\n<p class=\"note\">For an option chosen first, the option "
         "that beats it by the largest margin.</p>\n<table><thead><tr><th>chosen first</th><th>counter</th>"
         "<th>margin (points)</th></tr></thead><tbody>\n";
    for (std::size_t i = 0; i < n; ++i) {
        const Counter& c = t.counters[i];
        h += "<tr>" + cell(t.name(i)) + cell(c.counter ? t.name(*c.counter) : "none (nothing beats it)") +
             cell(c.counter ? points(c.margin) : "-") + "</tr>\n";
    }
    h += "</tbody></table></section>\n";

    h += "<section id=\"equilibrium\"><h2>Equilibrium mix</h2>\n<p class=\"note\">One optimal mixed choice of the "
         "game &ldquo;both pick an option, payoff = margin&rdquo;.</p>\n<table><thead><tr><th>option</th>"
         "<th>weight</th></tr></thead><tbody>\n";
    for (std::size_t i = 0; i < n && i < t.equilibrium.weight.size(); ++i)
        h += "<tr>" + cell(t.name(i)) + cell(percent(t.equilibrium.weight[i])) + "</tr>\n";
    h += "</tbody></table></section>\n";
}

void sweep_section(std::string& h, const ReportInput& in) {
    const SweepResult& r = *in.sweep;
    h += fmt::format("<section id=\"sweep\"><h2>Sweep over lengths {} to {}</h2>\n", r.grid.lo, r.grid.hi);
    for (std::size_t v = 0; v < r.variants.size(); ++v) {
        const VariantSweep& vs = r.variants[v];
        h += "<figure>" + sweep_figure(r, v).str() + "<figcaption>Margin of each pair against the board length; "
             "circles mark crossovers, shaded bands the lengths where a cycle holds.</figcaption></figure>\n";
        std::string runs;
        for (std::size_t k = 0; k < vs.no_dominant.size() && k < 12; ++k)
            runs += (k ? ", " : "") + (vs.no_dominant[k].first == vs.no_dominant[k].second
                                           ? fmt::format("{}", vs.no_dominant[k].first)
                                           : fmt::format("{}..{}", vs.no_dominant[k].first, vs.no_dominant[k].second));
        if (vs.no_dominant.size() > 12) runs += ", ...";
        h += fmt::format("<p>Lengths with no Condorcet winner: {}.</p>\n", runs.empty() ? "none" : escape(runs));
    }
    h += "</section>\n";
}

void race_sections(std::string& h, const ReportInput& in) {
    const auto& opts = *in.options;
    std::vector<std::string> raw;
    for (const auto& o : opts) raw.push_back(o.name);
    const std::vector<std::string> names = unique_names(raw);
    const std::string order = std::string(to_string(in.race_order));
    if (in.race) {
        const RaceResult& r = *in.race;
        h += fmt::format("<section id=\"race\"><h2>Race of {} pieces</h2>\n<p class=\"note\">One piece per option, "
                         "all from square 0, <code>{}</code> order; each probability within {} (proven).</p>\n",
                         r.pieces, order, escape(fmt::format("{:.3g}", static_cast<double>(r.bound))));
        h += "<table><thead><tr><th>piece</th><th>finishes first alone</th><th>among shared first finishers</th>"
             "</tr></thead><tbody>\n";
        for (int i = 0; i < r.pieces; ++i)
            h += "<tr>" + cell(names[i]) + cell(pct(r.p_wins[i])) + cell(pct(r.p_shares[i])) + "</tr>\n";
        h += "</tbody></table>\n" + fmt::format("<p>Shared first finish: {}. Nobody ever finishes: {}.</p>\n",
                                               pct(r.p_tie), pct(r.p_neither));
        h += "</section>\n";
    }
    if (in.choice) {
        const ChoiceResult& c = *in.choice;
        h += fmt::format("<section id=\"choice\"><h2>Choice game of {} players</h2>\n<p class=\"note\">Players pick "
                         "in turn, each seeing earlier picks, each maximising their chance to finish first alone{}; "
                         "<code>{}</code> order.</p>\n",
                         c.players, c.distinct ? ", no option picked twice" : "", order);
        h += "<table><thead><tr><th>player</th><th>best pick</th><th>chance to finish first alone</th></tr>"
             "</thead><tbody>\n";
        for (std::size_t p = 0; p < c.equilibrium.picks.size(); ++p)
            h += "<tr>" + cell(fmt::format("{}", p + 1)) + cell(opts[c.equilibrium.picks[p]].name) +
                 cell(pct(c.equilibrium.chances[p])) + "</tr>\n";
        h += "</tbody></table>\n";
        h += fmt::format("<p>The last to choose does at least as well as the first on the best-play path: <b>{}</b>; "
                         "after every possible sequence of earlier picks: <b>{}</b>.</p>\n",
                         c.last_at_least_first_on_path ? "yes" : "no", c.last_always_at_least_first ? "yes" : "no");
        h += "<p class=\"note\">Where a choice game is played for stakes, the player choosing later can hold an "
             "edge; money bets on it are gambling and subject to local law.</p>\n</section>\n";
    }
    if (in.head_starts || in.fair_lengths) {
        h += "<section id=\"balance\"><h2>Balance</h2>\n<p class=\"note\">Fairness is the largest deviation of a "
             "piece&rsquo;s chance to finish first alone from the mean chance; smaller is fairer.</p>\n";
        if (const HeadStartResult* hs = in.head_starts) {
            h += fmt::format("<h3>Head starts on squares {} to {}</h3>\n<table><thead><tr><th>rank</th>", hs->lo, hs->hi);
            for (const auto& nm : names) h += "<th>start of " + escape(nm) + "</th>";
            h += "<th>largest deviation</th></tr></thead><tbody>\n";
            auto row = [&](const std::string& label, const StartAssignment& s) {
                h += "<tr>" + cell(label);
                for (int st : s.starts) h += cell(fmt::format("{}", st));
                h += cell(pct(s.deviation)) + "</tr>\n";
            };
            for (std::size_t k = 0; k < hs->best.size(); ++k) row(fmt::format("{}", k + 1), hs->best[k]);
            row("all on 0", hs->from_zero);
            h += "</tbody></table>\n";
            if (!hs->best.empty()) {
                h += "<p>Fairest assignment, chances to finish first alone: ";
                const RaceResult& r = hs->best.front().race;
                for (int i = 0; i < r.pieces; ++i)
                    h += (i ? ", " : "") + escape(names[i]) + " " + pct(r.p_wins[i]);
                h += ".</p>\n";
            }
        }
        if (const LengthsResult* ls = in.fair_lengths) {
            h += "<h3>Fairest lengths</h3>\n<table><thead><tr><th>length</th>";
            for (const auto& nm : names) h += "<th>" + escape(nm) + "</th>";
            h += "<th>largest deviation</th></tr></thead><tbody>\n";
            for (int k : ls->fairest) {
                const LengthFairness& f = ls->lengths[k];
                h += "<tr>" + cell(fmt::format("{}", f.length));
                for (int i = 0; i < f.race.pieces; ++i) h += cell(pct(f.race.p_wins[i]));
                h += cell(pct(f.deviation)) + "</tr>\n";
            }
            h += "</tbody></table>\n";
        }
        h += "</section>\n";
    }
}

}  // namespace

std::string report_html(const ReportInput& in) {
    std::string names;
    for (std::size_t i = 0; i < in.options->size(); ++i) names += (i ? ", " : "") + (*in.options)[i].name;
    const std::string title = fmt::format("overshoot report: {} on {}", names, plural(in.board->length, "square"));
    std::string h;
    h += "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n";
    h += "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n";
    h += "<meta name=\"generator\" content=\"overshoot " + escape(version) + "\">\n";
    h += "<title>" + escape(title) + "</title>\n<style>" + css + "</style>\n</head>\n<body>\n<main>\n";
    h += "<h1>" + escape(title) + "</h1>\n";
    h += "<p class=\"lead\">Exact analysis of a race where the finish must be hit exactly: " +
         escape(describe(*in.board, in.order)) + ".</p>\n";
    rules_section(h, in);
    profiles_section(h, in);
    if (in.tournament) tournament_sections(h, in);
    if (in.sweep) sweep_section(h, in);
    race_sections(h, in);
    if (in.policy) h += policy_section_html(*in.policy);
    if (in.search) h += search_section_html(*in.search, *in.search_spec);
    h += "<footer>Written by overshoot " + escape(version) +
         ". Every probability carries a proven error bound; see docs/method.md.</footer>\n";
    h += "</main>\n</body>\n</html>\n";
    return h;
}

}  // namespace overshoot::render
