#include "tournament/cycles.hpp"

#include <algorithm>
#include <boost/graph/adjacency_list.hpp>
#include <boost/graph/dijkstra_shortest_paths.hpp>
#include <boost/graph/strong_components.hpp>
#include <cstdint>
#include <deque>
#include <functional>
#include <limits>

#include "core/error.hpp"

namespace overshoot {

namespace {

using Digraph = boost::adjacency_list<boost::vecS, boost::vecS, boost::directedS, boost::no_property,
                                      boost::property<boost::edge_weight_t, double>>;

// Fixed-size bit set over the options; the listing's inner loop is on these.
struct Bits {
    std::vector<std::uint64_t> w;
    explicit Bits(std::size_t n = 0) : w((n + 63) / 64, 0) {}
    void set(std::size_t i) { w[i >> 6] |= std::uint64_t{1} << (i & 63); }
    void reset(std::size_t i) { w[i >> 6] &= ~(std::uint64_t{1} << (i & 63)); }
    bool test(std::size_t i) const { return (w[i >> 6] >> (i & 63)) & 1; }
};

struct ArcRef {
    std::size_t from, to;
    double margin;
};

// Arcs whose two ends share a component, strongest first, then input order.
std::vector<ArcRef> cycle_arcs(std::size_t n, const std::vector<double>& margin, const std::vector<char>& beats,
                               const std::vector<int>* component) {
    std::vector<ArcRef> arcs;
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = 0; j < n; ++j)
            if (i != j && beats[i * n + j] && (!component || (*component)[i] == (*component)[j]))
                arcs.push_back({i, j, margin[i * n + j]});
    std::stable_sort(arcs.begin(), arcs.end(), [](const ArcRef& a, const ArcRef& b) { return a.margin > b.margin; });
    return arcs;
}

double cycle_strength(std::size_t n, const std::vector<double>& margin, const std::vector<std::size_t>& c) {
    double s = std::numeric_limits<double>::infinity();
    for (std::size_t k = 0; k < c.size(); ++k) s = std::min(s, margin[c[k] * n + c[(k + 1) % c.size()]]);
    return s;
}

}  // namespace

void rotate_to_first(std::vector<std::size_t>& cycle) {
    std::rotate(cycle.begin(), std::min_element(cycle.begin(), cycle.end()), cycle.end());
}

// Arcs are added strongest first. A cycle is found when its weakest arc (the
// last of its arcs to be added) goes in, as that arc (u -> v) closed by a
// simple path v ~> u through arcs already present; so cycles come out in order
// of strength, each exactly once, and the search can stop at the cap. The path
// search is pruned by the set of vertices that reach u within the remaining
// steps (a backward breadth-first layering on bit sets).
CycleListing list_cycles(std::size_t n, const std::vector<double>& margin, const std::vector<char>& beats,
                         const std::vector<int>& component, int max_length, std::size_t cap) {
    CycleListing out;
    if (max_length < 3 || n < 3 || cap == 0) {
        // Nothing can be listed; still say whether something was cut.
        if (cap == 0) out.cap_hit = strongest_cycle(n, margin, beats).has_value();
        return out;
    }
    const std::vector<ArcRef> arcs = cycle_arcs(n, margin, beats, &component);
    const std::size_t words = (n + 63) / 64;
    std::vector<Bits> succ(n, Bits(n)), pred(n, Bits(n));
    const std::size_t max_path = static_cast<std::size_t>(max_length) - 1;  // arcs on the path v ~> u
    std::vector<Bits> reach(max_path + 1, Bits(n));  // reach[d]: reaches u in <= d arcs
    std::vector<std::size_t> path;
    Bits on_path(n);
    std::vector<Cycle> found;
    bool stop = false;

    for (const ArcRef& a : arcs) {
        const std::size_t u = a.from, v = a.to;
        // Backward layers from u, only as deep as needed.
        reach[0] = Bits(n);
        reach[0].set(u);
        for (std::size_t d = 1; d <= max_path; ++d) {
            reach[d] = reach[d - 1];
            for (std::size_t wi = 0; wi < words; ++wi) {
                std::uint64_t bits = reach[d - 1].w[wi];
                while (bits) {
                    std::size_t x = wi * 64 + static_cast<std::size_t>(__builtin_ctzll(bits));
                    bits &= bits - 1;
                    for (std::size_t k = 0; k < words; ++k) reach[d].w[k] |= pred[x].w[k];
                }
            }
        }
        if (reach[max_path].test(v)) {
            path.assign(1, v);
            on_path = Bits(n);
            on_path.set(v);
            on_path.set(u);  // u closes the path, it is never an inner vertex
            // Depth-first over successors in input order.
            std::function<void(std::size_t, std::size_t)> extend = [&](std::size_t x, std::size_t used) {
                if (stop) return;
                if (succ[x].test(u)) {
                    Cycle c;
                    c.options.reserve(path.size() + 1);
                    c.options.push_back(u);
                    c.options.insert(c.options.end(), path.begin(), path.end());
                    rotate_to_first(c.options);
                    c.strength = a.margin;
                    found.push_back(std::move(c));
                    if (found.size() > cap) {
                        stop = true;
                        return;
                    }
                }
                if (used + 1 >= max_path) return;  // no room for another inner vertex
                const Bits& next_ok = reach[max_path - used - 1];
                for (std::size_t wi = 0; wi < words && !stop; ++wi) {
                    std::uint64_t bits = succ[x].w[wi] & next_ok.w[wi] & ~on_path.w[wi];
                    while (bits && !stop) {
                        std::size_t y = wi * 64 + static_cast<std::size_t>(__builtin_ctzll(bits));
                        bits &= bits - 1;
                        path.push_back(y);
                        on_path.set(y);
                        extend(y, used + 1);
                        on_path.reset(y);
                        path.pop_back();
                    }
                }
            };
            extend(v, 0);
        }
        if (stop) break;
        succ[u].set(v);
        pred[v].set(u);
    }
    if (found.size() > cap) {
        found.resize(cap);
        out.cap_hit = true;
    }
    std::stable_sort(found.begin(), found.end(), [](const Cycle& x, const Cycle& y) {
        if (x.strength != y.strength) return x.strength > y.strength;
        if (x.options.size() != y.options.size()) return x.options.size() < y.options.size();
        return x.options < y.options;
    });
    out.cycles = std::move(found);
    return out;
}

// The strongest cycle's strength is the largest threshold t whose digraph of
// arcs with margin >= t still has a strongly connected component with two or
// more options; that is monotone in t, so binary search over the distinct
// margins, testing with Boost.Graph's strong_components.
std::optional<Cycle> strongest_cycle(std::size_t n, const std::vector<double>& margin, const std::vector<char>& beats) {
    const std::vector<ArcRef> arcs = cycle_arcs(n, margin, beats, nullptr);
    std::vector<double> levels;
    for (const ArcRef& a : arcs)
        if (levels.empty() || levels.back() != a.margin) levels.push_back(a.margin);  // descending
    std::vector<int> comp(n);
    auto cyclic_at = [&](std::size_t level) {
        Digraph g(n);
        for (const ArcRef& a : arcs) {
            if (a.margin < levels[level]) break;
            boost::add_edge(a.from, a.to, a.margin, g);
        }
        int k = boost::strong_components(g, boost::make_iterator_property_map(comp.begin(), boost::get(boost::vertex_index, g)));
        return k < static_cast<int>(n);  // fewer components than options: one holds two or more
    };
    if (levels.empty() || !cyclic_at(levels.size() - 1)) return std::nullopt;
    // Smallest index `lo` (strongest level) at which a cycle exists.
    std::size_t lo = 0, hi = levels.size() - 1;  // cyclic_at(hi) holds
    while (lo < hi) {
        std::size_t mid = lo + (hi - lo) / 2;
        if (cyclic_at(mid))
            hi = mid;
        else
            lo = mid + 1;
    }
    cyclic_at(lo);  // leaves the components of the winning level in comp
    const double t = levels[lo];
    std::vector<int> size(n, 0);
    for (std::size_t v = 0; v < n; ++v) ++size[comp[v]];
    std::size_t start = 0;
    while (size[comp[start]] < 2) ++start;  // first option in a cyclic component
    // Shortest cycle through `start` with arcs >= t, breadth first in input order.
    std::vector<std::size_t> parent(n, n);
    std::deque<std::size_t> queue{start};
    parent[start] = start;
    std::size_t last = n;
    while (!queue.empty() && last == n) {
        std::size_t x = queue.front();
        queue.pop_front();
        for (std::size_t y = 0; y < n; ++y) {
            if (!beats[x * n + y] || margin[x * n + y] < t || comp[y] != comp[start]) continue;
            if (y == start) {
                last = x;
                break;
            }
            if (parent[y] == n) {
                parent[y] = x;
                queue.push_back(y);
            }
        }
    }
    Cycle c;
    for (std::size_t x = last; x != start; x = parent[x]) c.options.push_back(x);
    c.options.push_back(start);
    std::reverse(c.options.begin(), c.options.end());
    rotate_to_first(c.options);
    c.strength = cycle_strength(n, margin, c.options);
    return c;
}

// The strongest cycle through x is an arc x -> y followed by the widest path
// (largest smallest margin) from y back to x. Widest paths to x are Boost's
// Dijkstra on the reversed digraph with (max, min) in place of (min, +).
std::vector<std::optional<Cycle>> strongest_cycles_through(std::size_t n, const std::vector<double>& margin,
                                                           const std::vector<char>& beats,
                                                           const std::vector<int>& component) {
    std::vector<std::optional<Cycle>> out(n);
    const std::vector<ArcRef> arcs = cycle_arcs(n, margin, beats, &component);
    Digraph reversed(n);
    // Insert in input order so ties between equally wide paths resolve the same way every run.
    std::vector<ArcRef> by_input = arcs;
    std::sort(by_input.begin(), by_input.end(),
              [](const ArcRef& a, const ArcRef& b) { return a.from != b.from ? a.from < b.from : a.to < b.to; });
    for (const ArcRef& a : by_input) boost::add_edge(a.to, a.from, a.margin, reversed);
    const double inf = std::numeric_limits<double>::infinity();
    std::vector<double> width(n);
    std::vector<std::size_t> next(n);
    std::vector<int> comp_size(n + 1, 0);
    for (std::size_t v = 0; v < n; ++v) ++comp_size[component[v]];
    for (std::size_t x = 0; x < n; ++x) {
        if (comp_size[component[x]] < 2) continue;
        auto index = boost::get(boost::vertex_index, reversed);
        boost::dijkstra_shortest_paths(
            reversed, x,
            boost::predecessor_map(boost::make_iterator_property_map(next.begin(), index))
                .distance_map(boost::make_iterator_property_map(width.begin(), index))
                .distance_compare(std::greater<double>())
                .distance_combine([](double a, double b) { return std::min(a, b); })
                .distance_inf(-inf)
                .distance_zero(inf));
        std::optional<std::size_t> best;
        double best_width = -inf;
        for (std::size_t y = 0; y < n; ++y) {
            if (y == x || !beats[x * n + y] || component[y] != component[x] || width[y] == -inf) continue;
            double w = std::min(margin[x * n + y], width[y]);
            if (w > best_width) {
                best_width = w;
                best = y;
            }
        }
        if (!best) continue;
        Cycle c;
        c.options.push_back(x);
        for (std::size_t y = *best; y != x; y = next[y]) c.options.push_back(y);
        rotate_to_first(c.options);
        c.strength = cycle_strength(n, margin, c.options);
        out[x] = std::move(c);
    }
    return out;
}

void for_each_cycle_of_length(std::size_t n, const std::vector<char>& beats, int length,
                              const std::function<void(const std::vector<std::size_t>&)>& visit) {
    const int K = length;
    if (K < 3) throw InternalError("for_each_cycle_of_length: a cycle has at least 3 options");
    std::vector<std::size_t> path;
    // Cycles of exactly K options starting from their smallest index s.
    for (std::size_t s = 0; s < n; ++s) {
        path.assign(1, s);
        // Iterative DFS with explicit "next candidate" per depth.
        std::vector<std::size_t> next(K, s + 1);
        int depth = 1;
        while (depth >= 1) {
            if (depth == K) {
                // Close the cycle back to s.
                if (beats[path.back() * n + s]) visit(path);
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

}  // namespace overshoot
