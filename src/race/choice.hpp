#pragma once
// The sequential choice game: players pick options one after another (first
// player first), each seeing the earlier picks and maximising their own chance
// to finish first alone. Solved exactly by backward induction over the pick tree.
#include <cstdint>
#include <vector>

#include "race/several_pieces.hpp"

namespace overshoot {

struct ChoicePath {
    std::vector<int> picks;             // option index chosen by each player
    std::vector<long double> chances;   // each player's chance to finish first alone
};

struct ChoiceResult {
    int players = 0;
    bool distinct = false;
    ChoicePath equilibrium;       // the backward-induction path from the empty start
    long double bound = 0;        // largest error bound of any race consulted
    bool target_met = true;       // every race consulted met the wanted 1e-12
    // The multi-player counterpart of the counter table: for every first pick,
    // how the later players answer (their equilibrium continuation).
    std::vector<ChoicePath> after_first_pick;
    // On the equilibrium path, the last to choose does at least as well as the first.
    bool last_at_least_first_on_path = false;
    // At every node where the last player chooses (whatever came before), the
    // last player's best answer does at least as well as the first player.
    bool last_always_at_least_first = false;
    std::vector<int> counterexample;  // picks of one node where it fails (empty if none)
    std::uint64_t races = 0;          // distinct races evaluated
    std::uint64_t leaves = 0;         // complete pick sequences considered
};

// Values closer than `tolerance` (plus both races' bounds) count as indifferent:
// the earlier option in the input is taken. Throws LimitError when the pick tree
// has more than limits of 10 million leaves.
ChoiceResult solve_choice(RaceCache& cache, int options, int players, bool distinct);

}  // namespace overshoot
