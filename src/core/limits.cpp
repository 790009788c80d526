#include "core/limits.hpp"

#include <fmt/format.h>

#include <atomic>

#include "core/error.hpp"

namespace overshoot::limits {

namespace {
std::atomic<std::uint64_t> g_memory{default_memory_bytes};
}

std::uint64_t memory_bytes() { return g_memory.load(); }
void set_memory_bytes(std::uint64_t bytes) { g_memory.store(bytes); }

void check_memory(std::uint64_t estimate, const char* what) {
    if (estimate > memory_bytes())
        throw LimitError(fmt::format("{} would need about {} MiB, above the memory limit of {} MiB "
                                     "(raise it with --memory-limit MIB)",
                                     what, (estimate >> 20) + 1, memory_bytes() >> 20));
}

}  // namespace overshoot::limits
