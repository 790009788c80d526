#include "lengths/closure.hpp"

#include <algorithm>
#include <cmath>

#include "core/kernels.hpp"
#include "core/limits.hpp"
#include "core/parallel.hpp"
#include "lengths/rows.hpp"

#pragma GCC diagnostic ignored "-Wpsabi"

namespace overshoot::lengths_engine {

namespace {

// Edge entries of a convolution power below this are left out (their mass is
// counted in the bound), and so are the edge entries of K below trim_k.
constexpr double trim_power = 1e-20;
constexpr double trim_k = 1e-19;

// A convolution power p^{*s} on [lo, lo + p.size()).
struct Power {
    int lo = 0;
    std::vector<double> p;
};

// q = p * (one free move), up to `top`, edges below trim_power cut off (added to cut).
Power next_power(const Power& p, const DistanceModel& o, int top, double& cut, std::uint64_t& madds) {
    Power q;
    if (p.p.empty()) return q;
    const int n = static_cast<int>(p.p.size());
    q.lo = p.lo + o.moves.front();
    const int hi = std::min(top, p.lo + n - 1 + o.moves.back());
    if (hi < q.lo) {
        // Everything moved past the last distance any start reads: never read again.
        return Power{};
    }
    q.p.assign(static_cast<std::size_t>(hi - q.lo + 1), 0.0);
    for (std::size_t i = 0; i < o.moves.size(); ++i) {
        const int shift = p.lo + o.moves[i] - q.lo;
        const int count = std::min(n, hi - p.lo - o.moves[i] + 1);
        if (count <= 0) continue;
        axpy(q.p.data() + shift, p.p.data(), o.move_p[i], count);
        madds += static_cast<std::uint64_t>(count);
    }
    std::size_t first = 0, last = q.p.size();
    while (first < last && q.p[first] < trim_power) cut += q.p[first++];
    while (last > first && q.p[last - 1] < trim_power) cut += q.p[--last];
    q.lo += static_cast<int>(first);
    q.p = std::vector<double>(q.p.begin() + static_cast<std::ptrdiff_t>(first),
                              q.p.begin() + static_cast<std::ptrdiff_t>(last));
    return q;
}



// Sixteen starts at once: ow[o] += sum_j k[o - j] fw[j] (and ol with fl),
// o = 0..15. Each lane is one start and adds its n terms in order of j, so
// every clone gives the same bits (no fused multiply-adds).
__attribute__((target_clones("avx512f", "avx2", "default"), optimize("fp-contract=off"))) void conv16(
    const double* k, const double* fw, const double* fl, int n, double* ow, double* ol) {
    // Eight lanes a vector: one register each under AVX-512, two or four otherwise.
    typedef double v8 __attribute__((vector_size(64)));
    typedef double v8u __attribute__((vector_size(64), aligned(8)));
    auto load8 = [](const double* p) { return *reinterpret_cast<const v8u*>(p); };
    v8 w0 = {0, 0, 0, 0, 0, 0, 0, 0}, w1 = w0, l0 = w0, l1 = w0;
    for (int j = 0; j < n; ++j) {
        const double* c = k - j;
        const v8 k0 = load8(c), k1 = load8(c + 8);
        const double pw = fw[j], pl = fl[j];
        w0 += k0 * pw;
        w1 += k1 * pw;
        l0 += k0 * pl;
        l1 += k1 * pl;
    }
    *reinterpret_cast<v8u*>(ow) = load8(ow) + w0;
    *reinterpret_cast<v8u*>(ow + 8) = load8(ow + 8) + w1;
    *reinterpret_cast<v8u*>(ol) = load8(ol) + l0;
    *reinterpret_cast<v8u*>(ol + 8) = load8(ol + 8) + l1;
}

// dst[i] += a[i] b[i]: one round's share of a row of K.
__attribute__((target_clones("avx2", "default"), optimize("O3", "tree-vectorize", "fp-contract=off"))) void multiply_add(
    double* __restrict dst, const double* __restrict a, const double* __restrict b, int n) {
    for (int i = 0; i < n; ++i) dst[i] += a[i] * b[i];
}

// Two rounds in one pass: dst[i] = (dst[i] + a[i] b[i]) + c[i] e[i], the same
// bits as two passes, with one load and store of dst instead of two.
__attribute__((target_clones("avx2", "default"), optimize("O3", "tree-vectorize", "fp-contract=off"))) void multiply_add2(
    double* __restrict dst, const double* __restrict a, const double* __restrict b, const double* __restrict c,
    const double* __restrict e, int n) {
    for (int i = 0; i < n; ++i) dst[i] = (dst[i] + a[i] * b[i]) + c[i] * e[i];
}

// K(u, v) by rows u = 0..rows-1, each on its window [lo[u], hi[u]] (empty when hi < lo).
struct Banded {
    std::vector<int> lo, hi;
    std::vector<std::size_t> off;
    std::vector<double> k;
    const double* row(int u) const { return k.data() + off[u] - lo[u]; }  // row(u)[v], v in [lo, hi]
};

void allocate(Banded& m, const char* what) {
    std::size_t total = 0;
    m.off.assign(m.lo.size(), 0);
    for (std::size_t u = 0; u < m.lo.size(); ++u) {
        m.off[u] = total;
        if (m.hi[u] >= m.lo[u]) total += static_cast<std::size_t>(m.hi[u] - m.lo[u] + 1);
    }
    limits::check_memory(total * sizeof(double), what);
    m.k.assign(total, 0.0);
}

double spread(double sd, double s) { return 20 * sd * std::sqrt(std::max(s, 0.0)) + 1; }

}  // namespace

bool closure_applies(const DistanceModel& A, const DistanceModel& B) {
    return A.p_zero == 0.0 && B.p_zero == 0.0 && !A.moves.empty() && !B.moves.empty();
}

double closure_work(const DistanceModel& A, const DistanceModel& B, int L) {
    const double za = A.zone, zb = B.zone, ka = static_cast<double>(A.moves.size()) + 1,
                 kb = static_cast<double>(B.moves.size()) + 1;
    // The strip: za full rows, za band rows (first piece's moves), narrow rows.
    double work = 2 * L * (za * (ka + kb) + za * ka + 2 * zb * ka + zb * kb);
    // K from the convolution powers, and each start's sums near the zone the faster piece enters.
    const double sa = std::sqrt(std::max(A.variance, 0.0)), sb = std::sqrt(std::max(B.variance, 0.0));
    const double rounds = L / std::min(A.mean, B.mean) + 1;
    const double wa = A.mean >= B.mean ? 1 : 0;
    const double mf = wa ? A.mean : B.mean, ms = wa ? B.mean : A.mean, sf = wa ? sa : sb, ss = wa ? sb : sa;
    const double zf = wa ? za : zb;
    const double reach = L / mf;  // rounds until the faster piece is in its zone
    // K's products stream three arrays: measured about twice a row's multiply-add.
    for (double s = 1; s <= std::min(rounds, reach + 20); s += 1)
        work += 2 * std::min<double>(L, spread(sa, s)) * std::min<double>(L, spread(sb, s));
    const double per_round = std::sqrt(ss * ss + ms * ms * sf * sf / (mf * mf));
    for (int d = 1; d <= L; d += 16) work += 16 * 2 * zf * std::min<double>(d, spread(per_round, d / mf));
    return work;
}

ClosureCounts closure_rows(const DistanceModel& A, const DistanceModel& B, bool a_first, int L, double* dw, double* dl,
                           std::vector<double>& depth, std::vector<double>& cut, std::atomic<bool>* cancel,
                           int threads) {
    ClosureCounts counts;
    const int za = A.zone, zb = B.zone;
    depth.assign(static_cast<std::size_t>(L) + 1, 0.0);
    cut.assign(static_cast<std::size_t>(L) + 1, 0.0);
    const int first = std::max(za, zb) + 1;
    Strip strip;
    strip.za = za;
    strip.zb = zb;
    if (first > L) {
        strip.width = strip.last_row = L;
        diagonal_rows(A, B, a_first, L, dw, dl, true, cancel, &strip);
        return counts;
    }
    // Distances walked freely: u = d - x by the first piece (x > za), v = d - y by the second.
    const int umax = L - za - 1, vmax = L - zb - 1;
    std::vector<Power> pa(1), pb(1);
    pa[0].p = {1.0};
    pb[0].p = {1.0};
    double cut_a = 0, cut_b = 0;
    while (!pa.back().p.empty() && !pb.back().p.empty()) {
        if (cancel && cancel->load(std::memory_order_relaxed)) throw Cancelled{};
        Power na = next_power(pa.back(), A, umax, cut_a, counts.multiply_adds);
        Power nb = next_power(pb.back(), B, vmax, cut_b, counts.multiply_adds);
        pa.push_back(std::move(na));
        pb.push_back(std::move(nb));
    }
    const int rounds = static_cast<int>(pa.size()) - 1;  // rounds 0..rounds-1 have both powers
    counts.rounds = rounds;
    // K(u, v) = sum_s p_A^{*s}(u) p_B^{*s}(v) by offsets delta = u - v: row
    // delta holds K(u, u - delta) by u, so each round adds a product of two
    // contiguous slices. For a fixed delta the sum over the band is then a
    // convolution (rows: d = u + x; columns: d = u - delta + y).
    int dlo = 1 << 30, dhi = -(1 << 30);
    for (int s = 0; s < rounds; ++s) {
        dlo = std::min(dlo, pa[s].lo - (pb[s].lo + static_cast<int>(pb[s].p.size()) - 1));
        dhi = std::max(dhi, pa[s].lo + static_cast<int>(pa[s].p.size()) - 1 - pb[s].lo);
    }
    Banded D;  // D.row(delta - dlo)[u] = K(u, u - delta)
    D.lo.assign(static_cast<std::size_t>(dhi - dlo) + 1, umax + 1);
    D.hi.assign(D.lo.size(), -1);
    // The u of round s on row delta: supp a_s and supp b_s + delta.
    auto span = [&](int s, int delta, int& lo, int& hi) {
        lo = std::max(pa[s].lo, pb[s].lo + delta);
        hi = std::min(pa[s].lo + static_cast<int>(pa[s].p.size()), pb[s].lo + static_cast<int>(pb[s].p.size()) + delta) - 1;
    };
    for (int s = 0; s < rounds; ++s) {
        const int from = pa[s].lo - (pb[s].lo + static_cast<int>(pb[s].p.size()) - 1);
        const int to = pa[s].lo + static_cast<int>(pa[s].p.size()) - 1 - pb[s].lo;
        for (int delta = from; delta <= to; ++delta) {
            int lo, hi;
            span(s, delta, lo, hi);
            const auto e = static_cast<std::size_t>(delta - dlo);
            D.lo[e] = std::min(D.lo[e], lo);
            D.hi[e] = std::max(D.hi[e], hi);
        }
    }
    const int pad = std::max(za, zb) + 32;
    for (std::size_t e = 0; e < D.lo.size(); ++e)
        if (D.hi[e] >= D.lo[e]) {
            D.lo[e] -= pad;
            D.hi[e] += pad;
        }
    allocate(D, "the end-zone closure of this sweep");
    // Row by row, rounds inner: the row stays in the first-level cache while
    // every round adds to it (each entry adds its rounds in order of s).
    std::vector<int> round_from(static_cast<std::size_t>(rounds)), round_to(round_from.size());
    for (int s = 0; s < rounds; ++s) {
        round_from[s] = pa[s].lo - (pb[s].lo + static_cast<int>(pb[s].p.size()) - 1);
        round_to[s] = pa[s].lo + static_cast<int>(pa[s].p.size()) - 1 - pb[s].lo;
    }
    // Rows in blocks of 64 offsets, one job each (a job writes only its rows:
    // the same bits whatever the number of threads).
    const std::size_t offsets = D.lo.size(), blocks = (offsets + 63) / 64;
    std::vector<std::uint64_t> block_madds(blocks, 0);
    std::vector<double> row_cut(offsets, 0.0);
    std::vector<int> klo(offsets), khi(offsets);
    parallel_for(
        blocks, threads,
        [&](std::size_t c) {
            for (std::size_t e = 64 * c; e < std::min(offsets, 64 * c + 64); ++e) {
                klo[e] = D.lo[e] + pad;
                khi[e] = D.hi[e] - pad;
                if (D.hi[e] < D.lo[e]) continue;
                const int delta = static_cast<int>(e) + dlo;
                double* row = D.k.data() + D.off[e] - D.lo[e];
                // Round s on [lo, hi] of this row; rounds go in pairs (each entry
                // still adds its rounds in order of s).
                auto one = [&](int s, int lo, int hi) {
                    if (lo <= hi)
                        multiply_add(row + lo, pa[s].p.data() + (lo - pa[s].lo),
                                     pb[s].p.data() + (lo - delta - pb[s].lo), hi - lo + 1);
                };
                int held = -1, hlo = 0, hhi = -1;
                for (int s = 0; s < rounds; ++s) {
                    if (delta < round_from[s] || delta > round_to[s]) continue;
                    int lo, hi;
                    span(s, delta, lo, hi);
                    if (lo > hi) continue;
                    block_madds[c] += static_cast<std::uint64_t>(hi - lo + 1);
                    if (held < 0) {
                        held = s;
                        hlo = lo;
                        hhi = hi;
                        continue;
                    }
                    // Both rounds on the common part, each alone on the rest:
                    // the held round's own part first, then the fused part, then s's.
                    const int clo = std::max(hlo, lo), chi = std::min(hhi, hi);
                    if (clo > chi) {
                        one(held, hlo, hhi);
                        one(s, lo, hi);
                    } else {
                        one(held, hlo, clo - 1);
                        one(held, chi + 1, hhi);
                        one(s, lo, clo - 1);
                        multiply_add2(row + clo, pa[held].p.data() + (clo - pa[held].lo),
                                      pb[held].p.data() + (clo - delta - pb[held].lo), pa[s].p.data() + (clo - pa[s].lo),
                                      pb[s].p.data() + (clo - delta - pb[s].lo), chi - clo + 1);
                        one(s, chi + 1, hi);
                    }
                    held = -1;
                }
                if (held >= 0) one(held, hlo, hhi);
                // Trim the row's edges (their sum goes to the bound: a start reads each entry at most once).
                while (klo[e] <= khi[e] && row[klo[e]] < trim_k) {
                    row_cut[e] += row[klo[e]];
                    row[klo[e]++] = 0.0;
                }
                while (khi[e] >= klo[e] && row[khi[e]] < trim_k) {
                    row_cut[e] += row[khi[e]];
                    row[khi[e]--] = 0.0;
                }
            }
        },
        cancel);
    if (cancel && cancel->load()) throw Cancelled{};
    double cut_k = 0;
    int klo_all = 1 << 30, khi_all = -(1 << 30);
    for (std::size_t e = 0; e < offsets; ++e) {
        cut_k += row_cut[e];
        if (khi[e] >= klo[e]) {
            klo_all = std::min(klo_all, static_cast<int>(e) + dlo);
            khi_all = std::max(khi_all, static_cast<int>(e) + dlo);
        }
    }
    for (std::uint64_t m : block_madds) counts.multiply_adds += m;
    // The strip, on the columns and rows the sums below read: band rows up
    // to y = 2za + delta, band columns up to x = 2zb - delta.
    const int used_lo = std::min(klo_all, 0), used_hi = std::max(khi_all, 0);
    strip.width = std::min(L, std::max(2 * za + used_hi, 2 * zb));
    strip.last_row = std::min(L, std::max({2 * za, 2 * zb - used_lo, zb}));
    counts.multiply_adds += diagonal_rows(A, B, a_first, L, dw, dl, true, cancel, &strip).multiply_adds;
    const std::size_t stride = static_cast<std::size_t>(L) + 1;
    // Each block of 64 offsets sums into its own totals, added up in block
    // order afterwards: a start's sum adds at most 64 + blocks terms in a row,
    // the same bits whatever the number of threads.
    const std::size_t width = static_cast<std::size_t>(L) + 48;
    std::vector<double> part_w(blocks * width, 0.0), part_l(part_w.size(), 0.0);
    std::vector<int> block_widest(blocks, 0);
    const int nx = std::max(0, std::min(L, 2 * za) - za), ny = std::max(0, std::min(L, 2 * zb) - zb);
    std::fill(block_madds.begin(), block_madds.end(), 0);
    parallel_for(
        blocks, threads,
        [&](std::size_t c) {
            double* out_w = part_w.data() + c * width;
            double* out_l = part_l.data() + c * width;
            std::vector<double> fw(static_cast<std::size_t>(std::max(nx, ny)) + 1), fl(fw.size());
            // out[d] += sum_j k[d - p0 - j + shift] f[j] for d in [from, to] (k: the delta row by u).
            auto convolve = [&](const double* k, int k_lo, int k_hi, int n, int p0, int shift) {
                // Only the taps from the first to the last nonzero one (a zero tap adds +0).
                int j0 = 0, j1 = n - 1;
                while (j0 <= j1 && fw[j0] == 0.0 && fl[j0] == 0.0) ++j0;
                while (j1 >= j0 && fw[j1] == 0.0 && fl[j1] == 0.0) --j1;
                if (j0 > j1) return;
                n = j1 - j0 + 1;
                p0 += j0;
                const int from = std::max(first, k_lo + p0 - shift), to = std::min(L, k_hi + p0 + n - 1 - shift);
                for (int d0 = from; d0 <= to; d0 += 16) {
                    conv16(k + (d0 - p0 + shift), fw.data() + j0, fl.data() + j0, n, out_w + d0, out_l + d0);
                    block_madds[c] += 32 * static_cast<std::uint64_t>(n);
                }
                block_widest[c] = std::max(block_widest[c], n);
            };
            for (std::size_t e = 64 * c; e < std::min(offsets, 64 * c + 64); ++e) {
                if (khi[e] < klo[e]) continue;
                const int delta = static_cast<int>(e) + dlo;
                const double* k = D.row(static_cast<int>(e));  // k[u], u in [lo, hi] (padding included)
                // Band rows: x = za + 1 + j, y = x + delta in (zb, L].
                for (int j = 0; j < nx; ++j) {
                    const int x = za + 1 + j, y = x + delta;
                    const bool in = y > zb && y <= strip.width;
                    const std::size_t at = static_cast<std::size_t>(j) * stride + static_cast<std::size_t>(L - y);
                    fw[j] = in ? strip.row_w[at] : 0.0;
                    fl[j] = in ? strip.row_l[at] : 0.0;
                }
                convolve(k, klo[e], khi[e], nx, za + 1, 0);
                // Band columns: y = zb + 1 + j, x = y - delta in (2za, L].
                for (int j = 0; j < ny; ++j) {
                    const int y = zb + 1 + j, x = y - delta;
                    const bool in = x > 2 * za && x <= strip.last_row;
                    const std::size_t at = static_cast<std::size_t>(j) * stride + static_cast<std::size_t>(L - x);
                    fw[j] = in ? strip.col_w[at] : 0.0;
                    fl[j] = in ? strip.col_l[at] : 0.0;
                }
                convolve(k, klo[e], khi[e], ny, zb + 1, delta);
            }
        },
        cancel);
    if (cancel && cancel->load()) throw Cancelled{};
    int widest = 0;
    for (std::size_t c = 0; c < blocks; ++c) {
        counts.multiply_adds += block_madds[c];
        widest = std::max(widest, block_widest[c]);
    }
    const int chunks = static_cast<int>(blocks);
    for (int d = first; d <= L; ++d) {
        double w = 0, l = 0;
        for (std::size_t c = 0; c < blocks; ++c) {
            w += part_w[c * width + static_cast<std::size_t>(d)];
            l += part_l[c * width + static_cast<std::size_t>(d)];
        }
        dw[d] = w;
        dl[d] = l;
    }
    // Roundings on a path beyond the programme's: a power is s steps of at
    // most k + 1 roundings (start d reads rounds s <= d / smallest move), an
    // entry of K a product of two powers (their roundings add up) and a sum
    // over those rounds, a start's sum one product, `widest` additions per
    // offset, 64 per chunk and one per chunk.
    const double k = static_cast<double>(A.moves.size() + B.moves.size()) + 3;
    const int step = std::min(A.moves.front(), B.moves.front());
    const double sums = 2.0 + widest + 64 + chunks + 2;
    // Trimmed power mass reaches a start at most once per round it stays within reach.
    const double lost = 2 * ((umax + 1.0) * cut_a + (vmax + 1.0) * cut_b + cut_k);
    for (int d = first; d <= L; ++d) {
        const double reach = std::min(rounds, d / step + 1);
        depth[d] = reach * k + sums;
        cut[d] = lost;
    }
    return counts;
}

}  // namespace overshoot::lengths_engine
