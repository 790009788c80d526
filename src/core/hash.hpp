#pragma once
// FNV-1a, 64 bits: checkpoint fingerprints, the bench signature, and the seed
// of the checker's primes. Fowler, Noll and Vo's public-domain hash with their
// 64-bit prime 1099511628211 (from memory). The start value is one digit
// short of their offset basis 14695981039346656037 (from memory); any start
// works for the hash's purpose here, and it stays as it is because checkpoint
// fingerprints and the bench signature depend on it.
#include <cstddef>
#include <cstdint>
#include <string_view>

namespace overshoot {

inline constexpr std::uint64_t fnv_offset_basis = 1469598103934665603ULL;  // see above

inline std::uint64_t fnv1a(std::uint64_t h, const void* data, std::size_t size) {
    const unsigned char* p = static_cast<const unsigned char*>(data);
    for (std::size_t i = 0; i < size; ++i) {
        h ^= p[i];
        h *= 1099511628211ULL;
    }
    return h;
}

inline std::uint64_t fnv1a(std::uint64_t h, std::string_view s) { return fnv1a(h, s.data(), s.size()); }

}  // namespace overshoot
