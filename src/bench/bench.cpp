#include "bench/bench.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <functional>

#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"
#include "core/fraction.hpp"
#include "core/error.hpp"
#include "core/hash.hpp"
#include "race/exact.hpp"
#include "race/long_duel.hpp"
#include "core/family.hpp"
#include "hunt/hunt.hpp"
#include "race/several_pieces.hpp"
#include "sweep/sweep.hpp"
#include "tournament/tournament.hpp"

namespace overshoot {

namespace {

std::string digits(double x) { return fmt::format("{:.12g}", x); }

// Twelve decimal places: the engine's bounds are about 1e-12, so a digit below
// that (a remainder such as p_neither = 1 - win - loss - tie holds only rounding
// noise there) would change the signature whenever a summation order changes.
std::string duel_digest(const DuelResult& r) {
    auto fixed = [](long double x) { return fmt::format("{:.12f}", static_cast<double>(x)); };
    return fixed(r.p_a_wins) + " " + fixed(r.p_b_wins) + " " + fixed(r.p_tie) + " " + fixed(r.p_neither);
}

}  // namespace

BenchReport run_bench() {
    BenchReport rep;
    rep.signature = fnv_offset_basis;
    // Items shorter than fast_item run several times (a single run of a few
    // milliseconds is mostly noise on a shared machine); the median is shown.
    // Every run must give the same result: the workload is deterministic.
    constexpr double fast_item = 25.0;
    constexpr int fast_runs = 7;
    auto timed = [&](const std::string& name, const std::function<std::string()>& f) {
        std::vector<double> times;
        std::string res;
        while (times.empty() || (times.size() < fast_runs && times.front() < fast_item)) {
            auto t0 = std::chrono::steady_clock::now();
            std::string again = f();
            auto t1 = std::chrono::steady_clock::now();
            times.push_back(std::chrono::duration<double, std::milli>(t1 - t0).count());
            if (times.size() == 1)
                res = std::move(again);
            else if (again != res)
                throw InternalError(fmt::format("bench: '{}' gave a different result when run again", name));
        }
        BenchItem item{name, 0, res, static_cast<int>(times.size()), *std::min_element(times.begin(), times.end())};
        std::sort(times.begin(), times.end());
        item.milliseconds = times[times.size() / 2];
        rep.items.push_back(item);
        rep.total_milliseconds += item.milliseconds;
        rep.signature = fnv1a(rep.signature, name + "=" + res + ";");
    };
    auto duel_on = [](int length, const char* a, const char* b, Order order) {
        Board board = make_board(length, Overshoot::stay, {});
        Chain ca = build_chain(board, parse_option(a));
        Chain cb = build_chain(board, parse_option(b));
        return duel_digest(duel(ca, cb, order));
    };
    timed("duel 1d6 2d6 on 600", [&] { return duel_on(600, "1d6", "2d6", Order::simultaneous); });
    timed("duel 5d12 1d6 on 80", [&] { return duel_on(80, "5d12", "1d6", Order::simultaneous); });
    timed("duel 1d6 2d6 on 100, coin", [&] { return duel_on(100, "1d6", "2d6", Order::coin); });
    timed("duel 2d6 3d6 on 10000", [&] { return duel_on(10000, "2d6", "3d6", Order::simultaneous); });
    timed("duel bounce 1d6 2d6 on 60 with jumps", [&] {
        Board board = make_board(60, Overshoot::bounce, {{5, 20}, {44, 13}, {30, 52}});
        Chain ca = build_chain(board, parse_option("1d6"));
        Chain cb = build_chain(board, parse_option("2d6"));
        return duel_digest(duel(ca, cb, Order::a_first));
    });
    timed("race 1d6 2d6 3d6 4d6 on 1000", [&] {
        Board board = make_board(1000, Overshoot::stay, {});
        std::vector<Chain> cs;
        for (const char* s : {"1d6", "2d6", "3d6", "4d6"}) cs.push_back(build_chain(board, parse_option(s)));
        RaceResult r = race({&cs[0], &cs[1], &cs[2], &cs[3]}, {}, RaceOrder::simultaneous);
        std::string out;
        for (long double p : r.p_wins) out += digits(static_cast<double>(p)) + " ";
        return out + digits(static_cast<double>(r.p_tie));
    });
    timed("sweep 1d6 2d6 3d6 over 1..3000", [&] {
        SweepSpec spec;
        for (const char* s : {"1d6", "2d6", "3d6"}) spec.options.push_back(parse_option(s));
        spec.grid = {1, 3000, 1};
        spec.engine.threads = 1;
        SweepResult r = run_sweep(spec);
        std::string out;
        double sum = 0;
        for (const auto& p : r.variants[0].pairs)
            for (const auto& o : p.at) sum += o.margin();
        for (const auto& c : r.variants[0].crossovers) out += fmt::format("{}-{}@{} ", c.a, c.b, c.after);
        for (const auto& c : r.variants[0].cycles)
            for (auto iv : c.intervals) out += fmt::format("[{},{}] ", iv.first, iv.second);
        return out + digits(sum);
    });
    timed("profile 1d6..6d6 on 10000", [&] {
        Board board = make_board(10000, Overshoot::stay, {});
        std::string out;
        for (int k = 1; k <= 6; ++k) {
            Chain c = build_chain(board, parse_option(fmt::format("{}d6", k)));
            Profile p = profile(c);
            out += digits(p.p_finish) + " " + digits(p.mean_turns_given_finish) + " ";
        }
        return out;
    });
    timed("exact duel 2d6 3d6 on 200", [&] {
        Board board = make_board(200, Overshoot::stay, {});
        ExactDuel e = exact_duel(build_chain(board, parse_option("2d6")), build_chain(board, parse_option("3d6")),
                                 Order::simultaneous);
        // The fractions run to hundreds of digits: digest them, keep the decimals readable.
        return fmt::format("{} {:016x}", decimal_string(e.p_a_wins, 12),
                           fnv1a(fnv_offset_basis, fraction_string(e.p_a_wins) + fraction_string(e.p_tie)));
    });
    timed("tournament NdS N 1..5 S 2..11 on 1000", [&] {
        Board board = make_board(1000, Overshoot::stay, {});
        std::vector<Option> options;
        for (int n = 1; n <= 5; ++n)
            for (int s = 2; s <= 11; ++s) options.push_back(parse_option(fmt::format("{}d{}", n, s)));
        DuelSettings ds;
        ds.want_median = false;
        Tournament t = analyse(race_matrix(board, Order::simultaneous, options, ds));
        std::string out = fmt::format("{} arcs {} cycles {} {}", t.arcs.size(), t.cycles.size(), t.cap_hit,
                                      t.strongest_cycle ? digits(t.strongest_cycle->strength) : "none");
        for (const auto& c : t.counters) out += c.counter ? fmt::format(" {}", *c.counter) : std::string(" -");
        for (std::size_t i : t.equilibrium.support) out += fmt::format(" {}:{:.9f}", i, t.equilibrium.weight[i]);
        return out;
    });
    // Pairs of heavy options (many or large dice) go to the diagonal pair
    // programme: a shortened hunt with many of them.
    timed("hunt dice(count=1..6, sides=4,12,20) over 7..700", [&] {
        HuntSpec spec;
        spec.options = parse_family("dice(count=1..6, sides=4,12,20)");
        spec.grid = {7, 700, 1};
        spec.engine.threads = 1;
        HuntResult h = run_hunt(spec);
        std::string out = fmt::format("{} {} {}", h.cycles_found, h.distinct, h.sets_examined);
        if (!h.cycles.empty()) {
            const HuntCycle& c = h.cycles.front();
            for (std::size_t i : c.options) out += fmt::format(" {}", i);
            out += fmt::format(" {} @{}", digits(c.strongest), c.strongest_length);
        }
        return out;
    });
    timed("duel 1d6 2d6 on 10000", [&] { return duel_on(10000, "1d6", "2d6", Order::simultaneous); });
    // A long board as `overshoot duel` runs it: no chain, finishing windows apart.
    timed("duel 1d6 2d6 on 1000000 from the board", [&] {
        Board board = make_board(1'000'000, Overshoot::stay, {});
        DuelResult r = duel_on_board(board, parse_option("1d6"), parse_option("2d6"), 0, 0, Order::simultaneous);
        return duel_digest(r) + " " + std::to_string(r.median_rounds.value_or(-1));
    });
    // A general board (jumps both ways, bounce): 66 duels by the series.
    timed("tournament 12 options, bounce, 6 jumps on 100", [&] {
        Board board = make_board(100, Overshoot::bounce, {{4, 25}, {21, 42}, {36, 6}, {51, 67}, {62, 19}, {87, 24}});
        std::vector<Option> options;
        for (const char* o : {"1d4", "1d6", "1d8", "1d10", "1d12", "2d4", "2d6", "2d8", "3d4", "3d6", "4d4", "1d20"})
            options.push_back(parse_option(o));
        DuelSettings ds;
        ds.want_median = false;
        PairwiseMatrix m = race_matrix(board, Order::simultaneous, options, ds, 1);
        std::string out;
        for (std::size_t i = 0; i < m.size(); ++i) {
            double row = 0;
            for (std::size_t j = 0; j < m.size(); ++j)
                if (i != j) row += m.win[i * m.size() + j];
            out += digits(row) + " ";
        }
        return out;
    });
    return rep;
}

}  // namespace overshoot
