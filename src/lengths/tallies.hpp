#pragma once
// Per-distance tallies of the ordered races of one pair (simultaneous, A
// first, B first) and their combination into the requested turn order.
// Internal to src/lengths/.
#include <vector>

#include "core/board.hpp"
#include "lengths/lengths.hpp"

namespace overshoot::lengths_engine {

// P(A wins), P(B wins), P(tie) per starting distance 0..L of one ordered race.
struct Tallies {
    std::vector<double> win, loss, tie;
    void init(int L) {
        win.assign(L + 1, 0);
        loss.assign(L + 1, 0);
        tie.assign(L + 1, 0);
    }
};

// Combines the ordered races of one pair into the requested order.
std::vector<LengthOutcome> combine(Order order, int L, const Tallies& sim, const Tallies& af, const Tallies& bf,
                                   const std::vector<double>& neither, const std::vector<double>& bound);

}  // namespace overshoot::lengths_engine
