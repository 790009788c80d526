#pragma once
// Absorption on boards where pieces never move backward: one subtraction-free
// backward pass gives P(finish) and E[T 1{finish}] from every square.
#include <vector>

#include "chain/chain.hpp"

namespace overshoot {

struct Absorption {
    std::vector<long double> h;  // P(finish | square)
    std::vector<long double> g;  // E[T 1{finish} | square]
};

// Requires chain.forward_only (throws InternalError otherwise).
Absorption forward_absorption(const Chain& chain);

}  // namespace overshoot
