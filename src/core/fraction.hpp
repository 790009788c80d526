#pragma once
// Exact fractions as text: written as "num/den" or rounded decimals, and read
// back (certificates, exact duels).
#include <gmpxx.h>

#include <string>

namespace overshoot {

// "num/den" (den 1 is still written), and the value rounded to `places`
// decimals (ties away from zero), e.g. "0.512345" or "-0.001200".
std::string fraction_string(const mpq_class& q);
std::string decimal_string(const mpq_class& q, int places);
// Parses "num/den" or an integer, as written (not reduced: callers that
// compute with it canonicalize); throws InputError naming `what` when malformed.
mpq_class parse_fraction(const std::string& text, const std::string& what);

}  // namespace overshoot
