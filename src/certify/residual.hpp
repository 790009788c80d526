#pragma once
// Residual certificates for duels on general boards (docs/certificate.md,
// docs/method.md "Residual certificates"). For the duel's product chain the
// writer claims values x~ (P(A wins), P(B wins), P(tie)) for every live state
// reachable from the start and a vector h bounding the expected remaining
// rounds; a checker proves |x - x~| <= max|rho| h from exact integers alone.
//
// The writer (residual.cpp) solves in double precision and refines in exact
// 128-bit integer residuals; the checker (residual_check.cpp) shares none of
// its code and works in GMP integers and rationals only.
#include <gmpxx.h>

#include <cstdint>
#include <string>
#include <utility>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"

namespace overshoot {

// Who moves first in each round of one part's chain.
enum class Mover { both, a, b };
std::string_view to_string(Mover m);
// The parts a turn order needs, in the order a certificate lists them.
std::vector<Mover> parts_of(Order order);

// One product chain: states are pairs (square of A, square of B) at the start
// of a round. Values are integers over 10^digits (x~) and 10^rounds_digits (h).
struct ResidualPart {
    Mover first = Mover::both;
    int digits = 0;
    std::vector<std::pair<int, int>> states;           // increasing (a, then b)
    std::vector<mpz_class> p_a_wins, p_b_wins, p_tie;  // p_tie empty unless first == both
    std::vector<mpz_class> rounds;
};

// The parts of one duel: one for simultaneous, a-first and b-first; two for
// coin (a first, then b first), each weighing 1/2.
struct ResidualProof {
    int rounds_digits = 0;
    std::vector<ResidualPart> parts;
};

// The start-state values the proof gives: centre and proven radius of each of
// p_a_wins, p_b_wins, p_tie, p_neither, margin (in that order).
struct ResidualBounds {
    mpq_class centre[5];
    mpq_class radius[5];
};

// The writer's product chain of one part, among the live states reachable
// from the start (increasing), rows in CSR form with exact weights over
// `full` = DA * DB. Shared by the residual writer and exact lifting.
__extension__ typedef unsigned __int128 uint128;
struct ProductChain {
    uint128 full = 1;
    std::vector<std::pair<int, int>> states;
    std::size_t start = 0;          // index of the start state (the two start squares)
    std::vector<std::int64_t> row;  // size states + 1
    std::vector<int> col;
    std::vector<uint128> w;
    std::vector<uint128> out[3];  // weight of A wins, B wins, tie this round
};
ProductChain build_product_chain(const Chain& a, const Chain& b, Mover first);

// Largest product chain (live states of one part) the writer factors; beyond
// it (or the memory cap) write_residual throws LimitError and certificates
// fall back to the floating engine's proven intervals.
inline constexpr std::size_t residual_max_states = 200000;

// The writer: values refined until the rounding of the last digit dominates.
// Throws LimitError when the product chain exceeds the memory cap.
struct ResidualWriting {
    ResidualProof proof;
    ResidualBounds bounds;  // computed by the writer from its own integers
    int refinements = 0;    // refinement steps taken (all parts, all vectors)
};
ResidualWriting write_residual(const Chain& a, const Chain& b, Order order);

// The checker: an exact re-derivation from the chains' integer weights. On
// success fills `bounds`; on failure returns the reason (empty when it holds).
std::string check_residual(const ResidualProof& proof, const Chain& a, const Chain& b, Order order,
                           ResidualBounds& bounds);

// Decimal text of value / 10^digits with exactly `digits` places, and back
// (non-negative values only; the parser throws InputError naming `what`).
std::string scaled_decimal(const mpz_class& value, int digits);
mpz_class parse_scaled_decimal(const std::string& text, int digits, const std::string& what);

}  // namespace overshoot
