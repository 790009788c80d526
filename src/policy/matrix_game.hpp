#pragma once
// A small zero-sum matrix game solved by the simplex method in long double:
// the row player maximises. Used for the state games of the simultaneous
// stochastic game, whose matrices are at most menu by menu.
#include <vector>

namespace overshoot {

struct MatrixGameSolution {
    long double value = 0;
    std::vector<long double> row_mix, col_mix;  // optimal mixed strategies
};

// payoff[i * cols + j]: what the row player gets when row i meets column j.
MatrixGameSolution solve_matrix_game(int rows, int cols, const std::vector<long double>& payoff);

}  // namespace overshoot
