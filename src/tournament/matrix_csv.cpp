#include "tournament/matrix_csv.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <fstream>
#include <optional>
#include <sstream>
#include <vector>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/option.hpp"

namespace overshoot {

namespace {

struct Line {
    int number;
    std::vector<std::string> cells;
};

std::string trim(std::string_view s) {
    std::size_t a = 0, b = s.size();
    while (a < b && (s[a] == ' ' || s[a] == '\t')) ++a;
    while (b > a && (s[b - 1] == ' ' || s[b - 1] == '\t' || s[b - 1] == '\r')) --b;
    return std::string(s.substr(a, b - a));
}

// One record of RFC 4180 CSV without embedded line breaks: commas separate,
// double quotes protect commas, "" is a quote.
std::vector<std::string> split(std::string_view line, const std::string& where) {
    std::vector<std::string> cells;
    std::size_t i = 0;
    while (true) {
        while (i < line.size() && (line[i] == ' ' || line[i] == '\t')) ++i;
        std::string cell;
        if (i < line.size() && line[i] == '"') {
            ++i;
            bool closed = false;
            while (i < line.size()) {
                if (line[i] == '"') {
                    if (i + 1 < line.size() && line[i + 1] == '"') {
                        cell += '"';
                        i += 2;
                        continue;
                    }
                    ++i;
                    closed = true;
                    break;
                }
                cell += line[i++];
            }
            if (!closed) throw InputError(fmt::format("{}: a quoted cell is not closed", where));
            while (i < line.size() && (line[i] == ' ' || line[i] == '\t' || line[i] == '\r')) ++i;
            if (i < line.size() && line[i] != ',')
                throw InputError(fmt::format("{}: text after a closing quote", where));
        } else {
            std::size_t j = line.find(',', i);
            if (j == std::string_view::npos) j = line.size();
            cell = trim(line.substr(i, j - i));
            i = j;
        }
        cells.push_back(cell);
        if (i >= line.size()) break;
        ++i;  // the comma
    }
    return cells;
}

std::optional<double> plain_number(std::string_view s) {
    double x = 0;
    auto [p, ec] = std::from_chars(s.data(), s.data() + s.size(), x);
    if (ec != std::errc() || p != s.data() + s.size() || !std::isfinite(x)) return std::nullopt;
    return x;
}

// A probability: a decimal number or a fraction p/q.
double probability(const std::string& cell, const std::string& where) {
    std::optional<double> v;
    std::size_t slash = cell.find('/');
    if (slash == std::string::npos) {
        v = plain_number(cell);
    } else {
        auto num = plain_number(trim(std::string_view(cell).substr(0, slash)));
        auto den = plain_number(trim(std::string_view(cell).substr(slash + 1)));
        if (num && den && *den != 0) v = *num / *den;
    }
    if (!v) throw InputError(fmt::format("{}: '{}' is not a probability (a decimal number or a fraction p/q)", where, cell));
    if (*v < 0 || *v > 1) throw InputError(fmt::format("{}: {} is not between 0 and 1", where, cell));
    return *v;
}

}  // namespace

PairwiseMatrix parse_matrix_csv(std::string_view text, const std::string& source, double tolerance) {
    if (!(tolerance >= 0) || !std::isfinite(tolerance))
        throw InputError(fmt::format("the tolerance must be a number >= 0, got {}", tolerance));
    std::vector<Line> lines;
    std::size_t pos = 0;
    int number = 0;
    while (pos <= text.size()) {
        std::size_t end = text.find('\n', pos);
        if (end == std::string_view::npos) end = text.size();
        std::string_view raw = text.substr(pos, end - pos);
        ++number;
        std::string t = trim(raw);
        if (!t.empty() && t[0] != '#') lines.push_back({number, split(raw, fmt::format("{}:{}", source, number))});
        if (end == text.size()) break;
        pos = end + 1;
    }
    if (lines.empty()) throw InputError(fmt::format("{}: no header row of option names", source));
    const Line& header = lines.front();
    const std::size_t n = header.cells.size() - 1;
    if (n == 0) throw InputError(fmt::format("{}:{}: the header row names no option", source, header.number));
    if (n > 100'000) throw LimitError(fmt::format("{}:{}: too many options ({}, above the limit of 100000)", source, header.number, n));
    limits::check_memory(static_cast<std::uint64_t>(n) * n * 64, "the win matrix");
    PairwiseMatrix m;
    m.names.assign(header.cells.begin() + 1, header.cells.end());
    {  // the first bad column, read left to right: an empty name or a repeated one
        const std::size_t empty = static_cast<std::size_t>(
            std::find(m.names.begin(), m.names.end(), std::string()) - m.names.begin());
        const std::size_t repeat = first_repeated_name(m.names).value_or(n);
        if (empty < n && empty <= repeat)
            throw InputError(fmt::format("{}:{}: column {}: empty option name", source, header.number, empty + 2));
        if (repeat < n)
            throw InputError(fmt::format("{}:{}: column {}: option name '{}' appears twice", source, header.number,
                                         repeat + 2, m.names[repeat]));
    }
    if (lines.size() - 1 != n)
        throw InputError(fmt::format("{}: the header names {} option{} but {} row{} follow{}", source, n,
                                     n == 1 ? "" : "s", lines.size() - 1, lines.size() == 2 ? "" : "s",
                                     lines.size() == 2 ? "s" : ""));
    m.win.assign(n * n, 0.0);
    m.tie.assign(n * n, 0.0);
    m.neither.assign(n * n, 0.0);
    m.bound.assign(n * n, tolerance);
    std::vector<int> row_line(n);
    for (std::size_t i = 0; i < n; ++i) {
        const Line& l = lines[i + 1];
        row_line[i] = l.number;
        if (l.cells.size() != n + 1)
            throw InputError(fmt::format("{}:{}: {} cells, expected {} (a name and {} probabilities)", source, l.number,
                                         l.cells.size(), n + 1, n));
        if (l.cells[0] != m.names[i])
            throw InputError(fmt::format("{}:{}: row {} is '{}', expected '{}' (rows follow the header's order)", source,
                                         l.number, i + 1, l.cells[0], m.names[i]));
        for (std::size_t j = 0; j < n; ++j) {
            const std::string& c = l.cells[j + 1];
            std::string where = fmt::format("{}:{}: column {} ({} against {})", source, l.number, j + 2, m.names[i], m.names[j]);
            if (i == j) {
                if (!c.empty() && c != "-") probability(c, where);  // checked, ignored
                continue;
            }
            if (c.empty()) throw InputError(fmt::format("{}: missing probability", where));
            m.win[i * n + j] = probability(c, where);
        }
    }
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = i + 1; j < n; ++j) {
            double rest = 1.0 - m.win[i * n + j] - m.win[j * n + i];
            if (rest < -1e-9)
                throw InputError(fmt::format(
                    "{}:{}: P({} beats {}) + P({} beats {}) = {:.12g} exceeds 1 (see line {})", source, row_line[i],
                    m.names[i], m.names[j], m.names[j], m.names[i], 1.0 - rest, row_line[j]));
            // A file gives no split of the rest into ties and "neither": all of it is shown as ties.
            m.tie[i * n + j] = m.tie[j * n + i] = std::max(0.0, rest);
        }
    return m;
}

PairwiseMatrix read_matrix_csv(const std::string& path, double tolerance) {
    std::ifstream in(path, std::ios::binary);
    if (!in) throw InputError(fmt::format("{}: cannot open the matrix file", path));
    std::ostringstream ss;
    ss << in.rdbuf();
    return parse_matrix_csv(ss.str(), path, tolerance);
}

}  // namespace overshoot
