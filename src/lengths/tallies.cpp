#include "lengths/tallies.hpp"

#include <utility>

#include "lengths/distance.hpp"
#include "race/outcome.hpp"

namespace overshoot::lengths_engine {

namespace {
// One distance's outcome in seat A's view; `mean` when it averages two races.
struct Cell {
    double win = 0, loss = 0, tie = 0;
    bool mean = false;
};
}  // namespace

std::vector<LengthOutcome> combine(Order order, int L, const Tallies& sim, const Tallies& af, const Tallies& bf,
                                   const std::vector<double>& neither, const std::vector<double>& bound) {
    std::vector<LengthOutcome> out(L + 1);
    for (int d = 1; d <= L; ++d) {
        LengthOutcome& o = out[d];
        o.p_neither = neither[d];
        o.bound = bound[d];
        const Cell c = by_turn_order(
            order,
            [&](bool swapped, bool alternating) {
                if (!alternating) return Cell{sim.win[d], sim.loss[d], sim.tie[d]};
                // bf is the B-first race seen from A: the race with B in seat A is its swap.
                return swapped ? Cell{bf.loss[d], bf.win[d]} : Cell{af.win[d], af.loss[d]};
            },
            [](Cell x) {
                std::swap(x.win, x.loss);
                return x;
            },
            [](const Cell& x, const Cell& y) { return Cell{(x.win + y.win) / 2, (x.loss + y.loss) / 2, 0, true}; });
        o.p_a_wins = c.win;
        o.p_b_wins = c.loss;
        o.p_tie = c.tie;
        if (c.mean) o.bound = bound_after_rounding(o.bound);
    }
    return out;
}

}  // namespace overshoot::lengths_engine
