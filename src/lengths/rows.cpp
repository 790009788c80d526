#include "lengths/rows.hpp"

#include <algorithm>
#include <vector>

#include "core/error.hpp"
#include "core/limits.hpp"

// load() and store() are inlined into every clone: no vector crosses a call
// between functions of different targets, so GCC's ABI note does not apply.
#pragma GCC diagnostic ignored "-Wpsabi"

namespace overshoot::lengths_engine {

namespace {

// Four doubles; each clone maps it onto its widest registers. Contraction into
// fused multiply-adds is off, so every clone (and the scalar loop) rounds
// each product and each sum alike: the same bits on any x86-64.
typedef double v4 __attribute__((vector_size(32)));
typedef double v4u __attribute__((vector_size(32), aligned(8)));  // unaligned loads and stores

#define ROW_KERNEL __attribute__((target_clones("avx512f", "avx2", "default"), optimize("fp-contract=off")))

inline v4 load(const double* p) { return *reinterpret_cast<const v4u*>(p); }
inline void store(double* p, v4 v) { *reinterpret_cast<v4u*>(p) = v; }

// out[b] = (sum_e p[e] src[e][b]) / den over b in [lo, hi), terms added in
// the order e = 0, 1, ... starting from 0 (as the cell-by-cell loop adds them).
// A null source adds nothing (a finished first piece adds no loss).
ROW_KERNEL void weighted_rows(double* __restrict out, const double* const* src, const double* p, int k, double den,
                              int lo, int hi) {
    int b = lo;
    const bool divide = den != 1.0;
    for (; b + 8 <= hi; b += 8) {
        v4 x0 = {0, 0, 0, 0}, x1 = {0, 0, 0, 0};
        for (int e = 0; e < k; ++e) {
            if (!src[e]) continue;
            __builtin_prefetch(src[e] + b + 32);  // many rows side by side (see block_rows4)
            x0 += p[e] * load(src[e] + b);
            x1 += p[e] * load(src[e] + b + 4);
        }
        if (divide) {
            x0 /= den;
            x1 /= den;
        }
        store(out + b, x0);
        store(out + b + 4, x1);
    }
    for (; b < hi; ++b) {
        double x = 0;
        for (int e = 0; e < k; ++e)
            if (src[e]) x += p[e] * src[e][b];
        out[b] = divide ? x / den : x;
    }
}

// R rows at once (R = 2, 3 or 4) in the first piece's free region, where the
// smallest move is at least R so that no row of the block reads another.
// Each source row s is loaded once for every row it feeds: row a + r takes the
// move m = a + r - s with weight pz[m] (pz is zero-padded: adding +0 leaves a
// non-negative sum unchanged). Source rows are visited from the nearest
// (smallest move) outwards, so every output adds its terms in the order of
// increasing moves, as weighted_rows does: the same bits. out[r] receives row
// a + r divided by den; rows_w[i], rows_l[i] are the G rows of distance
// a - mmax + i, up to a + R - 1 - mmin.
#define BLOCK_ROWS(NAME, R)                                                                                         \
    ROW_KERNEL void NAME(double* const* outw, double* const* outl, const double* const* rows_w,                    \
                         const double* const* rows_l, const double* pz, int mmin, int mmax, int a, double den,      \
                         int lo, int hi) {                                                                          \
        const bool divide = den != 1.0;                                                                             \
        const int top = a + R - 1 - mmin, bottom = a - mmax;                                                        \
        int b = lo;                                                                                                 \
        for (; b + 4 <= hi; b += 4) {                                                                               \
            v4 w[R], l[R];                                                                                          \
            _Pragma("GCC unroll 4") for (int r = 0; r < R; ++r) w[r] = l[r] = v4{0, 0, 0, 0};                       \
            for (int s = top; s >= bottom; --s) {                                                                   \
                /* Hundreds of rows are read side by side: no hardware stream  */                                  \
                /* detector follows them all, so ask for the next lines early. */                                  \
                __builtin_prefetch(rows_w[s - bottom] + b + 32);                                                             \
                __builtin_prefetch(rows_l[s - bottom] + b + 32);                                                             \
                const v4 xw = load(rows_w[s - bottom] + b), xl = load(rows_l[s - bottom] + b);                                        \
                const double* p = pz + (a - s);                                                                     \
                _Pragma("GCC unroll 4") for (int r = 0; r < R; ++r) {                                               \
                    w[r] += p[r] * xw;                                                                              \
                    l[r] += p[r] * xl;                                                                              \
                }                                                                                                   \
            }                                                                                                       \
            _Pragma("GCC unroll 4") for (int r = 0; r < R; ++r) {                                                   \
                store(outw[r] + b, divide ? w[r] / den : w[r]);                                                     \
                store(outl[r] + b, divide ? l[r] / den : l[r]);                                                     \
            }                                                                                                       \
        }                                                                                                           \
        for (; b < hi; ++b)                                                                                         \
            for (int r = 0; r < R; ++r) {                                                                           \
                double xw = 0, xl = 0;                                                                              \
                for (int s = top; s >= bottom; --s) {                                                               \
                    xw += pz[a + r - s] * rows_w[s - bottom][b];                                                             \
                    xl += pz[a + r - s] * rows_l[s - bottom][b];                                                             \
                }                                                                                                   \
                outw[r][b] = divide ? xw / den : xw;                                                                \
                outl[r][b] = divide ? xl / den : xl;                                                                \
            }                                                                                                       \
    }
BLOCK_ROWS(block_rows4, 4)
BLOCK_ROWS(block_rows3, 3)
BLOCK_ROWS(block_rows2, 2)
#undef BLOCK_ROWS

// The second piece's free moves on one cell b of a finished row v, in four
// partial sums (i mod 4; the last moves into the first): the loop is bound
// by the latency of one chain of additions otherwise (the bound does not
// depend on the order).
inline void free_terms(const int* mv, const double* mp, int nm, int b, const double* vw, const double* vl, double& yw,
                       double& yl) {
    double w0 = 0, w1 = 0, w2 = 0, w3 = 0, l0 = 0, l1 = 0, l2 = 0, l3 = 0;
    int i = 0;
    for (; i + 4 <= nm; i += 4) {
        w0 += mp[i] * vw[b - mv[i]];
        l0 += mp[i] * vl[b - mv[i]];
        w1 += mp[i + 1] * vw[b - mv[i + 1]];
        l1 += mp[i + 1] * vl[b - mv[i + 1]];
        w2 += mp[i + 2] * vw[b - mv[i + 2]];
        l2 += mp[i + 2] * vl[b - mv[i + 2]];
        w3 += mp[i + 3] * vw[b - mv[i + 3]];
        l3 += mp[i + 3] * vl[b - mv[i + 3]];
    }
    for (; i < nm; ++i) {
        w0 += mp[i] * vw[b - mv[i]];
        l0 += mp[i] * vl[b - mv[i]];
    }
    yw = (w0 + w1) + (w2 + w3);
    yl = (l0 + l1) + (l2 + l3);
}

// free_terms on four cells b..b+3 side by side, lane by lane in its order
// (inlined into every clone of the kernels below).
__attribute__((always_inline)) inline void free_terms4(const int* mv, const double* mp, int nm, int b, const double* vw, const double* vl, v4& yw,
                        v4& yl) {
    const int n4 = nm - nm % 4;
    v4 w0 = {0, 0, 0, 0}, w1 = w0, w2 = w0, w3 = w0, l0 = w0, l1 = w0, l2 = w0, l3 = w0;
    int i = 0;
    for (; i < n4; i += 4) {
        w0 += mp[i] * load(vw + b - mv[i]);
        l0 += mp[i] * load(vl + b - mv[i]);
        w1 += mp[i + 1] * load(vw + b - mv[i + 1]);
        l1 += mp[i + 1] * load(vl + b - mv[i + 1]);
        w2 += mp[i + 2] * load(vw + b - mv[i + 2]);
        l2 += mp[i + 2] * load(vl + b - mv[i + 2]);
        w3 += mp[i + 3] * load(vw + b - mv[i + 3]);
        l3 += mp[i + 3] * load(vl + b - mv[i + 3]);
    }
    for (; i < nm; ++i) {
        w0 += mp[i] * load(vw + b - mv[i]);
        l0 += mp[i] * load(vl + b - mv[i]);
    }
    yw = (w0 + w1) + (w2 + w3);
    yl = (l0 + l1) + (l2 + l3);
}

// The second piece's free moves on a finished row v: for b in [lo, hi),
// y(b) = sum_i mp[i] v(b - mv[i]) in four partial sums (i mod 4; the last
// moves into the first), then g(b) = stay(b) v(b) + y(b). Same order as the
// cell-by-cell loop.
ROW_KERNEL void shifted_rows(const double* __restrict vw, const double* __restrict vl, double* __restrict gw,
                             double* __restrict gl, const int* mv, const double* mp, int nm, const double* stay,
                             int lo, int hi) {
    int b = lo;
    for (; b + 4 <= hi; b += 4) {
        v4 yw, yl;
        free_terms4(mv, mp, nm, b, vw, vl, yw, yl);
        const v4 s = load(stay + b);
        store(gw + b, s * load(vw + b) + yw);
        store(gl + b, s * load(vl + b) + yl);
    }
    for (; b < hi; ++b) {
        double yw, yl;
        free_terms(mv, mp, nm, b, vw, vl, yw, yl);
        gw[b] = stay[b] * vw[b] + yw;
        gl[b] = stay[b] * vl[b] + yl;
    }
}

// The second piece's zone rows (explicit transitions) on cell b.
inline void zone_terms(const DistanceModel& B, int b, const double* vw, const double* vl, double& yw, double& yl) {
    yw = 0;
    yl = 0;
    for (int e = B.zone_row[b]; e < B.zone_row[b + 1]; ++e) {
        const int to = B.zone_to[e];
        const double p = B.zone_p[e];
        if (to == 0) {
            yl += p;
        } else {
            yw += p * vw[to];
            yl += p * vl[to];
        }
    }
}


// The second piece's zone rows on a finished row v, for b in [lo, hi), when
// every zone row is the piece's moves below b in increasing order followed by
// its finishing entry (zone_as_moves): y(b) = sum_i mp[i] v(b - mv[i]) over
// the moves mv[i] < b, then yl(b) += fin(b). Lanes b side by side; a lane adds
// +0 for a move that does not fit (v is 0 at 0 and below: the caller pads 8
// zeros before the row), so each lane adds exactly zone_terms' terms in its
// order: the same bits.
ROW_KERNEL void zone_moves(const double* vw, const double* vl, double* __restrict yw, double* __restrict yl,
                           const int* mv, const double* mp, int nm, const double* fin, int lo, int hi) {
    int b = lo;
    for (; b + 8 <= hi; b += 8) {
        v4 w0 = {0, 0, 0, 0}, w1 = w0, l0 = w0, l1 = w0;
        for (int i = 0; i < nm && mv[i] <= b + 7; ++i) {
            w0 += mp[i] * load(vw + b - mv[i]);
            w1 += mp[i] * load(vw + b + 4 - mv[i]);
            l0 += mp[i] * load(vl + b - mv[i]);
            l1 += mp[i] * load(vl + b + 4 - mv[i]);
        }
        store(yw + b, w0);
        store(yw + b + 4, w1);
        store(yl + b, l0 + load(fin + b));
        store(yl + b + 4, l1 + load(fin + b + 4));
    }
    for (; b < hi; ++b) {
        double w = 0, l = 0;
        for (int i = 0; i < nm && mv[i] < b; ++i) {
            w += mp[i] * vw[b - mv[i]];
            l += mp[i] * vl[b - mv[i]];
        }
        yw[b] = w;
        yl[b] = l + fin[b];
    }
}

// True when every zone row b <= zb of the piece is its moves m < b (to b - m,
// with the moves' own probabilities) in increasing order, then at most one
// finishing entry, whose probability goes to fin[b] (0 when there is none).
bool zone_as_moves(const DistanceModel& B, int zb, std::vector<double>& fin) {
    fin.assign(static_cast<std::size_t>(zb) + 8, 0.0);
    for (int b = 1; b <= zb; ++b) {
        int e = B.zone_row[b];
        const int end = B.zone_row[b + 1];
        for (std::size_t i = 0; i < B.moves.size() && B.moves[i] < b; ++i, ++e)
            if (e >= end || B.zone_to[e] != b - B.moves[i] || B.zone_p[e] != B.move_p[i]) return false;
        if (e < end && B.zone_to[e] == 0) fin[b] = B.zone_p[e++];
        if (e != end) return false;
    }
    return true;
}

// Buffers kept between calls on one thread (a hunt runs hundreds of pairs on
// each): fresh pages cost more than the rows written on them. Buffers past
// 32 MiB are let go after the call.
struct Workspace {
    std::vector<double> gw, gl, vbuf, hw, xw, xl, xbuf, yw, yl, fin, fin_a, zeros, zx;
};
Workspace& workspace() {
    static thread_local Workspace w;
    return w;
}
void let_go_if_large(std::vector<double>& v) {
    if (v.capacity() * sizeof(double) > (std::size_t{32} << 20)) std::vector<double>().swap(v);
}

// One cell's closed-form self-loop: V = (X + sa Y) / (la + sa lb), with
// 1 - sa sb written as la + sa lb (no cancellation for heavy options), then
// G = sb V + Y. A cell where both stay for sure is a shared stuck state (0).
inline void solve_cell(double xw, double xl, double yw, double yl, double sa, double la, double lb, double sb,
                       double& vw, double& vl, double& gw, double& gl) {
    const double den = la + sa * lb;
    double w = 0, l = 0;
    if (den > 0) {
        w = (xw + sa * yw) / den;
        l = (xl + sa * yl) / den;
    }
    vw = w;
    vl = l;
    gw = sb * w + yw;
    gl = sb * l + yl;
}

// A row where the first piece may stay (its zone rows, or a move of 0), on
// the second piece's free cells b in [lo, hi): Y from the finished cells
// b - mv[i] in four partial sums (as free_terms), then solve_cell's closed
// form V = (X + sa Y) / (la + sa lb(b)) (0 where that is 0) and G = sb V + Y.
// A cell reads cells at least mv[0] before it, so with mv[0] >= 4 four cells
// side by side read only finished ones; each lane does solve_cell's and
// free_terms' operations in their order: the same bits.
ROW_KERNEL void loop_cells(double* vw, double* vl, double* __restrict gw, double* __restrict gl,
                           const double* __restrict xw, const double* __restrict xl, const int* mv, const double* mp,
                           int nm, const double* lb, const double* sb, double sa, double la, int lo, int hi) {
    const v4 zero = {0, 0, 0, 0};
    int b = lo;
    for (; b + 4 <= hi; b += 4) {
        v4 yw, yl;
        free_terms4(mv, mp, nm, b, vw, vl, yw, yl);
        const v4 den = la + sa * load(lb + b);
        const v4 w = den > zero ? (load(xw + b) + sa * yw) / den : zero;
        const v4 l = den > zero ? (load(xl + b) + sa * yl) / den : zero;
        store(vw + b, w);
        store(vl + b, l);
        const v4 s = load(sb + b);
        store(gw + b, s * w + yw);
        store(gl + b, s * l + yl);
    }
    for (; b < hi; ++b) {
        double yw, yl;
        free_terms(mv, mp, nm, b, vw, vl, yw, yl);
        solve_cell(xw[b], xl[b], yw, yl, sa, la, lb[b], sb[b], vw[b], vl[b], gw[b], gl[b]);
    }
}

}  // namespace

RowCounts diagonal_rows(const DistanceModel& A, const DistanceModel& B, bool a_first, int L, double* dw, double* dl,
                        bool vectorised, std::atomic<bool>* cancel, Strip* strip) {
    const int ring = A.max_move + 1;
    // A strip also keeps phi on the band: z_A rows and z_B columns of L + 1.
    const std::uint64_t band = strip ? static_cast<std::uint64_t>(strip->za + strip->zb) : 0;
    limits::check_memory((static_cast<std::uint64_t>(ring + 12) + band) * (L + 1) * 2 * sizeof(double),
                         "the pair programme of this sweep");
    const std::size_t stride = static_cast<std::size_t>(L) + 1;
    // G(a', b): the value once the first piece has moved to a' and before the
    // second moves; rows kept in a ring of max-move + 1.
    Workspace& ws = workspace();
    std::vector<double>& gw = ws.gw;
    std::vector<double>& gl = ws.gl;
    gw.assign(static_cast<std::size_t>(ring) * stride, 0);
    gl.assign(gw.size(), 0);
    // V rows: one for a row done alone, four for a block of rows; each with 8
    // zeros before distance 0 (zone_moves reads that far).
    const std::size_t vstride = stride + 8;
    std::vector<double>&hw = ws.hw, &xw = ws.xw, &xl = ws.xl, &vbuf = ws.vbuf;
    vbuf.assign(8 * vstride, 0);
    hw.assign(stride, 0);
    xw.assign(stride, 0);
    xl.assign(stride, 0);
    double* vw = vbuf.data() + 8;
    double* vl = vw + vstride;
    double* bw[4];
    double* bl[4];
    for (int r = 0; r < 4; ++r) {
        bw[r] = vw + (2 * r) * vstride;
        bl[r] = vw + (2 * r + 1) * vstride;
    }
    for (int b = 1; b <= L; ++b) hw[b] = a_first ? 1.0 : B.no_finish[b];
    const int zb = std::min(L, B.zone);
    // The first piece's free moves, as zero-padded weights by move.
    const int na = static_cast<int>(A.moves.size()), nb = static_cast<int>(B.moves.size());
    const int mmin = na > 0 ? A.moves.front() : 0, mmax = na > 0 ? A.moves.back() : 0;
    std::vector<double> pz(static_cast<std::size_t>(mmax) + 8, 0.0);
    for (int i = 0; i < na; ++i) pz[A.moves[i]] = A.move_p[i];
    // A strip does the rows beyond the first piece's zone itself (narrow rows).
    const int block = !vectorised || strip ? 1 : std::min(mmin, 4) >= 2 ? std::min(mmin, 4) : 1;
    const int za = strip ? strip->za : 0, zs = strip ? strip->zb : 0;
    // Columns 1..top and rows 1..last: all of them without a strip.
    const int top = strip ? std::min(L, strip->width) : L, last = strip ? std::min(L, strip->last_row) : L;
    std::vector<double>& xbuf = ws.xbuf;
    xbuf.assign(strip ? 8 * stride : 0, 0.0);
    // The second piece's zone rows as its moves (vectorised on finished rows),
    // unless the cell-by-cell loop is asked for.
    const bool zone_vec = vectorised && zone_as_moves(B, zb, ws.fin);
    std::vector<double>&yw_row = ws.yw, &yl_row = ws.yl;
    yw_row.assign(stride + 8, 0.0);
    yl_row.assign(stride + 8, 0.0);
    // G on the second piece's zone cells 1..hi of a finished V row, Y by zone_moves.
    auto zone_g = [&](const double* v_w, const double* v_l, int hi, double* rw, double* rl) {
        zone_moves(v_w, v_l, yw_row.data(), yl_row.data(), B.moves.data(), B.move_p.data(), nb, ws.fin.data(), 1,
                   hi + 1);
        for (int b = 1; b <= hi; ++b) {
            rw[b] = B.stay[b] * v_w[b] + yw_row[b];
            rl[b] = B.stay[b] * v_l[b] + yl_row[b];
        }
    };
    if (strip) {
        if (za != A.zone || zs != B.zone || A.p_zero != 0.0 || B.p_zero != 0.0 || na == 0 || nb == 0)
            throw InternalError("diagonal_rows: a strip needs both zones and no move of 0");
        const std::size_t rows = static_cast<std::size_t>(std::max(0, std::min(L, 2 * za) - za));
        const std::size_t cols = static_cast<std::size_t>(std::max(0, std::min(L, 2 * zs) - zs));
        strip->row_w.assign(rows * stride, 0.0);
        strip->row_l.assign(rows * stride, 0.0);
        strip->col_w.assign(cols * stride, 0.0);
        strip->col_l.assign(cols * stride, 0.0);
    }
    std::vector<const double*> sw, sl, rows_w(static_cast<std::size_t>(mmax) + 8), rows_l(rows_w.size());
    std::vector<double> sp;
    RowCounts counts;
    const auto Lu = static_cast<std::uint64_t>(L);
    // The G row of a + r from its finished V row (second piece's moves).
    auto finish_row = [&](int a, const double* v_w, const double* v_l) {
        double* rw = gw.data() + static_cast<std::size_t>(a % ring) * stride;
        double* rl = gl.data() + static_cast<std::size_t>(a % ring) * stride;
        if (zone_vec) {
            zone_g(v_w, v_l, zb, rw, rl);
        } else {
            for (int b = 1; b <= zb; ++b) {
                double yw, yl;
                zone_terms(B, b, v_w, v_l, yw, yl);
                rw[b] = B.stay[b] * v_w[b] + yw;
                rl[b] = B.stay[b] * v_l[b] + yl;
            }
        }
        shifted_rows(v_w, v_l, rw, rl, B.moves.data(), B.move_p.data(), nb, B.stay.data(), zb + 1, top + 1);
        dw[a] = v_w[a];
        dl[a] = v_l[a];
        counts.multiply_adds += 2 * static_cast<std::uint64_t>(nb) * Lu;
        ++counts.vector_rows;
    };
    // A row of the free region with no self-loop: the block may start here.
    auto free_row = [&](int a) { return a > A.zone && a <= L && A.stay[a] == 0.0 && A.leave[a] == A.leave[A.zone + 1]; };
    // A row beyond the first piece's zone under a strip: the cells of R
    // (b <= zb) as the cell loop does them, phi on the free cells the band
    // needs (every column for x <= 2za, else up to 2zb), and the G row of the
    // masked V (0 on free cells), which later rows read.
    auto strip_width = [&](int a) { return a <= 2 * za ? top : std::min(top, 2 * zs); };
    // X of a strip row from the first piece's free moves, alone (blocks below).
    auto strip_x = [&](int a) {
        const int wide = strip_width(a);
        sw.clear();
        sl.clear();
        sp.clear();
        for (int i = 0; i < na; ++i) {
            const std::size_t off = static_cast<std::size_t>((a - A.moves[i]) % ring) * stride;
            sw.push_back(gw.data() + off);
            sl.push_back(gl.data() + off);
            sp.push_back(A.move_p[i]);
        }
        weighted_rows(xw.data(), sw.data(), sp.data(), na, 1.0, 1, wide + 1);
        weighted_rows(xl.data(), sl.data(), sp.data(), na, 1.0, 1, wide + 1);
        counts.multiply_adds += 2 * static_cast<std::uint64_t>(na) * static_cast<std::uint64_t>(wide);
    };
    auto strip_row = [&](int a, const double* x_w, const double* x_l) {
        const int wide = strip_width(a);
        const int zr = std::min(zs, wide), gtop = std::min(top, 2 * zs);
        const double sa = A.stay[a], la = A.leave[a];
        double* rw = gw.data() + static_cast<std::size_t>(a % ring) * stride;
        double* rl = gl.data() + static_cast<std::size_t>(a % ring) * stride;
        if (zone_vec && sa == 0.0 && la > 0) {
            // No self-loop for the first piece: V = (X + 0 Y) / (la + 0 lb) = X / la
            // on every cell at once, then Y from the finished cells (solve_cell's bits).
            for (int b = 1; b <= zr; ++b) {
                vw[b] = x_w[b] / la;
                vl[b] = x_l[b] / la;
            }
            zone_g(vw, vl, zr, rw, rl);
        } else {
            for (int b = 1; b <= zr; ++b) {
                double yw, yl;
                zone_terms(B, b, vw, vl, yw, yl);
                solve_cell(x_w[b], x_l[b], yw, yl, sa, la, B.leave[b], B.stay[b], vw[b], vl[b], rw[b], rl[b]);
            }
        }
        // phi: what the programme computes at a free cell, V = (X + 0 Y) / (la + 0 lb) = X / la.
        if (a <= 2 * za) {
            double* pw = strip->row_w.data() + static_cast<std::size_t>(a - za - 1) * stride;
            double* pl = strip->row_l.data() + static_cast<std::size_t>(a - za - 1) * stride;
            for (int b = zs + 1; b <= wide; ++b) {
                pw[L - b] = x_w[b] / la;
                pl[L - b] = x_l[b] / la;
            }
        } else {
            for (int b = zs + 1; b <= wide; ++b) {
                strip->col_w[static_cast<std::size_t>(b - zs - 1) * stride + (L - a)] = x_w[b] / la;
                strip->col_l[static_cast<std::size_t>(b - zs - 1) * stride + (L - a)] = x_l[b] / la;
            }
        }
        // The masked row: V on R, 0 on the free cells the second piece's moves read.
        std::fill(vw + zs + 1, vw + gtop + 1, 0.0);
        std::fill(vl + zs + 1, vl + gtop + 1, 0.0);
        if (gtop > zs) {
            shifted_rows(vw, vl, rw, rl, B.moves.data(), B.move_p.data(), nb, B.stay.data(), zs + 1, gtop + 1);
            counts.multiply_adds += 2 * static_cast<std::uint64_t>(nb) * static_cast<std::uint64_t>(gtop - zs);
        }
        // The ring slot last held a full row: clear what band rows would read.
        if (a - ring <= za && gtop < top) {
            std::fill(rw + gtop + 1, rw + top + 1, 0.0);
            std::fill(rl + gtop + 1, rl + top + 1, 0.0);
        }
        if (a <= zs) {
            dw[a] = vw[a];
            dl[a] = vl[a];
        }
        ++counts.scalar_rows;
    };
    // A row where the first piece may stay, from its X rows: the closed-form
    // self-loop cell by cell, the second piece's free cells side by side when
    // its smallest move is at least 4 (loop_cells).
    auto loop_row = [&](int a, const double* x_w, const double* x_l) {
        const double sa = A.stay[a], la = A.leave[a];
        double* rw = gw.data() + static_cast<std::size_t>(a % ring) * stride;
        double* rl = gl.data() + static_cast<std::size_t>(a % ring) * stride;
        const int cells = vectorised && nb > 0 && B.moves.front() >= 4 ? std::min(zb, top) : top;
        for (int b = 1; b <= cells; ++b) {
            double yw, yl;
            if (b <= zb)
                zone_terms(B, b, vw, vl, yw, yl);
            else
                free_terms(B.moves.data(), B.move_p.data(), nb, b, vw, vl, yw, yl);
            solve_cell(x_w[b], x_l[b], yw, yl, sa, la, B.leave[b], B.stay[b], vw[b], vl[b], rw[b], rl[b]);
        }
        if (cells < top)
            loop_cells(vw, vl, rw, rl, x_w, x_l, B.moves.data(), B.move_p.data(), nb, B.leave.data(), B.stay.data(),
                       sa, la, cells + 1, top + 1);
        dw[a] = vw[a];
        dl[a] = vl[a];
        counts.multiply_adds += 2 * static_cast<std::uint64_t>(nb) * Lu;
        ++counts.scalar_rows;
    };
    // The first piece's zone rows as its moves then its finishing entry: X of
    // up to four rows at once (block_rows, moves below 1 read a row of zeros),
    // then the finishing term, the last one weighted_rows would add.
    std::vector<double>& fin_a = ws.fin_a;
    const bool zone_blocks = vectorised && mmin >= 2 && zone_as_moves(A, std::min(L, A.zone), fin_a);
    std::vector<double>& zeros = ws.zeros;
    zeros.assign(zone_blocks ? stride + 8 : 0, 0.0);
    std::vector<double>& zx = ws.zx;
    zx.assign(zone_blocks ? 8 * stride : 0, 0.0);
    int last_check = 0;
    for (int a = 1; a <= last;) {
        if (cancel && a - last_check >= 16) {
            last_check = a;
            if (cancel->load(std::memory_order_relaxed)) throw Cancelled{};
        }
        if (strip && a > za) {
            // Rows that read no row of their block (smallest move >= block) go
            // together, as whole_block below; the same bits as one by one.
            const int R = vectorised ? std::min({mmin, 4, L - a + 1}) : 1;
            if (R >= 2) {
                int wide = 0;
                for (int r = 0; r < R; ++r) wide = std::max(wide, strip_width(a + r));
                for (int s2 = a - mmax; s2 <= a + R - 1 - mmin; ++s2) {
                    const std::size_t off = static_cast<std::size_t>(s2 % ring) * stride;
                    rows_w[s2 - (a - mmax)] = gw.data() + off;
                    rows_l[s2 - (a - mmax)] = gl.data() + off;
                }
                double* ow[4] = {xbuf.data(), xbuf.data() + 2 * stride, xbuf.data() + 4 * stride, xbuf.data() + 6 * stride};
                double* ol[4] = {ow[0] + stride, ow[1] + stride, ow[2] + stride, ow[3] + stride};
                auto kernel = R == 4 ? block_rows4 : R == 3 ? block_rows3 : block_rows2;
                kernel(ow, ol, rows_w.data(), rows_l.data(), pz.data(), mmin, mmax, a, 1.0, 1, wide + 1);
                counts.multiply_adds += 2 * static_cast<std::uint64_t>(na) * static_cast<std::uint64_t>(wide) * R;
                for (int r = 0; r < R; ++r) strip_row(a + r, ow[r], ol[r]);
                a += R;
                continue;
            }
            strip_x(a);
            strip_row(a, xw.data(), xl.data());
            ++a;
            continue;
        }
        bool whole_block = block > 1 && A.leave[a] > 0;
        for (int r = 0; r < block && whole_block; ++r) whole_block = free_row(a + r);
        if (whole_block) {
            double* ow[4] = {bw[0], bw[1], bw[2], bw[3]};
            double* ol[4] = {bl[0], bl[1], bl[2], bl[3]};
            // The G rows by distance, so the kernel does no ring arithmetic.
            for (int s = a - mmax; s <= a + block - 1 - mmin; ++s) {
                const std::size_t off = static_cast<std::size_t>(s % ring) * stride;
                rows_w[s - (a - mmax)] = gw.data() + off;
                rows_l[s - (a - mmax)] = gl.data() + off;
            }
            auto kernel = block == 4 ? block_rows4 : block == 3 ? block_rows3 : block_rows2;
            kernel(ow, ol, rows_w.data(), rows_l.data(), pz.data(), mmin, mmax, a, A.leave[a], 1, top + 1);
            counts.multiply_adds += 2 * static_cast<std::uint64_t>(na) * Lu * block;
            for (int r = 0; r < block; ++r) finish_row(a + r, bw[r], bl[r]);
            a += block;
            continue;
        }
        const int R = zone_blocks && a <= A.zone ? std::min({mmin, 4, A.zone - a + 1, last - a + 1}) : 1;
        if (R >= 2) {
            // Rows at distance 0 and below are not sources (a move there finishes or
            // stays): the kernel reads only from distance 1, and a row below that
            // the block still meets is zeros (adding +0).
            const int reach = std::max(mmin, std::min(mmax, a - 1));
            for (int s2 = a - reach; s2 <= a + R - 1 - mmin; ++s2) {
                const std::size_t off = s2 > 0 ? static_cast<std::size_t>(s2 % ring) * stride : 0;
                rows_w[s2 - (a - reach)] = s2 > 0 ? gw.data() + off : zeros.data();
                rows_l[s2 - (a - reach)] = s2 > 0 ? gl.data() + off : zeros.data();
            }
            double* ow[4] = {zx.data(), zx.data() + 2 * stride, zx.data() + 4 * stride, zx.data() + 6 * stride};
            double* ol[4] = {ow[0] + stride, ow[1] + stride, ow[2] + stride, ow[3] + stride};
            auto kernel = R == 4 ? block_rows4 : R == 3 ? block_rows3 : block_rows2;
            kernel(ow, ol, rows_w.data(), rows_l.data(), pz.data(), mmin, reach, a, 1.0, 1, top + 1);
            for (int r = 0; r < R; ++r) {
                const double f = fin_a[a + r];
                for (int b = 1; b <= top; ++b) ow[r][b] = ow[r][b] + f * hw[b];
                counts.multiply_adds += (2 * static_cast<std::uint64_t>(a + r) - 1) * Lu;
                loop_row(a + r, ow[r], ol[r]);
            }
            a += R;
            continue;
        }
        sw.clear();
        sl.clear();
        sp.clear();
        auto add_source = [&](int to, double p) {
            if (to == 0) {
                sw.push_back(hw.data());
                sl.push_back(nullptr);
            } else {
                const std::size_t off = static_cast<std::size_t>(to % ring) * stride;
                sw.push_back(gw.data() + off);
                sl.push_back(gl.data() + off);
            }
            sp.push_back(p);
        };
        if (a <= A.zone) {
            for (int e = A.zone_row[a]; e < A.zone_row[a + 1]; ++e) add_source(A.zone_to[e], A.zone_p[e]);
        } else {
            for (int i = 0; i < na; ++i) add_source(a - A.moves[i], A.move_p[i]);
        }
        const int k = static_cast<int>(sp.size());
        const double sa = A.stay[a], la = A.leave[a];
        const auto nl = static_cast<std::uint64_t>(std::count(sl.begin(), sl.end(), nullptr));
        counts.multiply_adds += (2 * static_cast<std::uint64_t>(k) - nl) * Lu;
        if (vectorised && sa == 0.0 && la > 0) {
            // No self-loop: v = x / la (x + 0 y = x, la + 0 lb = la: the same bits).
            weighted_rows(vw, sw.data(), sp.data(), k, la, 1, top + 1);
            weighted_rows(vl, sl.data(), sp.data(), k, la, 1, top + 1);
            finish_row(a, vw, vl);
            ++a;
            continue;
        }
        weighted_rows(xw.data(), sw.data(), sp.data(), k, 1.0, 1, top + 1);
        weighted_rows(xl.data(), sl.data(), sp.data(), k, 1.0, 1, top + 1);
        loop_row(a, xw.data(), xl.data());
        ++a;
    }
    for (auto* v : {&ws.gw, &ws.gl, &ws.vbuf, &ws.hw, &ws.xw, &ws.xl, &ws.xbuf, &ws.yw, &ws.yl, &ws.fin, &ws.fin_a,
                    &ws.zeros, &ws.zx})
        let_go_if_large(*v);
    return counts;
}

}  // namespace overshoot::lengths_engine
