#pragma once
// Duel outcomes modulo a prime, by a formulation independent of the exact
// pair programme: the one-round equations of the product chain,
//   DA DB x(a,b) = sum_{(a',b')} wA(a->a') wB(b->b') [outcome or x(a',b')],
// solved by back substitution on forward-only boards and by Gaussian
// elimination mod p on small general boards. A fraction num/den is
// confirmed modulo p when num = x * den (mod p).
#include <array>
#include <cstdint>
#include <optional>

#include "chain/chain.hpp"
#include "core/board.hpp"

namespace overshoot {

// Residues of (P(A wins), P(B wins), P(tie)) modulo p (a prime below 2^61);
// nullopt when p divides a denominator the computation must invert.
std::optional<std::array<std::uint64_t, 3>> modular_duel(const Chain& a, const Chain& b, Order order,
                                                         std::uint64_t p);

// The first prime at or above `from` (from < 2^61).
std::uint64_t next_prime(std::uint64_t from);

}  // namespace overshoot
