#pragma once
// The two sweeps over pairs of squares behind every duel policy (internal to
// src/policy). States are a * length + b for A on square a and B on square b.
// States are met block by block (policy/blocks.hpp), each block after every
// block it can move to. On a forward-only board every block is one state whose
// moves go to later states, the finish or itself: one visit solves it, its
// self-loop in closed form. A block of several states (a loop of squares:
// the rule bounce, a backward jump) is swept again and again (Gauss-Seidel,
// each state's self-loop still in closed form) until no value moves. `step`
// then applies the plain one-round operator once to the values found, for
// the residual that proves their bound (docs/policy.md). The value type V is
// the scalar T when optimising and Quad<T> (four outcome probabilities at
// once) when evaluating fixed choices.
#include <gmpxx.h>

#include <algorithm>
#include <cmath>
#include <vector>

#include "core/limits.hpp"
#include "policy/alone.hpp"
#include "policy/blocks.hpp"
#include "policy/moves.hpp"

namespace overshoot::policy_detail {

template <class T>
struct Quad {
    T win{0}, loss{0}, tie{0}, neither{0};
    Quad& operator+=(const Quad& o) {
        win += o.win, loss += o.loss, tie += o.tie, neither += o.neither;
        return *this;
    }
    friend Quad operator+(Quad a, const Quad& b) { return a += b; }
    friend Quad operator*(const T& s, const Quad& q) {
        return {s * q.win, s * q.loss, s * q.tie, s * q.neither};
    }
    friend Quad operator/(const Quad& q, const T& s) {
        return {q.win / s, q.loss / s, q.tie / s, q.neither / s};
    }
};

// How far apart two values are (the largest component; 1 for unequal fractions).
inline long double gap(const long double& x, const long double& y) { return std::fabs(x - y); }
inline long double gap(const mpq_class& x, const mpq_class& y) { return x == y ? 0 : 1; }
template <class T>
long double gap(const Quad<T>& x, const Quad<T>& y) {
    return std::max({gap(x.win, y.win), gap(x.loss, y.loss), gap(x.tie, y.tie), gap(x.neither, y.neither)});
}
inline long double magnitude(const long double& x) { return std::fabs(x); }
inline long double magnitude(const mpq_class& x) { return std::fabs(x.get_d()); }
template <class T>
long double magnitude(const Quad<T>& q) {
    return std::max({magnitude(q.win), magnitude(q.loss), magnitude(q.tie), magnitude(q.neither)});
}

// What A scores when the race ends: A alone finishes, B alone finishes, both
// in the same round, or neither ever (a state that loops forever). `step` is
// added for every move (alternating) or round (simultaneous, by the caller's
// decision): 1 to count moves, 0 otherwise.
template <class V>
struct Payoff {
    V win, loss, tie, neither;
    V step{};
};

// The candidates of one side at a state: its fixed choice, or every option allowed.
struct Candidates {
    const std::vector<int>* allowed = nullptr;
    const std::vector<Choice>* fixed = nullptr;  // per state, when choices are given
    int fill(std::size_t idx, int* out) const {
        if (fixed) {
            out[0] = (*fixed)[idx].option;
            return 1;
        }
        for (std::size_t k = 0; k < allowed->size(); ++k) out[k] = (*allowed)[k];
        return static_cast<int>(allowed->size());
    }
};

// The order of the states and when a block of several is settled: when no
// value moves by more than `settle` times its size (at least 1) in a sweep,
// when a sweep moves nothing more than the best sweep so far for 64 sweeps in
// a row (rounding noise), or after `max_sweeps` (fewer for huge blocks).
struct SweepPlan {
    const SquareBlocks* a = nullptr;
    const SquareBlocks* b = nullptr;
    long double settle = 0;
    long long max_sweeps = 0;
    long long sweeps = 0;  // out: sweeps of blocks of several states, all added up
    bool several(int ka, int kb) const { return !(a->single(ka) && b->single(kb)); }
    // Calls visit(a, b) for every state of every block in order; `moved` is
    // the largest change of the last sweep, reset by `visit`'s caller.
    template <class Visit>
    void run(Visit&& visit) {
        run(visit, [](int, int) {});
    }
    // The same, calling done(ka, kb) after each block.
    template <class Visit, class Done>
    void run(Visit&& visit, Done&& done) {
        for (int ka = 0; ka < a->count(); ++ka)
            for (int kb = 0; kb < b->count(); ++kb) {
                const bool loop = several(ka, kb);
                long double best = INFINITY;
                int stale = 0;
                // A huge block (a backward jump across most of the board) gets
                // fewer sweeps: about 2e9 state visits at most; stopping early
                // only widens the proven bound (or refuses when w cannot be proven).
                const long long states = static_cast<long long>(a->size(ka)) * b->size(kb);
                const long long cap = std::clamp(2'000'000'000LL / states, 64LL, std::max(64LL, max_sweeps));
                for (long long s = 0;; ++s) {
                    long double moved = 0;
                    for (int ia = a->start[ka]; ia < a->start[ka + 1]; ++ia)
                        for (int ib = b->start[kb]; ib < b->start[kb + 1]; ++ib)
                            moved = std::max(moved, visit(a->squares[ia], b->squares[ib], loop));
                    if (!loop) break;
                    ++sweeps;
                    if (moved < best)
                        best = moved, stale = 0;
                    else
                        ++stale;
                    if (moved <= settle || stale >= 64 || s + 1 >= cap) break;
                }
                done(ka, kb);
            }
    }
    // Calls visit(a, b) for every state of block (ka, kb).
    template <class Visit>
    void each_in(int ka, int kb, Visit&& visit) const {
        for (int ia = a->start[ka]; ia < a->start[ka + 1]; ++ia)
            for (int ib = b->start[kb]; ib < b->start[kb + 1]; ++ib) visit(a->squares[ia], b->squares[ib]);
    }
    // Calls each(ka, kb) for every block of several states.
    template <class Each>
    void each_looping_block(Each&& each) const {
        for (int ka = 0; ka < a->count(); ++ka)
            for (int kb = 0; kb < b->count(); ++kb)
                if (several(ka, kb)) each(ka, kb);
    }
};

template <class V>
struct AltValues {
    std::vector<V> va, vb;  // A to move at (a, b); B to move at (a, b)
};

// Alternating turns: A moves, then B, then A... `decide_a(idx, n, ai, m, bj,
// e)` gets A's candidates and, for each pair with B's candidates, the value
// `e(i, j)` of the stationary pair (i, j) at the state: (X_i + s_i Y_j) /
// (1 - s_i s_j), or the payoff of neither when both stay forever
// (1 - s_i s_j = 0); it returns A's value. `decide_b(idx, m, bj, y)` gets B's
// candidates with the value of each (given A's value at the state) and
// returns B's.
template <class T, class V>
class AlternatingProgramme {
public:
    AlternatingProgramme(const std::vector<Moves<T>>& A, Candidates ca, const std::vector<Moves<T>>& B,
                         Candidates cb, const Payoff<V>& pay)
        : A_(A), B_(B), ca_(ca), cb_(cb), pay_(pay), n_(A.front().length) {
        const std::size_t cells = static_cast<std::size_t>(n_) * n_;
        limits::check_memory(cells * 2 * sizeof(V), "the policy programme on this board");
        r.va.assign(cells, V{});
        r.vb.assign(cells, V{});
        X_.resize(max_menu_options);
        Y_.resize(max_menu_options);
        e_.resize(max_menu_options * max_menu_options);
        y_.resize(max_menu_options);
    }

    AltValues<V> r;

    template <class DecideA, class DecideB>
    void sweep(SweepPlan& plan, DecideA&& decide_a, DecideB&& decide_b) {
        sweep(plan, decide_a, decide_b, [](int, int) {});
    }
    template <class DecideA, class DecideB, class Done>
    void sweep(SweepPlan& plan, DecideA&& decide_a, DecideB&& decide_b, Done&& done) {
        plan.run(
            [&](int a, int b, bool loop) -> long double {
                const std::size_t idx = static_cast<std::size_t>(a) * n_ + b;
                terms(a, b, r);
                for (int x = 0; x < na_; ++x) {
                    const Moves<T>& ma = A_[ai_[x]];
                    for (int z = 0; z < nb_; ++z) {
                        const Moves<T>& mb = B_[bj_[z]];
                        // 1 - s_i s_j written as l_i + s_i l_j: no cancellation for heavy options.
                        const T den = ma.leave[a] + ma.stay[a] * mb.leave[b];
                        e_[x * nb_ + z] = den > 0 ? V((X_[x] + ma.stay[a] * Y_[z]) / den) : pay_.neither;
                    }
                }
                const V va = decide_a(idx, na_, ai_, nb_, bj_, e_.data());
                for (int z = 0; z < nb_; ++z) y_[z] = Y_[z] + B_[bj_[z]].stay[b] * va;
                const V vb = decide_b(idx, nb_, bj_, y_.data());
                long double moved = 0;
                if (loop)
                    moved = std::max(gap(va, r.va[idx]), gap(vb, r.vb[idx])) / std::max(1.0L, magnitude(va));
                r.va[idx] = va;
                r.vb[idx] = vb;
                return moved;
            },
            done);
    }

    // Forgets the values of one state (as if it had not been met).
    void clear(int a, int b) {
        const std::size_t idx = static_cast<std::size_t>(a) * n_ + b;
        r.va[idx] = V{};
        r.vb[idx] = V{};
    }

    // One move of the plain operator from the values x at every state of a
    // block of several: `one_a(idx, n, ai, z)` gets z_i = X_i + s_i x_b(a, b)
    // per candidate of A, `one_b(idx, m, bj, y)` y_j = Y_j + s_j x_a(a, b);
    // `seen(a, b, ka, kb, phi_a, phi_b)` receives the results.
    template <class OneA, class OneB, class Seen>
    void step(const SweepPlan& plan, const AltValues<V>& x, OneA&& one_a, OneB&& one_b, Seen&& seen) {
        plan.each_looping_block([&](int ka, int kb) { step_block(plan, ka, kb, x, one_a, one_b, seen); });
    }
    template <class OneA, class OneB, class Seen>
    void step_block(const SweepPlan& plan, int ka, int kb, const AltValues<V>& x, OneA&& one_a, OneB&& one_b,
                    Seen&& seen) {
        plan.each_in(ka, kb, [&](int a, int b) {
            const std::size_t idx = static_cast<std::size_t>(a) * n_ + b;
            terms(a, b, x);
            for (int i = 0; i < na_; ++i) z_[i] = X_[i] + A_[ai_[i]].stay[a] * x.vb[idx];
            const V pa = one_a(idx, na_, ai_, z_);
            for (int j = 0; j < nb_; ++j) y_[j] = Y_[j] + B_[bj_[j]].stay[b] * x.va[idx];
            const V pb = one_b(idx, nb_, bj_, y_.data());
            seen(a, b, ka, kb, pa, pb);
        });
    }

private:
    // X_i: A's move with option i other than staying; Y_j: B's.
    void terms(int a, int b, const AltValues<V>& v) {
        const int n = n_;
        const std::size_t idx = static_cast<std::size_t>(a) * n + b;
        na_ = ca_.fill(idx, ai_);
        nb_ = cb_.fill(idx, bj_);
        for (int x = 0; x < na_; ++x) {
            const Moves<T>& m = A_[ai_[x]];
            V sum = pay_.step;
            for (auto q = m.start[a]; q < m.start[a + 1]; ++q) {
                const int d = m.dest[q];
                sum += m.p[q] * (d == n ? pay_.win : v.vb[static_cast<std::size_t>(d) * n + b]);
            }
            X_[x] = sum;
        }
        for (int z = 0; z < nb_; ++z) {
            const Moves<T>& m = B_[bj_[z]];
            V sum = pay_.step;
            for (auto q = m.start[b]; q < m.start[b + 1]; ++q) {
                const int d = m.dest[q];
                sum += m.p[q] * (d == n ? pay_.loss : v.va[static_cast<std::size_t>(a) * n + d]);
            }
            Y_[z] = sum;
        }
    }

    const std::vector<Moves<T>>& A_;
    const std::vector<Moves<T>>& B_;
    Candidates ca_, cb_;
    Payoff<V> pay_;
    int n_;
    int ai_[max_menu_options], bj_[max_menu_options];
    int na_ = 0, nb_ = 0;
    std::vector<V> X_, Y_, e_, y_;
    V z_[max_menu_options];
};

// Simultaneous rounds. At each state the matrix c(i, j) (the value of the
// round's moves other than both staying) and den(i, j) = 1 - s_i s_j go to
// `decide(idx, na, ai, nb, bj, c, den)`, which returns the state's value v
// solving v = val(c + (1 - den) v) (or its evaluation for fixed choices).
// g[j] holds, per state, the value of B's move with option j after A's move:
// sum over B's destinations b' of P_j(b -> b') v(a', b').
template <class T, class V>
class SimultaneousProgramme {
public:
    SimultaneousProgramme(const std::vector<Moves<T>>& A, Candidates ca, const std::vector<Moves<T>>& B,
                          const std::vector<int>& b_all, Candidates cb, const Payoff<V>& pay)
        : A_(A), B_(B), b_all_(b_all), ca_(ca), cb_(cb), pay_(pay), n_(A.front().length) {
        const std::size_t cells = static_cast<std::size_t>(n_) * n_;
        limits::check_memory(cells * (1 + b_all.size()) * sizeof(V), "the policy programme on this board");
        v.assign(cells, V{});
        g_.resize(B.size());
        for (int j : b_all) g_[j].assign(cells, V{});
        h_.resize(B.size());
        gn_.resize(B.size());
        c_.resize(max_menu_options * max_menu_options);
        den_.resize(max_menu_options * max_menu_options);
    }

    std::vector<V> v;

    template <class Decide>
    void sweep(SweepPlan& plan, Decide&& decide) {
        sweep(plan, decide, [](int, int) {});
    }
    template <class Decide, class Done>
    void sweep(SweepPlan& plan, Decide&& decide, Done&& done) {
        plan.run(
            [&](int a, int b, bool loop) -> long double {
                const std::size_t idx = static_cast<std::size_t>(a) * n_ + b;
                terms(a, b, v);
                const V val = decide(idx, na_, ai_, nb_, bj_, c_.data(), den_.data());
                const long double moved = loop ? gap(val, v[idx]) / std::max(1.0L, magnitude(val)) : 0;
                v[idx] = val;
                for (int j : b_all_) g_[j][idx] = h_[j] + B_[j].stay[b] * val;
                return moved;
            },
            done);
    }

    // Forgets the values of one state (as if it had not been met).
    void clear(int a, int b) {
        const std::size_t idx = static_cast<std::size_t>(a) * n_ + b;
        v[idx] = V{};
        for (int j : b_all_) g_[j][idx] = V{};
    }

    // One round of the plain operator from the values x (after sweep(), whose
    // values outside blocks of several states x must equal) at every state of
    // a block of several: `one(idx, na, ai, nb, bj, c, den, x(idx))` gets the
    // matrix of the round as in sweep; `seen(a, b, ka, kb, phi)` receives the
    // result. The stored g of those states is first rebuilt from x.
    template <class One, class Seen>
    void step(const SweepPlan& plan, const std::vector<V>& x, One&& one, Seen&& seen) {
        plan.each_looping_block([&](int ka, int kb) { step_block(plan, ka, kb, x, one, seen); });
    }
    template <class One, class Seen>
    void step_block(const SweepPlan& plan, int ka, int kb, const std::vector<V>& x, One&& one, Seen&& seen) {
        plan.each_in(ka, kb, [&](int a, int b) {
            const std::size_t idx = static_cast<std::size_t>(a) * n_ + b;
            b_moves(a, b, x);
            for (int j : b_all_) g_[j][idx] = h_[j] + B_[j].stay[b] * x[idx];
        });
        plan.each_in(ka, kb, [&](int a, int b) {
            const std::size_t idx = static_cast<std::size_t>(a) * n_ + b;
            terms(a, b, x);
            seen(a, b, ka, kb, one(idx, na_, ai_, nb_, bj_, c_.data(), den_.data(), x[idx]));
        });
    }

private:
    // B's move when A stays (B staying excluded), and when A finishes.
    void b_moves(int a, int b, const std::vector<V>& val) {
        const int n = n_;
        for (int j : b_all_) {
            const Moves<T>& m = B_[j];
            V sum{};
            for (auto q = m.start[b]; q < m.start[b + 1]; ++q) {
                const int d = m.dest[q];
                sum += m.p[q] * (d == n ? pay_.loss : val[static_cast<std::size_t>(a) * n + d]);
            }
            h_[j] = sum;
            gn_[j] = m.unfinished[b] * pay_.win + m.finish[b] * pay_.tie;
        }
    }

    void terms(int a, int b, const std::vector<V>& val) {
        const int n = n_;
        const std::size_t idx = static_cast<std::size_t>(a) * n + b;
        b_moves(a, b, val);
        na_ = ca_.fill(idx, ai_);
        nb_ = cb_.fill(idx, bj_);
        for (int x = 0; x < na_; ++x) {
            const Moves<T>& ma = A_[ai_[x]];
            for (int z = 0; z < nb_; ++z) {
                const int j = bj_[z];
                const std::vector<V>& gj = g_[j];
                V sum{};
                for (auto q = ma.start[a]; q < ma.start[a + 1]; ++q) {
                    const int d = ma.dest[q];
                    sum += ma.p[q] * (d == n ? gn_[j] : gj[static_cast<std::size_t>(d) * n + b]);
                }
                c_[x * nb_ + z] = sum + ma.stay[a] * h_[j];
                den_[x * nb_ + z] = ma.leave[a] + ma.stay[a] * B_[j].leave[b];
            }
        }
    }

    const std::vector<Moves<T>>& A_;
    const std::vector<Moves<T>>& B_;
    const std::vector<int>& b_all_;
    Candidates ca_, cb_;
    Payoff<V> pay_;
    int n_;
    std::vector<std::vector<V>> g_;
    std::vector<V> h_, gn_, c_;
    std::vector<T> den_;
    int ai_[max_menu_options], bj_[max_menu_options];
    int na_ = 0, nb_ = 0;
};

}  // namespace overshoot::policy_detail
