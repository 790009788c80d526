#include "race/choice.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <map>

#include "core/error.hpp"

namespace overshoot {

namespace {

struct Solver {
    RaceCache& cache;
    int n, k;
    bool distinct;
    bool seat_free;  // simultaneous order: a race depends only on the multiset of picks
    std::map<std::vector<int>, RaceResult> memo;
    ChoiceResult out;

    // Chance of each seat for a complete pick sequence.
    std::vector<long double> leaf(const std::vector<int>& picks, long double& bound) {
        ++out.leaves;
        std::vector<int> key = picks;
        if (seat_free) std::sort(key.begin(), key.end());
        auto it = memo.find(key);
        if (it == memo.end()) {
            it = memo.emplace(key, cache.run(key)).first;
            ++out.races;
        }
        const RaceResult& r = it->second;
        bound = r.bound;
        out.bound = std::max(out.bound, r.bound);
        out.target_met = out.target_met && r.target_met;
        std::vector<long double> ch(k);
        for (int i = 0; i < k; ++i) {
            // Seat i holds option picks[i]; with seats free, the first copy of
            // that option in the sorted key (copies are equal by symmetry).
            std::size_t pos = static_cast<std::size_t>(i);
            if (seat_free) pos = static_cast<std::size_t>(std::lower_bound(key.begin(), key.end(), picks[i]) - key.begin());
            ch[i] = r.p_wins[pos];
        }
        return ch;
    }

    // Best continuation from `prefix`; bound: error bound of the resulting race.
    ChoicePath solve(std::vector<int>& prefix, long double& bound) {
        const int d = static_cast<int>(prefix.size());
        if (d == k) {
            ChoicePath p;
            p.picks = prefix;
            p.chances = leaf(prefix, bound);
            return p;
        }
        ChoicePath best;
        long double best_bound = 0;
        bool have = false;
        for (int o = 0; o < n; ++o) {
            if (distinct && std::find(prefix.begin(), prefix.end(), o) != prefix.end()) continue;
            prefix.push_back(o);
            long double b = 0;
            ChoicePath sub = solve(prefix, b);
            prefix.pop_back();
            // Strictly better beyond both bounds; otherwise keep the earlier option.
            if (!have || sub.chances[d] > best.chances[d] + b + best_bound) {
                best = std::move(sub);
                best_bound = b;
                have = true;
            }
        }
        if (d == k - 1) {
            if (best.chances[k - 1] + 2 * best_bound < best.chances[0] && out.counterexample.empty()) {
                out.last_always_at_least_first = false;
                out.counterexample = prefix;
            }
        }
        if (d == 1) out.after_first_pick.push_back(best);
        bound = best_bound;
        return best;
    }
};

}  // namespace

ChoiceResult solve_choice(RaceCache& cache, int options, int players, bool distinct) {
    if (players < 2 || players > max_race_pieces)
        throw InputError(fmt::format("--players {}: a choice game takes 2 to {} players", players, max_race_pieces));
    if (options < 1) throw InputError("a choice game needs at least one option");
    if (distinct && options < players)
        throw InputError(fmt::format("--distinct with {} players needs at least {} options, got {}", players, players, options));
    double leaves = 1;
    for (int i = 0; i < players; ++i) leaves *= distinct ? options - i : options;
    if (leaves > 1e7)
        throw LimitError(fmt::format("the pick tree of {} players over {} options has {:.3g} leaves; the limit is 10 million",
                                     players, options, leaves));
    Solver s{cache, options, players, distinct, cache.order() == RaceOrder::simultaneous, {}, {}};
    s.out.players = players;
    s.out.distinct = distinct;
    s.out.last_always_at_least_first = true;
    std::vector<int> prefix;
    long double b = 0;
    s.out.equilibrium = s.solve(prefix, b);
    const auto& ch = s.out.equilibrium.chances;
    s.out.last_at_least_first_on_path = ch[players - 1] + 2 * b >= ch[0];
    return s.out;
}

}  // namespace overshoot
