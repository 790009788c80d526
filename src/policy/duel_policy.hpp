#pragma once
// Choosing the option every turn in a duel: piece A picks from its menu at
// every state (both pieces' squares and whose move it is), against either a
// fixed option (a Markov decision process maximising P(A wins)) or a second
// menu (a zero-sum stochastic game with payoff P(A wins) - P(B wins)). Solved
// backward over the squares where pieces never move backward, by iteration
// with a proven bound where they can (the rule bounce, backward jumps);
// docs/policy.md has the programmes and their proofs.
#include <gmpxx.h>

#include <optional>
#include <string>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "policy/alone.hpp"

namespace overshoot {

struct PolicyOutcomes {
    long double p_a_wins = 0, p_b_wins = 0, p_tie = 0, p_neither = 0;
    long double bound = 0;  // each probability lies within it
};

struct ExactPolicyOutcomes {
    mpq_class p_a_wins, p_b_wins, p_tie, p_neither;
};

enum class PolicyGoal {
    win,     // A maximises P(A wins) (against a fixed option)
    margin,  // A maximises, B minimises P(A wins) - P(B wins) (the game)
};

struct DuelPolicy {
    int length = 0;
    Order order = Order::simultaneous;
    PolicyGoal goal = PolicyGoal::win;
    int a_options = 0, b_options = 0;
    // Per state a * length + b (A on square a, B on square b): A's choice when
    // A is to move (alternating orders; the same table serves a-first, b-first
    // and coin) or at the start of the round (simultaneous). B's choices are
    // empty when B has one option.
    std::vector<Choice> a_choice, b_choice;
    // Simultaneous game only: the mixed choice per state (options x states,
    // a_mix[idx * a_options + i]) and which states need one (no saddle point).
    std::vector<double> a_mix, b_mix;
    std::vector<char> mixed;
    std::size_t mixed_states = 0;
    // The goal's value at every state, as the choices above: A to move (or the
    // round's start) in `values`, B to move in `values_b` (alternating orders).
    std::vector<long double> values, values_b;
    // The goal's optimal value from the start, and an interval proven to contain it.
    long double value = 0, value_low = 0, value_high = 0;
    PolicyOutcomes outcomes;  // under the found policies, from the start
    bool exact = false;
    mpq_class exact_value;
    ExactPolicyOutcomes exact_outcomes;
    // On boards where pieces move backward: blocks of states with loops were
    // solved by iteration (sweeps: all their sweeps added up), and the bounds
    // are proven from the residual of the values found (docs/policy.md).
    bool iterated = false;
    long long sweeps = 0;
};

// `exact` computes values and choices with fractions (refused for the
// simultaneous game of two menus, whose value is irrational in general).
// Boards where pieces move backward are iterated with a proven bound; exact
// mode refuses them, and both throw LimitError when the bound cannot be proven.
DuelPolicy solve_duel_policy(const std::vector<Chain>& a_menu, const std::vector<Chain>& b_menu, Order order,
                             bool exact);

// The adaptive policy and, for comparison, A fixed to each option of its menu
// (B as before: its fixed option, or its menu adapting).
struct FixedPolicy {
    PolicyOutcomes outcomes;
    long double value = 0;  // the goal's value
    bool exact = false;
    mpq_class exact_value;
    ExactPolicyOutcomes exact_outcomes;
};

struct PolicyComparison {
    DuelPolicy adaptive;
    // One per A option. Against a fixed option these are the ordinary duels
    // (race/duel.hpp, race/exact.hpp); against a menu, B's best answers.
    std::vector<FixedPolicy> fixed;
    int best_fixed = 0;     // largest value; the earlier option among equals
    long double worth = 0;  // adaptive value - best fixed value (goal units)
    std::optional<mpq_class> exact_worth;
};

PolicyComparison compare_policies(const std::vector<Chain>& a_menu, const std::vector<Chain>& b_menu,
                                  Order order, bool exact);

std::string_view to_string(PolicyGoal g);

}  // namespace overshoot
