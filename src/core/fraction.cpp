#include "core/fraction.hpp"

#include <fmt/format.h>

#include "core/error.hpp"

namespace overshoot {

std::string fraction_string(const mpq_class& q) {
    return q.get_num().get_str() + "/" + q.get_den().get_str();
}

std::string decimal_string(const mpq_class& q, int places) {
    mpz_class scale;
    mpz_ui_pow_ui(scale.get_mpz_t(), 10, static_cast<unsigned long>(places));
    mpz_class num = abs(q.get_num()) * scale * 2 + q.get_den();
    mpz_class den = q.get_den() * 2;
    mpz_class r;
    mpz_fdiv_q(r.get_mpz_t(), num.get_mpz_t(), den.get_mpz_t());  // round half away from zero
    std::string digits = r.get_str();
    if (static_cast<int>(digits.size()) <= places) digits.insert(0, static_cast<std::size_t>(places + 1) - digits.size(), '0');
    std::string out = digits.substr(0, digits.size() - places);
    if (places > 0) out += "." + digits.substr(digits.size() - places);
    if (q < 0 && r != 0) out.insert(0, "-");
    return out;
}

mpq_class parse_fraction(const std::string& text, const std::string& what) {
    auto digits_ok = [](const std::string& s, bool sign) {
        std::size_t i = sign && !s.empty() && s[0] == '-' ? 1 : 0;
        if (i >= s.size()) return false;
        for (; i < s.size(); ++i)
            if (s[i] < '0' || s[i] > '9') return false;
        return true;
    };
    auto slash = text.find('/');
    std::string num = text.substr(0, slash);
    std::string den = slash == std::string::npos ? "1" : text.substr(slash + 1);
    if (!digits_ok(num, true) || !digits_ok(den, false))
        throw InputError(fmt::format("{}: '{}' is not a fraction num/den", what,
                                     text.size() > 40 ? text.substr(0, 40) + "..." : text));
    mpq_class q;
    q.get_num() = mpz_class(num, 10);
    q.get_den() = mpz_class(den, 10);
    if (q.get_den() == 0) throw InputError(fmt::format("{}: zero denominator", what));
    return q;
}

}  // namespace overshoot
