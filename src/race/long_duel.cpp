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

// The finishing windows are apart when some turn tau has P(T_slow <= tau) and
// P(tau < T_fast < inf) both at most a few tail_limit. Returns that sum.
std::optional<long double> windows_apart(const Board& board, const Option& fast, int start_fast, const Option& slow,
                                         int start_slow) {
    const int n = board.length;
    // Below n - max_move no move overshoots, so the fast piece is at least as far
    // as its free walk there (jumps only lead forward).
    const int zone = n - fast.max_move();
    if (zone <= start_fast) return std::nullopt;
    const auto past = first_turn_past(fast, zone - start_fast, tail_limit);
    const int f = first_irregular_square(board, start_slow);
    const auto tau = last_turn_short_of(slow, f - start_slow, tail_limit);
    if (!past || !tau || *tau <= *past) return std::nullopt;
    if (!end_decays(board, fast, zone, *tau - *past, tail_limit, 200'000'000)) return std::nullopt;
    return 3 * tail_limit;
}

}  // namespace

std::optional<DuelResult> separated_duel(const Board& board, const Option& a, const Option& b, int start_a,
                                         int start_b, const DuelSettings& s) {
    if (!board.forward_only()) return std::nullopt;
    start_a = resolve_start(board, start_a);
    start_b = resolve_start(board, start_b);
    bool b_fast = true;
    std::optional<long double> tail = windows_apart(board, b, start_b, a, start_a);
    if (!tail) {
        b_fast = false;
        tail = windows_apart(board, a, start_a, b, start_b);
    }
    if (!tail) return std::nullopt;
    const StartAbsorption ha = absorption_from(board, a, start_a), hb = absorption_from(board, b, start_b);
    const StartAbsorption& fast = b_fast ? hb : ha;
    const StartAbsorption& slow = b_fast ? ha : hb;
    // The faster piece wins whenever it finishes, the slower one when it finishes
    // and the faster is stuck for good; nobody shares a round (docs/method.md 4.7).
    const long double fast_wins = fast.finish, slow_wins = slow.finish * fast.stuck;
    DuelResult out;
    out.p_a_wins = b_fast ? slow_wins : fast_wins;
    out.p_b_wins = b_fast ? fast_wins : slow_wins;
    out.p_tie = 0;
    out.p_neither = ha.stuck * hb.stuck;
    out.bound = *tail + ha.finish_error + ha.stuck_error + hb.finish_error + hb.stuck_error + gamma_ld(4);
    out.method.first = DuelMethod::separated;
    const long double finishes = fast.finish + fast.stuck * slow.finish;
    const long double rounds = fast.time + fast.stuck * slow.time;
    out.mean_rounds = finishes > 0 ? static_cast<double>(rounds / finishes) : std::nan("");
    selfcheck::check_distribution({out.p_a_wins, out.p_b_wins, out.p_tie, out.p_neither}, out.bound, "duel");
    out.median_resolved = true;
    if (!s.want_median) return out;
    // Median of R = min(T_A, T_B): before tau, P(R <= t) is the faster piece's
    // P(T <= t) within the tail; after, 1 - stuck_fast (1 - P(T_slow <= t)).
    const long double e = out.bound;
    if (finishes + e < 0.5L) return out;  // null median
    const int fast_start = b_fast ? start_b : start_a, slow_start = b_fast ? start_a : start_b;
    const Option& fo = b_fast ? b : a;
    const Option& so = b_fast ? a : b;
    out.median_resolved = false;
    if (finishes - e < 0.5L) return out;  // too close to call
    const std::uint64_t limit = s.work_limit / 4;
    LevelTurn m;
    if (fast.finish - e > 0.5L) {
        m = first_turn_at_level(board, fo, fast_start, 0.5L, e, limit);
    } else if (fast.finish + e < 0.5L) {
        // 1 - q (1 - F_slow) >= 1/2  <=>  F_slow >= 1 - 1/(2q), q > 1/2.
        const long double q = fast.stuck;
        m = first_turn_at_level(board, so, slow_start, 1 - 1 / (2 * q), 2 * e / q, limit);
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
