#include "race/exact.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <atomic>
#include <cmath>
#include <map>
#include <memory>
#include <mutex>
#include <thread>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "race/exact_methods.hpp"

namespace overshoot {

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
    r.method = a.forward_only ? "exact pair programme" : "exact elimination";
    auto fill = [&](const std::array<mpq_class, 3>& v, bool swap) {
        r.p_a_wins = swap ? v[1] : v[0];
        r.p_b_wins = swap ? v[0] : v[1];
        r.p_tie = v[2];
    };
    switch (order) {
        case Order::simultaneous: fill(solve_ordered(a, b, false), false); break;
        case Order::a_first: fill(solve_ordered(a, b, true), false); break;
        case Order::b_first: fill(solve_ordered(b, a, true), true); break;
        case Order::coin: {
            auto x = solve_ordered(a, b, true);
            auto y = solve_ordered(b, a, true);
            r.p_a_wins = (x[0] + y[1]) / 2;
            r.p_b_wins = (x[1] + y[0]) / 2;
            r.p_tie = 0;
            break;
        }
    }
    r.p_neither = 1 - r.p_a_wins - r.p_b_wins - r.p_tie;
    if (r.p_neither < 0) throw InternalError("exact duel: the outcomes exceed 1");
    return r;
}

std::vector<ExactDuel> exact_duels(const std::vector<std::pair<const Chain*, const Chain*>>& pairs, Order order,
                                   int threads) {
    std::vector<ExactDuel> out(pairs.size());
    for (const auto& [a, b] : pairs)
        if (std::string why = exact_refusal(*a, *b); !why.empty()) throw LimitError(why);
    if (threads <= 0) threads = static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
    threads = std::min<int>(threads, static_cast<int>(std::max<std::size_t>(pairs.size(), 1)));
    std::atomic<std::size_t> next{0};
    std::exception_ptr failure;
    std::mutex mu;
    auto work = [&] {
        try {
            for (std::size_t i; (i = next.fetch_add(1)) < pairs.size();)
                out[i] = exact_duel(*pairs[i].first, *pairs[i].second, order);
        } catch (...) {
            std::lock_guard<std::mutex> lock(mu);
            if (!failure) failure = std::current_exception();
            next.store(pairs.size());
        }
    };
    std::vector<std::thread> pool;
    for (int t = 1; t < threads; ++t) pool.emplace_back(work);
    work();
    for (auto& t : pool) t.join();
    if (failure) std::rethrow_exception(failure);
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
