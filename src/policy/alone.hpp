#pragma once
// One piece alone with a menu of options: the policy minimising the expected
// number of rounds to finish (a stochastic shortest-path problem) and the
// policy maximising the chance of ever finishing, by backward induction over
// squares on boards where pieces never move backward, and by iteration with a
// proven bound where they can (docs/policy.md).
#include <gmpxx.h>

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "chain/chain.hpp"

namespace overshoot {

// One square's choice: the option taken (index into the menu) and every option
// as good as it (bit i set for option i, the choice included).
struct Choice {
    int option = 0;
    std::uint32_t as_good = 0;
    bool indifferent() const { return (as_good & (as_good - 1)) != 0; }
};

struct AloneValues {
    std::vector<long double> p_finish;  // per square
    std::vector<long double> rounds;    // expected rounds; +inf when finishing is not certain
};

struct AlonePolicy {
    int length = 0;
    std::vector<Choice> fastest;     // per square: minimises the expected rounds (when finite)
    std::vector<Choice> surest;      // per square: maximises P(finish)
    AloneValues best;                // under those policies
    std::vector<AloneValues> fixed;  // one per menu option, always choosing it
    // Every P(finish) lies within `bound` of the true value; every expected
    // number of rounds within `relative_bound` times itself.
    long double bound = 0, relative_bound = 0;
    // With exact arithmetic: the values from square 0 as fractions
    // (rounds empty when finishing is not certain).
    bool exact = false;
    mpq_class exact_p_finish;
    std::optional<mpq_class> exact_rounds;
    std::vector<mpq_class> exact_fixed_p_finish;
    std::vector<std::optional<mpq_class>> exact_fixed_rounds;
    // Blocks of squares with loops were solved by iteration; the bounds then
    // come from the residual of the values found (docs/policy.md).
    bool iterated = false;
};

// Menus hold at most this many options (choices are kept as bit sets).
inline constexpr int max_menu_options = 16;

// Empty when exact mode handles this board (pieces never move backward);
// otherwise the reason.
std::string exact_policy_refusal(const Chain& any_option_chain);

// Boards where pieces move backward are iterated with a proven bound (exact
// mode refuses them: exact_policy_refusal); throws LimitError when the bound
// cannot be proven.
AlonePolicy solve_alone(const std::vector<Chain>& menu, bool exact);

}  // namespace overshoot
