#pragma once
// Option families for hunts: a grammar of our own (docs/sweep.md, "Families").
//
//   family := item { ';' item }
//   item   := COUNT 'd' SIDES        dice: every count with every number of sides
//           | KEYWORD '(' KEY '=' VALUES { ',' KEY '=' VALUES } ')'
//                                    dice sums, custom dice or spinners by
//                                    constraint (core/constraint_family.hpp)
//           | '@' FILE               custom options, one per line
//           | SPEC                   any single option spec (docs/options.md)
//   COUNT  := N | N '..' M           (N defaults to 1 when omitted)
//   SIDES  := S | S '..' T
//   FILE   := lines "NAME = SPEC" or "SPEC"; '#' starts a comment
//
// "dice(count=1..6, sides=4,6,8,10,12,20)" is the 36 options 1d4, 1d6, ...,
// 6d20, counts outer. Braces after 'd' ("1..6d{4,6}", a spelling we used to
// take) are refused with the new spelling: in other dice notations they list
// one die's faces. Options equal as distributions are kept once (the first).
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

struct FamilyOptions {
    std::vector<Option> options;  // in order, each distribution once
    std::size_t merged = 0;       // options dropped as equal to an earlier one
};

// Several family texts (command-line words), in order; equal distributions
// merged; throws InputError for an empty family or a name given twice, and
// LimitError past max_family_size options.
FamilyOptions expand_families(const std::vector<std::string>& texts);
std::vector<Option> parse_families(const std::vector<std::string>& texts);  // expand_families(texts).options

}  // namespace overshoot
