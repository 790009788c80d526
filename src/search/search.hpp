#pragma once
// Board search: changes to a board (added jumps, head starts, the length
// within a range) that make a tournament of the given options meet a target:
//   cycle      a named cycle A > B > C > A holds, as strong as possible;
//   no-winner  no option beats every other (no Condorcet winner);
//   top-cycle  every option is in the top cycle (Smith set);
//   fair       the largest |margin| over all pairs is as small as possible.
// A change is one added jump or one option's start square moved off the
// board's own (a head start on a square 1..H). Every board with at most one
// change is raced (exhaustive); head starts alone (no added jump) are searched
// over every assignment of 0..H to every option when that grid is small;
// anything more by a seeded beam search (docs/search.md) that is
// deterministic for a seed and is a search, not a proof of optimality. Every reported board is raced again by the duel engine
// (automatic method, proven bounds) and analysed as `tournament` would.
#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"
#include "search/target.hpp"
#include "tournament/tournament.hpp"

namespace overshoot {

struct SearchSpec {
    Board board;                    // the board the changes are made to
    Order order = Order::simultaneous;
    std::vector<Option> options;
    SearchTarget target = SearchTarget::cycle;
    std::vector<std::size_t> cycle;  // for the target cycle
    int max_jumps = 1;               // added jumps: 0..max_jumps
    std::vector<int> from_squares;   // allowed jump sources (empty: any)
    std::vector<int> to_squares;     // allowed jump targets (empty: any)
    int length_lo = 0, length_hi = 0;  // lengths searched (0, 0: the board's length only)
    std::vector<int> starts;         // the board's own start squares, one per option (empty: all 0)
    int head_start_max = 0;          // > 0: any option may start on a square 0..head_start_max
    int keep = 5;                    // boards listed (the best, then runners-up)
    std::uint64_t seed = 1;          // several jumps: the beam's sampling
    int beam = 8;                    // several jumps: boards kept per level
    int sample = 1500;               // several jumps: jumps tried per beam board and level
    int threads = 0;                 // 0: every core; same result for any count
};

// One board of the search: its added jumps and its score (higher is better;
// see score_of). `holds` is the target checked on the verified analysis.
struct FoundBoard {
    Board board;                 // the whole board, ready for `tournament` or `certify`
    std::vector<Jump> added;     // the jumps the search added, by source square
    std::vector<int> starts;     // one start square per option (as given; 0: none)
    double score = 0;            // from the verified races
    bool holds = false;          // the target holds with proven margins
    Tournament verified;         // race_matrix (automatic method) + analyse
};

struct SearchResult {
    SearchTarget target = SearchTarget::cycle;
    bool exhaustive = true;          // false when the beam search ran
    bool start_grid = false;         // every assignment of head starts 0..H was raced
    std::uint64_t boards_raced = 0;  // candidate boards evaluated
    std::uint64_t boards_invalid = 0;  // candidate jumps refused (a loop of jumps)
    std::vector<int> lengths;        // lengths searched
    std::optional<FoundBoard> base;  // the unchanged board (the first length), verified
    std::vector<FoundBoard> best;    // best first, then runners-up
};

// Throws InputError for an empty space, a bad cycle, or an unknown square.
SearchResult search_board(const SearchSpec& spec);

}  // namespace overshoot
