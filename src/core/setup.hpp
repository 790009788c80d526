#pragma once
// One board and its options from a scenario file merged with explicit values
// (the command-line flags, or a Python call's keywords): explicit values win,
// and a list of jumps given explicitly replaces the scenario's.
#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
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
    // "NAME:SQUARE" each; present = replaces the scenario's [head_starts].
    std::optional<std::vector<std::string>> head_starts;
    // Commands whose engines start pieces elsewhere than square 0 say so;
    // the others refuse head starts rather than ignore them.
    bool head_starts_allowed = false;
    std::size_t min_options = 1, max_options = 1;
};

struct Setup {
    Board board;
    Order order = Order::simultaneous;
    std::vector<Option> options;
    // One start square per option, as given (0: no head start); a square that
    // is a jump source takes the jump (resolve_start).
    std::vector<int> starts;
    bool has_head_starts() const;
};

// "NAME:SQUARE" -> (NAME, SQUARE); throws InputError.
std::pair<std::string, int> parse_head_start(std::string_view text);

// Resolves each word as a scenario name or a spec, and validates; throws
// InputError with one line naming the problem (and the file, for a scenario's).
Setup resolve_setup(const SetupRequest& request);

}  // namespace overshoot
