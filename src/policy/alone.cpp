#include "policy/alone.hpp"

#include <cmath>
#include <limits>

#include "chain/series.hpp"
#include "core/error.hpp"
#include "policy/moves.hpp"

namespace overshoot {

std::string policy_refusal(const Chain& c) {
    if (c.forward_only) return {};
    return "optimal policies are computed by backward induction over squares, which needs a board where pieces "
           "never move backward; this board has the bounce rule or a backward jump";
}

namespace {

template <class T>
struct AloneT {
    std::vector<T> h, e;      // P(finish), expected rounds
    std::vector<char> finite;  // e is finite
    std::vector<Choice> surest, fastest;
};

bool within(const long double& x, const long double& y, const long double& tol) { return std::fabs(x - y) <= tol; }
bool within(const mpq_class& x, const mpq_class& y, const mpq_class&) { return x == y; }

// Backward induction: every destination of a square other than itself lies
// beyond it, so each square's value needs only later squares and its own
// self-loop, solved in closed form (x = r + s x, x = r / (1 - s)).
template <class T>
AloneT<T> solve(const std::vector<Moves<T>>& menu, const std::vector<int>& allowed, const T& tol) {
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
    for (int s = n - 1; s >= 0; --s) {
        for (int x = 0; x < k; ++x) {
            const Moves<T>& m = menu[allowed[x]];
            T sum_h(0), sum_e(0);
            bool fin = m.leave[s] > 0;
            for (auto q = m.start[s]; q < m.start[s + 1]; ++q) {
                const int d = m.dest[q];
                sum_h += m.p[q] * r.h[d];
                if (!r.finite[d]) fin = false;
                else sum_e += m.p[q] * r.e[d];
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
    }
    return r;
}

AloneValues values_of(const AloneT<long double>& t, int n) {
    AloneValues v;
    v.p_finish.assign(t.h.begin(), t.h.begin() + n);
    v.rounds.resize(n);
    for (int s = 0; s < n; ++s) v.rounds[s] = t.finite[s] ? t.e[s] : std::numeric_limits<long double>::infinity();
    return v;
}

}  // namespace

AlonePolicy solve_alone(const std::vector<Chain>& menu, bool exact) {
    if (menu.empty() || static_cast<int>(menu.size()) > max_menu_options)
        throw InputError("a menu holds 1 to " + std::to_string(max_menu_options) + " options");
    if (auto why = policy_refusal(menu.front()); !why.empty()) throw LimitError(why);
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
    AloneT<long double> best = solve(menu_f, all, tol);
    out.fastest = best.fastest;
    out.surest = best.surest;
    out.best = values_of(best, n);
    for (std::size_t i = 0; i < menu.size(); ++i)
        out.fixed.push_back(values_of(solve(menu_f, {static_cast<int>(i)}, tol), n));
    if (exact) {
        auto menu_q = make_menu<mpq_class>(menu);
        AloneT<mpq_class> q = solve(menu_q, all, mpq_class(0));
        // The exact programme decides ties exactly: its choices replace the rounded ones.
        out.fastest = q.fastest;
        out.surest = q.surest;
        out.exact = true;
        out.exact_p_finish = q.h[0];
        if (q.finite[0]) out.exact_rounds = q.e[0];
        for (std::size_t i = 0; i < menu.size(); ++i) {
            AloneT<mpq_class> f = solve(menu_q, {static_cast<int>(i)}, mpq_class(0));
            out.exact_fixed_p_finish.push_back(f.h[0]);
            out.exact_fixed_rounds.push_back(f.finite[0] ? std::optional<mpq_class>(f.e[0]) : std::nullopt);
        }
    }
    return out;
}

}  // namespace overshoot
