#include "policy/duel_policy.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <type_traits>

#include "chain/series.hpp"
#include "core/error.hpp"
#include "policy/blocks.hpp"
#include "policy/loops.hpp"
#include "policy/matrix_game.hpp"
#include "policy/moves.hpp"
#include "policy/sweeps.hpp"
#include "race/duel.hpp"
#include "race/exact.hpp"

namespace overshoot {

std::string_view to_string(PolicyGoal g) { return g == PolicyGoal::win ? "win" : "margin"; }

namespace {

using policy_detail::AlternatingProgramme;
using policy_detail::AltValues;
using policy_detail::Candidates;
using policy_detail::ErrorTally;
using policy_detail::Payoff;
using policy_detail::Quad;
using policy_detail::RoundsBound;
using policy_detail::SimultaneousProgramme;
using policy_detail::SweepPlan;

bool near(const long double& x, const long double& y, const long double& tol) {
    return std::fabs(x - y) <= tol;
}
bool near(const mpq_class& x, const mpq_class& y, const mpq_class&) { return x == y; }

template <class T>
Payoff<T> goal_payoff(PolicyGoal g) {
    return {T(1), T(g == PolicyGoal::win ? 0 : -1), T(0), T(0)};
}

template <class T>
Payoff<Quad<T>> outcome_payoff() {
    Payoff<Quad<T>> p;
    p.win.win = 1;
    p.loss.loss = 1;
    p.tie.tie = 1;
    p.neither.neither = 1;
    return p;
}

// The order of the states and, on boards where pieces move backward, what
// proves the error of the iterated blocks (policy/loops.hpp).
struct Setting {
    SquareBlocks ba, bb;
    SweepPlan plan;
    bool loops = false;
    RoundsBound w;
    long double rel = 0;        // relative rounding of one state's operator
    long double one_state = 0;  // error a one-state block adds
    Setting(const std::vector<Chain>& a, const std::vector<Chain>& b)
        : ba(square_blocks(a)), bb(square_blocks(b)) {
        plan.a = &ba;
        plan.b = &bb;
        loops = ba.count() < static_cast<int>(ba.squares.size()) ||
                bb.count() < static_cast<int>(bb.squares.size());
        plan.settle = 8 * std::numeric_limits<long double>::epsilon();
        plan.max_sweeps = 20000;
    }
    Setting(const Setting&) = delete;
    // w at a state: before A's move (or the round) and before B's move.
    long double wa(std::size_t idx) const { return w.wa[idx]; }
    long double wb(std::size_t idx) const { return w.wb.empty() ? w.wa[idx] : w.wb[idx]; }
};

// Earliest candidate whose value is within tol of the best, and all such.
template <class T>
Choice pick(int count, const int* who, const T* value, const T& best, const T& tol) {
    Choice c{-1, 0};
    for (int k = 0; k < count; ++k)
        if (near(value[k], best, tol)) {
            if (c.option < 0) c.option = who[k];
            c.as_good |= 1u << who[k];
        }
    if (c.option < 0) c.option = who[0];  // unreachable: best is one of the values
    return c;
}

template <class T>
struct Found {
    std::vector<Choice> ca, cb;
    T value{0};
    std::vector<T> va, vb;
    long double error = 0;  // proven, on boards with loops (else 0: bounded by the caller)
};

// The proven error of values found by a programme on a board with loops: one
// step of the plain operator (`one`, `one_a`/`one_b`) at every state of a block
// of several, its residual with rounding, times the block's w (policy/loops.hpp).
template <class T, class V, class One>
long double simultaneous_error(SimultaneousProgramme<T, V>& p, const Setting& st, One&& one) {
    if constexpr (!std::is_floating_point_v<T>) {
        throw InternalError("policies: boards with loops are solved in floating point only");
    } else {
        ErrorTally tally(st.ba.count(), st.bb.count(), st.one_state);
        const std::size_t n = static_cast<std::size_t>(st.ba.squares.size());
        p.step(st.plan, p.v, one, [&](int a, int b, int ka, int kb, const V& phi) {
            const std::size_t idx = static_cast<std::size_t>(a) * n + b;
            const V& x = p.v[idx];
            tally.add(ka, kb, policy_detail::gap(phi, x) + st.rel * (1 + policy_detail::magnitude(x)),
                      st.wa(idx));
        });
        return tally.total();
    }
}

template <class T, class V, class OneA, class OneB>
long double alternating_error(AlternatingProgramme<T, V>& p, const Setting& st, OneA&& one_a, OneB&& one_b) {
    if constexpr (!std::is_floating_point_v<T>) {
        throw InternalError("policies: boards with loops are solved in floating point only");
    } else {
        ErrorTally tally(st.ba.count(), st.bb.count(), st.one_state);
        const std::size_t n = static_cast<std::size_t>(st.ba.squares.size());
        p.step(st.plan, p.r, one_a, one_b, [&](int a, int b, int ka, int kb, const V& pa, const V& pb) {
            const std::size_t idx = static_cast<std::size_t>(a) * n + b;
            const V &xa = p.r.va[idx], &xb = p.r.vb[idx];
            tally.add(ka, kb, policy_detail::gap(pa, xa) + st.rel * (1 + policy_detail::magnitude(xa)),
                      st.wa(idx));
            tally.add(ka, kb, policy_detail::gap(pb, xb) + st.rel * (1 + policy_detail::magnitude(xb)),
                      st.wb(idx));
        });
        return tally.total();
    }
}

template <class T>
T start_value(const AltValues<T>& r, Order order) {
    if (order == Order::a_first) return r.va[0];
    if (order == Order::b_first) return r.vb[0];
    return T((r.va[0] + r.vb[0]) / T(2));
}

template <class T>
Quad<T> start_outcomes(const AltValues<Quad<T>>& r, Order order) {
    if (order == Order::a_first) return r.va[0];
    if (order == Order::b_first) return r.vb[0];
    return (r.va[0] + r.vb[0]) / T(2);
}

// Pure optimisation: alternating turns (both menus may adapt: perfect
// information), or simultaneous rounds where one side has one option. A
// maximises and B minimises; a state's value is max_i min_j e(i, j), with the
// payoff of neither (0) for a pair that stays forever (docs/policy.md proves
// that this is the least-fixed-point value with the loop paying 0).
template <class T>
Found<T> optimise_pure(const std::vector<Moves<T>>& A, const std::vector<int>& a_all,
                       const std::vector<Moves<T>>& B, const std::vector<int>& b_all, Order order,
                       PolicyGoal goal, const T& tol, Setting& st) {
    const int n = A.front().length;
    const std::size_t cells = static_cast<std::size_t>(n) * n;
    Found<T> f;
    f.ca.assign(cells, Choice{});
    if (b_all.size() > 1) f.cb.assign(cells, Choice{});
    const Payoff<T> pay = goal_payoff<T>(goal);
    std::vector<T> rowmin(max_menu_options);
    auto decide_a = [&](std::size_t idx, int na, const int* ai, int nb, const int*, const T* e) -> T {
        for (int x = 0; x < na; ++x) {
            rowmin[x] = e[x * nb];
            for (int z = 1; z < nb; ++z)
                if (e[x * nb + z] < rowmin[x]) rowmin[x] = e[x * nb + z];
        }
        T best = rowmin[0];
        for (int x = 1; x < na; ++x)
            if (rowmin[x] > best) best = rowmin[x];
        f.ca[idx] = pick(na, ai, rowmin.data(), best, tol);
        return best;
    };
    if (order == Order::simultaneous) {
        if (a_all.size() > 1 && b_all.size() > 1)
            throw InternalError("optimise_pure: the simultaneous game of two menus needs mixed choices");
        std::vector<T> e(max_menu_options * max_menu_options);
        std::vector<T> col(max_menu_options);
        auto decide = [&](std::size_t idx, int na, const int* ai, int nb, const int* bj, const T* c,
                          const T* den) -> T {
            for (int k = 0; k < na * nb; ++k) e[k] = den[k] > 0 ? T(c[k] / den[k]) : pay.neither;
            const T v = decide_a(idx, na, ai, nb, bj, e.data());
            if (nb > 1) {
                for (int z = 0; z < nb; ++z) col[z] = e[z];
                f.cb[idx] = pick(nb, bj, col.data(), v, tol);
            }
            return v;
        };
        SimultaneousProgramme<T, T> p(A, Candidates{&a_all}, B, b_all, Candidates{&b_all}, pay);
        p.sweep(st.plan, decide);
        if (st.loops) {
            // One round: a pair that stays forever pays neither, any other
            // pays c + (1 - den) x; A's best row minimum.
            f.error = simultaneous_error(p, st,
                                         [&](std::size_t, int na, const int*, int nb, const int*, const T* c,
                                             const T* den, const T& x) {
                                             T best{};
                                             for (int i = 0; i < na; ++i) {
                                                 T low{};
                                                 for (int j = 0; j < nb; ++j) {
                                                     const int k = i * nb + j;
                                                     const T m = den[k] > 0 ? T(c[k] + (1 - den[k]) * x)
                                                                            : pay.neither;
                                                     if (j == 0 || m < low) low = m;
                                                 }
                                                 if (i == 0 || low > best) best = low;
                                             }
                                             return best;
                                         });
        }
        f.value = p.v[0];
        f.va = std::move(p.v);
        return f;
    }
    auto decide_b = [&](std::size_t idx, int nb, const int* bj, const T* y) -> T {
        T best = y[0];
        for (int z = 1; z < nb; ++z)
            if (y[z] < best) best = y[z];
        if (nb > 1) {
            // Among equally good answers, one that leaves the square: staying
            // forever would turn a state both sides leave alone into a loop.
            const int b = static_cast<int>(idx % static_cast<std::size_t>(n));
            Choice c = pick(nb, bj, y, best, tol);
            for (int z = 0; z < nb; ++z)
                if ((c.as_good >> bj[z] & 1u) && B[bj[z]].leave[b] > 0) {
                    c.option = bj[z];
                    break;
                }
            f.cb[idx] = c;
        }
        return best;
    };
    AlternatingProgramme<T, T> p(A, Candidates{&a_all}, B, Candidates{&b_all}, pay);
    p.sweep(st.plan, decide_a, decide_b);
    if (st.loops) {
        // One move: A takes its best, B its least.
        auto one = [](bool most) {
            return [most](std::size_t, int m, const int*, const T* z) {
                T best = z[0];
                for (int q = 1; q < m; ++q)
                    if (most ? z[q] > best : z[q] < best) best = z[q];
                return best;
            };
        };
        f.error = alternating_error(p, st, one(true), one(false));
    }
    f.value = start_value(p.r, order);
    f.va = std::move(p.r.va);
    f.vb = std::move(p.r.vb);
    return f;
}

// The four outcome probabilities from the start under fixed pure choices.
template <class T>
Quad<T> evaluate_pure(const std::vector<Moves<T>>& A, const std::vector<int>& a_all,
                      const std::vector<Choice>& ca, const std::vector<Moves<T>>& B,
                      const std::vector<int>& b_all, const std::vector<Choice>& cb, Order order, Setting& st,
                      long double* error = nullptr) {
    const Payoff<Quad<T>> pay = outcome_payoff<T>();
    Candidates xa{&a_all, &ca};
    Candidates xb{&b_all, cb.empty() ? nullptr : &cb};
    if (order == Order::simultaneous) {
        auto decide = [&](std::size_t, int, const int*, int, const int*, const Quad<T>* c, const T* den) {
            return den[0] > 0 ? c[0] / den[0] : pay.neither;
        };
        SimultaneousProgramme<T, Quad<T>> p(A, xa, B, b_all, xb, pay);
        p.sweep(st.plan, decide);
        if (st.loops && error)
            *error = simultaneous_error(
                p, st,
                [&](std::size_t, int, const int*, int, const int*, const Quad<T>* c, const T* den,
                    const Quad<T>& x) { return den[0] > 0 ? c[0] + (1 - den[0]) * x : pay.neither; });
        return p.v[0];
    }
    auto da = [&](std::size_t, int, const int*, int, const int*, const Quad<T>* e) { return e[0]; };
    auto db = [&](std::size_t, int, const int*, const Quad<T>* y) { return y[0]; };
    AlternatingProgramme<T, Quad<T>> p(A, xa, B, xb, pay);
    p.sweep(st.plan, da, db);
    if (st.loops && error) {
        auto first = [](std::size_t, int, const int*, const Quad<T>* z) { return z[0]; };
        *error = alternating_error(p, st, first, first);
    }
    return start_outcomes(p.r, order);
}

std::vector<int> all_of(std::size_t n) {
    std::vector<int> v(n);
    for (std::size_t i = 0; i < n; ++i) v[i] = static_cast<int>(i);
    return v;
}

// Rounding of every value of a sweep: each is a weighted mean of later values
// and payoffs (the weights sum to one after the division), so one state adds at
// most gamma(k) for k the longest sum, and a value depends on at most 4n + 4
// states in sequence (docs/policy.md).
// The longest sum of one state: a row of moves, the candidates' terms and
// the weights of a mixed choice.
int sweep_terms(const std::vector<Chain>& a, const std::vector<Chain>& b) {
    int widest = 0;
    for (const auto& c : a) widest = std::max(widest, c.max_move);
    for (const auto& c : b) widest = std::max(widest, c.max_move);
    const int na = static_cast<int>(a.size()), nb = static_cast<int>(b.size());
    return widest + 2 * (na + nb) + na * nb + 16;
}

long double sweep_bound(const std::vector<Chain>& a, const std::vector<Chain>& b) {
    const int n = a.front().length;
    return static_cast<long double>(4 * n + 4) * gamma_ld(sweep_terms(a, b));
}

// The simultaneous game of two menus (Shapley, 1953, PNAS 39:1095-1100): at
// every state v = val(c + (1 - den) v). A pure saddle point is tried first;
// otherwise v is found by bisection on the non-increasing val(M(v)) - v,
// toward the root nearest 0 (a loop pays 0; docs/policy.md), each step a
// matrix game solved by the simplex method.
struct GameRun {
    std::vector<Choice> ca, cb;
    std::vector<double> x, y;
    std::vector<char> mixed;
    std::size_t mixed_states = 0;
    long double value = 0;
    std::vector<long double> values;
};

GameRun solve_simultaneous_game(const std::vector<Moves<long double>>& A,
                                const std::vector<Moves<long double>>& B, long double tol, Setting& st) {
    const int n = A.front().length;
    const std::size_t cells = static_cast<std::size_t>(n) * n;
    const int na = static_cast<int>(A.size()), nb = static_cast<int>(B.size());
    GameRun g;
    g.ca.assign(cells, Choice{});
    g.cb.assign(cells, Choice{});
    g.x.assign(cells * na, 0.0);
    g.y.assign(cells * nb, 0.0);
    g.mixed.assign(cells, 0);
    const auto a_all = all_of(A.size()), b_all = all_of(B.size());
    const Payoff<long double> pay = goal_payoff<long double>(PolicyGoal::margin);
    std::vector<long double> m(static_cast<std::size_t>(na) * nb);
    auto matrix_at = [&](long double v, const long double* c, const long double* den) {
        for (int k = 0; k < na * nb; ++k) m[k] = c[k] + (1 - den[k]) * v;
        return solve_matrix_game(na, nb, m);
    };
    auto decide = [&](std::size_t idx, int, const int*, int, const int*, const long double* c,
                      const long double* den) -> long double {
        // A block with loops visits a state again: forget its last choice.
        std::fill(g.x.begin() + static_cast<std::ptrdiff_t>(idx * na),
                  g.x.begin() + static_cast<std::ptrdiff_t>((idx + 1) * na), 0.0);
        std::fill(g.y.begin() + static_cast<std::ptrdiff_t>(idx * nb),
                  g.y.begin() + static_cast<std::ptrdiff_t>((idx + 1) * nb), 0.0);
        if (g.mixed[idx]) g.mixed[idx] = 0, --g.mixed_states;
        for (int i = 0; i < na; ++i)
            for (int j = 0; j < nb; ++j) {
                const long double e = den[i * nb + j] > 0 ? c[i * nb + j] / den[i * nb + j] : pay.neither;
                bool saddle = true;
                for (int k = 0; k < na && saddle; ++k)
                    saddle = c[k * nb + j] + (1 - den[k * nb + j]) * e <= e + tol;
                for (int l = 0; l < nb && saddle; ++l)
                    saddle = c[i * nb + l] + (1 - den[i * nb + l]) * e >= e - tol;
                if (!saddle) continue;
                g.ca[idx] = Choice{i, 1u << i};
                g.cb[idx] = Choice{j, 1u << j};
                g.x[idx * na + i] = 1;
                g.y[idx * nb + j] = 1;
                return e;
            }
        auto phi = [&](long double v) { return matrix_at(v, c, den).value - v; };
        long double lo, hi, v;
        const long double p0 = phi(0);
        if (p0 == 0) {
            v = 0;
        } else {
            // phi(lo) on the root's side of 0, phi(hi) past it.
            const bool above = p0 > 0;
            lo = 0;
            hi = above ? pay.win : pay.loss;
            for (int it = 0; it < 70 && std::fabs(hi - lo) > 1e-19L; ++it) {
                const long double mid = (lo + hi) / 2;
                const long double p = phi(mid);
                if (above ? p > 0 : p < 0)
                    lo = mid;
                else
                    hi = mid;
            }
            v = (lo + hi) / 2;
        }
        MatrixGameSolution s = matrix_at(v, c, den);
        g.mixed[idx] = 1;
        ++g.mixed_states;
        Choice a{0, 0}, b{0, 0};
        for (int i = 0; i < na; ++i) {
            g.x[idx * na + i] = static_cast<double>(s.row_mix[i]);
            if (s.row_mix[i] > s.row_mix[a.option]) a.option = i;
            if (s.row_mix[i] > 1e-12L) a.as_good |= 1u << i;
        }
        for (int j = 0; j < nb; ++j) {
            g.y[idx * nb + j] = static_cast<double>(s.col_mix[j]);
            if (s.col_mix[j] > s.col_mix[b.option]) b.option = j;
            if (s.col_mix[j] > 1e-12L) b.as_good |= 1u << j;
        }
        g.ca[idx] = a;
        g.cb[idx] = b;
        return v;
    };
    SimultaneousProgramme<long double, long double> p(A, Candidates{&a_all}, B, b_all, Candidates{&b_all},
                                                      pay);
    p.sweep(st.plan, decide);
    g.value = p.v[0];
    g.values = std::move(p.v);
    return g;
}

// What a stored mixed strategy guarantees: one side plays its mix at every
// state, the other answers best (a decision process, solved like the pure
// ones). `rows` is true when A's mix is fixed.
// With the error proven on boards with loops in `*error`.
long double guaranteed_by_mix(const std::vector<Moves<long double>>& A,
                              const std::vector<Moves<long double>>& B, const GameRun& g, bool rows,
                              Setting& st, long double* error) {
    const int na = static_cast<int>(A.size()), nb = static_cast<int>(B.size());
    const auto a_all = all_of(A.size()), b_all = all_of(B.size());
    const Payoff<long double> pay = goal_payoff<long double>(PolicyGoal::margin);
    auto decide = [&](std::size_t idx, int, const int*, int, const int*, const long double* c,
                      const long double* den) -> long double {
        long double best = 0;
        const int outer = rows ? nb : na, inner = rows ? na : nb;
        for (int o = 0; o < outer; ++o) {
            long double num = 0, d = 0;
            for (int k = 0; k < inner; ++k) {
                const int cell = rows ? k * nb + o : o * nb + k;
                const long double w = rows ? g.x[idx * na + k] : g.y[idx * nb + k];
                num += w * c[cell];
                d += w * den[cell];
            }
            const long double e = d > 0 ? num / d : pay.neither;
            if (o == 0 || (rows ? e < best : e > best)) best = e;
        }
        return best;
    };
    SimultaneousProgramme<long double, long double> p(A, Candidates{&a_all}, B, b_all, Candidates{&b_all},
                                                      pay);
    p.sweep(st.plan, decide);
    if (st.loops) {
        // One round of the mix against each answer: the weighted matrix
        // entries (a cell that stays forever returns to the state), unless
        // every weighted cell stays forever (then the pair pays neither).
        *error = simultaneous_error(p, st,
                                    [&](std::size_t idx, int, const int*, int, const int*,
                                        const long double* c, const long double* den, long double x) {
                                        long double best = 0;
                                        const int outer = rows ? nb : na, inner = rows ? na : nb;
                                        for (int o = 0; o < outer; ++o) {
                                            long double num = 0, d = 0, total = 0;
                                            for (int k = 0; k < inner; ++k) {
                                                const int cell = rows ? k * nb + o : o * nb + k;
                                                const long double w =
                                                    rows ? g.x[idx * na + k] : g.y[idx * nb + k];
                                                num += w * (c[cell] + (1 - den[cell]) * x);
                                                d += w * den[cell];
                                                total += w;
                                            }
                                            const long double e = d > 0 ? num / total : pay.neither;
                                            if (o == 0 || (rows ? e < best : e > best)) best = e;
                                        }
                                        return best;
                                    });
    }
    return p.v[0];
}

Quad<long double> evaluate_mixes(const std::vector<Moves<long double>>& A,
                                 const std::vector<Moves<long double>>& B, const GameRun& g, Setting& st,
                                 long double* error) {
    const int na = static_cast<int>(A.size()), nb = static_cast<int>(B.size());
    const auto a_all = all_of(A.size()), b_all = all_of(B.size());
    const Payoff<Quad<long double>> pay = outcome_payoff<long double>();
    auto decide = [&](std::size_t idx, int, const int*, int, const int*, const Quad<long double>* c,
                      const long double* den) {
        Quad<long double> num{};
        long double d = 0;
        for (int i = 0; i < na; ++i)
            for (int j = 0; j < nb; ++j) {
                const long double w = static_cast<long double>(g.x[idx * na + i]) * g.y[idx * nb + j];
                if (w == 0) continue;
                num += w * c[i * nb + j];
                d += w * den[i * nb + j];
            }
        return d > 0 ? num / d : pay.neither;
    };
    SimultaneousProgramme<long double, Quad<long double>> p(A, Candidates{&a_all}, B, b_all,
                                                            Candidates{&b_all}, pay);
    p.sweep(st.plan, decide);
    if (st.loops) {
        *error = simultaneous_error(
            p, st,
            [&](std::size_t idx, int, const int*, int, const int*, const Quad<long double>* c,
                const long double* den, const Quad<long double>& x) {
                Quad<long double> num{};
                long double d = 0, total = 0;
                for (int i = 0; i < na; ++i)
                    for (int j = 0; j < nb; ++j) {
                        const long double w = static_cast<long double>(g.x[idx * na + i]) * g.y[idx * nb + j];
                        if (w == 0) continue;
                        num += w * (c[i * nb + j] + (1 - den[i * nb + j]) * x);
                        d += w * den[i * nb + j];
                        total += w;
                    }
                return d > 0 ? num / total : pay.neither;
            });
    }
    return p.v[0];
}

PolicyOutcomes outcomes_of(const Quad<long double>& q, long double bound) {
    return {q.win, q.loss, q.tie, q.neither, bound};
}

}  // namespace

DuelPolicy solve_duel_policy(const std::vector<Chain>& a_menu, const std::vector<Chain>& b_menu, Order order,
                             bool exact) {
    const int max_menu = max_menu_options;
    if (a_menu.empty() || b_menu.empty() || static_cast<int>(a_menu.size()) > max_menu ||
        static_cast<int>(b_menu.size()) > max_menu)
        throw InputError("a menu holds 1 to " + std::to_string(max_menu) + " options");
    if (exact)
        if (auto why = exact_policy_refusal(a_menu.front()); !why.empty()) throw LimitError(why);
    DuelPolicy d;
    d.length = a_menu.front().length;
    d.order = order;
    d.goal = b_menu.size() > 1 ? PolicyGoal::margin : PolicyGoal::win;
    d.a_options = static_cast<int>(a_menu.size());
    d.b_options = static_cast<int>(b_menu.size());
    const bool game_sim = order == Order::simultaneous && a_menu.size() > 1 && b_menu.size() > 1;
    if (exact && game_sim)
        throw LimitError(
            "exact mode: the simultaneous game of two menus has mixed choices whose value is irrational in "
            "general; omit --exact to get the value within a proven interval");
    const long double bound = sweep_bound(a_menu, b_menu);
    const long double tol = 4 * bound;
    const auto A = make_menu<long double>(a_menu);
    const auto B = make_menu<long double>(b_menu);
    const auto a_all = all_of(a_menu.size()), b_all = all_of(b_menu.size());
    Setting st(a_menu, b_menu);
    if (st.loops) {
        // One step of the operator nests A's row of moves around B's: its
        // longest sum has both rows' terms, so one more widest move than the
        // sweep's count.
        int widest = 0;
        for (const auto& c : a_menu) widest = std::max(widest, c.max_move);
        for (const auto& c : b_menu) widest = std::max(widest, c.max_move);
        const int k = sweep_terms(a_menu, b_menu) + widest;
        st.rel = policy_detail::step_rounding(k);
        st.one_state = 2 * st.rel;
        st.w = policy_detail::rounds_bound(A, a_all, B, b_all, order != Order::simultaneous, st.plan, k);
        d.iterated = true;
    }
    // On boards with loops every bound below is the proven error of the
    // iterated programme; elsewhere the rounding bound of the sweep.
    auto proven = [&](long double error) { return st.loops ? error : bound; };
    if (game_sim) {
        GameRun g = solve_simultaneous_game(A, B, tol, st);
        d.a_choice = std::move(g.ca);
        d.b_choice = std::move(g.cb);
        d.a_mix = g.x;
        d.b_mix = g.y;
        d.mixed = g.mixed;
        d.mixed_states = g.mixed_states;
        d.value = g.value;
        d.values = std::move(g.values);
        // The interval: what A's stored mix guarantees against every answer,
        // and what B's stored mix concedes at most, each with its error.
        long double e_low = 0, e_high = 0, e_out = 0;
        d.value_low = guaranteed_by_mix(A, B, g, true, st, &e_low);
        d.value_low -= proven(e_low);
        d.value_high = guaranteed_by_mix(A, B, g, false, st, &e_high);
        d.value_high += proven(e_high);
        const Quad<long double> q = evaluate_mixes(A, B, g, st, &e_out);
        d.outcomes = outcomes_of(q, proven(e_out));
        d.sweeps = st.plan.sweeps;
        return d;
    }
    Found<long double> f = optimise_pure(A, a_all, B, b_all, order, d.goal, tol, st);
    if (exact) {
        const auto Aq = make_menu<mpq_class>(a_menu);
        const auto Bq = make_menu<mpq_class>(b_menu);
        Found<mpq_class> q = optimise_pure(Aq, a_all, Bq, b_all, order, d.goal, mpq_class(0), st);
        // Exact ties decide the choices; the rounded programme's values stay.
        f.ca = q.ca;
        f.cb = q.cb;
        d.exact = true;
        d.exact_value = q.value;
        Quad<mpq_class> o = evaluate_pure(Aq, a_all, q.ca, Bq, b_all, q.cb, order, st);
        d.exact_outcomes = {o.win, o.loss, o.tie, o.neither};
    }
    d.a_choice = f.ca;
    d.b_choice = f.cb;
    d.value = f.value;
    d.values = std::move(f.va);
    d.values_b = std::move(f.vb);
    long double e_out = 0;
    const Quad<long double> q = evaluate_pure(A, a_all, f.ca, B, b_all, f.cb, order, st, &e_out);
    d.outcomes = outcomes_of(q, proven(e_out));
    d.sweeps = st.plan.sweeps;
    const long double own =
        d.goal == PolicyGoal::win ? d.outcomes.p_a_wins : d.outcomes.p_a_wins - d.outcomes.p_b_wins;
    if (st.loops) {
        // The optimum lies within the proven error of the iterated values;
        // against a fixed option the found policy's own value (within its
        // error) is also a lower bound: no policy of A does better than the optimum.
        d.value_low = d.value - f.error;
        d.value_high = d.value + f.error;
        if (d.goal == PolicyGoal::win) d.value_low = std::max(d.value_low, own - 2 * e_out);
        return d;
    }
    // The found policy's own value bounds the optimum from one side; the
    // optimising programme's value (within its rounding) from the other.
    d.value_low = std::min(own, d.value) - 2 * bound;
    d.value_high = std::max(own, d.value) + 2 * bound;
    return d;
}

PolicyComparison compare_policies(const std::vector<Chain>& a_menu, const std::vector<Chain>& b_menu,
                                  Order order, bool exact) {
    PolicyComparison c;
    c.adaptive = solve_duel_policy(a_menu, b_menu, order, exact);
    for (std::size_t i = 0; i < a_menu.size(); ++i) {
        FixedPolicy f;
        if (b_menu.size() == 1) {
            // Both options fixed: the ordinary duel, by the engine's own programmes.
            const DuelResult r = duel(a_menu[i], b_menu[0], order, DuelSettings{.want_median = false});
            f.outcomes = {r.p_a_wins, r.p_b_wins, r.p_tie, r.p_neither, r.bound};
            f.value = r.p_a_wins;
            if (exact) {
                const ExactDuel e = exact_duel(a_menu[i], b_menu[0], order);
                f.exact = true;
                f.exact_value = e.p_a_wins;
                f.exact_outcomes = {e.p_a_wins, e.p_b_wins, e.p_tie, e.p_neither};
            }
        } else {
            const DuelPolicy p = solve_duel_policy({a_menu[i]}, b_menu, order, exact);
            f.outcomes = p.outcomes;
            f.value = p.value;
            f.exact = p.exact;
            f.exact_value = p.exact_value;
            f.exact_outcomes = p.exact_outcomes;
        }
        c.fixed.push_back(std::move(f));
        if (c.fixed.back().value > c.fixed[c.best_fixed].value + 4 * c.fixed.back().outcomes.bound)
            c.best_fixed = static_cast<int>(i);
    }
    if (exact) {
        int best = 0;
        for (std::size_t i = 1; i < c.fixed.size(); ++i)
            if (c.fixed[i].exact_value > c.fixed[best].exact_value) best = static_cast<int>(i);
        c.best_fixed = best;
        c.exact_worth = c.adaptive.exact_value - c.fixed[best].exact_value;
    }
    c.worth = c.adaptive.value - c.fixed[c.best_fixed].value;
    return c;
}

}  // namespace overshoot
