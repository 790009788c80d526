#pragma once
// The per-turn series of one piece: the distribution of its square after t
// turns, stepped one turn at a time over the squares that hold mass.
#include <cstdint>
#include <vector>

#include "chain/chain.hpp"

namespace overshoot {

// Real is the working precision of the per-square masses (double or long
// double); running totals are kept in long double either way.
template <class Real>
class BasicSeries {
public:
    // Mass that lands on a stuck square is set aside in stuck(): it can never
    // finish, and its square does not matter.
    // start < 0: the chain's own start square (0 or its head start).
    explicit BasicSeries(const Chain& chain, int start = -1);
    // A series already at turn `turn`, with `mass[i]` on square `low + i`
    // (mass on stuck squares is set aside) and nothing finished; `error`
    // bounds the 1-norm distance of that start to the exact distribution and
    // is carried in rounding_bound().
    BasicSeries(const Chain& chain, const std::vector<Real>& mass, int low, int turn, long double error);

    // Advances one turn; returns P(T = t) for the new t.
    long double step();

    int turn() const { return t_; }
    long double finished() const { return finished_; }  // P(T <= t)
    long double stuck() const { return stuck_; }        // mass on squares that never finish
    long double alive() const { return alive_; }        // mass that may still finish
    long double survival() const { return alive_ + stuck_; }  // P(T > t)
    // Mass still alive on squares below `square` (outside an end zone).
    long double alive_below(int square) const;
    // Rigorous bound on the accumulated rounding error of every mass above,
    // including the tiny edge mass trimmed from the support.
    long double rounding_bound() const { return rounding_ + sum_error_; }
    long double dropped() const { return dropped_; }
    // Work done so far (transitions applied), for choosing between methods.
    std::uint64_t work() const { return work_; }
    int low() const { return lo_; }
    int high() const { return hi_; }
    const std::vector<Real>& mass() const { return v_; }

private:
    const Chain* c_;
    std::vector<Real> v_, next_;
    int lo_, hi_;
    int t_ = 0;
    long double finished_ = 0, stuck_ = 0, alive_ = 1, rounding_ = 0, gamma_, gamma_sum_;
    long double dropped_ = 0, sum_error_ = 0;
    Real trim_;  // mass below this at an edge of the support is dropped (and bounded)
    std::uint64_t work_ = 0;
};

using Series = BasicSeries<long double>;
using FastSeries = BasicSeries<double>;

// gamma_n = n u / (1 - n u) for long double's unit roundoff u (Higham, 2002).
long double gamma_ld(double n);
// The same for double.
long double gamma_d(double n);

}  // namespace overshoot
