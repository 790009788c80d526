#pragma once
// Absorption on boards where pieces never move backward: one subtraction-free
// backward pass gives P(finish) and E[T 1{finish}] from every square.
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "core/option.hpp"

namespace overshoot {

struct Absorption {
    std::vector<long double> h;  // P(finish | square)
    std::vector<long double> g;  // E[T 1{finish} | square]
};

// Requires chain.forward_only (throws InternalError otherwise).
Absorption forward_absorption(const Chain& chain);

// The same from one start square, with rows made on the fly instead of a built
// chain (long boards: no per-move storage), and each probability's proven
// rounding bound (docs/method.md, section 2).
struct StartAbsorption {
    long double finish = 0, stuck = 0;  // P(finish), P(stuck for good): subtraction-free, they add to 1
    double time = 0;                    // E[T 1{finish}]
    long double finish_error = 0, stuck_error = 0;
};
// Requires board.forward_only(); `start` is a resting square (resolve_start).
StartAbsorption absorption_from(const Board& board, const Option& option, int start);

}  // namespace overshoot
