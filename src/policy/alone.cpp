#include "policy/alone.hpp"

#include <Eigen/Dense>
#include <cmath>
#include <limits>
#include <type_traits>

#include "chain/series.hpp"
#include "core/error.hpp"
#include "policy/blocks.hpp"
#include "policy/loops.hpp"
#include "policy/moves.hpp"

namespace overshoot {

std::string exact_policy_refusal(const Chain& c) {
    if (c.forward_only) return {};
    return "exact mode: optimal policies are exact by backward induction over squares, which needs a board "
           "where "
           "pieces never move backward; this board has the bounce rule or a backward jump: omit --exact to "
           "get "
           "values within proven bounds";
}

namespace {

template <class T>
struct AloneT {
    std::vector<T> h, e;       // P(finish), expected rounds
    std::vector<char> finite;  // e is finite
    std::vector<Choice> surest, fastest;
};

bool within(const long double& x, const long double& y, const long double& tol) {
    return std::fabs(x - y) <= tol;
}
bool within(const mpq_class& x, const mpq_class& y, const mpq_class&) { return x == y; }

// Squares of a block with loops from which the options in `allowed` can
// finish for sure: the largest set F of the block where every square has an
// option that leaves it, moves only into F, to the finish or to later squares
// that finish for sure, and from which such moves reach the finish
// (graph search only; marks r.finite).
template <class T, class R>
void mark_sure(const std::vector<Moves<T>>& menu, const std::vector<int>& allowed,
               const std::vector<int>& block, R& r) {
    const int n = menu.front().length;
    std::vector<char> in(static_cast<std::size_t>(n) + 1, 0), reach(static_cast<std::size_t>(n) + 1, 0);
    for (int s : block) in[s] = 1;
    const std::vector<char> block_of = in;
    auto exit_ok = [&](int d) { return d == n || (!block_of[d] && r.finite[d]); };
    for (bool changed = true; changed;) {
        auto usable = [&](const Moves<T>& m, int s) {
            if (!(m.leave[s] > 0)) return false;
            for (auto q = m.start[s]; q < m.start[s + 1]; ++q)
                if (!exit_ok(m.dest[q]) && !in[m.dest[q]]) return false;
            return true;
        };
        std::fill(reach.begin(), reach.end(), 0);
        for (bool grew = true; grew;) {
            grew = false;
            for (int s : block) {
                if (!in[s] || reach[s]) continue;
                for (int i : allowed) {
                    const Moves<T>& m = menu[i];
                    if (!usable(m, s)) continue;
                    bool hits = false;
                    for (auto q = m.start[s]; q < m.start[s + 1] && !hits; ++q)
                        hits = exit_ok(m.dest[q]) || reach[m.dest[q]];
                    if (hits) {
                        reach[s] = 1;
                        grew = true;
                        break;
                    }
                }
            }
        }
        changed = false;
        for (int s : block)
            if (in[s] && !reach[s]) in[s] = 0, changed = true;
    }
    for (int s : block) r.finite[s] = in[s];
}

// Values of fixed choices on one block of squares: x(s) = base + sum_d P(s, d)
// x(d), the squares outside the block (and the finish, x[n]) known, by a
// dense LU in long double (blocks with loops are small: under bounce the last
// max-move squares). option[i] < 0 for the i-th square of the block: x = 0
// there (a choice that never leaves it). Policy iteration (Howard, 1960,
// Dynamic Programming and Markov Processes) evaluates its policies so; the
// sweeps that follow and the residual proof do not depend on its accuracy.
void evaluate_block(const std::vector<Moves<long double>>& menu, const std::vector<int>& block,
                    const std::vector<int>& option, long double base, std::vector<long double>& x) {
    const int m = static_cast<int>(block.size());
    const int n = menu.front().length;
    std::vector<int> at(static_cast<std::size_t>(n) + 1, -1);
    for (int i = 0; i < m; ++i) at[block[i]] = i;
    Eigen::Matrix<long double, Eigen::Dynamic, Eigen::Dynamic> a =
        Eigen::Matrix<long double, Eigen::Dynamic, Eigen::Dynamic>::Zero(m, m);
    Eigen::Matrix<long double, Eigen::Dynamic, 1> rhs =
        Eigen::Matrix<long double, Eigen::Dynamic, 1>::Zero(m);
    for (int i = 0; i < m; ++i) {
        const int s = block[i];
        if (option[i] < 0) {
            a(i, i) = 1;
            continue;
        }
        const Moves<long double>& mv = menu[option[i]];
        a(i, i) = mv.leave[s];
        rhs(i) = base;
        for (auto q = mv.start[s]; q < mv.start[s + 1]; ++q) {
            const int d = mv.dest[q];
            if (at[d] >= 0)
                a(i, at[d]) -= mv.p[q];
            else
                rhs(i) += mv.p[q] * x[d];
        }
    }
    const Eigen::Matrix<long double, Eigen::Dynamic, 1> v = a.partialPivLu().solve(rhs);
    for (int i = 0; i < m; ++i)
        if (std::isfinite(v(i))) x[block[i]] = std::max(0.0L, v(i));
}

// Square by square, each block after the blocks it moves to (policy/blocks.hpp).
// Where pieces never move backward every destination of a square other than
// itself lies beyond it: each square's value needs only later squares and its
// own self-loop, solved in closed form (x = r + s x, x = r / (1 - s)). A
// block with loops is swept until nothing moves (Gauss-Seidel from 0, which
// rises to the least fixed point); its proof is in solve_alone.
template <class T>
AloneT<T> solve(const std::vector<Moves<T>>& menu, const std::vector<int>& allowed, const T& tol,
                const SquareBlocks& blocks) {
    const int n = menu.front().length;
    AloneT<T> r;
    r.h.assign(n + 1, T(0));
    r.e.assign(n + 1, T(0));
    r.finite.assign(n + 1, 0);
    r.h[n] = 1;
    r.finite[n] = 1;
    r.surest.assign(n, Choice{});
    r.fastest.assign(n, Choice{});
    const int k = static_cast<int>(allowed.size());
    std::vector<T> hi(k), ei(k);
    std::vector<char> fi(k);
    auto visit = [&](int s) -> long double {
        const T old_h = r.h[s], old_e = r.e[s];
        for (int x = 0; x < k; ++x) {
            const Moves<T>& m = menu[allowed[x]];
            T sum_h(0), sum_e(0);
            bool fin = m.leave[s] > 0;
            for (auto q = m.start[s]; q < m.start[s + 1]; ++q) {
                const int d = m.dest[q];
                sum_h += m.p[q] * r.h[d];
                if (!r.finite[d])
                    fin = false;
                else
                    sum_e += m.p[q] * r.e[d];
            }
            // An option that never leaves the square never finishes from it.
            hi[x] = m.leave[s] > 0 ? T(sum_h / m.leave[s]) : T(0);
            fi[x] = fin;
            ei[x] = fin ? T((1 + sum_e) / m.leave[s]) : T(0);
        }
        int best = 0;
        for (int x = 1; x < k; ++x)
            if (hi[x] > hi[best]) best = x;
        r.h[s] = hi[best];
        Choice cs{allowed[0], 0};
        bool chosen = false;
        for (int x = 0; x < k; ++x)
            if (within(hi[x], hi[best], tol) || hi[x] == hi[best]) {
                if (!chosen) cs.option = allowed[x], chosen = true;
                cs.as_good |= 1u << allowed[x];
            }
        r.surest[s] = cs;
        int fast = -1;
        for (int x = 0; x < k; ++x)
            if (fi[x] && (fast < 0 || ei[x] < ei[fast])) fast = x;
        Choice cf{-1, 0};
        if (fast >= 0) {
            r.e[s] = ei[fast];
            r.finite[s] = 1;
            for (int x = 0; x < k; ++x)
                if (fi[x] && (ei[x] == ei[fast] || within(ei[x], ei[fast], T(tol * ei[fast])))) {
                    if (cf.option < 0) cf.option = allowed[x];
                    cf.as_good |= 1u << allowed[x];
                }
        }
        r.fastest[s] = cf;
        return std::max(policy_detail::gap(r.h[s], old_h),
                        policy_detail::gap(r.e[s], old_e) / (1 + policy_detail::magnitude(r.e[s])));
    };
    for (int b = 0; b < blocks.count(); ++b) {
        const std::vector<int> block(blocks.squares.begin() + blocks.start[b],
                                     blocks.squares.begin() + blocks.start[b + 1]);
        if (block.size() == 1) {
            visit(block[0]);
            continue;
        }
        mark_sure(menu, allowed, block, r);
        if constexpr (std::is_same_v<T, long double>) {
            // Policy iteration first: heavy options (5d12 waits about 250,000
            // rounds near the finish) would need millions of sweeps.
            std::vector<int> oh(block.size()), oe(block.size()), last_h, last_e;
            for (int it = 0; it < 50; ++it) {
                for (int s : block) visit(s);
                for (std::size_t i = 0; i < block.size(); ++i) {
                    const int s = block[i];
                    oh[i] = menu[r.surest[s].option].leave[s] > 0 ? r.surest[s].option : -1;
                    oe[i] = r.finite[s] ? r.fastest[s].option : -1;
                }
                if (oh == last_h && oe == last_e) break;
                evaluate_block(menu, block, oh, 0, r.h);
                evaluate_block(menu, block, oe, 1, r.e);
                last_h = oh;
                last_e = oe;
            }
        }
        long double best = INFINITY;
        for (int sweep = 0, stale = 0; sweep < 1000000 && stale < 64; ++sweep) {
            long double moved = 0;
            for (int s : block) moved = std::max(moved, visit(s));
            if (moved <= 8 * std::numeric_limits<long double>::epsilon()) break;
            if (moved < best)
                best = moved, stale = 0;
            else
                ++stale;
        }
    }
    return r;
}

AloneValues values_of(const AloneT<long double>& t, int n) {
    AloneValues v;
    v.p_finish.assign(t.h.begin(), t.h.begin() + n);
    v.rounds.resize(n);
    for (int s = 0; s < n; ++s)
        v.rounds[s] = t.finite[s] ? t.e[s] : std::numeric_limits<long double>::infinity();
    return v;
}

// A proven bound w on the rounds a piece can still spend inside its block of
// squares whatever it chooses, for the squares of blocks with loops (options
// that never leave a square count as ending there: they finish nothing; 0 on
// other squares).
// Throws LimitError when no finite bound is found (policy/loops.hpp).
std::vector<long double> rounds_alone(const std::vector<Moves<long double>>& menu, const SquareBlocks& blocks,
                                      long double rel) {
    const int n = menu.front().length;
    // `cur` holds the block being solved; other squares read 0, so w counts
    // the rounds spent inside the block (what its error needs), and is
    // scaled by 1 + eta (plus eta) and checked once the block is done.
    std::vector<long double> w(static_cast<std::size_t>(n) + 1, 0.0L), cur = w;
    auto phi = [&](int s, const std::vector<long double>& x, bool solve) {
        long double most = 0;
        for (const auto& m : menu) {
            if (!(m.leave[s] > 0)) continue;
            long double sum = 1;
            for (auto q = m.start[s]; q < m.start[s + 1]; ++q) sum += m.p[q] * x[m.dest[q]];
            most = std::max(most, solve ? sum / m.leave[s] : sum + m.stay[s] * x[s]);
        }
        return most;
    };
    for (int b = 0; b < blocks.count(); ++b) {
        if (blocks.single(b)) continue;
        const std::vector<int> block(blocks.squares.begin() + blocks.start[b],
                                     blocks.squares.begin() + blocks.start[b + 1]);
        // Policy iteration first (see solve), then sweeps to settle.
        std::vector<int> choice(block.size()), last;
        for (int it = 0; it < 50; ++it) {
            for (std::size_t i = 0; i < block.size(); ++i) {
                const int s = block[i];
                choice[i] = -1;
                long double most = 0;
                for (std::size_t o = 0; o < menu.size(); ++o) {
                    const auto& m = menu[o];
                    if (!(m.leave[s] > 0)) continue;
                    long double sum = 1;
                    for (auto q = m.start[s]; q < m.start[s + 1]; ++q) sum += m.p[q] * cur[m.dest[q]];
                    if (choice[i] < 0 || sum / m.leave[s] > most)
                        most = sum / m.leave[s], choice[i] = static_cast<int>(o);
                }
            }
            if (choice == last) break;
            evaluate_block(menu, block, choice, 1, cur);
            for (int s : block)
                if (!std::isfinite(cur[s]) || cur[s] > 1e15L) policy_detail::refuse_unbounded();
            last = choice;
        }
        long double best = INFINITY;
        for (int sweep = 0, stale = 0; sweep < 1000000 && stale < 64; ++sweep) {
            long double moved = 0;
            for (int s : block) {
                const long double x = phi(s, cur, true);
                moved = std::max(moved, std::fabs(x - cur[s]) / std::max(1.0L, x));
                cur[s] = x;
            }
            if (!std::isfinite(moved) || cur[block[0]] > 1e15L) policy_detail::refuse_unbounded();
            if (moved <= 8 * std::numeric_limits<long double>::epsilon()) break;
            if (moved < best)
                best = moved, stale = 0;
            else
                ++stale;
        }
        const std::vector<long double> found = cur;
        bool ok = false;
        for (long double eta = 1e-9L; eta < 1 && !ok; eta *= 64) {
            for (int s : block) cur[s] = found[s] * (1 + eta) + eta;
            ok = true;
            for (int s : block) ok = ok && phi(s, cur, false) * (1 + rel) <= cur[s];
        }
        if (!ok) policy_detail::refuse_unbounded();
        for (int s : block) w[s] = cur[s], cur[s] = 0;
    }
    return w;
}

// The proven errors (P(finish), expected rounds) of a solution on a board
// with loops: the residual of one round at every square of a block with
// loops, times the block's w, over a chain of at most `blocks` blocks.
std::pair<long double, long double> alone_error(const std::vector<Moves<long double>>& menu,
                                                const std::vector<int>& allowed, const AloneT<long double>& r,
                                                const SquareBlocks& blocks, const std::vector<long double>& w,
                                                long double rel) {
    policy_detail::ErrorTally th(blocks.count(), 1, 2 * rel), te(blocks.count(), 1, 2 * rel);
    for (int b = 0; b < blocks.count(); ++b) {
        if (blocks.single(b)) continue;
        for (int i = blocks.start[b]; i < blocks.start[b + 1]; ++i) {
            const int s = blocks.squares[i];
            long double ph = 0, pe = INFINITY;
            for (int o : allowed) {
                const auto& m = menu[o];
                if (!(m.leave[s] > 0)) continue;  // never leaves: finishes nothing (0)
                long double sh = 0, se = 1;
                bool fin = true;
                for (auto q = m.start[s]; q < m.start[s + 1]; ++q) {
                    sh += m.p[q] * r.h[m.dest[q]];
                    if (!r.finite[m.dest[q]])
                        fin = false;
                    else
                        se += m.p[q] * r.e[m.dest[q]];
                }
                ph = std::max(ph, sh + m.stay[s] * r.h[s]);
                if (fin) pe = std::min(pe, se + m.stay[s] * r.e[s]);
            }
            th.add(b, 0, std::fabs(ph - r.h[s]) + rel, w[s]);
            if (r.finite[s]) te.add(b, 0, std::fabs(pe - r.e[s]) + rel * (1 + r.e[s]), w[s]);
        }
    }
    return {th.total(), te.total()};
}

}  // namespace

AlonePolicy solve_alone(const std::vector<Chain>& menu, bool exact) {
    if (menu.empty() || static_cast<int>(menu.size()) > max_menu_options)
        throw InputError("a menu holds 1 to " + std::to_string(max_menu_options) + " options");
    if (exact)
        if (auto why = exact_policy_refusal(menu.front()); !why.empty()) throw LimitError(why);
    const int n = menu.front().length;
    int widest = 0;
    for (const auto& c : menu) widest = std::max(widest, c.max_move);
    AlonePolicy out;
    out.length = n;
    // Each value is a weighted mean of later values (weights summing to one
    // after the division) or a sum of positive terms: the rounding of one
    // square is at most gamma(widest + 8), and it adds up along the n squares
    // a value can depend on (docs/policy.md).
    out.bound = static_cast<long double>(n + 1) * gamma_ld(widest + 8);
    out.relative_bound = out.bound;
    const long double tol = 2 * out.bound;
    auto menu_f = make_menu<long double>(menu);
    std::vector<int> all(menu.size());
    for (std::size_t i = 0; i < menu.size(); ++i) all[i] = static_cast<int>(i);
    const SquareBlocks blocks = square_blocks(menu);
    const bool loops = blocks.count() < n;
    std::vector<long double> w;
    const long double rel = policy_detail::step_rounding(widest + 8);
    if (loops) {
        w = rounds_alone(menu_f, blocks, rel);
        out.iterated = true;
    }
    // On a board with loops the bounds are the largest proven errors of the
    // adaptive and every fixed programme; E >= 1, so an absolute error of the
    // rounds is also a relative one.
    auto prove = [&](const std::vector<int>& allowed, const AloneT<long double>& r) {
        if (!loops) return;
        const auto [eh, ee] = alone_error(menu_f, allowed, r, blocks, w, rel);
        out.bound = std::max(out.bound, eh);
        out.relative_bound = std::max(out.relative_bound, ee);
    };
    AloneT<long double> best = solve(menu_f, all, tol, blocks);
    prove(all, best);
    out.fastest = best.fastest;
    out.surest = best.surest;
    out.best = values_of(best, n);
    for (std::size_t i = 0; i < menu.size(); ++i) {
        AloneT<long double> f = solve(menu_f, {static_cast<int>(i)}, tol, blocks);
        prove({static_cast<int>(i)}, f);
        out.fixed.push_back(values_of(f, n));
    }
    if (exact) {
        auto menu_q = make_menu<mpq_class>(menu);
        AloneT<mpq_class> q = solve(menu_q, all, mpq_class(0), blocks);
        // The exact programme decides ties exactly: its choices replace the rounded ones.
        out.fastest = q.fastest;
        out.surest = q.surest;
        out.exact = true;
        out.exact_p_finish = q.h[0];
        if (q.finite[0]) out.exact_rounds = q.e[0];
        for (std::size_t i = 0; i < menu.size(); ++i) {
            AloneT<mpq_class> f = solve(menu_q, {static_cast<int>(i)}, mpq_class(0), blocks);
            out.exact_fixed_p_finish.push_back(f.h[0]);
            out.exact_fixed_rounds.push_back(f.finite[0] ? std::optional<mpq_class>(f.e[0]) : std::nullopt);
        }
    }
    return out;
}

}  // namespace overshoot
