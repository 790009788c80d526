#pragma once
// Vector kernels shared by the engines: loops the compiler vectorises, with a
// run-time choice of instruction set (any x86-64 runs them; no -march=native).
// Products and sums are rounded apart (no fused multiply-add), so every
// instruction set gives the same bits.

namespace overshoot {

// dst[i] += p * src[i], i = 0..n-1.
void axpy(double* __restrict dst, const double* __restrict src, double p, int n);

}  // namespace overshoot
