#pragma once
// One duel: text for people, JSON for programs.
#include <nlohmann/json.hpp>

#include <string>

#include "core/board.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"

namespace overshoot::render {

// starts: the start squares of A and B (empty: both on 0).
std::string duel_text(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                      const std::vector<int>& starts = {});
nlohmann::json duel_json(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                         const std::vector<int>& starts = {});

}  // namespace overshoot::render
