#pragma once
// Duels: two pieces on one board, every turn order, with a proven error bound.
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "race/outcome.hpp"

namespace overshoot {

enum class DuelMethod {
    automatic,  // choose per case by estimated work (docs/method.md)
    pairs,      // time-free pair programme over the whole board (forward-only boards)
    zone,       // per-turn series, closed by the pair programme on the end zone
    series,     // per-turn series until the live mass is below the target
    product,    // sparse LU of the product chain (small boards; independent check)
    separated,  // finishing windows proven apart: each piece's absorption (race/long_duel.hpp)
};

// The methods behind a result: under coin, `second` is the B-first race's
// method when it differs from the A-first race's.
struct DuelMethods {
    DuelMethod first = DuelMethod::automatic;
    std::optional<DuelMethod> second;
    bool operator==(const DuelMethods&) const = default;
};

struct DuelSettings {
    DuelMethod method = DuelMethod::automatic;
    long double target = 1e-14L;  // truncation target for series-based methods
    std::uint64_t work_limit = 20'000'000'000ULL;  // transitions a series may apply
    bool want_median = true;
};

struct DuelResult {
    long double p_a_wins = 0, p_b_wins = 0, p_tie = 0, p_neither = 0;
    // Each probability lies within `bound` of its true value (proven unless
    // the method is product, whose bound is a residual estimate).
    long double bound = 0;
    bool bound_proven = true;
    bool target_met = true;  // false when the work limit stopped a series early
    DuelMethods method;
    double mean_rounds = 0;  // rounds until the first finish, given one happens
    std::optional<long long> median_rounds;
    bool median_resolved = true;

    double margin() const { return static_cast<double>(p_a_wins - p_b_wins); }
    // Bound on the margin: the sum of the two probabilities' bounds.
    double error_bound() const { return static_cast<double>(2 * bound); }
    bool a_beats_b() const { return decided(margin(), error_bound()) > 0; }
    bool b_beats_a() const { return decided(margin(), error_bound()) < 0; }
};

// Both chains must be built on the same board. Method `separated` works from
// the board and the options instead (duel_on_board in race/long_duel.hpp).
DuelResult duel(const Chain& a, const Chain& b, Order order, const DuelSettings& settings = {});

// Every ordered pair of options on one board: result[i * n + j] is the duel of
// chains[i] (as A) against chains[j] (as B), the diagonal included. Uses all
// cores (threads = 0) and gives the same bytes whatever the thread count.
std::vector<DuelResult> duel_matrix(const std::vector<Chain>& chains, Order order,
                                    const DuelSettings& settings = {}, int threads = 0);

std::string_view to_string(DuelMethod m);
std::string to_string(const DuelMethods& m);  // "zone", or "zone+series" under coin
DuelMethod parse_duel_method(std::string_view text);

}  // namespace overshoot
