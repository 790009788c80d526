#pragma once
// Documented resource limits (docs/guide.md, "Limits"). Every input is checked
// against them before any large allocation.
#include <cstdint>

namespace overshoot::limits {

inline constexpr int max_length = 1'000'000;          // squares on a board
inline constexpr int max_move = 100'000;              // largest single move of an option
inline constexpr int max_dice = 1'000;                // N in NdS or N[...]
inline constexpr int max_sides = 100'000;             // S in NdS
inline constexpr int max_faces = 100'000;             // listed faces or spinner sectors
// Integer weights share one denominator; it must fit 62 bits so sums never overflow.
inline constexpr std::uint64_t max_denominator = (std::uint64_t{1} << 62);
// Multiply-adds one convolution may take while expanding an option spec
// (sums and powers of large custom dice); NdS never comes near it.
inline constexpr std::uint64_t max_spec_work = 200'000'000;
// Default cap on the memory a single computation may plan to use (bytes);
// raised with --memory-limit.
inline constexpr std::uint64_t default_memory_bytes = std::uint64_t{4} << 30;
// The largest cap that can be asked for, in MiB: more would wrap the byte count.
inline constexpr long long max_memory_mib = 1LL << 43;

}  // namespace overshoot::limits

namespace overshoot::limits {
// The memory cap in force (bytes); the CLI sets it from --memory-limit.
std::uint64_t memory_bytes();
void set_memory_bytes(std::uint64_t bytes);
// Throws LimitError when `estimate` bytes for `what` exceed the cap.
void check_memory(std::uint64_t estimate, const char* what);
}  // namespace overshoot::limits
