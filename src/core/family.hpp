#pragma once
// Option families for hunts: a grammar of our own (docs/sweep.md, "Families").
//
//   family := item { ';' item }
//   item   := COUNT 'd' SIDES        dice: every count with every number of sides
//           | '@' FILE               custom options, one per line
//           | SPEC                   any single option spec (docs/options.md)
//   COUNT  := N | N '..' M           (N defaults to 1 when omitted)
//   SIDES  := S | S '..' T | '{' S { ',' S } '}'
//   FILE   := lines "NAME = SPEC" or "SPEC"; '#' starts a comment
//
// "1..6d{4,6,8,10,12,20}" is the 36 options 1d4, 1d6, ..., 6d20, counts outer.
#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include "core/option.hpp"

namespace overshoot {

inline constexpr std::size_t max_family_size = 2000;

// Expands a family; throws InputError naming the item and the problem.
// Names must come out distinct.
std::vector<Option> parse_family(std::string_view text);

// Several family texts (command-line words), in order.
std::vector<Option> parse_families(const std::vector<std::string>& texts);

}  // namespace overshoot
