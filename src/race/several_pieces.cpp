#include "race/several_pieces.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <bit>
#include <cmath>

#include "chain/series.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/selfcheck.hpp"

namespace overshoot {

RaceOrder parse_race_order(std::string_view t) {
    if (t == "simultaneous") return RaceOrder::simultaneous;
    if (t == "seated") return RaceOrder::seated;
    throw InputError(fmt::format("order '{}': a race of several pieces takes simultaneous or seated", t));
}

std::string_view to_string(RaceOrder o) { return o == RaceOrder::seated ? "seated" : "simultaneous"; }

std::string_view to_string(RaceMethod m) { return m == RaceMethod::series_zone ? "series+zone" : "series"; }

namespace {

// Adds one round's outcomes to `subset` (index = set of first finishers).
// f[i] = P(T_i = t), s[i] = P(T_i > t), sp[i] = P(T_i > t - 1).
void add_round(std::vector<long double>& subset, std::vector<long double>& w, int k, RaceOrder order,
               const long double* f, const long double* s, const long double* sp) {
    if (order == RaceOrder::simultaneous) {
        // w[mask] = prod_{i in mask} f_i prod_{i not in mask} s_i, built piece by piece.
        w[0] = 1;
        for (int i = 0; i < k; ++i) {
            const unsigned bit = 1u << i;
            for (unsigned m = 0; m < bit; ++m) {
                w[m | bit] = w[m] * f[i];
                w[m] *= s[i];
            }
        }
        for (unsigned m = 1; m < (1u << k); ++m) subset[m] += w[m];
    } else {
        // Pieces before i have moved this round, pieces after i have not.
        for (int i = 0; i < k; ++i) {
            long double x = f[i];
            if (x == 0) continue;
            for (int j = 0; j < i; ++j) x *= s[j];
            for (int j = i + 1; j < k; ++j) x *= sp[j];
            subset[1u << i] += x;
        }
    }
}

// P(nobody finished yet and somebody still can) = prod(alive+stuck) - prod stuck,
// accumulated without subtraction.
long double unresolved(int k, const long double* alive, const long double* stuck) {
    long double u = 0, st = 1;
    for (int j = 0; j < k; ++j) {
        u = u * (alive[j] + stuck[j]) + st * alive[j];
        st *= stuck[j];
    }
    return u;
}

void finish_result(RaceResult& r, const std::vector<long double>& subset, int k) {
    r.pieces = k;
    r.p_wins.assign(k, 0);
    r.p_shares.assign(k, 0);
    r.p_shared.assign(1u << k, 0);
    r.p_tie = 0;
    long double total = 0;
    for (unsigned m = 1; m < (1u << k); ++m) {
        const long double p = std::max(0.0L, subset[m]);
        total += p;
        if (std::popcount(m) == 1) {
            r.p_wins[std::countr_zero(m)] = p;
        } else {
            r.p_shared[m] = p;
            r.p_tie += p;
            for (int i = 0; i < k; ++i)
                if (m & (1u << i)) r.p_shares[i] += p;
        }
    }
    if (r.p_neither < 0) r.p_neither = std::max(0.0L, 1.0L - total);
    // Self-check on the raw values (before the clamp at 0): the sets of first
    // finishers and "nobody" partition the space, each within r.bound.
    std::vector<long double> parts(subset.begin() + 1, subset.begin() + (1u << k));
    parts.push_back(r.p_neither);
    selfcheck::check_distribution(parts, r.bound, "race");
}

// The closure: a time-free programme over tuples of end-zone squares of the
// pieces that are still live ("heavy"). Axis j has coordinate 0 = "never
// finishes" and 1.. = squares z_j..N-1. Returns the value of the race from the
// weighted tuple distribution, per set of first finishers (over heavy pieces).
struct ZoneAxis {
    const Chain* chain;
    int z;                          // first zone square
    int dim;                        // N - z + 1
    std::vector<long double> mass;  // weight per coordinate
};

std::uint64_t zone_states(const std::vector<ZoneAxis>& ax) {
    std::uint64_t s = 1;
    for (const auto& a : ax) {
        s *= static_cast<std::uint64_t>(a.dim);
        if (s > (std::uint64_t{1} << 40)) return s;
    }
    return s;
}

std::uint64_t zone_cost(const std::vector<ZoneAxis>& ax) {
    const std::uint64_t nv = std::uint64_t{1} << ax.size();
    std::uint64_t per = 0;
    for (const auto& a : ax) per += static_cast<std::uint64_t>(a.chain->max_move + 2) * nv;
    per += 2 * nv * ax.size() + 8;
    const std::uint64_t s = zone_states(ax);
    if (s > (std::uint64_t{1} << 40)) return ~std::uint64_t{0} >> 2;
    return s * per;
}

std::uint64_t zone_memory(const std::vector<ZoneAxis>& ax) {
    const std::uint64_t s = zone_states(ax);
    if (s > (std::uint64_t{1} << 40)) return ~std::uint64_t{0} >> 2;
    return s * ax.size() * (std::uint64_t{1} << ax.size()) * sizeof(long double) + 4096;
}

std::vector<long double> zone_programme(const std::vector<ZoneAxis>& ax, RaceOrder order, long double& rel_rounding) {
    const int h = static_cast<int>(ax.size());
    const int n = ax.front().chain->length;
    const std::size_t nv = std::size_t{1} << h;
    const std::size_t states = zone_states(ax);
    limits::check_memory(zone_memory(ax), "the end-zone programme of this race");
    std::vector<std::size_t> stride(h);
    std::size_t st = 1;
    for (int j = h - 1; j >= 0; --j) {
        stride[j] = st;
        st *= static_cast<std::size_t>(ax[j].dim);
    }
    // store[j] holds X_j for j = 1..h (X_h = V); see docs/races.md.
    std::vector<std::vector<long double>> store(h + 1);
    for (int j = 1; j <= h; ++j) store[j].assign(states * nv, 0);
    std::vector<long double> beta((h + 1) * nv), alpha(h + 1), dd(h + 1), rvec(nv), total(nv, 0), v(nv);
    std::vector<int> c(h);
    const bool seated = order == RaceOrder::seated;
    for (std::size_t flat = states; flat-- > 0;) {
        long double weight = 1;
        for (int j = 0; j < h; ++j) {
            c[j] = static_cast<int>((flat / stride[j]) % static_cast<std::size_t>(ax[j].dim));
            weight *= ax[j].mass[c[j]];
        }
        alpha[h] = 1;
        dd[h] = 0;
        std::fill(beta.begin() + static_cast<std::ptrdiff_t>(h * nv), beta.end(), 0.0L);
        for (int j = h - 1; j >= 0; --j) {
            long double* bj = &beta[j * nv];
            const long double* bn = &beta[(j + 1) * nv];
            const Chain& ch = *ax[j].chain;
            long double stay = 1, leave = 0, fin = 0;
            if (c[j] > 0) {
                const int s = ax[j].z + c[j] - 1;
                stay = ch.stay[s];
                leave = ch.leave[s];
                fin = ch.finish[s];
            }
            for (std::size_t m = 0; m < nv; ++m) bj[m] = stay * bn[m];
            if (c[j] > 0) {
                const int s = ax[j].z + c[j] - 1;
                const long double* xs = store[j + 1].data();
                for (auto k = ch.row_start[s]; k < ch.row_start[s + 1]; ++k) {
                    const int d = ch.dest[k];
                    if (d == s || d == n) continue;
                    if (d < ax[j].z) throw InternalError("zone programme: a move left the end zone");
                    const std::size_t other = flat + static_cast<std::size_t>(d - s) * stride[j];
                    const long double p = ch.prob[k];
                    const long double* x = xs + other * nv;
                    for (std::size_t m = 1; m < nv; ++m) bj[m] += p * x[m];
                }
            }
            if (seated) bj[std::size_t{1} << j] += fin;
            alpha[j] = stay * alpha[j + 1];
            dd[j] = leave + stay * dd[j + 1];  // 1 - alpha_j, subtraction-free
        }
        if (!seated) {
            // R[mask]: exactly the pieces in mask finish this round.
            rvec[0] = 1;
            for (int j = 0; j < h; ++j) {
                long double fin = 0, nf = 1;
                if (c[j] > 0) {
                    const Chain& ch = *ax[j].chain;
                    const int s = ax[j].z + c[j] - 1;
                    fin = ch.finish[s];
                    nf = static_cast<long double>(ch.denominator - ch.finish_weight[s]) / ch.denominator;
                }
                const std::size_t bit = std::size_t{1} << j;
                for (std::size_t m = 0; m < bit; ++m) {
                    rvec[m | bit] = rvec[m] * fin;
                    rvec[m] *= nf;
                }
            }
        }
        for (std::size_t m = 0; m < nv; ++m) {
            long double x = beta[m] + (seated || m == 0 ? 0.0L : rvec[m]);
            v[m] = dd[0] > 0 && m > 0 ? x / dd[0] : 0.0L;
        }
        for (int j = 1; j <= h; ++j) {
            long double* dst = &store[j][flat * nv];
            if (j == h) {
                for (std::size_t m = 0; m < nv; ++m) dst[m] = v[m];
            } else {
                const long double* bj = &beta[j * nv];
                for (std::size_t m = 0; m < nv; ++m) dst[m] = alpha[j] * v[m] + bj[m];
            }
        }
        if (weight != 0)
            for (std::size_t m = 1; m < nv; ++m) total[m] += weight * v[m];
    }
    // Depth of the programme (hops that change a coordinate) times the rounding
    // of one hop, as for the pair programme (docs/races.md), plus the final sum.
    // One state's value passes through every axis: at most sum_j (m_j + 4)
    // roundings plus the outcome products, the division and the stored forms.
    int depth = h + 2, per_hop = 2 * h + 12;
    for (const auto& a : ax) {
        depth += a.dim;
        per_hop += a.chain->max_move + 4;
    }
    rel_rounding = static_cast<long double>(depth) * gamma_ld(per_hop) + gamma_ld(static_cast<double>(states) + h + 2);
    return total;
}

}  // namespace

RaceResult race(const std::vector<const Chain*>& chains, const std::vector<int>& starts_in, RaceOrder order,
                const RaceSettings& cfg) {
    const int k = static_cast<int>(chains.size());
    if (k < 2 || k > max_race_pieces)
        throw InputError(fmt::format("a race takes 2 to {} pieces, got {}", max_race_pieces, k));
    const int n = chains.front()->length;
    bool forward = true;
    for (const Chain* c : chains) {
        if (c->length != n) throw InternalError("race: the chains are on different boards");
        forward = forward && c->forward_only;
    }
    std::vector<int> starts = starts_in.empty() ? std::vector<int>(k, 0) : starts_in;
    if (static_cast<int>(starts.size()) != k) throw InternalError("race: one start square per piece");
    for (int j = 0; j < k; ++j)
        if (starts[j] < 0 || starts[j] >= n || !chains[j]->resting[starts[j]])
            throw InputError(fmt::format("start square {} of piece {}: not a square a piece can rest on", starts[j], j + 1));

    std::vector<Series> ser;
    ser.reserve(k);
    for (int j = 0; j < k; ++j) ser.emplace_back(*chains[j], starts[j]);
    std::vector<long double> subset(1u << k, 0), w(1u << k, 0);
    std::vector<long double> f(k), s(k, 1), sp(k, 1), alive(k), stuck(k);
    RaceResult r;
    r.method = RaceMethod::series;
    r.p_neither = -1;  // filled below
    const long double thr = cfg.target / (4 * k);
    long double extra_bound = 0;
    bool closed = false;
    auto total_work = [&] {
        std::uint64_t x = 0;
        for (const auto& q : ser) x += q.work();
        return x;
    };
    int turn = 0;
    while (true) {
        for (int j = 0; j < k; ++j) {
            alive[j] = ser[j].alive();
            stuck[j] = ser[j].stuck();
        }
        const long double u = unresolved(k, alive.data(), stuck.data());
        if (u < cfg.target) {
            extra_bound = u;
            break;
        }
        const std::uint64_t work = total_work();
        if (work > cfg.work_limit) {
            extra_bound = u;
            break;
        }
        if (forward && cfg.allow_closure && turn % 4 == 0 && turn > 0) {
            // Plan the closure from the current distributions; take it once it
            // costs no more than the series has already spent.
            std::vector<ZoneAxis> ax;
            std::vector<int> heavy;
            long double dropped = 0, scale = 1;
            for (int j = 0; j < k; ++j) {
                if (alive[j] <= thr) {
                    dropped += alive[j];
                    scale *= stuck[j];
                    continue;
                }
                const auto& m = ser[j].mass();
                int z = ser[j].low();
                long double below = 0;
                while (z <= ser[j].high() && below + m[z] <= thr) below += m[z++];
                dropped += below;
                ZoneAxis a{chains[j], z, n - z + 1, {}};
                a.mass.assign(a.dim, 0);
                a.mass[0] = stuck[j];
                for (int q = z; q <= ser[j].high(); ++q) a.mass[q - z + 1] = m[q];
                ax.push_back(std::move(a));
                heavy.push_back(j);
            }
            const std::uint64_t cost = zone_cost(ax);
            if (!ax.empty() && cost <= std::max<std::uint64_t>(work, 200'000) && cost <= cfg.closure_limit &&
                zone_memory(ax) <= limits::memory_bytes()) {
                long double rel = 0;
                std::vector<long double> tot = zone_programme(ax, order, rel);
                for (std::size_t m = 1; m < tot.size(); ++m) {
                    unsigned gm = 0;
                    for (std::size_t i = 0; i < heavy.size(); ++i)
                        if (m & (std::size_t{1} << i)) gm |= 1u << heavy[i];
                    subset[gm] += scale * tot[m];
                }
                extra_bound = dropped + rel;
                closed = true;
                r.method = RaceMethod::series_zone;
                break;
            }
        }
        for (int j = 0; j < k; ++j) {
            sp[j] = s[j];
            f[j] = ser[j].step();
            s[j] = ser[j].survival();
        }
        ++turn;
        add_round(subset, w, k, order, f.data(), s.data(), sp.data());
    }
    r.rounds = turn;
    long double rounding = 0;
    int support = 0;
    for (const auto& q : ser) {
        rounding += q.rounding_bound();
        support += q.high() - q.low() + 1;
    }
    // Products of k factors per round and the running sums over the rounds.
    rounding += gamma_ld(2.0 * k + turn + support + 8);
    r.bound = extra_bound + rounding;
    if (!closed) {
        // Every piece on a stuck square: nobody finishes. Unresolved mass is in the bound.
        long double nei = 1;
        for (int j = 0; j < k; ++j) nei *= ser[j].stuck();
        r.p_neither = nei;
    }
    finish_result(r, subset, k);
    r.target_met = r.bound <= cfg.wanted;
    return r;
}

PieceTrack record_track(const Chain& chain, int start, long double threshold, int max_turns) {
    Series s(chain, start);
    PieceTrack t;
    t.f.push_back(0);
    t.alive.push_back(s.alive());
    t.stuck.push_back(s.stuck());
    while (s.alive() > threshold && s.turn() < max_turns) {
        long double x = s.step();
        t.f.push_back(x);
        t.alive.push_back(s.alive());
        t.stuck.push_back(s.stuck());
    }
    t.complete = s.alive() <= threshold;
    t.rounding = s.rounding_bound();
    return t;
}

std::optional<RaceResult> race_from_tracks(const std::vector<const PieceTrack*>& tr, RaceOrder order,
                                           long double target, long double accept) {
    const int k = static_cast<int>(tr.size());
    if (k < 2 || k > max_race_pieces) throw InputError(fmt::format("a race takes 2 to {} pieces, got {}", max_race_pieces, k));
    // Combine up to the shortest incomplete track (or the longest complete one);
    // complete tracks are frozen after their end, their live mass in the bound.
    std::size_t horizon = 0;
    bool any_incomplete = false;
    for (const auto* t : tr) {
        const std::size_t last = t->f.size() - 1;
        if (!t->complete) {
            horizon = any_incomplete ? std::min(horizon, last) : last;
            any_incomplete = true;
        }
    }
    if (!any_incomplete)
        for (const auto* t : tr) horizon = std::max(horizon, t->f.size() - 1);
    std::vector<long double> subset(1u << k, 0), w(1u << k, 0);
    std::vector<long double> f(k), s(k, 1), sp(k, 1), alive(k), stuck(k);
    for (std::size_t t = 1; t <= horizon; ++t) {
        for (int j = 0; j < k; ++j) {
            const std::size_t i = std::min(t, tr[j]->f.size() - 1);
            sp[j] = s[j];
            f[j] = t < tr[j]->f.size() ? tr[j]->f[t] : 0.0L;
            s[j] = tr[j]->alive[i] + tr[j]->stuck[i];
        }
        add_round(subset, w, k, order, f.data(), s.data(), sp.data());
        // Stop as soon as what is still unresolved is far below the target.
        for (int j = 0; j < k; ++j) {
            const std::size_t i = std::min(t, tr[j]->f.size() - 1);
            alive[j] = tr[j]->alive[i];
            stuck[j] = tr[j]->stuck[i];
        }
        if (unresolved(k, alive.data(), stuck.data()) < target / 16) {
            horizon = t;
            break;
        }
    }
    long double frozen = 0, rounding = 0;
    for (int j = 0; j < k; ++j) {
        const std::size_t i = std::min(horizon, tr[j]->f.size() - 1);
        alive[j] = tr[j]->alive[i];
        stuck[j] = tr[j]->stuck[i];
        if (tr[j]->f.size() - 1 < horizon) frozen += alive[j];
        rounding += tr[j]->rounding;
    }
    RaceResult r;
    r.bound = unresolved(k, alive.data(), stuck.data()) + frozen + rounding +
              gamma_ld(2.0 * k + static_cast<double>(horizon) + 8);
    if (r.bound > accept) return std::nullopt;
    long double nei = 1;
    for (int j = 0; j < k; ++j) nei *= stuck[j];
    r.p_neither = nei;
    r.method = RaceMethod::series;
    r.rounds = static_cast<int>(horizon);
    finish_result(r, subset, k);
    r.target_met = true;
    return r;
}

RaceCache::RaceCache(const Board& board, const std::vector<const Chain*>& chains, RaceOrder order,
                     const RaceSettings& settings)
    : board_(&board), chains_(chains), order_(order), settings_(settings), tracks_(chains.size()) {
    for (auto& t : tracks_) t.resize(static_cast<std::size_t>(board.length));
}

const PieceTrack& RaceCache::track(int option, int start) {
    auto& slot = tracks_[option][start];
    if (!slot) slot = record_track(*chains_[option], start, settings_.target / 64, 4000);
    return *slot;
}

RaceResult RaceCache::run(const std::vector<int>& picks, const std::vector<int>& starts_in) {
    std::vector<int> starts(picks.size(), 0);
    for (std::size_t i = 0; i < starts_in.size() && i < picks.size(); ++i) starts[i] = resolve_start(*board_, starts_in[i]);
    std::vector<const PieceTrack*> tr;
    for (std::size_t i = 0; i < picks.size(); ++i) tr.push_back(&track(picks[i], starts[i]));
    if (auto r = race_from_tracks(tr, order_, settings_.target, settings_.wanted)) {
        r->target_met = r->bound <= settings_.wanted;
        return *r;
    }
    ++full_races_;
    std::vector<const Chain*> ch;
    for (int p : picks) ch.push_back(chains_[p]);
    return race(ch, starts, order_, settings_);
}

}  // namespace overshoot
