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

// Convolution powers side by side, each with `power_pad` zeros on both sides,
// so that a block of 32 entries that meets a power's window reads zeros where
// it runs past it: at(s)[u] is p^{*s}(u) for u in [lo_s - power_pad, hi_s + power_pad].
constexpr int power_pad = 32;
struct PaddedPowers {
    std::vector<double> buf;
    std::vector<std::ptrdiff_t> base;  // buf index of u = 0 of round s (read only for u in range)
    std::vector<int> lo, hi;
    const double* at(int s) const { return buf.data() + base[s]; }
};

void pad_powers(const std::vector<Power>& p, int rounds, PaddedPowers& out) {
    std::size_t total = 0;
    for (int s = 0; s < rounds; ++s) total += p[s].p.size() + 2 * power_pad;
    out.buf.assign(total, 0.0);
    out.base.resize(static_cast<std::size_t>(rounds));
    out.lo.resize(out.base.size());
    out.hi.resize(out.base.size());
    std::size_t at = 0;
    for (int s = 0; s < rounds; ++s) {
        std::copy(p[s].p.begin(), p[s].p.end(), out.buf.begin() + static_cast<std::ptrdiff_t>(at + power_pad));
        out.base[s] = static_cast<std::ptrdiff_t>(at + power_pad) - p[s].lo;
        out.lo[s] = p[s].lo;
        out.hi[s] = p[s].lo + static_cast<int>(p[s].p.size()) - 1;
        at += p[s].p.size() + 2 * power_pad;
    }
}

// Eight rows of K by offsets delta0 .. delta0 + 7 at once: out[r][u] = sum
// over the listed rounds, in their order, of a[i][u] b[i][u - delta0 - r],
// for u in [ulo, uhi] and up to 15 past uhi. A round is listed when its span
// [lo[i], hi[i]] (the union over the eight rows) meets a block of 16 entries;
// where a row's own span does not reach, the block reads zeros (the powers are
// padded) and a product with a zero adds +0 to a non-negative sum, so each
// entry gets exactly the roundings of adding its rounds one by one in order of
// s. The eight rows read the same slice of a and overlapping slices of b: one
// pass over the powers from the second-level cache serves them all.
__attribute__((target_clones("avx512f", "avx2", "default"), optimize("fp-contract=off"))) void k_rows8(
    const double* const* a, const double* const* b, const int* lo, const int* hi, const int* lo_after, int n,
    int delta0, int ulo, int uhi, double* const* out) {
    typedef double v8 __attribute__((vector_size(64)));
    typedef double v8u __attribute__((vector_size(64), aligned(8)));
    auto load8 = [](const double* p) { return *reinterpret_cast<const v8u*>(p); };
    int begin = 0;
    for (int u0 = ulo; u0 <= uhi; u0 += 16) {
        // Rounds that ended before this block never come back (the block moves right).
        while (begin < n && hi[begin] < u0) ++begin;
        v8 s[8][2];
        _Pragma("GCC unroll 8") for (int r = 0; r < 8; ++r) s[r][0] = s[r][1] = v8{0, 0, 0, 0, 0, 0, 0, 0};
        for (int i = begin; i < n && lo_after[i] <= u0 + 15; ++i) {
            if (hi[i] < u0 || lo[i] > u0 + 15) continue;
            const v8 x0 = load8(a[i] + u0), x1 = load8(a[i] + u0 + 8);
            const double* y = b[i] + u0 - delta0;
            _Pragma("GCC unroll 8") for (int r = 0; r < 8; ++r) {
                s[r][0] += x0 * load8(y - r);
                s[r][1] += x1 * load8(y - r + 8);
            }
        }
        _Pragma("GCC unroll 8") for (int r = 0; r < 8; ++r) {
            *reinterpret_cast<v8u*>(out[r] + u0) = s[r][0];
            *reinterpret_cast<v8u*>(out[r] + u0 + 8) = s[r][1];
        }
    }
}

double spread(double sd, double s) { return 20 * sd * std::sqrt(std::max(s, 0.0)) + 1; }

}  // namespace

bool closure_applies(const DistanceModel& A, const DistanceModel& B) {
    return A.p_zero == 0.0 && B.p_zero == 0.0 && !A.moves.empty() && !B.moves.empty();
}

namespace {

// The estimate's parts: the strip, K, the band sums.
struct WorkParts {
    double strip = 0, k = 0, band = 0;
};

WorkParts work_parts(const DistanceModel& A, const DistanceModel& B, int L) {
    WorkParts w;
    const double za = A.zone, zb = B.zone, ka = static_cast<double>(A.moves.size()) + 1,
                 kb = static_cast<double>(B.moves.size()) + 1;
    // The strip: za full rows, za band rows (first piece's moves), narrow rows.
    w.strip = 2 * L * (za * (ka + kb) + za * ka + 2 * zb * ka + zb * kb);
    // K from the convolution powers, and each start's sums near the zone the faster piece enters.
    const double sa = std::sqrt(std::max(A.variance, 0.0)), sb = std::sqrt(std::max(B.variance, 0.0));
    const double rounds = L / std::min(A.mean, B.mean) + 1;
    const double wa = A.mean >= B.mean ? 1 : 0;
    const double mf = wa ? A.mean : B.mean, ms = wa ? B.mean : A.mean, sf = wa ? sa : sb, ss = wa ? sb : sa;
    const double zf = wa ? za : zb;
    const double reach = L / mf;  // rounds until the faster piece is in its zone
    // K's products stream three arrays: measured about twice a row's multiply-add.
    for (double s = 1; s <= std::min(rounds, reach + 20); s += 1)
        w.k += 2 * std::min<double>(L, spread(sa, s)) * std::min<double>(L, spread(sb, s));
    const double per_round = std::sqrt(ss * ss + ms * ms * sf * sf / (mf * mf));
    for (int d = 1; d <= L; d += 16) w.band += 16 * 2 * zf * std::min<double>(d, spread(per_round, d / mf));
    return w;
}

}  // namespace

double closure_work(const DistanceModel& A, const DistanceModel& B, int L) {
    const WorkParts w = work_parts(A, B, L);
    return w.strip + w.k + w.band;
}

double closure_cost(const DistanceModel& A, const DistanceModel& B, int L) {
    // Thread CPU seconds per estimated multiply-add of each part, and a fixed
    // part per race, fitted over the 404 closure pairs of the 36-option hunt
    // on lengths 7..2000 (median error 4%, 90% within 9%); the series' estimate
    // ran at 4.3e9 of its multiply-adds a second in the same run.
    const WorkParts w = work_parts(A, B, L);
    const double seconds = 1.22e-10 * w.strip + 3.8e-11 * w.k + 8.2e-12 * w.band + 2.0e-3;
    return 4.3e9 * seconds;
}

ClosureCounts closure_rows(const DistanceModel& A, const DistanceModel& B, bool a_first, int L, double* dw, double* dl,
                           std::vector<double>& depth, std::vector<double>& cut, std::atomic<bool>* cancel,
                           int threads) {
    ClosureCounts counts;
    const int za = A.zone, zb = B.zone;
    depth.assign(static_cast<std::size_t>(L) + 1, 0.0);
    cut.assign(static_cast<std::size_t>(L) + 1, 0.0);
    const int first = std::max(za, zb) + 1;
    // Buffers kept between calls on this thread, as the programme's rows
    // (rows.cpp). Jobs on other threads read them through these references
    // (a thread_local named in a job would be that thread's own).
    static thread_local Strip strip_kept;
    static thread_local PaddedPowers qa_kept, qb_kept;
    static thread_local std::vector<double> part_w_kept, part_l_kept;
    Strip& strip = strip_kept;
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
    // convolution (rows: d = u + x; columns: d = u - delta + y). Rows are built
    // one at a time and summed at once (K is never stored whole).
    std::vector<int> round_from(static_cast<std::size_t>(rounds)), round_to(round_from.size());
    int dlo = 1 << 30, dhi = -(1 << 30);
    for (int s = 0; s < rounds; ++s) {
        round_from[s] = pa[s].lo - (pb[s].lo + static_cast<int>(pb[s].p.size()) - 1);
        round_to[s] = pa[s].lo + static_cast<int>(pa[s].p.size()) - 1 - pb[s].lo;
        dlo = std::min(dlo, round_from[s]);
        dhi = std::max(dhi, round_to[s]);
    }
    PaddedPowers &qa = qa_kept, &qb = qb_kept;
    pad_powers(pa, rounds, qa);
    pad_powers(pb, rounds, qb);
    limits::check_memory((qa.buf.size() + qb.buf.size()) * sizeof(double), "the end-zone closure of this sweep");
    const std::size_t offsets = static_cast<std::size_t>(dhi - dlo) + 1, blocks = (offsets + 63) / 64;
    // A row lies on [u_lo, u_hi] (the union of its rounds' spans), stored with
    // `pad` zeros on both sides: the band sums read that far past it.
    const int pad = std::max(za, zb) + 32;
    std::vector<double> row_cut(offsets, 0.0);
    std::vector<int> klo(offsets, 0), khi(offsets, -1);
    std::vector<std::uint64_t> block_madds(blocks, 0);
    // The rounds of eight rows, in order of s, with the union of their spans.
    struct RowGroup {
        std::vector<const double*> a, b;
        std::vector<int> lo, hi, lo_after;
        std::vector<double> k;  // eight padded rows
        std::size_t len = 0;    // of one row
        const double* row[8] = {};  // row[r][u] = K(u, u - delta0 - r), null when empty
    };
    // Builds and trims rows e0 .. e0 + 7 (those below `offsets`) into w.
    auto build_rows = [&](std::size_t e0, RowGroup& w, std::uint64_t& madds) {
        const int delta0 = static_cast<int>(e0) + dlo;
        const int rows = static_cast<int>(std::min<std::size_t>(8, offsets - e0));
        w.a.clear();
        w.b.clear();
        w.lo.clear();
        w.hi.clear();
        for (int r = 0; r < 8; ++r) w.row[r] = nullptr;
        int ulo = 1 << 30, uhi = -(1 << 30);
        for (int s = 0; s < rounds; ++s) {
            if (delta0 + rows - 1 < round_from[s] || delta0 > round_to[s]) continue;
            int glo = 1 << 30, ghi = -(1 << 30);
            for (int r = 0; r < rows; ++r) {
                const int delta = delta0 + r;
                if (delta < round_from[s] || delta > round_to[s]) continue;
                const int lo = std::max(qa.lo[s], qb.lo[s] + delta), hi = std::min(qa.hi[s], qb.hi[s] + delta);
                if (lo > hi) continue;
                glo = std::min(glo, lo);
                ghi = std::max(ghi, hi);
                madds += static_cast<std::uint64_t>(hi - lo + 1);
            }
            if (glo > ghi) continue;
            w.a.push_back(qa.at(s));
            w.b.push_back(qb.at(s));
            w.lo.push_back(glo);
            w.hi.push_back(ghi);
            ulo = std::min(ulo, glo);
            uhi = std::max(uhi, ghi);
        }
        for (int r = 0; r < rows; ++r) {
            klo[e0 + r] = 0;
            khi[e0 + r] = -1;
            row_cut[e0 + r] = 0;
        }
        if (ulo > uhi) return;
        const int n = static_cast<int>(w.lo.size());
        w.lo_after.resize(static_cast<std::size_t>(n));
        for (int i = n - 1, m = 1 << 30; i >= 0; --i) w.lo_after[i] = m = std::min(m, w.lo[i]);
        // Padding, the row, and the last block's overrun (products of zeros).
        w.len = static_cast<std::size_t>(uhi - ulo + 1) + 2 * static_cast<std::size_t>(pad) + 16;
        if (w.k.size() < 8 * w.len) w.k.resize(8 * w.len);
        double* out[8];
        const int written = ulo + (uhi - ulo) / 16 * 16 + 15;
        for (int r = 0; r < 8; ++r) {
            out[r] = w.k.data() + r * w.len + pad - ulo;  // out[r][u]
            std::fill(out[r] + ulo - pad, out[r] + ulo, 0.0);
            std::fill(out[r] + written + 1, out[r] + uhi + pad + 1, 0.0);
        }
        k_rows8(w.a.data(), w.b.data(), w.lo.data(), w.hi.data(), w.lo_after.data(), n, delta0, ulo, uhi, out);
        // Trim each row's edges (their sum goes to the bound: a start reads each entry at most once).
        for (int r = 0; r < rows; ++r) {
            double* row = out[r];
            int lo = ulo, hi = uhi;
            double c = 0;
            while (lo <= hi && row[lo] < trim_k) {
                c += row[lo];
                row[lo++] = 0.0;
            }
            while (hi >= lo && row[hi] < trim_k) {
                c += row[hi];
                row[hi--] = 0.0;
            }
            row_cut[e0 + r] = c;
            if (lo > hi) continue;
            klo[e0 + r] = lo;
            khi[e0 + r] = hi;
            w.row[r] = row;
        }
    };
    // The first and last rows that are not empty once trimmed set how far the
    // strip must go; the empty rows outside them are done (their mass is cut).
    int klo_all = 1 << 30, khi_all = -(1 << 30);
    std::size_t e_first = offsets, e_last = 0;
    {
        static thread_local RowGroup w;
        std::uint64_t scan_madds = 0;  // the first and last groups are built twice
        for (std::size_t e0 = 0; e0 < offsets && e_first == offsets; e0 += 8) {
            build_rows(e0, w, scan_madds);
            for (int r = 0; r < 8 && e_first == offsets; ++r)
                if (w.row[r]) e_first = e0 + static_cast<std::size_t>(r);
        }
        if (e_first < offsets) {
            bool found = false;
            for (std::size_t e0 = (offsets - 1) / 8 * 8;; e0 -= 8) {
                build_rows(e0, w, scan_madds);
                for (int r = 7; r >= 0 && !found; --r)
                    if (w.row[r]) {
                        e_last = e0 + static_cast<std::size_t>(r);
                        found = true;
                    }
                if (found || e0 == 0) break;
            }
            klo_all = static_cast<int>(e_first) + dlo;
            khi_all = static_cast<int>(e_last) + dlo;
        }
        counts.multiply_adds += scan_madds;
    }
    if (cancel && cancel->load()) throw Cancelled{};
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
    limits::check_memory(2 * blocks * width * sizeof(double), "the end-zone closure of this sweep");
    std::vector<double>&part_w = part_w_kept, &part_l = part_l_kept;
    part_w.assign(blocks * width, 0.0);
    part_l.assign(part_w.size(), 0.0);
    std::vector<int> block_widest(blocks, 0);
    const int nx = std::max(0, std::min(L, 2 * za) - za), ny = std::max(0, std::min(L, 2 * zb) - zb);
    parallel_for(
        blocks, threads,
        [&](std::size_t c) {
            double* out_w = part_w.data() + c * width;
            double* out_l = part_l.data() + c * width;
            std::vector<double> fw(static_cast<std::size_t>(std::max(nx, ny)) + 1), fl(fw.size());
            static thread_local RowGroup w;
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
                    // Only the taps that meet the row for some start of the block:
                    // the others multiply zeros and add +0.
                    const int jlo = std::max(0, d0 - p0 + shift - k_hi);
                    const int jhi = std::min(n - 1, d0 + 15 - p0 + shift - k_lo);
                    if (jlo > jhi) continue;
                    conv16(k + (d0 - p0 + shift) - jlo, fw.data() + j0 + jlo, fl.data() + j0 + jlo, jhi - jlo + 1,
                           out_w + d0, out_l + d0);
                    block_madds[c] += 32 * static_cast<std::uint64_t>(jhi - jlo + 1);
                }
                block_widest[c] = std::max(block_widest[c], n);
            };
            std::size_t built = offsets;  // the group in w
            for (std::size_t e = 64 * c; e < std::min(offsets, 64 * c + 64); ++e) {
                if (e < e_first || e > e_last) continue;
                if (built != e / 8) build_rows((built = e / 8) * 8, w, block_madds[c]);
                const double* k = w.row[e % 8];  // k[u], u in [lo, hi] (padding included)
                if (!k) continue;
                const int delta = static_cast<int>(e) + dlo;
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
    double cut_k = 0;
    for (std::size_t e = 0; e < offsets; ++e) cut_k += row_cut[e];
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
    for (auto* v : {&strip.row_w, &strip.row_l, &strip.col_w, &strip.col_l, &part_w, &part_l, &qa.buf, &qb.buf})
        if (v->capacity() * sizeof(double) > (std::size_t{32} << 20)) std::vector<double>().swap(*v);
    return counts;
}

}  // namespace overshoot::lengths_engine
