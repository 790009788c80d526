#include "core/family.hpp"

#include <fmt/format.h>

#include <cctype>
#include <fstream>
#include <limits>
#include <set>
#include <sstream>

#include "core/constraint_family.hpp"
#include "core/error.hpp"
#include "core/numbers.hpp"

namespace overshoot {

namespace {

std::string trim(std::string_view s) {
    std::size_t a = 0, b = s.size();
    while (a < b && std::isspace(static_cast<unsigned char>(s[a]))) ++a;
    while (b > a && std::isspace(static_cast<unsigned char>(s[b - 1]))) --b;
    return std::string(s.substr(a, b - a));
}

std::string strip_spaces(std::string_view s) {
    std::string out;
    for (char c : s)
        if (!std::isspace(static_cast<unsigned char>(c))) out += c;
    return out;
}

bool all_digits(std::string_view s) {
    if (s.empty()) return false;
    for (char c : s)
        if (!std::isdigit(static_cast<unsigned char>(c))) return false;
    return true;
}

int to_int(std::string_view s, std::string_view item) {
    auto v = whole_number(s);
    if (!v || *v < 1 || *v > std::numeric_limits<int>::max())
        throw InputError(fmt::format("family item '{}': '{}' is not a positive whole number", item, s));
    return static_cast<int>(*v);
}

// "N", "N..M" -> list; empty text -> {1} when allow_empty.
std::vector<int> range_list(std::string_view s, std::string_view item, bool allow_empty) {
    if (s.empty()) {
        if (allow_empty) return {1};
        throw InputError(fmt::format("family item '{}': missing number of sides after 'd'", item));
    }
    std::vector<int> out;
    if (s.front() == '{')
        // Braces after 'd' list one die's faces in other dice notations; ours
        // never used them for faces, and the sides list has its own item now.
        throw InputError(fmt::format("family item '{}': braces after 'd' are not a list of sides; write "
                                     "dice(count=..., sides=4,6,8) (docs/sweep.md, \"Families\")",
                                     item));
    auto dots = s.find("..");
    if (dots == std::string_view::npos) return {to_int(s, item)};
    int lo = to_int(s.substr(0, dots), item), hi = to_int(s.substr(dots + 2), item);
    if (hi < lo) throw InputError(fmt::format("family item '{}': the range {} is empty", item, s));
    if (hi - lo >= static_cast<int>(max_family_size))
        throw InputError(fmt::format("family item '{}': the range {} is too long", item, s));
    for (int v = lo; v <= hi; ++v) out.push_back(v);
    return out;
}

// A dice item "COUNT d SIDES" where COUNT and SIDES use ranges or lists;
// false when the item is not of that shape (then it is a plain spec).
bool dice_item(const std::string& item, std::vector<Option>& out) {
    // The 'd' that separates count from sides: the first 'd' outside braces.
    std::size_t d = item.find('d');
    if (d == std::string::npos) return false;
    std::string count = item.substr(0, d), sides = item.substr(d + 1);
    bool ranged = count.find("..") != std::string::npos || sides.find("..") != std::string::npos ||
                  (!sides.empty() && sides.front() == '{');  // refused in range_list, with the new spelling
    if (!ranged) return false;  // plain NdS: let the spec parser take it
    auto is_count = [](const std::string& c) {
        if (c.empty()) return true;
        auto dots = c.find("..");
        if (dots == std::string::npos) return all_digits(c);
        return all_digits(c.substr(0, dots)) && all_digits(c.substr(dots + 2));
    };
    if (!is_count(count))
        throw InputError(fmt::format("family item '{}': expected COUNT d SIDES with COUNT like 2 or 1..6", item));
    std::vector<int> counts = range_list(count, item, true);
    std::vector<int> sidelist = range_list(sides, item, false);
    if (counts.size() * sidelist.size() > max_family_size)
        throw LimitError(fmt::format("family item '{}' makes {} options; the limit is {}", item,
                                     counts.size() * sidelist.size(), max_family_size));
    for (int n : counts)
        for (int s : sidelist) {
            std::string spec = fmt::format("{}d{}", n, s);
            try {
                out.push_back(parse_option(spec));
            } catch (const InputError& e) {
                throw InputError(fmt::format("family item '{}': {}: {}", item, spec, e.what()));
            }
        }
    return true;
}

void file_item(const std::string& path, std::vector<Option>& out) {
    std::ifstream in(path);
    if (!in) throw InputError(fmt::format("family file '{}': cannot open it", path));
    std::string line;
    int number = 0;
    while (std::getline(in, line)) {
        ++number;
        auto hash = line.find('#');
        if (hash != std::string::npos) line = line.substr(0, hash);
        std::string t = trim(line);
        if (t.empty()) continue;
        std::string name, spec;
        auto eq = t.find('=');
        if (eq == std::string::npos) {
            spec = t;
            name = strip_spaces(t);
        } else {
            name = trim(t.substr(0, eq));
            spec = trim(t.substr(eq + 1));
            if (name.empty()) throw InputError(fmt::format("{}:{}: a name is missing before '='", path, number));
        }
        try {
            out.push_back(parse_option(spec, name));
        } catch (const InputError& e) {
            throw InputError(fmt::format("{}:{}: {}", path, number, e.what()));
        }
        if (out.size() > max_family_size)
            throw LimitError(fmt::format("{}: more than {} options", path, max_family_size));
    }
}

}  // namespace

std::vector<Option> parse_family(std::string_view text) {
    std::vector<Option> out;
    std::size_t start = 0;
    while (start <= text.size()) {
        std::size_t semi = text.find(';', start);
        std::string raw = trim(text.substr(start, semi == std::string_view::npos ? text.npos : semi - start));
        if (!raw.empty()) {
            if (raw.front() == '@') {
                file_item(trim(raw.substr(1)), out);
            } else {
                std::string item = strip_spaces(raw);
                if (auto made = expand_keyword_item(item, max_family_size)) {
                    out.insert(out.end(), made->begin(), made->end());
                } else if (!dice_item(item, out)) {
                    try {
                        out.push_back(parse_option(raw));
                    } catch (const InputError& e) {
                        throw InputError(fmt::format("family item '{}': {}", raw, e.what()));
                    }
                }
            }
        }
        if (semi == std::string_view::npos) break;
        start = semi + 1;
    }
    return out;
}

FamilyOptions expand_families(const std::vector<std::string>& texts) {
    FamilyOptions f;
    for (const auto& t : texts) {
        auto part = parse_family(t);
        f.options.insert(f.options.end(), part.begin(), part.end());
        if (f.options.size() > max_family_size)
            throw LimitError(fmt::format("the family makes at least {} options (before equal ones are merged); the "
                                         "limit is {}",
                                         f.options.size(), max_family_size));
    }
    f.merged = merge_equal_options(f.options);
    std::set<std::string> seen;
    for (const auto& o : f.options)
        if (!seen.insert(o.name).second)
            throw InputError(fmt::format("the family lists option '{}' twice; give each option its own name", o.name));
    if (f.options.empty())
        throw InputError("the family is empty: give items like dice(count=1..6, sides=4,6,8) or @options.txt");
    return f;
}

std::vector<Option> parse_families(const std::vector<std::string>& texts) { return expand_families(texts).options; }

}  // namespace overshoot
