#pragma once
// Cycles of the dominance digraph: a pruned listing up to a length limit,
// strongest first and capped; the strongest cycle of any length, found exactly
// by thresholding margins; and the strongest cycle through each option.
#include <cstddef>
#include <functional>
#include <optional>
#include <vector>

#include "tournament/tournament.hpp"

namespace overshoot {

struct CycleListing {
    std::vector<Cycle> cycles;  // strongest first; equal strengths shorter first, then by options
    bool cap_hit = false;       // more cycles exist than the cap let through
};

// `margin` is n x n; `beats` marks the arcs. `component[v]` is v's strongly
// connected component (cycles never leave one).
CycleListing list_cycles(std::size_t n, const std::vector<double>& margin, const std::vector<char>& beats,
                         const std::vector<int>& component, int max_length, std::size_t cap);

// The strongest cycle of any length, or nullopt when the digraph is acyclic.
std::optional<Cycle> strongest_cycle(std::size_t n, const std::vector<double>& margin, const std::vector<char>& beats);

// For each option, the strongest cycle through it (nullopt when none).
std::vector<std::optional<Cycle>> strongest_cycles_through(std::size_t n, const std::vector<double>& margin,
                                                           const std::vector<char>& beats,
                                                           const std::vector<int>& component);

// Every cycle of exactly `length` options (3 or more) of the digraph `beats`
// (n x n), each once, starting from its first option in input order; `visit`
// gets them in lexicographic order. Exhaustive, without a cap: a hunt counts
// every cycle of the size it looks for. (list_cycles ranks cycles of every
// length up to a limit; on hundreds of options its pruning costs more than
// this plain depth-first search does for one fixed length.)
void for_each_cycle_of_length(std::size_t n, const std::vector<char>& beats, int length,
                              const std::function<void(const std::vector<std::size_t>&)>& visit);

// Rotates a cycle so that it starts from its smallest index (first in input).
void rotate_to_first(std::vector<std::size_t>& cycle);

}  // namespace overshoot
