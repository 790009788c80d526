#pragma once
// The time-free pair programme in distance coordinates, keeping only the rows
// it still needs and reading the diagonal (d, d): the duel of one pair on
// every length 1..L (docs/sweep.md). Internal to src/lengths/.
#include <atomic>
#include <vector>

#include "lengths/distance.hpp"
#include "lengths/lengths.hpp"

namespace overshoot::lengths_engine {

// How the programme is run: every row cell by cell (the previous loop, kept
// for timing), in row form (the same bits), or in row form on the zones only,
// closed by the free walk (closure.hpp; falls back to rows where it does not apply).
enum class DiagonalKind { cells, rows, closure };

// Every length 1..L of one pair in the requested order; throws Cancelled.
// `threads` share the closure's work (the same bits for any number).
std::vector<LengthOutcome> diagonal_duels(const DistanceModel& A, const DistanceModel& B, Order order, int L,
                                       std::atomic<bool>* cancel, DiagonalKind kind = DiagonalKind::rows,
                                       int threads = 1);

}  // namespace overshoot::lengths_engine
