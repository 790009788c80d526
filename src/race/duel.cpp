#include "race/duel.hpp"

#include "race/outcome.hpp"

#include <fmt/format.h>

#include <Eigen/Sparse>
#include <Eigen/SparseLU>
#include <algorithm>
#include <atomic>
#include <cmath>
#include <mutex>
#include <thread>
#include <type_traits>

#include "chain/absorption.hpp"
#include "chain/free_walk.hpp"
#include "chain/series.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/selfcheck.hpp"
#include "race/closure.hpp"
#include "race/pairs.hpp"

namespace overshoot {

std::string_view to_string(DuelMethod m) {
    switch (m) {
        case DuelMethod::automatic: return "auto";
        case DuelMethod::pairs: return "pairs";
        case DuelMethod::zone: return "zone";
        case DuelMethod::series: return "series";
        case DuelMethod::product: return "product";
        case DuelMethod::separated: return "separated";
    }
    return "?";
}

std::string to_string(const DuelMethods& m) {
    std::string out(to_string(m.first));
    if (m.second) (out += '+') += to_string(*m.second);
    return out;
}

DuelMethod parse_duel_method(std::string_view t) {
    for (auto m : {DuelMethod::automatic, DuelMethod::pairs, DuelMethod::zone, DuelMethod::series,
                   DuelMethod::product, DuelMethod::separated})
        if (t == to_string(m)) return m;
    throw InputError(fmt::format("method '{}': expected auto, pairs, zone, series, product or separated", t));
}

namespace {

// Accumulates one ordered race: simultaneous, or A moving first each round.
struct Tally {
    long double win = 0, loss = 0, tie = 0, neither = 0, rounds = 0;  // rounds: E[R 1{R<inf}]
    long double bound = 0;
    bool target_met = true;
    bool proven = true;
    DuelMethods method;
    std::optional<long long> median;  // rounds to the first finish, when found on the way
    bool median_done = false;
};

// Records the first round t with P(R <= t) >= 1/2, R = min(T_A, T_B).
template <class S>
void watch_median(Tally& r, const S& sa, const S& sb) {
    if (!r.median_done && 1.0L - sa.survival() * sb.survival() >= 0.5L) {
        r.median = sa.turn();
        r.median_done = true;
    }
}

std::uint64_t full_pairs_work(const Chain& a, const Chain& b) {
    const auto n = static_cast<std::uint64_t>(a.length);
    return n * n * static_cast<std::uint64_t>(a.max_move + b.max_move + 2);
}

void add_round(Tally& r, bool a_first, int t, long double fa, long double fb, long double /*sa_prev*/,
               long double sb_prev, long double sa, long double sb) {
    long double w, l, ti = 0;
    if (a_first) {
        w = fa * sb_prev;  // A lands while B had not finished before this round
        l = fb * sa;
    } else {
        w = fa * sb;
        l = fb * sa;
        ti = fa * fb;
    }
    r.win += w;
    r.loss += l;
    r.tie += ti;
    r.rounds += static_cast<long double>(t) * (w + l + ti);
}

Tally full_pairs(const Chain& a, const Chain& b, bool a_first) {
    PairTable pt = pair_programme(a, b, 0, 0, a_first);
    const PairValue& v = pt.at(a.start, b.start);
    Tally r;
    r.win = v.win;
    r.loss = v.loss;
    r.tie = v.tie;
    r.rounds = v.rounds;
    r.bound = pt.relative_rounding;
    r.neither = std::max(0.0L, 1.0L - r.win - r.loss - r.tie);
    r.bound += gamma_ld(4);
    r.method.first = DuelMethod::pairs;
    return r;
}

// Series over the open part of the board until both pieces are in their end
// zones (but for `target` mass), then the pair programme on the zones. Mass on
// stuck squares is carried as a scalar: a stuck piece's square does not matter.
template <class S>
std::optional<Tally> zone_method(const Chain& a, const Chain& b, bool a_first, long double target,
                                 std::uint64_t budget) {
    const int n = a.length;
    const int za = std::max(0, n - (2 * a.max_move + 2));
    const int zb = std::max(0, n - (2 * b.max_move + 2));
    S sa(a), sb(b);
    Tally r;
    // Long boards: each piece jumps to the last turn its walk surely stays on
    // plain squares (docs/method.md 4.2). The earlier one is stepped alone until
    // the later one's turn (the later piece cannot finish before it), then both
    // go on together. Before its turn each finished with probability at most
    // `escape`, which the bound carries.
    long double jumped = 0;
    if constexpr (std::is_same_v<S, Series>) {
        constexpr long double escape = 1e-16L;
        const auto ta = last_turn_short_of(chain_moves(a), first_irregular_square(a) - a.start, escape);
        const auto tb = last_turn_short_of(chain_moves(b), first_irregular_square(b) - b.start, escape);
        const auto wa = ta && *ta >= 100 ? chain_walk(a, *ta, escape) : std::nullopt;
        const auto wb = tb && *tb >= 100 ? chain_walk(b, *tb, escape) : std::nullopt;
        if (wa && wb) {
            const bool a_early = *ta <= *tb;
            S& early = a_early ? sa : sb;
            early = a_early ? S(a, wa->mass, wa->low, static_cast<int>(*ta), wa->error)
                            : S(b, wb->mass, wb->low, static_cast<int>(*tb), wb->error);
            const long long later = a_early ? *tb : *ta;
            long double before = early.survival();
            while (early.turn() < later) {
                const long double f = early.step();
                if (a_early)
                    add_round(r, a_first, early.turn(), f, 0, before, 1, early.survival(), 1);
                else
                    add_round(r, a_first, early.turn(), 0, f, 1, before, 1, early.survival());
                before = early.survival();
                if (!r.median_done && 1.0L - before >= 0.5L) {
                    r.median = early.turn();
                    r.median_done = true;
                }
            }
            (a_early ? sb : sa) = a_early ? S(b, wb->mass, wb->low, static_cast<int>(*tb), wb->error)
                                          : S(a, wa->mass, wa->low, static_cast<int>(*ta), wa->error);
            jumped = 2 * escape;
        }
    }
    long double pa = sa.survival(), pb = sb.survival();
    while (true) {
        long double outside = sa.alive_below(za) + sb.alive_below(zb);
        if (outside < target) {
            r.bound = outside + jumped;
            break;
        }
        if (sa.work() + sb.work() > budget) return std::nullopt;
        long double fa = sa.step(), fb = sb.step();
        add_round(r, a_first, sa.turn(), fa, fb, pa, pb, sa.survival(), sb.survival());
        watch_median(r, sa, sb);
        pa = sa.survival();
        pb = sb.survival();
    }
    PairTable pt = pair_programme(a, b, za, zb, a_first);
    const Absorption ha = forward_absorption(a), hb = forward_absorption(b);
    const auto& va = sa.mass();
    const auto& vb = sb.mass();
    const long double t0 = static_cast<long double>(sa.turn());
    const int alo = std::max(za, sa.low()), blo = std::max(zb, sb.low());
    const ZoneMass<typename std::decay_t<decltype(va)>::value_type> ma{va, alo, sa.high(), sa.stuck(), ha},
        mb{vb, blo, sb.high(), sb.stuck(), hb};
    ZoneSums c = weigh_zones(ma, mb, t0, true, [&](int i, int j) { return pt.at(i, j); });
    add_stuck_terms(c, ma, mb, t0);
    r.win += c.win;
    r.loss += c.loss;
    r.tie += c.tie;
    r.rounds += c.rounds;
    r.neither = std::max(0.0L, 1.0L - r.win - r.loss - r.tie);
    const int support = (sa.high() - sa.low() + 1) + (sb.high() - sb.low() + 1);
    // The absorption pass has the same depth structure as the pair programme.
    r.bound += sa.rounding_bound() + sb.rounding_bound() + pt.relative_rounding +
               closure_rounding(n, std::max(a.max_move, b.max_move), support, sa.turn());
    r.method.first = DuelMethod::zone;
    // The median of R may lie past the prefix: keep stepping the two series.
    if (!r.median_done && r.win + r.loss + r.tie >= 0.5L) {
        while (!r.median_done && (sa.alive() > 0 || sb.alive() > 0) && sa.work() + sb.work() < 4 * budget + 100000000) {
            sa.step();
            sb.step();
            watch_median(r, sa, sb);
        }
    }
    if (r.win + r.loss + r.tie < 0.5L) r.median_done = true;  // null median, resolved
    return r;
}

// Plain per-turn series on any board; stops at the target or the work limit.
template <class S>
Tally series_method(const Chain& a, const Chain& b, bool a_first, long double target,
                    std::uint64_t work_limit) {
    S sa(a), sb(b);
    Tally r;
    long double pa = 1, pb = 1;
    while (sa.alive() + sb.alive() >= target) {
        if (sa.work() + sb.work() > work_limit) {
            r.target_met = false;
            break;
        }
        long double fa = sa.step(), fb = sb.step();
        add_round(r, a_first, sa.turn(), fa, fb, pa, pb, sa.survival(), sb.survival());
        watch_median(r, sa, sb);
        pa = sa.survival();
        pb = sb.survival();
    }
    if (sa.alive() + sb.alive() == 0 || r.win + r.loss + r.tie + r.neither < 0.5L) r.median_done = true;
    // Every unresolved outcome needs a piece that is still alive.
    r.neither = sa.stuck() * sb.stuck();
    r.bound = sa.alive() + sb.alive() + sa.rounding_bound() + sb.rounding_bound() +
              gamma_ld(2 * sa.turn() + 8);
    r.method.first = DuelMethod::series;
    return r;
}

// Direct sparse LU of the product chain over pairs of squares. Independent of
// the other methods; its bound is a residual estimate, not a proof.
Tally product_method(const Chain& A, const Chain& B, bool a_first) {
    const int n = A.length;
    const std::uint64_t states = static_cast<std::uint64_t>(n) * n;
    const std::uint64_t nnz = states * static_cast<std::uint64_t>(A.max_move + 1) * (B.max_move + 1);
    limits::check_memory(nnz * 64 + states * 256, "the product chain of this duel");
    std::vector<int> idx(states, -1);
    int count = 0;
    auto both_stuck = [&](int a, int b) { return A.stuck[a] && B.stuck[b]; };
    for (int a = 0; a < n; ++a)
        for (int b = 0; b < n; ++b)
            if (!both_stuck(a, b)) idx[static_cast<std::size_t>(a) * n + b] = count++;
    Tally r;
    r.method.first = DuelMethod::product;
    r.proven = false;
    const int i0 = idx[static_cast<std::size_t>(A.start) * n + B.start];
    if (count == 0 || i0 < 0) {
        r.neither = 1;
        return r;
    }
    std::vector<Eigen::Triplet<double>> trip;
    Eigen::MatrixXd rhs = Eigen::MatrixXd::Zero(count, 3);
    for (int a = 0; a < n; ++a) {
        for (int b = 0; b < n; ++b) {
            int i = idx[static_cast<std::size_t>(a) * n + b];
            if (i < 0) continue;
            double diag = 1.0;
            for (auto ka = A.row_start[a]; ka < A.row_start[a + 1]; ++ka) {
                int da = A.dest[ka];
                if (da == n) continue;
                for (auto kb = B.row_start[b]; kb < B.row_start[b + 1]; ++kb) {
                    int db = B.dest[kb];
                    if (db == n) continue;
                    int j = idx[static_cast<std::size_t>(da) * n + db];
                    if (j < 0) continue;
                    double p = static_cast<double>(A.prob[ka] * B.prob[kb]);
                    if (j == i)
                        diag -= p;
                    else
                        trip.emplace_back(i, j, -p);
                }
            }
            trip.emplace_back(i, i, diag);
            const double ra = static_cast<double>(A.finish[a]), rb = static_cast<double>(B.finish[b]);
            if (a_first) {
                rhs(i, 0) = ra;
                rhs(i, 1) = (1 - ra) * rb;
            } else {
                rhs(i, 0) = ra * (1 - rb);
                rhs(i, 1) = (1 - ra) * rb;
                rhs(i, 2) = ra * rb;
            }
        }
    }
    Eigen::SparseMatrix<double> m(count, count);
    m.setFromTriplets(trip.begin(), trip.end());
    m.makeCompressed();
    Eigen::SparseLU<Eigen::SparseMatrix<double>> lu;
    lu.compute(m);
    if (lu.info() != Eigen::Success) throw InternalError("sparse LU of the product chain failed");
    Eigen::MatrixXd x = lu.solve(rhs);
    Eigen::VectorXd f = x.rowwise().sum();
    Eigen::VectorXd e = lu.solve(f);
    Eigen::VectorXd tau = lu.solve(Eigen::VectorXd::Ones(count));
    double resid = (m * x - rhs).lpNorm<Eigen::Infinity>();
    r.win = x(i0, 0);
    r.loss = x(i0, 1);
    r.tie = x(i0, 2);
    r.rounds = e(i0);
    r.neither = std::max(0.0L, 1.0L - r.win - r.loss - r.tie);
    // |error| <= (I - M)^{-1} |residual| <= residual * max expected rounds.
    r.bound = static_cast<long double>((resid + 1e-16) * std::max(1.0, tau.lpNorm<Eigen::Infinity>()) * 4);
    return r;
}

// Per-probability bound below which the fast double-precision pass is kept.
constexpr long double precise_enough = 1e-13L;
// On boards where pieces move backward the series alone decides: its double
// run is kept while its proven bound stays below this, inside the wanted 1e-12
// with room to spare, as in duel_matrix (docs/method.md section 4.3).
constexpr long double general_precise_enough = 5e-13L;

long double predicted_double_bound(const Chain& a, const Chain& b) {
    auto turns = [](const Chain& c) {
        long double mean = 0;
        for (int s = 0; s < 1; ++s)
            for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k)
                mean += c.prob[k] * static_cast<long double>(c.dest[k] - s);
        return mean > 0 ? 1.5L * c.length / mean + 50 : 1e30L;
    };
    return turns(a) * gamma_d(a.max_in_degree + 3) + turns(b) * gamma_d(b.max_in_degree + 3);
}

Tally solve_ordered(const Chain& a, const Chain& b, bool a_first, const DuelSettings& s) {
    switch (s.method) {
        case DuelMethod::pairs:
            if (!a.forward_only) throw InputError("method pairs needs a board where pieces never move backward");
            return full_pairs(a, b, a_first);
        case DuelMethod::zone: {
            if (!a.forward_only) throw InputError("method zone needs a board where pieces never move backward");
            auto r = zone_method<Series>(a, b, a_first, s.target, s.work_limit);
            if (!r) throw LimitError("method zone: the series did not reach the end zones within the work limit");
            return *r;
        }
        case DuelMethod::series: return series_method<Series>(a, b, a_first, s.target, s.work_limit);
        case DuelMethod::product: return product_method(a, b, a_first);
        case DuelMethod::separated:
            throw InputError("method separated works from the board and the options, not from built chains");
        case DuelMethod::automatic: break;
    }
    if (a.forward_only) {
        const std::uint64_t full = full_pairs_work(a, b);
        // Small boards: the whole pair programme is cheap and needs no series.
        if (full <= 2'000'000) return full_pairs(a, b, a_first);
        // Otherwise try the series + end zone, giving up once it has cost a
        // quarter of the full programme (slow movers: moves of 0, tiny dice).
        // Double precision when its predicted rounding bound (turns to cross
        // the board times gamma per turn) stays below the target; long double
        // otherwise, or when the double run's proven bound turns out too wide.
        if (predicted_double_bound(a, b) <= precise_enough) {
            if (auto r = zone_method<FastSeries>(a, b, a_first, s.target, full / 4)) {
                if (r->bound <= precise_enough) return *r;
            } else {
                return full_pairs(a, b, a_first);
            }
        }
        if (auto q = zone_method<Series>(a, b, a_first, s.target, full / 4)) return *q;
        return full_pairs(a, b, a_first);
    }
    Tally r = series_method<FastSeries>(a, b, a_first, s.target, s.work_limit);
    if (r.bound <= general_precise_enough || !r.target_met) return r;
    return series_method<Series>(a, b, a_first, s.target, s.work_limit);
}

// Median of R = min(T_A, T_B): the smallest t with P(R <= t) >= 1/2.
void median_rounds(const Chain& a, const Chain& b, DuelResult& out, std::uint64_t work_limit) {
    out.median_resolved = true;
    out.median_rounds.reset();
    if (out.p_a_wins + out.p_b_wins + out.p_tie < 0.5L) return;
    FastSeries sa(a), sb(b);
    while (true) {
        sa.step();
        sb.step();
        if (1.0L - sa.survival() * sb.survival() >= 0.5L) {
            out.median_rounds = sa.turn();
            return;
        }
        if ((sa.alive() == 0 && sb.alive() == 0) || sa.work() + sb.work() > work_limit) {
            out.median_resolved = sa.alive() == 0 && sb.alive() == 0;
            return;
        }
    }
}

}  // namespace

DuelResult duel(const Chain& a, const Chain& b, Order order, const DuelSettings& s) {
    if (a.length != b.length) throw InternalError("duel: the two chains are on different boards");
    DuelResult out;
    auto fill = [&](const Tally& t) {
        out.p_a_wins = t.win;
        out.p_b_wins = t.loss;
        out.p_tie = t.tie;
        out.p_neither = t.neither;
        out.bound = t.bound;
        out.bound_proven = t.proven;
        out.target_met = t.target_met;
        out.method = t.method;
        out.median_rounds = t.median;
        out.median_resolved = t.median_done;
        long double f = t.win + t.loss + t.tie;
        out.mean_rounds = f > 0 ? static_cast<double>(t.rounds / f) : std::nan("");
    };
    auto solve = [&](bool swapped, bool alternating) {
        return swapped ? solve_ordered(b, a, alternating, s) : solve_ordered(a, b, alternating, s);
    };
    auto swap = [](Tally t) {
        std::swap(t.win, t.loss);
        return t;
    };
    auto coin = [](const Tally& x, const Tally& y) {  // y: B first, seats already swapped back
        Tally m;
        m.win = (x.win + y.win) / 2;
        m.loss = (x.loss + y.loss) / 2;
        m.tie = 0;
        m.neither = (x.neither + y.neither) / 2;
        m.rounds = (x.rounds + y.rounds) / 2;
        m.bound = std::max(x.bound, y.bound) + gamma_ld(2);
        m.proven = x.proven && y.proven;
        m.target_met = x.target_met && y.target_met;
        m.method = x.method;
        if (y.method != x.method) m.method.second = y.method.first;
        m.median = x.median;  // R = min(T_A, T_B) does not depend on the seats
        m.median_done = x.median_done;
        return m;
    };
    fill(by_turn_order(order, solve, swap, coin));
    // Self-check: the four outcomes partition the probability space (NaN fails too).
    selfcheck::check_distribution({out.p_a_wins, out.p_b_wins, out.p_tie, out.p_neither}, out.bound, "duel");
    if (s.want_median && !out.median_resolved) median_rounds(a, b, out, s.work_limit / 4);
    return out;
}

}  // namespace overshoot

