#include "render/several_pieces.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <bit>
#include <map>

#include "render/format.hpp"
#include "render/document.hpp"

namespace overshoot::render {

namespace {

double d(long double x) { return static_cast<double>(x); }

std::string board_line(const Board& b, RaceOrder order) {
    return fmt::format("board of {}, overshoot {}, {} order, {}", plural(b.length, "square"), to_string(b.rule), to_string(order),
                       jumps_text(b.jumps));
}

std::vector<std::string> names_of(const std::vector<Option>& options) {
    std::vector<std::string> n;
    for (const auto& o : options) n.push_back(o.name);
    return unique_names(n);
}

std::vector<std::string> picked_names(const std::vector<Option>& options, const std::vector<int>& picks) {
    std::vector<std::string> n;
    for (int p : picks) n.push_back(options[p].name);
    return n;
}

std::string bound_note(const RaceResult& r) {
    return fmt::format("error bound on each probability: {:.2g} (proven{}, method {})", d(r.bound),
                       r.target_met ? "" : "; ABOVE the wanted 1e-12: the work limit or the accumulated rounding stopped it", to_string(r.method));
}

// The shared first finishes, largest first: "1d6 & 2d6".
std::vector<std::pair<unsigned, long double>> shared_list(const RaceResult& r) {
    std::vector<std::pair<unsigned, long double>> s;
    for (unsigned m = 0; m < r.p_shared.size(); ++m)
        if (std::popcount(m) >= 2 && r.p_shared[m] > 0) s.emplace_back(m, r.p_shared[m]);
    std::stable_sort(s.begin(), s.end(), [](const auto& a, const auto& b) { return a.second > b.second; });
    return s;
}

std::string join_mask(unsigned m, const std::vector<std::string>& names, const char* sep) {
    std::string out;
    for (std::size_t i = 0; i < names.size(); ++i)
        if (m & (1u << i)) out += (out.empty() ? "" : sep) + names[i];
    return out;
}

std::string starts_text(const std::vector<int>& s) {
    std::string out;
    for (std::size_t i = 0; i < s.size(); ++i) out += (i ? ", " : "") + fmt::format("{}", s[i]);
    return out;
}

}  // namespace

std::vector<std::string> unique_names(const std::vector<std::string>& names) {
    std::vector<std::string> out;
    std::map<std::string, int> seen;
    for (const auto& n : names) {
        int c = ++seen[n];
        std::string cand = c == 1 ? n : fmt::format("{}#{}", n, c);
        // A later "#2" could collide with a name given as such; count on.
        while (std::find(out.begin(), out.end(), cand) != out.end()) cand = fmt::format("{}#{}", n, ++seen[n]);
        out.push_back(cand);
    }
    return out;
}

nlohmann::json race_board_json(const Board& b, RaceOrder order) {
    nlohmann::json j = board_json(b, Order::simultaneous);
    j["order"] = std::string(to_string(order));
    return j;
}

nlohmann::json race_result_json(const RaceResult& r, const std::vector<std::string>& names) {
    nlohmann::json j;
    nlohmann::json wins = nlohmann::json::object(), shares = nlohmann::json::object();
    for (std::size_t i = 0; i < names.size(); ++i) {
        wins[names[i]] = d(r.p_wins[i]);
        shares[names[i]] = d(r.p_shares[i]);
    }
    j["p_wins"] = wins;
    j["p_tie"] = d(r.p_tie);
    j["p_neither"] = d(r.p_neither);
    j["error_bound"] = d(r.bound);
    j["p_shares_first_finish"] = shares;
    nlohmann::json sh = nlohmann::json::array();
    for (const auto& [m, p] : shared_list(r)) {
        nlohmann::json who = nlohmann::json::array();
        for (std::size_t i = 0; i < names.size(); ++i)
            if (m & (1u << i)) who.push_back(names[i]);
        sh.push_back({{"pieces", who}, {"p", d(p)}});
    }
    j["shared_finishes"] = sh;
    j["target_met"] = r.target_met;
    j["method"] = to_string(r.method);
    j["series_rounds"] = r.rounds;
    return j;
}

nlohmann::json race_json(const RaceView& v) {
    nlohmann::json j = document("race", 1);
    j["board"] = race_board_json(*v.board, v.order);
    const auto names = names_of(*v.options);
    nlohmann::json pieces = nlohmann::json::array();
    for (std::size_t i = 0; i < names.size(); ++i)
        pieces.push_back({{"name", names[i]},
                          {"spec", (*v.options)[i].spec},
                          {"start", v.starts.empty() ? 0 : v.starts[i]}});
    j["pieces"] = pieces;
    j.update(race_result_json(*v.result, names));
    return j;
}

std::string race_text(const RaceView& v) {
    const RaceResult& r = *v.result;
    const auto names = names_of(*v.options);
    std::string out = board_line(*v.board, v.order) + "\n";
    if (!v.starts.empty()) out += "start squares: " + starts_text(v.starts) + "\n";
    out += "\n";
    std::vector<std::vector<std::string>> rows;
    for (std::size_t i = 0; i < names.size(); ++i)
        rows.push_back({names[i], percent(d(r.p_wins[i])), percent(d(r.p_shares[i]))});
    out += table({"piece", "first alone", "shares first finish"}, rows);
    out += fmt::format("\nshared first finish: {}\nnobody ever finishes: {}\n", percent(d(r.p_tie)), percent(d(r.p_neither)));
    auto sh = shared_list(r);
    if (!sh.empty()) {
        out += "shared by:";
        std::size_t shown = 0;
        for (const auto& [m, p] : sh) {
            if (shown++ == 6) {
                out += fmt::format(" (+{} more in --json)", sh.size() - 6);
                break;
            }
            out += fmt::format(" {} {};", join_mask(m, names, " & "), percent(d(p)));
        }
        if (out.back() == ';') out.pop_back();
        out += "\n";
    }
    out += bound_note(r) + "\n";
    return out;
}

nlohmann::json choice_json(const ChoiceView& v) {
    const ChoiceResult& c = *v.result;
    nlohmann::json j = document("choice", 1);
    j["board"] = race_board_json(*v.board, v.order);
    nlohmann::json opts = nlohmann::json::array();
    for (const auto& o : *v.options) opts.push_back(o.name);
    j["options"] = opts;
    j["players"] = c.players;
    j["distinct"] = c.distinct;
    auto path = [&](const ChoicePath& p) {
        nlohmann::json a = nlohmann::json::array();
        for (std::size_t i = 0; i < p.picks.size(); ++i)
            a.push_back({{"player", i + 1}, {"pick", (*v.options)[p.picks[i]].name}, {"chance", d(p.chances[i])}});
        return a;
    };
    j["equilibrium"] = path(c.equilibrium);
    nlohmann::json after = nlohmann::json::array();
    for (const auto& p : c.after_first_pick) after.push_back(path(p));
    j["after_first_pick"] = after;
    j["last_at_least_first_on_path"] = c.last_at_least_first_on_path;
    j["last_always_at_least_first"] = c.last_always_at_least_first;
    if (c.counterexample.empty()) {
        j["counterexample"] = nullptr;
    } else {
        nlohmann::json ce = nlohmann::json::array();
        for (int p : c.counterexample) ce.push_back((*v.options)[p].name);
        j["counterexample"] = ce;
    }
    j["error_bound"] = d(c.bound);
    j["target_met"] = c.target_met;
    j["races"] = c.races;
    j["pick_sequences"] = c.leaves;
    return j;
}

std::string choice_text(const ChoiceView& v) {
    const ChoiceResult& c = *v.result;
    std::string out = board_line(*v.board, v.order) + "\n";
    out += fmt::format("{} players pick in turn from {} options{}; each wants to finish first alone.\n\n", c.players,
                       v.options->size(), c.distinct ? " (no option picked twice)" : " (repeats allowed)");
    std::vector<std::vector<std::string>> rows;
    for (std::size_t i = 0; i < c.equilibrium.picks.size(); ++i)
        rows.push_back({fmt::format("player {}", i + 1), (*v.options)[c.equilibrium.picks[i]].name,
                        percent(d(c.equilibrium.chances[i]))});
    out += table({"player", "best pick", "chance"}, rows);
    out += "\nafter each first pick, the others answer:\n";
    std::vector<std::vector<std::string>> rr;
    for (const auto& p : c.after_first_pick) {
        std::string answers;
        for (std::size_t i = 1; i < p.picks.size(); ++i)
            answers += (i > 1 ? ", " : "") + (*v.options)[p.picks[i]].name;
        std::string chances;
        for (std::size_t i = 0; i < p.chances.size(); ++i) chances += (i ? " / " : "") + percent(d(p.chances[i]));
        rr.push_back({(*v.options)[p.picks[0]].name, answers, chances});
    }
    out += table({"first pick", "answers", "chances (player 1 / 2 / ...)"}, rr);
    out += fmt::format("\nthe last to choose does at least as well as the first: on the best-play path {}; "
                       "after every possible sequence of earlier picks {}\n",
                       c.last_at_least_first_on_path ? "yes" : "no", c.last_always_at_least_first ? "yes" : "no");
    if (!c.counterexample.empty())
        out += "  for example after: " + fmt::format("{}", fmt::join(picked_names(*v.options, c.counterexample), ", ")) + "\n";
    out += fmt::format("{} distinct races, error bound on each chance: {:.2g} (proven{})\n", c.races, d(c.bound),
                       c.target_met ? "" : "; ABOVE the wanted 1e-12 for some race");
    return out;
}

nlohmann::json balance_json(const BalanceView& v) {
    nlohmann::json j = document("balance", 1);
    j["board"] = race_board_json(*v.board, v.order);
    const auto names = names_of(*v.options);
    j["options"] = names;
    auto assignment = [&](const StartAssignment& a) {
        nlohmann::json starts = nlohmann::json::object();
        for (std::size_t i = 0; i < names.size(); ++i) starts[names[i]] = a.starts[i];
        nlohmann::json x = {{"starts", starts}, {"deviation", d(a.deviation)}};
        x["race"] = race_result_json(a.race, names);
        return x;
    };
    if (v.starts) {
        const HeadStartResult& h = *v.starts;
        nlohmann::json best = nlohmann::json::array();
        for (const auto& a : h.best) best.push_back(assignment(a));
        j["head_starts"] = {{"squares", {h.lo, h.hi}},   {"best", best},
                            {"from_zero", assignment(h.from_zero)}, {"assignments", h.assignments},
                            {"evaluated", h.evaluated}, {"pruned_partial", h.pruned}};
    }
    if (v.lengths) {
        const LengthsResult& l = *v.lengths;
        nlohmann::json all = nlohmann::json::array(), best = nlohmann::json::array();
        for (const auto& x : l.lengths) {
            nlohmann::json wins = nlohmann::json::object();
            for (std::size_t i = 0; i < names.size(); ++i) wins[names[i]] = d(x.race.p_wins[i]);
            all.push_back({{"length", x.length}, {"deviation", d(x.deviation)}, {"p_wins", wins},
                           {"p_tie", d(x.race.p_tie)}, {"error_bound", d(x.race.bound)}});
        }
        for (int i : l.fairest) best.push_back(l.lengths[i].length);
        j["lengths"] = {{"per_length", all}, {"fairest", best}};
    }
    if (v.jumps) {
        const JumpSearchResult& s = *v.jumps;
        auto cand = [&](const JumpCandidate& c) {
            nlohmann::json x = {{"from", c.jump.from}, {"to", c.jump.to}, {"deviation", d(c.deviation)}};
            x["dominant"] = c.dominant ? nlohmann::json(names[*c.dominant]) : nlohmann::json(nullptr);
            x["race"] = race_result_json(c.race, names);
            return x;
        };
        nlohmann::json fair = nlohmann::json::array(), rem = nlohmann::json::array();
        for (const auto& c : s.fairest) fair.push_back(cand(c));
        for (const auto& c : s.removing_dominant) rem.push_back(cand(c));
        j["jump"] = {{"base_deviation", d(s.base_deviation)},
                     {"dominant_before", s.dominant_before ? nlohmann::json(names[*s.dominant_before]) : nlohmann::json(nullptr)},
                     {"fairest", fair},
                     {"removing_dominant", rem},
                     {"boards_tried", s.tried},
                     {"error_bound", d(s.bound)}};
    }
    return j;
}

std::string balance_text(const BalanceView& v) {
    const auto names = names_of(*v.options);
    std::string out = board_line(*v.board, v.order) + "\n";
    out += "deviation: the largest distance of a piece's chance to finish first alone from the mean of those chances\n";
    auto wins = [&](const RaceResult& r) {
        std::string s;
        for (std::size_t i = 0; i < names.size(); ++i) s += (i ? " / " : "") + percent(d(r.p_wins[i]));
        return s;
    };
    const std::string order = fmt::format("{}", fmt::join(names, " / "));
    if (v.starts) {
        const HeadStartResult& h = *v.starts;
        out += fmt::format("\nhead starts (start squares {}..{}, {} assignments, {} raced, {} partial ones cut by the bound)\n",
                           h.lo, h.hi, h.assignments, h.evaluated, h.pruned);
        std::vector<std::vector<std::string>> rows;
        rows.push_back({"all on 0", "", fmt::format("{:.6f}", d(h.from_zero.deviation)), wins(h.from_zero.race)});
        for (std::size_t i = 0; i < h.best.size(); ++i)
            rows.push_back({i == 0 ? "fairest" : fmt::format("runner-up {}", i), starts_text(h.best[i].starts),
                            fmt::format("{:.6f}", d(h.best[i].deviation)), wins(h.best[i].race)});
        out += table({"", "starts (" + order + ")", "deviation", "first alone (" + order + ")"}, rows);
    }
    if (v.lengths) {
        const LengthsResult& l = *v.lengths;
        out += "\nlengths most nearly fair\n";
        std::vector<std::vector<std::string>> rows;
        for (int i : l.fairest)
            rows.push_back({fmt::format("{}", l.lengths[i].length), fmt::format("{:.6f}", d(l.lengths[i].deviation)),
                            wins(l.lengths[i].race)});
        out += table({"length", "deviation", "first alone (" + order + ")"}, rows);
    }
    if (v.jumps) {
        const JumpSearchResult& s = *v.jumps;
        out += fmt::format("\nsingle jumps ({} boards tried); without a new jump the deviation is {:.6f}{}\n", s.tried,
                           d(s.base_deviation),
                           s.dominant_before ? fmt::format(" and {} beats every other option", names[*s.dominant_before])
                                             : std::string(" and no option beats every other"));
        auto list = [&](const std::vector<JumpCandidate>& cs) {
            std::vector<std::vector<std::string>> rows;
            for (const auto& c : cs)
                rows.push_back({fmt::format("{}->{}", c.jump.from, c.jump.to), fmt::format("{:.6f}", d(c.deviation)),
                                wins(c.race), c.dominant ? names[*c.dominant] : "none"});
            return table({"jump", "deviation", "first alone (" + order + ")", "dominant"}, rows);
        };
        out += "fairest:\n" + list(s.fairest);
        if (s.dominant_before) {
            out += "fairest among those after which no option beats every other (" + names[*s.dominant_before] + " did):\n";
            out += s.removing_dominant.empty() ? std::string("  none\n") : list(s.removing_dominant);
        }
        out += fmt::format("largest error bound of any race: {:.2g} (proven)\n", d(s.bound));
    }
    return out;
}

}  // namespace overshoot::render
