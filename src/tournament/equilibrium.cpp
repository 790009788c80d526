#include "tournament/equilibrium.hpp"

#include <glpk.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <memory>

#include "core/error.hpp"

namespace overshoot {

namespace {
// GLPK prints by default; the library never prints.
int silent(void*, const char*) { return 1; }
}  // namespace

// maximise v  subject to  sum_i x_i payoff[i][j] >= v  for every column j,
//                         sum_i x_i = 1,  x >= 0,  v free.
// The primal simplex from GLPK's standard basis, with presolve off and fixed
// parameters, is a deterministic sequence of pivots: the same input gives the
// same mix. Weights below 1e-12 are rounding and are set to 0.
EquilibriumMix equilibrium_mix(std::size_t n, const std::vector<double>& payoff) {
    EquilibriumMix mix;
    mix.weight.assign(n, 0.0);
    mix.guaranteed.assign(n, 0.0);
    if (n == 0) return mix;
    if (n == 1) {
        mix.weight[0] = 1;
        mix.support = {0};
        return mix;
    }
    // A strict Condorcet winner by margin (w beats every other option by a
    // positive margin) is the one optimal mix: weight anywhere else loses
    // against w, so the linear programme would return pure w with value 0.
    // A sweep asks for a mix per length; this case needs no programme.
    for (std::size_t w = 0; w < n; ++w) {
        bool winner = true;
        for (std::size_t j = 0; j < n && winner; ++j) winner = j == w || payoff[w * n + j] > 0;
        if (!winner) continue;
        mix.weight[w] = 1;
        mix.value = 0;
        for (std::size_t j = 0; j < n; ++j)
            if (j != w) mix.guaranteed[j] = payoff[w * n + j];
        mix.support = {w};
        return mix;
    }
    glp_term_hook(silent, nullptr);
    std::unique_ptr<glp_prob, void (*)(glp_prob*)> lp(glp_create_prob(), glp_delete_prob);
    glp_set_obj_dir(lp.get(), GLP_MAX);
    const int cols = static_cast<int>(n) + 1;  // x_1..x_n, then v
    const int rows = static_cast<int>(n) + 1;  // one per pure option, then the sum
    glp_add_cols(lp.get(), cols);
    for (int i = 1; i <= static_cast<int>(n); ++i) glp_set_col_bnds(lp.get(), i, GLP_LO, 0.0, 0.0);
    glp_set_col_bnds(lp.get(), cols, GLP_FR, 0.0, 0.0);
    glp_set_obj_coef(lp.get(), cols, 1.0);
    glp_add_rows(lp.get(), rows);
    std::vector<int> ia{0}, ja{0};
    std::vector<double> ar{0.0};
    for (std::size_t j = 0; j < n; ++j) {
        const int r = static_cast<int>(j) + 1;
        glp_set_row_bnds(lp.get(), r, GLP_LO, 0.0, 0.0);
        for (std::size_t i = 0; i < n; ++i) {
            double a = payoff[i * n + j];
            if (i == j || a == 0.0) continue;
            ia.push_back(r);
            ja.push_back(static_cast<int>(i) + 1);
            ar.push_back(a);
        }
        ia.push_back(r);
        ja.push_back(cols);
        ar.push_back(-1.0);
    }
    glp_set_row_bnds(lp.get(), rows, GLP_FX, 1.0, 1.0);
    for (int i = 1; i <= static_cast<int>(n); ++i) {
        ia.push_back(rows);
        ja.push_back(i);
        ar.push_back(1.0);
    }
    glp_load_matrix(lp.get(), static_cast<int>(ia.size()) - 1, ia.data(), ja.data(), ar.data());
    glp_smcp parm;
    glp_init_smcp(&parm);
    parm.msg_lev = GLP_MSG_OFF;
    parm.presolve = GLP_OFF;
    int rc = glp_simplex(lp.get(), &parm);
    glp_term_hook(nullptr, nullptr);
    if (rc != 0 || glp_get_status(lp.get()) != GLP_OPT)
        throw InternalError("the equilibrium linear programme did not reach an optimum (GLPK status " +
                            std::to_string(glp_get_status(lp.get())) + ")");
    double total = 0;
    for (std::size_t i = 0; i < n; ++i) {
        double x = glp_get_col_prim(lp.get(), static_cast<int>(i) + 1);
        if (!(x > 1e-12)) x = 0;
        mix.weight[i] = x;
        total += x;
    }
    if (!(total > 0)) throw InternalError("the equilibrium linear programme returned an empty mix");
    for (double& x : mix.weight) x /= total;
    mix.value = glp_get_obj_val(lp.get());
    for (std::size_t j = 0; j < n; ++j) {
        double g = 0;
        for (std::size_t i = 0; i < n; ++i)
            if (i != j) g += mix.weight[i] * payoff[i * n + j];
        mix.guaranteed[j] = g;
    }
    for (std::size_t i = 0; i < n; ++i)
        if (mix.weight[i] > 1e-9) mix.support.push_back(i);
    return mix;
}

}  // namespace overshoot
