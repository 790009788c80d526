#include "lengths/zone_tail.hpp"

#include <gmpxx.h>

#include <algorithm>
#include <cmath>
#include <limits>

#include "chain/series.hpp"

namespace overshoot::lengths_engine {

using ld = long double;

namespace {

// Scaled values outside this range would lose the relative accuracy the
// bound assumes (overflow, or gradual underflow): such a length and every
// longer one is left to the series.
constexpr ld huge_value = 1e4700L;
constexpr ld tiny_value = 1e-4700L;
constexpr int max_zone = 40;
constexpr double smallest_cut = 0.01;  // stay probabilities below this are always bounded, never kept

ExactZone exact_zone(const Option& o, Overshoot rule) {
    ExactZone x;
    x.z = o.max_move();
    x.den = o.denominator;
    x.w = o.weight;
    x.stay.assign(x.z + 1, 0);
    x.fin.assign(x.z + 1, 0);
    for (int e = 1; e <= x.z; ++e)
        for (int m = 1; m <= x.z; ++m) {
            if (x.w[m] == 0 || m < e) continue;
            if (m == e || rule == Overshoot::pass)
                x.fin[e] += x.w[m];
            else
                x.stay[e] += x.w[m];
        }
    return x;
}

ld to_ld(const mpq_class& q) {
    // Two doubles carry about 106 bits: the long double is q rounded (relative u_ld + 2^-104).
    mpf_class f(q, 256);
    const double hi = f.get_d();
    mpf_class rest = f - hi;
    return static_cast<ld>(hi) + static_cast<ld>(rest.get_d());
}

Modes zone_modes(const ExactZone& x) {
    Modes m;
    const int z = x.z;
    std::vector<mpq_class> h(z + 1, 0);
    for (int e = 1; e <= z; ++e) {
        if (x.stay[e] == x.den) continue;
        mpq_class s = mpq_class(mpz_class(std::to_string(x.fin[e])));
        for (int mv = 1; mv < e; ++mv)
            if (x.w[mv]) s += mpq_class(mpz_class(std::to_string(x.w[mv]))) * h[e - mv];
        h[e] = s / mpq_class(mpz_class(std::to_string(x.den - x.stay[e])));
        h[e].canonicalize();
    }
    std::vector<int> index(z + 1, -1);
    for (int e = 1; e <= z; ++e)
        if (h[e] > 0) {
            index[e] = static_cast<int>(m.states.size());
            m.states.push_back(e);
        }
    const std::size_t n = m.states.size();
    if (std::all_of(m.states.begin(), m.states.end(), [&](int e) { return x.stay[e] == 0; })) {
        m.nilpotent = m.ok = true;
        return m;
    }
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = 0; j < i; ++j)
            if (x.stay[m.states[i]] == x.stay[m.states[j]]) return m;  // equal stays: not diagonal in this form
    std::vector<std::vector<mpq_class>> c(n, std::vector<mpq_class>(n, 0)), cp = c;
    const mpq_class den(mpz_class(std::to_string(x.den)));
    for (std::size_t i = 0; i < n; ++i) {
        const int e = m.states[i];
        mpq_class sum_c = 0, sum_cp = 0;
        for (std::size_t j = 0; j < i; ++j) {
            mpq_class a = 0, b = 0;
            for (int mv = 1; mv < e; ++mv) {
                const int k = index[e - mv];
                if (!x.w[mv] || k < static_cast<int>(j)) continue;
                const mpq_class wm(mpz_class(std::to_string(x.w[mv])));
                a += wm * c[k][j];
                b += wm * cp[k][j];
            }
            const mpq_class gap = mpq_class(mpz_class(std::to_string(x.stay[m.states[j]]))) -
                                  mpq_class(mpz_class(std::to_string(x.stay[e])));
            c[i][j] = a / gap;
            cp[i][j] = b / gap;
            sum_c += c[i][j];
            sum_cp += cp[i][j];
        }
        c[i][i] = h[e] - sum_c;
        cp[i][i] = mpq_class(mpz_class(std::to_string(x.fin[e]))) / den - sum_cp;
    }
    m.c.assign(n, std::vector<ld>(n, 0));
    m.cp = m.c;
    for (std::size_t i = 0; i < n; ++i) {
        ld rc = 0, rcp = 0;
        for (std::size_t j = 0; j <= i; ++j) {
            m.c[i][j] = to_ld(c[i][j]);
            m.cp[i][j] = to_ld(cp[i][j]);
            rc += std::fabs(m.c[i][j]);
            rcp += std::fabs(m.cp[i][j]);
        }
        m.c_max = std::max(m.c_max, rc);
        m.cp_max = std::max(m.cp_max, rcp);
    }
    for (std::size_t j = 0; j < n; ++j) {
        const std::uint64_t s = x.stay[m.states[j]];
        m.stay_w.push_back(s);
        m.lambda.push_back(static_cast<ld>(s) / static_cast<ld>(x.den));
        m.inv_lambda.push_back(s ? static_cast<ld>(x.den) / static_cast<ld>(s) : 0);
        m.one_minus.push_back(static_cast<ld>(x.den - s) / static_cast<ld>(x.den));
    }
    m.ok = true;
    return m;
}

// Several recursions of one piece, run together over the distance.
struct Job {
    ld x = 0, one_minus = 0;  // the argument (lambda, or w = 1 / lambda) and 1 - lambda
    int r = 0;                // scaling 2^(r d) (finishing) or 2^(-r d) (entry)
    std::vector<ld> boundary;  // entry: values on the zone squares 1..z
};

// Either the slow piece's finishing time, 2^(r d) E[lambda^T; T < inf | d]
// (self-loops in closed form: (1 - lambda) + lambda leave, no cancellation),
// or the fast piece's zone entry, 2^(-r d) sum_e b(e) E[w^tau; enters at e | d],
// for d = 1, 2, ... one row at a time. Rows are kept in a ring of z + 1 (a
// row reads at most z rows back), the jobs of a row side by side so that
// independent chains keep the long double unit busy; the power-of-two
// scaling is exact and keeps the values in range.
class Recursion {
  public:
    Recursion(const ExactZone& x, std::vector<Job> jobs, bool finishing)
        : x_(x), jobs_(std::move(jobs)), finishing_(finishing), nq_(jobs_.size()), span_(x.z + 1),
          ring_(static_cast<std::size_t>(span_) * nq_, 0) {
        const ld den = static_cast<ld>(x.den);
        for (int m = 1; m <= x.z; ++m)
            if (x.w[m]) moves_.push_back(m);
        a_.resize(moves_.size() * nq_);
        for (std::size_t i = 0; i < moves_.size(); ++i)
            for (std::size_t q = 0; q < nq_; ++q)
                a_[i * nq_ + q] = jobs_[q].x * std::ldexp(static_cast<ld>(x.w[moves_[i]]) / den,
                                                          (finishing ? 1 : -1) * jobs_[q].r * moves_[i]);
    }

    // The row of the next distance (1 first).
    const ld* next() {
        ++d_;
        if (nq_ == 0) return nullptr;  // no term kept: nothing to read
        ld* out = row(d_);
        if (d_ <= x_.z)
            zone_row(out);
        else
            free_row(out);
        return out;
    }

  private:
    ld* row(int d) { return &ring_[static_cast<std::size_t>(d % span_) * nq_]; }

    void zone_row(ld* out) {
        const int d = d_;
        const ld den = static_cast<ld>(x_.den);
        for (std::size_t q = 0; q < nq_; ++q) {
            const Job& j = jobs_[q];
            if (!finishing_) {
                out[q] = std::ldexp(j.boundary[d], -j.r * d);
                continue;
            }
            ld num = std::ldexp(static_cast<ld>(x_.fin[d]) / den, j.r * d);
            for (std::size_t i = 0; i < moves_.size() && moves_[i] < d; ++i)
                num += std::ldexp(static_cast<ld>(x_.w[moves_[i]]) / den, j.r * moves_[i]) * row(d - moves_[i])[q];
            const ld leave = static_cast<ld>(x_.den - x_.stay[d]) / den;
            out[q] = j.x * num / (j.one_minus + j.x * leave);
        }
    }

    // v[d][q] = sum_i a[i][q] v[d - m_i][q], four chains at a time in
    // registers (the terms in the order of the moves, as one chain alone
    // would add them).
    void free_row(ld* out) {
        const std::size_t k = moves_.size();
        std::size_t q = 0;
        for (; q + 4 <= nq_; q += 4) {
            ld s0 = 0, s1 = 0, s2 = 0, s3 = 0;
            for (std::size_t i = 0; i < k; ++i) {
                const ld* src = row(d_ - moves_[i]) + q;
                const ld* ai = &a_[i * nq_ + q];
                s0 += ai[0] * src[0];
                s1 += ai[1] * src[1];
                s2 += ai[2] * src[2];
                s3 += ai[3] * src[3];
            }
            out[q] = s0;
            out[q + 1] = s1;
            out[q + 2] = s2;
            out[q + 3] = s3;
        }
        for (; q < nq_; ++q) {
            ld s0 = 0;
            for (std::size_t i = 0; i < k; ++i) s0 += a_[i * nq_ + q] * row(d_ - moves_[i])[q];
            out[q] = s0;
        }
    }

    const ExactZone& x_;
    std::vector<Job> jobs_;
    bool finishing_;
    std::size_t nq_;
    int span_;
    std::vector<ld> ring_, a_;
    std::vector<int> moves_;
    int d_ = 0;
};

int scale_exponent(ld lambda, double mean_slow, double mean_fast) {
    const double bits = -std::log2(static_cast<double>(lambda));
    return static_cast<int>(std::lround(bits * (1 / mean_slow + 1 / mean_fast) / 2));
}

bool in_range(ld v) { return std::isfinite(v) && (v == 0 || (std::fabs(v) >= tiny_value && std::fabs(v) <= huge_value)); }


}  // namespace

bool zone_tail_applies(const Option& a, const Option& b) {
    for (const Option* o : {&a, &b})
        if (o->weight[0] != 0 || o->max_move() > max_zone || o->max_move() < 1) return false;
    return true;
}

ZoneChain zone_chain(const Option& o, Overshoot rule) {
    ZoneChain c;
    if (o.weight[0] != 0 || o.max_move() > max_zone || o.max_move() < 1 || rule == Overshoot::bounce) return c;
    c.zone = exact_zone(o, rule);
    c.modes = zone_modes(c.zone);
    c.usable = true;
    return c;
}

ZoneTail zone_tail(const Option& a, const Option& b, const ZoneChain& ca, const ZoneChain& cb, const DistanceModel& da,
                   const DistanceModel& db, OrderedRaces races, int L, double target) {
    ZoneTail out;
    out.first = L + 1;
    if (!zone_tail_applies(a, b) || !ca.usable || !cb.usable) return out;
    // The fast piece (larger mean move) reaches its zone first.
    out.fast_is_a = a.mean() > b.mean();
    const Option& fast = out.fast_is_a ? a : b;
    const Option& slow = out.fast_is_a ? b : a;
    const DistanceModel& dF = out.fast_is_a ? da : db;
    const DistanceModel& dS = out.fast_is_a ? db : da;
    const ExactZone& zf = (out.fast_is_a ? ca : cb).zone;
    const ExactZone& zs = (out.fast_is_a ? cb : ca).zone;
    const Modes& m = (out.fast_is_a ? ca : cb).modes;
    if (!m.ok || m.states.empty()) return out;
    const std::size_t n = m.states.size();
    const double mean_s = slow.mean(), mean_f = fast.mean();
    // Work only: the bound falls roughly like exp(-d m^2 / 2v) (the overlap of
    // the two finishing times, m and v their mean gap and variance per
    // square); far from 1e-13 at L, no cut is tried.
    {
        const double gap = 1 / mean_s - 1 / mean_f;
        const double var = dS.variance / (mean_s * mean_s * mean_s) + dF.variance / (mean_f * mean_f * mean_f);
        if (!(L * gap * gap / (2 * var) >= 20)) return out;
    }
    // Rounding depth (elementary operations on a path) per distance d: one
    // level per square at most, each a sum of k products, a division and the
    // coefficients' own roundings (docs/method.md, section 4.6).
    const double ks = static_cast<double>(std::count_if(zs.w.begin(), zs.w.end(), [](auto w) { return w != 0; }));
    const double kf = static_cast<double>(std::count_if(zf.w.begin(), zf.w.end(), [](auto w) { return w != 0; }));
    auto depth = [&](int d) { return (ks + kf + 16) * (d + 1) + 2.0 * static_cast<double>(n) + 8; };
    // Choose the cut: the smallest kept stay probability, each tried, keeping
    // the one that covers the most lengths (fewer terms on a tie). When no
    // square of the zone can be stayed on (the rule pass), the zone time is
    // at most z rounds and no term is kept: the cut is then free.
    std::vector<std::size_t> order(m.stay_w.size());
    for (std::size_t j = 0; j < order.size(); ++j) order[j] = j;
    std::sort(order.begin(), order.end(), [&](std::size_t x, std::size_t y) { return m.stay_w[x] > m.stay_w[y]; });
    struct Cut {
        ld lambda, inv, one_minus;
        std::size_t kept;
        ld factor;
    };
    std::vector<Cut> cuts;
    if (m.nilpotent) {
        for (const ld c : {0.875L, 0.75L, 0.5L, 0.25L, 0.125L})
            cuts.push_back({c, 1 / c, 1 - c, 0, 1 + 2 * std::pow(1 / c, static_cast<ld>(zf.z))});
    } else {
        for (std::size_t oi = 0; oi < n; ++oi) {
            const std::size_t j = order[oi];
            if (m.lambda[j] < smallest_cut) break;
            cuts.push_back({m.lambda[j], m.inv_lambda[j], m.one_minus[j], oi + 1, 1 + m.c_max + m.cp_max / m.lambda[j]});
        }
    }
    std::vector<ld> ones(zf.z + 1, 1);
    ones[0] = 0;
    int best_first = L + 1;
    std::size_t best_cut = 0;
    std::vector<ld> best_eps;
    // Among the cuts below `limit` (index into cuts, largest stay first): from
    // the smallest cut up (the most terms, usually the most lengths); once a
    // cut covers clearly fewer lengths than the best, larger ones will not do
    // better (a choice of work only: every cut's bound is proven).
    auto choose = [&](std::size_t limit) {
        best_first = L + 1;
        for (std::size_t ci = limit; ci-- > 0;) {
            const Cut& cut = cuts[ci];
            const int r = scale_exponent(cut.lambda, mean_s, mean_f);
            Recursion phi(zs, {Job{cut.lambda, cut.one_minus, r, {}}}, true);
            Recursion psi(zf, {Job{cut.inv, 0, r, ones}}, false);
            std::vector<ld> eps(L + 1, 0);
            bool bad = false;
            for (int d = 1; d <= L && !bad; ++d) {
                const ld f = *phi.next(), e = *psi.next();
                bad = !in_range(f) || !in_range(e);
                eps[d] = cut.factor * f * e * (1 + 4 * gamma_ld(depth(d)));
            }
            if (bad) continue;
            int first = L + 1;
            // Lengths inside a zone stay with the series (it needs them).
            for (int d = L; d > std::max(zs.z, zf.z); --d) {
                if (!(eps[d] <= target)) break;
                first = d;
            }
            if (first < best_first) {
                best_first = first;
                best_cut = ci;
                best_eps = std::move(eps);
            } else if (best_first <= L && first > best_first + best_first / 2) {
                break;
            }
        }
    };
    // The kept terms (every stay probability at or above the cut); when one
    // of them leaves the safe range, only cuts above it are tried again.
    std::vector<ld> mx(L + 1, 0), me(L + 1, 0), mag(L + 1, 0);
    std::size_t limit = cuts.size(), kept = 0;
    while (true) {
        choose(limit);
        if (best_first > L) return out;
        kept = cuts[best_cut].kept;
        std::vector<Job> fin_jobs, entry_jobs;
        for (std::size_t oi = 0; oi < kept; ++oi) {
            const std::size_t j = order[oi];
            const int r = scale_exponent(m.lambda[j], mean_s, mean_f);
            fin_jobs.push_back({m.lambda[j], m.one_minus[j], r, {}});
            std::vector<std::vector<ld>> bnd(3, std::vector<ld>(zf.z + 1, 0));
            for (std::size_t i = 0; i < n; ++i) {
                const int e = m.states[i];
                bnd[0][e] = m.c[i][j];
                bnd[1][e] = m.cp[i][j] / m.lambda[j];
                bnd[2][e] = std::fabs(m.c[i][j]) + std::fabs(m.cp[i][j]) / m.lambda[j];
            }
            for (auto& bv : bnd) entry_jobs.push_back({m.inv_lambda[j], 0, r, std::move(bv)});
        }
        Recursion phi(zs, std::move(fin_jobs), true);
        Recursion psi(zf, std::move(entry_jobs), false);
        std::fill(mx.begin(), mx.end(), 0);
        std::fill(me.begin(), me.end(), 0);
        std::fill(mag.begin(), mag.end(), 0);
        std::size_t bad_term = kept;  // the first kept term out of range, if any
        for (int d = 1; d <= L && bad_term == kept; ++d) {
            const ld* f = phi.next();
            const ld* e = psi.next();
            for (std::size_t q = 0; q < kept; ++q) {
                if (!in_range(f[q]) || !in_range(e[3 * q]) || !in_range(e[3 * q + 1]) || !in_range(e[3 * q + 2])) {
                    bad_term = q;
                    break;
                }
                mx[d] += f[q] * e[3 * q];
                me[d] += f[q] * e[3 * q + 1];
                mag[d] += f[q] * e[3 * q + 2];
            }
        }
        if (bad_term == kept) break;
        limit = bad_term;  // cut index i keeps terms 0..i: only cuts below the bad term avoid it
        if (limit == 0) return out;
    }
    out.first = best_first;
    out.modes = static_cast<int>(kept);
    out.cut = static_cast<double>(cuts[best_cut].lambda);
    if (races.simultaneous) out.sim.init(L);
    if (races.a_first) out.af.init(L);
    if (races.b_first) out.bf.init(L);
    out.bound.assign(L + 1, 0);
    const double u = unit_d;
    for (int d = out.first; d <= L; ++d) {
        const double hs = dS.p_ever[d], ks_ = dS.p_never[d], hf = dF.p_ever[d], kf_ = dF.p_never[d];
        const double x = static_cast<double>(mx[d]), tie = static_cast<double>(me[d]);
        // P(S first) = h_S K_F + X; P(F first) = h_F K_S + (h_S h_F - X - E).
        const double s_first = hs * kf_ + x;
        const double f_first = hf * ks_ + (hs * hf - x - tie);
        const double rounding = static_cast<double>((gamma_ld(depth(d)) + 4 * std::numeric_limits<ld>::epsilon()) *
                                                    mag[d] * (1 + 4 * gamma_ld(depth(d))));
        out.bound[d] = static_cast<double>(best_eps[d]) * (1 + 1e-12) + rounding +
                       4 * (dS.ever_never_error + dF.ever_never_error) + 16 * u;
        const double win = out.fast_is_a ? f_first : s_first;  // A strictly first
        const double loss = out.fast_is_a ? s_first : f_first;
        if (races.simultaneous) {
            out.sim.win[d] = win;
            out.sim.loss[d] = loss;
            out.sim.tie[d] = tie;
        }
        if (races.a_first) {
            out.af.win[d] = win + tie;
            out.af.loss[d] = loss;
        }
        if (races.b_first) {
            out.bf.win[d] = win;
            out.bf.loss[d] = loss + tie;
        }
    }
    return out;
}

}  // namespace overshoot::lengths_engine
