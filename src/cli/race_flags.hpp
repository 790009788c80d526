#pragma once
// Flags shared by the race, choose and balance commands.
#include <optional>
#include <string>
#include <vector>

#include "cli/arguments.hpp"
#include "cli/common.hpp"
#include "race/several_pieces.hpp"

namespace overshoot::cli {

// The race order comes from --order (simultaneous or seated) or the scenario,
// whose duel orders are refused with a pointer to the two that apply.
RaceOrder race_order_of(const std::optional<std::string>& flag, const BoardFlags& board);

// --start squares, checked to be one per piece (or none).
std::vector<int> parse_starts(const std::vector<int>& squares, std::size_t pieces);

}  // namespace overshoot::cli
