#pragma once
// Exact duels on general boards too large for exact elimination, by p-adic
// lifting (J. D. Dixon, "Exact solution of linear equations using p-adic
// expansions", Numerische Mathematik 40, 1982): one LU factorisation of the
// live product chain modulo a prime, then digits of the solution in base p
// from integer residuals, rational reconstruction, and an exact substitution
// into the one-round equations that proves the fractions (docs/exact.md).
#include <optional>
#include <string>

#include "chain/chain.hpp"
#include "race/exact.hpp"

namespace overshoot {

// Largest live product chain (states of one part) and longest solution
// (bits) that lifting attempts; beyond them the residual proof stands alone.
inline constexpr std::size_t lifting_max_states = 1000;
inline constexpr long lifting_max_bits = 60000;

struct LiftedDuel {
    std::optional<ExactDuel> duel;  // verified by exact substitution
    std::string refusal;            // why not, when duel is empty (one line)
};

LiftedDuel lifted_duel(const Chain& a, const Chain& b, Order order);

}  // namespace overshoot
