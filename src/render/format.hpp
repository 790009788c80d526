#pragma once
// Small formatting helpers shared by every renderer: numbers, percentages and
// aligned text tables.
#include <optional>
#include <string>
#include <vector>

namespace overshoot::render {

// 51.2345% : four decimals, enough to see a 0.01% difference.
std::string percent(double p);
// A probability with up to 17 significant digits, shortest round-trip.
std::string number(double x);
// Right-aligned columns except the first; every row has the same cell count.
std::string table(const std::vector<std::string>& header, const std::vector<std::vector<std::string>>& rows);
std::string optional_int(const std::optional<long long>& v, const char* none = "-");

}  // namespace overshoot::render
