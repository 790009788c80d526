#pragma once
// A hunt: over a family of options, a range of lengths and rule variants, the
// intransitive sets of a wanted size (cycles of the dominance digraph), each
// listed once (in the rotation that starts from its first option in the input),
// ranked by strength, with the lengths where it holds.
// The pieces run_hunt is made of (spec, store, plan) are in their own headers;
// a hunt run as MPI ranks (src/hunt/mpi) calls them in its own order. Every
// piece gives the same bytes whoever runs it.
#include <cstddef>
#include <utility>
#include <vector>

#include "hunt/plan.hpp"
#include "hunt/spec.hpp"
#include "hunt/store.hpp"

namespace overshoot {

// A cycle of a hunt: the lengths where it holds (as in a sweep) and its variant.
struct HuntCycle : CycleSpan {
    std::size_t variant = 0;
};

struct HuntResult {
    bool complete = true;          // false when interrupted: only cycles whose pairs are all known
    std::size_t pairs_total = 0, pairs_known = 0;  // per variant times variants
    std::size_t lengths_examined = 0;              // swept lengths times variants (complete runs)
    unsigned long long sets_examined = 0;          // option sets of the wanted size, per length and variant
    unsigned long long cycles_found = 0;           // (cycle, length) instances meeting the wishes
    std::size_t distinct = 0;                      // distinct (variant, cycle)
    std::vector<HuntCycle> cycles;                 // ranked, at most max_listed
    double largest_bound = 0;  // largest error bound on a known margin (the 1e-12 target)
    int largest_bound_length = 0;
};

// One process: loads the checkpoint when resuming, computes every unknown
// pair (threads from spec.engine), saves the checkpoint, searches the cycles.
HuntResult run_hunt(const HuntSpec& spec);

// The cycle search over the known pairs, length by length, in grid order.
HuntResult search_cycles(const HuntSpec& spec, const HuntStore& store);

}  // namespace overshoot
