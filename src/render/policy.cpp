#include "render/policy.hpp"

#include <fmt/format.h>

#include <cmath>

#include "core/fraction.hpp"
#include "race/exact.hpp"
#include "race/outcome.hpp"
#include "render/figures.hpp"
#include "render/format.hpp"
#include "render/document.hpp"

namespace overshoot::render {

namespace {

// The ends of a proven interval rounded outward to double, so the printed
// interval still holds the value.
double rounded_down(long double x) {
    double d = static_cast<double>(x);
    return d > x ? std::nextafter(d, -INFINITY) : d;
}
double rounded_up(long double x) {
    double d = static_cast<double>(x);
    return d < x ? std::nextafter(d, INFINITY) : d;
}


std::string names_of(const std::vector<Option>& opts) {
    std::string s;
    for (std::size_t i = 0; i < opts.size(); ++i) s += (i ? ", " : "") + opts[i].name;
    return s;
}

std::vector<std::string> names_in(std::uint32_t mask, const std::vector<Option>& opts) {
    std::vector<std::string> out;
    for (std::size_t i = 0; i < opts.size(); ++i)
        if (mask >> i & 1u) out.push_back(opts[i].name);
    return out;
}

nlohmann::json menu_json(const std::vector<Option>& opts) {
    nlohmann::json a = nlohmann::json::array();
    for (const auto& o : opts) a.push_back({{"name", o.name}, {"spec", o.spec}});
    return a;
}

// A margin in signed points that never shows "-0.0000".
std::string margin_points(long double x) { return signed_points(static_cast<double>(x)); }

std::string rounds_text(long double x) { return std::isfinite(x) ? fmt::format("{:.4f}", static_cast<double>(x)) : "-"; }

// A piece never rests on a jump's source: no state has it there.
bool rests(const Board& b, int square) {
    for (const Jump& j : b.jumps)
        if (j.from == square) return false;
    return true;
}

// One line per A distance: runs of B distances with the same choice.
std::string runs_table(const Board& board, const std::vector<Choice>& choice, const std::vector<char>* mixed,
                       const std::vector<Option>& opts, const char* who, const char* other) {
    const int n = board.length;
    std::string out;
    for (int da = 1; da <= n; ++da) {
        const int a = n - da;
        if (!rests(board, a)) continue;
        out += fmt::format("  {} at {:>4}:", who, da);
        int start = -1;
        std::string key, prev;
        auto flush = [&](int end) {
            if (start < 0) return;
            out += start == end ? fmt::format(" {} {}", other, start) : fmt::format(" {} {}-{}", other, start, end);
            out += " " + prev + ";";
        };
        int last = 0;
        for (int db = 1; db <= n; ++db) {
            const int b = n - db;
            if (!rests(board, b)) continue;
            const std::size_t idx = static_cast<std::size_t>(a) * n + b;
            const Choice& c = choice[idx];
            key = opts[c.option].name;
            if (mixed && (*mixed)[idx]) key += "~";
            else if (c.indifferent()) key += "*";
            if (key != prev) {
                flush(last);
                start = db;
                prev = key;
            }
            last = db;
        }
        flush(last);
        out.back() = '\n';
    }
    return out;
}

nlohmann::json choice_map(const Board& board, const std::vector<Choice>& choice) {
    const int n = board.length;
    nlohmann::json rows = nlohmann::json::array();
    for (int da = 1; da <= n; ++da) {
        nlohmann::json row = nlohmann::json::array();
        for (int db = 1; db <= n; ++db) {
            const int a = n - da, b = n - db;
            if (!rests(board, a) || !rests(board, b)) row.push_back(nullptr);
            else row.push_back(choice[static_cast<std::size_t>(a) * n + b].option);
        }
        rows.push_back(std::move(row));
    }
    return rows;
}

nlohmann::json outcomes_json(const PolicyOutcomes& o) {
    return {{"p_a_wins", static_cast<double>(o.p_a_wins)},   {"p_b_wins", static_cast<double>(o.p_b_wins)},
            {"p_tie", static_cast<double>(o.p_tie)},         {"p_neither", static_cast<double>(o.p_neither)},
            {"margin", static_cast<double>(o.p_a_wins - o.p_b_wins)}, {"error_bound", bound_after_rounding(static_cast<double>(o.bound))}};
}

nlohmann::json exact_outcomes_json(const ExactPolicyOutcomes& e) {
    return {{"p_a_wins", fraction_string(e.p_a_wins)},
            {"p_b_wins", fraction_string(e.p_b_wins)},
            {"p_tie", fraction_string(e.p_tie)},
            {"p_neither", fraction_string(e.p_neither)},
            {"margin", fraction_string(e.p_a_wins - e.p_b_wins)}};
}

const char* goal_words(PolicyGoal g) {
    return g == PolicyGoal::win ? "P(A wins)" : "the margin P(A wins) - P(B wins)";
}

}  // namespace

// ---------------------------------------------------------------- alone

std::string alone_policy_text(const AlonePolicyView& v) {
    const AlonePolicy& r = *v.result;
    const auto& menu = *v.menu;
    std::string out = describe(*v.board, Order::simultaneous);
    out = out.substr(0, out.find(", simultaneous turns")) + "\n";
    out += fmt::format("one piece alone, choosing each turn from {}\n\n", names_of(menu));
    std::vector<std::vector<std::string>> rows;
    rows.push_back({"best choice each turn", rounds_text(r.best.rounds[0]), percent(static_cast<double>(r.best.p_finish[0]))});
    for (std::size_t i = 0; i < menu.size(); ++i)
        rows.push_back({"always " + menu[i].name, rounds_text(r.fixed[i].rounds[0]),
                        percent(static_cast<double>(r.fixed[i].p_finish[0]))});
    out += table({"from the start", "expected rounds", "P(finish)"}, rows);
    out += fmt::format("error bound: P(finish) within {:.1e}, expected rounds within {:.1e} of themselves\n",
                       static_cast<double>(r.bound), static_cast<double>(r.relative_bound));
    out += "(expected rounds '-': finishing is not certain, the expectation is infinite)\n";
    if (r.iterated)
        out += "pieces can move backward on this board: squares in loops were solved by iteration, and the bounds "
               "are proven from the residual of the values found\n";
    if (r.exact) {
        out += "\nexact: P(finish) = " + fraction_string(r.exact_p_finish);
        out += r.exact_rounds ? ", expected rounds = " + fraction_string(*r.exact_rounds) + "\n" : "\n";
    }
    out += "\npolicy by distance to the finish (* another option is as good):\n";
    rows.clear();
    const int n = r.length;
    for (int d = 1; d <= n; ++d) {
        const int s = n - d;
        if (!rests(*v.board, s)) continue;
        std::vector<std::string> row{std::to_string(d)};
        const Choice& f = r.fastest[s];
        row.push_back(f.option < 0 ? "-" : menu[f.option].name + (f.indifferent() ? "*" : ""));
        row.push_back(rounds_text(r.best.rounds[s]));
        row.push_back(menu[r.surest[s].option].name + (r.surest[s].indifferent() ? "*" : ""));
        row.push_back(percent(static_cast<double>(r.best.p_finish[s])));
        rows.push_back(std::move(row));
    }
    out += table({"distance", "fastest", "expected rounds", "surest", "P(finish)"}, rows);
    return out;
}

nlohmann::json alone_policy_json(const AlonePolicyView& v) {
    const AlonePolicy& r = *v.result;
    const auto& menu = *v.menu;
    nlohmann::json j = document("policy", 1);
    j["mode"] = "alone";
    j["board"] = board_json(*v.board, Order::simultaneous);
    j["board"].erase("order");
    j["menu"] = menu_json(menu);
    j["p_finish"] = static_cast<double>(r.best.p_finish[0]);
    j["expected_rounds"] = number_or_null(static_cast<double>(r.best.rounds[0]));
    j["error_bound"] = bound_after_rounding(static_cast<double>(r.bound));
    j["relative_error_bound"] = bound_after_rounding(static_cast<double>(r.relative_bound));
    j["method"] = r.iterated ? "iteration" : "backward";
    nlohmann::json fixed = nlohmann::json::array();
    for (std::size_t i = 0; i < menu.size(); ++i)
        fixed.push_back({{"option", menu[i].name},
                         {"p_finish", static_cast<double>(r.fixed[i].p_finish[0])},
                         {"expected_rounds", number_or_null(static_cast<double>(r.fixed[i].rounds[0]))}});
    j["fixed"] = fixed;
    nlohmann::json rows = nlohmann::json::array();
    const int n = r.length;
    for (int d = 1; d <= n; ++d) {
        const int s = n - d;
        if (!rests(*v.board, s)) continue;
        const Choice& f = r.fastest[s];
        rows.push_back({{"distance", d},
                        {"fastest", f.option < 0 ? nlohmann::json(nullptr) : nlohmann::json(menu[f.option].name)},
                        {"fastest_as_good", names_in(f.as_good, menu)},
                        {"expected_rounds", number_or_null(static_cast<double>(r.best.rounds[s]))},
                        {"surest", menu[r.surest[s].option].name},
                        {"surest_as_good", names_in(r.surest[s].as_good, menu)},
                        {"p_finish", static_cast<double>(r.best.p_finish[s])}});
    }
    j["policy"] = rows;
    if (r.exact) {
        nlohmann::json e{{"p_finish", fraction_string(r.exact_p_finish)},
                         {"expected_rounds", r.exact_rounds ? nlohmann::json(fraction_string(*r.exact_rounds))
                                                            : nlohmann::json(nullptr)}};
        nlohmann::json fx = nlohmann::json::array();
        for (std::size_t i = 0; i < menu.size(); ++i)
            fx.push_back({{"option", menu[i].name},
                          {"p_finish", fraction_string(r.exact_fixed_p_finish[i])},
                          {"expected_rounds", r.exact_fixed_rounds[i]
                                                  ? nlohmann::json(fraction_string(*r.exact_fixed_rounds[i]))
                                                  : nlohmann::json(nullptr)}});
        e["fixed"] = fx;
        j["exact"] = e;
    }
    return j;
}

// ---------------------------------------------------------------- duels

std::string duel_policy_text(const DuelPolicyView& v) {
    const PolicyComparison& c = *v.result;
    const DuelPolicy& d = c.adaptive;
    const auto& menu = *v.menu;
    const auto& against = *v.against;
    const bool game = against.size() > 1;
    std::string out = describe(*v.board, v.order) + "\n";
    if (game)
        out += fmt::format("A chooses from {}, B from {}: a zero-sum game, payoff {}\n", names_of(menu),
                           names_of(against), goal_words(d.goal));
    else
        out += fmt::format("A chooses from {} to maximise P(A wins); B always plays {}\n", names_of(menu),
                           against[0].name);
    out += "\n";
    std::vector<std::vector<std::string>> rows;
    auto row = [&](std::string who, const PolicyOutcomes& o) {
        rows.push_back({std::move(who), percent(static_cast<double>(o.p_a_wins)), percent(static_cast<double>(o.p_b_wins)),
                        percent(static_cast<double>(o.p_tie)), percent(static_cast<double>(o.p_neither)),
                        margin_points(o.p_a_wins - o.p_b_wins)});
    };
    row(game ? "A adaptive" : "A adaptive", d.outcomes);
    for (std::size_t i = 0; i < menu.size(); ++i) row("A always " + menu[i].name, c.fixed[i].outcomes);
    out += table({game ? "B adaptive" : "against " + against[0].name, "P(A wins)", "P(B wins)", "P(tie)",
                  "P(neither)", "margin (points)"},
                 rows);
    out += fmt::format("error bound: each probability within {:.1e}\n", static_cast<double>(d.outcomes.bound));
    if (d.iterated && game && v.order == Order::simultaneous)
        out += fmt::format("pieces can move backward on this board: states in loops were solved by iteration ({} "
                           "sweeps), their errors proven from the residual\n",
                           d.sweeps);
    else if (d.iterated)
        out += fmt::format("pieces can move backward on this board: states in loops were solved by iteration ({} "
                           "sweeps); the optimal {} is proven within [{}, {}]\n",
                           d.sweeps, game ? "margin" : "P(A wins)", rounded_down(d.value_low),
                           rounded_up(d.value_high));
    if (game && v.order == Order::simultaneous)
        out += fmt::format("value of the game (margin): {} points, proven within [{:+.4e}, {:+.4e}]; {} of {} "
                           "states need a mixed choice\n",
                           margin_points(d.value), 100 * static_cast<double>(d.value_low),
                           100 * static_cast<double>(d.value_high), d.mixed_states,
                           static_cast<std::size_t>(d.length) * d.length);
    const FixedPolicy& best = c.fixed[c.best_fixed];
    out += fmt::format("best fixed option: {} ({} {}); adaptivity is worth {} points of {}\n",
                       menu[c.best_fixed].name, game ? "margin" : "P(A wins)",
                       game ? margin_points(best.value) + " points"
                            : percent(static_cast<double>(best.value)),
                       margin_points(c.worth), game ? "margin" : "P(A wins)");
    if (d.exact) {
        out += "\nexact (fractions):\n";
        out += fmt::format("  {:<26} {}  = {}\n", "P(A wins), adaptive", decimal_string(d.exact_outcomes.p_a_wins, 12),
                           fraction_string(d.exact_outcomes.p_a_wins));
        out += fmt::format("  {:<26} {}  = {}\n", "P(B wins), adaptive", decimal_string(d.exact_outcomes.p_b_wins, 12),
                           fraction_string(d.exact_outcomes.p_b_wins));
        if (c.exact_worth)
            out += fmt::format("  {:<26} {}  = {}\n", "adaptivity is worth", decimal_string(*c.exact_worth, 12),
                               fraction_string(*c.exact_worth));
    }
    const bool alternating = v.order != Order::simultaneous;
    out += fmt::format("\nA's choice {}, by distances to the finish (runs of B's distance; * another option is as "
                       "good{}):\n",
                       alternating ? "when A is to move" : "each round", game && !alternating ? ", ~ mixed: the "
                                                                                             "heaviest option shown" : "");
    out += runs_table(*v.board, d.a_choice, d.mixed.empty() ? nullptr : &d.mixed, menu, "A", "B");
    if (game) {
        out += fmt::format("\nB's choice {} (runs of B's distance):\n", alternating ? "when B is to move" : "each round");
        out += runs_table(*v.board, d.b_choice, d.mixed.empty() ? nullptr : &d.mixed, against, "A", "B");
    }
    return out;
}

nlohmann::json duel_policy_json(const DuelPolicyView& v) {
    const PolicyComparison& c = *v.result;
    const DuelPolicy& d = c.adaptive;
    const auto& menu = *v.menu;
    const auto& against = *v.against;
    const bool game = against.size() > 1;
    nlohmann::json j = document("policy", 1);
    j["mode"] = game ? "against-menu" : "against";
    j["board"] = board_json(*v.board, v.order);
    j["menu"] = menu_json(menu);
    if (game) j["against_menu"] = menu_json(against);
    else j["against"] = menu_json(against)[0];
    j["goal"] = std::string(to_string(d.goal));
    j["p_a_wins"] = static_cast<double>(d.outcomes.p_a_wins);
    j["p_b_wins"] = static_cast<double>(d.outcomes.p_b_wins);
    j["p_tie"] = static_cast<double>(d.outcomes.p_tie);
    j["p_neither"] = static_cast<double>(d.outcomes.p_neither);
    j["margin"] = static_cast<double>(d.outcomes.p_a_wins - d.outcomes.p_b_wins);
    j["error_bound"] = bound_after_rounding(static_cast<double>(d.outcomes.bound));
    j["method"] = d.iterated ? "iteration" : "backward";
    if (d.iterated) j["sweeps"] = d.sweeps;
    j["value"] = {{"value", static_cast<double>(d.value)},
                  {"low", rounded_down(d.value_low)},
                  {"high", rounded_up(d.value_high)}};
    const FixedPolicy& best = c.fixed[c.best_fixed];
    j["best_fixed"] = {{"option", menu[c.best_fixed].name},
                       {"p_a_wins", static_cast<double>(best.outcomes.p_a_wins)},
                       {"value", static_cast<double>(best.value)}};
    j["adaptivity_worth"] = static_cast<double>(c.worth);
    nlohmann::json fixed = nlohmann::json::array();
    for (std::size_t i = 0; i < menu.size(); ++i) {
        nlohmann::json f = outcomes_json(c.fixed[i].outcomes);
        f["option"] = menu[i].name;
        f["value"] = static_cast<double>(c.fixed[i].value);
        fixed.push_back(std::move(f));
    }
    j["fixed"] = fixed;
    nlohmann::json pol;
    pol["rows"] = "A's distance to the finish, 1 first";
    pol["columns"] = "B's distance to the finish, 1 first";
    pol["a_to_move"] = v.order != Order::simultaneous;
    pol["a"] = choice_map(*v.board, d.a_choice);
    if (game) pol["b"] = choice_map(*v.board, d.b_choice);
    nlohmann::json indiff = nlohmann::json::array(), mixed = nlohmann::json::array();
    const int n = d.length;
    for (int da = 1; da <= n; ++da)
        for (int db = 1; db <= n; ++db) {
            const int a = n - da, b = n - db;
            if (!rests(*v.board, a) || !rests(*v.board, b)) continue;
            const std::size_t idx = static_cast<std::size_t>(a) * n + b;
            if (!d.mixed.empty() && d.mixed[idx]) {
                nlohmann::json am = nlohmann::json::object(), bm = nlohmann::json::object();
                for (int i = 0; i < d.a_options; ++i)
                    if (d.a_mix[idx * d.a_options + i] > 0) am[menu[i].name] = d.a_mix[idx * d.a_options + i];
                for (int i = 0; i < d.b_options; ++i)
                    if (d.b_mix[idx * d.b_options + i] > 0) bm[against[i].name] = d.b_mix[idx * d.b_options + i];
                mixed.push_back({{"a_distance", da}, {"b_distance", db}, {"a_mix", am}, {"b_mix", bm}});
                continue;
            }
            if (d.a_choice[idx].indifferent())
                indiff.push_back({{"a_distance", da}, {"b_distance", db}, {"side", "A"},
                                  {"options", names_in(d.a_choice[idx].as_good, menu)}});
            if (game && d.b_choice[idx].indifferent())
                indiff.push_back({{"a_distance", da}, {"b_distance", db}, {"side", "B"},
                                  {"options", names_in(d.b_choice[idx].as_good, against)}});
        }
    pol["indifferent"] = indiff;
    if (game && v.order == Order::simultaneous) pol["mixed"] = mixed;
    if (v.state_values) {
        auto value_map = [&](const std::vector<long double>& val) {
            nlohmann::json rows = nlohmann::json::array();
            for (int da = 1; da <= n; ++da) {
                nlohmann::json row = nlohmann::json::array();
                for (int db = 1; db <= n; ++db)
                    row.push_back(static_cast<double>(val[static_cast<std::size_t>(n - da) * n + (n - db)]));
                rows.push_back(std::move(row));
            }
            return rows;
        };
        pol["values"] = value_map(d.values);
        if (!d.values_b.empty()) pol["values_b"] = value_map(d.values_b);
    }
    j["policy"] = pol;
    if (d.exact) {
        nlohmann::json e = exact_outcomes_json(d.exact_outcomes);
        e["value"] = fraction_string(d.exact_value);
        e["best_fixed"] = {{"option", menu[c.best_fixed].name},
                           {"p_a_wins", fraction_string(best.exact_outcomes.p_a_wins)},
                           {"value", fraction_string(best.exact_value)}};
        if (c.exact_worth) e["adaptivity_worth"] = fraction_string(*c.exact_worth);
        j["exact"] = e;
    }
    return j;
}

// ---------------------------------------------------------------- figures

namespace {

svg::Element legend(svg::Element& root, double x, double y, const std::vector<Option>& opts, bool pale_note,
                    const char* pale_words) {
    for (std::size_t i = 0; i < opts.size(); ++i) {
        root.add(svg::rect(x, y + 22.0 * static_cast<double>(i), 14, 14, palette()[i % palette().size()]));
        svg::Element t = svg::text(x + 20, y + 22.0 * static_cast<double>(i) + 11.5, opts[i].name, 12);
        t.set("fill", ink);
        root.add(std::move(t));
    }
    if (pale_note) {
        const double yy = y + 22.0 * static_cast<double>(opts.size()) + 6;
        svg::Element r = svg::rect(x, yy, 14, 14, palette()[0]);
        r.set("fill-opacity", 0.4);
        root.add(std::move(r));
        svg::Element t = svg::text(x + 20, yy + 11.5, pale_words, 11);
        t.set("fill", muted);
        root.add(std::move(t));
    }
    return root;
}

}  // namespace

svg::Element policy_figure(const DuelPolicyView& v) {
    const DuelPolicy& d = v.result->adaptive;
    const auto& menu = *v.menu;
    const int n = d.length;
    // Distances 1..shown; the states nearest the finish are where choices differ.
    const int shown = v.figure_distance > 0 ? std::min(v.figure_distance, n) : n;
    const double plot = 520, cell = plot / shown, left = 64, top = 48, W = left + plot + 190, H = top + plot + 58;
    const bool game = v.against->size() > 1;
    std::string title = fmt::format("Optimal choice of A from {} {} on {} squares ({}{})", names_of(menu),
                                    game ? "against B choosing from " + names_of(*v.against)
                                         : "against " + (*v.against)[0].name,
                                    n, to_string(v.order),
                                    shown < n ? fmt::format(", distances up to {}", shown) : std::string());
    svg::Element root = svg::document(
        W, H, title,
        "A map of the option piece A should take for every pair of distances to the finish: B's distance "
        "across, A's distance upward, one colour per option; pale cells are indifferent or mixed.");
    svg::Element bg = svg::rect(0, 0, W, H, paper);
    root.add(std::move(bg));
    svg::Element head = svg::text(left, 26, title, 13);
    head.set("fill", ink);
    root.add(std::move(head));
    // One rectangle per run of equal cells along B's distance keeps the file small.
    svg::Element cells("g");
    cells.set("shape-rendering", "crispEdges");
    for (int da = 1; da <= shown; ++da) {
        const int a = n - da;
        if (!rests(*v.board, a)) continue;
        const double y = top + plot - da * cell;
        int db = 1;
        while (db <= shown) {
            const int b = n - db;
            const std::size_t idx = static_cast<std::size_t>(a) * n + b;
            if (!rests(*v.board, b)) {
                ++db;
                continue;
            }
            const Choice& c = d.a_choice[idx];
            const bool pale = c.indifferent() || (!d.mixed.empty() && d.mixed[idx]);
            int end = db;
            while (end + 1 <= shown) {
                const int b2 = n - (end + 1);
                if (!rests(*v.board, b2)) break;
                const std::size_t i2 = static_cast<std::size_t>(a) * n + b2;
                const bool pale2 = d.a_choice[i2].indifferent() || (!d.mixed.empty() && d.mixed[i2]);
                if (d.a_choice[i2].option != c.option || pale2 != pale) break;
                ++end;
            }
            svg::Element r = svg::rect(left + (db - 1) * cell, y, (end - db + 1) * cell, cell,
                                       palette()[c.option % palette().size()]);
            if (pale) r.set("fill-opacity", 0.4);
            cells.add(std::move(r));
            db = end + 1;
        }
    }
    root.add(std::move(cells));
    // Axes: ticks at round distances.
    const double step = std::max(1.0, nice_step(shown, 8));
    for (double t = step; t <= shown + 1e-9; t += step) {
        const double x = left + (t - 0.5) * cell, y = top + plot - (t - 0.5) * cell;
        root.add(svg::line(x, top + plot, x, top + plot + 5, ink, 1));
        svg::Element tx = svg::text(x, top + plot + 18, fmt::format("{}", static_cast<int>(t)), 11, "middle");
        tx.set("fill", ink);
        root.add(std::move(tx));
        root.add(svg::line(left - 5, y, left, y, ink, 1));
        svg::Element ty = svg::text(left - 8, y + 4, fmt::format("{}", static_cast<int>(t)), 11, "end");
        ty.set("fill", ink);
        root.add(std::move(ty));
    }
    svg::Element frame = svg::rect(left, top, plot, plot, "none");
    frame.set("stroke", ink).set("stroke-width", 1);
    root.add(std::move(frame));
    svg::Element xl = svg::text(left + plot / 2, top + plot + 40, "B's distance to the finish", 12, "middle");
    xl.set("fill", ink);
    root.add(std::move(xl));
    svg::Element yl = svg::text(16, top + plot / 2, "A's distance to the finish", 12, "middle");
    yl.set("fill", ink).set("transform", fmt::format("rotate(-90 16 {})", svg::num(top + plot / 2)));
    root.add(std::move(yl));
    bool any_pale = false;
    for (int da = 1; da <= shown && !any_pale; ++da)
        for (int db = 1; db <= shown && !any_pale; ++db) {
            const std::size_t i = static_cast<std::size_t>(n - da) * n + (n - db);
            any_pale = d.a_choice[i].indifferent() || (!d.mixed.empty() && d.mixed[i]);
        }
    svg::Element lt = svg::text(left + plot + 24, top + 4, "A chooses", 12);
    lt.set("fill", ink);
    root.add(std::move(lt));
    legend(root, left + plot + 24, top + 16, menu, any_pale,
           game && v.order == Order::simultaneous ? "indifferent or mixed" : "indifferent");
    return root;
}

svg::Element alone_policy_figure(const AlonePolicyView& v) {
    const AlonePolicy& r = *v.result;
    const auto& menu = *v.menu;
    const int n = r.length;
    const double plot = 560, cell = plot / n, left = 110, top = 48, band = 28, W = left + plot + 170, H = top + 2 * band + 80;
    std::string title = fmt::format("Choice of one piece alone from {} on {} squares", names_of(menu), n);
    svg::Element root = svg::document(W, H, title,
                                      "Two bands over the distance to the finish: the option minimising the expected "
                                      "rounds and the option maximising the chance to finish.");
    root.add(svg::rect(0, 0, W, H, paper));
    svg::Element head = svg::text(left, 26, title, 13);
    head.set("fill", ink);
    root.add(std::move(head));
    const std::vector<const std::vector<Choice>*> bands{&r.fastest, &r.surest};
    const char* band_names[] = {"fastest", "surest"};
    for (int k = 0; k < 2; ++k) {
        const double y = top + k * (band + 8);
        svg::Element name = svg::text(left - 8, y + band / 2 + 4, band_names[k], 12, "end");
        name.set("fill", ink);
        root.add(std::move(name));
        for (int dd = 1; dd <= n; ++dd) {
            const int s = n - dd;
            if (!rests(*v.board, s)) continue;
            const Choice& c = (*bands[k])[s];
            if (c.option < 0) continue;  // finishing is not certain: no fastest choice
            svg::Element rr = svg::rect(left + (dd - 1) * cell, y, cell, band, palette()[c.option % palette().size()]);
            if (c.indifferent()) rr.set("fill-opacity", 0.4);
            root.add(std::move(rr));
        }
    }
    const double base = top + 2 * band + 8;
    const double step = std::max(1.0, nice_step(n, 8));
    for (double t = step; t <= n + 1e-9; t += step) {
        const double x = left + (t - 0.5) * cell;
        root.add(svg::line(x, base, x, base + 5, ink, 1));
        svg::Element tx = svg::text(x, base + 18, fmt::format("{}", static_cast<int>(t)), 11, "middle");
        tx.set("fill", ink);
        root.add(std::move(tx));
    }
    svg::Element xl = svg::text(left + plot / 2, base + 38, "distance to the finish", 12, "middle");
    xl.set("fill", ink);
    root.add(std::move(xl));
    legend(root, left + plot + 24, top, menu, true, "indifferent");
    return root;
}

}  // namespace overshoot::render

namespace overshoot::render {

std::string policy_section_html(const DuelPolicyView& v) {
    using svg::escape;
    const PolicyComparison& c = *v.result;
    const DuelPolicy& d = c.adaptive;
    const auto& menu = *v.menu;
    const bool game = v.against->size() > 1;
    std::string h = "<section id=\"policy\"><h2>Choosing the option every turn</h2>\n<p class=\"note\">";
    h += game ? escape(fmt::format("A chooses each turn from {}, B from {}: a zero-sum game with payoff the margin "
                                   "P(A wins) - P(B wins).",
                                   names_of(menu), names_of(*v.against)))
              : escape(fmt::format("A chooses each turn from {} to maximise P(A wins); B always plays {}.",
                                   names_of(menu), (*v.against)[0].name));
    h += "</p>\n<table><thead><tr><th>A</th><th>P(A wins)</th><th>P(B wins)</th><th>P(tie)</th><th>P(neither)</th>"
         "</tr></thead><tbody>\n";
    auto row = [&](const std::string& who, const PolicyOutcomes& o) {
        h += "<tr><td>" + escape(who) + "</td><td>" + percent(static_cast<double>(o.p_a_wins)) + "</td><td>" +
             percent(static_cast<double>(o.p_b_wins)) + "</td><td>" + percent(static_cast<double>(o.p_tie)) +
             "</td><td>" + percent(static_cast<double>(o.p_neither)) + "</td></tr>\n";
    };
    row("adaptive", d.outcomes);
    for (std::size_t i = 0; i < menu.size(); ++i) row("always " + menu[i].name, c.fixed[i].outcomes);
    h += "</tbody></table>\n";
    h += "<p class=\"note\">" +
         escape(fmt::format("Best fixed option: {}. Adaptivity is worth {} points of {}. Each probability is "
                            "within {:.1e}.",
                            menu[c.best_fixed].name, margin_points(c.worth),
                            game ? "the margin" : "P(A wins)", static_cast<double>(d.outcomes.bound))) +
         "</p>\n";
    if (d.iterated)
        h += "<p class=\"note\">" +
             escape("Pieces can move backward on this board: states in loops of squares were solved by iteration, "
                    "and the bounds are proven from the residual of the values found.") +
             "</p>\n";
    h += "<figure>" + policy_figure(v).str() + "<figcaption>" +
         escape("A's optimal option for every pair of distances to the finish (B's across, A's upward); pale: "
                "another option is as good, or the choice is mixed.") +
         "</figcaption></figure>\n";
    h += "<p class=\"note\">A game of choices can be used as a hustle: whoever knows the optimal policy wins far "
         "more often than a casual opponent expects. Do not use it against people who cannot see it; bets on it "
         "are gambling and subject to local law.</p>\n</section>\n";
    return h;
}

}  // namespace overshoot::render
