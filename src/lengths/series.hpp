#pragma once
// The all-lengths series: backward per-turn series over every starting
// distance at once, options stepped once per turn and shared by every pair of
// the group (docs/sweep.md). Internal to src/lengths/.
#include <atomic>
#include <cstddef>
#include <vector>

#include "lengths/distance.hpp"
#include "lengths/method.hpp"
#include "lengths/tallies.hpp"

namespace overshoot::lengths_engine {

// One option's series state: f_t(d) = P(T = t | d) and G_t(d) = P(t < T < inf | d)
// in two buffers (this turn and the last), live on distances lo..hi.
struct SeriesOption {
    const DistanceModel* o = nullptr;
    std::vector<double> f[2], g[2];
    int written[2] = {0, 0};  // highest index of f written in each buffer
    int cur = 0, lo = 1, hi = 1;
    bool used = false;
};

// One pair of the group: its tallies per ordered race and where each start closed.
struct SeriesPair {
    std::size_t index = 0;  // into the request list
    SeriesOption *A = nullptr, *B = nullptr;
    OrderedRaces races;
    Tallies sim, af, bf;
    std::vector<char> closed;
    std::vector<double> close_bound;
    std::vector<int> close_turn;
    int plo = 1;
    int last_turn = 0;  // the turn it closed: its bound depends on no other pair
    double cap = 0;
    bool active = true, failed = false;
};

// Runs the series for a group of pairs; pairs it cannot close within their
// turn cap come back with failed set (the caller uses the pair programme).
void run_series(std::vector<SeriesOption>& opts, std::vector<SeriesPair>& pairs, int L, double target,
                std::atomic<bool>* cancel);

}  // namespace overshoot::lengths_engine
