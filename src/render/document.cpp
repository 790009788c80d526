#include "render/document.hpp"

#include <fmt/format.h>

#include <cmath>

#include "render/format.hpp"

namespace overshoot::render {

nlohmann::json document(const std::string& kind, int schema_version) {
    nlohmann::json j;
    j["schema"] = fmt::format("overshoot.{}/{}", kind, schema_version);
    j["version"] = version;
    return j;
}

nlohmann::json board_json(const Board& b, Order order) {
    nlohmann::json jumps = nlohmann::json::array();
    for (const Jump& j : b.jumps) jumps.push_back({j.from, j.to});
    return {{"length", b.length}, {"overshoot", std::string(to_string(b.rule))},
            {"jumps", jumps}, {"order", std::string(to_string(order))}};
}

std::string jumps_text(const std::vector<Jump>& jumps) {
    if (jumps.empty()) return "no jumps";
    std::string out = "jumps";
    for (const Jump& j : jumps) out += fmt::format(" {}->{}", j.from, j.to);
    return out;
}

std::string describe(const Board& b, Order order) {
    return fmt::format("board of {}, overshoot {}, {} turns, {}", plural(b.length, "square"), to_string(b.rule),
                       to_string(order), jumps_text(b.jumps));
}

std::string describe_board(const Board& b) {
    return fmt::format("board of {}, overshoot {}, {}", plural(b.length, "square"), to_string(b.rule), jumps_text(b.jumps));
}

bool any_head_start(const std::vector<int>& starts) {
    for (int s : starts)
        if (s != 0) return true;
    return false;
}

nlohmann::json head_starts_json(const std::vector<std::string>& names, const std::vector<int>& starts) {
    nlohmann::json j = nlohmann::json::object();
    for (std::size_t i = 0; i < names.size() && i < starts.size(); ++i)
        if (starts[i] != 0) j[names[i]] = starts[i];
    return j;
}

std::string head_starts_text(const std::vector<std::string>& names, const std::vector<int>& starts) {
    std::string out;
    for (std::size_t i = 0; i < names.size() && i < starts.size(); ++i)
        if (starts[i] != 0) out += fmt::format("{}{} on {}", out.empty() ? "head starts: " : ", ", names[i], starts[i]);
    return out;
}

nlohmann::json number_or_null(double x) { return std::isfinite(x) ? nlohmann::json(x) : nlohmann::json(nullptr); }
nlohmann::json number_or_null(const std::optional<long long>& v) { return v ? nlohmann::json(*v) : nlohmann::json(nullptr); }

}  // namespace overshoot::render
