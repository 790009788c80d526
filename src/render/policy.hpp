#pragma once
// Words and figures for optimal policies: text tables, JSON and the policy
// map (one colour per option over both pieces' distances).
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "policy/alone.hpp"
#include "policy/duel_policy.hpp"
#include "render/svg.hpp"

namespace overshoot::render {

struct AlonePolicyView {
    const Board* board = nullptr;
    const std::vector<Option>* menu = nullptr;
    const AlonePolicy* result = nullptr;
};

// `against` holds B's options: one for a fixed opponent, several for a menu.
struct DuelPolicyView {
    const Board* board = nullptr;
    Order order = Order::simultaneous;
    const std::vector<Option>* menu = nullptr;
    const std::vector<Option>* against = nullptr;
    const PolicyComparison* result = nullptr;
    bool state_values = false;  // JSON: the goal's value at every state too
    int figure_distance = 0;    // the map shows distances 1..this (0: the whole board)
};

std::string alone_policy_text(const AlonePolicyView& v);
nlohmann::json alone_policy_json(const AlonePolicyView& v);
std::string duel_policy_text(const DuelPolicyView& v);
nlohmann::json duel_policy_json(const DuelPolicyView& v);

// A's choice on every pair of distances (x: B's distance, y: A's distance),
// one colour per option, pale where another option is as good or the choice
// is mixed; the legend names the options.
svg::Element policy_figure(const DuelPolicyView& v);
// The report's section: the outcomes table, the map and the caution.
std::string policy_section_html(const DuelPolicyView& v);

// The alone policies: one band per policy along the distance.
svg::Element alone_policy_figure(const AlonePolicyView& v);

}  // namespace overshoot::render
