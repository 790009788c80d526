#include "render/profile.hpp"

#include <fmt/format.h>

#include <cmath>

#include "render/document.hpp"
#include "render/format.hpp"

namespace overshoot::render {

std::string profile_text(const Board& board, Order order, const std::vector<ProfileEntry>& entries) {
    (void)order;  // profiles do not depend on the turn order
    std::string out = describe_board(board) + "\n\n";
    // The mean and sd count only finishing races; the median and quantiles count
    // every race, one that never finishes as infinitely long (docs/guide.md).
    std::vector<std::string> header{"option", "P(finish)", "mean turns (finishers)", "sd (finishers)",
                                    "median (all races)"};
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
        std::vector<std::string> r{e.option->name, finish_chance(p.p_finish),
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
    out += "\nThe mean and sd count only the races that finish. The median and quantiles count every race, one that\n"
           "never finishes as infinitely long: they are - when P(finish) is below the quantile.\n";
    bool any_certain = false;
    for (const auto& e : entries) any_certain = any_certain || e.profile.p_finish == 1;
    if (any_certain)
        out += "100% (certain): no stuck square can be reached, so the piece finishes with probability exactly 1.\n";
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
        o["mean_turns_given_finish"] = number_or_null(p.mean_turns_given_finish);
        o["sd_turns_given_finish"] = number_or_null(p.sd_turns_given_finish);
        o["median_turns"] = nullptr;
        nlohmann::json qs = nlohmann::json::array();
        for (const auto& q : p.quantiles) {
            if (q.q == 0.5) o["median_turns"] = number_or_null(q.turns);
            qs.push_back({{"q", q.q}, {"turns", number_or_null(q.turns)}, {"resolved", q.resolved}});
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
        const std::string name = csv_cell(o->name);
        for (const auto& r : d.rows)
            out += fmt::format("{},{},{:.17g},{:.17g}\n", name, r.turn, static_cast<double>(r.p),
                               static_cast<double>(r.cumulative));
        out += fmt::format("{},later,{:.17g},\n", name, static_cast<double>(d.remaining_finish));
        out += fmt::format("{},never,{:.17g},\n", name, static_cast<double>(d.never));
    }
    return out;
}

}  // namespace overshoot::render
