// libFuzzer target: the hunt checkpoint reader (hunt/checkpoint.hpp,
// decode_checkpoint). Checkpoints outlive crashes and travel between MPI
// ranks; a damaged one must end in InputError, never a crash or a record that
// breaks the promises the hunt relies on.
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <string>

#include "core/error.hpp"
#include "hunt/checkpoint.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size > 65536) return 0;
    std::string bytes(reinterpret_cast<const char*>(data), size);
    try {
        const overshoot::Checkpoint c = overshoot::decode_checkpoint(bytes, "fuzz.ckpt");
        for (const auto& r : c.records) {
            // What the reader promises: each record inside the lengths, margins and bounds paired and in range.
            if (r.margin.size() != r.bound.size()) std::abort();
            if (r.first > c.lengths || r.margin.size() > c.lengths - r.first) std::abort();
            for (std::size_t k = 0; k < r.margin.size(); ++k)
                if (!(r.bound[k] >= 0) || !(std::fabs(r.margin[k]) <= 1 + r.bound[k])) std::abort();
        }
        // Whatever was read writes back to bytes that read the same.
        if (overshoot::encode_checkpoint(overshoot::decode_checkpoint(overshoot::encode_checkpoint(c), "again")) !=
            overshoot::encode_checkpoint(c))
            std::abort();
    } catch (const overshoot::InputError&) {
    }
    return 0;
}
