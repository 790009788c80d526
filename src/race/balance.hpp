#pragma once
// Balancing a board for designers: head starts, lengths and a single jump that
// make a race of several options as fair as possible. Fairness of a race is
// its largest deviation from equal chances: max_i |p_i - mean_j p_j|, p_i the
// chance that piece i finishes first alone (docs/races.md).
#include <cstdint>
#include <optional>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "race/several_pieces.hpp"

namespace overshoot {

long double deviation(const RaceResult& r);

// Boards longer than this are refused by the jump search (it tries every jump).
inline constexpr int max_jump_search_length = 80;

struct StartAssignment {
    std::vector<int> starts;  // one start square per option (as given, before jumps)
    long double deviation = 0;
    RaceResult race;
};

struct HeadStartResult {
    int lo = 0, hi = 0;                   // start squares searched
    std::vector<StartAssignment> best;    // fairest first, then runner-ups
    StartAssignment from_zero;            // everybody on square 0, for comparison
    std::uint64_t assignments = 0;        // (hi - lo + 1)^k
    std::uint64_t evaluated = 0;          // complete assignments raced
    std::uint64_t pruned = 0;             // partial assignments cut by the bound
};

// Exact search over start squares lo..hi for each of the cache's options (one
// piece per option, in order), keeping the `keep` fairest assignments.
HeadStartResult balance_starts(RaceCache& cache, int options, int lo, int hi, int keep = 5,
                               bool prune = true);

struct LengthFairness {
    int length = 0;
    long double deviation = 0;
    RaceResult race;
};

struct LengthsResult {
    std::vector<LengthFairness> lengths;  // every length in the range, in order
    std::vector<int> fairest;             // indices into lengths, fairest first (up to keep)
};

// The race of the options (from square 0) at every length lo..hi with the
// board's rule and jumps (every jump must fit the shortest length).
LengthsResult balance_lengths(const Board& board, const std::vector<Option>& options, RaceOrder order, int lo, int hi,
                              int keep = 5);

struct JumpCandidate {
    Jump jump;
    long double deviation = 0;
    RaceResult race;
    std::optional<int> dominant;  // the option that beats every other in duels after the change
};

struct JumpSearchResult {
    long double base_deviation = 0;
    RaceResult base_race;
    std::optional<int> dominant_before;
    std::vector<JumpCandidate> fairest;            // the fairest single jumps, best first
    std::vector<JumpCandidate> removing_dominant;  // fairest jumps after which no option dominates (when one did)
    std::uint64_t tried = 0;                       // valid boards raced
    long double bound = 0;                         // largest race bound seen
};

// Every single jump FROM:TO added to the board (FROM not already a jump
// source, no loop): the race and the duels of all pairs. Needs
// board.length <= max_jump_search_length.
JumpSearchResult search_jumps(const Board& board, const std::vector<Option>& options, RaceOrder order, int keep = 5);

// The option that beats every other option in its duel (simultaneous order for
// simultaneous races, coin order for seated ones), if any.
std::optional<int> dominant_option(const std::vector<Chain>& chains, RaceOrder order);

}  // namespace overshoot
