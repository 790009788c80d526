#pragma once
// Who is preferred where: the swept lengths of one pair cut into stretches of
// consecutive lengths with one verdict each, with the smallest and largest
// margin in each; and the largest error bound of a sweep (the 1e-12 target).
#include <vector>

#include "sweep/sweep.hpp"

namespace overshoot {

struct Stretch {
    int first = 0, last = 0;  // swept lengths, inclusive
    int verdict = 0;          // +1: a beats b, -1: b beats a, 0: undecided (the rule of race/outcome.hpp)
    double least = 0, most = 0;  // |margin| over the stretch, smallest and largest
    std::size_t count = 0;       // swept lengths in the stretch
};

// One pair's stretches in grid order; `lengths` are the swept lengths of its variant.
std::vector<Stretch> preference_stretches(const PairSweep& pair, const std::vector<int>& lengths);

// The largest error bound on any margin of the sweep, and where it is.
struct LargestBound {
    double bound = 0;
    int length = 0;
    std::size_t variant = 0, pair = 0;
};
LargestBound largest_bound(const SweepResult& r);

// The error bound every margin aims for (docs/method.md).
inline constexpr double target_bound = 1e-12;

}  // namespace overshoot
