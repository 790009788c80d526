#pragma once
// Exact duels: every outcome probability as a reduced fraction (GMP).
//
// Boards where pieces never move backward use the pair programme of
// race/pairs.hpp in exact integer arithmetic: each cell keeps an integer
// numerator over a denominator that is tracked symbolically (powers of a few
// self-loop denominators, times one fixed product of the rare ones), so no
// fraction is reduced until the very end (docs/exact.md). Small general boards
// are solved by exact elimination of the product chain. Anything else is
// refused with a message that points to the proven intervals of duel().
#include <gmpxx.h>

#include <array>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"

namespace overshoot {

enum class ExactMethod {
    pair_programme,  // forward-only boards: the pair programme in rationals
    elimination,     // elsewhere: Gaussian elimination of the product chain
    lifting,         // p-adic lifting of the product chain (certify/lifting.hpp)
};
std::string_view to_string(ExactMethod m);  // "exact pair programme", "exact elimination", "exact lifting"

struct ExactDuel {
    mpq_class p_a_wins, p_b_wins, p_tie, p_neither;  // reduced, summing to 1
    ExactMethod method = ExactMethod::pair_programme;
    mpq_class margin() const { return p_a_wins - p_b_wins; }
};

// Largest product chain (pairs of squares) solved by exact elimination on
// boards where pieces can move backward.
inline constexpr int exact_elimination_max_squares = 12;

// Empty when exact mode can handle this duel; otherwise the reason, one line.
std::string exact_refusal(const Chain& a, const Chain& b);

// Throws LimitError (with exact_refusal's reason) when exact mode cannot.
ExactDuel exact_duel(const Chain& a, const Chain& b, Order order);

// Several duels at once on up to `threads` threads (0 = all cores); the result
// does not depend on the thread count.
std::vector<ExactDuel> exact_duels(const std::vector<std::pair<const Chain*, const Chain*>>& pairs, Order order,
                                   int threads = 0);

// Every ordered pair of distinct options on one board: result[i * n + j] is
// chains[i] (as A) against chains[j]; the diagonal is empty. Seats are
// swapped instead of recomputed where the order allows (simultaneous, coin).
std::vector<std::optional<ExactDuel>> exact_matrix(const std::vector<Chain>& chains, Order order, int threads = 0);

}  // namespace overshoot
