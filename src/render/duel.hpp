#pragma once
// One duel: text for people, JSON for programs, Markdown and LaTeX for
// documents. With an exact result its sign decides the verdict.
#include <nlohmann/json.hpp>

#include <string>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"
#include "race/exact.hpp"

namespace overshoot::render {

// starts: the start squares of A and B (empty: both on 0); exact: the exact
// duel when it was asked for.

std::string duel_text(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                      const std::vector<int>& starts = {}, const ExactDuel* exact = nullptr);
nlohmann::json duel_json(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                         const std::vector<int>& starts = {}, const ExactDuel* exact = nullptr);
std::string duel_markdown(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                          const std::vector<int>& starts = {}, const ExactDuel* exact = nullptr);
std::string duel_latex(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                       const std::vector<int>& starts = {}, const ExactDuel* exact = nullptr);

}  // namespace overshoot::render
