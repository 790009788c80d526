#include "race/exact.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/parallel.hpp"
#include "race/exact_methods.hpp"
#include "race/outcome.hpp"

namespace overshoot {

std::string_view to_string(ExactMethod m) {
    switch (m) {
        case ExactMethod::pair_programme: return "exact pair programme";
        case ExactMethod::elimination: return "exact elimination";
        case ExactMethod::lifting: return "exact lifting";
    }
    return "?";
}

namespace {

std::array<mpq_class, 3> solve_ordered(const Chain& a, const Chain& b, bool a_first) {
    if (a.forward_only) return exact_pair_programme(a, b, a_first);
    return exact_elimination(a, b, a_first);
}

}  // namespace

std::string exact_refusal(const Chain& a, const Chain& b) {
    if (a.length != b.length) return "the two chains are on different boards";
    if (a.forward_only) return {};
    if (a.length <= exact_elimination_max_squares) return {};
    return fmt::format(
        "exact mode: pieces can move backward on this board (a backward jump or the bounce rule) and its {} "
        "squares exceed the {} that exact elimination handles; omit --exact to get probabilities with a "
        "proven error bound",
        a.length, exact_elimination_max_squares);
}

ExactDuel exact_duel(const Chain& a, const Chain& b, Order order) {
    if (std::string why = exact_refusal(a, b); !why.empty()) throw LimitError(why);
    ExactDuel r;
    r.method = a.forward_only ? ExactMethod::pair_programme : ExactMethod::elimination;
    using Outcome = std::array<mpq_class, 3>;  // win, loss, tie
    const Outcome v = by_turn_order(
        order, [&](bool swapped, bool alternating) { return swapped ? solve_ordered(b, a, alternating) : solve_ordered(a, b, alternating); },
        [](Outcome x) {
            std::swap(x[0], x[1]);
            return x;
        },
        [](const Outcome& x, const Outcome& y) { return Outcome{(x[0] + y[0]) / 2, (x[1] + y[1]) / 2, 0}; });
    r.p_a_wins = v[0];
    r.p_b_wins = v[1];
    r.p_tie = v[2];
    r.p_neither = 1 - r.p_a_wins - r.p_b_wins - r.p_tie;
    if (r.p_neither < 0) throw InternalError("exact duel: the outcomes exceed 1");
    return r;
}

std::vector<ExactDuel> exact_duels(const std::vector<std::pair<const Chain*, const Chain*>>& pairs, Order order,
                                   int threads) {
    std::vector<ExactDuel> out(pairs.size());
    for (const auto& [a, b] : pairs)
        if (std::string why = exact_refusal(*a, *b); !why.empty()) throw LimitError(why);
    parallel_for(pairs.size(), threads,
                 [&](std::size_t i) { out[i] = exact_duel(*pairs[i].first, *pairs[i].second, order); });
    return out;
}

std::vector<std::optional<ExactDuel>> exact_matrix(const std::vector<Chain>& chains, Order order, int threads) {
    const std::size_t n = chains.size();
    const bool seats_matter = order == Order::a_first || order == Order::b_first;
    std::vector<std::pair<std::size_t, std::size_t>> jobs;
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = 0; j < n; ++j)
            if (i != j && (i < j || seats_matter)) jobs.emplace_back(i, j);
    std::vector<std::pair<const Chain*, const Chain*>> pairs;
    for (auto [i, j] : jobs) pairs.emplace_back(&chains[i], &chains[j]);
    std::vector<ExactDuel> res = exact_duels(pairs, order, threads);
    std::vector<std::optional<ExactDuel>> out(n * n);
    for (std::size_t k = 0; k < jobs.size(); ++k) {
        auto [i, j] = jobs[k];
        out[i * n + j] = res[k];
        if (!seats_matter) {
            ExactDuel s = res[k];
            std::swap(s.p_a_wins, s.p_b_wins);
            out[j * n + i] = s;
        }
    }
    return out;
}

}  // namespace overshoot
