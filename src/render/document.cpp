#include "render/document.hpp"

#include <fmt/format.h>

#include <cmath>

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

nlohmann::json number_or_null(double x) { return std::isfinite(x) ? nlohmann::json(x) : nlohmann::json(nullptr); }
nlohmann::json number_or_null(const std::optional<long long>& v) { return v ? nlohmann::json(*v) : nlohmann::json(nullptr); }

}  // namespace overshoot::render
