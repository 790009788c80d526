#include "core/numbers.hpp"

#include <charconv>

namespace overshoot {

std::optional<long long> whole_number(std::string_view t) {
    if (!t.empty() && t[0] == '+') {
        t.remove_prefix(1);
        if (!t.empty() && t[0] == '-') return std::nullopt;
    }
    long long v = 0;
    auto [p, ec] = std::from_chars(t.data(), t.data() + t.size(), v);
    if (t.empty() || ec != std::errc() || p != t.data() + t.size()) return std::nullopt;
    return v;
}

std::optional<std::pair<long long, long long>> number_range(std::string_view t) {
    const auto dots = t.find("..");
    if (dots == std::string_view::npos) {
        auto v = whole_number(t);
        if (!v) return std::nullopt;
        return std::make_pair(*v, *v);
    }
    auto lo = whole_number(t.substr(0, dots)), hi = whole_number(t.substr(dots + 2));
    if (!lo || !hi) return std::nullopt;
    return std::make_pair(*lo, *hi);
}

}  // namespace overshoot
