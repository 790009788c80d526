#pragma once
// The diagonal pair programme written row by row (docs/sweep.md, "Row form").
// Where the first piece's stay probability at distance a is exactly 0 (every
// row outside its end zone for dice), the self-loop term vanishes and row a of
// the programme is a sum of earlier rows, scaled (the first piece's moves),
// then a sum of shifted copies of itself (the second piece's moves): contiguous
// multiply-adds, vectorised with run-time dispatch (any x86-64). Rows where the
// piece may stay keep the closed-form self-loop, cell by cell. Each lane adds
// the same terms in the same order as the cell-by-cell loop, so the results
// are the same bits. Internal to src/lengths/.
#include <atomic>
#include <cstdint>
#include <vector>

#include "lengths/distance.hpp"

namespace overshoot::lengths_engine {

// How the rows of one run were done, and its multiply-adds.
struct RowCounts {
    std::uint64_t vector_rows = 0, scalar_rows = 0, multiply_adds = 0;
};

// The end-zone closure's strip (closure.cpp, docs/sweep.md): the programme
// only on R = {a <= za} u {b <= zb} (za, zb: the pieces' zones), and on the
// free cells next to R the value phi of one round that lands in R (what the
// programme computes there when every free cell counts 0). phi rows hold
// x in (za, 2za], y in (zb, L], reversed: row_w[(x - za - 1) * (L + 1) + L - y];
// phi columns hold x in (2za, L], y in (zb, 2zb]: col_w[(y - zb - 1) * (L + 1) + L - x].
// Needs both pieces without a move of 0 (no stay on a free square).
struct Strip {
    int za = 0, zb = 0;
    int width = 0, last_row = 0;  // the columns and rows the closure reads (at most L)
    std::vector<double> row_w, row_l, col_w, col_l;
};

// Win and loss of every diagonal start (d, d), d = 1..L, of the ordered race
// (A first when a_first, else simultaneous); dw and dl have L + 1 entries.
// `vectorised` false runs every row cell by cell (the previous loop, kept to
// be timed side by side). Throws Cancelled.
// With a strip, rows beyond za are done only where R and phi need them, and
// dw, dl are set only for starts inside R (d <= za or d <= zb).
RowCounts diagonal_rows(const DistanceModel& A, const DistanceModel& B, bool a_first, int L, double* dw, double* dl,
                        bool vectorised, std::atomic<bool>* cancel, Strip* strip = nullptr);

}  // namespace overshoot::lengths_engine
