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

// Inside each block the race is counted until it leaves the block: the
// values of other blocks read as 0 (each block is forgotten once done), so w
// bounds the rounds spent inside the block, which is what its error needs.
// Each block's w is scaled by 1 + eta (plus eta) and checked at once.
template <class T>
RoundsBound rounds_bound(const std::vector<Moves<T>>& A, const std::vector<int>& a_all,
                         const std::vector<Moves<T>>& B, const std::vector<int>& b_all, bool alternating,
                         SweepPlan plan, int k) {
    RoundsBound out;
    const long double rel = step_rounding(k);
    const int n = A.front().length;
    const std::size_t cells = static_cast<std::size_t>(n) * n;
    auto index = [n](int a, int b) { return static_cast<std::size_t>(a) * n + b; };
    auto check_size = [](long double x) {
        if (!std::isfinite(x) || x > 1e15L) refuse_unbounded();
    };
    // Tries eta = 1e-9, 6.4e-8, ...: scale(eta) writes the scaled block into
    // the programme, holds() checks it; on success keep() stores it.
    auto settle = [&](auto&& scale, auto&& holds, auto&& keep) {
        for (long double eta = 1e-9L; eta < 1; eta *= 64) {
            scale(eta);
            if (holds()) {
                keep();
                return;
            }
        }
        refuse_unbounded();
    };
    if (alternating) {
        out.wa.assign(cells, 0);
        out.wb.assign(cells, 0);
        Payoff<long double> pay{0, 0, 0, 0, 1};
        AlternatingProgramme<T, long double> p(A, Candidates{&a_all}, B, Candidates{&b_all}, pay);
        auto most = [](std::size_t, int m, const int*, const long double* y) {
            long double best = 0;
            for (int q = 0; q < m; ++q) best = std::max(best, y[q]);
            return best;
        };
        auto most_e = [](std::size_t, int na, const int*, int nb, const int*, const long double* e) {
            long double m = 0;
            for (int q = 0; q < na * nb; ++q) m = std::max(m, e[q]);
            return m;
        };
        std::vector<std::pair<long double, long double>> found;
        p.sweep(plan, most_e, most, [&](int ka, int kb) {
            if (plan.several(ka, kb)) {
                found.clear();
                plan.each_in(ka, kb, [&](int a, int b) {
                    const std::size_t i = index(a, b);
                    check_size(p.r.va[i]);
                    check_size(p.r.vb[i]);
                    found.emplace_back(p.r.va[i], p.r.vb[i]);
                });
                settle(
                    [&](long double eta) {
                        std::size_t q = 0;
                        plan.each_in(ka, kb, [&](int a, int b) {
                            p.r.va[index(a, b)] = found[q].first * (1 + eta) + eta;
                            p.r.vb[index(a, b)] = found[q++].second * (1 + eta) + eta;
                        });
                    },
                    [&] {
                        bool ok = true;
                        p.step_block(
                            plan, ka, kb, p.r,
                            [&](std::size_t, int m, const int*, const long double* z) {
                                return most(0, m, nullptr, z);
                            },
                            most,
                            [&](int a, int b, int, int, long double pa, long double pb) {
                                ok = ok && pa * (1 + rel) <= p.r.va[index(a, b)] &&
                                     pb * (1 + rel) <= p.r.vb[index(a, b)];
                            });
                        return ok;
                    },
                    [&] {
                        plan.each_in(ka, kb, [&](int a, int b) {
                            out.wa[index(a, b)] = p.r.va[index(a, b)];
                            out.wb[index(a, b)] = p.r.vb[index(a, b)];
                        });
                    });
            }
            plan.each_in(ka, kb, [&](int a, int b) { p.clear(a, b); });
        });
        return out;
    }
    out.wa.assign(cells, 0);
    Payoff<long double> pay{0, 0, 0, 0, 0};
    SimultaneousProgramme<T, long double> p(A, Candidates{&a_all}, B, b_all, Candidates{&b_all}, pay);
    std::vector<long double> found;
    p.sweep(
        plan,
        [](std::size_t, int na, const int*, int nb, const int*, const long double* c, const T* den) {
            long double m = 0;
            for (int q = 0; q < na * nb; ++q)
                if (den[q] > 0) m = std::max(m, (1 + c[q]) / den[q]);
            return m;
        },
        [&](int ka, int kb) {
            if (plan.several(ka, kb)) {
                found.clear();
                plan.each_in(ka, kb, [&](int a, int b) {
                    check_size(p.v[index(a, b)]);
                    found.push_back(p.v[index(a, b)]);
                });
                settle(
                    [&](long double eta) {
                        std::size_t q = 0;
                        plan.each_in(ka, kb,
                                     [&](int a, int b) { p.v[index(a, b)] = found[q++] * (1 + eta) + eta; });
                    },
                    [&] {
                        bool ok = true;
                        p.step_block(
                            plan, ka, kb, p.v,
                            [](std::size_t, int na, const int*, int nb, const int*, const long double* c,
                               const T* den, long double x) {
                                long double m = 0;
                                for (int q = 0; q < na * nb; ++q)
                                    if (den[q] > 0) m = std::max(m, 1 + c[q] + (1 - den[q]) * x);
                                return m;
                            },
                            [&](int a, int b, int, int, long double phi) {
                                ok = ok && phi * (1 + rel) <= p.v[index(a, b)];
                            });
                        return ok;
                    },
                    [&] {
                        plan.each_in(ka, kb, [&](int a, int b) { out.wa[index(a, b)] = p.v[index(a, b)]; });
                    });
            }
            plan.each_in(ka, kb, [&](int a, int b) { p.clear(a, b); });
        });
    return out;
}

// Accumulates the proven error of a block-by-block solution: the largest
// residual of a block of several states (plus its rounding) times the block's
// largest w, and the rounding of a one-state block (`one_state`). A chain of
// dependencies walks through block pairs (ka, kb) with neither index ever
// decreasing; charge each pair to the index that grows when the chain leaves
// it: the pairs charged to A have distinct ka, those charged to B distinct
// kb. So every value is within the sum over ka of the worst pair with that
// ka, plus the same over kb, plus the worst pair (the last one).
class ErrorTally {
public:
    ErrorTally(int a_blocks, int b_blocks, long double one_state)
        : worst_a_(static_cast<std::size_t>(a_blocks), one_state),
          worst_b_(static_cast<std::size_t>(b_blocks), one_state),
          worst_(one_state) {}
    // Feed the states of one block in a row (as the programmes' step does).
    void add(int ka, int kb, long double residual, long double w) {
        if (ka != ka_ || kb != kb_) close(), ka_ = ka, kb_ = kb;
        r_ = std::max(r_, residual);
        w_ = std::max(w_, w);
    }
    long double total() {
        close();
        long double sum = worst_;
        for (long double x : worst_a_) sum += x;
        for (long double x : worst_b_) sum += x;
        // The sum's own rounding: a relative gamma of its length.
        return sum * (1 + gamma_ld(static_cast<double>(worst_a_.size() + worst_b_.size() + 2)));
    }

private:
    void close() {
        if (ka_ >= 0) {
            const long double e = r_ * w_;
            worst_a_[ka_] = std::max(worst_a_[ka_], e);
            worst_b_[kb_] = std::max(worst_b_[kb_], e);
            worst_ = std::max(worst_, e);
        }
        r_ = w_ = 0;
    }
    std::vector<long double> worst_a_, worst_b_;
    long double worst_;
    int ka_ = -1, kb_ = -1;
    long double r_ = 0, w_ = 0;
};

}  // namespace overshoot::policy_detail
