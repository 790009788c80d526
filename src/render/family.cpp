#include "render/family.hpp"

#include <fmt/format.h>

#include "render/format.hpp"
#include "render/document.hpp"

namespace overshoot::render {

std::string family_text(const FamilyView& v) {
    std::vector<std::vector<std::string>> rows;
    for (const auto& o : *v.options)
        rows.push_back({o.name, o.spec, fmt::format("{:.4f}", o.mean()), std::to_string(o.min_move()),
                        std::to_string(o.max_move())});
    std::string out = table({"option", "spec", "mean move", "least", "most"}, rows);
    out += fmt::format("\n{} option{}", v.options->size(), v.options->size() == 1 ? "" : "s");
    if (v.merged > 0)
        out += fmt::format("; {} more {} equal as distributions to an earlier option and {} merged into it",
                           v.merged, v.merged == 1 ? "was" : "were", v.merged == 1 ? "was" : "were");
    return out + ".\n";
}

nlohmann::json family_json(const FamilyView& v) {
    nlohmann::json j = document("family", 1);
    j["items"] = *v.items;
    nlohmann::json opts = nlohmann::json::array();
    for (const auto& o : *v.options) {
        nlohmann::json w = nlohmann::json::object();
        for (std::size_t m = 0; m < o.weight.size(); ++m)
            if (o.weight[m] != 0) w[std::to_string(m)] = o.weight[m];
        opts.push_back({{"name", o.name}, {"spec", o.spec}, {"mean", o.mean()}, {"weights", w},
                        {"denominator", o.denominator}});
    }
    j["options"] = opts;
    j["size"] = v.options->size();
    j["merged"] = v.merged;
    return j;
}

}  // namespace overshoot::render
