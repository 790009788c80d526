#pragma once
// The free walk of one option: the sum S_t of t independent moves. On the
// squares before its first jump and before the finish a piece *is* this walk
// (docs/method.md, section 3.1), so its square after t turns comes from S_t
// without stepping the chain turn by turn: Chernoff bounds on the tails of
// S_t say when the walk is over, binary powering gives its distribution.
#include <cstdint>
#include <optional>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "core/option.hpp"

namespace overshoot {

// Upper bounds (Chernoff) on P(S_t >= d) and P(S_t < d), S_t the sum of t
// moves; any tilt gives a valid bound, the best one is searched for.
long double walk_at_least(const Option& option, long long turns, long long distance);
long double walk_below(const Option& option, long long turns, long long distance);

// The largest t with P(S_t >= distance) <= limit (by the bound above); 0 when
// even one turn may reach it. Null when the walk never moves (mean 0).
std::optional<long long> last_turn_short_of(const Option& option, long long distance, long double limit);
// The smallest t with P(S_t < distance) <= limit; null when the walk never moves.
std::optional<long long> first_turn_past(const Option& option, long long distance, long double limit);

// The first square a piece starting on `start` meets that is not a plain
// square: the first jump source past the start, or the finish.
int first_irregular_square(const Board& board, int start);

// The distribution of S_t on a trimmed window: mass[i] ~ P(S_t = low + i).
// `error` bounds the 1-norm distance to the exact distribution: the rounding
// of every convolution (gamma of its terms, doubled by each later squaring)
// and every trimmed edge (below `trim` per edge per convolution).
template <class Real>
struct BasicWalkMass {
    std::vector<Real> mass;
    long long low = 0;
    long double error = 0;
    std::uint64_t work = 0;  // multiply-adds
};
using WalkMass = BasicWalkMass<double>;
// Real: double (vectorised) or long double (unit roundoff 2^-64, for bounds near 1e-13).
template <class Real = double>
BasicWalkMass<Real> walk_mass(const Option& option, long long turns, double trim);

// The piece of a built chain after `turns` turns, read off its free walk
// (binary powering in long double): masses from square `low` on and the
// 1-norm bound of the walk plus `escape`, which must bound P(S_turns >= f)
// (the caller picks `turns` with last_turn_short_of). Null when nothing is
// left short of f. The options' weights are recovered exactly from the
// chain's move probabilities (den <= 2^62, long double).
struct ChainWalk {
    std::vector<long double> mass;
    int low = 0;
    long double error = 0;
};
Option chain_moves(const Chain& chain);
int first_irregular_square(const Chain& chain);  // past the chain's start
std::optional<ChainWalk> chain_walk(const Chain& chain, long long turns, long double escape);

// A piece's state at the last turn its walk surely stays short of its first
// irregular square (all but `escape` of its mass, by Chernoff): the walk's
// masses from square `from` on, and the chain of the board from `from` on
// (board_from), on which a series starts with BasicSeries(chain, mass, 0,
// turn, error). Null when the walk never moves or nothing is left short of
// the square. Requires a board where pieces never move backward.
template <class Real>
struct JumpedStart {
    Chain chain;
    std::vector<Real> mass;
    int from = 0, turn = 0;
    long double error = 0;  // the walk's bound plus `escape`
    std::uint64_t work = 0;
};
template <class Real>
std::optional<JumpedStart<Real>> jumped_start(const Board& board, const Option& option, int start, long double escape,
                                              double trim);

// The first turn t with P(T <= t) >= level for one piece (T its finishing
// turn), on a board where pieces never move backward: the walk jumps to the
// last turn it surely stays on plain squares, then the series of the board
// from there on (double precision, its bound carried) steps on. `slack` is
// added to the bound of every comparison; a comparison within it leaves the
// turn unresolved, never guessed.
struct LevelTurn {
    std::optional<long long> turn;  // null: the level is never reached
    bool resolved = false;
    std::uint64_t work = 0;  // multiply-adds and transitions
};
LevelTurn first_turn_at_level(const Board& board, const Option& option, int start, long double level,
                              long double slack, std::uint64_t work_limit);

}  // namespace overshoot
