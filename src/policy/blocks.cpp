#include "policy/blocks.hpp"

#include <algorithm>
#include <boost/graph/compressed_sparse_row_graph.hpp>
#include <boost/graph/strong_components.hpp>

#include "core/error.hpp"

namespace overshoot {

SquareBlocks square_blocks(const std::vector<Chain>& menu) {
    const int n = menu.front().length;
    SquareBlocks out;
    const bool forward = std::all_of(menu.begin(), menu.end(), [](const Chain& c) { return c.forward_only; });
    if (forward) {
        for (int s = n - 1; s >= 0; --s) {
            out.start.push_back(static_cast<int>(out.squares.size()));
            out.squares.push_back(s);
        }
        out.start.push_back(n);
        return out;
    }
    using Graph = boost::compressed_sparse_row_graph<boost::directedS>;
    std::vector<std::pair<std::size_t, std::size_t>> arcs;
    for (const Chain& c : menu)
        for (int s = 0; s < n; ++s)
            for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k)
                if (c.dest[k] != s && c.dest[k] < n)
                    arcs.emplace_back(static_cast<std::size_t>(s), static_cast<std::size_t>(c.dest[k]));
    Graph g(boost::edges_are_unsorted_multi_pass, arcs.begin(), arcs.end(), static_cast<std::size_t>(n));
    std::vector<int> comp(static_cast<std::size_t>(n));
    const int k = boost::strong_components(
        g, boost::make_iterator_property_map(comp.begin(), boost::get(boost::vertex_index, g)));
    // Tarjan's algorithm numbers components as it closes them, so every arc
    // goes to a component numbered no higher: component 0 is a sink. Checked.
    for (const auto& [s, d] : arcs)
        if (comp[d] > comp[s]) throw InternalError("square_blocks: components are not numbered sinks first");
    std::vector<std::vector<int>> members(static_cast<std::size_t>(k));
    for (int s = n - 1; s >= 0; --s) members[comp[s]].push_back(s);
    for (const auto& m : members) {
        out.start.push_back(static_cast<int>(out.squares.size()));
        out.squares.insert(out.squares.end(), m.begin(), m.end());
    }
    out.start.push_back(n);
    return out;
}

}  // namespace overshoot
