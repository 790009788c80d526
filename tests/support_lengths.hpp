#pragma once
// Helpers shared by the tests of src/lengths: every pair of a list of options,
// one run of the all-lengths engine with a chosen method, and its check against
// the exact fractions (GMP, race/exact.cpp).
#include <gmpxx.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "lengths/lengths.hpp"
#include "race/exact.hpp"

namespace overshoot::testing {

inline std::vector<PairRequest> every_pair(std::size_t n) {
    std::vector<PairRequest> r;
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = i + 1; j < n; ++j) r.push_back({i, j});
    return r;
}

inline std::vector<PairLengths> run_lengths(const std::vector<Option>& o, Overshoot rule, Order order, int L,
                                            LengthMethod m) {
    LengthSettings s;
    s.method = m;
    s.threads = 2;
    return all_lengths(o, rule, order, L, every_pair(o.size()), s);
}

// Two methods' figures for one length agree within the sum of their bounds.
inline void require_within_bounds(const LengthOutcome& x, const LengthOutcome& y) {
    const double allowed = x.bound + y.bound;
    REQUIRE(std::fabs(x.p_a_wins - y.p_a_wins) <= allowed);
    REQUIRE(std::fabs(x.p_b_wins - y.p_b_wins) <= allowed);
    REQUIRE(std::fabs(x.p_tie - y.p_tie) <= allowed);
    REQUIRE(x.p_neither == y.p_neither);
}

// The figures of one pair at each length hold the exact duel inside their bound.
inline void require_exact_inside(const std::vector<Option>& o, Order order, const PairLengths& res,
                                 const std::vector<int>& lengths) {
    for (int len : lengths) {
        Board board = make_board(len, Overshoot::stay, {});
        ExactDuel e = exact_duel(build_chain(board, o[0]), build_chain(board, o[1]), order);
        const LengthOutcome& x = res.by_length[len];
        INFO(o[0].name << " vs " << o[1].name << " at " << len);
        const mpq_class bound(x.bound);
        REQUIRE(abs(mpq_class(x.p_a_wins) - e.p_a_wins) <= bound);
        REQUIRE(abs(mpq_class(x.p_b_wins) - e.p_b_wins) <= bound);
        if (order == Order::simultaneous) REQUIRE(abs(mpq_class(x.p_tie) - e.p_tie) <= bound);
    }
}

}  // namespace overshoot::testing
