#include "render/duel.hpp"

#include <fmt/format.h>

#include <cmath>

#include "render/document.hpp"
#include "render/format.hpp"

namespace overshoot::render {

std::string duel_text(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                      const std::vector<int>& starts) {
    std::string out = describe(board, order) + "\n";
    if (any_head_start(starts)) out += head_starts_text({a.name, b.name}, starts) + "\n";
    out += "\n";
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
                       to_string(r.method));
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

nlohmann::json duel_json(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                         const std::vector<int>& starts) {
    nlohmann::json j = document("duel", 1);
    j["board"] = board_json(board, order);
    if (any_head_start(starts)) j["board"]["head_starts"] = head_starts_json({a.name, b.name}, starts);
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
    j["method"] = to_string(r.method);
    j["mean_rounds"] = number_or_null(r.mean_rounds);
    j["median_rounds"] = r.median_resolved ? number_or_null(r.median_rounds) : nlohmann::json(nullptr);
    j["median_resolved"] = r.median_resolved;
    return j;
}

}  // namespace overshoot::render
