// libFuzzer target: the option-spec parser (core/option.hpp). Any input must
// either parse into a well-formed distribution or throw InputError; anything
// else (a crash, a sanitizer report, another exception, a broken invariant)
// is a finding.
#include <cstdint>
#include <cstdlib>
#include <numeric>
#include <string_view>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/option.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    // Specs are typed by hand; longer inputs only slow the search down.
    if (size > 4096) return 0;
    std::string_view text(reinterpret_cast<const char*>(data), size);
    try {
        overshoot::Option o = overshoot::parse_option(text);
        // Invariants every parsed option keeps (docs/options.md): the weights
        // sum to the reduced denominator, within the documented limits.
        if (o.weight.empty() || o.denominator == 0 || o.denominator > overshoot::limits::max_denominator) std::abort();
        if (o.max_move() > overshoot::limits::max_move) std::abort();
        if (o.weight.back() == 0 && o.weight.size() > 1) std::abort();
        std::uint64_t sum = 0, g = o.denominator;
        for (std::uint64_t w : o.weight) {
            if (w > o.denominator) std::abort();
            sum += w;
            g = std::gcd(g, w);
        }
        if (sum != o.denominator || g != 1) std::abort();
    } catch (const overshoot::InputError&) {
        // A clear refusal is the expected answer to bad input.
    }
    return 0;
}
