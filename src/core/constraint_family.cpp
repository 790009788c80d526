#include "core/constraint_family.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <functional>
#include <map>
#include <numeric>
#include <set>
#include <string>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/numbers.hpp"

namespace overshoot {

namespace {

constexpr std::uint64_t saturated = std::uint64_t{1} << 62;
__extension__ typedef unsigned __int128 u128;

enum class Kind { dice, custom, spinner };

struct Rational {
    long long num = 0, den = 1;
};

class ItemParser {
public:
    ItemParser(std::string_view item, Kind kind) : item_(item), kind_(kind) {}

    [[noreturn]] void fail(const std::string& what) const {
        throw InputError(fmt::format("family item '{}': {}", item_, what));
    }

    // key -> raw value text, from "k=v,k=v" where a part without '=' continues the previous value.
    std::map<std::string, std::string> keys(std::string_view body) {
        std::map<std::string, std::string> out;
        std::string last;
        std::size_t at = 0;
        while (at <= body.size()) {
            const std::size_t comma = body.find(',', at);
            std::string part(body.substr(at, comma == std::string_view::npos ? std::string_view::npos : comma - at));
            if (part.empty()) fail("an empty part between commas");
            const std::size_t eq = part.find('=');
            if (eq == std::string::npos) {
                if (last.empty()) fail(fmt::format("'{}' has no key; write key=value", part));
                out[last] += "," + part;
            } else {
                last = part.substr(0, eq);
                if (!allowed(last)) fail(fmt::format("unknown key '{}'; {} takes {}", last, name(), allowed_list()));
                if (out.count(last)) fail(fmt::format("the key '{}' is given twice", last));
                out[last] = part.substr(eq + 1);
                if (out[last].empty()) fail(fmt::format("the key '{}' has no value", last));
            }
            if (comma == std::string_view::npos) break;
            at = comma + 1;
        }
        return out;
    }

    long long number(std::string_view s, long long lo, long long hi, std::string_view key) const {
        const auto v = whole_number(s);
        if (!v) fail(fmt::format("{}: '{}' is not a whole number", key, s));
        if (*v < lo || *v > hi) fail(fmt::format("{}: {} is outside {}..{}", key, *v, lo, hi));
        return *v;
    }

    // "4,6,8" / "1..6" / "0..3,6": sorted distinct numbers within lo..hi.
    std::vector<int> list(const std::string& s, long long lo, long long hi, std::string_view key) const {
        std::set<int> out;
        std::size_t at = 0;
        while (at <= s.size()) {
            const std::size_t comma = s.find(',', at);
            const std::string part = s.substr(at, comma == std::string::npos ? std::string::npos : comma - at);
            const std::size_t dots = part.find("..");
            if (dots == std::string::npos)
                out.insert(static_cast<int>(number(part, lo, hi, key)));
            else {
                const long long a = number(part.substr(0, dots), lo, hi, key), b = number(part.substr(dots + 2), lo, hi, key);
                if (b < a) fail(fmt::format("{}: the range {} is empty", key, part));
                if (b - a > 1'000'000) fail(fmt::format("{}: the range {} is too long", key, part));
                for (long long v = a; v <= b; ++v) out.insert(static_cast<int>(v));
            }
            if (comma == std::string::npos) break;
            at = comma + 1;
        }
        return {out.begin(), out.end()};
    }

    Rational mean(const std::string& s) const {
        Rational r;
        const std::size_t slash = s.find('/'), dot = s.find('.');
        if (slash != std::string::npos) {
            r.num = number(s.substr(0, slash), 0, limits::max_move * 1000LL, "mean");
            r.den = number(s.substr(slash + 1), 1, 1'000'000, "mean");
        } else if (dot != std::string::npos) {
            const std::string frac = s.substr(dot + 1);
            if (frac.empty() || frac.size() > 6) fail(fmt::format("mean: '{}' needs 1 to 6 decimals", s));
            r.den = 1;
            for (std::size_t i = 0; i < frac.size(); ++i) r.den *= 10;
            r.num = number(s.substr(0, dot), 0, limits::max_move, "mean") * r.den + number(frac, 0, r.den - 1, "mean");
        } else {
            r.num = number(s, 0, limits::max_move, "mean");
        }
        const long long g = std::gcd(r.num, r.den);
        if (g > 1) {
            r.num /= g;
            r.den /= g;
        }
        return r;
    }

    const char* name() const { return kind_ == Kind::dice ? "dice" : kind_ == Kind::custom ? "custom" : "spinner"; }

private:
    bool allowed(const std::string& k) const {
        if (kind_ == Kind::dice) return k == "count" || k == "sides";
        const char* size = kind_ == Kind::custom ? "faces" : "sectors";
        const char* vals = kind_ == Kind::custom ? "values" : "moves";
        return k == size || k == vals || k == "sum" || k == "mean" || k == "count";
    }
    std::string allowed_list() const {
        if (kind_ == Kind::dice) return "count and sides";
        return kind_ == Kind::custom ? "faces, values, sum or mean, count" : "sectors, moves, sum or mean, count";
    }

    std::string_view item_;
    Kind kind_;
};

// Every non-decreasing choice of `faces` values (indices into `values`) with
// the wanted sum, in lexicographic order.
void enumerate(const std::vector<int>& values, int faces, std::optional<long long> sum,
               const std::function<void(const std::vector<int>&)>& visit) {
    std::vector<int> pick;
    pick.reserve(faces);
    std::function<void(std::size_t, long long)> go = [&](std::size_t from, long long partial) {
        const int left = faces - static_cast<int>(pick.size());
        if (left == 0) {
            if (!sum || partial == *sum) visit(pick);
            return;
        }
        for (std::size_t i = from; i < values.size(); ++i) {
            if (sum) {
                const long long low = partial + static_cast<long long>(left) * values[i];
                const long long high = partial + values[i] + static_cast<long long>(left - 1) * values.back();
                if (low > *sum) break;  // values ascend: every later choice is larger
                if (high < *sum) continue;
            }
            pick.push_back(values[i]);
            go(i, partial + values[i]);
            pick.pop_back();
        }
    };
    go(0, 0);
}

std::string die_spec(const std::vector<int>& faces, int count, Kind kind) {
    if (kind == Kind::spinner) {
        std::string one = "{";
        for (std::size_t i = 0; i < faces.size();) {
            std::size_t j = i;
            while (j < faces.size() && faces[j] == faces[i]) ++j;
            one += fmt::format("{}{}:{}", one.size() > 1 ? "," : "", faces[i], j - i);
            i = j;
        }
        one += "}";
        std::string s = one;
        for (int c = 1; c < count; ++c) s += "+" + one;
        return s;
    }
    return fmt::format("{}[{}]", count > 1 ? std::to_string(count) : std::string(), fmt::join(faces, ","));
}

}  // namespace

std::uint64_t count_multisets(int faces, const std::vector<int>& values, std::optional<long long> sum) {
    if (faces < 0 || values.empty()) return faces == 0 ? 1 : 0;
    if (!sum) {
        // C(R + F - 1, F), saturating; C(m + i, i) grows with i, so a saturated step stays saturated.
        const std::uint64_t m = values.size() - 1;
        u128 r = 1;
        for (int i = 1; i <= faces; ++i) {
            r = r * (m + static_cast<std::uint64_t>(i)) / static_cast<std::uint64_t>(i);
            if (r >= saturated) return saturated;
        }
        return static_cast<std::uint64_t>(r);
    }
    if (*sum < 0) return 0;
    const auto S = static_cast<std::size_t>(*sum);
    // Values above the sum cannot be faces; the table is faces x sum per value.
    std::size_t useful = 0;
    for (int v : values) useful += static_cast<std::size_t>(v) <= S;
    if (static_cast<double>(faces + 1) * static_cast<double>(S + 1) > 5e6 ||
        static_cast<double>(faces + 1) * static_cast<double>(S + 1) * static_cast<double>(useful) > 2e8)
        throw LimitError(fmt::format("counting dice of {} faces with sum {}: too large a table", faces, *sum));
    // ways[k][s]: multisets of k values seen so far with sum s; each value may repeat.
    std::vector<std::vector<std::uint64_t>> ways(faces + 1, std::vector<std::uint64_t>(S + 1, 0));
    ways[0][0] = 1;
    for (int v : values) {
        if (static_cast<std::size_t>(v) > S) break;  // values ascend
        for (int k = 1; k <= faces; ++k)
            for (std::size_t s = static_cast<std::size_t>(v); s <= S; ++s)
                ways[k][s] = std::min(saturated, ways[k][s] + ways[k - 1][s - static_cast<std::size_t>(v)]);
    }
    return ways[faces][S];
}

std::optional<std::vector<Option>> expand_keyword_item(std::string_view item, std::size_t cap) {
    const std::size_t open = item.find('(');
    if (open == std::string_view::npos) return std::nullopt;
    const std::string_view word = item.substr(0, open);
    Kind kind;
    if (word == "dice")
        kind = Kind::dice;
    else if (word == "custom")
        kind = Kind::custom;
    else if (word == "spinner")
        kind = Kind::spinner;
    else
        return std::nullopt;
    ItemParser p(item, kind);
    if (item.back() != ')') p.fail("'(' without a closing ')' at the end");
    auto keys = p.keys(item.substr(open + 1, item.size() - open - 2));
    std::vector<int> counts{1};
    if (keys.count("count")) counts = p.list(keys["count"], 1, limits::max_dice, "count");

    std::vector<Option> out;
    auto add = [&](const std::string& spec) {
        try {
            out.push_back(parse_option(spec));
        } catch (const InputError& e) {
            p.fail(fmt::format("{}: {}", spec, e.what()));
        }
    };
    if (kind == Kind::dice) {
        if (!keys.count("sides")) p.fail("dice needs sides=..., e.g. dice(count=1..6, sides=4,6,8)");
        const auto sides = p.list(keys["sides"], 1, limits::max_sides, "sides");
        const std::uint64_t size = counts.size() * sides.size();
        if (size > cap) throw LimitError(fmt::format("family item '{}' makes {} options; the limit is {}", item, size, cap));
        for (int c : counts)
            for (int s : sides) add(fmt::format("{}d{}", c, s));
        return out;
    }
    const char* size_key = kind == Kind::custom ? "faces" : "sectors";
    const char* values_key = kind == Kind::custom ? "values" : "moves";
    if (!keys.count(size_key) || !keys.count(values_key))
        p.fail(fmt::format("{} needs {}=... and {}=..., e.g. {}({}=6, {}=0..6, sum=21)", p.name(), size_key, values_key,
                           p.name(), size_key, values_key));
    if (keys.count("sum") && keys.count("mean")) p.fail("give sum or mean, not both");
    const auto sizes = p.list(keys[size_key], 1, 1000, size_key);
    const auto values = p.list(keys[values_key], 0, limits::max_move, values_key);
    std::optional<long long> sum;
    std::optional<Rational> mean;
    if (keys.count("sum")) sum = p.number(keys["sum"], 0, static_cast<long long>(limits::max_move) * 1000, "sum");
    if (keys.count("mean")) mean = p.mean(keys["mean"]);
    // Per number of faces, the wanted sum (none when the mean is not reachable).
    std::vector<std::pair<int, std::optional<long long>>> plan;
    for (int f : sizes) {
        if (mean) {
            if ((static_cast<long long>(f) * mean->num) % mean->den != 0) continue;
            plan.emplace_back(f, static_cast<long long>(f) * mean->num / mean->den);
        } else
            plan.emplace_back(f, sum);
    }
    if (plan.empty()) p.fail(fmt::format("no number of {} gives a whole sum for that mean", size_key));
    // Refuse before enumerating: the exact size of the item.
    std::uint64_t size = 0;
    for (const auto& [f, s] : plan) size = std::min(saturated, size + count_multisets(f, values, s));
    {
        const u128 all = static_cast<u128>(size) * counts.size();
        size = all >= saturated ? saturated : static_cast<std::uint64_t>(all);
    }
    if (size > cap)
        throw LimitError(fmt::format("family item '{}' makes {}{} options; the limit is {}", item,
                                     size >= saturated ? "more than " : "", size, cap));
    if (size == 0) p.fail("no die meets these constraints");
    for (int c : counts)
        for (const auto& [f, s] : plan)
            enumerate(values, f, s, [&](const std::vector<int>& faces) { add(die_spec(faces, c, kind)); });
    return out;
}

std::size_t merge_equal_options(std::vector<Option>& options) {
    std::set<std::pair<std::vector<std::uint64_t>, std::uint64_t>> seen;
    std::vector<Option> kept;
    kept.reserve(options.size());
    for (auto& o : options)
        if (seen.emplace(o.weight, o.denominator).second) kept.push_back(std::move(o));
    const std::size_t merged = options.size() - kept.size();
    options = std::move(kept);
    return merged;
}

}  // namespace overshoot
