#include "race/balance.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "chain/chain.hpp"
#include "core/error.hpp"
#include "core/parallel.hpp"
#include "race/duel.hpp"

namespace overshoot {

long double deviation(const RaceResult& r) {
    long double mean = 0;
    for (long double p : r.p_wins) mean += p;
    mean /= static_cast<long double>(r.p_wins.size());
    long double d = 0;
    for (long double p : r.p_wins) d = std::max(d, std::fabs(p - mean));
    return d;
}

namespace {

// Sound slack for comparing a bound with a computed deviation: covers the
// rounding of both (each far below 1e-12 on the boards this search accepts).
constexpr long double compare_slack = 1e-11L;

bool fairer(long double da, const std::vector<int>& a, long double db, const std::vector<int>& b) {
    if (da != db) return da < db;
    return a < b;
}

// Survival bounds of one piece over t, valid whatever its start square
// (envelope) or for one known start (a single track).
struct Envelope {
    std::vector<long double> lo, hi;  // lo[t] <= P(T > t) <= hi[t]
    long double at_lo(std::size_t t) const { return lo[std::min(t, lo.size() - 1)]; }
    long double at_hi(std::size_t t) const { return hi[std::min(t, hi.size() - 1)]; }
};

Envelope of_track(const PieceTrack& tr, std::size_t horizon) {
    Envelope e;
    e.lo.resize(horizon + 1);
    e.hi.resize(horizon + 1);
    const std::size_t last = tr.f.size() - 1;
    for (std::size_t t = 0; t <= horizon; ++t) {
        const std::size_t i = std::min(t, last);
        e.hi[t] = tr.alive[i] + tr.stuck[i];                          // survival only falls
        e.lo[t] = t <= last ? tr.alive[i] + tr.stuck[i] : tr.stuck[last];  // stuck mass only grows
    }
    return e;
}

struct StartSearch {
    RaceCache& cache;
    int n;
    std::vector<int> squares;  // candidate start squares (as given)
    int keep;
    bool prune;
    RaceOrder order;
    std::vector<std::vector<const PieceTrack*>> tracks;  // [option][index into squares]
    std::vector<std::vector<Envelope>> single;           // [option][index]
    std::vector<Envelope> any;                           // [option]: over every start
    std::size_t horizon = 0;
    std::vector<int> assign;  // index into squares per assigned option
    HeadStartResult out;

    long double kept_worst() const {
        return static_cast<int>(out.best.size()) < keep ? 1e9L : out.best.back().deviation;
    }

    // Lower bound on the deviation of every completion of assign[0..r].
    long double lower_bound(int r) const {
        long double max_lo = 0, min_hi = 1e9L;
        for (int i = 0; i <= r; ++i) {
            const PieceTrack& ti = *tracks[i][assign[i]];
            long double lo = 0, hi = ti.alive.back();  // what finishes after the recorded turns
            for (std::size_t t = 1; t < ti.f.size(); ++t) {
                const long double f = ti.f[t];
                if (f != 0) {
                    long double a = f, b = f;
                    for (int j = 0; j < n; ++j) {
                        if (j == i) continue;
                        // Seated: pieces after i have moved t - 1 times when i lands.
                        const std::size_t tj = order == RaceOrder::seated && j > i ? t - 1 : t;
                        const Envelope& e = j <= r ? single[j][assign[j]] : any[j];
                        a *= e.at_lo(tj);
                        b *= e.at_hi(tj);
                    }
                    lo += a;
                    hi += b;
                }
                // Later terms sum to at most alive_i(t) prod_j hi_j(t) (survival only
                // falls); stop once that is negligible and add it to the upper bound.
                long double rest = ti.alive[t];
                for (int j = 0; j < n && rest > 0; ++j)
                    if (j != i) rest *= (j <= r ? single[j][assign[j]] : any[j]).at_hi(t);
                if (rest < 1e-13L) {
                    hi += rest;
                    break;
                }
            }
            hi += ti.rounding;
            lo -= ti.rounding;
            max_lo = std::max(max_lo, lo);
            min_hi = std::min(min_hi, hi);
        }
        // (max p - min p) / 2 <= max |p - mean|, and mean <= 1/n.
        return std::max((max_lo - min_hi) / 2, max_lo - 1.0L / n);
    }

    void leaf() {
        std::vector<int> starts(n), picks(n);
        for (int i = 0; i < n; ++i) {
            starts[i] = squares[assign[i]];
            picks[i] = i;
        }
        ++out.evaluated;
        RaceResult r = cache.run(picks, starts);
        const long double d = deviation(r);
        if (static_cast<int>(out.best.size()) == keep && !fairer(d, starts, out.best.back().deviation, out.best.back().starts))
            return;
        StartAssignment a{starts, d, std::move(r)};
        auto pos = std::find_if(out.best.begin(), out.best.end(), [&](const StartAssignment& b) {
            return fairer(d, starts, b.deviation, b.starts);
        });
        out.best.insert(pos, std::move(a));
        if (static_cast<int>(out.best.size()) > keep) out.best.pop_back();
    }

    void dfs(int r) {
        if (r == n) {
            leaf();
            return;
        }
        for (std::size_t s = 0; s < squares.size(); ++s) {
            assign[r] = static_cast<int>(s);
            if (prune && r >= 1 && r + 1 < n && lower_bound(r) > kept_worst() + compare_slack) {
                ++out.pruned;
                continue;
            }
            dfs(r + 1);
        }
    }
};

}  // namespace

HeadStartResult balance_starts(RaceCache& cache, int n, int lo, int hi, int keep, bool prune) {
    const Board& board = cache.board();
    if (n < 2 || n > max_race_pieces)
        throw InputError(fmt::format("balancing takes 2 to {} options, got {}", max_race_pieces, n));
    if (lo < 0 || hi >= board.length || lo > hi)
        throw InputError(fmt::format("--starts {}..{}: start squares must lie in 0..{}", lo, hi, board.length - 1));
    if (keep < 1) keep = 1;
    StartSearch s{cache, n, {}, keep, prune, cache.order(), {}, {}, {}, 0, {}, {}};
    for (int q = lo; q <= hi; ++q)
        if (board.after_jumps[q] < board.length) s.squares.push_back(q);  // a jump into the finish is no start
    if (s.squares.empty()) throw InputError(fmt::format("--starts {}..{}: no square there can hold a piece", lo, hi));
    double total = std::pow(static_cast<double>(s.squares.size()), n);
    if (total > 1e9)
        throw LimitError(fmt::format("{:.3g} head-start assignments: the limit is 1e9 (narrow --starts)", total));
    s.tracks.resize(n);
    for (int o = 0; o < n; ++o)
        for (int q : s.squares) {
            const PieceTrack& t = cache.track(o, board.after_jumps[q]);
            s.tracks[o].push_back(&t);
            s.horizon = std::max(s.horizon, t.f.size() - 1);
        }
    s.single.resize(n);
    s.any.resize(n);
    for (int o = 0; o < n; ++o) {
        Envelope any;
        any.lo.assign(s.horizon + 1, 1e9L);
        any.hi.assign(s.horizon + 1, 0);
        for (const PieceTrack* t : s.tracks[o]) {
            Envelope e = of_track(*t, s.horizon);
            for (std::size_t i = 0; i <= s.horizon; ++i) {
                any.lo[i] = std::min(any.lo[i], e.lo[i]);
                any.hi[i] = std::max(any.hi[i], e.hi[i]);
            }
            s.single[o].push_back(std::move(e));
        }
        s.any[o] = std::move(any);
    }
    s.assign.assign(n, 0);
    s.out.lo = lo;
    s.out.hi = hi;
    s.out.assignments = static_cast<std::uint64_t>(total);
    s.dfs(0);
    std::vector<int> zero(n, 0), picks(n);
    for (int i = 0; i < n; ++i) picks[i] = i;
    RaceResult r0 = cache.run(picks, zero);
    s.out.from_zero = StartAssignment{zero, deviation(r0), r0};
    return s.out;
}

LengthsResult balance_lengths(const Board& board, const std::vector<Option>& options, RaceOrder order, int lo, int hi,
                              int keep) {
    if (options.size() < 2 || options.size() > static_cast<std::size_t>(max_race_pieces))
        throw InputError(fmt::format("balancing takes 2 to {} options, got {}", max_race_pieces, options.size()));
    if (lo < 1 || lo > hi) throw InputError(fmt::format("--lengths {}..{}: need 1 <= LO <= HI", lo, hi));
    LengthsResult out;
    for (int len = lo; len <= hi; ++len) {
        Board b;
        try {
            b = make_board(len, board.rule, board.jumps);
        } catch (const InputError& e) {
            throw InputError(fmt::format("--lengths at length {}: {}", len, e.what()));
        }
        std::vector<Chain> chains;
        for (const auto& o : options) chains.push_back(build_chain(b, o));
        std::vector<const Chain*> ptr;
        for (const auto& c : chains) ptr.push_back(&c);
        RaceResult r = race(ptr, {}, order);
        out.lengths.push_back({len, deviation(r), std::move(r)});
    }
    std::vector<int> idx(out.lengths.size());
    for (std::size_t i = 0; i < idx.size(); ++i) idx[i] = static_cast<int>(i);
    std::stable_sort(idx.begin(), idx.end(),
                     [&](int a, int b) { return out.lengths[a].deviation < out.lengths[b].deviation; });
    idx.resize(std::min<std::size_t>(idx.size(), static_cast<std::size_t>(std::max(1, keep))));
    out.fairest = idx;
    return out;
}

std::optional<int> dominant_option(const std::vector<Chain>& chains, RaceOrder order) {
    DuelSettings ds;
    ds.want_median = false;
    const Order o = order == RaceOrder::seated ? Order::coin : Order::simultaneous;
    const int n = static_cast<int>(chains.size());
    for (int i = 0; i < n; ++i) {
        bool all = true;
        for (int j = 0; j < n && all; ++j) {
            if (j == i) continue;
            all = duel(chains[i], chains[j], o, ds).a_beats_b();
        }
        if (all) return i;
    }
    return std::nullopt;
}

JumpSearchResult search_jumps(const Board& board, const std::vector<Option>& options, RaceOrder order, int keep) {
    if (board.length > max_jump_search_length)
        throw LimitError(fmt::format("the jump search tries every jump and takes boards up to {} squares, got {}",
                                     max_jump_search_length, board.length));
    if (options.size() < 2 || options.size() > static_cast<std::size_t>(max_race_pieces))
        throw InputError(fmt::format("balancing takes 2 to {} options, got {}", max_race_pieces, options.size()));
    keep = std::max(1, keep);
    RaceSettings rs;
    rs.work_limit = 400'000'000ULL;  // per candidate board; an unmet target is flagged in its race
    JumpSearchResult out;
    {
        std::vector<Chain> chains;
        for (const auto& o : options) chains.push_back(build_chain(board, o));
        std::vector<const Chain*> ptr;
        for (const auto& c : chains) ptr.push_back(&c);
        out.base_race = race(ptr, {}, order, rs);
        out.dominant_before = dominant_option(chains, order);
    }
    out.base_deviation = deviation(out.base_race);
    out.bound = out.base_race.bound;
    auto better = [](const JumpCandidate& a, const JumpCandidate& b) {
        if (a.deviation != b.deviation) return a.deviation < b.deviation;
        return std::pair(a.jump.from, a.jump.to) < std::pair(b.jump.from, b.jump.to);
    };
    auto insert = [&](std::vector<JumpCandidate>& list, const JumpCandidate& c) {
        auto pos = std::find_if(list.begin(), list.end(), [&](const JumpCandidate& x) { return better(c, x); });
        if (static_cast<int>(pos - list.begin()) >= keep) return;
        list.insert(pos, c);
        if (static_cast<int>(list.size()) > keep) list.pop_back();
    };
    const int n = board.length;
    // Every board with one more jump (a loop of jumps is no board).
    std::vector<JumpCandidate> cand;
    std::vector<Board> boards;
    for (int from = 1; from < n; ++from) {
        bool taken = std::any_of(board.jumps.begin(), board.jumps.end(), [&](const Jump& j) { return j.from == from; });
        if (taken) continue;
        for (int to = 0; to <= n; ++to) {
            if (to == from) continue;
            std::vector<Jump> js = board.jumps;
            js.push_back({from, to});
            try {
                boards.push_back(make_board(n, board.rule, js));
            } catch (const InputError&) {
                continue;
            }
            JumpCandidate c;
            c.jump = {from, to};
            cand.push_back(c);
        }
    }
    // The races, on every core; each result lands in its own slot, so the
    // output is the same whatever the thread count.
    parallel_for(cand.size(), 0, [&](std::size_t i) {
        std::vector<Chain> chains;
        for (const auto& o : options) chains.push_back(build_chain(boards[i], o));
        std::vector<const Chain*> ptr;
        for (const auto& c : chains) ptr.push_back(&c);
        cand[i].race = race(ptr, {}, order, rs);
        cand[i].deviation = deviation(cand[i].race);
    });
    // Then in board order: the duels behind `dominant` only for a board that
    // can still enter one of the two kept lists.
    for (std::size_t i = 0; i < cand.size(); ++i) {
        JumpCandidate& c = cand[i];
        out.bound = std::max(out.bound, c.race.bound);
        ++out.tried;
        auto open = [&](const std::vector<JumpCandidate>& list) {
            return static_cast<int>(list.size()) < keep || c.deviation <= list.back().deviation;
        };
        if (!open(out.fairest) && !(out.dominant_before && open(out.removing_dominant))) continue;
        std::vector<Chain> chains;
        for (const auto& o : options) chains.push_back(build_chain(boards[i], o));
        c.dominant = dominant_option(chains, order);
        insert(out.fairest, c);
        if (out.dominant_before && !c.dominant) insert(out.removing_dominant, c);  // nobody dominates any more
    }
    return out;
}

}  // namespace overshoot
