#include "core/scenario.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>
#include <toml++/toml.h>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/option.hpp"

namespace overshoot {

namespace {

std::string where(const std::string& source, const toml::node& n) {
    const auto& s = n.source();
    return fmt::format("{}:{}:{}", source, s.begin.line, s.begin.column);
}

void only_keys(const std::string& source, const toml::table& t, const std::string& table,
               std::initializer_list<std::string_view> allowed) {
    for (auto&& [k, v] : t) {
        if (std::find(allowed.begin(), allowed.end(), k.str()) == allowed.end())
            throw InputError(fmt::format("{}: unknown key '{}' in {}", where(source, v), k.str(), table));
    }
}

const toml::table& as_table(const std::string& source, const toml::node& n, const std::string& name) {
    if (!n.is_table()) throw InputError(fmt::format("{}: '{}' must be a table", where(source, n), name));
    return *n.as_table();
}

std::string as_string(const std::string& source, const toml::node& n, const std::string& key) {
    if (!n.is_string()) throw InputError(fmt::format("{}: '{}' must be a string", where(source, n), key));
    return std::string(n.as_string()->get());
}

int as_int(const std::string& source, const toml::node& n, const std::string& key, long long lo,
           long long hi) {
    if (!n.is_integer()) throw InputError(fmt::format("{}: '{}' must be an integer", where(source, n), key));
    long long v = n.as_integer()->get();
    if (v < lo || v > hi)
        throw InputError(fmt::format("{}: '{}' = {} is outside {}..{}", where(source, n), key, v, lo, hi));
    return static_cast<int>(v);
}

}  // namespace

Scenario parse_scenario(std::string_view text, const std::string& source) {
    toml::table root;
    try {
        root = toml::parse(text, source);
    } catch (const toml::parse_error& e) {
        const auto& s = e.source();
        throw InputError(fmt::format("{}:{}:{}: {}", source, s.begin.line, s.begin.column, e.description()));
    }
    Scenario sc;
    sc.source = source;
    only_keys(source, root, "the scenario", {"board", "race", "options", "head_starts"});
    if (auto* n = root.get("board")) {
        const auto& b = as_table(source, *n, "board");
        only_keys(source, b, "[board]", {"length", "overshoot", "jumps"});
        if (auto* v = b.get("length")) sc.length = as_int(source, *v, "length", 1, limits::max_length);
        if (auto* v = b.get("overshoot")) {
            try {
                sc.rule = parse_overshoot(as_string(source, *v, "overshoot"));
            } catch (const InputError& e) {
                throw InputError(fmt::format("{}: {}", where(source, *v), e.what()));
            }
        }
        if (auto* v = b.get("jumps")) {
            if (!v->is_array())
                throw InputError(fmt::format("{}: 'jumps' must be an array of [from, to] pairs", where(source, *v)));
            std::vector<Jump> jumps;
            for (auto&& item : *v->as_array()) {
                if (!item.is_array() || item.as_array()->size() != 2)
                    throw InputError(fmt::format("{}: each jump must be a pair [from, to]", where(source, item)));
                const auto& pair = *item.as_array();
                jumps.push_back(Jump{as_int(source, *pair.get(0), "jump from", 0, limits::max_length),
                                     as_int(source, *pair.get(1), "jump to", 0, limits::max_length)});
            }
            sc.jumps = std::move(jumps);
        }
    }
    if (auto* n = root.get("race")) {
        const auto& r = as_table(source, *n, "race");
        only_keys(source, r, "[race]", {"order"});
        if (auto* v = r.get("order")) {
            try {
                sc.order = parse_order(as_string(source, *v, "order"));
            } catch (const InputError& e) {
                throw InputError(fmt::format("{}: {}", where(source, *v), e.what()));
            }
        }
    }
    if (auto* n = root.get("options")) {
        const auto& o = as_table(source, *n, "options");
        std::vector<std::pair<toml::source_position, NamedSpec>> found;
        for (auto&& [k, v] : o) {
            std::string key(k.str());
            // An empty name would print as a blank column and match no word.
            if (key.empty())
                throw InputError(fmt::format("{}: an option name in [options] must not be empty", where(source, v)));
            try {
                require_printable(key, "option name");
            } catch (const InputError& e) {
                throw InputError(fmt::format("{}: {}", where(source, v), e.what()));
            }
            found.push_back({v.source().begin, NamedSpec{key, as_string(source, v, key)}});
        }
        // toml++ keeps keys sorted; the input order is the file order.
        std::sort(found.begin(), found.end(), [](const auto& a, const auto& b) {
            return a.first.line != b.first.line ? a.first.line < b.first.line : a.first.column < b.first.column;
        });
        for (auto& f : found) sc.options.push_back(std::move(f.second));
    }
    if (auto* n = root.get("head_starts")) {
        const auto& h = as_table(source, *n, "head_starts");
        std::vector<std::pair<toml::source_position, std::pair<std::string, int>>> found;
        for (auto&& [k, v] : h) {
            std::string key(k.str());
            found.push_back({v.source().begin, {key, as_int(source, v, key, 0, limits::max_length)}});
        }
        std::sort(found.begin(), found.end(), [](const auto& a, const auto& b) {
            return a.first.line != b.first.line ? a.first.line < b.first.line : a.first.column < b.first.column;
        });
        for (auto& f : found) sc.head_starts.push_back(std::move(f.second));
    }
    return sc;
}

Scenario load_scenario(const std::string& path) {
    // A folder opens as a stream but reads as empty: say what it is instead.
    std::error_code ec;
    if (std::filesystem::is_directory(path, ec))
        throw InputError(fmt::format("{}: is a folder, not a scenario file", path));
    std::ifstream in(path, std::ios::binary);
    if (!in) throw InputError(fmt::format("{}: cannot open the scenario file", path));
    // Refused before reading: a huge file must not be pulled into memory first.
    constexpr std::uint64_t max_bytes = std::uint64_t{16} << 20;
    in.seekg(0, std::ios::end);
    const auto size = static_cast<std::int64_t>(in.tellg());
    if (size > static_cast<std::int64_t>(max_bytes))
        throw LimitError(fmt::format("{}: the scenario file has {} bytes, above the limit of {} bytes (16 MiB)", path,
                                     size, max_bytes));
    in.seekg(0, std::ios::beg);
    std::ostringstream ss;
    ss << in.rdbuf();
    std::string text = ss.str();
    if (text.size() > max_bytes)  // a pipe or a file that grew while read
        throw LimitError(fmt::format("{}: the scenario file has {} bytes or more, above the limit of {} bytes (16 MiB)",
                                     path, text.size(), max_bytes));
    return parse_scenario(text, path);
}

}  // namespace overshoot
