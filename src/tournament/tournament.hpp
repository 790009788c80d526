#pragma once
// A tournament: every option against every other on one board (or a win matrix
// from a file), and what follows from it: the dominance digraph, its components,
// the top cycle, cycles, counters and the equilibrium mix. Plain data; render
// formats it.
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"

namespace overshoot {

// The raw pairwise results: n options, row-major n x n matrices. The diagonal
// is ignored.
struct PairwiseMatrix {
    std::vector<std::string> names;
    std::vector<double> win;      // P(row wins against column)
    std::vector<double> tie;      // P(shared finish); from a file: 1 - win - win^T
    std::vector<double> neither;  // P(no piece ever finishes); 0 from a file
    std::vector<double> bound;    // bound on margin(row, col)
    bool bounds_proven = true;    // false when some duel bound is an estimate

    std::size_t size() const { return names.size(); }
    double margin(std::size_t i, std::size_t j) const { return win[i * size() + j] - win[j * size() + i]; }
};

struct TournamentSettings {
    int max_cycle_length = 6;          // longest cycle listed (3 or more)
    std::size_t cycle_cap = 10'000;    // most cycles listed; cap_hit says when it cut
    bool want_mix = true;              // the equilibrium mix (a linear programme); a sweep's lengths do not show it
};

struct Arc {
    std::size_t from = 0, to = 0;
    double margin = 0;  // > bound
    double bound = 0;
};

struct Cycle {
    // Each option beats the next, the last beats the first; starts from the
    // option that comes first in the input.
    std::vector<std::size_t> options;
    double strength = 0;  // the smallest margin along the cycle
};

struct Counter {
    std::optional<std::size_t> counter;  // nullopt: nothing beats this option
    double margin = 0;                   // margin of the counter against it
};

struct EquilibriumMix {
    std::vector<double> weight;      // one per option, sums to 1
    std::vector<std::size_t> support;  // options with weight > 1e-9
    double value = 0;                // LP optimum (0 for a symmetric game, up to rounding)
    std::vector<double> guaranteed;  // expected margin of the mix against each pure option
};

struct Tournament {
    PairwiseMatrix matrix;
    std::vector<double> margin;  // n x n, margin[i*n+j] = win[i][j] - win[j][i]
    std::vector<char> beats;     // n x n, 1 when row beats column
    std::vector<Arc> arcs;       // sorted by from, then to (input order)
    std::vector<std::pair<std::size_t, std::size_t>> undecided;  // i < j, |margin| <= bound
    std::vector<double> copeland;  // 1 per option beaten, 1/2 per undecided pair
    std::optional<std::size_t> condorcet_winner, condorcet_loser;
    // Strongly connected components of the dominance digraph, each in input
    // order, listed by their first option.
    std::vector<std::vector<std::size_t>> components;
    std::vector<std::size_t> top_cycle;  // Smith set, undecided pairs as ties; input order
    long long cyclic_triads = 0;         // 3-sets {a,b,c} with a->b->c->a in some orientation
    bool transitive = false;             // a->b and b->c always give a->c
    bool acyclic = false;                // no directed cycle at all

    TournamentSettings settings;
    std::vector<Cycle> cycles;  // up to max_cycle_length, strongest first
    bool cap_hit = false;       // the cycle cap cut the list
    std::optional<Cycle> strongest_cycle;  // of any length; nullopt when acyclic
    std::vector<std::optional<Cycle>> strongest_through;  // per option
    std::vector<Counter> counters;                        // per option
    EquilibriumMix equilibrium;

    std::size_t size() const { return matrix.size(); }
    const std::string& name(std::size_t i) const { return matrix.names[i]; }
};

// The full analysis of a pairwise matrix. Throws InputError on a bad setting.
Tournament analyse(PairwiseMatrix matrix, const TournamentSettings& settings = {});

// The pairwise matrix of options raced on one board. Refuses a-first and
// b-first (the result would depend on the seat, not the option) and duplicate
// names. `starts`: one start square per option (empty: every piece on 0).
PairwiseMatrix race_matrix(const Board& board, Order order, const std::vector<Option>& options,
                           const DuelSettings& duel_settings = {}, int threads = 0,
                           const std::vector<int>& starts = {});

}  // namespace overshoot
