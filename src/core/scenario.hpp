#pragma once
// A scenario file (TOML): board, race rules and named options. Every field is
// optional so that command-line flags can fill in or override it.
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "core/board.hpp"

namespace overshoot {

struct NamedSpec {
    std::string name;
    std::string spec;
};

struct Scenario {
    std::string source;  // file name, for messages
    std::optional<int> length;
    std::optional<Overshoot> rule;
    std::optional<std::vector<Jump>> jumps;
    std::optional<Order> order;
    std::vector<NamedSpec> options;  // in file order
    // [head_starts]: option name -> start square, in file order.
    std::vector<std::pair<std::string, int>> head_starts;
};

// Loads and validates the keys and value types (not the board: that is
// make_board's job once flags are merged). Throws InputError "FILE:LINE:COL: ...".
Scenario load_scenario(const std::string& path);
Scenario parse_scenario(std::string_view text, const std::string& source);

}  // namespace overshoot
