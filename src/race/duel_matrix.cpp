// All pairs of a set of options on one board. Each option's series is run
// once to a common horizon; every pair then costs one pass over the horizon
// plus the pair programme on the two end zones left at that horizon.
#include <algorithm>
#include <cmath>
#include <optional>

#include "chain/absorption.hpp"
#include "chain/series.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/parallel.hpp"
#include "core/selfcheck.hpp"
#include "race/duel.hpp"
#include "race/outcome.hpp"
#include "race/closure.hpp"
#include "race/pairs.hpp"

namespace overshoot {

namespace {

constexpr long double kTarget = 1e-14L;
constexpr int kMaxHorizon = 1 << 16;
// A general board's series runs in double while its proven rounding stays below
// this (so a pair's bound stays well inside the wanted 1e-12).
constexpr long double kFastRounding = 2e-13L;

// One option's series up to the horizon: f[t], S[t] for t = 0..H and the
// distribution left at H.
struct Trace {
    std::vector<long double> f, s;
    std::vector<long double> v;  // distribution at H (length N), zero below lo
    int lo = 0, hi = -1;
    long double stuck = 0, rounding = 0, alive = 0;
    Absorption absorption;
};

// Runs one option's series until it is done (alive mass below the target),
// its zone (squares from the trailing mass to the finish) is narrow, or its
// work budget is spent; then to the common horizon once that is known.
// S is the series type: long double or double (general_traces chooses).
template <class S>
class Tracer {
public:
    Tracer(const Chain& c, bool forward) : c_(&c), s_(c), forward_(forward) {
        t_.f.push_back(0);
        t_.s.push_back(1);
    }
    void run_to_stop(int narrow, std::uint64_t budget, int cap) {
        while (s_.turn() < cap && s_.alive() >= kTarget && s_.work() < budget) {
            if (forward_ && c_->length - s_.low() <= narrow) break;
            advance();
        }
    }
    bool stopped(int narrow, std::uint64_t budget) const {
        return s_.alive() < kTarget || s_.work() >= budget || (forward_ && c_->length - s_.low() <= narrow);
    }
    int turn() const { return s_.turn(); }
    long double rounding() const { return s_.rounding_bound(); }
    // Zone width (squares from the trailing mass to the finish) at turn h,
    // known for h at a checkpoint or past the stop (where it can only shrink).
    int zone_at(int h) const {
        for (const auto& k : checkpoints_)
            if (k.turn == h) return k.zone;
        return zone_now();
    }
    std::uint64_t work_at(int h) const {
        for (const auto& k : checkpoints_)
            if (k.turn == h) return k.work;
        return s_.work();
    }
    // The trace at turn h: from a checkpoint when the series ran past h,
    // otherwise by running on to h.
    Trace finish(int h) {
        // On a general board a piece whose live mass is below the target is not
        // stepped on to the common horizon: what it has left (at most the target)
        // stays unresolved and is carried in the pair's bound as `alive`; its
        // finishing chance is 0 and its survival constant for the padded turns.
        while (s_.turn() < h && (forward_ || s_.alive() >= kTarget)) advance();
        while (static_cast<int>(t_.f.size()) <= h) {
            t_.f.push_back(0);
            t_.s.push_back(t_.s.back());
        }
        Trace out;
        out.f.assign(t_.f.begin(), t_.f.begin() + h + 1);
        out.s.assign(t_.s.begin(), t_.s.begin() + h + 1);
        const Snapshot* k = nullptr;
        for (const auto& c : checkpoints_)
            if (c.turn == h) k = &c;
        Snapshot now;
        if (!k) {
            now = snapshot();
            k = &now;
        }
        out.stuck = k->stuck;
        out.alive = k->alive;
        out.rounding = k->rounding;
        out.lo = k->lo;
        out.hi = k->hi;
        if (k->lo <= k->hi) {
            out.v.assign(static_cast<std::size_t>(c_->length), 0.0L);
            std::copy(k->mass.begin(), k->mass.end(), out.v.begin() + k->lo);
        }
        if (forward_) out.absorption = forward_absorption(*c_);
        return out;
    }

private:
    struct Snapshot {
        int turn = 0, zone = 0, lo = 0, hi = -1;
        std::uint64_t work = 0;
        long double stuck = 0, alive = 0, rounding = 0;
        std::vector<long double> mass;  // squares lo..hi
    };
    int zone_now() const {
        if (s_.alive() <= 0) return 0;
        return forward_ ? c_->length - s_.low() : c_->length;
    }
    Snapshot snapshot() const {
        Snapshot k;
        k.turn = s_.turn();
        k.zone = zone_now();
        k.work = s_.work();
        k.stuck = s_.stuck();
        k.alive = s_.alive();
        k.rounding = s_.rounding_bound();
        if (s_.alive() > 0) {
            k.lo = s_.low();
            k.hi = s_.high();
            k.mass.assign(s_.mass().begin() + k.lo, s_.mass().begin() + k.hi + 1);
        } else {
            k.lo = c_->length;
            k.hi = c_->length - 1;
        }
        return k;
    }
    void advance() {
        long double f = s_.step();
        t_.f.push_back(f);
        t_.s.push_back(s_.survival());
        const int t = s_.turn();
        if ((t & (t - 1)) == 0 && t >= 8) checkpoints_.push_back(snapshot());
    }
    const Chain* c_;
    S s_;
    bool forward_;
    Trace t_;
    std::vector<Snapshot> checkpoints_;
};

// Estimated work of the whole matrix with horizon h (the tracers have run at
// least to h or stopped before): the series, a pass over h per pair, and the
// pair programme on the zones left at h.
template <class T>
double estimate(const std::vector<T>& tracers, const std::vector<Chain>& chains, int h) {
    const std::size_t n = tracers.size();
    double cost = 0;
    std::vector<double> zone(n), row(n);
    for (std::size_t i = 0; i < n; ++i) {
        const int at = std::min(h, tracers[i].turn());
        zone[i] = tracers[i].zone_at(at);
        row[i] = std::min<double>(zone[i], chains[i].max_move + 1);
        cost += static_cast<double>(tracers[i].work_at(at));
    }
    const double pairs = static_cast<double>(n) * static_cast<double>(n + 1) / 2;
    cost += pairs * h * 4;
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = i; j < n; ++j) cost += zone[i] * zone[j] * (row[i] + row[j]) * 1.5;
    return cost;
}

using Sums = ZoneSums;

// Refuse before the traces are copied out: f and S per turn for every option.
void check_trace_memory(const std::vector<Chain>& chains, int horizon) {
    limits::check_memory(static_cast<std::uint64_t>(horizon + 1) * chains.size() * 2 * sizeof(long double) +
                             static_cast<std::uint64_t>(chains.front().length) * chains.size() * 64,
                         "the series of every option of this tournament");
}

// Rounds 1..H of one ordered race from the two traces.
Sums prefix(const Trace& a, const Trace& b, int horizon, bool a_first) {
    Sums r;
    for (int t = 1; t <= horizon; ++t) {
        long double w, l, ti = 0;
        if (a_first) {
            w = a.f[t] * b.s[t - 1];
            l = b.f[t] * a.s[t];
        } else {
            w = a.f[t] * b.s[t];
            l = b.f[t] * a.s[t];
            ti = a.f[t] * b.f[t];
        }
        r.win += w;
        r.loss += l;
        r.tie += ti;
    }
    return r;
}

// The rest of the race after H rounds, from the pair programme on the zones.
Sums closure(const Chain& ca, const Chain& cb, const Trace& a, const Trace& b, int horizon, bool a_first,
             long double& rounding) {
    Sums r;
    const int n = ca.length;
    const long double t0 = horizon;
    // A piece with no square left on the board (lo == n) adds nothing.
    const ZoneMass<long double> ma{a.v, a.lo, a.lo < n ? a.hi : a.lo - 1, a.stuck, a.absorption},
        mb{b.v, b.lo, b.lo < n ? b.hi : b.lo - 1, b.stuck, b.absorption};
    if (a.lo < n && b.lo < n) {
        if (outcome_programme_bound(ca, cb, a.lo, b.lo) <= 3e-13L) {
            OutcomeTable ot = outcome_programme(ca, cb, a.lo, b.lo, a_first);
            rounding += ot.relative_rounding;
            r = weigh_zones(ma, mb, t0, false, [&](int i, int j) {
                const std::size_t k = ot.index(i, j);
                return PairValue{ot.win[k], ot.loss[k], ot.tie[k], 0};
            });
            r.rounds = std::nanl("");
        } else {
            PairTable pt = pair_programme(ca, cb, a.lo, b.lo, a_first);
            rounding += pt.relative_rounding;
            r = weigh_zones(ma, mb, t0, true, [&](int i, int j) { return pt.at(i, j); });
        }
    }
    add_stuck_terms(r, ma, mb, t0);
    rounding += closure_rounding(n, std::max(ca.max_move, cb.max_move), (a.hi - a.lo + 1) + (b.hi - b.lo + 1),
                                 horizon);
    return r;
}

// Forward boards: every option's trace (in long double, which the end-zone
// closure reads) to one common horizon, chosen here by estimate().
std::vector<Trace> forward_traces(const std::vector<Chain>& chains, int narrow, std::uint64_t budget, int cap,
                                  int threads, int& horizon) {
    const std::size_t n = chains.size();
    std::vector<Tracer<Series>> tracers;
    tracers.reserve(n);
    for (const auto& c : chains) tracers.emplace_back(c, true);
    horizon = 0;
    // Double the horizon while it pays: each doubling costs series work and
    // longer per-pair passes, and buys narrower zones for the pair programme.
    double best_cost = -1;
    for (int h = 8; h <= cap; h *= 2) {
        parallel_for(n, threads, [&](std::size_t i) { tracers[i].run_to_stop(narrow, budget, h); });
        double cost = estimate(tracers, chains, h);
        if (best_cost < 0 || cost < best_cost) {
            best_cost = cost;
            horizon = h;
        }
        bool all_stopped = true;
        for (const auto& t : tracers) all_stopped = all_stopped && t.stopped(narrow, budget);
        if (all_stopped || cost > 1.5 * best_cost) break;
    }
    // Nothing gained past the last turn any tracer reached.
    int longest = 0;
    for (const auto& t : tracers) longest = std::max(longest, t.turn());
    horizon = std::min(horizon, longest);
    check_trace_memory(chains, horizon);
    std::vector<Trace> traces(n);
    parallel_for(n, threads, [&](std::size_t i) { traces[i] = tracers[i].finish(horizon); });
    return traces;
}

// General boards: each option's series runs until its live mass is below the
// target, in double when the proven rounding of that run stays below
// kFastRounding (about three times faster than long double), otherwise again
// in long double; the horizon is the longest run.
std::vector<Trace> general_traces(const std::vector<Chain>& chains, std::uint64_t budget, int cap, int threads,
                                  int& horizon) {
    const std::size_t n = chains.size();
    std::vector<std::optional<Tracer<FastSeries>>> fast(n);
    std::vector<std::optional<Tracer<Series>>> precise(n);
    parallel_for(n, threads, [&](std::size_t i) {
        fast[i].emplace(chains[i], false);
        fast[i]->run_to_stop(0, budget, cap);
        if (fast[i]->rounding() > kFastRounding) {
            fast[i].reset();
            precise[i].emplace(chains[i], false);
            precise[i]->run_to_stop(0, budget, cap);
        }
    });
    horizon = 0;
    for (std::size_t i = 0; i < n; ++i) horizon = std::max(horizon, fast[i] ? fast[i]->turn() : precise[i]->turn());
    check_trace_memory(chains, horizon);
    std::vector<Trace> traces(n);
    parallel_for(n, threads,
                 [&](std::size_t i) { traces[i] = fast[i] ? fast[i]->finish(horizon) : precise[i]->finish(horizon); });
    return traces;
}

DuelResult make_result(const Sums& s, long double bound, DuelMethod method) {
    DuelResult d;
    d.p_a_wins = s.win;
    d.p_b_wins = s.loss;
    d.p_tie = s.tie;
    d.p_neither = std::max(0.0L, 1.0L - s.win - s.loss - s.tie);
    d.bound = bound;
    d.method.first = method;
    // Race lengths are not computed for matrices (duel() gives them).
    d.mean_rounds = std::nan("");
    d.median_resolved = false;
    // Self-check: p_neither is the remainder, so this catches win + loss + tie above 1 + bounds.
    selfcheck::check_distribution({s.win, s.loss, s.tie, d.p_neither}, bound, "duel_matrix");
    return d;
}

}  // namespace

std::vector<DuelResult> duel_matrix(const std::vector<Chain>& chains, Order order, const DuelSettings& s,
                                    int threads) {
    const std::size_t n = chains.size();
    std::vector<DuelResult> out(n * n);
    if (n == 0) return out;
    for (const auto& c : chains)
        if (c.length != chains.front().length) throw InternalError("duel_matrix: chains on different boards");
    // Refuse before any series runs: every option's traces and the results.
    limits::check_memory(static_cast<std::uint64_t>(chains.front().length) * n * 64 +
                             static_cast<std::uint64_t>(n) * n * sizeof(DuelResult),
                         "the series of every option of this tournament");
    // Forced methods and medians go pair by pair.
    if (s.method != DuelMethod::automatic || s.want_median) {
        std::vector<std::pair<std::size_t, std::size_t>> jobs;
        for (std::size_t i = 0; i < n; ++i)
            for (std::size_t j = 0; j < n; ++j) jobs.emplace_back(i, j);
        parallel_for(jobs.size(), threads, [&](std::size_t k) {
            auto [i, j] = jobs[k];
            out[i * n + j] = duel(chains[i], chains[j], order, s);
        });
        return out;
    }
    const bool forward = chains.front().forward_only;
    // Zones this narrow make the pair programme cheaper than more turns.
    const int narrow = 12;
    const std::uint64_t budget = forward ? 500'000 : s.work_limit / std::max<std::size_t>(n, 1);
    const int cap = forward ? kMaxHorizon : 1 << 24;
    int horizon = 0;
    const std::vector<Trace> traces = forward ? forward_traces(chains, narrow, budget, cap, threads, horizon)
                                              : general_traces(chains, budget, cap, threads, horizon);

    std::vector<std::pair<std::size_t, std::size_t>> jobs;
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = i; j < n; ++j) jobs.emplace_back(i, j);
    parallel_for(jobs.size(), threads, [&](std::size_t k) {
        auto [i, j] = jobs[k];
        const Trace &a = traces[i], &b = traces[j];
        const Chain &ca = chains[i], &cb = chains[j];
        long double base = a.rounding + b.rounding + gamma_ld(2 * horizon + 8);
        if (!forward) base += a.alive + b.alive;  // unresolved mass bounds every outcome
        auto one = [&](bool a_first, const Trace& x, const Trace& y, const Chain& cx, const Chain& cy,
                       long double& bound) {
            Sums p = prefix(x, y, horizon, a_first);
            bound = base;
            if (forward) {
                Sums c = closure(cx, cy, x, y, horizon, a_first, bound);
                p.win += c.win;
                p.loss += c.loss;
                p.tie += c.tie;
                p.rounds += c.rounds;
            }
            return p;
        };
        const DuelMethod method = forward ? DuelMethod::zone : DuelMethod::series;
        // Each ordered race is computed at most once; both cells of the pair
        // follow the one turn-order rule of race/outcome.hpp.
        struct Race {
            Sums sums;
            long double bound = 0;
        };
        std::optional<Race> together, i_first, j_first;
        auto race = [&](std::optional<Race>& slot, bool alternating, bool i_in_seat_a) {
            if (!slot) {
                Race r;
                r.sums = i_in_seat_a ? one(alternating, a, b, ca, cb, r.bound) : one(alternating, b, a, cb, ca, r.bound);
                slot = r;
            }
            return *slot;
        };
        auto flip = [](Race r) {
            std::swap(r.sums.win, r.sums.loss);
            return r;
        };
        auto coin = [](const Race& x, const Race& y) {
            Sums m{(x.sums.win + y.sums.win) / 2, (x.sums.loss + y.sums.loss) / 2, 0,
                   (x.sums.rounds + y.sums.rounds) / 2};
            return Race{m, std::max(x.bound, y.bound) + gamma_ld(2)};
        };
        // The cell with option i in seat A (row i) or in seat B (row j).
        auto cell = [&](bool i_is_a) {
            Race r = by_turn_order(
                order,
                [&](bool swapped, bool alternating) {
                    if (!alternating) return i_is_a ? race(together, false, true) : flip(race(together, false, true));
                    return i_is_a != swapped ? race(i_first, true, true) : race(j_first, true, false);
                },
                flip, coin);
            return make_result(r.sums, r.bound, method);
        };
        out[i * n + j] = cell(true);
        out[j * n + i] = cell(false);
    });
    return out;
}

}  // namespace overshoot
