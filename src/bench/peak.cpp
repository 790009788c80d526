#include "bench/peak.hpp"

#include <algorithm>
#include <ctime>

namespace overshoot {

namespace {

typedef double v4 __attribute__((vector_size(32)));

// Twelve independent chains of v = v c + d on four lanes: enough chains to
// cover the latency of a multiply and an add on two vector pipes. The clone
// for the widest vectors this processor has is picked at run time.
__attribute__((target_clones("avx512f", "avx2", "default"), optimize("fp-contract=off"), noinline)) double
separate_chains(long iterations, double c, double d) {
    v4 a[12];
    for (int j = 0; j < 12; ++j) a[j] = v4{1, 2, 3, 4} + j;
    for (long i = 0; i < iterations; ++i) {
#pragma GCC unroll 12
        for (int j = 0; j < 12; ++j) a[j] = a[j] * c + d;
    }
    v4 s = {0, 0, 0, 0};
    for (int j = 0; j < 12; ++j) s += a[j];
    return s[0] + s[1] + s[2] + s[3];
}

__attribute__((target("avx2,fma"), noinline)) double fused_chains(long iterations, double c, double d) {
    v4 a[12];
    for (int j = 0; j < 12; ++j) a[j] = v4{1, 2, 3, 4} + j;
    const v4 cc = {c, c, c, c}, dd = {d, d, d, d};
    for (long i = 0; i < iterations; ++i) {
#pragma GCC unroll 12
        for (int j = 0; j < 12; ++j) a[j] = __builtin_ia32_vfmaddpd256(a[j], cc, dd);
    }
    v4 s = {0, 0, 0, 0};
    for (int j = 0; j < 12; ++j) s += a[j];
    return s[0] + s[1] + s[2] + s[3];
}

// CPU time of this thread: on a shared machine, time spent waiting for a core
// must not count against the peak.
double thread_seconds() {
    timespec ts{};
    clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
    return static_cast<double>(ts.tv_sec) + 1e-9 * static_cast<double>(ts.tv_nsec);
}

template <class F>
double best_rate(F&& f, double seconds) {
    // Calibrate on a short run, then keep the best of five repetitions.
    long n = 1'000'000;
    double best = 0;
    volatile double sink = 0;
    for (int rep = 0; rep < 6; ++rep) {
        const double t0 = thread_seconds();
        sink = sink + f(n, 0.999999, 1e-9);
        const double dt = thread_seconds() - t0;
        if (rep == 0) {
            n = static_cast<long>(static_cast<double>(n) * (seconds / 10) / (dt > 0 ? dt : 1e-3)) + 1000;
            continue;
        }
        if (dt > 0) best = std::max(best, static_cast<double>(n) * 48.0 / dt / 1e9);
    }
    return best;
}

}  // namespace

VectorPeak measure_vector_peak(double seconds) {
    VectorPeak p;
    p.separate = best_rate(separate_chains, seconds);
    if (__builtin_cpu_supports("avx2") && __builtin_cpu_supports("fma")) p.fused = best_rate(fused_chains, seconds);
    return p;
}

}  // namespace overshoot
