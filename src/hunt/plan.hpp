#pragma once
// The work of a hunt cut into shards, given to ranks, and computed.
#include <cstddef>
#include <functional>
#include <string>
#include <vector>

#include "hunt/spec.hpp"
#include "hunt/store.hpp"
#include "lengths/lengths.hpp"

namespace overshoot {

// A unit of work for the plan: some pairs of one variant, on some swept
// lengths (indices into the grid). Variants that the all-lengths engine
// handles get every length in one go, so their shards split pairs only;
// board-by-board variants (bounce) split lengths into blocks.
struct HuntShard {
    std::size_t id = 0;
    std::size_t variant = 0;
    LengthMethod method = LengthMethod::series;  // series, pairs, closure or board
    std::vector<PairRequest> pairs;
    std::size_t first = 0, count = 0;  // swept lengths first .. first+count-1
    double cost = 0;                   // estimated multiply-adds
    int rank = 0;                      // who computes it
};

struct HuntPlan {
    int ranks = 1;
    std::vector<HuntShard> shards;     // unfinished work only
    std::vector<double> rank_cost;     // estimated multiply-adds per rank
    std::size_t pairs_total = 0, pairs_known = 0;
};

// Splits the unknown cells of `store` into shards sized for balance over
// `ranks` ranks with `threads` threads each, and gives each shard a rank by
// longest-first greedy assignment. Deterministic.
HuntPlan plan_hunt(const HuntSpec& spec, const HuntStore& store, int ranks, int threads);

// Computes the shards of `plan` that belong to `rank` into `out` (cells that
// `out` already knows are not redone). `save` (may be empty) is called with
// the store lock held at most every few seconds, after each finished shard
// and at the end. Returns false when stopped (spec.cancel or stop_after_pairs).
bool compute_shards(const HuntSpec& spec, const HuntPlan& plan, int rank, HuntStore& out,
                    const std::function<void(const HuntStore&)>& save);

}  // namespace overshoot
