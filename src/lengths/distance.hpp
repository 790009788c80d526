#pragma once
// The all-lengths engine's model of one option: distance coordinates 1..L
// (0 = finished) on a jump-free board, with what the series and the diagonal
// programme need per distance (docs/sweep.md). Internal to src/lengths/.
#include <limits>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"

namespace overshoot::lengths_engine {

constexpr double unit_d = std::numeric_limits<double>::epsilon() / 2;
inline double gamma_d(double n) { return n * unit_d / (1 - n * unit_d); }

// Thrown inside the engine when the caller's cancel flag is set.
struct Cancelled {};

// One option in distance coordinates 1..max_length (0 = finished). Distances
// up to `zone` = min(max_length, max_move) have explicit rows from the chain;
// beyond that every move m >= 1 lands on d - m and a move of 0 is a turn in place.
struct DistanceModel {
    int max_length = 0, max_move = 0, zone = 0;
    double p_zero = 0;             // probability of a move of 0
    std::vector<int> moves;        // moves >= 1 with weight
    std::vector<double> move_p;    // their probabilities
    std::vector<int> zone_row;     // zone rows: entries zone_row[d]..zone_row[d+1]-1 for d in 1..zone
    std::vector<int> zone_to;      // destination distance (0 = finish), never d itself
    std::vector<double> zone_p;
    std::vector<double> stay, leave, no_finish;  // per distance 0..max_length
    std::vector<double> p_ever, p_never;         // P(ever finish), P(never finish)
    double ever_never_error = 0;   // relative error of p_ever and p_never
    int row_terms = 1;             // most terms in one row, self included
    double mean = 1, variance = 0;
    double tail_rate = 1e300;      // -log of the largest stay on a square that can still finish
};

DistanceModel build_distance_model(const Option& o, Overshoot rule, int L);

// (df, dg) = P (sf, sg) on distances lo..top (P: one turn, finishing mass dropped).
void step_two(const DistanceModel& o, const double* sf, const double* sg, double* df, double* dg, int lo, int top);

}  // namespace overshoot::lengths_engine
