#pragma once
// Rendering of exact duels: fractions with their decimal values.
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "core/option.hpp"
#include "race/exact.hpp"

namespace overshoot::render {

// {"p_a_wins": "num/den", "p_b_wins", "p_tie", "p_neither", "margin", "method"}
nlohmann::json exact_duel_json(const ExactDuel& e);
// A table of the reduced fractions and their decimals (12 places); a and b
// are the names shown for the two seats.
std::string exact_duel_text(const std::string& a, const std::string& b, const ExactDuel& e);

// {"method", "wins": [[P(row beats column) as "num/den", null on the diagonal]],
//  "margins": [[...]]} for a tournament's options, in input order.
nlohmann::json exact_matrix_json(const std::vector<std::optional<ExactDuel>>& m, std::size_t n);

}  // namespace overshoot::render
