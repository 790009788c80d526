#pragma once
// Renderers for profiles and duels: text for people, JSON for programs, CSV
// for distributions.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "chain/profile.hpp"
#include "core/board.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"

namespace overshoot::render {

inline constexpr const char* version = OVERSHOOT_VERSION;

// The fields every JSON document starts with.
nlohmann::json document(const std::string& kind, int schema_version);
nlohmann::json board_json(const Board& board, Order order);

struct ProfileEntry {
    const Option* option;
    Profile profile;
};

std::string profile_text(const Board& board, Order order, const std::vector<ProfileEntry>& entries);
nlohmann::json profile_json(const Board& board, Order order, const std::vector<ProfileEntry>& entries);
std::string distribution_csv(const std::vector<std::pair<const Option*, Distribution>>& d);


std::string duel_text(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r);
nlohmann::json duel_json(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r);

}  // namespace overshoot::render
