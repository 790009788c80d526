#include "render/race.hpp"

#include <fmt/format.h>

#include <cmath>

#include "render/format.hpp"

namespace overshoot::render {

namespace {
nlohmann::json maybe(double x) { return std::isfinite(x) ? nlohmann::json(x) : nlohmann::json(nullptr); }
nlohmann::json maybe(const std::optional<long long>& v) { return v ? nlohmann::json(*v) : nlohmann::json(nullptr); }
}  // namespace

nlohmann::json document(const std::string& kind, int schema_version) {
    nlohmann::json j;
    j["schema"] = fmt::format("overshoot.{}/{}", kind, schema_version);
    j["version"] = version;
    return j;
}

nlohmann::json board_json(const Board& b, Order order) {
    nlohmann::json jumps = nlohmann::json::array();
    for (const Jump& j : b.jumps) jumps.push_back({j.from, j.to});
    return {{"length", b.length}, {"overshoot", std::string(to_string(b.rule))},
            {"jumps", jumps}, {"order", std::string(to_string(order))}};
}

std::string profile_text(const Board& board, Order order, const std::vector<ProfileEntry>& entries) {
    (void)order;
    std::string out = describe(board, Order::simultaneous);
    // Profiles do not depend on the turn order; keep the board part of the line.
    out = out.substr(0, out.find(", simultaneous turns")) + out.substr(out.find(", simultaneous turns") + 20);
    out += "\n\n";
    std::vector<std::string> header{"option", "P(finish)", "mean turns", "sd", "median"};
    bool any_quantile = false;
    for (const auto& e : entries)
        for (const auto& q : e.profile.quantiles)
            if (q.q != 0.5) any_quantile = true;
    if (any_quantile)
        for (const auto& q : entries.front().profile.quantiles)
            if (q.q != 0.5) header.push_back(fmt::format("q{}", q.q));
    header.push_back("stuck squares");
    std::vector<std::vector<std::string>> rows;
    for (const auto& e : entries) {
        const Profile& p = e.profile;
        std::vector<std::string> r{e.option->name, percent(p.p_finish),
                                   std::isfinite(p.mean_turns_given_finish) ? fmt::format("{:.3f}", p.mean_turns_given_finish) : "-",
                                   std::isfinite(p.sd_turns_given_finish) ? fmt::format("{:.3f}", p.sd_turns_given_finish) : "-"};
        std::string median = "-";
        for (const auto& q : p.quantiles)
            if (q.q == 0.5) median = q.resolved ? optional_int(q.turns) : "unresolved";
        r.push_back(median);
        if (any_quantile)
            for (const auto& q : p.quantiles)
                if (q.q != 0.5) r.push_back(q.resolved ? optional_int(q.turns) : "unresolved");
        std::string stuck;
        if (p.stuck_squares.empty()) {
            stuck = "none";
        } else {
            // Squares in board order; the JSON lists them all.
            std::size_t shown = 0;
            for (auto it = p.stuck_squares.begin(); it != p.stuck_squares.end() && shown < 8; ++it, ++shown)
                stuck += (shown ? " " : "") + fmt::format("{}", *it);
            if (p.stuck_squares.size() > 8) stuck += fmt::format(" (+{} more)", p.stuck_squares.size() - 8);
        }
        r.push_back(stuck);
        rows.push_back(std::move(r));
    }
    out += table(header, rows);
    out += "\nmean and sd are over the races that finish; median is null (-) when P(finish) < 50%.\n";
    return out;
}

nlohmann::json profile_json(const Board& board, Order order, const std::vector<ProfileEntry>& entries) {
    nlohmann::json j = document("profile", 1);
    j["board"] = board_json(board, order);
    nlohmann::json opts = nlohmann::json::array();
    for (const auto& e : entries) {
        const Profile& p = e.profile;
        nlohmann::json o;
        o["name"] = e.option->name;
        o["spec"] = e.option->spec;
        o["p_finish"] = p.p_finish;
        o["p_stuck"] = p.p_stuck;
        o["mean_turns_given_finish"] = maybe(p.mean_turns_given_finish);
        o["sd_turns_given_finish"] = maybe(p.sd_turns_given_finish);
        o["median_turns"] = nullptr;
        nlohmann::json qs = nlohmann::json::array();
        for (const auto& q : p.quantiles) {
            if (q.q == 0.5) o["median_turns"] = maybe(q.turns);
            qs.push_back({{"q", q.q}, {"turns", maybe(q.turns)}, {"resolved", q.resolved}});
        }
        o["quantiles"] = qs;
        o["stuck_squares"] = p.stuck_squares;
        o["solve_residual"] = p.residual;
        opts.push_back(o);
    }
    j["options"] = opts;
    return j;
}

std::string distribution_csv(const std::vector<std::pair<const Option*, Distribution>>& ds) {
    std::string out = "option,turn,p,cumulative\n";
    for (const auto& [o, d] : ds) {
        for (const auto& r : d.rows)
            out += fmt::format("{},{},{:.17g},{:.17g}\n", o->name, r.turn, static_cast<double>(r.p),
                               static_cast<double>(r.cumulative));
        out += fmt::format("{},later,{:.17g},\n", o->name, static_cast<double>(d.remaining_finish));
        out += fmt::format("{},never,{:.17g},\n", o->name, static_cast<double>(d.never));
    }
    return out;
}

std::string duel_text(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r) {
    std::string out = describe(board, order) + "\n\n";
    std::vector<std::vector<std::string>> rows{
        {a.name + " wins", percent(static_cast<double>(r.p_a_wins))},
        {b.name + " wins", percent(static_cast<double>(r.p_b_wins))},
        {"tie (shared finish)", percent(static_cast<double>(r.p_tie))},
        {"neither finishes", percent(static_cast<double>(r.p_neither))}};
    out += table({"outcome", "probability"}, rows);
    double m = r.margin();
    out += "\n";
    if (r.a_beats_b())
        out += fmt::format("{} beats {} by {:.4f} points of probability.\n", a.name, b.name, 100 * m);
    else if (r.b_beats_a())
        out += fmt::format("{} beats {} by {:.4f} points of probability.\n", b.name, a.name, -100 * m);
    else
        out += fmt::format("{} and {} are undecided: the margin {:.3g} is within the error bound.\n", a.name, b.name, m);
    out += fmt::format("error bound on the margin: {:.2g} ({}, method {})\n", r.error_bound(),
                       r.bound_proven ? (r.target_met ? "proven" : "proven, target not reached within the work limit")
                                      : "estimated, not proven",
                       r.method);
    if (std::isfinite(r.mean_rounds))
        out += fmt::format("race length: mean {:.3f} rounds to the first finish, median {}\n", r.mean_rounds,
                           r.median_resolved ? optional_int(r.median_rounds) : "unresolved");
    else
        out += "race length: no piece can ever finish\n";
    if (r.error_bound() > 1e-12)
        out += fmt::format("note: the target bound 1e-12 was not reached; {:.2g} is the bound proven.\n",
                           r.error_bound());
    return out;
}

nlohmann::json duel_json(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r) {
    nlohmann::json j = document("duel", 1);
    j["board"] = board_json(board, order);
    j["a"] = {{"name", a.name}, {"spec", a.spec}};
    j["b"] = {{"name", b.name}, {"spec", b.spec}};
    j["p_a_wins"] = static_cast<double>(r.p_a_wins);
    j["p_b_wins"] = static_cast<double>(r.p_b_wins);
    j["p_tie"] = static_cast<double>(r.p_tie);
    j["p_neither"] = static_cast<double>(r.p_neither);
    j["margin"] = r.margin();
    j["error_bound"] = r.error_bound();
    j["probability_error_bound"] = static_cast<double>(r.bound);
    j["bound_proven"] = r.bound_proven;
    j["target_met"] = r.target_met;
    j["method"] = r.method;
    j["mean_rounds"] = maybe(r.mean_rounds);
    j["median_rounds"] = r.median_resolved ? maybe(r.median_rounds) : nlohmann::json(nullptr);
    j["median_resolved"] = r.median_resolved;
    return j;
}

}  // namespace overshoot::render
