#pragma once
// Profiles of options (how long one piece takes alone): text for people, JSON
// for programs, CSV for the distribution of finishing turns.
#include <nlohmann/json.hpp>

#include <string>
#include <utility>
#include <vector>

#include "chain/profile.hpp"
#include "core/board.hpp"
#include "core/option.hpp"

namespace overshoot::render {

struct ProfileEntry {
    const Option* option;
    Profile profile;
};

std::string profile_text(const Board& board, Order order, const std::vector<ProfileEntry>& entries);
nlohmann::json profile_json(const Board& board, Order order, const std::vector<ProfileEntry>& entries);
std::string distribution_csv(const std::vector<std::pair<const Option*, Distribution>>& d);

}  // namespace overshoot::render
