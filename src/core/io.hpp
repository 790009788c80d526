#pragma once
// File output that never leaves a half-written file: write to a temporary file
// in the same folder, flush it to disk, then rename over the target.
#include <string>
#include <string_view>

namespace overshoot {

void write_atomically(const std::string& path, std::string_view content);

}  // namespace overshoot
