#include "cli/common.hpp"

#include <fmt/format.h>

#include <cstdio>

#include "core/error.hpp"
#include "core/limits.hpp"

namespace overshoot::cli {

void add_board_flags(CLI::App& cmd, BoardFlags& f, bool with_order) {
    cmd.add_option("--length", f.length, "number of squares to walk (the finish is square LENGTH)");
    cmd.add_option("--overshoot", f.overshoot, "what a move past the finish does: stay, bounce or pass");
    f.jump_option = cmd.add_option("--jump", f.jumps, "a jump FROM:TO (repeatable; replaces the scenario's jumps)");
    if (with_order)
        cmd.add_option("--order", f.order, "turn order: simultaneous, a-first, b-first or coin");
    cmd.add_option("--scenario", f.scenario, "a TOML scenario file (flags override it)");
    cmd.add_flag("--json", f.json, "print one JSON document instead of text");
    cmd.add_option("--memory-limit", f.memory_mib, "memory cap in MiB for one computation (default 4096)");
}

Setup resolve_setup(const BoardFlags& f, const std::vector<std::string>& words, std::size_t min_options,
                    std::size_t max_options) {
    if (f.memory_mib) {
        if (*f.memory_mib < 1) throw InputError("--memory-limit must be at least 1 MiB");
        // Shifting more than 2^44 MiB left by 20 bits would wrap around.
        if (*f.memory_mib > (1LL << 43))
            throw InputError(fmt::format("--memory-limit {}: at most {} MiB", *f.memory_mib, 1LL << 43));
        limits::set_memory_bytes(static_cast<std::uint64_t>(*f.memory_mib) << 20);
    }
    Scenario sc;
    if (f.scenario) sc = load_scenario(*f.scenario);
    std::optional<int> length = f.length ? f.length : sc.length;
    if (!length)
        throw InputError("no board length: give --length N or a scenario with [board] length");
    Overshoot rule = f.overshoot ? parse_overshoot(*f.overshoot) : sc.rule.value_or(Overshoot::stay);
    std::vector<Jump> jumps;
    if (f.jump_option && f.jump_option->count() > 0) {
        for (const auto& j : f.jumps) jumps.push_back(parse_jump(j));
    } else if (sc.jumps) {
        jumps = *sc.jumps;
    }
    Setup s;
    try {
        s.board = make_board(*length, rule, jumps);
    } catch (const InputError& e) {
        if (f.scenario && !f.length && !(f.jump_option && f.jump_option->count() > 0))
            throw InputError(fmt::format("{}: {}", *f.scenario, e.what()));
        throw;
    }
    s.order = f.order ? parse_order(*f.order) : sc.order.value_or(Order::simultaneous);
    if (words.empty()) {
        for (const auto& ns : sc.options) {
            try {
                s.options.push_back(parse_option(ns.spec, ns.name));
            } catch (const InputError& e) {
                throw InputError(fmt::format("{}: option '{}': {}", sc.source, ns.name, e.what()));
            }
        }
    } else {
        for (const auto& w : words) {
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
    if (s.options.size() < min_options)
        throw InputError(fmt::format("this command needs at least {} option{} (spec or scenario name), got {}",
                                     min_options, min_options == 1 ? "" : "s", s.options.size()));
    if (s.options.size() > max_options)
        throw InputError(fmt::format("this command takes at most {} options, got {}", max_options, s.options.size()));
    return s;
}

std::vector<std::string> option_words(const CLI::App& cmd) {
    std::vector<std::string> words = cmd.remaining();
    for (const auto& w : words)
        if (w.size() > 1 && w[0] == '-' && !(w[1] >= '0' && w[1] <= '9'))
            throw InputError(fmt::format("{}: unknown flag '{}' (see --help)", cmd.get_name(), w));
    return words;
}

void emit(const std::string& text) {
    std::fwrite(text.data(), 1, text.size(), stdout);
    if (!text.empty() && text.back() != '\n') std::fputc('\n', stdout);
    std::fflush(stdout);
}

}  // namespace overshoot::cli
