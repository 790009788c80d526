#include "render/exact.hpp"

#include <fmt/format.h>

#include "core/fraction.hpp"

namespace overshoot::render {

nlohmann::json exact_duel_json(const ExactDuel& e) {
    return {{"p_a_wins", fraction_string(e.p_a_wins)}, {"p_b_wins", fraction_string(e.p_b_wins)},
            {"p_tie", fraction_string(e.p_tie)},       {"p_neither", fraction_string(e.p_neither)},
            {"margin", fraction_string(e.margin())},   {"method", to_string(e.method)}};
}

std::string exact_duel_text(const std::string& a, const std::string& b, const ExactDuel& e) {
    std::string out = fmt::format("\nexact values ({}):\n", to_string(e.method));
    auto line = [&](const std::string& what, const mpq_class& q) {
        out += fmt::format("  {:<24} {}  = {}\n", what, decimal_string(q, 12), fraction_string(q));
    };
    line(a + " wins", e.p_a_wins);
    line(b + " wins", e.p_b_wins);
    line("tie (shared finish)", e.p_tie);
    line("neither finishes", e.p_neither);
    line("margin (A wins - B wins)", e.margin());
    return out;
}

nlohmann::json exact_matrix_json(const std::vector<std::optional<ExactDuel>>& m, std::size_t n) {
    nlohmann::json wins = nlohmann::json::array(), margins = nlohmann::json::array();
    std::string method;
    for (std::size_t i = 0; i < n; ++i) {
        nlohmann::json w = nlohmann::json::array(), g = nlohmann::json::array();
        for (std::size_t j = 0; j < n; ++j) {
            const auto& e = m[i * n + j];
            w.push_back(e ? nlohmann::json(fraction_string(e->p_a_wins)) : nlohmann::json(nullptr));
            g.push_back(e ? nlohmann::json(fraction_string(e->margin())) : nlohmann::json(nullptr));
            if (e && method.empty()) method = to_string(e->method);
        }
        wins.push_back(w);
        margins.push_back(g);
    }
    return {{"method", method}, {"wins", wins}, {"margins", margins}};
}

}  // namespace overshoot::render
