#pragma once
// The vector peak of one core of this machine, measured: how many
// multiply-adds per second a loop of independent vector multiply-adds (no
// memory traffic) reaches, to say what fraction of it a kernel attains.
namespace overshoot {

struct VectorPeak {
    double separate = 0;  // G multiply-adds/s, product rounded then sum rounded (as our kernels do)
    double fused = 0;     // G multiply-adds/s with fused multiply-adds, where the processor has them
};

// Runs about `seconds` of CPU in total (thread CPU time, so waiting for a
// core on a busy machine does not count); the best of five repetitions.
VectorPeak measure_vector_peak(double seconds = 1.0);

}  // namespace overshoot
