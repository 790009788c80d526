#include "lengths/tallies.hpp"

#include "lengths/distance.hpp"

namespace overshoot::lengths_engine {

std::vector<LengthOutcome> combine(Order order, int L, const Tallies& sim, const Tallies& af, const Tallies& bf,
                                   const std::vector<double>& neither, const std::vector<double>& bound) {
    std::vector<LengthOutcome> out(L + 1);
    for (int d = 1; d <= L; ++d) {
        LengthOutcome& o = out[d];
        o.neither = neither[d];
        o.bound = bound[d];
        switch (order) {
            case Order::simultaneous:
                o.win = sim.win[d];
                o.loss = sim.loss[d];
                o.tie = sim.tie[d];
                break;
            case Order::a_first:
                o.win = af.win[d];
                o.loss = af.loss[d];
                break;
            case Order::b_first:
                o.win = bf.win[d];
                o.loss = bf.loss[d];
                break;
            case Order::coin:
                o.win = (af.win[d] + bf.win[d]) / 2;
                o.loss = (af.loss[d] + bf.loss[d]) / 2;
                o.bound += 2 * unit_d;
                break;
        }
    }
    return out;
}

}  // namespace overshoot::lengths_engine
