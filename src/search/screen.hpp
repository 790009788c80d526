#pragma once
// Screening races for the board search: fast estimates of every margin of a
// tournament on one candidate board, to rank thousands of boards. Not a
// proven result: the boards the search reports are raced again by the duel
// engine with proven bounds (search.cpp).
//
// In simultaneous and coin order two pieces move independently, so a duel
// depends only on each option's finishing-time distribution: P(A wins) =
// sum_t P(T_A = t) P(T_B > t) (a-first: P(T_B > t - 1)). Each option's series
// is stepped in double precision until its live mass is below 1e-11, or until
// the per-turn decay has settled (live mass, finishing and sticking rates the
// same to 1e-10 from one turn to the next), after which the rest is summed as a
// geometric tail in closed form (docs/search.md).
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"

namespace overshoot {

struct ScreenTrack {
    std::vector<double> f;     // f[t] = P(T = t), t = 0..T (f[0] = 0)
    std::vector<double> surv;  // surv[t] = P(T > t), never finishing included
    double alive_end = 0, stuck_end = 0;    // live and stuck mass at T
    double phi = 0, sigma = 0, lambda = 0;  // per-turn rates after T: finish, stick, stay alive
};

ScreenTrack screen_track(const Chain& chain);

// P(A wins) - P(B wins) in simultaneous or coin order.
double screen_margin(const ScreenTrack& a, const ScreenTrack& b, Order order);

}  // namespace overshoot
