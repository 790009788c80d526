#pragma once
// What every JSON document shares: the schema line and the tool's version,
// the board, and numbers that may be missing.
#include <nlohmann/json.hpp>

#include <optional>
#include <string>
#include <vector>

#include "core/board.hpp"

namespace overshoot::render {

inline constexpr const char* version = OVERSHOOT_VERSION;

// The fields every JSON document starts with.
nlohmann::json document(const std::string& kind, int schema_version);
nlohmann::json board_json(const Board& board, Order order);

// The board in words: "board of 100 squares, overshoot stay, simultaneous
// turns, jumps 3->11 27->9"; without the order for what does not depend on it
// (profiles); the jumps alone ("no jumps" or "jumps 3->11 27->9").
std::string describe(const Board& board, Order order);
std::string describe_board(const Board& board);
std::string jumps_text(const std::vector<Jump>& jumps);

// Head starts (one start square per name; 0: none): {"name": square} of the
// nonzero ones, and the same in words ("head starts: bold on 4"; empty when none).
nlohmann::json head_starts_json(const std::vector<std::string>& names, const std::vector<int>& starts);
std::string head_starts_text(const std::vector<std::string>& names, const std::vector<int>& starts);
bool any_head_start(const std::vector<int>& starts);

// A number, or null when it is not finite / not there.
nlohmann::json number_or_null(double x);
nlohmann::json number_or_null(const std::optional<long long>& v);

}  // namespace overshoot::render
