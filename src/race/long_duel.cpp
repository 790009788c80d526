#include "race/long_duel.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "chain/absorption.hpp"
#include "chain/chain.hpp"
#include "chain/free_walk.hpp"
#include "chain/series.hpp"
#include "core/error.hpp"
#include "core/selfcheck.hpp"

namespace overshoot {

namespace {

// Each tail of the proof below is at most this (docs/method.md, section 4.7).
constexpr long double tail_limit = 1e-16L;

// True when a piece on any square from `from` on is still alive (neither
// finished nor stuck) after `turns` turns with probability at most `limit`:
// the rows of the board from `from` on, stepped backward from "alive" (r_0 = 1
// on live squares, r_{i+1} = Q r_i), in double with its rounding covered.
bool end_decays(const Board& board, const Option& o, int from, long long turns, long double limit,
                std::uint64_t work_cap) {
    while (from > 0 && board.after_jumps[from] != from) --from;
    const Chain c = build_chain(board_from(board, from), o, 0);
    const int len = c.length;
    std::vector<double> r(static_cast<std::size_t>(len)), next(r.size());
    for (int y = 0; y < len; ++y) r[y] = c.stuck[y] ? 0.0 : 1.0;
    const long double gm = gamma_d(c.max_in_degree + 3);
    std::uint64_t work = 0;
    for (long long i = 1; i <= turns; ++i) {
        double top = 0;
        for (int y = 0; y < len; ++y) {
            double x = 0;
            for (auto k = c.row_start[y]; k < c.row_start[y + 1]; ++k)
                if (c.dest[k] < len) x += c.prob_d[k] * r[c.dest[k]];
            next[y] = x;
            top = std::max(top, x);
        }
        r.swap(next);
        work += c.dest.size();
        // Each step loses at most a factor (1 - gamma) against the exact values.
        if (static_cast<long double>(top) * (1 + 2 * i * gm) <= limit) return true;
        if (work > work_cap) return false;
    }
    return false;
}

// What the duel needs of the faster piece: P(finish), P(stuck), E[T 1{finish}]
// and their common bound, and the median turn when it can be read off it.
struct FastSide {
    long double finish = 0, stuck = 0, error = 0, time = 0;
    std::optional<long long> median;  // first t with P(T_fast <= t) >= 1/2, when resolved
    bool median_seen = false;         // the series watched P(T_fast <= t) cross 1/2
};

// Route 1: the fast piece is surely done by the turn tau the slow one surely
// cannot finish before (Chernoff for its walk into the end rows, their decay
// stepped backward): its absorption from the start closes it, with no vector.
std::optional<FastSide> fast_by_decay(const Board& board, const Option& fast, int start, long long tau) {
    // Below n - max_move no move overshoots, so the fast piece is at least as far
    // as its free walk there (jumps only lead forward).
    const int zone = board.length - fast.max_move();
    if (zone <= start) return std::nullopt;
    const auto past = first_turn_past(fast, zone - start, tail_limit);
    if (!past || tau <= *past) return std::nullopt;
    if (!end_decays(board, fast, zone, tau - *past, tail_limit, 200'000'000)) return std::nullopt;
    const StartAbsorption h = absorption_from(board, fast, start);
    return FastSide{h.finish, h.stuck, h.finish_error + h.stuck_error + 2 * tail_limit, h.time, {}, false};
}

// Route 2: the fast piece's series, jumped by powering (long double) to the
// last turn its walk stays on plain squares, stepped until its live mass is
// below 1e-15; it must get there before tau.
std::optional<FastSide> fast_by_series(const Board& board, const Option& fast, int start, long long tau,
                                       std::uint64_t work_cap) {
    const auto t0 = last_turn_short_of(fast, first_irregular_square(board, start) - start, tail_limit);
    if (!t0 || *t0 >= tau) return std::nullopt;  // checked before paying for the walk
    const auto j = jumped_start<long double>(board, fast, start, tail_limit, 1e-20);
    if (!j) return std::nullopt;
    Series s(j->chain, j->mass, 0, j->turn, j->error);
    FastSide out;
    long double rounds = 0;
    while (s.alive() >= 1e-15L) {
        if (s.turn() >= tau || j->work + s.work() > work_cap) return std::nullopt;
        const long double before = s.finished();
        rounds += static_cast<long double>(s.turn() + 1) * s.step();
        if (!out.median_seen && s.finished() >= 0.5L) {
            out.median_seen = true;
            // The crossing is known when both sides of it are clear of the bound.
            const long double e = s.rounding_bound() + 2 * tail_limit;
            if (s.finished() - e >= 0.5L && before + e < 0.5L) out.median = s.turn();
        }
    }
    out.finish = s.finished();
    out.stuck = s.stuck();
    out.time = rounds;
    // The live mass may still finish or stick: either value is short by at most it.
    out.error = s.alive() + s.rounding_bound();
    return out;
}

}  // namespace

std::optional<DuelResult> separated_duel(const Board& board, const Option& a, const Option& b, int start_a,
                                         int start_b, const DuelSettings& s) {
    if (!board.forward_only()) return std::nullopt;
    start_a = resolve_start(board, start_a);
    start_b = resolve_start(board, start_b);
    // tau: the last turn the slow piece surely cannot finish by (its walk short
    // of its first jump source or the finish, Chernoff).
    auto slow_tau = [&](const Option& o, int start) {
        return last_turn_short_of(o, first_irregular_square(board, start) - start, tail_limit);
    };
    const auto tau_a = slow_tau(a, start_a), tau_b = slow_tau(b, start_b);
    std::optional<FastSide> fast;
    bool b_fast = true;
    // The cheap route for either seat first, then the series for either seat.
    const auto n = static_cast<std::uint64_t>(board.length);
    const std::uint64_t cap =
        std::min(s.work_limit, n * n * static_cast<std::uint64_t>(a.max_move() + b.max_move() + 2) / 4);
    for (int route = 0; route < 2 && !fast; ++route) {
        for (bool bf : {true, false}) {
            const auto& tau = bf ? tau_a : tau_b;
            if (!tau) continue;
            const Option& fo = bf ? b : a;
            const int fs = bf ? start_b : start_a;
            fast = route == 0 ? fast_by_decay(board, fo, fs, *tau) : fast_by_series(board, fo, fs, *tau, cap);
            if (fast) {
                b_fast = bf;
                break;
            }
        }
    }
    if (!fast) return std::nullopt;
    const StartAbsorption slow = absorption_from(board, b_fast ? a : b, b_fast ? start_a : start_b);
    // The faster piece wins whenever it finishes, the slower one when it finishes
    // and the faster is stuck for good; nobody shares a round (docs/method.md 4.7).
    const long double fast_wins = fast->finish, slow_wins = slow.finish * fast->stuck;
    DuelResult out;
    out.p_a_wins = b_fast ? slow_wins : fast_wins;
    out.p_b_wins = b_fast ? fast_wins : slow_wins;
    out.p_tie = 0;
    out.p_neither = slow.stuck * fast->stuck;
    // tail_limit: the slow piece by tau; the fast side's error holds its own tails.
    out.bound = tail_limit + fast->error + slow.finish_error + slow.stuck_error + gamma_ld(4);
    out.method.first = DuelMethod::separated;
    const long double finishes = fast->finish + fast->stuck * slow.finish;
    const long double rounds = fast->time + fast->stuck * slow.time;
    out.mean_rounds = finishes > 0 ? static_cast<double>(rounds / finishes) : std::nan("");
    selfcheck::check_distribution({out.p_a_wins, out.p_b_wins, out.p_tie, out.p_neither}, out.bound, "duel");
    out.median_resolved = true;
    if (!s.want_median) return out;
    // Median of R = min(T_A, T_B): before tau, P(R <= t) is the faster piece's
    // P(T <= t) within the tails; after, 1 - stuck_fast (1 - P(T_slow <= t)).
    const long double e = out.bound;
    if (finishes + e < 0.5L) return out;  // null median
    const Option& fo = b_fast ? b : a;
    const Option& so = b_fast ? a : b;
    out.median_resolved = false;
    if (finishes - e < 0.5L) return out;  // too close to call
    const std::uint64_t limit = s.work_limit / 4;
    LevelTurn m;
    if (fast->median_seen) {  // the fast piece's series watched it
        m.turn = fast->median;
        m.resolved = fast->median.has_value();
    } else if (fast->finish - e > 0.5L) {
        m = first_turn_at_level(board, fo, b_fast ? start_b : start_a, 0.5L, e, limit);
    } else if (fast->finish + e < 0.5L) {
        // 1 - q (1 - F_slow) >= 1/2  <=>  F_slow >= 1 - 1/(2q), q > 1/2.
        const long double q = fast->stuck;
        m = first_turn_at_level(board, so, b_fast ? start_a : start_b, 1 - 1 / (2 * q), 2 * e / q, limit);
    } else {
        return out;
    }
    out.median_resolved = m.resolved && m.turn.has_value();
    if (out.median_resolved) out.median_rounds = *m.turn;
    return out;
}

DuelResult duel_on_board(const Board& board, const Option& a, const Option& b, int start_a, int start_b,
                         Order order, const DuelSettings& s) {
    const auto n = static_cast<std::uint64_t>(board.length);
    const bool long_board = n * n * static_cast<std::uint64_t>(a.max_move() + b.max_move() + 2) > 2'000'000;
    if (s.method == DuelMethod::separated || (s.method == DuelMethod::automatic && long_board)) {
        if (auto r = separated_duel(board, a, b, start_a, start_b, s)) return *r;
        if (s.method == DuelMethod::separated)
            throw InputError(
                "method separated: the two pieces' finishing turns cannot be proven apart on this board (it needs a "
                "board where pieces never move backward, long enough for the faster piece to be done before the "
                "slower can arrive)");
    }
    const Chain ca = build_chain(board, a, start_a), cb = build_chain(board, b, start_b);
    return duel(ca, cb, order, s);
}

}  // namespace overshoot
