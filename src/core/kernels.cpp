#include "core/kernels.hpp"

namespace overshoot {

// ISO mode keeps the product and the sum apart; the AVX2 clone gives the same bits.
__attribute__((target_clones("avx2", "default"), optimize("O3", "tree-vectorize"))) void axpy(
    double* __restrict dst, const double* __restrict src, double p, int n) {
    for (int i = 0; i < n; ++i) dst[i] += p * src[i];
}

}  // namespace overshoot
