// libFuzzer target: the family grammar (core/family.hpp) with its families by
// constraint (core/constraint_family.hpp). Any input must either expand into
// at most max_family_size well-formed options or throw InputError (LimitError
// included); anything else is a finding. Items naming files ('@') are skipped:
// the fuzzer must not read the disk.
#include <cstdint>
#include <cstdlib>
#include <string>
#include <string_view>

#include "core/error.hpp"
#include "core/family.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size > 512) return 0;  // families are typed by hand
    std::string text(reinterpret_cast<const char*>(data), size);
    if (text.find('@') != std::string::npos) return 0;
    try {
        const overshoot::FamilyOptions f = overshoot::expand_families({text});
        if (f.options.empty() || f.options.size() > overshoot::max_family_size) std::abort();
        for (const auto& o : f.options)
            if (o.weight.empty() || o.denominator == 0 || o.name.empty()) std::abort();
    } catch (const overshoot::InputError&) {
        // A clear refusal is the expected answer to bad input.
    }
    return 0;
}
