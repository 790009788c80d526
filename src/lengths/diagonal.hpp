#pragma once
// The time-free pair programme in distance coordinates, keeping only the rows
// it still needs and reading the diagonal (d, d): the duel of one pair on
// every length 1..L (docs/sweep.md). Internal to src/lengths/.
#include <atomic>
#include <vector>

#include "lengths/distance.hpp"
#include "lengths/lengths.hpp"

namespace overshoot::lengths_engine {

// Every length 1..L of one pair in the requested order; throws Cancelled.
// `vectorised` false: every row cell by cell (the same bits, for timing).
std::vector<LengthOutcome> diagonal_duels(const DistanceModel& A, const DistanceModel& B, Order order, int L,
                                       std::atomic<bool>* cancel, bool vectorised = true);

}  // namespace overshoot::lengths_engine
