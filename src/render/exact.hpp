#pragma once
// Rendering of exact duels: fractions with their decimal values.
#include <nlohmann/json.hpp>
#include <string>

#include "core/option.hpp"
#include "race/exact.hpp"

namespace overshoot::render {

// {"p_a_wins": "num/den", "p_b_wins", "p_tie", "p_neither", "margin", "method"}
nlohmann::json exact_duel_json(const ExactDuel& e);
// A table of the reduced fractions and their decimals (12 places).
std::string exact_duel_text(const Option& a, const Option& b, const ExactDuel& e);

}  // namespace overshoot::render
