#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <map>
#include <memory>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "race/exact_methods.hpp"

namespace overshoot {

namespace {

using u64 = std::uint64_t;
__extension__ typedef unsigned __int128 u128;

mpz_class to_mpz(u128 v) {
    mpz_class hi(static_cast<unsigned long>(static_cast<u64>(v >> 64)));
    hi <<= 64;
    hi += mpz_class(static_cast<unsigned long>(static_cast<u64>(v)));
    return hi;
}

// Cap on the bits of the fixed product C of rare self-loop denominators: past
// it every number of the programme would be dominated by C.
constexpr double max_rare_bits = 1 << 20;
constexpr std::size_t max_tracked = 8;
constexpr u64 tracked_min_count = 16;

// ---------------------------------------------------------------------------
// The exact pair programme (forward-only boards).
//
// With integer weights the programme of race/pairs.cpp reads
//   Y'(a,b) = sum_e wB(b->e) F(a,e)            [+ wfB(b) in the loss part]
//   G'(a,b) = wsB(b) F(a,b) + Y'(a,b)           (DB times G)
//   F(a,b)  = (sum_d wA(a->d) G'(d,b) + wsA(a) Y'(a,b)) / q(a,b),
//   q(a,b)  = DA DB - wsA(a) wsB(b),
// with G'(N,b) = DB H(b). Every value is stored as an integer numerator over
//   C * prod_j basis_j^t_j(cell),
// where basis_j are the frequent values of q (DA DB first of all), t_j is the
// cell's own exponent vector (the componentwise max over what it depends on,
// plus one at q's index) and C is the product of q over every cell whose q is
// rare. Dividing by a rare q is then exact (docs/exact.md has the proof), and
// only the final value is reduced.
class ExactPairs {
public:
    ExactPairs(const Chain& a, const Chain& b, bool a_first) : A_(a), B_(b), a_first_(a_first) {
        n_ = a.length;
        comps_ = a_first ? 2 : 3;
        choose_basis();
    }

    // Win, loss and tie of the race from the two start squares, reduced.
    std::array<mpq_class, 3> run();

private:
    const Chain& A_;
    const Chain& B_;
    bool a_first_;
    int n_ = 0;
    int comps_ = 3;
    std::size_t k_ = 0;  // tracked basis size
    std::vector<u128> basis_;
    std::vector<mpz_class> basis_z_;
    std::vector<std::vector<mpz_class>> pow_;  // pow_[j][e] = basis_j^e, grown on demand
    mpz_class c_ = 1;
    std::vector<mpz_class> const_cache_;  // k_ == 1: C * basis_0^t
    // Per square: index of its stay weight among the distinct ones; per pair
    // of indices: tracked index (>= 0), -1 rare, -2 zero (both never move).
    std::vector<int> ia_, ib_;
    int nb_ = 0;
    std::vector<int> qkind_;
    std::vector<u128> qvalue_;

    struct Row {
        std::vector<mpz_class> num;
        std::vector<std::int32_t> ex;
    };

    u128 q_of(int a, int b) const {
        return static_cast<u128>(A_.denominator) * B_.denominator -
               static_cast<u128>(A_.stay_weight[a]) * B_.stay_weight[b];
    }

    void choose_basis() {
        // Distinct stay weights over squares a piece can rest on.
        auto index = [](const Chain& c, std::vector<int>& idx, std::vector<u64>& vals, std::vector<u64>& cnt) {
            std::map<u64, int> seen;
            idx.assign(c.length, -1);
            for (int s = 0; s < c.length; ++s) {
                if (!c.resting[s]) continue;
                auto [it, fresh] = seen.emplace(c.stay_weight[s], static_cast<int>(vals.size()));
                if (fresh) {
                    vals.push_back(c.stay_weight[s]);
                    cnt.push_back(0);
                }
                idx[s] = it->second;
                ++cnt[it->second];
            }
        };
        std::vector<u64> va, vb, ca, cb;
        index(A_, ia_, va, ca);
        index(B_, ib_, vb, cb);
        nb_ = static_cast<int>(vb.size());
        const u128 full = static_cast<u128>(A_.denominator) * B_.denominator;
        std::map<u128, u64> count;
        for (std::size_t i = 0; i < va.size(); ++i)
            for (std::size_t j = 0; j < vb.size(); ++j) {
                u128 q = full - static_cast<u128>(va[i]) * vb[j];
                if (q != 0) count[q] += ca[i] * cb[j];
            }
        std::vector<std::pair<u64, u128>> order;  // (count, value)
        for (auto& [q, c] : count) order.emplace_back(c, q);
        std::sort(order.begin(), order.end(), [](const auto& x, const auto& y) {
            return x.first != y.first ? x.first > y.first : x.second < y.second;
        });
        for (auto& [c, q] : order)
            if (c >= tracked_min_count && basis_.size() < max_tracked) basis_.push_back(q);
        k_ = std::max<std::size_t>(basis_.size(), 1);
        if (basis_.empty()) basis_.push_back(full);  // keeps k_ >= 1; exponents stay 0
        for (u128 q : basis_) basis_z_.push_back(to_mpz(q));
        pow_.assign(k_, {mpz_class(1)});
        double rare_bits = 0;
        qkind_.assign(va.size() * vb.size(), -1);
        qvalue_.assign(va.size() * vb.size(), 0);
        for (std::size_t i = 0; i < va.size(); ++i)
            for (std::size_t j = 0; j < vb.size(); ++j) {
                u128 q = full - static_cast<u128>(va[i]) * vb[j];
                std::size_t at = i * vb.size() + j;
                qvalue_[at] = q;
                if (q == 0) {
                    qkind_[at] = -2;
                    continue;
                }
                auto it = std::find(basis_.begin(), basis_.end(), q);
                if (it != basis_.end()) {
                    qkind_[at] = static_cast<int>(it - basis_.begin());
                    continue;
                }
                rare_bits += static_cast<double>(ca[i] * cb[j]) * std::log2(static_cast<double>(q));
            }
        if (rare_bits > max_rare_bits)
            throw LimitError(fmt::format(
                "exact mode: the self-loops of this duel have too many distinct denominators (their product "
                "would have {:.0f} bits); omit --exact to get probabilities with a proven error bound",
                rare_bits));
        for (std::size_t i = 0; i < va.size(); ++i)
            for (std::size_t j = 0; j < vb.size(); ++j) {
                std::size_t at = i * vb.size() + j;
                if (qkind_[at] == -1) {
                    mpz_class q = to_mpz(qvalue_[at]);
                    mpz_class p;
                    mpz_pow_ui(p.get_mpz_t(), q.get_mpz_t(), ca[i] * cb[j]);
                    c_ *= p;
                }
            }
    }

    const mpz_class& power(std::size_t j, int e) {
        auto& v = pow_[j];
        while (static_cast<int>(v.size()) <= e) v.push_back(v.back() * basis_z_[j]);
        return v[e];
    }

    // C * prod basis^t: the scale of a constant entering at exponent t.
    mpz_class const_scale(const std::int32_t* t) {
        if (k_ == 1) {
            while (static_cast<int>(const_cache_.size()) <= t[0])
                const_cache_.push_back(c_ * power(0, static_cast<int>(const_cache_.size())));
            return const_cache_[t[0]];
        }
        mpz_class s = c_;
        for (std::size_t j = 0; j < k_; ++j) s *= power(j, t[j]);
        return s;
    }

    // acc += w * x * prod basis^(t - tx).
    void add_scaled(mpz_class& acc, const mpz_class& x, u64 w, const std::int32_t* t, const std::int32_t* tx,
                    mpz_class& tmp) {
        u128 f = w;
        bool fits = true;
        for (std::size_t j = 0; j < k_ && fits; ++j)
            for (int e = tx[j]; e < t[j]; ++e) {
                if (basis_[j] > static_cast<u128>(~u64{0}) || f > static_cast<u128>(~u64{0}) / basis_[j]) {
                    fits = false;
                    break;
                }
                f *= basis_[j];
            }
        if (fits) {
            mpz_addmul_ui(acc.get_mpz_t(), x.get_mpz_t(), static_cast<unsigned long>(static_cast<u64>(f)));
            return;
        }
        tmp = x;
        for (std::size_t j = 0; j < k_; ++j)
            if (t[j] > tx[j]) tmp *= power(j, t[j] - tx[j]);
        mpz_addmul_ui(acc.get_mpz_t(), tmp.get_mpz_t(), static_cast<unsigned long>(w));
    }

    void add_const(mpz_class& acc, u64 w1, u64 w2, const std::int32_t* t, mpz_class& tmp) {
        if (w1 == 0 || w2 == 0) return;
        tmp = const_scale(t);
        tmp *= static_cast<unsigned long>(w1);
        mpz_addmul_ui(acc.get_mpz_t(), tmp.get_mpz_t(), static_cast<unsigned long>(w2));
    }
};

std::array<mpq_class, 3> ExactPairs::run() {
    const int n = n_;
    const std::size_t k = k_;
    const int cm = comps_;
    constexpr int WIN = 0, LOSS = 1, TIE = 2;
    // Rows of G' needed by a lower row; freed once the lowest user is done.
    std::vector<int> lowest_user(n, -1);
    for (int a = 0; a < n; ++a) {
        if (!A_.resting[a]) continue;
        for (auto e = A_.row_start[a]; e < A_.row_start[a + 1]; ++e) {
            int d = A_.dest[e];
            if (d != a && d < n && lowest_user[d] < 0) lowest_user[d] = a;
        }
    }
    std::vector<std::vector<int>> free_after(n);
    for (int d = 0; d < n; ++d)
        if (lowest_user[d] >= 0) free_after[lowest_user[d]].push_back(d);
    {
        // Memory: the rows of G' alive at once plus the F row, each number at
        // most about 2N log2(DA DB) bits plus C (exponents grow by one per cell).
        int alive = 0, most = 0;
        for (int a = n - 1; a >= 0; --a) {
            if (lowest_user[a] >= 0) ++alive;
            most = std::max(most, alive);
            alive -= static_cast<int>(free_after[a].size());
        }
        const double bits = 2.0 * n * std::log2(static_cast<double>(A_.denominator) * static_cast<double>(B_.denominator)) +
                            static_cast<double>(mpz_sizeinbase(c_.get_mpz_t(), 2));
        const double bytes = static_cast<double>(most + 1) * n * cm * (bits / 8 + 32);
        limits::check_memory(bytes > 1e18 ? ~std::uint64_t{0} : static_cast<std::uint64_t>(bytes),
                             "the exact pair programme of this duel (omit --exact for proven intervals)");
    }
    std::vector<std::unique_ptr<Row>> grow(n);
    std::vector<std::unique_ptr<Row>> pool;
    auto fresh_row = [&]() {
        std::unique_ptr<Row> r;
        if (!pool.empty()) {
            r = std::move(pool.back());
            pool.pop_back();
        } else {
            r = std::make_unique<Row>();
            r->num.resize(static_cast<std::size_t>(n) * cm);
            r->ex.resize(static_cast<std::size_t>(n) * k);
        }
        return r;
    };
    Row frow;
    frow.num.resize(static_cast<std::size_t>(n) * cm);
    frow.ex.assign(static_cast<std::size_t>(n) * k, 0);
    std::vector<std::int32_t> ty(k), t(k), zero(k, 0);
    std::vector<mpz_class> y(cm), s(cm);
    mpz_class tmp, tmp2;
    const u64 db = B_.denominator;

    for (int a = n - 1; a >= 0; --a) {
        if (!A_.resting[a]) continue;
        Row* g = nullptr;
        if (lowest_user[a] >= 0) {
            grow[a] = fresh_row();
            g = grow[a].get();
        }
        const u64 wsa = A_.stay_weight[a];
        for (int b = n - 1; b >= 0; --b) {
            std::int32_t* fex = &frow.ex[static_cast<std::size_t>(b) * k];
            mpz_class* fnum = &frow.num[static_cast<std::size_t>(b) * cm];
            if (!B_.resting[b]) {
                for (int c = 0; c < cm; ++c) fnum[c] = 0;
                std::fill(fex, fex + k, 0);
                continue;
            }
            const u64 wsb = B_.stay_weight[b];
            const int kind = qkind_[static_cast<std::size_t>(ia_[a]) * nb_ + ib_[b]];
            if (kind == -2) {  // neither piece can ever move: nobody finishes
                for (int c = 0; c < cm; ++c) fnum[c] = 0;
                std::fill(fex, fex + k, 0);
                if (g) {
                    for (int c = 0; c < cm; ++c) g->num[static_cast<std::size_t>(b) * cm + c] = 0;
                    std::fill(&g->ex[static_cast<std::size_t>(b) * k], &g->ex[static_cast<std::size_t>(b) * k] + k, 0);
                }
                continue;
            }
            // Exponents: Y' from this row, then the rows A moves to.
            std::fill(ty.begin(), ty.end(), 0);
            for (auto e = B_.row_start[b]; e < B_.row_start[b + 1]; ++e) {
                int d = B_.dest[e];
                if (d == b || d == n) continue;
                const std::int32_t* x = &frow.ex[static_cast<std::size_t>(d) * k];
                for (std::size_t j = 0; j < k; ++j) ty[j] = std::max(ty[j], x[j]);
            }
            t = ty;
            for (auto e = A_.row_start[a]; e < A_.row_start[a + 1]; ++e) {
                int d = A_.dest[e];
                if (d == a || d == n) continue;
                const std::int32_t* x = &grow[d]->ex[static_cast<std::size_t>(b) * k];
                for (std::size_t j = 0; j < k; ++j) t[j] = std::max(t[j], x[j]);
            }
            const bool need_y = wsa > 0 || g != nullptr;
            if (need_y) {
                for (int c = 0; c < cm; ++c) y[c] = 0;
                for (auto e = B_.row_start[b]; e < B_.row_start[b + 1]; ++e) {
                    int d = B_.dest[e];
                    if (d == b) continue;
                    if (d == n) {
                        add_const(y[LOSS], B_.weight[e], 1, ty.data(), tmp);
                        continue;
                    }
                    const mpz_class* x = &frow.num[static_cast<std::size_t>(d) * cm];
                    const std::int32_t* xe = &frow.ex[static_cast<std::size_t>(d) * k];
                    for (int c = 0; c < cm; ++c) add_scaled(y[c], x[c], B_.weight[e], ty.data(), xe, tmp);
                }
            }
            for (int c = 0; c < cm; ++c) s[c] = 0;
            for (auto e = A_.row_start[a]; e < A_.row_start[a + 1]; ++e) {
                int d = A_.dest[e];
                if (d == a) continue;
                const u64 w = A_.weight[e];
                if (d == n) {
                    if (a_first_) {
                        add_const(s[WIN], w, db, t.data(), tmp);
                    } else {
                        add_const(s[WIN], w, db - B_.finish_weight[b], t.data(), tmp);
                        add_const(s[TIE], w, B_.finish_weight[b], t.data(), tmp);
                    }
                    continue;
                }
                const mpz_class* x = &grow[d]->num[static_cast<std::size_t>(b) * cm];
                const std::int32_t* xe = &grow[d]->ex[static_cast<std::size_t>(b) * k];
                for (int c = 0; c < cm; ++c) add_scaled(s[c], x[c], w, t.data(), xe, tmp);
            }
            if (wsa > 0)
                for (int c = 0; c < cm; ++c) add_scaled(s[c], y[c], wsa, t.data(), ty.data(), tmp);
            // Divide by q: a tracked q raises its exponent, a rare one divides exactly.
            if (kind >= 0) {
                for (int c = 0; c < cm; ++c) fnum[c].swap(s[c]);
                std::copy(t.begin(), t.end(), fex);
                fex[kind] += 1;
            } else {
                const mpz_class q = to_mpz(qvalue_[static_cast<std::size_t>(ia_[a]) * nb_ + ib_[b]]);
                for (int c = 0; c < cm; ++c) {
                    if (!mpz_divisible_p(s[c].get_mpz_t(), q.get_mpz_t()))
                        throw InternalError("exact pair programme: a self-loop denominator does not divide");
                    mpz_divexact(fnum[c].get_mpz_t(), s[c].get_mpz_t(), q.get_mpz_t());
                }
                std::copy(t.begin(), t.end(), fex);
            }
            if (g) {
                mpz_class* gn = &g->num[static_cast<std::size_t>(b) * cm];
                std::int32_t* ge = &g->ex[static_cast<std::size_t>(b) * k];
                for (int c = 0; c < cm; ++c) {
                    gn[c] = 0;
                    if (wsb > 0) mpz_addmul_ui(gn[c].get_mpz_t(), fnum[c].get_mpz_t(), static_cast<unsigned long>(wsb));
                    add_scaled(gn[c], y[c], 1, fex, ty.data(), tmp);
                }
                std::copy(fex, fex + k, ge);
            }
        }
        for (int d : free_after[a]) pool.push_back(std::move(grow[d]));
        // Rows below A's start square are never reached from the start.
        if (a == A_.start) break;
    }
    // F row of A's start square, at B's start square.
    const std::size_t sb = static_cast<std::size_t>(B_.start);
    std::array<mpq_class, 3> out;
    mpz_class den = c_;
    for (std::size_t j = 0; j < k; ++j) den *= power(j, frow.ex[sb * k + j]);
    for (int c = 0; c < cm; ++c) {
        out[c] = mpq_class(frow.num[sb * cm + c], den);
        out[c].canonicalize();
    }
    if (cm == 2) out[2] = 0;
    return out;
}


}  // namespace

std::array<mpq_class, 3> exact_pair_programme(const Chain& a, const Chain& b, bool a_first) {
    ExactPairs p(a, b, a_first);
    return p.run();
}

}  // namespace overshoot
