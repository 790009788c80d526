#include "lengths/tallies.hpp"

#include "lengths/distance.hpp"

namespace overshoot::lengths_engine {

std::vector<LengthOutcome> combine(Order order, int L, const Tallies& sim, const Tallies& af, const Tallies& bf,
                                   const std::vector<double>& neither, const std::vector<double>& bound) {
    std::vector<LengthOutcome> out(L + 1);
    for (int d = 1; d <= L; ++d) {
        LengthOutcome& o = out[d];
        o.p_neither = neither[d];
        o.bound = bound[d];
        switch (order) {
            case Order::simultaneous:
                o.p_a_wins = sim.win[d];
                o.p_b_wins = sim.loss[d];
                o.p_tie = sim.tie[d];
                break;
            case Order::a_first:
                o.p_a_wins = af.win[d];
                o.p_b_wins = af.loss[d];
                break;
            case Order::b_first:
                o.p_a_wins = bf.win[d];
                o.p_b_wins = bf.loss[d];
                break;
            case Order::coin:
                o.p_a_wins = (af.win[d] + bf.win[d]) / 2;
                o.p_b_wins = (af.loss[d] + bf.loss[d]) / 2;
                o.bound = bound_after_rounding(o.bound);
                break;
        }
    }
    return out;
}

}  // namespace overshoot::lengths_engine
