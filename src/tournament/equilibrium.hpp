#pragma once
// The equilibrium mix of the symmetric zero-sum game "both pick an option,
// payoff = margin", by linear programming (GLPK's simplex).
#include <cstddef>
#include <vector>

#include "tournament/tournament.hpp"

namespace overshoot {

// `payoff` is n x n with payoff[i*n+j] the row player's gain (antisymmetric).
EquilibriumMix equilibrium_mix(std::size_t n, const std::vector<double>& payoff);

}  // namespace overshoot
