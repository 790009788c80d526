#include "tournament/tournament.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <boost/graph/adjacency_list.hpp>
#include <boost/graph/strong_components.hpp>
#include <cmath>

#include "core/error.hpp"
#include "race/outcome.hpp"
#include "tournament/cycles.hpp"
#include "tournament/equilibrium.hpp"

namespace overshoot {

namespace {

using Digraph = boost::adjacency_list<boost::vecS, boost::vecS, boost::directedS>;

// Components of a relation given as an n x n 0/1 matrix, renumbered so that
// component ids follow the first option of each component in input order.
std::vector<int> components_of(std::size_t n, const std::vector<char>& rel) {
    Digraph g(n);
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = 0; j < n; ++j)
            if (i != j && rel[i * n + j]) boost::add_edge(i, j, g);
    std::vector<int> raw(n);
    boost::strong_components(g, boost::make_iterator_property_map(raw.begin(), boost::get(boost::vertex_index, g)));
    std::vector<int> renumber(n, -1), out(n);
    int next = 0;
    for (std::size_t v = 0; v < n; ++v) {
        if (renumber[raw[v]] < 0) renumber[raw[v]] = next++;
        out[v] = renumber[raw[v]];
    }
    return out;
}

void check_matrix(const PairwiseMatrix& m) {
    const std::size_t n = m.size();
    if (n == 0) throw InputError("a tournament needs at least one option");
    if (m.win.size() != n * n || m.tie.size() != n * n || m.neither.size() != n * n || m.bound.size() != n * n)
        throw InternalError("pairwise matrix of the wrong size");
    require_distinct_names(m.names);
}

}  // namespace

Tournament analyse(PairwiseMatrix matrix, const TournamentSettings& settings) {
    check_matrix(matrix);
    if (settings.max_cycle_length < 3)
        throw InputError(fmt::format("the cycle length limit must be at least 3, got {}", settings.max_cycle_length));
    Tournament t;
    t.settings = settings;
    t.matrix = std::move(matrix);
    const std::size_t n = t.size();
    const PairwiseMatrix& m = t.matrix;

    t.margin.assign(n * n, 0.0);
    t.beats.assign(n * n, 0);
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = 0; j < n; ++j)
            if (i != j) t.margin[i * n + j] = m.margin(i, j);
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = 0; j < n; ++j) {
            if (i == j) continue;
            // The bound of a pair is one number whichever seat is A; take the larger
            // of the two stored so that i beats j and j beats i never both hold.
            double bound = std::max(m.bound[i * n + j], m.bound[j * n + i]);
            if (decided(t.margin[i * n + j], bound) > 0) {
                t.beats[i * n + j] = 1;
                t.arcs.push_back({i, j, t.margin[i * n + j], bound});
            } else if (i < j && decided(t.margin[j * n + i], bound) <= 0) {
                t.undecided.emplace_back(i, j);
            }
        }

    t.copeland.assign(n, 0.0);
    for (const Arc& a : t.arcs) t.copeland[a.from] += 1;
    for (auto [i, j] : t.undecided) {
        t.copeland[i] += 0.5;
        t.copeland[j] += 0.5;
    }
    for (std::size_t i = 0; i < n && n > 1; ++i) {
        bool wins_all = true, loses_all = true;
        for (std::size_t j = 0; j < n; ++j) {
            if (i == j) continue;
            wins_all = wins_all && t.beats[i * n + j];
            loses_all = loses_all && t.beats[j * n + i];
        }
        if (wins_all) t.condorcet_winner = i;
        if (loses_all) t.condorcet_loser = i;
    }

    // Components of the dominance digraph.
    const std::vector<int> comp = components_of(n, t.beats);
    int ncomp = n ? *std::max_element(comp.begin(), comp.end()) + 1 : 0;
    t.components.assign(ncomp, {});
    for (std::size_t v = 0; v < n; ++v) t.components[comp[v]].push_back(v);
    t.acyclic = ncomp == static_cast<int>(n);

    // Top cycle: the Smith set, counting undecided pairs as ties. In the
    // relation "not beaten by" (x -> y unless y beats x) every two options are
    // joined, so its components are totally ordered; the top cycle is the
    // component no outside option reaches.
    std::vector<char> weak(n * n, 0);
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = 0; j < n; ++j)
            if (i != j && !t.beats[j * n + i]) weak[i * n + j] = 1;
    const std::vector<int> wcomp = components_of(n, weak);
    std::vector<char> reached(n, 0);
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = 0; j < n; ++j)
            if (weak[i * n + j] && wcomp[i] != wcomp[j]) reached[wcomp[j]] = 1;
    for (std::size_t v = 0; v < n; ++v)
        if (!reached[wcomp[v]]) t.top_cycle.push_back(v);

    // Cyclic triads by direct enumeration (undecided pairs make the score
    // formula of a complete tournament inapplicable).
    for (std::size_t a = 0; a < n; ++a)
        for (std::size_t b = a + 1; b < n; ++b)
            for (std::size_t c = b + 1; c < n; ++c) {
                bool fwd = t.beats[a * n + b] && t.beats[b * n + c] && t.beats[c * n + a];
                bool back = t.beats[a * n + c] && t.beats[c * n + b] && t.beats[b * n + a];
                if (fwd || back) ++t.cyclic_triads;
            }
    t.transitive = true;
    for (std::size_t a = 0; a < n && t.transitive; ++a)
        for (std::size_t b = 0; b < n && t.transitive; ++b) {
            if (!t.beats[a * n + b]) continue;
            for (std::size_t c = 0; c < n; ++c)
                if (c != a && t.beats[b * n + c] && !t.beats[a * n + c]) {
                    t.transitive = false;
                    break;
                }
        }

    CycleListing listing = list_cycles(n, t.margin, t.beats, comp, settings.max_cycle_length, settings.cycle_cap);
    t.cycles = std::move(listing.cycles);
    t.cap_hit = listing.cap_hit;
    t.strongest_cycle = strongest_cycle(n, t.margin, t.beats);
    t.strongest_through = strongest_cycles_through(n, t.margin, t.beats, comp);

    // Counters: the largest margin against each option; earlier input wins ties.
    t.counters.assign(n, {});
    for (std::size_t j = 0; j < n; ++j)
        for (std::size_t i = 0; i < n; ++i)
            if (t.beats[i * n + j] && (!t.counters[j].counter || t.margin[i * n + j] > t.counters[j].margin)) {
                t.counters[j].counter = i;
                t.counters[j].margin = t.margin[i * n + j];
            }

    if (settings.want_mix) t.equilibrium = equilibrium_mix(n, t.margin);
    return t;
}

PairwiseMatrix race_matrix(const Board& board, Order order, const std::vector<Option>& options,
                           const DuelSettings& duel_settings, int threads, const std::vector<int>& starts) {
    if (order == Order::a_first || order == Order::b_first)
        throw InputError(fmt::format(
            "a tournament cannot use the turn order {}: with an alternating order the matrix would depend on the "
            "seat, not the option; use simultaneous or coin (the mean of both seats)",
            to_string(order)));
    PairwiseMatrix m;
    for (const Option& o : options) m.names.push_back(o.name);
    require_distinct_names(m.names);  // before any race is run
    std::vector<Chain> chains;
    chains.reserve(options.size());
    if (!starts.empty() && starts.size() != options.size())
        throw InternalError("race_matrix: one start square per option");
    for (std::size_t i = 0; i < options.size(); ++i)
        chains.push_back(build_chain(board, options[i], starts.empty() ? 0 : starts[i]));
    std::vector<DuelResult> r = duel_matrix(chains, order, duel_settings, threads);
    const std::size_t n = options.size();
    m.win.assign(n * n, 0.0);
    m.tie.assign(n * n, 0.0);
    m.neither.assign(n * n, 0.0);
    m.bound.assign(n * n, 0.0);
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = 0; j < n; ++j) {
            if (i == j) continue;
            const DuelResult& d = r[i * n + j];
            m.win[i * n + j] = static_cast<double>(d.p_a_wins);
            m.tie[i * n + j] = static_cast<double>(d.p_tie);
            m.neither[i * n + j] = static_cast<double>(d.p_neither);
            // The margin is rounded to double here: widen the bound by that rounding.
            m.bound[i * n + j] = rounded_margin_bound(d.error_bound());
            if (!d.bound_proven || !d.target_met) m.bounds_proven = false;
        }
    return m;
}

}  // namespace overshoot
