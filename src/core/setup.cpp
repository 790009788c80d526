#include "core/setup.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/error.hpp"
#include "core/scenario.hpp"

namespace overshoot {

bool Setup::has_head_starts() const {
    for (int s : starts)
        if (s != 0) return true;
    return false;
}

std::pair<std::string, int> parse_head_start(std::string_view text) {
    const auto colon = text.rfind(':');
    if (colon == std::string_view::npos || colon == 0 || colon + 1 == text.size())
        throw InputError(fmt::format("head start '{}': expected NAME:SQUARE, for example 1d6:4", text));
    const std::string_view digits = text.substr(colon + 1);
    int square = 0;
    for (char c : digits) {
        if (c < '0' || c > '9' || square > 100'000'000)
            throw InputError(fmt::format("head start '{}': the square '{}' is not a whole number", text, digits));
        square = square * 10 + (c - '0');
    }
    return {std::string(text.substr(0, colon)), square};
}

Setup resolve_setup(const SetupRequest& r) {
    Scenario sc;
    if (r.scenario) sc = load_scenario(*r.scenario);
    std::optional<int> length = r.length ? r.length : sc.length;
    if (!length)
        throw InputError("no board length: give --length N or a scenario with [board] length");
    Overshoot rule = r.overshoot ? parse_overshoot(*r.overshoot) : sc.rule.value_or(Overshoot::stay);
    std::vector<Jump> jumps;
    if (r.jumps) {
        for (const auto& j : *r.jumps) jumps.push_back(parse_jump(j));
    } else if (sc.jumps) {
        jumps = *sc.jumps;
    }
    Setup s;
    try {
        s.board = make_board(*length, rule, jumps);
    } catch (const InputError& e) {
        if (r.scenario && !r.length && !r.jumps) throw InputError(fmt::format("{}: {}", *r.scenario, e.what()));
        throw;
    }
    s.order = r.order ? parse_order(*r.order) : sc.order.value_or(Order::simultaneous);
    if (r.words.empty()) {
        for (const auto& ns : sc.options) {
            try {
                s.options.push_back(parse_option(ns.spec, ns.name));
            } catch (const InputError& e) {
                throw InputError(fmt::format("{}: option '{}': {}", sc.source, ns.name, e.what()));
            }
        }
    } else {
        for (const auto& w : r.words) {
            bool found = false;
            for (const auto& ns : sc.options) {
                if (ns.name == w) {  // a scenario name wins over a spec spelled the same
                    s.options.push_back(parse_option(ns.spec, ns.name));
                    found = true;
                    break;
                }
            }
            if (!found) {
                try {
                    s.options.push_back(parse_option(w));
                } catch (const InputError& e) {
                    if (!sc.options.empty() && w.find_first_of("0123456789[{") == std::string::npos)
                        throw InputError(fmt::format("'{}' is neither an option of {} nor a valid spec ({})", w,
                                                     sc.source, e.what()));
                    throw;
                }
            }
        }
    }
    // Head starts: flags replace the scenario's; each names an option of this command.
    std::vector<std::pair<std::string, int>> heads;
    std::string from = "--head-start";
    if (r.head_starts) {
        for (const auto& h : *r.head_starts) heads.push_back(parse_head_start(h));
    } else {
        heads = sc.head_starts;
        from = sc.source + ": [head_starts]";
    }
    s.starts.assign(s.options.size(), 0);
    for (const auto& [name, square] : heads) {
        std::size_t i = 0;
        while (i < s.options.size() && s.options[i].name != name) ++i;
        if (i == s.options.size()) {
            if (!r.head_starts) continue;  // a scenario may give head starts to options not raced here
            throw InputError(fmt::format("{} {}:{}: no option of this command is named '{}'", from, name, square, name));
        }
        try {
            resolve_start(s.board, square);
        } catch (const InputError& e) {
            throw InputError(fmt::format("{} {}:{}: {}", from, name, square, e.what()));
        }
        // clang 14 cannot capture a structured binding: compare through a plain reference.
        const std::string& who = name;
        if (s.starts[i] != 0 || std::count_if(heads.begin(), heads.end(), [&](const auto& h) { return h.first == who; }) > 1)
            throw InputError(fmt::format("{} {}:{}: '{}' has a head start already", from, name, square, name));
        s.starts[i] = square;
    }
    if (s.has_head_starts() && !r.head_starts_allowed)
        throw InputError(fmt::format("{}: this command starts every piece on square 0; head starts are taken by duel, "
                                     "tournament, certify and search",
                                     from));
    if (s.options.size() < r.min_options)
        throw InputError(fmt::format("this command needs at least {} option{} (spec or scenario name), got {}",
                                     r.min_options, r.min_options == 1 ? "" : "s", s.options.size()));
    if (s.options.size() > r.max_options)
        throw InputError(fmt::format("this command takes at most {} options, got {}", r.max_options, s.options.size()));
    return s;
}

}  // namespace overshoot
