#include "certify/modular.hpp"

#include <gmpxx.h>

#include <vector>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "race/outcome.hpp"

namespace overshoot {

namespace {

using u64 = std::uint64_t;
__extension__ typedef unsigned __int128 u128;

u64 mulmod(u64 x, u64 y, u64 p) { return static_cast<u64>(static_cast<u128>(x) * y % p); }

u64 inverse(u64 x, u64 p) {  // extended Euclid; x != 0 mod p
    __extension__ typedef __int128 i128;
    i128 t = 0, nt = 1, r = p, nr = x % p;
    while (nr != 0) {
        i128 q = r / nr;
        i128 tmp = t - q * nt;
        t = nt;
        nt = tmp;
        tmp = r - q * nr;
        r = nr;
        nr = tmp;
    }
    if (t < 0) t += p;
    return static_cast<u64>(t);
}

// Sums of up to 32 products below p^2 < 2^122 fit 128 bits; reduce before more.
struct ModularSum {
    u128 v = 0;
    int n = 0;
    void add(u64 x, u64 y, u64 p) {
        v += static_cast<u128>(x) * y;
        if (++n == 32) {
            v %= p;
            n = 0;
        }
    }
    u64 get(u64 p) const { return static_cast<u64>(v % p); }
};

std::optional<std::array<u64, 3>> forward(const Chain& A, const Chain& B, bool a_first, u64 p) {
    const int n = A.length;
    const std::size_t cells = static_cast<std::size_t>(n) * n;
    limits::check_memory(cells * 3 * sizeof(u64), "the modular check of this duel");
    std::vector<u64> x(cells * 3, 0);
    std::vector<u64> wa(A.weight.size()), wb(B.weight.size());
    for (std::size_t i = 0; i < wa.size(); ++i) wa[i] = A.weight[i] % p;
    for (std::size_t i = 0; i < wb.size(); ++i) wb[i] = B.weight[i] % p;
    const u64 full = mulmod(A.denominator % p, B.denominator % p, p);
    for (int a = n - 1; a >= 0; --a) {
        if (!A.resting[a]) continue;
        for (int b = n - 1; b >= 0; --b) {
            if (!B.resting[b]) continue;
            const u128 q_true = static_cast<u128>(A.denominator) * B.denominator -
                                static_cast<u128>(A.stay_weight[a]) * B.stay_weight[b];
            if (q_true == 0) continue;  // neither piece ever moves: all zero
            ModularSum acc[3];
            for (auto ka = A.row_start[a]; ka < A.row_start[a + 1]; ++ka) {
                const int da = A.dest[ka];
                if (da == n) {
                    // A finishes this round: B's move decides win or tie.
                    for (auto kb = B.row_start[b]; kb < B.row_start[b + 1]; ++kb) {
                        const bool tie = !a_first && B.dest[kb] == n;
                        acc[tie ? 2 : 0].add(wa[ka], wb[kb], p);
                    }
                    continue;
                }
                ModularSum inner[3];
                for (auto kb = B.row_start[b]; kb < B.row_start[b + 1]; ++kb) {
                    const int db = B.dest[kb];
                    if (db == n) {
                        inner[1].add(wb[kb], 1, p);
                        continue;
                    }
                    if (da == a && db == b) continue;  // the self-loop, moved to the left side
                    const u64* v = &x[(static_cast<std::size_t>(da) * n + db) * 3];
                    for (int c = 0; c < 3; ++c) inner[c].add(wb[kb], v[c], p);
                }
                for (int c = 0; c < 3; ++c) acc[c].add(wa[ka], inner[c].get(p), p);
            }
            const u64 self = mulmod(A.stay_weight[a] % p, B.stay_weight[b] % p, p);
            const u64 q = (full + p - self) % p;
            if (q == 0) return std::nullopt;
            const u64 inv = inverse(q, p);
            u64* out = &x[(static_cast<std::size_t>(a) * n + b) * 3];
            for (int c = 0; c < 3; ++c) out[c] = mulmod(acc[c].get(p), inv, p);
        }
    }
    const std::size_t at0 = (static_cast<std::size_t>(A.start) * n + B.start) * 3;
    return std::array<u64, 3>{x[at0], x[at0 + 1], x[at0 + 2]};
}

// Gaussian elimination mod p with row pivoting on the product chain.
std::optional<std::array<u64, 3>> general(const Chain& A, const Chain& B, bool a_first, u64 p) {
    const int n = A.length;
    std::vector<int> idx(static_cast<std::size_t>(n) * n, -1);
    int m = 0;
    for (int a = 0; a < n; ++a)
        for (int b = 0; b < n; ++b)
            if (A.resting[a] && B.resting[b] && !(A.stuck[a] && B.stuck[b])) idx[static_cast<std::size_t>(a) * n + b] = m++;
    const int r0 = idx[static_cast<std::size_t>(A.start) * n + B.start];
    if (r0 < 0) return std::array<u64, 3>{0, 0, 0};
    limits::check_memory(static_cast<std::uint64_t>(m) * (m + 3) * 8, "the modular check of this duel");
    const int cols = m + 3;
    std::vector<u64> mat(static_cast<std::size_t>(m) * cols, 0);
    auto at = [&](int i, int j) -> u64& { return mat[static_cast<std::size_t>(i) * cols + j]; };
    const u64 full = mulmod(A.denominator % p, B.denominator % p, p);
    for (int a = 0; a < n; ++a)
        for (int b = 0; b < n; ++b) {
            const int i = idx[static_cast<std::size_t>(a) * n + b];
            if (i < 0) continue;
            at(i, i) = (at(i, i) + full) % p;
            for (auto ka = A.row_start[a]; ka < A.row_start[a + 1]; ++ka)
                for (auto kb = B.row_start[b]; kb < B.row_start[b + 1]; ++kb) {
                    const int da = A.dest[ka], db = B.dest[kb];
                    const u64 w = mulmod(A.weight[ka] % p, B.weight[kb] % p, p);
                    int col;
                    if (da == n) col = (a_first || db != n) ? m : m + 2;
                    else if (db == n) col = m + 1;
                    else {
                        const int j = idx[static_cast<std::size_t>(da) * n + db];
                        if (j < 0) continue;
                        at(i, j) = (at(i, j) + p - w) % p;
                        continue;
                    }
                    at(i, col) = (at(i, col) + w) % p;
                }
        }
    for (int c = 0; c < m; ++c) {
        int piv = -1;
        for (int r = c; r < m; ++r)
            if (at(r, c) != 0) {
                piv = r;
                break;
            }
        if (piv < 0) return std::nullopt;
        if (piv != c)
            for (int j = 0; j < cols; ++j) std::swap(at(piv, j), at(c, j));
        const u64 inv = inverse(at(c, c), p);
        for (int j = c; j < cols; ++j) at(c, j) = mulmod(at(c, j), inv, p);
        for (int r = 0; r < m; ++r) {
            if (r == c || at(r, c) == 0) continue;
            const u64 f = at(r, c);
            for (int j = c; j < cols; ++j) at(r, j) = (at(r, j) + p - mulmod(f, at(c, j), p)) % p;
        }
    }
    return std::array<u64, 3>{at(r0, m), at(r0, m + 1), at(r0, m + 2)};
}

std::optional<std::array<u64, 3>> ordered(const Chain& a, const Chain& b, bool a_first, u64 p) {
    return a.forward_only ? forward(a, b, a_first, p) : general(a, b, a_first, p);
}

}  // namespace

std::optional<std::array<std::uint64_t, 3>> modular_duel(const Chain& a, const Chain& b, Order order, u64 p) {
    if (p >= (u64{1} << 61)) throw InternalError("modular_duel: the prime must be below 2^61");
    using Outcome = std::optional<std::array<u64, 3>>;  // win, loss, tie modulo p; empty when p divides a pivot
    return by_turn_order(
        order, [&](bool swapped, bool alternating) { return swapped ? ordered(b, a, alternating, p) : ordered(a, b, alternating, p); },
        [](Outcome r) {
            if (r) std::swap((*r)[0], (*r)[1]);
            return r;
        },
        [&](const Outcome& x, const Outcome& y) -> Outcome {
            if (!x || !y) return std::nullopt;
            const u64 half = inverse(2, p);
            return std::array<u64, 3>{mulmod(((*x)[0] + (*y)[0]) % p, half, p), mulmod(((*x)[1] + (*y)[1]) % p, half, p), 0};
        });
}

std::uint64_t next_prime(std::uint64_t from) {
    mpz_class z(static_cast<unsigned long>(from - 1));
    mpz_nextprime(z.get_mpz_t(), z.get_mpz_t());
    return static_cast<u64>(z.get_ui());
}

}  // namespace overshoot
