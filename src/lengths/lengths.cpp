#include "lengths/lengths.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <mutex>

#include "chain/chain.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/parallel.hpp"
#include "lengths/diagonal.hpp"
#include "lengths/distance.hpp"
#include "lengths/series.hpp"
#include "lengths/tallies.hpp"
#include "lengths/zone_tail.hpp"
#include "race/duel.hpp"

namespace overshoot {

using lengths_engine::DistanceModel;

namespace {
// The zone tail covers a length when its proven truncation bound is at most
// this (the rest of a probability's bound is rounding, about 1e-14).
constexpr double tail_target = 1e-13;
}  // namespace

JumpAnchor parse_anchor(std::string_view t) {
    if (t == "start") return JumpAnchor::start;
    if (t == "finish") return JumpAnchor::finish;
    throw InputError(fmt::format("--anchor '{}': expected start or finish", t));
}

bool all_lengths_applies(Overshoot rule, bool has_jumps) { return !has_jumps && rule != Overshoot::bounce; }

std::vector<Jump> anchored_jumps(const std::vector<Jump>& jumps, JumpAnchor anchor, int reference, int length) {
    std::vector<Jump> out;
    for (const Jump& j : jumps) {
        Jump k = j;
        if (anchor == JumpAnchor::finish) {
            k.from = length - (reference - j.from);
            k.to = length - (reference - j.to);
        }
        if (k.from >= 1 && k.from <= length - 1 && k.to >= 0 && k.to <= length && k.from != k.to) out.push_back(k);
    }
    return out;
}

std::vector<PairLengths> all_lengths(const std::vector<Option>& options, Overshoot rule, Order order,
                                     int max_length, const std::vector<PairRequest>& requests,
                                     const LengthSettings& s, const std::function<void(const PairLengths&)>& on_done) {
    if (rule == Overshoot::bounce)
        throw InternalError("all_lengths: the rule bounce goes board by board");
    const int L = max_length;
    if (L < 1) throw InputError("the longest length of a sweep must be at least 1");
    // Which options take part.
    std::vector<char> needed(options.size(), 0);
    for (const auto& r : requests) needed[r.a] = needed[r.b] = 1;
    std::vector<DistanceModel> dist(options.size());
    for (std::size_t i = 0; i < options.size(); ++i) {
        if (!needed[i]) continue;
        limits::check_memory(static_cast<std::uint64_t>(L + 1) * 8 * 10 + chain_memory_estimate(make_board(std::min(L, options[i].max_move() + 1), rule, {}), options[i]),
                             "the all-lengths engine");
        dist[i] = lengths_engine::build_distance_model(options[i], rule, L);
    }
    std::vector<PairLengths> out(requests.size());
    std::vector<char> to_series(requests.size(), 0);
    for (std::size_t k = 0; k < requests.size(); ++k) {
        out[k].a = requests[k].a;
        out[k].b = requests[k].b;
        if (requests[k].a == requests[k].b) throw InternalError("all_lengths: a pair of one option with itself");
        const DistanceModel& A = dist[requests[k].a];
        const DistanceModel& B = dist[requests[k].b];
        const double est = lengths_engine::turns_estimate(A, B, s.close_target);
        // --method zone-tail: the series below the zone tail on every pair it applies to.
        const bool forced = s.method == LengthMethod::zone_tail &&
                            lengths_engine::zone_tail_applies(options[requests[k].a], options[requests[k].b]);
        to_series[k] = forced || lengths_engine::series_chosen(s.method, est, L) ? 1 : 0;
    }
    std::mutex done_mutex;
    auto finish = [&](std::size_t k, std::vector<LengthOutcome> v, LengthMethod method, int tail_from = 0) {
        std::lock_guard<std::mutex> lock(done_mutex);
        out[k].by_length = std::move(v);
        out[k].method = method;
        out[k].tail_from = tail_from;
        out[k].done = true;
        if (on_done) on_done(out[k]);
    };
    // Jobs: the series group first (it shares option vectors), then one per programme pair.
    std::vector<std::size_t> pp_jobs;
    std::vector<std::size_t> series_list;
    for (std::size_t k = 0; k < requests.size(); ++k) (to_series[k] ? series_list : pp_jobs).push_back(k);
    std::vector<std::size_t> fallback;  // series pairs that hit their cap
    std::mutex fallback_mutex;
    // Series pairs on long lengths: the zone tail from the length where its
    // bound meets the target, the series below it (a pair's numbers depend on
    // the pair and L alone: the series of each cut length runs on its own).
    std::vector<lengths_engine::ZoneTail> tails(requests.size());
    const bool try_tail = s.method == LengthMethod::automatic || s.method == LengthMethod::zone_tail;
    if (try_tail) {
        // Each option's zone once (exact coefficients), then every pair.
        std::vector<char> in_series(options.size(), 0);
        for (std::size_t k : series_list) in_series[requests[k].a] = in_series[requests[k].b] = 1;
        std::vector<lengths_engine::ZoneChain> chains(options.size());
        parallel_for(
            options.size(), s.threads,
            [&](std::size_t i) {
                if (in_series[i]) chains[i] = lengths_engine::zone_chain(options[i], rule);
            },
            s.cancel);
        parallel_for(
            series_list.size(), s.threads,
            [&](std::size_t q) {
                const std::size_t k = series_list[q];
                const std::size_t a = requests[k].a, b = requests[k].b;
                tails[k] = lengths_engine::zone_tail(options[a], options[b], chains[a], chains[b], dist[a], dist[b],
                                                     needed_races(order), L, tail_target);
            },
            s.cancel);
    }
    // The series runs to the first length of the grid 2^(i/4) (rounded up)
    // at or above the zone tail's first length, so that pairs share their
    // series group (options are stepped once per group); the tail gives the
    // lengths above. It depends on the pair and L only.
    auto series_top = [&](std::size_t k) {
        if (!try_tail || tails[k].first > L) return L;
        const int need = tails[k].first - 1;
        for (int i = 0;; ++i) {
            const int grid = static_cast<int>(std::ceil(std::exp2(i / 4.0)));
            if (grid >= need) {
                if (grid >= L) return L;
                tails[k].first = grid + 1;
                return grid;
            }
        }
    };
    std::vector<std::vector<std::size_t>> series_groups;  // one per cut length, in order of first appearance
    std::vector<int> top_of(requests.size(), L);
    {
        std::vector<int> tops;
        for (std::size_t k : series_list) {
            const int top = top_of[k] = series_top(k);
            const auto it = std::find(tops.begin(), tops.end(), top);
            if (it == tops.end()) {
                tops.push_back(top);
                series_groups.push_back({k});
            } else {
                series_groups[it - tops.begin()].push_back(k);
            }
        }
    }
    auto series_job = [&](const std::vector<std::size_t>& group) {
        const int top = top_of[group.front()];
        std::vector<lengths_engine::SeriesPair> sp(group.size());
        std::vector<lengths_engine::SeriesOption> opts(options.size());
        if (top >= 1) {
            for (std::size_t i = 0; i < options.size(); ++i) opts[i].o = &dist[i];
            for (std::size_t q = 0; q < group.size(); ++q) {
                const std::size_t k = group[q];
                sp[q].index = k;
                sp[q].A = &opts[requests[k].a];
                sp[q].B = &opts[requests[k].b];
                sp[q].A->used = sp[q].B->used = true;
                sp[q].races = needed_races(order);
                const double est = lengths_engine::turns_estimate(dist[requests[k].a], dist[requests[k].b], s.close_target);
                sp[q].cap = 3 * est + 2000;
            }
            lengths_engine::run_series(opts, sp, top, s.close_target, s.cancel);
        }
        for (std::size_t q = 0; q < group.size(); ++q) {
            const std::size_t k = group[q];
            auto& p = sp[q];
            if (p.failed) {
                std::lock_guard<std::mutex> lock(fallback_mutex);
                fallback.push_back(k);
                continue;
            }
            const DistanceModel& A = dist[requests[k].a];
            const DistanceModel& B = dist[requests[k].b];
            std::vector<double> neither(L + 1, 0);
            for (int d = 1; d <= L; ++d) neither[d] = A.p_never[d] * B.p_never[d];
            if (top == L) {
                finish(k, lengths_engine::combine(order, L, p.sim, p.af, p.bf, neither, p.close_bound), LengthMethod::series);
                continue;
            }
            // Lengths 1..top from the series, the rest from the zone tail.
            lengths_engine::ZoneTail& zt = tails[k];
            auto join = [&](lengths_engine::Tallies& into, const lengths_engine::Tallies& low) {
                if (into.win.empty()) return;
                for (int d = 1; d <= top; ++d) {
                    into.win[d] = low.win[d];
                    into.loss[d] = low.loss[d];
                    if (!low.tie.empty()) into.tie[d] = low.tie[d];
                }
            };
            if (top >= 1) {
                join(zt.sim, p.sim);
                join(zt.af, p.af);
                join(zt.bf, p.bf);
                for (int d = 1; d <= top; ++d) zt.bound[d] = p.close_bound[d];
            }
            finish(k, lengths_engine::combine(order, L, zt.sim, zt.af, zt.bf, neither, zt.bound), LengthMethod::zone_tail,
                   zt.first);
        }
    };
    // A programme pair: the end-zone closure where it is chosen, else the whole programme.
    // A pair alone among the jobs (a sweep of two options) gets every thread.
    const int all_threads = s.threads <= 0 ? default_threads() : s.threads;
    int inner_threads = 1;
    auto programme = [&](std::size_t k) {
        const DistanceModel& A = dist[requests[k].a];
        const DistanceModel& B = dist[requests[k].b];
        const bool closure = lengths_engine::closure_chosen(s.method, A, B, L);
        const auto kind = closure ? lengths_engine::DiagonalKind::closure
                          : s.method == LengthMethod::pairs_scalar ? lengths_engine::DiagonalKind::cells
                                                                   : lengths_engine::DiagonalKind::rows;
        finish(k, lengths_engine::diagonal_duels(A, B, order, L, s.cancel, kind, inner_threads),
               closure ? LengthMethod::closure : LengthMethod::pairs);
    };
    // The series groups come first (handed out first), then one
    // job per programme pair. A cancelled job ends quietly; the flag stops the rest.
    const std::size_t first_pp = series_groups.size();
    if (first_pp + pp_jobs.size() == 1) inner_threads = all_threads;
    parallel_for(
        first_pp + pp_jobs.size(), s.threads,
        [&](std::size_t j) {
            try {
                if (j < first_pp) {
                    series_job(series_groups[j]);
                    return;
                }
                const std::size_t k = pp_jobs[j - first_pp];
                programme(k);
            } catch (const lengths_engine::Cancelled&) {
            }
        },
        s.cancel);
    // Series pairs that did not close in time: the programme, exact whatever the cap.
    std::sort(fallback.begin(), fallback.end());
    inner_threads = all_threads;  // one pair at a time from here
    for (std::size_t k : fallback) {
        if (s.cancel && s.cancel->load()) break;
        try {
            programme(k);
        } catch (const lengths_engine::Cancelled&) {
            break;
        }
    }
    return out;
}

namespace {

// One result per requested pair, every length 0..top, computed board by board.
std::vector<PairLengths> board_results(const std::vector<PairRequest>& requests, int top) {
    std::vector<PairLengths> out(requests.size());
    for (std::size_t k = 0; k < requests.size(); ++k) {
        out[k].a = requests[k].a;
        out[k].b = requests[k].b;
        out[k].method = LengthMethod::board;
        out[k].by_length.assign(top + 1, LengthOutcome{});
    }
    return out;
}

LengthOutcome outcome_of(const DuelResult& r) {
    LengthOutcome o;
    o.p_a_wins = static_cast<double>(r.p_a_wins);
    o.p_b_wins = static_cast<double>(r.p_b_wins);
    o.p_tie = static_cast<double>(r.p_tie);
    o.p_neither = static_cast<double>(r.p_neither);
    // Rounded to double here: widen the bound by that rounding.
    o.bound = bound_after_rounding(static_cast<double>(r.bound));
    if (!r.bound_proven || !r.target_met) o.bound = std::numeric_limits<double>::infinity();
    return o;
}

// What both board-by-board paths share: the results to fill, the length the
// jumps are anchored to, and one board per length.
struct BoardByBoard {
    std::vector<PairLengths> out;
    int anchor_length = 0;
    DuelSettings duel;

    BoardByBoard(const std::vector<int>& lengths, const std::vector<PairRequest>& requests, int reference) {
        const int top = lengths.empty() ? 0 : *std::max_element(lengths.begin(), lengths.end());
        anchor_length = reference > 0 ? reference : top;
        out = board_results(requests, top);
        duel.want_median = false;  // sweeps need the outcome only
    }
    Board board(int len, Overshoot rule, const std::vector<Jump>& jumps, JumpAnchor anchor) const {
        return make_board(len, rule, anchored_jumps(jumps, anchor, anchor_length, len));
    }
};

}  // namespace

std::vector<PairLengths> board_by_board(const std::vector<Option>& options, Overshoot rule, Order order,
                                        const std::vector<Jump>& jumps, JumpAnchor anchor,
                                        const std::vector<int>& lengths, const std::vector<PairRequest>& requests,
                                        const LengthSettings& s, int reference) {
    BoardByBoard run(lengths, requests, reference);
    std::atomic<std::size_t> computed{0};
    parallel_for(
        lengths.size(), s.threads,
        [&](std::size_t j) {
            const int len = lengths[j];
            const Board board = run.board(len, rule, jumps, anchor);
            std::vector<Chain> chains(options.size());
            std::vector<char> built(options.size(), 0);
            for (const auto& r : requests)
                for (std::size_t i : {r.a, r.b})
                    if (!built[i]) {
                        chains[i] = build_chain(board, options[i]);
                        built[i] = 1;
                    }
            for (std::size_t k = 0; k < requests.size(); ++k)
                run.out[k].by_length[len] =
                    outcome_of(duel(chains[requests[k].a], chains[requests[k].b], order, run.duel));
            ++computed;
        },
        s.cancel);
    for (auto& p : run.out) p.done = computed == lengths.size();  // false when the cancel flag stopped some lengths
    return std::move(run.out);
}

std::vector<PairLengths> board_by_board_matrix(const std::vector<Option>& options, Overshoot rule, Order order,
                                               const std::vector<Jump>& jumps, JumpAnchor anchor,
                                               const std::vector<int>& lengths, const std::vector<PairRequest>& requests,
                                               const LengthSettings& s, int reference) {
    BoardByBoard run(lengths, requests, reference);
    const std::size_t n = options.size();
    bool stopped = false;
    for (const int len : lengths) {
        if (s.cancel && s.cancel->load()) {
            stopped = true;
            break;
        }
        // Every option, whichever pairs are asked: duel_matrix shares one series
        // per option between pairs, so a pair's numbers would otherwise depend on
        // its company (and a resumed hunt would differ from an uninterrupted one).
        const Board board = run.board(len, rule, jumps, anchor);
        std::vector<Chain> chains;
        chains.reserve(n);
        for (const auto& o : options) chains.push_back(build_chain(board, o));
        const std::vector<DuelResult> m = duel_matrix(chains, order, run.duel, s.threads);
        for (std::size_t k = 0; k < requests.size(); ++k)
            run.out[k].by_length[len] = outcome_of(m[requests[k].a * n + requests[k].b]);
    }
    for (auto& p : run.out) p.done = !stopped;
    return std::move(run.out);
}

}  // namespace overshoot
