#pragma once
// The targets of a board search: their names, the cycle as written, the score
// of a margin matrix (higher is better) and whether a verified tournament
// meets the target.
#include <cstddef>
#include <string_view>
#include <vector>

#include "core/option.hpp"
#include "tournament/tournament.hpp"

namespace overshoot {

enum class SearchTarget { cycle, no_winner, top_cycle, fair };

std::string_view to_string(SearchTarget t);
SearchTarget parse_search_target(std::string_view text);  // throws InputError

// "A > B > C > A" (the last name repeats the first, or is left out) as option
// indices; throws InputError naming an unknown or repeated name.
std::vector<std::size_t> parse_cycle(std::string_view text, const std::vector<Option>& options);

// The score of a target from a margin matrix (n x n, row minus column):
//   cycle: the smallest margin along the cycle;
//   no-winner: min over options of the largest margin by which another beats it;
//   top-cycle: the largest t such that the arcs with margin >= t make a strongly
//     connected digraph (bottleneck of strong connectivity);
//   fair: minus the largest |margin|.
double score_of(SearchTarget target, const std::vector<std::size_t>& cycle, std::size_t n,
                const std::vector<double>& margin);

// Whether the target holds on a verified tournament: the cycle's arcs are all
// arcs, no Condorcet winner, the top cycle is every option; fair always holds.
bool target_holds(SearchTarget target, const std::vector<std::size_t>& cycle, const Tournament& t);

}  // namespace overshoot
