#include "cli/common.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <map>

#include "cli/arguments.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "core/limits.hpp"

namespace overshoot::cli {

void add_board_flags(CLI::App& cmd, BoardFlags& f, bool with_order) {
    cmd.add_option("--length", f.length, "number of squares to walk (the finish is square LENGTH)")
        ->type_name("N")
        ->check(whole_in(1, limits::max_length));
    cmd.add_option("--overshoot", f.overshoot, "what a move past the finish does: stay, bounce or pass")
        ->type_name("RULE")
        ->check(one_of({"stay", "bounce", "pass"}));
    // One value per flag (or a comma list): a jump never swallows the option words after it.
    f.jump_option = cmd.add_option("--jump", f.jumps,
                                   "a jump FROM:TO; repeat the flag or give FROM:TO,FROM:TO (replaces the scenario's jumps)")
                        ->type_name("FROM:TO")
                        ->allow_extra_args(false)
                        ->delimiter(',');
    f.head_start_option =
        cmd.add_option("--head-start", f.head_starts,
                       "a head start NAME:SQUARE: that option's piece begins on SQUARE (repeat the flag; replaces the "
                       "scenario's [head_starts])")
            ->type_name("NAME:SQUARE")
            ->allow_extra_args(false);
    if (with_order)
        cmd.add_option("--order", f.order, "turn order: simultaneous, a-first, b-first or coin")
            ->type_name("ORDER")
            ->check(one_of({"simultaneous", "a-first", "b-first", "coin"}));
    cmd.add_option("--scenario", f.scenario, "a TOML scenario file (flags override it)")->type_name("FILE");
    add_memory_limit(cmd, f.memory_mib);
}

Setup resolve_setup(const BoardFlags& f, const std::vector<std::string>& words, std::size_t min_options,
                    std::size_t max_options) {
    apply_memory_limit(f.memory_mib);
    SetupRequest r;
    r.length = f.length;
    r.overshoot = f.overshoot;
    if (f.jump_option && f.jump_option->count() > 0) r.jumps = f.jumps;
    if (f.head_start_option && f.head_start_option->count() > 0) r.head_starts = f.head_starts;
    r.head_starts_allowed = f.head_starts_allowed;
    r.order = f.order;
    r.scenario = f.scenario;
    r.words = words;
    r.min_options = min_options;
    r.max_options = max_options;
    return resolve_setup(r);
}

std::vector<std::string> option_words(const CLI::App& cmd) {
    std::vector<std::string> words = cmd.remaining();
    for (const auto& w : words)
        if (w.size() > 1 && w[0] == '-' && !(w[1] >= '0' && w[1] <= '9'))
            throw InputError(fmt::format("{}: unknown flag '{}' (see --help)", cmd.get_name(), w));
    return words;
}

std::vector<std::string> list_words(const std::string& text, const char* flag) {
    std::vector<std::string> out;
    std::string cur;
    int depth = 0;
    for (char ch : text) {
        if (ch == '[' || ch == '{') ++depth;
        if (ch == ']' || ch == '}') --depth;
        if (depth < 0) throw InputError(fmt::format("{} '{}': a closing bracket without its opening one", flag, text));
        if (ch == ',' && depth == 0) {
            out.push_back(cur);
            cur.clear();
            continue;
        }
        cur += ch;
    }
    if (depth != 0) throw InputError(fmt::format("{} '{}': a bracket is not closed", flag, text));
    out.push_back(cur);
    for (const auto& w : out)
        if (w.find_first_not_of(" \t") == std::string::npos)
            throw InputError(fmt::format("{} '{}': an empty option in the list", flag, text));
    return out;
}

void emit(const std::string& text) {
    std::fwrite(text.data(), 1, text.size(), stdout);
    if (!text.empty() && text.back() != '\n') std::fputc('\n', stdout);
    if (std::fflush(stdout) != 0 || std::ferror(stdout))
        throw InputError(fmt::format("standard output: write failed ({})", std::strerror(errno)));
}

std::string OutputFlags::chosen() const {
    if (format) return *format;
    if (json) return "json";
    if (csv) return "csv";
    return formats.front();
}

void add_output_flags(CLI::App& cmd, OutputFlags& f, std::vector<std::string> formats) {
    f.formats = formats;
    cmd.add_option("-o,--output", f.output, "write to FILE instead of stdout (- is stdout)")->type_name("FILE");
    std::string list;
    for (std::size_t i = 0; i < formats.size(); ++i)
        list += (i == 0 ? "" : i + 1 == formats.size() ? " or " : ", ") + formats[i];
    auto* format = cmd.add_option("--format", f.format, fmt::format("{} (default {})", list, formats.front()))
                       ->type_name("FORMAT")
                       ->check(one_of(formats));
    auto has = [&](const char* w) { return std::find(formats.begin(), formats.end(), w) != formats.end(); };
    CLI::Option* json = nullptr;
    if (has("json")) json = cmd.add_flag("--json", f.json, "short for --format json")->excludes(format);
    if (has("csv")) {
        auto* csv = cmd.add_flag("--csv", f.csv, "short for --format csv")->excludes(format);
        if (json) csv->excludes(json);
    }
}

void deliver(const OutputFlags& f, const std::string& text) {
    if (!f.output || *f.output == "-") {
        emit(text);
        return;
    }
    if (!text.empty() && text.back() != '\n')
        write_atomically(*f.output, text + "\n");
    else
        write_atomically(*f.output, text);
}

namespace {
std::map<const CLI::App*, Usage>& usages() {
    static std::map<const CLI::App*, Usage> m;
    return m;
}
}  // namespace

void set_usage(CLI::App& cmd, std::string positionals, std::string meaning) {
    usages()[&cmd] = Usage{std::move(positionals), std::move(meaning)};
}

const Usage* usage_of(const CLI::App* cmd) {
    auto it = usages().find(cmd);
    return it == usages().end() ? nullptr : &it->second;
}

}  // namespace overshoot::cli
