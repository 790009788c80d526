#include "core/setup.hpp"

#include <fmt/format.h>

#include "core/error.hpp"
#include "core/scenario.hpp"

namespace overshoot {

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
    if (s.options.size() < r.min_options)
        throw InputError(fmt::format("this command needs at least {} option{} (spec or scenario name), got {}",
                                     r.min_options, r.min_options == 1 ? "" : "s", s.options.size()));
    if (s.options.size() > r.max_options)
        throw InputError(fmt::format("this command takes at most {} options, got {}", r.max_options, s.options.size()));
    return s;
}

}  // namespace overshoot
