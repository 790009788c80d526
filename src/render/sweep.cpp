#include "render/sweep.hpp"

#include <fmt/format.h>

#include <cmath>

#include "render/format.hpp"
#include "race/outcome.hpp"
#include "render/document.hpp"
#include "render/tournament.hpp"
#include "sweep/stretches.hpp"

namespace overshoot::render {

namespace {

using nlohmann::json;

std::string runs_text(const std::vector<std::pair<int, int>>& runs) {
    std::string out;
    for (std::size_t i = 0; i < runs.size(); ++i) {
        if (i > 0) out += ", ";
        out += runs[i].first == runs[i].second ? fmt::format("{}", runs[i].first)
                                               : fmt::format("{}..{}", runs[i].first, runs[i].second);
    }
    return out.empty() ? "none" : out;
}

json runs_json(const std::vector<std::pair<int, int>>& runs) {
    json a = json::array();
    for (auto [lo, hi] : runs) a.push_back({lo, hi});
    return a;
}

json names_json(const std::vector<Option>& opts, const std::vector<std::size_t>& idx) {
    json a = json::array();
    for (std::size_t i : idx) a.push_back(opts[i].name);
    return a;
}

std::string cycle_text(const std::vector<Option>& opts, const std::vector<std::size_t>& idx) {
    std::string s;
    for (std::size_t i : idx) s += opts[i].name + " > ";
    return s + opts[idx.front()].name;
}

std::string variant_text(const Variant& v) {
    return fmt::format("overshoot {}, {} turns", to_string(v.rule), to_string(v.order));
}

std::string grid_text(const LengthGrid& g) {
    return g.step == 1 ? fmt::format("lengths {}..{}", g.lo, g.hi)
                       : fmt::format("lengths {}..{} step {}", g.lo, g.hi, g.step);
}

std::string jumps_text(const std::vector<Jump>& jumps, JumpAnchor anchor, const LengthGrid& grid) {
    if (jumps.empty()) return "no jumps";
    std::string s = "jumps";
    for (const Jump& j : jumps) s += fmt::format(" {}:{}", j.from, j.to);
    s += anchor == JumpAnchor::start ? " (anchored to the start)"
                                     : fmt::format(" (anchored to the finish of length {})", grid.lengths().back());
    return s;
}

// points() without its unit, for the first number of a range.
std::string bare_points(double margin) {
    std::string s = points(margin);
    return s.substr(0, s.size() - std::string(" points").size());
}

// The option a stretch prefers, or "undecided" (escape it for a table's language).
std::string preferred_name(const SweepResult& r, const PairSweep& p, const Stretch& st) {
    return st.verdict > 0 ? r.options[p.a].name : st.verdict < 0 ? r.options[p.b].name : "undecided";
}

// "1d6 at 10..115 (0.1678 to 28.3000 points); 2d6 at 116..200 (...)": who is
// preferred over which lengths and by how much, also when nothing changes.
std::string stretches_text(const SweepResult& r, const PairSweep& p, const std::vector<int>& lengths) {
    std::string out;
    for (const Stretch& st : preference_stretches(p, lengths)) {
        const std::string where = st.first == st.last ? fmt::format("{}", st.first) : fmt::format("{}..{}", st.first, st.last);
        const std::string who = preferred_name(r, p, st);
        const std::string by = st.least == st.most ? points(st.least)
                                                   : fmt::format("{} to {}", bare_points(st.least), points(st.most));
        out += fmt::format("{}{} at {} ({}{})", out.empty() ? "" : "; ", who, where, st.verdict == 0 ? "margins " : "by ",
                           by);
    }
    return out;
}

}  // namespace

namespace {

// The method that gave one length: a zone-tail pair takes the series below its first length.
LengthMethod length_method(const PairSweep& p, int length) {
    return p.method == LengthMethod::zone_tail && length < p.tail_from ? LengthMethod::series : p.method;
}

std::string method_text(const PairSweep& p) {
    if (p.method != LengthMethod::zone_tail) return std::string(to_string(p.method));
    return p.tail_from > 1 ? fmt::format("series to {}, zone tail from {}", p.tail_from - 1, p.tail_from)
                           : std::string("zone tail");
}

}  // namespace

std::string sweep_text(const SweepResult& r) {
    std::string out = fmt::format("sweep of {} options over {}, {}\n", r.options.size(), grid_text(r.grid), jumps_text(r.jumps, r.anchor, r.grid));
    for (const auto& vs : r.variants) {
        out += fmt::format("\n{}\n", variant_text(vs.variant));
        std::string methods;
        for (const auto& p : vs.pairs)
            methods += fmt::format("{}{} vs {}: {}", methods.empty() ? "" : "; ", r.options[p.a].name,
                                   r.options[p.b].name, method_text(p));
        out += fmt::format("  method: {}\n", methods);
        out += "  preferred, by margin (smallest to largest):\n";
        for (const auto& p : vs.pairs)
            out += fmt::format("    {} vs {}: {}\n", r.options[p.a].name, r.options[p.b].name,
                               stretches_text(r, p, vs.lengths));
        if (vs.crossovers.empty()) {
            out += "  crossovers: none\n";
        } else {
            out += "  crossovers:\n";
            for (const auto& c : vs.crossovers) {
                const std::string where =
                    c.length() ? fmt::format("at {}", *c.length())
                               : fmt::format("between {} and {}", c.before + 1, c.after);
                out += fmt::format("    {} vs {}: {} (preferred {} up to {}, margin {}; {} from {}, margin {})",
                                   r.options[c.a].name, r.options[c.b].name, where,
                                   r.options[c.preferred_before].name, c.before, points(std::fabs(c.margin_before)),
                                   r.options[c.preferred_after].name, c.after, points(std::fabs(c.margin_after)));
                if (!c.undecided.empty()) {
                    std::string u;
                    for (int l : c.undecided) u += fmt::format("{}{}", u.empty() ? "" : ", ", l);
                    out += fmt::format("; undecided at {}", u);
                }
                out += "\n";
            }
        }
        if (vs.cycles.empty()) {
            out += "  cycles: none\n";
        } else {
            out += "  cycles:\n";
            for (const auto& c : vs.cycles)
                out += fmt::format("    {}: lengths {}; strength {} at {}, weakest {}\n", cycle_text(r.options, c.options),
                                   runs_text(c.intervals), points(c.strongest), c.strongest_length,
                                   points(c.weakest));
            if (vs.cycles_cap_hit) out += "    (the cycle cap cut some lists)\n";
        }
        out += fmt::format("  no Condorcet winner at: {}\n", runs_text(vs.no_dominant));
        if (vs.per_length.size() <= 40) {
            out += "  per length:\n";
            for (const auto& s : vs.per_length) {
                std::string w = s.condorcet_winner ? "winner " + r.options[*s.condorcet_winner].name
                                                   : "top cycle {" + [&] {
                                                         std::string t;
                                                         for (std::size_t i : s.top_cycle)
                                                             t += (t.empty() ? "" : ", ") + r.options[i].name;
                                                         return t;
                                                     }() + "}";
                out += fmt::format("    {}: {}, {}, {} undecided, {}\n", s.length, w,
                                   plural(static_cast<long long>(s.arcs.size()), "arc"), s.undecided.size(),
                                   plural(static_cast<long long>(s.cycles.size()), "cycle"));
            }
        }
    }
    const std::string note = sweep_bound_note(r);
    if (!note.empty()) out += "\n" + note + "\n";
    return out;
}

std::string sweep_bound_note(const SweepResult& r) {
    const LargestBound b = largest_bound(r);
    if (!(b.bound > target_bound)) return {};
    const PairSweep& p = r.variants[b.variant].pairs[b.pair];
    return fmt::format("note: the target bound {:g} was not reached everywhere; the largest bound proven is {:.2g} "
                       "({} vs {} at length {}{})",
                       target_bound, b.bound, r.options[p.a].name, r.options[p.b].name, b.length,
                       r.variants.size() > 1 ? ", " + variant_text(r.variants[b.variant].variant) : std::string());
}

json sweep_json(const SweepResult& r) {
    json j = document("sweep", 1);
    json opts = json::array();
    for (const auto& o : r.options) opts.push_back({{"name", o.name}, {"spec", o.spec}});
    j["options"] = opts;
    j["lengths"] = {{"lo", r.grid.lo}, {"hi", r.grid.hi}, {"step", r.grid.step}};
    json jumps = json::array();
    for (const Jump& jp : r.jumps) jumps.push_back({jp.from, jp.to});
    j["jumps"] = jumps;
    j["anchor"] = r.anchor == JumpAnchor::start ? "start" : "finish";
    json variants = json::array(), per = json::array(), cross = json::array(), cycles = json::array(),
         nodom = json::array();
    for (const auto& vs : r.variants) {
        const std::string rule(to_string(vs.variant.rule)), order(to_string(vs.variant.order));
        json methods = json::array();
        for (const auto& p : vs.pairs) {
            json m = {{"a", r.options[p.a].name}, {"b", r.options[p.b].name}, {"method", std::string(to_string(p.method))}};
            if (p.method == LengthMethod::zone_tail) m["zone_tail_from"] = p.tail_from;
            methods.push_back(std::move(m));
        }
        variants.push_back({{"overshoot", rule}, {"order", order}, {"methods", methods},
                            {"no_condorcet_winner", runs_json(vs.no_dominant)},
                            {"cycle_cap_hit", vs.cycles_cap_hit}});
        for (const auto& s : vs.per_length) {
            json arcs = json::array();
            for (const Arc& a : s.arcs)
                arcs.push_back({{"from", r.options[a.from].name}, {"to", r.options[a.to].name}, {"margin", a.margin},
                                {"error_bound", a.bound}});
            json und = json::array();
            for (auto [a, b] : s.undecided) und.push_back({r.options[a].name, r.options[b].name});
            json cyc = json::array();
            for (const Cycle& c : s.cycles) cyc.push_back({{"options", names_json(r.options, c.options)}, {"strength", c.strength}});
            per.push_back({{"overshoot", rule},
                           {"order", order},
                           {"length", s.length},
                           {"arcs", arcs},
                           {"undecided", und},
                           {"condorcet_winner", s.condorcet_winner ? json(r.options[*s.condorcet_winner].name) : json(nullptr)},
                           {"top_cycle", names_json(r.options, s.top_cycle)},
                           {"cycles", cyc}});
        }
        for (const auto& c : vs.crossovers) {
            json und = json::array();
            for (int l : c.undecided) und.push_back(l);
            cross.push_back({{"overshoot", rule},
                             {"order", order},
                             {"a", r.options[c.a].name},
                             {"b", r.options[c.b].name},
                             {"length", c.length() ? json(*c.length()) : json(nullptr)},
                             {"interval", {c.before + 1, c.after}},
                             {"last_before", c.before},
                             {"first_after", c.after},
                             {"undecided_lengths", und},
                             {"preferred_before", r.options[c.preferred_before].name},
                             {"preferred_after", r.options[c.preferred_after].name},
                             {"margin_before", c.margin_before},
                             {"error_bound_before", c.bound_before},
                             {"margin_after", c.margin_after},
                             {"error_bound_after", c.bound_after}});
        }
        for (const auto& c : vs.cycles)
            cycles.push_back({{"overshoot", rule},
                              {"order", order},
                              {"options", names_json(r.options, c.options)},
                              {"lengths", runs_json(c.intervals)},
                              {"weakest_strength", c.weakest},
                              {"strongest_strength", c.strongest},
                              {"strongest_length", c.strongest_length},
                              {"count", c.count}});
    }
    j["variants"] = variants;
    const LargestBound lb = largest_bound(r);
    j["largest_error_bound"] = lb.bound;
    j["target_bound_met"] = !(lb.bound > target_bound);
    j["per_length"] = per;
    j["crossovers"] = cross;
    j["cycles"] = cycles;
    return j;
}

std::string sweep_csv(const SweepResult& r) {
    std::string out = "overshoot,order,length,a,b,p_a_wins,p_b_wins,p_tie,p_neither,margin,error_bound,preferred,method\n";
    for (const auto& vs : r.variants)
        for (std::size_t k = 0; k < vs.lengths.size(); ++k)
            for (const auto& p : vs.pairs) {
                const LengthOutcome& o = p.at[k];
                const double bound = rounded_margin_bound(o.error_bound());
                const int d = decided(o.margin(), bound);
                const std::string pref = d > 0 ? r.options[p.a].name : d < 0 ? r.options[p.b].name : std::string("undecided");
                out += fmt::format("{},{},{},{},{},{},{},{},{},{},{},{},{}\n", to_string(vs.variant.rule),
                                   to_string(vs.variant.order), vs.lengths[k], csv_cell(r.options[p.a].name),
                                   csv_cell(r.options[p.b].name), number(o.p_a_wins), number(o.p_b_wins), number(o.p_tie),
                                   number(o.p_neither), number(o.margin()), number(bound), csv_cell(pref),
                                   to_string(length_method(p, vs.lengths[k])));
            }
    return out;
}

std::string sweep_markdown(const SweepResult& r) {
    std::string out = fmt::format("Sweep of {} over {}, {}.\n", plural(static_cast<long long>(r.options.size()), "option"),
                                  grid_text(r.grid), md_escape(jumps_text(r.jumps, r.anchor, r.grid)));
    for (const auto& vs : r.variants) {
        out += fmt::format("\n### {}\n\n", md_escape(variant_text(vs.variant)));
        out += "| A | B | preferred | lengths | smallest margin (points) | largest margin (points) |\n"
               "|---|---|---|---|---:|---:|\n";
        for (const auto& p : vs.pairs)
            for (const Stretch& st : preference_stretches(p, vs.lengths))
                out += fmt::format("| {} | {} | {} | {}..{} | {} | {} |\n", md_escape(r.options[p.a].name),
                                   md_escape(r.options[p.b].name), md_escape(preferred_name(r, p, st)), st.first, st.last, bare_points(st.least), bare_points(st.most));
        out += "\n**Crossovers:**" + std::string(vs.crossovers.empty() ? " none.\n" : "\n\n");
        for (const auto& c : vs.crossovers)
            out += fmt::format("- {} vs {}: {} preferred up to {}, {} from {}\n", md_escape(r.options[c.a].name),
                               md_escape(r.options[c.b].name), md_escape(r.options[c.preferred_before].name), c.before,
                               md_escape(r.options[c.preferred_after].name), c.after);
        out += "\n**Cycles:**" + std::string(vs.cycles.empty() ? " none.\n" : "\n\n");
        for (const auto& c : vs.cycles)
            out += fmt::format("- {}: lengths {}; strength {} at {}\n", md_escape(cycle_text(r.options, c.options)),
                               runs_text(c.intervals), points(c.strongest), c.strongest_length);
    }
    const std::string note = sweep_bound_note(r);
    if (!note.empty()) out += "\n" + md_escape(note) + "\n";
    return out;
}

std::string sweep_latex(const SweepResult& r) {
    std::string out = fmt::format("% sweep of {} over {}, {}\n% needs \\usepackage{{booktabs}}\n",
                                  plural(static_cast<long long>(r.options.size()), "option"), grid_text(r.grid),
                                  jumps_text(r.jumps, r.anchor, r.grid));
    for (const auto& vs : r.variants) {
        out += fmt::format("\n% {}\n\\begin{{tabular}}{{lllrrr}}\n\\toprule\n", variant_text(vs.variant));
        out += "$A$ & $B$ & preferred & lengths & smallest margin & largest margin \\\\\n\\midrule\n";
        for (const auto& p : vs.pairs)
            for (const Stretch& st : preference_stretches(p, vs.lengths))
                out += fmt::format("{} & {} & {} & {}--{} & {} & {} \\\\\n", latex_escape(r.options[p.a].name),
                                   latex_escape(r.options[p.b].name), latex_escape(preferred_name(r, p, st)), st.first, st.last, bare_points(st.least), bare_points(st.most));
        out += "\\bottomrule\n\\end{tabular}\n% margins in percentage points\n";
    }
    const std::string note = sweep_bound_note(r);
    if (!note.empty()) out += "% " + note + "\n";
    return out;
}

std::string hunt_text(const HuntResult& r, const HuntSpec& spec) {
    std::string out = fmt::format("hunt for {}-cycles among {} options over {}", spec.cycle_length, spec.options.size(),
                                  grid_text(spec.grid));
    for (std::size_t v = 0; v < spec.variants.size(); ++v)
        out += fmt::format("{}{}", v == 0 ? "; " : " | ", variant_text(spec.variants[v]));
    out += "\n";
    if (!spec.jumps.empty()) out += jumps_text(spec.jumps, spec.anchor, spec.grid) + "\n";
    if (spec.merged_options > 0)
        out += fmt::format("{} more option{} of the family equal as distributions to earlier ones merged into them\n",
                           spec.merged_options, spec.merged_options == 1 ? "" : "s");
    if (spec.min_strength > 0) out += fmt::format("minimum strength {}\n", points(spec.min_strength));
    if (spec.required) out += fmt::format("every set contains {}\n", spec.options[*spec.required].name);
    if (!r.complete)
        out += fmt::format("INTERRUPTED: {} of {} pairs known; only cycles whose pairs are all known are listed\n",
                           r.pairs_known, r.pairs_total);
    out += fmt::format("examined {} lengths and {} option sets; {} cycle instances, {} distinct sets\n",
                       r.lengths_examined, r.sets_examined, r.cycles_found, r.distinct);
    if (r.cycles.empty()) {
        out += "no cycle found\n";
        const std::string note = hunt_bound_note(r);
        if (!note.empty()) out += note + "\n";
        return out;
    }
    std::vector<std::vector<std::string>> rows;
    for (std::size_t i = 0; i < r.cycles.size(); ++i) {
        const HuntCycle& c = r.cycles[i];
        std::vector<std::string> row{fmt::format("{}", i + 1), cycle_text(spec.options, c.options),
                                     points(c.strongest), fmt::format("{}", c.strongest_length),
                                     fmt::format("{}", c.count), runs_text(c.intervals)};
        if (spec.variants.size() > 1) row.insert(row.begin() + 1, variant_text(spec.variants[c.variant]));
        rows.push_back(row);
    }
    std::vector<std::string> header{"rank", "cycle", "strength", "at length", "lengths held", "where"};
    if (spec.variants.size() > 1) header.insert(header.begin() + 1, "rules");
    out += table(header, rows);
    if (r.distinct > r.cycles.size()) out += fmt::format("({} more sets not listed)\n", r.distinct - r.cycles.size());
    const std::string note = hunt_bound_note(r);
    if (!note.empty()) out += note + "\n";
    return out;
}

std::string hunt_bound_note(const HuntResult& r) {
    if (!(r.largest_bound > target_bound)) return {};
    return fmt::format("note: the target bound {:g} was not reached everywhere; the largest bound proven is {:.2g} "
                       "(at length {})",
                       target_bound, r.largest_bound, r.largest_bound_length);
}

std::string hunt_markdown(const HuntResult& r, const HuntSpec& spec) {
    std::string out = fmt::format("Hunt for {}-cycles among {} over {}.\n\n", spec.cycle_length,
                                  plural(static_cast<long long>(spec.options.size()), "option"), grid_text(spec.grid));
    if (!r.complete) out += "**Interrupted:** only cycles whose pairs are all known are listed.\n\n";
    if (r.cycles.empty()) return out + "No cycle found.\n";
    out += "| rank | rules | cycle | strength (points) | at length | lengths held | where |\n"
           "|---:|---|---|---:|---:|---:|---|\n";
    for (std::size_t i = 0; i < r.cycles.size(); ++i) {
        const HuntCycle& c = r.cycles[i];
        out += fmt::format("| {} | {} | {} | {} | {} | {} | {} |\n", i + 1,
                           md_escape(variant_text(spec.variants[c.variant])),
                           md_escape(cycle_text(spec.options, c.options)), bare_points(c.strongest),
                           c.strongest_length, c.count, runs_text(c.intervals));
    }
    return out;
}

std::string hunt_latex(const HuntResult& r, const HuntSpec& spec) {
    std::string out = fmt::format("% hunt for {}-cycles among {} over {}\n% needs \\usepackage{{booktabs}}\n",
                                  spec.cycle_length, plural(static_cast<long long>(spec.options.size()), "option"),
                                  grid_text(spec.grid));
    if (!r.complete) out += "% interrupted: only cycles whose pairs are all known are listed\n";
    out += "\\begin{tabular}{rllrrrl}\n\\toprule\n";
    out += "rank & rules & cycle & strength (points) & at length & lengths held & where \\\\\n\\midrule\n";
    for (std::size_t i = 0; i < r.cycles.size(); ++i) {
        const HuntCycle& c = r.cycles[i];
        out += fmt::format("{} & {} & {} & {} & {} & {} & {} \\\\\n", i + 1,
                           latex_escape(variant_text(spec.variants[c.variant])),
                           latex_escape(cycle_text(spec.options, c.options)), bare_points(c.strongest),
                           c.strongest_length, c.count, runs_text(c.intervals));
    }
    out += "\\bottomrule\n\\end{tabular}\n";
    return out;
}

json hunt_json(const HuntResult& r, const HuntSpec& spec) {
    json j = document("hunt", 1);
    json opts = json::array();
    for (const auto& o : spec.options) opts.push_back({{"name", o.name}, {"spec", o.spec}});
    j["options"] = opts;
    j["lengths"] = {{"lo", spec.grid.lo}, {"hi", spec.grid.hi}, {"step", spec.grid.step}};
    json vars = json::array();
    for (const auto& v : spec.variants)
        vars.push_back({{"overshoot", std::string(to_string(v.rule))}, {"order", std::string(to_string(v.order))}});
    j["variants"] = vars;
    json jumps = json::array();
    for (const Jump& jp : spec.jumps) jumps.push_back({jp.from, jp.to});
    j["jumps"] = jumps;
    j["anchor"] = spec.anchor == JumpAnchor::start ? "start" : "finish";
    j["merged_options"] = spec.merged_options;
    j["cycle_length"] = spec.cycle_length;
    j["min_strength"] = spec.min_strength;
    j["required"] = spec.required ? json(spec.options[*spec.required].name) : json(nullptr);
    j["complete"] = r.complete;
    j["totals"] = {{"pairs", r.pairs_total},          {"pairs_known", r.pairs_known},
                   {"lengths_examined", r.lengths_examined}, {"sets_examined", r.sets_examined},
                   {"cycle_instances", r.cycles_found}, {"distinct_sets", r.distinct}};
    json cyc = json::array();
    for (const auto& c : r.cycles)
        cyc.push_back({{"options", names_json(spec.options, c.options)},
                       {"overshoot", std::string(to_string(spec.variants[c.variant].rule))},
                       {"order", std::string(to_string(spec.variants[c.variant].order))},
                       {"strength", c.strongest},
                       {"strongest_length", c.strongest_length},
                       {"weakest_strength", c.weakest},
                       {"lengths", runs_json(c.intervals)},
                       {"count", c.count}});
    j["cycles"] = cyc;
    j["largest_error_bound"] = r.largest_bound;
    j["target_bound_met"] = !(r.largest_bound > target_bound);
    return j;
}

namespace {

std::string shard_lengths(const HuntShard& sh, const std::vector<int>& lengths) {
    if (sh.count == 0) return "none";
    const int lo = lengths[sh.first], hi = lengths[sh.first + sh.count - 1];
    return lo == hi ? fmt::format("{}", lo) : fmt::format("{}..{}", lo, hi);
}

std::string shard_pairs(const HuntShard& sh, const HuntSpec& spec) {
    if (sh.pairs.size() == 1)
        return fmt::format("{} v {}", spec.options[sh.pairs[0].a].name, spec.options[sh.pairs[0].b].name);
    return fmt::format("{} pairs", sh.pairs.size());
}

double total_cost(const HuntPlan& plan) {
    double t = 0;
    for (const auto& sh : plan.shards) t += sh.cost;
    return t;
}

}  // namespace

std::string hunt_plan_text(const HuntPlan& plan, const HuntSpec& spec, int threads) {
    const std::vector<int> lengths = spec.grid.lengths();
    const double total = total_cost(plan);
    std::string out = fmt::format("hunt plan: {} shards over {} rank{} ({} thread{} each); {} of {} pairs already known\n",
                                  plan.shards.size(), plan.ranks, plan.ranks == 1 ? "" : "s", threads,
                                  threads == 1 ? "" : "s", plan.pairs_known, plan.pairs_total);
    out += "estimated work in multiply-adds (a model, not a measurement; docs/cluster.md)\n";
    std::vector<std::vector<std::string>> rows;
    for (const auto& sh : plan.shards) {
        std::vector<std::string> row{fmt::format("{}", sh.id), std::string(to_string(sh.method)), shard_pairs(sh, spec),
                                     shard_lengths(sh, lengths), fmt::format("{:.3g}", sh.cost),
                                     total > 0 ? fmt::format("{:.1f}%", 100 * sh.cost / total) : "-",
                                     fmt::format("{}", sh.rank)};
        if (spec.variants.size() > 1) row.insert(row.begin() + 1, variant_text(spec.variants[sh.variant]));
        rows.push_back(row);
    }
    std::vector<std::string> header{"shard", "method", "pairs", "lengths", "work", "share", "rank"};
    if (spec.variants.size() > 1) header.insert(header.begin() + 1, "rules");
    if (!rows.empty()) out += table(header, rows);
    std::vector<std::vector<std::string>> ranks;
    double mean = 0;
    for (double c : plan.rank_cost) mean += c / static_cast<double>(plan.rank_cost.size());
    for (std::size_t r = 0; r < plan.rank_cost.size(); ++r) {
        std::size_t n = 0;
        for (const auto& sh : plan.shards) n += sh.rank == static_cast<int>(r);
        ranks.push_back({fmt::format("{}", r), fmt::format("{}", n), fmt::format("{:.3g}", plan.rank_cost[r]),
                         mean > 0 ? fmt::format("{:.3f}", plan.rank_cost[r] / mean) : "-"});
    }
    out += table({"rank", "shards", "work", "over mean"}, ranks);
    return out;
}

json hunt_plan_json(const HuntPlan& plan, const HuntSpec& spec, int threads) {
    json j = document("hunt-plan", 1);
    j["ranks"] = plan.ranks;
    j["threads_per_rank"] = threads;
    j["pairs_total"] = plan.pairs_total;
    j["pairs_known"] = plan.pairs_known;
    const std::vector<int> lengths = spec.grid.lengths();
    json shards = json::array();
    for (const auto& sh : plan.shards) {
        json pairs = json::array();
        for (const auto& p : sh.pairs) pairs.push_back({spec.options[p.a].name, spec.options[p.b].name});
        shards.push_back({{"id", sh.id},
                          {"overshoot", std::string(to_string(spec.variants[sh.variant].rule))},
                          {"order", std::string(to_string(spec.variants[sh.variant].order))},
                          {"method", std::string(to_string(sh.method))},
                          {"pairs", pairs},
                          {"lengths", sh.count ? json::array({lengths[sh.first], lengths[sh.first + sh.count - 1]})
                                               : json(nullptr)},
                          {"estimated_work", sh.cost},
                          {"rank", sh.rank}});
    }
    j["shards"] = shards;
    j["rank_work"] = plan.rank_cost;
    return j;
}

std::string rank_times_text(const std::vector<double>& busy, const std::vector<std::size_t>& shards, int threads) {
    double mean = 0, most = 0;
    for (double b : busy) {
        mean += b / static_cast<double>(busy.size());
        most = std::max(most, b);
    }
    std::string out = fmt::format("ranks: {}, {} thread{} each; time computing shards per rank:", busy.size(), threads,
                                  threads == 1 ? "" : "s");
    for (std::size_t r = 0; r < busy.size(); ++r)
        out += fmt::format(" {}: {:.2f} s ({} shards){}", r, busy[r], r < shards.size() ? shards[r] : 0,
                           r + 1 < busy.size() ? ";" : "");
    out += fmt::format("\nimbalance (largest over mean): {:.3f}\n", mean > 0 ? most / mean : 1.0);
    return out;
}

}  // namespace overshoot::render
