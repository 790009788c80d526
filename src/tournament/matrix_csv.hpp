#pragma once
// A win matrix from a CSV file (docs/tournament.md, "Matrix files"), so any
// pairwise game can be analysed like a race tournament.
#include <string>
#include <string_view>

#include "tournament/tournament.hpp"

namespace overshoot {

// Header row: a label cell (ignored), then the option names. Then one row per
// option, in the header's order: its name, then P(row beats column) for every
// column as a decimal or a fraction p/q; the diagonal cell is empty, "-" or a
// number (ignored). Blank lines and lines starting with '#' are skipped.
// `tolerance` (>= 0) becomes the error bound of every margin. Throws
// InputError naming the source, line and column of the first problem.
PairwiseMatrix parse_matrix_csv(std::string_view text, const std::string& source, double tolerance = 0);
PairwiseMatrix read_matrix_csv(const std::string& path, double tolerance = 0);

}  // namespace overshoot
