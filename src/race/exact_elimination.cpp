#include <array>
#include <vector>

#include "core/error.hpp"
#include "race/exact_methods.hpp"

namespace overshoot {

// ---------------------------------------------------------------------------
// Exact elimination of the product chain (small general boards): the integer
// system DA DB (I - M) x = r solved by fraction-free (Bareiss) elimination,
// which keeps every entry an integer and divides exactly; I - M is a
// nonsingular M-matrix, so no pivot vanishes.
std::array<mpq_class, 3> exact_elimination(const Chain& A, const Chain& B, bool a_first) {
    const int n = A.length;
    std::vector<int> idx(static_cast<std::size_t>(n) * n, -1);
    int count = 0;
    for (int a = 0; a < n; ++a)
        for (int b = 0; b < n; ++b)
            if (A.resting[a] && B.resting[b] && !(A.stuck[a] && B.stuck[b]))
                idx[static_cast<std::size_t>(a) * n + b] = count++;
    std::array<mpq_class, 3> out{0, 0, 0};
    const int i0 = idx[static_cast<std::size_t>(A.start) * n + B.start];
    if (i0 < 0) return out;
    const int cols = count + 3;
    std::vector<mpz_class> m(static_cast<std::size_t>(count) * cols);
    auto at = [&](int i, int j) -> mpz_class& { return m[static_cast<std::size_t>(i) * cols + j]; };
    const mpz_class full = mpz_class(static_cast<unsigned long>(A.denominator)) * static_cast<unsigned long>(B.denominator);
    for (int a = 0; a < n; ++a)
        for (int b = 0; b < n; ++b) {
            int i = idx[static_cast<std::size_t>(a) * n + b];
            if (i < 0) continue;
            at(i, i) += full;
            for (auto ka = A.row_start[a]; ka < A.row_start[a + 1]; ++ka) {
                int da = A.dest[ka];
                for (auto kb = B.row_start[b]; kb < B.row_start[b + 1]; ++kb) {
                    int dbq = B.dest[kb];
                    mpz_class w = mpz_class(static_cast<unsigned long>(A.weight[ka])) * static_cast<unsigned long>(B.weight[kb]);
                    if (da == n) {
                        if (a_first || dbq != n) at(i, count + 0) += w;
                        else at(i, count + 2) += w;
                    } else if (dbq == n) {
                        at(i, count + 1) += w;
                    } else {
                        int j = idx[static_cast<std::size_t>(da) * n + dbq];
                        if (j >= 0) at(i, j) -= w;
                    }
                }
            }
        }
    // Bareiss forward elimination on the augmented matrix.
    mpz_class prev = 1, t1;
    for (int p = 0; p < count; ++p) {
        if (at(p, p) == 0) throw InternalError("exact elimination: zero pivot");
        for (int i = p + 1; i < count; ++i) {
            for (int j = p + 1; j < cols; ++j) {
                t1 = at(i, j) * at(p, p);
                mpz_submul(t1.get_mpz_t(), at(i, p).get_mpz_t(), at(p, j).get_mpz_t());
                mpz_divexact(at(i, j).get_mpz_t(), t1.get_mpz_t(), prev.get_mpz_t());
            }
            at(i, p) = 0;
        }
        prev = at(p, p);
    }
    // Back substitution in rationals; only n^2 operations.
    std::vector<std::array<mpq_class, 3>> x(count);
    for (int i = count - 1; i >= 0; --i)
        for (int c = 0; c < 3; ++c) {
            mpq_class s(at(i, count + c));
            for (int j = i + 1; j < count; ++j)
                if (at(i, j) != 0) s -= mpq_class(at(i, j)) * x[j][c];
            s /= mpq_class(at(i, i));
            x[i][c] = s;
        }
    for (int c = 0; c < 3; ++c) out[c] = x[i0][c];
    return out;
}

}  // namespace overshoot
