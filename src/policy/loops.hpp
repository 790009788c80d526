#pragma once
// Proven bounds for the policy programmes on boards where pieces can move
// backward (internal to src/policy; docs/policy.md "Boards with loops"). A
// block of several states is solved by iteration, so its values x are only
// near the fixed point v of the one-move operator Phi. If w >= 1 + Q w holds
// inside the block for every choice of both sides (w bounds the moves the
// race can last there, whatever is chosen), then |v - x| <= max|Phi(x) - x|
// * max w over the block, plus whatever error the block's exits carry: the
// operator is monotone, its probabilities sum to at most one, and
// x + c w is a supersolution once c exceeds the residual (Bertsekas and
// Tsitsiklis, 1991, Mathematics of Operations Research 16:580-595, for the
// stochastic shortest path; Shapley, 1953, for the game, from memory).
#include <cmath>
#include <string>
#include <vector>

#include "chain/series.hpp"
#include "core/error.hpp"
#include "policy/sweeps.hpp"

namespace overshoot::policy_detail {

// Per state, a proven bound w on the moves (alternating: wa before A's move,
// wb before B's) or rounds (simultaneous) the race can last inside its block,
// whatever both sides choose; pairs that stay forever count as ended (they
// pay neither). Throws LimitError when the menus can keep the race going
// round a loop forever, which no finite w bounds.
struct RoundsBound {
    std::vector<long double> wa, wb;
};

inline void refuse_unbounded() {
    throw LimitError(
        "policies on this board: no bound was found on how long the race can last inside a loop of squares "
        "(some choices of options go round it forever without finishing, or finish there too rarely), so the "
        "iteration's error cannot be proven; choose options that can always finish, or a board without "
        "backward moves");
}

// The largest relative rounding of one state's operator: sums of at most k terms.
inline long double step_rounding(int k) { return 2 * gamma_ld(k); }

template <class T>
RoundsBound rounds_bound(const std::vector<Moves<T>>& A, const std::vector<int>& a_all,
                         const std::vector<Moves<T>>& B, const std::vector<int>& b_all, bool alternating,
                         SweepPlan plan, int k) {
    RoundsBound out;
    const long double rel = step_rounding(k);
    const int n = A.front().length;
    auto fail_if_unsettled = [&](const std::vector<long double>& w) {
        plan.each_looping([&](int a, int b, int, int) {
            const long double x = w[static_cast<std::size_t>(a) * n + b];
            if (!std::isfinite(x) || x > 1e15L) refuse_unbounded();
        });
    };
    if (alternating) {
        Payoff<long double> pay{0, 0, 0, 0, 1};
        AlternatingProgramme<T, long double> p(A, Candidates{&a_all}, B, Candidates{&b_all}, pay);
        auto most_e = [](std::size_t, int na, const int*, int nb, const int*, const long double* e) {
            long double m = 0;
            for (int q = 0; q < na * nb; ++q) m = std::max(m, e[q]);
            return m;
        };
        auto most = [](std::size_t, int m, const int*, const long double* y) {
            long double best = 0;
            for (int q = 0; q < m; ++q) best = std::max(best, y[q]);
            return best;
        };
        p.sweep(plan, most_e, most);
        fail_if_unsettled(p.r.va);
        fail_if_unsettled(p.r.vb);
        for (long double eta = 1e-9L; eta < 1; eta *= 64) {
            AltValues<long double> w = p.r;
            for (auto* v : {&w.va, &w.vb})
                for (auto& x : *v) x = x * (1 + eta) + eta;
            bool ok = true;
            p.step(
                plan, w,
                [&](std::size_t, int m, const int*, const long double* z) { return most(0, m, nullptr, z); },
                most,
                [&](int a, int b, int, int, long double pa, long double pb) {
                    const std::size_t idx = static_cast<std::size_t>(a) * n + b;
                    ok = ok && pa * (1 + rel) <= w.va[idx] && pb * (1 + rel) <= w.vb[idx];
                });
            if (ok) {
                out.wa = std::move(w.va);
                out.wb = std::move(w.vb);
                return out;
            }
        }
        refuse_unbounded();
    }
    Payoff<long double> pay{0, 0, 0, 0, 0};
    SimultaneousProgramme<T, long double> p(A, Candidates{&a_all}, B, b_all, Candidates{&b_all}, pay);
    p.sweep(plan,
            [](std::size_t, int na, const int*, int nb, const int*, const long double* c, const T* den) {
                long double m = 0;
                for (int q = 0; q < na * nb; ++q)
                    if (den[q] > 0) m = std::max(m, (1 + c[q]) / den[q]);
                return m;
            });
    fail_if_unsettled(p.v);
    for (long double eta = 1e-9L; eta < 1; eta *= 64) {
        std::vector<long double> w = p.v;
        for (auto& x : w) x = x * (1 + eta) + eta;
        bool ok = true;
        p.step(
            plan, w,
            [](std::size_t, int na, const int*, int nb, const int*, const long double* c, const T* den,
               long double x) {
                long double m = 0;
                for (int q = 0; q < na * nb; ++q)
                    if (den[q] > 0) m = std::max(m, 1 + c[q] + (1 - den[q]) * x);
                return m;
            },
            [&](int a, int b, int, int, long double phi) {
                ok = ok && phi * (1 + rel) <= w[static_cast<std::size_t>(a) * n + b];
            });
        if (ok) {
            out.wa = std::move(w);
            return out;
        }
    }
    refuse_unbounded();
    return out;
}

// Accumulates the proven error of a block-by-block solution: the largest
// residual of a block of several states (plus its rounding) times the block's
// largest w, and the rounding of a one-state block; a chain of dependencies
// passes at most `blocks` blocks, each adding at most the largest of these.
class ErrorTally {
public:
    ErrorTally(int blocks, long double one_state) : blocks_(blocks), worst_(one_state) {}
    // Feed the states of one block in a row (as SweepPlan::each_looping does).
    void add(int ka, int kb, long double residual, long double w) {
        if (ka != ka_ || kb != kb_) close(), ka_ = ka, kb_ = kb;
        r_ = std::max(r_, residual);
        w_ = std::max(w_, w);
    }
    long double total() {
        close();
        return static_cast<long double>(blocks_) * worst_;
    }

private:
    void close() {
        if (ka_ >= 0) worst_ = std::max(worst_, r_ * w_);
        r_ = w_ = 0;
    }
    int blocks_;
    long double worst_;
    int ka_ = -1, kb_ = -1;
    long double r_ = 0, w_ = 0;
};

}  // namespace overshoot::policy_detail
