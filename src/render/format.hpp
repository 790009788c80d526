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
// One CSV cell: quoted (with "" for a quote) when it holds a comma, a quote, a
// line break or '#', is empty, or starts or ends with a space, so that our own
// matrix reader (tournament/matrix_csv.cpp) and common CSV readers read it back.
std::string csv_cell(const std::string& s);
std::string optional_int(const std::optional<long long>& v, const char* none = "-");

}  // namespace overshoot::render
