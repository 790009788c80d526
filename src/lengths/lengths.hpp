#pragma once
// The all-lengths engine: duels of every pair of options on every board length
// 1..L at once, for boards without jumps under the rules stay or pass. On such
// boards the race from distances (a, b) to the finish does not depend on the
// length, so the duel on a board of length d is the race from (d, d).
//
// Two methods (docs/sweep.md gives the formulas, the bounds and the measured
// costs that pick between them):
//   series: backward per-turn series over every starting distance at once.
//           Each option carries f_t(d) = P(T = t | d) and G_t(d) = P(t < T < inf | d)
//           (both subtraction-free); a pair accumulates f^A_t S^B_t per start.
//           A start is closed once G^A_t G^B_t is below the target: what is left
//           is known exactly up to that product (stuck pieces are exact).
//           Options are stepped once per turn and shared by every pair.
//   pairs:  the time-free pair programme in distance coordinates, keeping only
//           the rows it still needs and reading the diagonal (d, d).
// Boards with jumps or the rule bounce go one length at a time through duel().
#include <atomic>
#include <cstddef>
#include <functional>
#include <string>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "lengths/method.hpp"

namespace overshoot {

// One duel on one length. Each probability lies within `bound` of its true value.
struct LengthOutcome {
    double p_a_wins = 0, p_b_wins = 0, p_tie = 0, p_neither = 0;
    double bound = 0;
    double margin() const { return p_a_wins - p_b_wins; }
    double error_bound() const { return 2 * bound; }
};

struct PairRequest {
    std::size_t a = 0, b = 0;
};

struct PairLengths {
    std::size_t a = 0, b = 0;
    LengthMethod method = LengthMethod::series;  // series, pairs, closure, zone_tail or board
    int tail_from = 0;  // zone_tail: the first length the zone tail gives (the series gives those below)
    bool done = false;                 // false when cancelled before it finished
    std::vector<LengthOutcome> by_length;  // index: length (0 unused), up to max_length
};

// True when the all-lengths engine applies: no jumps and a rule other than bounce.
bool all_lengths_applies(Overshoot rule, bool has_jumps);

// Duels of each requested pair (A = options[a], B = options[b]) on every length
// 1..max_length. `on_done` (may be empty) is called once per finished pair, from
// any thread but never two at once. Same bytes whatever the thread count.
std::vector<PairLengths> all_lengths(const std::vector<Option>& options, Overshoot rule, Order order,
                                     int max_length, const std::vector<PairRequest>& pairs,
                                     const LengthSettings& settings = {},
                                     const std::function<void(const PairLengths&)>& on_done = {});

// Where jumps stay when the length changes: at the same squares counted from
// the start, or at the same distances from the finish (given on the board of
// length `reference`, the longest of the sweep).
enum class JumpAnchor { start, finish };

// The jumps of a board of length `length`; jumps that no longer fit on it are
// left out (docs/sweep.md).
std::vector<Jump> anchored_jumps(const std::vector<Jump>& jumps, JumpAnchor anchor, int reference, int length);

// Board by board: for each listed length, duel() of every requested pair on the
// board with the anchored jumps, lengths spread over threads. The jumps are
// given on the board of length `reference` (0: the longest listed length; a
// hunt's block of lengths passes the longest of the whole hunt).
std::vector<PairLengths> board_by_board(const std::vector<Option>& options, Overshoot rule, Order order,
                                        const std::vector<Jump>& jumps, JumpAnchor anchor,
                                        const std::vector<int>& lengths, const std::vector<PairRequest>& pairs,
                                        const LengthSettings& settings = {}, int reference = 0);

// The same through duel_matrix, one length at a time (its threads inside):
// every option's series is run once per length and shared by all pairs, which
// is far cheaper when many pairs share a board (a hunt on a board with jumps).
// Every option is raced whatever pairs are asked, so a pair's numbers do not
// depend on the request.
std::vector<PairLengths> board_by_board_matrix(const std::vector<Option>& options, Overshoot rule, Order order,
                                               const std::vector<Jump>& jumps, JumpAnchor anchor,
                                               const std::vector<int>& lengths, const std::vector<PairRequest>& pairs,
                                               const LengthSettings& settings = {}, int reference = 0);

JumpAnchor parse_anchor(std::string_view text);

}  // namespace overshoot
