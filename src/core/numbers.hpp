#pragma once
// Whole numbers and LO..HI ranges as users write them: one reading for every
// parser (command-line flags, jumps, families, --lengths), so "+5", "05" and
// "1..6" mean the same everywhere.
#include <optional>
#include <string_view>
#include <utility>

namespace overshoot {

// Exactly one decimal whole number (optional sign, no spaces, no 0x), else nullopt;
// also nullopt when it does not fit in 64 bits.
std::optional<long long> whole_number(std::string_view text);

// "LO..HI" or one number N (meaning N..N); nullopt when malformed.
std::optional<std::pair<long long, long long>> number_range(std::string_view text);

}  // namespace overshoot
