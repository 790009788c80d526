#pragma once
// The two backward sweeps over pairs of squares behind every duel policy
// (internal to src/policy). States are a * length + b for A on square a and B
// on square b; every move of a forward-only board goes to a later square, the
// finish or back to the same square, so sweeping a and b downward meets each
// state after all its successors but itself, and each state's self-loop is
// solved in closed form. The value type V is the scalar T when optimising and
// Quad<T> (four outcome probabilities at once) when evaluating fixed choices.
#include <algorithm>
#include <vector>

#include "core/limits.hpp"
#include "policy/alone.hpp"
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
    friend Quad operator*(const T& s, const Quad& q) { return {s * q.win, s * q.loss, s * q.tie, s * q.neither}; }
    friend Quad operator/(const Quad& q, const T& s) { return {q.win / s, q.loss / s, q.tie / s, q.neither / s}; }
};

// What A scores when the race ends: A alone finishes, B alone finishes, both
// in the same round, or neither ever (a state that loops forever).
template <class V>
struct Payoff {
    V win, loss, tie, neither;
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

template <class V>
struct AltValues {
    std::vector<V> va, vb;  // A to move at (a, b); B to move at (a, b)
};

// Alternating turns: A moves, then B, then A... `decide_a(idx, n, ai, e)`
// gets A's candidates and, for each, the value of that candidate against B's
// best answer, and returns A's value; `decide_b(idx, n, bj, y)` gets B's
// candidates with the value of each (given A's value at the state) and
// returns B's. With `e(i, j)` the value of the stationary pair (i, j) at the
// state: (X_i + s_i Y_j) / (1 - s_i s_j), or the payoff of neither when both
// stay forever (1 - s_i s_j = 0).
template <class T, class V, class DecideA, class DecideB>
AltValues<V> alternating_sweep(const std::vector<Moves<T>>& A, Candidates ca, const std::vector<Moves<T>>& B,
                               Candidates cb, const Payoff<V>& pay, DecideA&& decide_a, DecideB&& decide_b) {
    const int n = A.front().length;
    const std::size_t cells = static_cast<std::size_t>(n) * n;
    limits::check_memory(cells * 2 * sizeof(V), "the policy programme on this board");
    AltValues<V> r;
    r.va.assign(cells, V{});
    r.vb.assign(cells, V{});
    int ai[max_menu_options], bj[max_menu_options];
    std::vector<V> X(max_menu_options), Y(max_menu_options), e(max_menu_options * max_menu_options);
    std::vector<V> y(max_menu_options);
    for (int a = n - 1; a >= 0; --a) {
        for (int b = n - 1; b >= 0; --b) {
            const std::size_t idx = static_cast<std::size_t>(a) * n + b;
            const int na = ca.fill(idx, ai), nb = cb.fill(idx, bj);
            for (int x = 0; x < na; ++x) {
                const Moves<T>& m = A[ai[x]];
                V sum{};
                for (auto q = m.start[a]; q < m.start[a + 1]; ++q) {
                    const int d = m.dest[q];
                    sum += m.p[q] * (d == n ? pay.win : r.vb[static_cast<std::size_t>(d) * n + b]);
                }
                X[x] = sum;
            }
            for (int z = 0; z < nb; ++z) {
                const Moves<T>& m = B[bj[z]];
                V sum{};
                for (auto q = m.start[b]; q < m.start[b + 1]; ++q) {
                    const int d = m.dest[q];
                    sum += m.p[q] * (d == n ? pay.loss : r.va[static_cast<std::size_t>(a) * n + d]);
                }
                Y[z] = sum;
            }
            for (int x = 0; x < na; ++x) {
                const Moves<T>& ma = A[ai[x]];
                for (int z = 0; z < nb; ++z) {
                    const Moves<T>& mb = B[bj[z]];
                    // 1 - s_i s_j written as l_i + s_i l_j: no cancellation for heavy options.
                    const T den = ma.leave[a] + ma.stay[a] * mb.leave[b];
                    e[x * nb + z] = den > 0 ? V((X[x] + ma.stay[a] * Y[z]) / den) : pay.neither;
                }
            }
            const V va = decide_a(idx, na, ai, nb, bj, e.data());
            r.va[idx] = va;
            for (int z = 0; z < nb; ++z) y[z] = Y[z] + B[bj[z]].stay[b] * va;
            r.vb[idx] = decide_b(idx, nb, bj, y.data());
        }
    }
    return r;
}

// Simultaneous rounds. At each state the matrix c(i, j) (the value of the
// round's moves other than both staying) and den(i, j) = 1 - s_i s_j go to
// `decide(idx, na, ai, nb, bj, c, den)`, which returns the state's value v
// solving v = val(c + (1 - den) v) (or its evaluation for fixed choices).
// g[j] holds, per state, the value of B's move with option j after A's move:
// sum over B's destinations b' of P_j(b -> b') v(a', b').
template <class T, class V, class Decide>
std::vector<V> simultaneous_sweep(const std::vector<Moves<T>>& A, Candidates ca, const std::vector<Moves<T>>& B,
                                  const std::vector<int>& b_all, Candidates cb, const Payoff<V>& pay,
                                  Decide&& decide) {
    const int n = A.front().length;
    const std::size_t cells = static_cast<std::size_t>(n) * n;
    limits::check_memory(cells * (1 + b_all.size()) * sizeof(V), "the policy programme on this board");
    std::vector<V> v(cells, V{});
    std::vector<std::vector<V>> g(B.size());
    for (int j : b_all) g[j].assign(cells, V{});
    std::vector<V> h(B.size()), gn(B.size());
    int ai[max_menu_options], bj[max_menu_options];
    std::vector<V> c(max_menu_options * max_menu_options);
    std::vector<T> den(max_menu_options * max_menu_options);
    for (int a = n - 1; a >= 0; --a) {
        for (int b = n - 1; b >= 0; --b) {
            const std::size_t idx = static_cast<std::size_t>(a) * n + b;
            // B's move when A stays (B staying excluded), and when A finishes.
            for (int j : b_all) {
                const Moves<T>& m = B[j];
                V sum{};
                for (auto q = m.start[b]; q < m.start[b + 1]; ++q) {
                    const int d = m.dest[q];
                    sum += m.p[q] * (d == n ? pay.loss : v[static_cast<std::size_t>(a) * n + d]);
                }
                h[j] = sum;
                gn[j] = m.unfinished[b] * pay.win + m.finish[b] * pay.tie;
            }
            const int na = ca.fill(idx, ai), nb = cb.fill(idx, bj);
            for (int x = 0; x < na; ++x) {
                const Moves<T>& ma = A[ai[x]];
                for (int z = 0; z < nb; ++z) {
                    const int j = bj[z];
                    const std::vector<V>& gj = g[j];
                    V sum{};
                    for (auto q = ma.start[a]; q < ma.start[a + 1]; ++q) {
                        const int d = ma.dest[q];
                        sum += ma.p[q] * (d == n ? gn[j] : gj[static_cast<std::size_t>(d) * n + b]);
                    }
                    c[x * nb + z] = sum + ma.stay[a] * h[j];
                    den[x * nb + z] = ma.leave[a] + ma.stay[a] * B[j].leave[b];
                }
            }
            const V val = decide(idx, na, ai, nb, bj, c.data(), den.data());
            v[idx] = val;
            for (int j : b_all) g[j][idx] = h[j] + B[j].stay[b] * val;
        }
    }
    return v;
}

}  // namespace overshoot::policy_detail
