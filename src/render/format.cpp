#include "render/format.hpp"

#include <fmt/format.h>

#include <algorithm>

namespace overshoot::render {

std::string percent(double p) { return fmt::format("{:.4f}%", 100.0 * p); }

std::string number(double x) { return fmt::format("{}", x); }

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

}  // namespace overshoot::render
