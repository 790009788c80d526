#include "cli/arguments.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <regex>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/numbers.hpp"

namespace overshoot::cli {

CLI::Validator whole_in(long long lo, long long hi) {
    const CLI::Validator range = CLI::Range(lo, hi);
    return CLI::Validator(
        [=](std::string& s) -> std::string {
            auto v = whole_number(s);
            if (!v) {
                // from_chars also fails on numbers too large for 64 bits: say so.
                const bool digits = std::regex_match(s, std::regex("[+-]?[0-9]+"));
                return digits ? fmt::format("{} is outside {}..{}", s, lo, hi)
                              : fmt::format("'{}' is not a whole number (expected {}..{})", s, lo, hi);
            }
            std::string text = std::to_string(*v);
            if (!range(text).empty()) return fmt::format("{} is outside {}..{}", s, lo, hi);
            s = text;
            return {};
        },
        fmt::format("{}..{}", lo, hi), "whole number");
}

CLI::Validator range_in(long long lo, long long hi) {
    const CLI::Validator range = CLI::Range(lo, hi);
    return CLI::Validator(
        [=](std::string& s) -> std::string {
            auto r = number_range(s);
            if (!r) return fmt::format("'{}' is not LO..HI or one whole number", s);
            if (r->first > r->second) return fmt::format("{}: the low end {} is above the high end {}", s, r->first, r->second);
            for (long long v : {r->first, r->second}) {
                std::string text = std::to_string(v);
                if (!range(text).empty()) return fmt::format("{}: {} is outside {}..{}", s, v, lo, hi);
            }
            return {};
        },
        fmt::format("LO..HI within {}..{}", lo, hi), "range");
}

CLI::Validator real_in(double lo, double hi, bool open) {
    const CLI::Validator range = CLI::Range(lo, hi);
    return CLI::Validator(
        [=](std::string& s) -> std::string {
            double v = 0;
            const char* b = s.data();
            auto [p, ec] = std::from_chars(b, b + s.size(), v);
            if (s.empty() || ec != std::errc() || p != b + s.size()) return fmt::format("'{}' is not a number", s);
            // NaN passes every comparison of a range check: demand lo <= v <= hi outright.
            if (!(v >= lo && v <= hi) || !range(s).empty() || (open && (v == lo || v == hi)))
                return fmt::format("{} is outside {}{}..{}{}", s, open ? "(" : "[", lo, hi, open ? ")" : "]");
            return {};
        },
        fmt::format("{}{}..{}{}", open ? "(" : "[", lo, hi, open ? ")" : "]"), "number");
}

CLI::Validator one_of(std::vector<std::string> words) {
    const CLI::Validator member = CLI::IsMember(words);
    return CLI::Validator(
        [=](std::string& s) -> std::string {
            if (member(s).empty()) return {};
            std::string list;
            for (std::size_t i = 0; i < words.size(); ++i)
                list += (i == 0 ? "" : i + 1 == words.size() ? " or " : ", ") + words[i];
            const std::string near = closest(s, words);
            return fmt::format("'{}' is not {}{}", s, list, near.empty() ? "" : fmt::format(" (did you mean '{}'?)", near));
        },
        "", "word");
}

std::pair<int, int> parse_range(const std::string& text, const char* what) {
    auto r = number_range(text);
    if (!r) throw InputError(fmt::format("{} '{}': expected LO..HI or one whole number", what, text));
    if (r->first > r->second) throw InputError(fmt::format("{} '{}': the low end is above the high end", what, text));
    constexpr long long big = std::numeric_limits<int>::max();
    if (r->first < -big || r->second > big) throw InputError(fmt::format("{} '{}': outside {}..{}", what, text, -big, big));
    return {static_cast<int>(r->first), static_cast<int>(r->second)};
}

// 2^43 MiB is 2^63 bytes: the largest cap whose shift to bytes cannot wrap.
using limits::max_memory_mib;

CLI::Option* add_memory_limit(CLI::App& cmd, std::optional<long long>& mib) {
    return cmd
        .add_option("--memory-limit", mib,
                    fmt::format("memory cap in MiB for one computation (default {}, at most {})",
                                limits::default_memory_bytes >> 20, max_memory_mib))
        ->type_name("MIB")
        ->check(whole_in(1, max_memory_mib));
}

void apply_memory_limit(const std::optional<long long>& mib) {
    if (!mib) return;
    if (*mib < 1 || *mib > max_memory_mib)  // the flag's check already refused these
        throw InputError(fmt::format("--memory-limit {}: expected 1..{} MiB", *mib, max_memory_mib));
    limits::set_memory_bytes(static_cast<std::uint64_t>(*mib) << 20);
}

namespace {

std::string after(const std::string& s, const std::string& key) {
    const auto k = s.find(key);
    return k == std::string::npos ? std::string() : s.substr(k + key.size());
}

}  // namespace

std::string in_our_words(const CLI::ParseError& e) {
    const std::string kind = e.get_name();
    const std::string m = e.what();
    std::smatch g;
    // Our validators' own words, after the flag: "--length 0 is outside 1..1000000".
    if (kind == "ValidationError") return std::regex_replace(m, std::regex("^(\\S+): "), "$1 ");
    if (kind == "ArgumentMismatch") {
        if (std::regex_search(m, g, std::regex("^(\\S+): At Most (\\d+) required but received (\\d+)")))
            return fmt::format("{} is given {} times; give it {}", g[1].str(), g[3].str(),
                               g[2].str() == "1" ? "once" : "at most " + g[2].str() + " times");
        if (std::regex_search(m, g, std::regex("^(\\S+): At least (\\d+) required but received (\\d+)")))
            return fmt::format("{} needs a value", g[1].str());
        if (std::regex_search(m, g, std::regex("^Expected exactly (\\d+) arguments to (\\S+), got (\\d+)")))
            return fmt::format("{} takes {} value{}, got {}", g[2].str(), g[1].str(), g[1].str() == "1" ? "" : "s",
                               g[3].str());
        if (std::regex_search(m, g, std::regex("^Expected at least (\\d+) arguments to (\\S+), got (\\d+)")))
            return fmt::format("{} needs a value", g[2].str());
        if (std::regex_search(m, g, std::regex("^(\\S+): ")))
            return fmt::format("{} is given a value it cannot take", g[1].str());
    }
    if (kind == "ExcludesError" && std::regex_search(m, g, std::regex("^(\\S+) excludes (\\S+)")))
        return fmt::format("give either {} or {}, not both", g[1].str(), g[2].str());
    if (kind == "RequiresError" && std::regex_search(m, g, std::regex("^(\\S+) requires (\\S+)")))
        return fmt::format("{} needs {}", g[1].str(), g[2].str());
    if (kind == "ExtrasError") return fmt::format("unexpected word(s): {}", after(m, ": "));
    if (kind == "ConversionError") {
        if (std::regex_search(m, g, std::regex("^Could not convert: (\\S+) = (.*)$")))
            return fmt::format("{} '{}': not a value it takes", g[1].str(), g[2].str());
        if (std::regex_search(m, g, std::regex("^(\\S+): too many inputs for a flag")))
            return fmt::format("{} is a flag and takes no value", g[1].str());
    }
    if (kind == "RequiredError") {
        if (m.find("subcommand") != std::string::npos) return "say which command to run";
        if (std::regex_search(m, g, std::regex("^(\\S+) is required")))
            return fmt::format("{} is missing: give it", g[1].str());
    }
    return fmt::format("cannot read the arguments ({})", m);
}

std::string closest(const std::string& word, const std::vector<std::string>& known) {
    std::string best;
    std::size_t best_d = 3;  // farther than 2 edits is no hint
    for (const auto& k : known) {
        std::vector<std::size_t> row(k.size() + 1);
        for (std::size_t j = 0; j <= k.size(); ++j) row[j] = j;
        for (std::size_t i = 1; i <= word.size(); ++i) {
            std::size_t diag = row[0];
            row[0] = i;
            for (std::size_t j = 1; j <= k.size(); ++j) {
                const std::size_t up = row[j];
                row[j] = std::min({row[j] + 1, row[j - 1] + 1, diag + (word[i - 1] == k[j - 1] ? 0 : 1)});
                diag = up;
            }
        }
        // A swap of two neighbouring letters ("dule") counts as one edit.
        std::size_t d = row[k.size()];
        if (word.size() == k.size()) {
            std::size_t diff = 0, first = 0;
            for (std::size_t i = 0; i < k.size(); ++i)
                if (word[i] != k[i]) {
                    if (diff++ == 0) first = i;
                }
            if (diff == 2 && first + 1 < k.size() && word[first] == k[first + 1] && word[first + 1] == k[first])
                d = std::min<std::size_t>(d, 1);
        }
        if (d < best_d) {
            best_d = d;
            best = k;
        }
    }
    return best;
}

}  // namespace overshoot::cli
