#include "core/option.hpp"

#include <fmt/format.h>

#include <numeric>
#include <set>

#include "core/error.hpp"
#include "core/limits.hpp"

namespace overshoot {

int Option::min_move() const {
    for (std::size_t m = 0; m < weight.size(); ++m)
        if (weight[m] != 0) return static_cast<int>(m);
    return 0;
}

long double Option::probability(int move) const {
    if (move < 0 || move > max_move()) return 0.0L;
    return static_cast<long double>(weight[move]) / static_cast<long double>(denominator);
}

double Option::mean() const {
    long double s = 0;
    for (std::size_t m = 0; m < weight.size(); ++m) s += static_cast<long double>(m) * weight[m];
    return static_cast<double>(s / denominator);
}

namespace {

using u64 = std::uint64_t;
__extension__ typedef unsigned __int128 u128;

struct Dist {
    std::vector<u64> w{1};  // a point mass at 0
    u64 den = 1;
};

class Parser {
public:
    explicit Parser(std::string_view text) : text_(text) {}

    Dist parse() {
        skip();
        if (pos_ >= text_.size()) fail("is empty");
        Dist total = term();
        skip();
        while (pos_ < text_.size() && text_[pos_] == '+') {
            ++pos_;
            Dist next = term();
            total = convolve(total, next);
            skip();
        }
        if (pos_ < text_.size()) fail(fmt::format("unexpected '{}'", text_[pos_]));
        return total;
    }

private:
    std::string_view text_;
    std::size_t pos_ = 0;

    [[noreturn]] void fail(const std::string& what) const {
        throw InputError(fmt::format("option spec '{}' at column {}: {}", text_,
                                     std::min(pos_, text_.size()) + 1, what));
    }

    void skip() {
        while (pos_ < text_.size() && (text_[pos_] == ' ' || text_[pos_] == '\t')) ++pos_;
    }

    bool peek_digit() {
        skip();
        return pos_ < text_.size() && text_[pos_] >= '0' && text_[pos_] <= '9';
    }

    // A non-negative integer no larger than `cap`.
    u64 integer(u64 cap, const char* what) {
        skip();
        if (pos_ < text_.size() && text_[pos_] == '-') fail(fmt::format("{} must not be negative", what));
        if (!peek_digit()) fail(fmt::format("expected {}", what));
        u64 v = 0;
        while (pos_ < text_.size() && text_[pos_] >= '0' && text_[pos_] <= '9') {
            const u64 digit = static_cast<u64>(text_[pos_] - '0');
            // Checked before multiplying: v * 10 could wrap past 2^64 and look small.
            if (v > (cap - digit) / 10) fail(fmt::format("{} is larger than the limit {}", what, cap));
            v = v * 10 + digit;
            ++pos_;
        }
        return v;
    }

    void expect(char c) {
        skip();
        if (pos_ >= text_.size()) fail(fmt::format("expected '{}' before the end", c));
        if (text_[pos_] != c) fail(fmt::format("expected '{}', found '{}'", c, text_[pos_]));
        ++pos_;
    }

    bool accept(char c) {
        skip();
        if (pos_ < text_.size() && text_[pos_] == c) {
            ++pos_;
            return true;
        }
        return false;
    }

    static void reduce(Dist& d) {
        u64 g = d.den;
        for (u64 x : d.w) g = std::gcd(g, x);
        if (g > 1) {
            for (u64& x : d.w) x /= g;
            d.den /= g;
        }
        while (d.w.size() > 1 && d.w.back() == 0) d.w.pop_back();
    }

    Dist convolve(const Dist& a, const Dist& b) {
        u128 den = static_cast<u128>(a.den) * b.den;
        if (den > limits::max_denominator)
            fail(fmt::format("the distribution's denominator would be {} x {}, above the limit 2^62 (too many or "
                             "too large dice)", a.den, b.den));
        std::size_t size = a.w.size() + b.w.size() - 1;
        if (size - 1 > static_cast<std::size_t>(limits::max_move))
            fail(fmt::format("a move larger than the limit {}", limits::max_move));
        u64 nonzero = 0;
        for (u64 x : a.w) nonzero += x != 0;
        if (static_cast<u128>(nonzero) * b.w.size() > limits::max_spec_work)
            throw LimitError(fmt::format("option spec '{}': expanding it would take about {} multiply-adds, above the "
                                         "limit of {}", text_, static_cast<u64>(nonzero * b.w.size()),
                                         limits::max_spec_work));
        Dist r;
        r.w.assign(size, 0);
        r.den = static_cast<u64>(den);
        for (std::size_t i = 0; i < a.w.size(); ++i) {
            if (a.w[i] == 0) continue;
            for (std::size_t j = 0; j < b.w.size(); ++j)
                r.w[i + j] += a.w[i] * b.w[j];  // bounded by den <= 2^62
        }
        reduce(r);
        return r;
    }

    Dist power(const Dist& d, u64 n) {
        Dist result;  // point mass at 0
        Dist base = d;
        while (n > 0) {
            if (n & 1) result = convolve(result, base);
            n >>= 1;
            if (n > 0) base = convolve(base, base);
        }
        return result;
    }

    // NdS by N passes of a sliding-window sum: O(N * N * S) additions instead
    // of squaring dense distributions (2d50000 would need 2.5e9 multiply-adds).
    Dist fair_dice(u64 count, u64 sides) {
        u128 den = 1;
        for (u64 i = 0; i < count; ++i) {
            den *= sides;
            if (den > limits::max_denominator)
                fail(fmt::format("the distribution's denominator would be {}^{}, above the limit 2^62 (too many or "
                                 "too large dice)", sides, count));
        }
        if (count * sides > static_cast<u64>(limits::max_move))
            fail(fmt::format("a move larger than the limit {}", limits::max_move));
        Dist d;  // a point mass at 0
        for (u64 i = 0; i < count; ++i) {
            std::vector<u64> next(d.w.size() + sides, 0);
            u64 window = 0;  // sum of d.w[k - sides .. k - 1], at most den <= 2^62
            for (std::size_t k = 1; k < next.size(); ++k) {
                if (k - 1 < d.w.size()) window += d.w[k - 1];
                if (k > sides && k - 1 - sides < d.w.size()) window -= d.w[k - 1 - sides];
                next[k] = window;
            }
            d.w = std::move(next);
        }
        d.den = static_cast<u64>(den);
        reduce(d);
        return d;
    }

    Dist term() {
        skip();
        if (pos_ >= text_.size()) fail("expected a term before the end");
        u64 count = 1;
        bool have_count = false;
        if (peek_digit()) {
            count = integer(limits::max_move, "a number");
            have_count = true;
        }
        skip();
        char c = pos_ < text_.size() ? text_[pos_] : '\0';
        if (c == 'd' || c == 'D') {
            if (have_count && count == 0) fail("the number of dice must be at least 1");
            if (count > static_cast<u64>(limits::max_dice))
                fail(fmt::format("more than {} dice", limits::max_dice));
            ++pos_;
            u64 sides = integer(limits::max_sides, "the number of sides");
            if (sides == 0) fail("a die needs at least 1 side");
            return fair_dice(count, sides);
        }
        if (c == '[') {
            if (have_count && count == 0) fail("the number of dice must be at least 1");
            if (count > static_cast<u64>(limits::max_dice))
                fail(fmt::format("more than {} dice", limits::max_dice));
            ++pos_;
            Dist die;
            die.w.clear();
            die.den = 0;
            if (accept(']')) fail("a die needs at least one face");
            do {
                u64 face = integer(limits::max_move, "a face");
                if (die.w.size() <= face) die.w.resize(face + 1, 0);
                ++die.w[face];
                if (++die.den > static_cast<u64>(limits::max_faces))
                    fail(fmt::format("more than {} faces", limits::max_faces));
            } while (accept(','));
            expect(']');
            reduce(die);
            return power(die, count);
        }
        if (c == '{') {
            if (have_count) fail("a spinner cannot take a count; write it as a sum");
            ++pos_;
            Dist sp;
            sp.w.clear();
            sp.den = 0;
            std::size_t sectors = 0;
            if (accept('}')) fail("a spinner needs at least one move");
            do {
                u64 move = integer(limits::max_move, "a move");
                expect(':');
                u64 w = integer(limits::max_denominator, "a weight");
                if (w == 0) fail("a weight must be at least 1");
                if (sp.w.size() <= move) sp.w.resize(move + 1, 0);
                if (sp.w[move] != 0) fail(fmt::format("move {} is listed twice", move));
                sp.w[move] = w;
                if (static_cast<u128>(sp.den) + w > limits::max_denominator)
                    fail("the weights add up to more than 2^62");
                sp.den += w;
                if (++sectors > static_cast<std::size_t>(limits::max_faces))
                    fail(fmt::format("more than {} moves", limits::max_faces));
            } while (accept(','));
            expect('}');
            reduce(sp);
            return sp;
        }
        if (have_count) {  // a constant number of squares
            Dist k;
            k.w.assign(count + 1, 0);
            k.w[count] = 1;
            return k;
        }
        if (c == '\0') fail("expected a term before the end");
        fail(fmt::format("unexpected '{}'", c));
    }
};

}  // namespace

std::string escape_controls(const std::string& text) {
    std::string shown;
    for (std::size_t i = 0; i < text.size();) {
        const auto c = static_cast<unsigned char>(text[i]);
        // C0 controls and DEL; C1 controls U+0080..U+009F are 0xC2 then 0x80..0x9F in UTF-8.
        const int n = c < 0x20 || c == 0x7f ? 1
                      : c == 0xc2 && i + 1 < text.size() && (static_cast<unsigned char>(text[i + 1]) & 0xe0) == 0x80 ? 2
                                                                                                                      : 0;
        if (n == 0) shown += text[i++];
        for (int k = 0; k < n; ++k) shown += fmt::format("\\x{:02x}", static_cast<unsigned char>(text[i++]));
    }
    return shown;
}

void require_printable(const std::string& text, const char* what) {
    const std::string shown = escape_controls(text);
    if (shown != text)
        throw InputError(fmt::format("{} '{}' holds a control character; names and specs must be printable text", what,
                                     shown));
}

Option parse_option(std::string_view spec, std::string name) {
    require_printable(name, "option name");
    require_printable(std::string(spec), "spec");
    Dist d = Parser(spec).parse();
    Option o;
    o.name = std::move(name);
    o.spec = std::string(spec);
    o.weight = std::move(d.w);
    o.denominator = d.den;
    return o;
}

Option parse_option(std::string_view spec) { return parse_option(spec, std::string(spec)); }

std::optional<std::size_t> first_repeated_name(const std::vector<std::string>& names) {
    std::set<std::string> seen;
    for (std::size_t i = 0; i < names.size(); ++i)
        if (!seen.insert(names[i]).second) return i;
    return std::nullopt;
}

void require_distinct_names(const std::vector<std::string>& names) {
    if (auto i = first_repeated_name(names))
        throw InputError(fmt::format("option name '{}' appears twice; give each option its own name", names[*i]));
}

void require_distinct_names(const std::vector<Option>& options) {
    std::vector<std::string> names;
    names.reserve(options.size());
    for (const Option& o : options) names.push_back(o.name);
    require_distinct_names(names);
}

}  // namespace overshoot
