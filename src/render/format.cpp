#include "render/format.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace overshoot::render {

std::string percent(double p) { return fmt::format("{:.4f}%", 100.0 * p); }

std::string finish_chance(double p) { return p == 1 ? std::string("100% (certain)") : percent(p); }

std::string number(double x) { return fmt::format("{}", x); }

std::string fixed(double x, int decimals) {
    std::string s = fmt::format("{:.{}f}", x, decimals);
    // "-0.0000" is a zero that rounding left a sign on.
    if (s.front() == '-' && s.find_first_not_of("-0.") == std::string::npos) s.erase(0, 1);
    return s;
}

std::string points(double margin) {
    const double p = 100 * margin;
    if (p != 0 && std::fabs(p) < 0.001) return fmt::format("{:.3g} points", p);
    return fixed(p, 4) + " points";
}

std::string signed_points(double margin) {
    const std::string s = fixed(100 * margin, 4);
    return s.front() == '-' || s.find_first_not_of("0.") == std::string::npos ? s : "+" + s;
}

std::string plural(long long count, const std::string& word) {
    return fmt::format("{} {}{}", count, word, count == 1 ? "" : "s");
}

std::pair<std::string, std::string> seat_names(const std::string& a, const std::string& b) {
    if (a != b) return {a, b};
    return {a + " (A)", b + " (B)"};
}

std::string latex_escape(const std::string& s) {
    std::string out;
    for (char c : s) {
        switch (c) {
            case '&': case '%': case '$': case '#': case '_': case '{': case '}': out += '\\'; out += c; break;
            case '~': out += "\\textasciitilde{}"; break;
            case '^': out += "\\textasciicircum{}"; break;
            case '\\': out += "\\textbackslash{}"; break;
            case '<': out += "\\textless{}"; break;
            case '>': out += "\\textgreater{}"; break;
            case '|': out += "\\textbar{}"; break;
            default: out += c;
        }
    }
    return out;
}

std::string md_escape(const std::string& s) {
    // Anywhere in a line: emphasis, code, links, HTML, entities, cells, strikethrough, math.
    static const std::string special = "\\`*_{}[]<>#|~&$!^";
    // Only at the start of a line: bullets, setext underlines, and "1." or "1)" of an ordered list.
    std::size_t digits = 0;
    while (digits < s.size() && s[digits] >= '0' && s[digits] <= '9') ++digits;
    std::string out;
    for (std::size_t i = 0; i < s.size(); ++i) {
        const char c = s[i];
        const bool leading = i == 0 && (c == '-' || c == '+' || c == '=');
        const bool list_mark = digits > 0 && i == digits && (c == '.' || c == ')');
        if (special.find(c) != std::string::npos || leading || list_mark) out += '\\';
        out += c;
    }
    return out;
}

std::string csv_cell(const std::string& s) {
    if (s.find_first_of(",\"#\n\r") == std::string::npos && !s.empty() && s.front() != ' ' && s.back() != ' ')
        return s;
    std::string out = "\"";
    for (char c : s) out += c == '"' ? std::string("\"\"") : std::string(1, c);
    return out + "\"";
}

std::string optional_int(const std::optional<long long>& v, const char* none) {
    return v ? fmt::format("{}", *v) : std::string(none);
}

std::string table(const std::vector<std::string>& header, const std::vector<std::vector<std::string>>& rows) {
    std::vector<std::size_t> width(header.size(), 0);
    auto measure = [&](const std::vector<std::string>& r) {
        for (std::size_t i = 0; i < r.size() && i < width.size(); ++i) width[i] = std::max(width[i], r[i].size());
    };
    measure(header);
    for (const auto& r : rows) measure(r);
    std::string out;
    auto emit = [&](const std::vector<std::string>& r) {
        std::string line;
        for (std::size_t i = 0; i < r.size() && i < width.size(); ++i) {
            if (i > 0) line += "  ";
            std::string pad(width[i] - r[i].size(), ' ');
            line += i == 0 ? r[i] + pad : pad + r[i];
        }
        while (!line.empty() && line.back() == ' ') line.pop_back();
        out += line + "\n";
    };
    emit(header);
    for (const auto& r : rows) emit(r);
    return out;
}

std::string table(const std::vector<std::string>& header, const std::vector<std::vector<std::string>>& rows,
                  std::size_t max_width) {
    std::vector<std::size_t> width(header.size(), 0);
    auto measure = [&](const std::vector<std::string>& r) {
        for (std::size_t i = 0; i < r.size() && i < width.size(); ++i) width[i] = std::max(width[i], r[i].size());
    };
    measure(header);
    for (const auto& r : rows) measure(r);
    if (width.empty()) return table(header, rows);
    // Greedy blocks: as many columns after the first as fit, at least one.
    std::vector<std::pair<std::size_t, std::size_t>> blocks;  // [first, last) of columns 1..
    for (std::size_t c = 1; c < width.size();) {
        std::size_t used = width[0], end = c;
        while (end < width.size() && (end == c || used + 2 + width[end] <= max_width)) used += 2 + width[end++];
        blocks.push_back({c, end});
        c = end;
    }
    if (blocks.size() <= 1) return table(header, rows);
    auto pick = [](const std::vector<std::string>& r, std::size_t lo, std::size_t hi) {
        std::vector<std::string> out{r.empty() ? std::string() : r[0]};
        for (std::size_t i = lo; i < hi && i < r.size(); ++i) out.push_back(r[i]);
        return out;
    };
    std::string out;
    for (std::size_t b = 0; b < blocks.size(); ++b) {
        const auto [lo, hi] = blocks[b];
        std::vector<std::vector<std::string>> part;
        for (const auto& r : rows) part.push_back(pick(r, lo, hi));
        out += (b ? "\n" : "") + table(pick(header, lo, hi), part);
    }
    return out;
}

}  // namespace overshoot::render
