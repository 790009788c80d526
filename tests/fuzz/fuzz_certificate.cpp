// libFuzzer target: the certificate reader (certify/certificate.hpp,
// parse_certificate). Certificates are passed around by hand; a malformed one
// must end in InputError naming the field, never a crash.
#include <cstdint>
#include <string>

#include "certify/certificate.hpp"
#include "core/error.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size > 65536) return 0;
    std::string text(reinterpret_cast<const char*>(data), size);
    try {
        overshoot::Certificate c = overshoot::parse_certificate(text, "fuzz.json");
        (void)c;
    } catch (const overshoot::InputError&) {
    }
    return 0;
}
