#pragma once
// The per-turn series of one piece: the distribution of its square after t
// turns, stepped one turn at a time over the squares that hold mass.
#include <cstdint>
#include <vector>

#include "chain/chain.hpp"

namespace overshoot {

class Series {
public:
    // With keep_stuck, mass on stuck squares stays on its square (and counts as
    // alive); otherwise it is set aside in stuck(), which is cheaper.
    explicit Series(const Chain& chain, int start = 0, bool keep_stuck = false);

    // Advances one turn; returns P(T = t) for the new t.
    long double step();

    int turn() const { return t_; }
    long double finished() const { return finished_; }  // P(T <= t)
    long double stuck() const { return stuck_; }        // mass on squares that never finish
    long double alive() const { return alive_; }        // mass that may still finish
    long double survival() const { return alive_ + stuck_; }  // P(T > t)
    // Mass still alive on squares below `square` (outside an end zone).
    long double alive_below(int square) const;
    // Rigorous bound on the accumulated rounding error of every mass above.
    long double rounding_bound() const { return rounding_; }
    // Work done so far (transitions applied), for choosing between methods.
    std::uint64_t work() const { return work_; }
    int low() const { return lo_; }
    int high() const { return hi_; }
    const std::vector<long double>& mass() const { return v_; }

private:
    const Chain* c_;
    std::vector<long double> v_, next_;
    int lo_, hi_;
    int t_ = 0;
    long double finished_ = 0, stuck_ = 0, alive_ = 1, rounding_ = 0, gamma_;
    bool keep_stuck_ = false;
    std::uint64_t work_ = 0;
};

// gamma_n = n u / (1 - n u) for long double's unit roundoff u (Higham, 2002).
long double gamma_ld(double n);

}  // namespace overshoot
