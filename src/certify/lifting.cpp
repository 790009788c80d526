// Exact duels by p-adic lifting over the live product chain (lifting.hpp).
// The integer system is A y = b with A = full I - W (W the round's integer
// weights between live states, full = DA DB) and b the weights of one
// outcome; its solution is the outcome's probability from every state.
#include "certify/lifting.hpp"

#include <fmt/format.h>
#include <gmpxx.h>

#include "certify/modular.hpp"
#include "certify/residual.hpp"
#include "core/error.hpp"

namespace overshoot {

namespace {

using u64 = std::uint64_t;

// Dense LU modulo a prime below 2^31 (products fit 64 bits), rows permuted.
struct ModLu {
    std::size_t m = 0;
    u64 p = 0;
    std::vector<u64> a;  // L (unit diagonal, below) and U (on and above), row-major
    std::vector<std::size_t> perm;
    std::vector<u64> inv_diag;

    u64& at(std::size_t i, std::size_t j) { return a[i * m + j]; }
    u64 at(std::size_t i, std::size_t j) const { return a[i * m + j]; }

    static u64 inverse(u64 x, u64 p) {  // Fermat: x^(p-2)
        u64 r = 1, e = p - 2;
        for (x %= p; e; e >>= 1, x = x * x % p)
            if (e & 1) r = r * x % p;
        return r;
    }

    bool factor() {
        inv_diag.clear();
        perm.resize(m);
        for (std::size_t i = 0; i < m; ++i) perm[i] = i;
        for (std::size_t c = 0; c < m; ++c) {
            std::size_t piv = c;
            while (piv < m && at(piv, c) == 0) ++piv;
            if (piv == m) return false;  // singular modulo p
            if (piv != c) {
                std::swap_ranges(a.begin() + static_cast<std::ptrdiff_t>(piv * m),
                                 a.begin() + static_cast<std::ptrdiff_t>((piv + 1) * m),
                                 a.begin() + static_cast<std::ptrdiff_t>(c * m));
                std::swap(perm[piv], perm[c]);
            }
            const u64 inv = inverse(at(c, c), p);
            inv_diag.push_back(inv);
            for (std::size_t r = c + 1; r < m; ++r) {
                if (at(r, c) == 0) continue;
                const u64 f = at(r, c) * inv % p;
                at(r, c) = f;
                u64* row = &a[r * m];
                const u64* top = &a[c * m];
                for (std::size_t j = c + 1; j < m; ++j) row[j] = (row[j] + (p - f) * top[j]) % p;
            }
        }
        return true;
    }

    // v := A^{-1} v modulo p.
    void solve(std::vector<u64>& v) const {
        std::vector<u64> x(m);
        for (std::size_t i = 0; i < m; ++i) x[i] = v[perm[i]];
        for (std::size_t i = 0; i < m; ++i)
            for (std::size_t j = 0; j < i; ++j) x[i] = (x[i] + (p - at(i, j)) * x[j]) % p;
        for (std::size_t i = m; i-- > 0;) {
            for (std::size_t j = i + 1; j < m; ++j) x[i] = (x[i] + (p - at(i, j)) * x[j]) % p;
            x[i] = x[i] * inv_diag[i] % p;
        }
        v.swap(x);
    }
};

mpz_class big(uint128 v) {
    return (mpz_class(static_cast<unsigned long>(static_cast<u64>(v >> 64))) << 64) +
           mpz_class(static_cast<unsigned long>(static_cast<u64>(v)));
}

// n/d with |n|, d <= sqrt(M / 2) and n = d x (mod M), if one exists.
std::optional<mpq_class> reconstruct(const mpz_class& x, const mpz_class& M) {
    mpz_class bound = sqrt(M / 2);
    mpz_class r0 = M, r1 = x, t0 = 0, t1 = 1;
    while (r1 > bound) {
        mpz_class q = r0 / r1;
        mpz_class r2 = r0 - q * r1, t2 = t0 - q * t1;
        r0.swap(r1);
        r1.swap(r2);
        t0.swap(t1);
        t1.swap(t2);
    }
    if (t1 == 0 || abs(t1) > bound) return std::nullopt;
    mpq_class q(r1, t1);
    q.canonicalize();
    return q;
}

struct Part {
    std::array<mpq_class, 3> start;  // A wins, B wins, tie from the start state
};

// Lifts all outcomes of one part at once; nullopt (with `why`) when it does not fit.
std::optional<Part> lift_part(const ProductChain& c, std::string& why) {
    const std::size_t m = c.states.size();
    Part out;
    if (m == 0) return out;
    if (m > lifting_max_states) {
        why = fmt::format("{} states exceed the {} that exact lifting handles", m, lifting_max_states);
        return std::nullopt;
    }
    const mpz_class full = big(c.full);
    std::vector<mpz_class> w(c.w.size());
    for (std::size_t k = 0; k < c.w.size(); ++k) w[k] = big(c.w[k]);
    ModLu lu;
    lu.m = m;
    for (u64 from = (u64{1} << 31) - (u64{1} << 20);; from = lu.p + 2) {
        lu.p = next_prime(from);
        lu.a.assign(m * m, 0);
        const u64 fp = static_cast<u64>(c.full % lu.p);
        for (std::size_t i = 0; i < m; ++i) {
            lu.at(i, i) = fp;
            for (auto k = c.row[i]; k < c.row[i + 1]; ++k) {
                u64& e = lu.at(i, static_cast<std::size_t>(c.col[k]));
                e = (e + lu.p - static_cast<u64>(c.w[k] % lu.p)) % lu.p;
            }
        }
        if (lu.factor()) break;
        if (from > (u64{1} << 31) - (u64{1} << 19))
            throw InternalError("exact lifting: no prime gave a regular matrix");
    }
    const mpz_class p(static_cast<unsigned long>(lu.p));
    // Digits in base p of y = A^{-1} b for each outcome, from integer residuals.
    std::array<std::vector<mpz_class>, 3> r, x;
    for (int o = 0; o < 3; ++o) {
        r[o].resize(m);
        x[o].assign(m, 0);
        for (std::size_t i = 0; i < m; ++i) r[o][i] = big(c.out[o][i]);
    }
    mpz_class pk = 1;
    long bits = 0;
    std::vector<u64> z(m);
    for (long step = 1;; ++step) {
        for (int o = 0; o < 3; ++o) {
            for (std::size_t i = 0; i < m; ++i)
                z[i] = mpz_fdiv_ui(r[o][i].get_mpz_t(), static_cast<unsigned long>(lu.p));
            lu.solve(z);
            for (std::size_t i = 0; i < m; ++i) {
                x[o][i] += pk * static_cast<unsigned long>(z[i]);
                mpz_class t = full * static_cast<unsigned long>(z[i]);
                for (auto k = c.row[i]; k < c.row[i + 1]; ++k)
                    t -= w[k] * static_cast<unsigned long>(z[c.col[k]]);
                r[o][i] -= t;
                mpz_divexact(r[o][i].get_mpz_t(), r[o][i].get_mpz_t(), p.get_mpz_t());
            }
        }
        pk *= p;
        bits += 31;
        if ((step & (step - 1)) != 0 && step % 64 != 0) continue;  // try at 1, 2, 4, ... and every 64 steps
        // A common denominator for every state and outcome, grown by reconstruction.
        mpz_class den = 1;
        bool ok = true;
        std::array<std::vector<mpz_class>, 3> y;
        const mpz_class half = pk / 2;
        for (int o = 0; o < 3 && ok; ++o) {
            y[o].resize(m);
            for (std::size_t i = 0; i < m && ok; ++i) {
                mpz_class v = den * x[o][i] % pk;
                if (v > half) v -= pk;
                if (v < 0 || v > den) {  // not yet a probability over den: grow den
                    std::optional<mpq_class> q = reconstruct(v < 0 ? mpz_class(v + pk) : v, pk);
                    if (!q || q->get_den() == 1) {
                        ok = false;
                        break;
                    }
                    den *= q->get_den();
                    for (int o2 = 0; o2 <= o; ++o2)
                        for (std::size_t i2 = 0; i2 < (o2 < o ? m : i); ++i2) y[o2][i2] *= q->get_den();
                    v = den * x[o][i] % pk;
                    if (v > half) v -= pk;
                    if (v < 0 || v > den) ok = false;
                }
                y[o][i] = v;
            }
        }
        // The proof: A y = den b exactly, in integers.
        for (int o = 0; o < 3 && ok; ++o)
            for (std::size_t i = 0; i < m && ok; ++i) {
                mpz_class t = full * y[o][i] - den * big(c.out[o][i]);
                for (auto k = c.row[i]; k < c.row[i + 1]; ++k) t -= w[k] * y[o][c.col[k]];
                ok = t == 0;
            }
        if (ok) {
            for (int o = 0; o < 3; ++o) {
                out.start[o] = mpq_class(y[o][c.start], den);
                out.start[o].canonicalize();
            }
            return out;
        }
        if (bits > lifting_max_bits) {
            why = fmt::format("the fractions exceed {} bits", lifting_max_bits);
            return std::nullopt;
        }
    }
}

}  // namespace

LiftedDuel lifted_duel(const Chain& a, const Chain& b, Order order) {
    LiftedDuel res;
    const std::vector<Mover> parts = parts_of(order);
    ExactDuel d;
    d.method = ExactMethod::lifting;
    for (Mover mv : parts) {
        const ProductChain c = build_product_chain(a, b, mv);
        std::optional<Part> p = lift_part(c, res.refusal);
        if (!p) return res;
        const mpq_class share(1, static_cast<unsigned long>(parts.size()));
        d.p_a_wins += share * p->start[0];
        d.p_b_wins += share * p->start[1];
        d.p_tie += share * p->start[2];
    }
    d.p_neither = 1 - d.p_a_wins - d.p_b_wins - d.p_tie;
    if (d.p_neither < 0) throw InternalError("exact lifting: the outcomes exceed 1");
    res.duel = std::move(d);
    return res;
}

}  // namespace overshoot
