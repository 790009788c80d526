// Writing residual certificates: the product chain's values by a sparse LU in
// double precision, refined against exact 128-bit integer residuals until the
// rounding of the last written digit dominates, and a bound on the expected
// remaining rounds that satisfies h >= 1 + Q h exactly (docs/method.md).
#include "certify/residual.hpp"

#include <fmt/format.h>

#include <Eigen/Sparse>
#include <Eigen/SparseLU>
#include <algorithm>
#include <cmath>
#include <deque>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "race/outcome.hpp"

namespace overshoot {

std::string_view to_string(Mover m) {
    switch (m) {
        case Mover::both:
            return "both";
        case Mover::a:
            return "a";
        case Mover::b:
            return "b";
    }
    return "?";
}

std::vector<Mover> parts_of(Order order) {
    const OrderedRaces races = needed_races(order);
    std::vector<Mover> out;
    if (races.simultaneous) out.push_back(Mover::both);
    if (races.a_first) out.push_back(Mover::a);
    if (races.b_first) out.push_back(Mover::b);
    return out;
}

namespace {

__extension__ typedef __int128 i128;
__extension__ typedef unsigned __int128 u128;

mpz_class to_mpz(i128 v) {
    const bool neg = v < 0;
    u128 u = neg ? static_cast<u128>(-(v + 1)) + 1 : static_cast<u128>(v);
    mpz_class hi(static_cast<unsigned long>(static_cast<std::uint64_t>(u >> 64)));
    mpz_class z = (hi << 64) + mpz_class(static_cast<unsigned long>(static_cast<std::uint64_t>(u)));
    return neg ? mpz_class(-z) : z;
}

i128 pow10_i128(int d) {
    i128 r = 1;
    for (int i = 0; i < d; ++i) r *= 10;
    return r;
}

int bits(u128 v) {
    int n = 0;
    while (v) {
        ++n;
        v >>= 1;
    }
    return n;
}

// Calls f(kind, da, db, weight) for every outcome of one round from (a, b):
// kind 0/1/2 = A wins / B wins / tie (da, db unused), 3 = the race goes on.
template <class Visit>
void round_from(const Chain& A, const Chain& B, Mover first, int a, int b, Visit&& f) {
    const int n = A.length;
    if (first == Mover::both) {
        for (auto ka = A.row_start[a]; ka < A.row_start[a + 1]; ++ka)
            for (auto kb = B.row_start[b]; kb < B.row_start[b + 1]; ++kb) {
                const u128 w = static_cast<u128>(A.weight[ka]) * B.weight[kb];
                const bool fa = A.dest[ka] == n, fb = B.dest[kb] == n;
                f(fa && fb ? 2 : fa ? 0 : fb ? 1 : 3, A.dest[ka], B.dest[kb], w);
            }
        return;
    }
    // One piece moves; if it finishes the round ends, otherwise the other moves.
    const Chain& F = first == Mover::a ? A : B;
    const Chain& S = first == Mover::a ? B : A;
    const int fs = first == Mover::a ? a : b, ss = first == Mover::a ? b : a;
    const int first_wins = first == Mover::a ? 0 : 1;
    for (auto kf = F.row_start[fs]; kf < F.row_start[fs + 1]; ++kf) {
        if (F.dest[kf] == n) {
            f(first_wins, 0, 0, static_cast<u128>(F.weight[kf]) * S.denominator);
            continue;
        }
        for (auto ks = S.row_start[ss]; ks < S.row_start[ss + 1]; ++ks) {
            const u128 w = static_cast<u128>(F.weight[kf]) * S.weight[ks];
            if (S.dest[ks] == n) {
                f(1 - first_wins, 0, 0, w);
                continue;
            }
            const int df = F.dest[kf], dsec = S.dest[ks];
            f(3, first == Mover::a ? df : dsec, first == Mover::a ? dsec : df, w);
        }
    }
}

}  // namespace

ProductChain build_product_chain(const Chain& A, const Chain& B, Mover first) {
    const int n = A.length;
    const std::size_t cells = static_cast<std::size_t>(n) * n;
    const std::uint64_t rowlen = static_cast<std::uint64_t>(A.max_move + 1) * (B.max_move + 1);
    limits::check_memory(cells * (8 + rowlen * 48), "the residual certificate of this duel");
    ProductChain p;
    p.full = static_cast<u128>(A.denominator) * B.denominator;
    auto live = [&](int a, int b) { return !(A.stuck[a] && B.stuck[b]); };
    // Live states reachable from the start through live states (dead ones only lead to dead ones).
    std::vector<int> idx(cells, -1);
    const int s0 = A.start * n + B.start;
    if (live(A.start, B.start)) {
        std::deque<int> queue{s0};
        idx[s0] = 0;
        while (!queue.empty()) {
            const int s = queue.front();
            queue.pop_front();
            round_from(A, B, first, s / n, s % n, [&](int kind, int da, int db, u128) {
                const int t = da * n + db;
                if (kind == 3 && idx[t] < 0 && live(da, db)) {
                    idx[t] = 0;
                    queue.push_back(t);
                }
            });
        }
    }
    for (std::size_t c = 0; c < cells; ++c)
        if (idx[c] >= 0) {
            idx[c] = static_cast<int>(p.states.size());
            p.states.emplace_back(static_cast<int>(c / n), static_cast<int>(c % n));
        }
    if (idx[static_cast<std::size_t>(s0)] >= 0) p.start = static_cast<std::size_t>(idx[static_cast<std::size_t>(s0)]);
    p.row.push_back(0);
    for (int k = 0; k < 3; ++k) p.out[k].assign(p.states.size(), 0);
    for (std::size_t i = 0; i < p.states.size(); ++i) {
        const auto [a, b] = p.states[i];
        round_from(A, B, first, a, b, [&](int kind, int da, int db, u128 w) {
            if (kind < 3) {
                p.out[kind][i] += w;
                return;
            }
            const int j = idx[static_cast<std::size_t>(da) * n + db];
            if (j < 0) return;  // a dead state: its values are 0
            p.col.push_back(j);
            p.w.push_back(w);
        });
        p.row.push_back(static_cast<std::int64_t>(p.col.size()));
    }
    return p;
}

namespace {

// full * x(s) - sum_t w(s,t) x(t) - scale * out(s): the residual times full * scale.
std::vector<i128> residual(const ProductChain& p, const std::vector<i128>& x, const std::vector<u128>* out,
                           i128 scale) {
    std::vector<i128> r(x.size());
    for (std::size_t i = 0; i < x.size(); ++i) {
        i128 acc = static_cast<i128>(p.full) * x[i];
        if (out) acc -= scale * static_cast<i128>((*out)[i]);
        for (auto k = p.row[i]; k < p.row[i + 1]; ++k) acc -= static_cast<i128>(p.w[k]) * x[p.col[k]];
        r[i] = acc;
    }
    return r;
}

i128 max_abs(const std::vector<i128>& v) {
    i128 m = 0;
    for (i128 x : v) m = std::max(m, x < 0 ? -x : x);
    return m;
}

struct PartValues {
    ResidualPart part;
    i128 max_r[5] = {0, 0, 0, 0, 0};  // A, B, tie, neither, margin residuals (times full * 10^D)
    i128 x0[3] = {0, 0, 0};           // start-state values (times 10^D)
    i128 h0 = 0;                      // start-state rounds bound (times 10^Dh)
    u128 full = 1;
    int refinements = 0;
};

constexpr int kRoundsDigits = 3;

PartValues write_part(const Chain& A, const Chain& B, Mover first) {
    PartValues out;
    out.part.first = first;
    ProductChain p = build_product_chain(A, B, first);
    out.full = p.full;
    out.part.states = p.states;
    const std::size_t m = p.states.size();
    if (m == 0) return out;  // the race can never end from the start: every value is 0
    if (m > residual_max_states)
        throw LimitError(fmt::format("residual certificate: {} states exceed the {} its writer handles", m,
                                     residual_max_states));
    const double full_d = static_cast<double>(p.full);
    std::vector<Eigen::Triplet<double>> trip;
    trip.reserve(p.col.size() + m);
    for (std::size_t i = 0; i < m; ++i) {
        trip.emplace_back(static_cast<int>(i), static_cast<int>(i), 1.0);
        for (auto k = p.row[i]; k < p.row[i + 1]; ++k)
            trip.emplace_back(static_cast<int>(i), p.col[k], -static_cast<double>(p.w[k]) / full_d);
    }
    Eigen::SparseMatrix<double> mat(static_cast<int>(m), static_cast<int>(m));
    mat.setFromTriplets(trip.begin(), trip.end());
    mat.makeCompressed();
    Eigen::SparseLU<Eigen::SparseMatrix<double>> lu;
    lu.compute(mat);
    if (lu.info() != Eigen::Success)
        throw InternalError("residual certificate: the sparse LU of the product chain failed");
    // Expected rounds, and the number of digits that makes the rounding of the
    // last digit (about 10^-D per state) times h at the start negligible.
    Eigen::VectorXd t = lu.solve(Eigen::VectorXd::Ones(static_cast<int>(m)));
    const int bits_full = bits(p.full);
    const int h_bits =
        bits(static_cast<u128>(std::max(1.0, t.maxCoeff() * 4) * std::pow(10.0, kRoundsDigits)) + 1);
    if (bits_full + h_bits > 124)
        throw LimitError(
            fmt::format("residual certificate: the options' denominators ({} bits together) are too large "
                        "for the writer's 128-bit residuals",
                        bits_full));
    const int d_max = static_cast<int>(std::floor((124 - bits_full) * 0.30102999566398));
    const int want = 18 + static_cast<int>(std::ceil(std::log10(std::max(1.0, t(static_cast<int>(p.start))))));
    const int digits = std::min(d_max, std::max(19, want));
    out.part.digits = digits;
    out.part.rounds.resize(m);
    // h = (1 + delta) t rounded up: (I - Q) h >= (1 + delta)(1 - |eps|) - 10^-Dh >= 1.
    const i128 hscale = pow10_i128(kRoundsDigits);
    std::vector<i128> h(m);
    bool ok = false;
    for (long double delta = 2e-3L; delta < 1 && !ok; delta *= 8) {
        for (std::size_t i = 0; i < m; ++i)
            h[i] = static_cast<i128>(std::ceil((1 + delta) * std::max(1.0L, static_cast<long double>(t(i))) *
                                               static_cast<long double>(hscale))) +
                   1;
        std::vector<i128> r = residual(p, h, nullptr, 0);
        ok = std::all_of(r.begin(), r.end(), [&](i128 v) { return v >= static_cast<i128>(p.full) * hscale; });
    }
    if (!ok) throw InternalError("residual certificate: no bound on the remaining rounds was found");
    for (std::size_t i = 0; i < m; ++i) out.part.rounds[i] = to_mpz(h[i]);
    out.h0 = h[p.start];
    // Values: solve, then refine against exact residuals.
    const i128 scale = pow10_i128(digits);
    const long double scale_ld = std::pow(10.0L, digits);
    const int vectors = first == Mover::both ? 3 : 2;
    std::vector<i128> res[3];
    for (int c = 0; c < vectors; ++c) {
        Eigen::VectorXd rhs(static_cast<int>(m));
        for (std::size_t i = 0; i < m; ++i)
            rhs(static_cast<int>(i)) = static_cast<double>(p.out[c][i]) / full_d;
        Eigen::VectorXd x = lu.solve(rhs);
        std::vector<i128> X(m);
        for (std::size_t i = 0; i < m; ++i)
            X[i] = static_cast<i128>(std::round(
                std::clamp(static_cast<long double>(x(static_cast<int>(i))), 0.0L, 1.0L) * scale_ld));
        std::vector<i128> r = residual(p, X, &p.out[c], scale);
        i128 prev = max_abs(r);
        for (int it = 0; it < 12 && prev > 2 * static_cast<i128>(p.full); ++it) {
            Eigen::VectorXd rho(static_cast<int>(m));
            for (std::size_t i = 0; i < m; ++i)
                rho(static_cast<int>(i)) = static_cast<double>(static_cast<long double>(r[i]) /
                                                               static_cast<long double>(p.full) / scale_ld);
            Eigen::VectorXd d = lu.solve(rho);
            std::vector<i128> Y(m);
            for (std::size_t i = 0; i < m; ++i) {
                i128 y = X[i] - static_cast<i128>(
                                    std::round(static_cast<long double>(d(static_cast<int>(i))) * scale_ld));
                Y[i] = std::clamp(y, static_cast<i128>(0), scale);
            }
            std::vector<i128> ry = residual(p, Y, &p.out[c], scale);
            const i128 now = max_abs(ry);
            ++out.refinements;
            if (now >= prev) break;  // no further progress: keep the better one
            X.swap(Y);
            r.swap(ry);
            prev = now;
        }
        std::vector<mpz_class>& dst = c == 0   ? out.part.p_a_wins
                                      : c == 1 ? out.part.p_b_wins
                                               : out.part.p_tie;
        dst.resize(m);
        for (std::size_t i = 0; i < m; ++i) dst[i] = to_mpz(X[i]);
        out.x0[c] = X[p.start];
        res[c] = std::move(r);
    }
    if (vectors == 2) res[2].assign(m, 0);
    out.max_r[0] = max_abs(res[0]);
    out.max_r[1] = max_abs(res[1]);
    out.max_r[2] = max_abs(res[2]);
    i128 mm = 0, mn = 0;
    for (std::size_t i = 0; i < m; ++i) {
        const i128 dm = res[0][i] - res[1][i], dn = res[0][i] + res[1][i] + res[2][i];
        mm = std::max(mm, dm < 0 ? -dm : dm);
        mn = std::max(mn, dn < 0 ? -dn : dn);
    }
    out.max_r[3] = mn;
    out.max_r[4] = mm;
    return out;
}

}  // namespace

ResidualWriting write_residual(const Chain& a, const Chain& b, Order order) {
    if (a.length != b.length) throw InternalError("write_residual: the chains are on different boards");
    const std::vector<Mover> movers = parts_of(order);
    ResidualWriting w;
    w.proof.rounds_digits = kRoundsDigits;
    const mpq_class weight(1, static_cast<unsigned long>(movers.size()));
    for (Mover m : movers) {
        PartValues v = write_part(a, b, m);
        w.refinements += v.refinements;
        const ResidualPart& p = v.part;
        mpq_class centre[5], radius[5];
        if (p.states.empty()) {
            centre[3] = 1;  // never ends: P(neither) = 1
        } else {
            const mpz_class scale = to_mpz(pow10_i128(p.digits));
            for (int c = 0; c < 3; ++c) centre[c] = mpq_class(to_mpz(v.x0[c]), scale);
            centre[3] = 1 - centre[0] - centre[1] - centre[2];
            centre[4] = centre[0] - centre[1];
            const mpz_class den =
                to_mpz(static_cast<i128>(v.full)) * scale * to_mpz(pow10_i128(kRoundsDigits));
            for (int c = 0; c < 5; ++c) radius[c] = mpq_class(to_mpz(v.max_r[c]) * to_mpz(v.h0), den);
            for (int c = 0; c < 5; ++c) {
                centre[c].canonicalize();
                radius[c].canonicalize();
            }
        }
        for (int c = 0; c < 5; ++c) {
            w.bounds.centre[c] += weight * centre[c];
            w.bounds.radius[c] += weight * radius[c];
        }
        w.proof.parts.push_back(std::move(v.part));
    }
    for (int c = 0; c < 5; ++c) {
        w.bounds.centre[c].canonicalize();
        w.bounds.radius[c].canonicalize();
    }
    return w;
}

std::string scaled_decimal(const mpz_class& value, int digits) {
    if (value < 0) throw InternalError("scaled_decimal: a negative value");
    std::string s = value.get_str();
    if (static_cast<int>(s.size()) <= digits)
        s.insert(0, static_cast<std::size_t>(digits + 1) - s.size(), '0');
    if (digits > 0) s.insert(s.size() - static_cast<std::size_t>(digits), ".");
    return s;
}

mpz_class parse_scaled_decimal(const std::string& text, int digits, const std::string& what) {
    const auto dot = text.find('.');
    const std::size_t frac = dot == std::string::npos ? 0 : text.size() - dot - 1;
    const std::string whole = text.substr(0, dot == std::string::npos ? text.size() : dot);
    bool ok = !whole.empty() && static_cast<int>(frac) == digits &&
              (digits > 0 || dot == std::string::npos) && whole.size() <= 40;
    std::string d = whole + (dot == std::string::npos ? "" : text.substr(dot + 1));
    for (char c : d) ok = ok && c >= '0' && c <= '9';
    if (!ok)
        throw InputError(fmt::format("{}: '{}' is not a non-negative decimal with exactly {} places", what,
                                     text.substr(0, 60), digits));
    return mpz_class(d, 10);
}

}  // namespace overshoot
