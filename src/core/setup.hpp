#pragma once
// One board and its options from a scenario file merged with explicit values
// (the command-line flags, or a Python call's keywords): explicit values win,
// and a list of jumps given explicitly replaces the scenario's.
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"

namespace overshoot {

struct SetupRequest {
    std::optional<int> length;
    std::optional<std::string> overshoot;            // "stay", "bounce" or "pass"
    std::optional<std::vector<std::string>> jumps;   // "FROM:TO" each; present = replaces the scenario's
    std::optional<std::string> order;                // "simultaneous", "a-first", "b-first" or "coin"
    std::optional<std::string> scenario;             // a TOML scenario file
    std::vector<std::string> words;                  // scenario option names or specs; none = the scenario's
    std::size_t min_options = 1, max_options = 1;
};

struct Setup {
    Board board;
    Order order = Order::simultaneous;
    std::vector<Option> options;
};

// Resolves each word as a scenario name or a spec, and validates; throws
// InputError with one line naming the problem (and the file, for a scenario's).
Setup resolve_setup(const SetupRequest& request);

}  // namespace overshoot
