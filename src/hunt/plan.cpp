#include "hunt/plan.hpp"

#include <algorithm>
#include <atomic>
#include <chrono>
#include <cmath>
#include <map>
#include <mutex>

#include "core/error.hpp"
#include "race/outcome.hpp"

namespace overshoot {

namespace {

// Moves with weight, plus the stay term: the terms of one row of an option.
double row_terms(const Option& o) {
    double k = 1;
    for (std::size_t m = 1; m < o.weight.size(); ++m)
        if (o.weight[m] != 0) k += 1;
    return k;
}

// Assigns shards to ranks, longest first, each to the least loaded rank.
void assign_ranks(HuntPlan& plan) {
    std::vector<std::size_t> order(plan.shards.size());
    for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
    std::stable_sort(order.begin(), order.end(),
                     [&](std::size_t x, std::size_t y) { return plan.shards[x].cost > plan.shards[y].cost; });
    plan.rank_cost.assign(plan.ranks, 0);
    for (std::size_t i : order) {
        const auto least = std::min_element(plan.rank_cost.begin(), plan.rank_cost.end());
        plan.shards[i].rank = static_cast<int>(least - plan.rank_cost.begin());
        *least += plan.shards[i].cost;
    }
}

struct SeriesPairCost {
    PairRequest pair;
    PairCost cost;
};

// Series pairs grouped by blocks of options: shard (x, y), x <= y, holds the
// pairs with the first option in block x and the second in block y. Each
// shard steps only the options it holds, so fewer blocks repeat less work.
std::vector<HuntShard> series_shards(const HuntSpec& spec, std::size_t v, const std::vector<SeriesPairCost>& list,
                                     int blocks, std::size_t nl) {
    std::vector<std::size_t> used;
    for (const auto& p : list) {
        used.push_back(p.pair.a);
        used.push_back(p.pair.b);
    }
    std::sort(used.begin(), used.end());
    used.erase(std::unique(used.begin(), used.end()), used.end());
    std::vector<int> block(spec.options.size(), 0);
    for (std::size_t i = 0; i < used.size(); ++i)
        block[used[i]] = static_cast<int>(i * static_cast<std::size_t>(blocks) / used.size());
    const double L = spec.grid.hi;
    const double races = needed_races(spec.variants[v].order).count();
    std::vector<HuntShard> out;
    for (int x = 0; x < blocks; ++x)
        for (int y = x; y < blocks; ++y) {
            HuntShard sh;
            sh.variant = v;
            sh.method = LengthMethod::series;
            sh.first = 0;
            sh.count = nl;
            std::map<std::size_t, double> turns;  // option -> turns it is stepped
            for (const auto& p : list) {
                const int bx = block[p.pair.a], by = block[p.pair.b];
                if (std::min(bx, by) != x || std::max(bx, by) != y) continue;
                sh.pairs.push_back(p.pair);
                sh.cost += p.cost.turns * L * 3 * races;
                for (std::size_t o : {p.pair.a, p.pair.b}) turns[o] = std::max(turns[o], p.cost.turns);
            }
            if (sh.pairs.empty()) continue;
            for (const auto& [o, t] : turns) sh.cost += t * L * 2 * row_terms(spec.options[o]);
            out.push_back(std::move(sh));
        }
    return out;
}

}  // namespace

HuntPlan plan_hunt(const HuntSpec& spec, const HuntStore& store, int ranks, int threads) {
    if (ranks < 1) throw InternalError("plan_hunt: no ranks");
    threads = std::max(1, threads);
    HuntPlan plan;
    plan.ranks = ranks;
    plan.pairs_total = store.variant_count * store.pair_count;
    plan.pairs_known = store.pairs_known();
    const std::size_t n = spec.options.size(), nl = store.length_count;
    const std::vector<int> lengths = spec.grid.lengths();
    std::vector<std::vector<SeriesPairCost>> series(spec.variants.size());
    for (std::size_t v = 0; v < spec.variants.size(); ++v) {
        const Variant& var = spec.variants[v];
        if (all_lengths_applies(var.rule, !spec.jumps.empty())) {
            for (std::size_t i = 0; i < n; ++i)
                for (std::size_t j = i + 1; j < n; ++j) {
                    if (store.known(v, i, j)) continue;
                    const PairCost c =
                        estimate_pair_cost(spec.options[i], spec.options[j], var.rule, var.order, spec.grid.hi, spec.engine);
                    if (c.series) {
                        series[v].push_back({{i, j}, c});
                        continue;
                    }
                    HuntShard sh;
                    sh.variant = v;
                    sh.method = c.closure ? LengthMethod::closure : LengthMethod::pairs;
                    sh.pairs = {{i, j}};
                    sh.first = 0;
                    sh.count = nl;
                    sh.cost = c.work;
                    plan.shards.push_back(std::move(sh));
                }
            continue;
        }
        // Board by board: every pair with an unknown length, in blocks of lengths.
        std::vector<PairRequest> pairs;
        // Measured (docs/cluster.md): a board-by-board duel costs about
        // 1e4 length (1 + (k_A + k_B) / 40) multiply-adds' worth of time per race.
        double per_len = 0;
        for (std::size_t i = 0; i < n; ++i)
            for (std::size_t j = i + 1; j < n; ++j) {
                if (store.known(v, i, j)) continue;
                pairs.push_back({i, j});
                per_len += 1e4 * (1 + (row_terms(spec.options[i]) + row_terms(spec.options[j])) / 40) *
                           needed_races(var.order).count();
            }
        if (pairs.empty()) continue;
        std::vector<std::size_t> need;
        for (std::size_t k = 0; k < nl; ++k)
            for (const auto& p : pairs)
                if (!store.known(v, p.a, p.b, k)) {
                    need.push_back(k);
                    break;
                }
        auto cost_of = [&](std::size_t k) {
            return per_len * lengths[k];
        };
        double total = 0;
        for (std::size_t k : need) total += cost_of(k);
        const std::size_t blocks = std::max<std::size_t>(1, std::min<std::size_t>(need.size() / (2 * threads), 16 * ranks));
        const double target = total / static_cast<double>(blocks);
        HuntShard cur;
        auto flush = [&] {
            if (cur.count == 0) return;
            plan.shards.push_back(cur);
            cur = HuntShard{};
        };
        for (std::size_t q = 0; q < need.size(); ++q) {
            const std::size_t k = need[q];
            if (cur.count > 0 && (k != cur.first + cur.count || cur.cost >= target)) flush();
            if (cur.count == 0) {
                cur.variant = v;
                cur.method = LengthMethod::board;
                cur.pairs = pairs;
                cur.first = k;
            }
            ++cur.count;
            cur.cost += cost_of(k);
        }
        flush();
    }
    // Series pairs: as few option blocks as keep each shard below half a rank's share.
    double total = 0;
    for (const auto& sh : plan.shards) total += sh.cost;
    for (std::size_t v = 0; v < spec.variants.size(); ++v)
        for (const auto& p : series[v]) total += p.cost.work;
    for (std::size_t v = 0; v < spec.variants.size(); ++v) {
        if (series[v].empty()) continue;
        int blocks = 1;
        std::vector<HuntShard> best = series_shards(spec, v, series[v], blocks, nl);
        const int most = static_cast<int>(std::min<std::size_t>(n, 16));
        while (ranks > 1 && blocks < most) {
            double largest = 0;
            for (const auto& sh : best) largest = std::max(largest, sh.cost);
            if (largest <= total / (2.0 * ranks)) break;
            best = series_shards(spec, v, series[v], ++blocks, nl);
        }
        for (auto& sh : best) plan.shards.push_back(std::move(sh));
    }
    // Ids in a fixed order: variant, then method, then first pair and length.
    std::stable_sort(plan.shards.begin(), plan.shards.end(), [](const HuntShard& x, const HuntShard& y) {
        if (x.variant != y.variant) return x.variant < y.variant;
        if (x.first != y.first) return x.first < y.first;
        const auto kx = std::make_pair(x.pairs.front().a, x.pairs.front().b);
        const auto ky = std::make_pair(y.pairs.front().a, y.pairs.front().b);
        if (kx != ky) return kx < ky;
        return to_string(x.method) < to_string(y.method);  // by name, as the plan lists them
    });
    for (std::size_t i = 0; i < plan.shards.size(); ++i) plan.shards[i].id = i + 1;
    assign_ranks(plan);
    return plan;
}

bool compute_shards(const HuntSpec& spec, const HuntPlan& plan, int rank, HuntStore& out,
                    const std::function<void(const HuntStore&)>& save) {
    const std::vector<int> lengths = spec.grid.lengths();
    const std::size_t nl = lengths.size();
    std::atomic<bool> local_stop{false};
    std::atomic<bool>* stop = spec.cancel ? spec.cancel : &local_stop;
    std::mutex store_mutex;
    long long fresh = 0;
    auto last_save = std::chrono::steady_clock::now();
    auto maybe_save = [&](bool now) {  // caller holds store_mutex
        if (!save) return;
        if (!now && std::chrono::steady_clock::now() - last_save < std::chrono::seconds(2)) return;
        save(out);
        last_save = std::chrono::steady_clock::now();
    };
    // Progress in cells (pair x length) of this rank's work, counting what `out` knew before.
    std::size_t cells_done = 0, cells_total = 0;
    for (std::size_t c : out.have_count) cells_done += c;
    cells_total = cells_done;
    for (const auto& sh : plan.shards)
        if (sh.rank == rank) cells_total += sh.pairs.size() * sh.count;
    auto progress = [&] {
        if (spec.progress) spec.progress(cells_done, cells_total);
    };
    // Stores one pair's lengths first .. first+count-1 (of `by_length`, indexed by length).
    auto take = [&](std::size_t v, std::size_t a, std::size_t b, std::size_t first, std::size_t count,
                    const std::vector<LengthOutcome>& by_length) {
        std::lock_guard<std::mutex> lock(store_mutex);
        if (spec.stop_after_pairs >= 0 && fresh >= spec.stop_after_pairs) return;
        CheckpointRecord r;
        r.variant = static_cast<std::uint32_t>(v);
        r.a = static_cast<std::uint32_t>(a);
        r.b = static_cast<std::uint32_t>(b);
        r.first = static_cast<std::uint32_t>(first);
        for (std::size_t k = first; k < first + count; ++k) {
            const LengthOutcome& o = by_length[lengths[k]];
            r.margin.push_back(o.margin());
            // The margin is rounded once more here: widen the bound by it.
            r.bound.push_back(rounded_margin_bound(o.error_bound()));
        }
        out.put(r, "hunt");
        cells_done += count;
        ++fresh;
        progress();
        if (spec.stop_after_pairs >= 0 && fresh >= spec.stop_after_pairs) stop->store(true);
        maybe_save(false);
    };
    progress();
    LengthSettings es = spec.engine;
    es.cancel = stop;
    for (std::size_t v = 0; v < spec.variants.size() && !stop->load(); ++v) {
        const Variant& var = spec.variants[v];
        if (all_lengths_applies(var.rule, !spec.jumps.empty())) {
            // One call for every pair of this rank: series pairs share their option stepping.
            std::vector<PairRequest> req;
            for (const auto& sh : plan.shards)
                if (sh.rank == rank && sh.variant == v)
                    for (const auto& p : sh.pairs)
                        if (!out.known(v, p.a, p.b)) req.push_back(p);
            std::sort(req.begin(), req.end(), [](const PairRequest& x, const PairRequest& y) {
                return std::make_pair(x.a, x.b) < std::make_pair(y.a, y.b);
            });
            if (req.empty()) continue;
            all_lengths(spec.options, var.rule, var.order, spec.grid.hi, req, es,
                        [&](const PairLengths& p) { take(v, p.a, p.b, 0, nl, p.by_length); });
            continue;
        }
        for (const auto& sh : plan.shards) {
            if (sh.rank != rank || sh.variant != v) continue;
            if (stop->load()) break;
            std::vector<int> lens(lengths.begin() + static_cast<std::ptrdiff_t>(sh.first),
                                  lengths.begin() + static_cast<std::ptrdiff_t>(sh.first + sh.count));
            // Boards with jumps race every pair of a length together (shared series); the
            // jump-free bounce variant keeps its duel per pair (its numbers stay as they were).
            auto res = spec.jumps.empty()
                           ? board_by_board(spec.options, var.rule, var.order, spec.jumps, spec.anchor, lens, sh.pairs, es,
                                            lengths.back())
                           : board_by_board_matrix(spec.options, var.rule, var.order, spec.jumps, spec.anchor, lens,
                                                   sh.pairs, es, lengths.back());
            for (const auto& p : res)
                if (p.done) take(v, p.a, p.b, sh.first, sh.count, p.by_length);
        }
    }
    {
        std::lock_guard<std::mutex> lock(store_mutex);
        maybe_save(true);
    }
    return !stop->load();
}

}  // namespace overshoot
