#include "policy/matrix_game.hpp"

#include <algorithm>
#include <cmath>

#include "core/error.hpp"

namespace overshoot {

// The column player's programme after shifting every entry to at least 1:
//   maximise sum q  subject to  G q <= 1, q >= 0;
// its optimum is 1 / (value + shift), q / sum q is the column mix, and the row
// mix is read off the slacks' reduced costs (the dual). Bland's rule (smallest
// index enters, smallest basic index leaves among ties) keeps the degenerate
// pivots of games with ties from cycling (Bland, 1977, Mathematics of
// Operations Research 2:103-107).
MatrixGameSolution solve_matrix_game(int rows, int cols, const std::vector<long double>& payoff) {
    const long double lowest = *std::min_element(payoff.begin(), payoff.end());
    const long double shift = 1 - lowest;
    const int width = cols + rows + 1;  // q, slacks, right-hand side
    std::vector<long double> t(static_cast<std::size_t>(rows + 1) * width, 0.0L);
    auto at = [&](int r, int c) -> long double& { return t[static_cast<std::size_t>(r) * width + c]; };
    std::vector<int> basis(rows);
    for (int i = 0; i < rows; ++i) {
        for (int j = 0; j < cols; ++j) at(i, j) = payoff[static_cast<std::size_t>(i) * cols + j] + shift;
        at(i, cols + i) = 1;
        at(i, width - 1) = 1;
        basis[i] = cols + i;
    }
    for (int j = 0; j < cols; ++j) at(rows, j) = -1;
    constexpr long double eps = 1e-16L;
    for (int step = 0; step < 10000; ++step) {
        int enter = -1;
        for (int c = 0; c < cols + rows; ++c)
            if (at(rows, c) < -eps) {
                enter = c;
                break;
            }
        if (enter < 0) break;
        int leave = -1;
        long double best = 0;
        for (int r = 0; r < rows; ++r) {
            if (at(r, enter) <= eps) continue;
            const long double ratio = at(r, width - 1) / at(r, enter);
            if (leave < 0 || ratio < best || (ratio == best && basis[r] < basis[leave])) {
                leave = r;
                best = ratio;
            }
        }
        if (leave < 0) throw InternalError("matrix game: unbounded programme (cannot happen with positive entries)");
        const long double pivot = at(leave, enter);
        for (int c = 0; c < width; ++c) at(leave, c) /= pivot;
        for (int r = 0; r <= rows; ++r) {
            if (r == leave) continue;
            const long double f = at(r, enter);
            if (f == 0) continue;
            for (int c = 0; c < width; ++c) at(r, c) -= f * at(leave, c);
        }
        basis[leave] = enter;
    }
    MatrixGameSolution s;
    s.row_mix.assign(rows, 0.0L);
    s.col_mix.assign(cols, 0.0L);
    long double total_q = 0, total_p = 0;
    for (int r = 0; r < rows; ++r)
        if (basis[r] < cols) s.col_mix[basis[r]] = std::max(0.0L, at(r, width - 1));
    for (int i = 0; i < rows; ++i) s.row_mix[i] = std::max(0.0L, at(rows, cols + i));
    for (long double q : s.col_mix) total_q += q;
    for (long double p : s.row_mix) total_p += p;
    if (!(total_q > 0) || !(total_p > 0)) throw InternalError("matrix game: the simplex ended without a solution");
    for (long double& q : s.col_mix) q /= total_q;
    for (long double& p : s.row_mix) p /= total_p;
    s.value = 1 / at(rows, width - 1) - shift;
    return s;
}

}  // namespace overshoot
