#include "search/target.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/error.hpp"

namespace overshoot {

std::string_view to_string(SearchTarget t) {
    switch (t) {
        case SearchTarget::cycle: return "cycle";
        case SearchTarget::no_winner: return "no-winner";
        case SearchTarget::top_cycle: return "top-cycle";
        case SearchTarget::fair: return "fair";
    }
    return "?";
}

SearchTarget parse_search_target(std::string_view t) {
    if (t == "cycle") return SearchTarget::cycle;
    if (t == "no-winner") return SearchTarget::no_winner;
    if (t == "top-cycle") return SearchTarget::top_cycle;
    if (t == "fair") return SearchTarget::fair;
    throw InputError(fmt::format("target '{}': expected cycle, no-winner, top-cycle or fair", t));
}

std::vector<std::size_t> parse_cycle(std::string_view text, const std::vector<Option>& options) {
    std::vector<std::string> names;
    std::size_t at = 0;
    while (true) {
        const std::size_t gt = text.find('>', at);
        std::string_view part = text.substr(at, gt == std::string_view::npos ? std::string_view::npos : gt - at);
        while (!part.empty() && part.front() == ' ') part.remove_prefix(1);
        while (!part.empty() && part.back() == ' ') part.remove_suffix(1);
        if (part.empty()) throw InputError(fmt::format("cycle '{}': an empty name; write it as 'A > B > C > A'", text));
        names.emplace_back(part);
        if (gt == std::string_view::npos) break;
        at = gt + 1;
    }
    if (names.size() > 1 && names.back() == names.front()) names.pop_back();
    if (names.size() < 3)
        throw InputError(fmt::format("cycle '{}': a cycle needs at least 3 options (A > B > C > A)", text));
    std::vector<std::size_t> cycle;
    for (const auto& name : names) {
        std::size_t i = 0;
        while (i < options.size() && options[i].name != name) ++i;
        if (i == options.size()) throw InputError(fmt::format("cycle '{}': no option is named '{}'", text, name));
        if (std::find(cycle.begin(), cycle.end(), i) != cycle.end())
            throw InputError(fmt::format("cycle '{}': '{}' appears twice", text, name));
        cycle.push_back(i);
    }
    return cycle;
}

namespace {

// True when every vertex reaches every other along arcs with margin >= t.
bool strongly_connected_at(std::size_t n, const std::vector<double>& margin, double t) {
    for (int dir = 0; dir < 2; ++dir) {
        std::vector<char> seen(n, 0);
        std::vector<std::size_t> stack{0};
        seen[0] = 1;
        std::size_t count = 1;
        while (!stack.empty()) {
            const std::size_t v = stack.back();
            stack.pop_back();
            for (std::size_t w = 0; w < n; ++w) {
                if (w == v || seen[w]) continue;
                const double m = dir == 0 ? margin[v * n + w] : margin[w * n + v];
                if (m >= t) {
                    seen[w] = 1;
                    ++count;
                    stack.push_back(w);
                }
            }
        }
        if (count < n) return false;
    }
    return true;
}

}  // namespace

double score_of(SearchTarget target, const std::vector<std::size_t>& cycle, std::size_t n,
                const std::vector<double>& margin) {
    switch (target) {
        case SearchTarget::cycle: {
            double s = std::numeric_limits<double>::infinity();
            for (std::size_t k = 0; k < cycle.size(); ++k)
                s = std::min(s, margin[cycle[k] * n + cycle[(k + 1) % cycle.size()]]);
            return s;
        }
        case SearchTarget::no_winner: {
            double s = std::numeric_limits<double>::infinity();
            for (std::size_t i = 0; i < n; ++i) {
                double beaten = -std::numeric_limits<double>::infinity();
                for (std::size_t j = 0; j < n; ++j)
                    if (j != i) beaten = std::max(beaten, margin[j * n + i]);
                s = std::min(s, beaten);
            }
            return s;
        }
        case SearchTarget::top_cycle: {
            // The largest threshold keeping the digraph strongly connected: one of the margins.
            std::vector<double> ts;
            for (std::size_t i = 0; i < n; ++i)
                for (std::size_t j = 0; j < n; ++j)
                    if (i != j) ts.push_back(margin[i * n + j]);
            std::sort(ts.begin(), ts.end(), std::greater<>());
            ts.erase(std::unique(ts.begin(), ts.end()), ts.end());
            for (double t : ts)
                if (strongly_connected_at(n, margin, t)) return t;
            return ts.empty() ? 0 : ts.back();
        }
        case SearchTarget::fair: {
            double worst = 0;
            for (std::size_t i = 0; i < n; ++i)
                for (std::size_t j = 0; j < n; ++j)
                    if (i != j) worst = std::max(worst, std::fabs(margin[i * n + j]));
            return -worst;
        }
    }
    return 0;
}

bool target_holds(SearchTarget target, const std::vector<std::size_t>& cycle, const Tournament& t) {
    const std::size_t n = t.size();
    switch (target) {
        case SearchTarget::cycle:
            for (std::size_t k = 0; k < cycle.size(); ++k)
                if (!t.beats[cycle[k] * n + cycle[(k + 1) % cycle.size()]]) return false;
            return true;
        case SearchTarget::no_winner: return !t.condorcet_winner.has_value();
        case SearchTarget::top_cycle: return t.top_cycle.size() == n;
        case SearchTarget::fair: return true;
    }
    return false;
}

}  // namespace overshoot
