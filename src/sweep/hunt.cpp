#include "sweep/hunt.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <filesystem>
#include <cmath>
#include <map>
#include <mutex>
#include <set>
#include <sys/stat.h>

#include "core/error.hpp"
#include "core/parallel.hpp"
#include "sweep/checkpoint.hpp"

namespace overshoot {

namespace {

std::size_t pair_index(std::size_t n, std::size_t i, std::size_t j) {  // i < j
    return i * n - i * (i + 1) / 2 + (j - i - 1);
}

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


std::uint64_t hunt_fingerprint(const HuntSpec& s) {
    std::uint64_t h = 1469598103934665603ULL;
    h = fingerprint_text(h, "hunt/1");
    for (const auto& o : s.options) {
        h = fingerprint_text(h, o.name);
        h = fingerprint_bytes(h, o.weight.data(), o.weight.size() * sizeof(o.weight[0]));
        h = fingerprint_bytes(h, &o.denominator, sizeof o.denominator);
    }
    int g[3] = {s.grid.lo, s.grid.hi, s.grid.step};
    h = fingerprint_bytes(h, g, sizeof g);
    for (const auto& v : s.variants) {
        int r[2] = {static_cast<int>(v.rule), static_cast<int>(v.order)};
        h = fingerprint_bytes(h, r, sizeof r);
    }
    h = fingerprint_text(h, std::string(to_string(s.engine.method)));
    h = fingerprint_bytes(h, &s.engine.close_target, sizeof s.engine.close_target);
    return h;
}

void validate_hunt(const HuntSpec& spec) {
    const std::size_t n = spec.options.size();
    const int K = spec.cycle_length;
    if (K < 3) throw InputError(fmt::format("--cycle-length {}: a cycle has at least 3 options", K));
    if (n < static_cast<std::size_t>(K))
        throw InputError(fmt::format("a hunt for {}-cycles needs at least {} options, got {}", K, K, n));
    if (spec.min_strength < 0) throw InputError("--min-strength must be 0 or more");
    {
        std::set<std::string> names;
        for (const auto& o : spec.options)
            if (!names.insert(o.name).second)
                throw InputError(fmt::format("option name '{}' appears twice; give each option its own name", o.name));
    }
    for (const auto& v : spec.variants)
        if (v.order == Order::a_first || v.order == Order::b_first)
            throw InputError(fmt::format("a hunt cannot use the turn order {}: the result would depend on the seat; "
                                         "use simultaneous or coin",
                                         to_string(v.order)));
    if (spec.resume && spec.checkpoint.empty()) throw InputError("--resume needs --checkpoint FILE");
}

// ---------------------------------------------------------------- store

HuntStore::HuntStore(std::size_t options, std::size_t variants, std::size_t lengths)
    : n(options), nv(variants), nl(lengths), np(options * (options - 1) / 2) {
    margin.resize(nv * np);
    bound.resize(nv * np);
    have.resize(nv * np);
    have_count.assign(nv * np, 0);
}

std::size_t HuntStore::slot(std::size_t v, std::size_t a, std::size_t b) const { return v * np + pair_index(n, a, b); }

bool HuntStore::known(std::size_t v, std::size_t a, std::size_t b, std::size_t k) const {
    const auto& h = have[slot(v, a, b)];
    return !h.empty() && h[k];
}

std::size_t HuntStore::pairs_known() const {
    return static_cast<std::size_t>(std::count(have_count.begin(), have_count.end(), nl));
}

void HuntStore::put(const CheckpointRecord& r, const std::string& where) {
    if (r.variant >= nv || r.a >= r.b || r.b >= n || r.first > nl || r.margin.size() > nl - r.first ||
        r.bound.size() != r.margin.size())
        throw InputError(fmt::format("{}: a record names a pair or lengths outside this hunt", where));
    const std::size_t s = slot(r.variant, r.a, r.b);
    if (have[s].empty()) {
        margin[s].assign(nl, 0);
        bound[s].assign(nl, 0);
        have[s].assign(nl, 0);
    }
    for (std::size_t k = 0; k < r.margin.size(); ++k) {
        const std::size_t at = r.first + k;
        margin[s][at] = r.margin[k];
        bound[s][at] = r.bound[k];
        if (!have[s][at]) {
            have[s][at] = 1;
            ++have_count[s];
        }
    }
}

void HuntStore::merge(const Checkpoint& c, const std::string& where) {
    for (const auto& r : c.records) put(r, where);
}

Checkpoint HuntStore::checkpoint(std::uint64_t fingerprint) const {
    Checkpoint c;
    c.fingerprint = fingerprint;
    c.lengths = static_cast<std::uint32_t>(nl);
    for (std::size_t v = 0; v < nv; ++v)
        for (std::size_t i = 0; i < n; ++i)
            for (std::size_t j = i + 1; j < n; ++j) {
                const std::size_t s = slot(v, i, j);
                if (have_count[s] == 0) continue;
                for (std::size_t k = 0; k < nl;) {
                    if (!have[s][k]) {
                        ++k;
                        continue;
                    }
                    CheckpointRecord r;
                    r.variant = static_cast<std::uint32_t>(v);
                    r.a = static_cast<std::uint32_t>(i);
                    r.b = static_cast<std::uint32_t>(j);
                    r.first = static_cast<std::uint32_t>(k);
                    for (; k < nl && have[s][k]; ++k) {
                        r.margin.push_back(margin[s][k]);
                        r.bound.push_back(bound[s][k]);
                    }
                    c.records.push_back(std::move(r));
                }
            }
    return c;
}

std::string rank_checkpoint_file(const std::string& checkpoint, int rank) {
    return fmt::format("{}.rank{}", checkpoint, rank);
}

void remove_rank_checkpoint_files(const std::string& checkpoint) {
    if (checkpoint.empty()) return;
    for (const auto& f : rank_checkpoint_files(checkpoint)) std::filesystem::remove(f);
}

std::vector<std::string> rank_checkpoint_files(const std::string& checkpoint) {
    namespace fs = std::filesystem;
    const fs::path p(checkpoint);
    const fs::path dir = p.has_parent_path() ? p.parent_path() : fs::path(".");
    const std::string stem = p.filename().string() + ".rank";
    std::vector<std::pair<long, std::string>> found;
    std::error_code ec;
    for (fs::directory_iterator it(dir, ec), end; !ec && it != end; it.increment(ec)) {
        const std::string name = it->path().filename().string();
        if (name.size() <= stem.size() || name.compare(0, stem.size(), stem) != 0) continue;
        const std::string digits = name.substr(stem.size());
        if (digits.size() > 6 || !std::all_of(digits.begin(), digits.end(), [](char ch) { return ch >= '0' && ch <= '9'; }))
            continue;
        found.emplace_back(std::stol(digits), (dir / name).string());
    }
    std::sort(found.begin(), found.end());
    std::vector<std::string> out;
    for (auto& f : found) out.push_back(std::move(f.second));
    return out;
}

HuntStore load_hunt_store(const HuntSpec& spec) {
    HuntStore st(spec.options.size(), spec.variants.size(), spec.grid.lengths().size());
    if (!spec.resume) return st;
    const std::uint64_t fp = hunt_fingerprint(spec);
    std::vector<std::string> files;
    if (std::filesystem::exists(spec.checkpoint)) files.push_back(spec.checkpoint);
    for (auto& f : rank_checkpoint_files(spec.checkpoint)) files.push_back(f);
    if (files.empty()) load_checkpoint(spec.checkpoint);  // throws the usual "cannot read" line
    for (const auto& f : files) {
        Checkpoint c = load_checkpoint(f);
        if (c.fingerprint != fp || c.lengths != st.nl)
            throw InputError(fmt::format("{}: this checkpoint belongs to a different hunt (options, lengths, rules or "
                                         "method differ)",
                                         f));
        st.merge(c, f);
    }
    return st;
}

// ---------------------------------------------------------------- plan

namespace {

// Moves with weight, plus the stay term: the terms of one row of an option.
double row_terms(const Option& o) {
    double k = 1;
    for (std::size_t m = 1; m < o.weight.size(); ++m)
        if (o.weight[m] != 0) k += 1;
    return k;
}

double races_of(Order order) { return order == Order::coin ? 2 : 1; }

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
    const double races = races_of(spec.variants[v].order);
    std::vector<HuntShard> out;
    for (int x = 0; x < blocks; ++x)
        for (int y = x; y < blocks; ++y) {
            HuntShard sh;
            sh.variant = v;
            sh.method = "series";
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
    plan.pairs_total = store.nv * store.np;
    plan.pairs_known = store.pairs_known();
    const std::size_t n = spec.options.size(), nl = store.nl;
    const std::vector<int> lengths = spec.grid.lengths();
    std::vector<std::vector<SeriesPairCost>> series(spec.variants.size());
    for (std::size_t v = 0; v < spec.variants.size(); ++v) {
        const Variant& var = spec.variants[v];
        if (all_lengths_applies(var.rule, false)) {
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
                    sh.method = "pairs";
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
                           races_of(var.order);
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
                cur.method = "board";
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
        return x.method < y.method;
    });
    for (std::size_t i = 0; i < plan.shards.size(); ++i) plan.shards[i].id = i + 1;
    assign_ranks(plan);
    return plan;
}

// ---------------------------------------------------------------- compute

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
            r.bound.push_back(o.error_bound() + 4 * std::ldexp(1.0, -53));
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
        if (all_lengths_applies(var.rule, false)) {
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
            auto res = board_by_board(spec.options, var.rule, var.order, {}, JumpAnchor::start, lens, sh.pairs, es);
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

// ---------------------------------------------------------------- cycles

HuntResult search_cycles(const HuntSpec& spec, const HuntStore& store) {
    const std::size_t n = spec.options.size();
    const int K = spec.cycle_length;
    const std::vector<int> lengths = spec.grid.lengths();
    const std::size_t nl = lengths.size();
    const std::size_t nv = spec.variants.size();
    HuntResult out;
    out.pairs_total = store.nv * store.np;
    out.pairs_known = store.pairs_known();
    out.complete = out.pairs_known == out.pairs_total;
    // Cycle search, length by length, in grid order (deterministic).
    std::map<std::pair<std::size_t, std::vector<std::size_t>>, Aggregate> found;
    std::vector<double> mg(n * n);
    std::vector<char> beats(n * n);
    std::vector<std::size_t> path;
    for (std::size_t v = 0; v < nv; ++v) {
        for (std::size_t k = 0; k < nl; ++k) {
            std::fill(beats.begin(), beats.end(), 0);
            for (std::size_t i = 0; i < n; ++i)
                for (std::size_t j = i + 1; j < n; ++j) {
                    if (!store.known(v, i, j)) continue;
                    const std::size_t idx = store.slot(v, i, j);
                    const double m = store.margin[idx][k], b = store.bound[idx][k];
                    mg[i * n + j] = m;
                    mg[j * n + i] = -m;
                    // Arcs weaker than the wanted strength cannot be in a wanted cycle.
                    if (m > b && m >= spec.min_strength) beats[i * n + j] = 1;
                    if (-m > b && -m >= spec.min_strength) beats[j * n + i] = 1;
                }
            out.lengths_examined++;
            out.sets_examined += choose(n, K);
            // Cycles of exactly K options starting from their smallest index s.
            for (std::size_t s = 0; s < n; ++s) {
                path.assign(1, s);
                // Iterative DFS with explicit "next candidate" per depth.
                std::vector<std::size_t> next(K, s + 1);
                int depth = 1;
                next[1] = s + 1;
                while (depth >= 1) {
                    if (depth == K) {
                        // Close the cycle back to s.
                        const std::size_t last = path.back();
                        if (beats[last * n + s]) {
                            bool has_required = !spec.required;
                            double strength = mg[last * n + s];
                            for (int q = 0; q < K; ++q) {
                                if (spec.required && path[q] == *spec.required) has_required = true;
                                if (q + 1 < K) strength = std::min(strength, mg[path[q] * n + path[q + 1]]);
                            }
                            if (has_required && strength >= spec.min_strength) {
                                out.cycles_found++;
                                auto& ag = found[{v, path}];
                                HuntCycle& c = ag.c;
                                const int len = lengths[k];
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
                            }
                        }
                        path.pop_back();
                        --depth;
                        continue;
                    }
                    bool advanced = false;
                    const std::size_t from = path.back();
                    for (std::size_t w = next[depth]; w < n; ++w) {
                        if (!beats[from * n + w]) continue;
                        if (std::find(path.begin(), path.end(), w) != path.end()) continue;
                        next[depth] = w + 1;
                        path.push_back(w);
                        ++depth;
                        if (depth < K) next[depth] = s + 1;
                        advanced = true;
                        break;
                    }
                    if (!advanced) {
                        if (depth == 1) break;
                        path.pop_back();
                        --depth;
                    }
                }
            }
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
