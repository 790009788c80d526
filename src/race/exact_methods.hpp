#pragma once
// The two exact methods behind exact_duel() (race/exact.hpp): win, loss and
// tie of one ordered race from the chains' start squares, each a reduced fraction.
#include <gmpxx.h>

#include <array>

#include "chain/chain.hpp"

namespace overshoot {

// The pair programme in exact integer arithmetic (forward-only boards;
// race/exact_pairs.cpp, docs/exact.md).
std::array<mpq_class, 3> exact_pair_programme(const Chain& a, const Chain& b, bool a_first);

// Fraction-free elimination of the product chain (small general boards;
// race/exact_elimination.cpp).
std::array<mpq_class, 3> exact_elimination(const Chain& a, const Chain& b, bool a_first);

}  // namespace overshoot
