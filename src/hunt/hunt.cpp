#include "hunt/hunt.hpp"

#include <algorithm>
#include <functional>
#include <map>

#include "core/parallel.hpp"
#include "hunt/checkpoint.hpp"
#include "race/outcome.hpp"
#include "tournament/cycles.hpp"

namespace overshoot {

namespace {

unsigned long long choose(std::size_t n, int k) {
    if (k < 0 || static_cast<std::size_t>(k) > n) return 0;
    unsigned long long r = 1;
    for (int i = 1; i <= k; ++i) r = r * (n - k + i) / i;
    return r;
}

struct Aggregate {
    HuntCycle c;
    int last = 0;
};

}  // namespace

HuntResult search_cycles(const HuntSpec& spec, const HuntStore& store) {
    const std::size_t n = spec.options.size();
    const int K = spec.cycle_length;
    const std::vector<int> lengths = spec.grid.lengths();
    const std::size_t nl = lengths.size();
    const std::size_t nv = spec.variants.size();
    HuntResult out;
    out.pairs_total = store.variant_count * store.pair_count;
    out.pairs_known = store.pairs_known();
    out.complete = out.pairs_known == out.pairs_total;
    // Cycle search, length by length, in grid order (deterministic).
    std::map<std::pair<std::size_t, std::vector<std::size_t>>, Aggregate> found;
    std::vector<double> mg(n * n);
    std::vector<char> beats(n * n);
    for (std::size_t v = 0; v < nv; ++v) {
        for (std::size_t k = 0; k < nl; ++k) {
            std::fill(beats.begin(), beats.end(), 0);
            for (std::size_t i = 0; i < n; ++i)
                for (std::size_t j = i + 1; j < n; ++j) {
                    if (!store.known(v, i, j)) continue;
                    const std::size_t idx = store.slot(v, i, j);
                    const double m = store.margin[idx][k], b = store.bound[idx][k];
                    if (b > out.largest_bound) {
                        out.largest_bound = b;
                        out.largest_bound_length = lengths[k];
                    }
                    mg[i * n + j] = m;
                    mg[j * n + i] = -m;
                    // Arcs weaker than the wanted strength cannot be in a wanted cycle.
                    if (decided(m, b) > 0 && m >= spec.min_strength) beats[i * n + j] = 1;
                    if (decided(m, b) < 0 && -m >= spec.min_strength) beats[j * n + i] = 1;
                }
            out.lengths_examined++;
            out.sets_examined += choose(n, K);
            const int len = lengths[k];
            for_each_cycle_of_length(n, beats, K, [&](const std::vector<std::size_t>& path) {
                bool has_required = !spec.required;
                double strength = mg[path.back() * n + path.front()];
                for (int q = 0; q < K; ++q) {
                    if (spec.required && path[q] == *spec.required) has_required = true;
                    if (q + 1 < K) strength = std::min(strength, mg[path[q] * n + path[q + 1]]);
                }
                if (!has_required || strength < spec.min_strength) return;
                out.cycles_found++;
                auto& ag = found[{v, path}];
                HuntCycle& c = ag.c;
                if (c.count == 0) {
                    c.variant = v;
                    c.options = path;
                    c.strongest = c.weakest = strength;
                    c.strongest_length = len;
                    c.intervals.emplace_back(len, len);
                } else {
                    if (ag.last + spec.grid.step == len)
                        c.intervals.back().second = len;
                    else
                        c.intervals.emplace_back(len, len);
                    if (strength > c.strongest) {
                        c.strongest = strength;
                        c.strongest_length = len;
                    }
                    c.weakest = std::min(c.weakest, strength);
                }
                c.count++;
                ag.last = len;
            });
        }
    }
    out.distinct = found.size();
    for (auto& [key, ag] : found) out.cycles.push_back(std::move(ag.c));
    std::stable_sort(out.cycles.begin(), out.cycles.end(), [](const HuntCycle& x, const HuntCycle& y) {
        if (x.strongest != y.strongest) return x.strongest > y.strongest;
        if (x.variant != y.variant) return x.variant < y.variant;
        return x.options < y.options;
    });
    if (out.cycles.size() > spec.max_listed) out.cycles.resize(spec.max_listed);
    return out;
}

HuntResult run_hunt(const HuntSpec& spec) {
    validate_hunt(spec);
    HuntStore store = load_hunt_store(spec);
    if (!spec.resume) remove_rank_checkpoint_files(spec.checkpoint);
    const int threads = spec.engine.threads > 0 ? spec.engine.threads : default_threads();
    const HuntPlan plan = plan_hunt(spec, store, 1, threads);
    if (spec.on_plan) spec.on_plan(plan);
    const std::uint64_t fp = hunt_fingerprint(spec);
    std::function<void(const HuntStore&)> save;
    if (!spec.checkpoint.empty())
        save = [&](const HuntStore& s) { save_checkpoint(spec.checkpoint, s.checkpoint(fp)); };
    compute_shards(spec, plan, 0, store, save);
    // Rank files of an earlier run are now inside the checkpoint.
    remove_rank_checkpoint_files(spec.checkpoint);
    return search_cycles(spec, store);
}

}  // namespace overshoot
