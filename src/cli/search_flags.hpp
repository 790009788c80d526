#pragma once
// Flags shared by the search command and the report's search section.
#include <optional>
#include <string>

#include "core/setup.hpp"
#include "search/search.hpp"

namespace overshoot::cli {

// The spec of a board search for the setup's options on its board (with its
// head starts): the target by name (none: cycle when a cycle is given, else
// no-winner) and the cycle as written. `prefix` is how the two flags are
// spelled in messages ("" for --target/--cycle, "search-" for the report's).
SearchSpec search_spec_of(const Setup& setup, const std::optional<std::string>& target,
                          const std::optional<std::string>& cycle, const std::string& prefix);

}  // namespace overshoot::cli
