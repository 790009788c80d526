// libFuzzer target: the --matrix CSV reader (tournament/matrix_csv.hpp).
// Any input either becomes a valid win matrix or throws InputError.
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "core/error.hpp"
#include "tournament/matrix_csv.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size > 65536) return 0;
    std::string_view text(reinterpret_cast<const char*>(data), size);
    try {
        overshoot::PairwiseMatrix m = overshoot::parse_matrix_csv(text, "fuzz.csv", 0.0);
        // What the reader promises: n names, probabilities in [0, 1], and
        // P(i beats j) + P(j beats i) no more than 1 (up to its 1e-9 slack).
        const std::size_t n = m.size();
        if (n == 0 || m.win.size() != n * n || m.tie.size() != n * n) std::abort();
        for (std::size_t i = 0; i < n; ++i)
            for (std::size_t j = 0; j < n; ++j) {
                if (i == j) continue;
                double w = m.win[i * n + j];
                if (!(w >= 0 && w <= 1)) std::abort();
                if (!(w + m.win[j * n + i] <= 1 + 1e-9 + 1e-12)) std::abort();
            }
    } catch (const overshoot::InputError&) {
    }
    return 0;
}
