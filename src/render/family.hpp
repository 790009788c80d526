#pragma once
// Renderers for the options a family makes (`overshoot family`): a table for
// people, JSON with every distribution for programs.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "core/option.hpp"

namespace overshoot::render {

struct FamilyView {
    const std::vector<std::string>* items;  // the family words as typed
    const std::vector<Option>* options;     // after merging
    std::size_t merged = 0;                 // options dropped as equal to an earlier one
};

std::string family_text(const FamilyView& v);
nlohmann::json family_json(const FamilyView& v);

}  // namespace overshoot::render
