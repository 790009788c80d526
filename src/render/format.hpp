#pragma once
// Small formatting helpers shared by every renderer: numbers, percentages and
// aligned text tables.
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace overshoot::render {

// 51.2345% : four decimals, enough to see a 0.01% difference.
std::string percent(double p);
// A chance of finishing: "100% (certain)" when it is exactly 1 (the library
// sets it so only when no stuck square can be reached), else percent().
std::string finish_chance(double p);
// A probability with up to 17 significant digits, shortest round-trip.
std::string number(double x);
// Right-aligned columns except the first; every row has the same cell count.
std::string table(const std::vector<std::string>& header, const std::vector<std::vector<std::string>>& rows);
// The same table cut into blocks of columns, each line at most `max_width`
// characters where the cells allow: every block repeats the first column and
// blocks are separated by a blank line.
std::string table(const std::vector<std::string>& header, const std::vector<std::vector<std::string>>& rows,
                  std::size_t max_width);
// Widest line of text output meant for a terminal.
inline constexpr std::size_t max_text_width = 100;
// One CSV cell: quoted (with "" for a quote) when it holds a comma, a quote, a
// line break or '#', is empty, or starts or ends with a space, so that our own
// matrix reader (tournament/matrix_csv.cpp) and common CSV readers read it back.
std::string csv_cell(const std::string& s);
std::string optional_int(const std::optional<long long>& v, const char* none = "-");

// A margin in percentage points, e.g. "1.2345 points"; tiny margins keep
// three significant digits. A margin that rounds to zero prints without a
// sign ("0.0000 points", never "-0.0000").
std::string points(double margin);
// A signed number of points in fixed notation, "+1.2345" or "0.0000" (no
// sign on zero, never "-0.0000"): for values that are zero up to rounding,
// such as what an equilibrium mix guarantees.
std::string signed_points(double margin);
// Fixed notation with `decimals` places that never prints a negative zero.
std::string fixed(double x, int decimals);
// "1 square", "2 squares": the count and the word, plural unless the count is 1.
std::string plural(long long count, const std::string& word);
// The two names a result shows for options A and B: the names themselves, or
// "NAME (A)" and "NAME (B)" when the two are spelled the same.
std::pair<std::string, std::string> seat_names(const std::string& a, const std::string& b);

// Text safe inside a LaTeX document: every special character of plain TeX
// and LaTeX (# $ % & ~ _ ^ \ { }) and those the default font encoding turns
// into other glyphs (< > |) escaped.
std::string latex_escape(const std::string& s);
// Text safe inside a Markdown (CommonMark with tables) line, or at its start:
// every character that can start emphasis, code, a link, an HTML tag, an
// entity, a table cell or a heading is escaped with a backslash, and so is
// what would make a list item or an underline at the start of the text.
std::string md_escape(const std::string& s);

}  // namespace overshoot::render
