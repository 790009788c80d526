#include "chain/free_walk.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "chain/chain.hpp"
#include "chain/series.hpp"
#include "core/error.hpp"
#include "core/kernels.hpp"

namespace overshoot {

namespace {

// log E[exp(theta X)] - theta ref and the tilted mean E[X exp(theta X)] / E[exp(theta X)],
// shifted by the move `ref` so that no exponential overflows.
struct Tilt {
    long double log_mgf = 0, mean = 0;
};
Tilt tilt(const Option& o, long double theta) {
    const int ref = theta >= 0 ? o.max_move() : o.min_move();
    long double s = 0, sm = 0;
    for (int m = 0; m <= o.max_move(); ++m) {
        if (o.weight[m] == 0) continue;
        const long double e = static_cast<long double>(o.weight[m]) * std::exp(theta * (m - ref));
        s += e;
        sm += e * m;
    }
    return {theta * ref + std::log(s / static_cast<long double>(o.denominator)), sm / s};
}

// min over theta of exp(t K(theta) - theta d), theta >= 0 (upper tail) or <= 0
// (lower tail), at the root of the convex exponent's derivative t K'(theta) - d.
// Every theta gives a valid bound (Chernoff, 1952); the exponent is computed in
// long double with an absolute error far below the 1e-9 relative margin added.
long double chernoff(const Option& o, long long t, long double d, bool upper) {
    const long double target = d / static_cast<long double>(t);
    long double lo = 0, hi = upper ? 1 : -1;
    for (int i = 0; i < 200 && (upper ? tilt(o, hi).mean < target : tilt(o, hi).mean > target); ++i) hi *= 2;
    for (int i = 0; i < 100; ++i) {
        const long double mid = (lo + hi) / 2;
        if ((tilt(o, mid).mean < target) == upper)
            lo = mid;
        else
            hi = mid;
    }
    long double best = 0;  // theta = 0 gives the trivial bound 1
    for (long double theta : {lo, hi}) {
        const long double k = tilt(o, theta).log_mgf;
        const long double e = static_cast<long double>(t) * k - theta * d;
        best = std::min(best, e + 1e-9L * (1 + std::fabs(static_cast<long double>(t) * k) + std::fabs(theta * d)));
    }
    return std::min(1.0L, std::exp(best));
}

template <class Pred>
std::optional<long long> search_turns(const Option& o, long long distance, Pred&& ok_at, bool want_last) {
    if (o.mean() <= 0) return std::nullopt;
    // ok_at is monotone in t (true then false when want_last, false then true otherwise).
    long long lo = 0, hi = 1;
    const long long cap = 1LL << 40;
    if (want_last) {
        if (!ok_at(1)) return 0;
        while (ok_at(hi * 2) && hi < cap) hi *= 2;
        lo = hi;
        hi *= 2;  // ok_at(lo) true, ok_at(hi) false
        while (hi - lo > 1) {
            const long long mid = lo + (hi - lo) / 2;
            (ok_at(mid) ? lo : hi) = mid;
        }
        return lo;
    }
    if (ok_at(0)) return 0;
    while (!ok_at(hi) && hi < cap) hi *= 2;
    if (!ok_at(hi)) return std::nullopt;
    while (hi - lo > 1) {  // ok_at(lo) false, ok_at(hi) true
        const long long mid = lo + (hi - lo) / 2;
        (ok_at(mid) ? hi : lo) = mid;
    }
    (void)distance;
    return hi;
}

// dst[i] += p * src[i]: vectorised for double; long double has no vector unit.
void add_scaled(double* dst, const double* src, double p, long long n) { axpy(dst, src, p, static_cast<int>(n)); }
void add_scaled(long double* __restrict dst, const long double* __restrict src, long double p, long long n) {
    for (long long i = 0; i < n; ++i) dst[i] += p * src[i];
}

// Drops the far edges of `v` whose mass is below `trim` each; returns the mass dropped.
template <class Real>
long double trim_edges(std::vector<Real>& v, long long& low, double trim) {
    std::size_t a = 0, b = v.size();
    long double lo_mass = 0, hi_mass = 0;
    while (b - a > 1 && lo_mass + v[a] < trim) lo_mass += v[a++];
    while (b - a > 1 && hi_mass + v[b - 1] < trim) hi_mass += v[--b];
    if (a > 0 || b < v.size()) {
        v = std::vector<Real>(v.begin() + static_cast<long>(a), v.begin() + static_cast<long>(b));
        low += static_cast<long long>(a);
    }
    return lo_mass + hi_mass;
}

}  // namespace

long double walk_at_least(const Option& o, long long t, long long d) {
    if (d <= static_cast<long long>(o.min_move()) * t) return 1;
    if (d > static_cast<long long>(o.max_move()) * t) return 0;
    return chernoff(o, t, static_cast<long double>(d), true);
}

long double walk_below(const Option& o, long long t, long long d) {
    if (d <= static_cast<long long>(o.min_move()) * t) return 0;
    if (d > static_cast<long long>(o.max_move()) * t) return 1;
    return chernoff(o, t, static_cast<long double>(d - 1), false);
}

std::optional<long long> last_turn_short_of(const Option& o, long long distance, long double limit) {
    return search_turns(o, distance, [&](long long t) { return walk_at_least(o, t, distance) <= limit; }, true);
}

std::optional<long long> first_turn_past(const Option& o, long long distance, long double limit) {
    return search_turns(o, distance, [&](long long t) { return walk_below(o, t, distance) <= limit; }, false);
}

int first_irregular_square(const Board& board, int start) {
    for (const Jump& j : board.jumps)  // sorted by source
        if (j.from > start) return j.from;
    return board.length;
}

template <class Real>
BasicWalkMass<Real> walk_mass(const Option& o, long long turns, double trim) {
    using Mass = BasicWalkMass<Real>;
    const long double u = std::numeric_limits<Real>::epsilon() / 2;
    auto gamma = [&](long double n) { return n * u / (1 - n * u); };
    Mass base;
    base.low = o.min_move();
    for (int m = o.min_move(); m <= o.max_move(); ++m)
        base.mass.push_back(static_cast<Real>(static_cast<long double>(o.weight[m]) / o.denominator));
    base.error = u;  // each probability rounded once
    Mass r;
    r.mass = {1.0};
    if (turns <= 0) return r;
    // Left to right over the bits of t: square, then one more move when the bit is set.
    auto combine = [&](const Mass& a, const Mass& b) {
        Mass c;
        c.low = a.low + b.low;
        const long long la = static_cast<long long>(a.mass.size()), lb = static_cast<long long>(b.mass.size());
        c.mass.assign(static_cast<std::size_t>(la + lb - 1), 0.0);
        if (&a == &b) {  // a square: each cross product once, doubled (exactly)
            for (long long i = 0; i < la; ++i) {
                c.mass[2 * i] += a.mass[i] * a.mass[i];
                if (i + 1 < la) add_scaled(&c.mass[2 * i + 1], &a.mass[i + 1], 2 * a.mass[i], la - i - 1);
            }
            c.work = a.work + static_cast<std::uint64_t>(la) * (la + 1) / 2;
        } else {
            for (long long i = 0; i < la; ++i) add_scaled(&c.mass[i], b.mass.data(), a.mass[i], lb);
            c.work = a.work + static_cast<std::uint64_t>(la) * lb;
        }
        // Each sum has at most min(la, lb) products: gamma of that plus one, on
        // a total of at most (1 + e_a)(1 + e_b); earlier errors carry through
        // the convolution of two sub-stochastic vectors and add.
        const long double terms = static_cast<long double>(std::min(la, lb)) + 1;
        c.error = a.error + b.error + a.error * b.error + gamma(terms) * (1 + a.error) * (1 + b.error);
        c.error += trim_edges(c.mass, c.low, trim) * (1 + gamma(4));
        return c;
    };
    int bit = 62;
    while (((turns >> bit) & 1) == 0) --bit;
    r = base;
    for (--bit; bit >= 0; --bit) {
        r = combine(r, r);
        if ((turns >> bit) & 1) r = combine(r, base);
    }
    return r;
}
template BasicWalkMass<double> walk_mass<double>(const Option&, long long, double);
template BasicWalkMass<long double> walk_mass<long double>(const Option&, long long, double);

Option chain_moves(const Chain& c) {
    Option o;
    o.denominator = c.denominator;
    o.weight.assign(c.move_prob.size(), 0);
    for (std::size_t m = 0; m < c.move_prob.size(); ++m)
        o.weight[m] = static_cast<std::uint64_t>(std::llround(c.move_prob[m] * static_cast<long double>(c.denominator)));
    return o;
}

int first_irregular_square(const Chain& c) {
    for (int s = c.start + 1; s < c.length; ++s)
        if (!c.resting[s]) return s;
    return c.length;
}

std::optional<ChainWalk> chain_walk(const Chain& c, long long turns, long double escape) {
    const int f = first_irregular_square(c);
    BasicWalkMass<long double> w = walk_mass<long double>(chain_moves(c), turns, 1e-20);
    const long long keep =
        std::max(0LL, std::min<long long>(static_cast<long long>(w.mass.size()), f - c.start - w.low));
    w.mass.resize(static_cast<std::size_t>(keep));
    if (w.mass.empty()) return std::nullopt;
    return ChainWalk{std::move(w.mass), static_cast<int>(c.start + w.low), w.error + escape};
}

template <class Real>
std::optional<JumpedStart<Real>> jumped_start(const Board& board, const Option& o, int start, long double escape,
                                              double trim) {
    if (!board.forward_only()) throw InternalError("jumped_start on a board where pieces move backward");
    const int f = first_irregular_square(board, start);
    const auto t0 = last_turn_short_of(o, f - start, escape);
    if (!t0) return std::nullopt;  // never moves
    BasicWalkMass<Real> w = walk_mass<Real>(o, *t0, trim);
    // Squares from f on belong to the escaped mass already bounded.
    const long long keep =
        std::max(0LL, std::min<long long>(static_cast<long long>(w.mass.size()), f - start - w.low));
    w.mass.resize(static_cast<std::size_t>(keep));
    if (w.mass.empty()) return std::nullopt;
    const int s0 = static_cast<int>(start + w.low);
    JumpedStart<Real> j{build_chain(board_from(board, s0), o, 0), std::move(w.mass), s0,
                        static_cast<int>(*t0), w.error + escape, w.work};
    return j;
}
template std::optional<JumpedStart<double>> jumped_start<double>(const Board&, const Option&, int, long double,
                                                                 double);
template std::optional<JumpedStart<long double>> jumped_start<long double>(const Board&, const Option&, int,
                                                                           long double, double);

LevelTurn first_turn_at_level(const Board& board, const Option& o, int start, long double level, long double slack,
                              std::uint64_t work_limit) {
    LevelTurn out;
    // The walk stays short of its first irregular square but for 1e-16 of its mass.
    const long double escape = 1e-16L;
    const auto j = jumped_start<double>(board, o, start, escape, 1e-17);
    if (!j) return out;  // a walk that never moves, or nothing short of the square: unresolved
    out.work = j->work;
    FastSeries s(j->chain, j->mass, 0, j->turn, j->error);
    auto bound = [&] { return s.rounding_bound() + slack; };
    // Before the jumped turn the piece finished with probability at most `escape`.
    if (level <= escape + slack) return out;
    while (true) {
        const long double before = s.finished();
        s.step();
        const long double now = s.finished();
        out.work = j->work + s.work();
        if (now - bound() >= level) {
            out.turn = s.turn();
            out.resolved = before + bound() < level;
            return out;
        }
        if (now + bound() >= level) return out;  // too close to call at this turn
        if (now + s.alive() + bound() < level) {  // never reaches the level
            out.resolved = true;
            return out;
        }
        if (s.alive() == 0 || out.work > work_limit) return out;
    }
}

}  // namespace overshoot
