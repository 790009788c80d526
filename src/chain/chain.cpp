#include "chain/chain.hpp"

#include <algorithm>
#include <boost/graph/compressed_sparse_row_graph.hpp>
#include <boost/graph/breadth_first_search.hpp>

#include "core/limits.hpp"

namespace overshoot {

int move_destination(const Board& b, int s, int m) {
    const int n = b.length;
    int t = s + m;
    if (t < n) return b.after_jumps[t];
    if (t == n) return n;
    switch (b.rule) {
        case Overshoot::stay: return s;
        case Overshoot::pass: return n;
        case Overshoot::bounce: {
            int excess = t - n;
            if (excess > n) return b.after_jumps[0];
            return b.after_jumps[n - excess];
        }
    }
    return s;
}

namespace {

// Marks every square from which some square of `targets` (the finish is
// square N) can be reached: one compressed graph of the reversed arcs, with a
// source joined to every target, and one breadth-first search.
std::vector<char> reaching(const Chain& c, const std::vector<int>& targets) {
    using Graph = boost::compressed_sparse_row_graph<boost::directedS>;
    const int n = c.length;
    const std::size_t source = static_cast<std::size_t>(n) + 1;
    std::vector<std::pair<std::size_t, std::size_t>> reversed;
    reversed.reserve(c.dest.size() + targets.size());
    for (int s = 0; s < n; ++s)
        for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k)
            if (c.dest[k] != s) reversed.emplace_back(static_cast<std::size_t>(c.dest[k]), static_cast<std::size_t>(s));
    for (int t : targets) reversed.emplace_back(source, static_cast<std::size_t>(t));
    Graph g(boost::edges_are_unsorted_multi_pass, reversed.begin(), reversed.end(), source + 1);
    std::vector<boost::default_color_type> color(boost::num_vertices(g), boost::white_color);
    auto cmap = boost::make_iterator_property_map(color.begin(), boost::get(boost::vertex_index, g));
    boost::breadth_first_search(g, source, boost::color_map(cmap));
    std::vector<char> out(static_cast<std::size_t>(n), 0);
    for (int s = 0; s < n; ++s) out[s] = color[s] == boost::white_color ? 0 : 1;
    return out;
}

void mark_stuck(Chain& c) {
    // The finish reaches, along reversed arcs, exactly the squares that can still finish.
    const std::vector<char> can_finish = reaching(c, {c.length});
    c.stuck.assign(static_cast<std::size_t>(c.length), 0);
    for (int s = 0; s < c.length; ++s) c.stuck[s] = can_finish[s] ? 0 : 1;
}

void set_plain_block(Chain& c, const Board& board, const Option& option) {
    const int n = c.length;
    const long double den = static_cast<long double>(option.denominator);
    c.plain_end = std::max(0, n - option.max_move());
    c.move_prob.assign(static_cast<std::size_t>(option.max_move()) + 1, 0);
    c.move_prob_d.assign(c.move_prob.size(), 0);
    for (int m = 0; m <= option.max_move(); ++m) {
        c.move_prob[m] = static_cast<long double>(option.weight[m]) / den;
        c.move_prob_d[m] = static_cast<double>(c.move_prob[m]);
    }
    for (int q = 0; q < n; ++q) {
        const int to = board.after_jumps[q];
        if (to != q && (to == n || !c.stuck[to]))
            c.redirects.push_back({q, to});
        else if (c.stuck[to])
            c.redirects.push_back({q, -1});
    }
}

}  // namespace

std::uint64_t chain_memory_estimate(const Board& board, const Option& option) {
    std::uint64_t entries = static_cast<std::uint64_t>(board.length) *
                            static_cast<std::uint64_t>(option.max_move() + 1);
    // dest + weight + prob per entry, graph edges, per-square arrays.
    return entries * (4 + 8 + 16 + 32) + static_cast<std::uint64_t>(board.length) * 128;
}

Chain build_chain(const Board& board, const Option& option, int start) {
    limits::check_memory(chain_memory_estimate(board, option), "the chain of this option on this board");
    Chain c;
    c.start = resolve_start(board, start);
    const int n = board.length;
    c.length = n;
    c.denominator = option.denominator;
    c.forward_only = board.forward_only();
    c.max_move = option.max_move();
    c.row_start.assign(static_cast<std::size_t>(n) + 1, 0);
    c.stay_weight.assign(n, 0);
    c.finish_weight.assign(n, 0);
    const long double den = static_cast<long double>(option.denominator);
    std::vector<std::pair<int, std::uint64_t>> row;
    std::vector<int> in_degree(static_cast<std::size_t>(n) + 1, 0);
    // Terms per destination when each move is applied on its own (jumps and
    // overshoot rules followed), the finish included: the plain block's sums.
    std::vector<int> in_moves(static_cast<std::size_t>(n) + 1, 0);
    for (int s = 0; s < n; ++s) {
        row.clear();
        // Moves that end back on s (overshoot under stay, moves of 0) are merged
        // up front; the rest usually arrive sorted, so sorting is rarely needed.
        std::uint64_t stay = 0;
        for (int m = 0; m <= option.max_move(); ++m) {
            if (option.weight[m] == 0) continue;
            const int d = move_destination(board, s, m);
            ++in_moves[d];
            if (d == s)
                stay += option.weight[m];
            else
                row.emplace_back(d, option.weight[m]);
        }
        if (stay > 0) row.emplace_back(s, stay);
        if (!std::is_sorted(row.begin(), row.end())) std::sort(row.begin(), row.end());
        for (std::size_t i = 0; i < row.size(); ++i) {
            if (!c.dest.empty() && static_cast<std::int64_t>(c.dest.size()) > c.row_start[s] &&
                c.dest.back() == row[i].first) {
                c.weight.back() += row[i].second;
                continue;
            }
            c.dest.push_back(row[i].first);
            c.weight.push_back(row[i].second);
        }
        c.row_start[s + 1] = static_cast<std::int64_t>(c.dest.size());
        for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k) {
            if (c.dest[k] == s) c.stay_weight[s] = c.weight[k];
            if (c.dest[k] == n) c.finish_weight[s] = c.weight[k];
            ++in_degree[c.dest[k]];
        }
    }
    c.prob.resize(c.weight.size());
    c.prob_d.resize(c.weight.size());
    for (std::size_t k = 0; k < c.weight.size(); ++k) {
        c.prob[k] = static_cast<long double>(c.weight[k]) / den;
        c.prob_d[k] = static_cast<double>(c.prob[k]);
    }
    c.stay.resize(n);
    c.leave.resize(n);
    c.finish.resize(n);
    for (int s = 0; s < n; ++s) {
        c.stay[s] = static_cast<long double>(c.stay_weight[s]) / den;
        // Computed from integers, never as 1 - stay: heavy options stay with
        // probability within 1e-6 of 1 and the subtraction would lose digits.
        c.leave[s] = static_cast<long double>(option.denominator - c.stay_weight[s]) / den;
        c.finish[s] = static_cast<long double>(c.finish_weight[s]) / den;
    }
    c.max_in_degree = *std::max_element(in_degree.begin(), in_degree.end());
    c.max_in_moves = *std::max_element(in_moves.begin(), in_moves.end());
    c.resting.resize(n);
    for (int s = 0; s < n; ++s) c.resting[s] = board.after_jumps[s] == s ? 1 : 0;
    mark_stuck(c);
    c.row_stays_live.assign(n, 1);
    for (int s = 0; s < n; ++s)
        for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k)
            if (c.dest[k] == n || c.stuck[c.dest[k]]) c.row_stays_live[s] = 0;
    set_plain_block(c, board, option);
    return c;
}

std::vector<char> certain_to_finish(const Chain& c) {
    std::vector<int> stuck;
    for (int s = 0; s < c.length; ++s)
        if (c.stuck[s]) stuck.push_back(s);
    const std::vector<char> can_get_stuck = reaching(c, stuck);
    std::vector<char> out(static_cast<std::size_t>(c.length), 0);
    for (int s = 0; s < c.length; ++s) out[s] = can_get_stuck[s] ? 0 : 1;
    return out;
}

std::vector<int> stuck_squares(const Chain& c) {
    std::vector<int> out;
    for (int s = 0; s < c.length; ++s)
        if (c.stuck[s] && c.resting[s]) out.push_back(s);
    return out;
}

}  // namespace overshoot
