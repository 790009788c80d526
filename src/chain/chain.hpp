#pragma once
// The Markov chain of one option on one board: where a piece on each square can
// be after one turn. Squares 0..length-1 are live; `length` is the finish.
#include <cstdint>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"

namespace overshoot {

struct Chain {
    int length = 0;          // N; destination N means "finished"
    std::uint64_t denominator = 1;
    bool forward_only = false;
    int max_move = 0;
    // Where the piece begins: 0, or a head start (after its jump, if any).
    // Every engine starts this option's piece here.
    int start = 0;

    // Row s lists the distinct destinations of one turn from square s (merged
    // weights), including s itself when the turn can end in place.
    std::vector<std::int64_t> row_start;  // size N+1
    std::vector<int> dest;
    std::vector<std::uint64_t> weight;    // exact, over `denominator`
    std::vector<long double> prob;        // weight / denominator
    std::vector<double> prob_d;           // the same, rounded to double (fast paths)

    // Per square, exact integer weights of the three fates of one turn.
    std::vector<std::uint64_t> stay_weight;    // back on s
    std::vector<std::uint64_t> finish_weight;  // reaches N
    std::vector<long double> stay;             // stay_weight / denominator
    std::vector<long double> leave;            // (denominator - stay_weight) / denominator, exact
    std::vector<long double> finish;           // finish_weight / denominator

    std::vector<char> stuck;    // 1 when the finish cannot be reached from s
    std::vector<char> resting;  // 0 for jump sources: no piece ever rests there
    std::vector<char> row_stays_live;  // 1 when no destination of the row is the finish or stuck
    int max_in_degree = 0;    // most sources feeding one destination (rounding bound)

    // The plain block: from every square below plain_end each move lands on the
    // board before any jump, so one turn there is the convolution of the masses
    // with the move distribution, followed by the redirections below. The series
    // steps it as one vectorised multiply-add per move.
    int plain_end = 0;                    // max(0, length - max_move)
    std::vector<long double> move_prob;   // option weight[m] / denominator, m = 0..max_move
    std::vector<double> move_prob_d;      // the same, rounded to double
    // Landing squares where mass does not rest: jump sources (to: the square
    // after the jumps, or length for the finish) and stuck squares (to: -1).
    struct Redirect {
        int from = 0, to = 0;
    };
    std::vector<Redirect> redirects;      // sorted by `from`
    int max_in_moves = 0;  // most (square, move) pairs feeding one destination: the
                           // terms of one sum when moves are applied one at a time

    int rows() const { return length; }
};

// Where one move of `move` squares from `square` ends, after the overshoot
// rule and jumps (the finish is `length`).
int move_destination(const Board& board, int square, int move);

// Builds the chain; throws LimitError when its size would exceed the memory cap.
// `start` is the piece's start square as given (resolve_start validates it).
Chain build_chain(const Board& board, const Option& option, int start = 0);

// Bytes build_chain would allocate (an upper estimate), for refusing early.
std::uint64_t chain_memory_estimate(const Board& board, const Option& option);

// Squares from which the finish is unreachable (Boost.Graph reverse search).
std::vector<int> stuck_squares(const Chain& chain);

// Per square, 1 when no stuck square can be reached from it: in a finite
// chain every such piece finishes with probability exactly 1, a fact of the
// arcs (integers), not of a rounded solve.
std::vector<char> certain_to_finish(const Chain& chain);

}  // namespace overshoot
