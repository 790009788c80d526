#include "sweep/hunt.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <map>
#include <mutex>
#include <set>
#include <sys/stat.h>

#include "core/error.hpp"
#include "sweep/checkpoint.hpp"

namespace overshoot {

namespace {

std::size_t pair_index(std::size_t n, std::size_t i, std::size_t j) {  // i < j
    return i * n - i * (i + 1) / 2 + (j - i - 1);
}

// What the pairwise data depends on: options, lengths, rules and the method.
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

HuntResult run_hunt(const HuntSpec& spec) {
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
    const std::vector<int> lengths = spec.grid.lengths();
    const std::size_t nl = lengths.size();
    const std::size_t np = n * (n - 1) / 2;
    const std::size_t nv = spec.variants.size();
    // Pair store: margin and bound per (variant, pair, length).
    std::vector<std::vector<double>> margin(nv * np), bound(nv * np);
    std::vector<char> known(nv * np, 0);
    const std::uint64_t fp = hunt_fingerprint(spec);
    if (spec.resume) {
        if (spec.checkpoint.empty()) throw InputError("--resume needs --checkpoint FILE");
        Checkpoint c = load_checkpoint(spec.checkpoint);
        if (c.fingerprint != fp || c.lengths != nl)
            throw InputError(fmt::format("{}: this checkpoint belongs to a different hunt (options, lengths, rules or "
                                         "method differ)",
                                         spec.checkpoint));
        for (auto& r : c.records) {
            if (r.variant >= nv || r.a >= r.b || r.b >= n)
                throw InputError(fmt::format("{}: a record names a pair outside this hunt", spec.checkpoint));
            const std::size_t idx = r.variant * np + pair_index(n, r.a, r.b);
            margin[idx] = std::move(r.margin);
            bound[idx] = std::move(r.bound);
            known[idx] = 1;
        }
    }
    std::atomic<bool> local_stop{false};
    std::atomic<bool>* stop = spec.cancel ? spec.cancel : &local_stop;
    std::mutex store_mutex;
    long long fresh = 0;
    std::size_t done_count = std::count(known.begin(), known.end(), 1);
    auto last_save = std::chrono::steady_clock::now();
    auto save = [&] {  // caller holds store_mutex
        if (spec.checkpoint.empty()) return;
        Checkpoint c;
        c.fingerprint = fp;
        c.lengths = static_cast<std::uint32_t>(nl);
        for (std::size_t v = 0; v < nv; ++v)
            for (std::size_t i = 0; i < n; ++i)
                for (std::size_t j = i + 1; j < n; ++j) {
                    const std::size_t idx = v * np + pair_index(n, i, j);
                    if (!known[idx]) continue;
                    CheckpointRecord r;
                    r.variant = static_cast<std::uint32_t>(v);
                    r.a = static_cast<std::uint32_t>(i);
                    r.b = static_cast<std::uint32_t>(j);
                    r.margin = margin[idx];
                    r.bound = bound[idx];
                    c.records.push_back(std::move(r));
                }
        save_checkpoint(spec.checkpoint, c);
        last_save = std::chrono::steady_clock::now();
    };
    if (spec.progress) spec.progress(done_count, nv * np);
    for (std::size_t v = 0; v < nv && !stop->load(); ++v) {
        std::vector<PairRequest> req;
        for (std::size_t i = 0; i < n; ++i)
            for (std::size_t j = i + 1; j < n; ++j)
                if (!known[v * np + pair_index(n, i, j)]) req.push_back({i, j});
        if (req.empty()) continue;
        LengthSettings es = spec.engine;
        es.cancel = stop;
        auto take = [&](const PairLengths& p) {
            std::lock_guard<std::mutex> lock(store_mutex);
            if (stop->load() && spec.stop_after_pairs >= 0 && fresh >= spec.stop_after_pairs) return;
            const std::size_t idx = v * np + pair_index(n, p.a, p.b);
            std::vector<double> m(nl), b(nl);
            for (std::size_t k = 0; k < nl; ++k) {
                const LengthOutcome& o = p.by_length[lengths[k]];
                m[k] = o.margin();
                // The margin is rounded once more here: widen the bound by it.
                b[k] = o.error_bound() + 4 * std::ldexp(1.0, -53);
            }
            margin[idx] = std::move(m);
            bound[idx] = std::move(b);
            known[idx] = 1;
            ++fresh;
            ++done_count;
            if (spec.progress) spec.progress(done_count, nv * np);
            if (spec.stop_after_pairs >= 0 && fresh >= spec.stop_after_pairs) stop->store(true);
            if (std::chrono::steady_clock::now() - last_save > std::chrono::seconds(5)) save();
        };
        const Variant& var = spec.variants[v];
        if (all_lengths_applies(var.rule, false)) {
            all_lengths(spec.options, var.rule, var.order, spec.grid.hi, req, es, take);
        } else {
            auto res = board_by_board(spec.options, var.rule, var.order, {}, JumpAnchor::start, lengths, req, es);
            for (const auto& p : res)
                if (p.done) take(p);
        }
    }
    HuntResult out;
    out.pairs_total = nv * np;
    {
        std::lock_guard<std::mutex> lock(store_mutex);
        out.pairs_known = static_cast<std::size_t>(std::count(known.begin(), known.end(), 1));
        out.complete = out.pairs_known == out.pairs_total;
        save();
    }
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
                    const std::size_t idx = v * np + pair_index(n, i, j);
                    if (!known[idx]) continue;
                    const double m = margin[idx][k], b = bound[idx][k];
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

}  // namespace overshoot
