#pragma once
// Numerical self-checks: a probability vector the engine produces must be
// made of numbers in [0, 1] that sum to 1, each within its error bound. A
// violation is a bug in the engine, never the user's input: it is thrown as
// InternalError with the numbers, not passed on as a silent wrong answer.
#include <fmt/format.h>

#include <cmath>
#include <initializer_list>
#include <span>
#include <string_view>

#include "core/error.hpp"

namespace overshoot::selfcheck {

// Floating-point slack on top of the proven bound: the additions of the check
// itself, plus the accumulated rounding the bounds leave out (the same slack
// duel() has always used).
inline constexpr long double slack = 1e-9L;

// Extra slack for numbers from a linear solve whose error is only known a
// posteriori (residual times a condition number nobody has proven): wide
// enough never to fire on rounding, narrow enough to catch a failed solve.
inline constexpr long double solve_slack = 1e-6L;

// Each part lies in [-bound, 1 + bound] and the parts sum to 1 within
// parts.size() * bound + slack. NaN or infinity always fails.
inline void check_distribution(std::span<const long double> parts, long double bound, std::string_view what) {
    long double total = 0;
    for (std::size_t i = 0; i < parts.size(); ++i) {
        const long double p = parts[i];
        if (!std::isfinite(p) || !(p >= -bound - slack && p <= 1 + bound + slack))
            throw InternalError(fmt::format("self-check failed: {}: outcome {} is {:.17g}, not a probability "
                                            "within the bound {:.3g}",
                                            what, i, static_cast<double>(p), static_cast<double>(bound)));
        total += p;
    }
    const long double tol = static_cast<long double>(parts.size()) * bound + slack;
    if (!std::isfinite(bound) || !(std::fabs(total - 1.0L) <= tol))
        throw InternalError(fmt::format("self-check failed: {}: the outcomes sum to {:.17g}, not 1 within {:.3g}",
                                        what, static_cast<double>(total), static_cast<double>(tol)));
}

inline void check_distribution(std::initializer_list<long double> parts, long double bound, std::string_view what) {
    check_distribution(std::span<const long double>(parts.begin(), parts.size()), bound, what);
}

// One probability: a number in [-bound, 1 + bound].
inline void check_probability(long double p, long double bound, std::string_view what) {
    if (!std::isfinite(p) || !std::isfinite(bound) || !(p >= -bound - slack && p <= 1 + bound + slack))
        throw InternalError(fmt::format("self-check failed: {} is {:.17g}, not a probability within the bound {:.3g}",
                                        what, static_cast<double>(p), static_cast<double>(bound)));
}

// A value two methods must agree on: within [lo - tol, hi + tol].
inline void check_within(long double value, long double lo, long double hi, long double tol, std::string_view what) {
    if (!std::isfinite(value) || !(value >= lo - tol && value <= hi + tol))
        throw InternalError(fmt::format("self-check failed: {}: {:.17g} is outside [{:.17g}, {:.17g}]", what,
                                        static_cast<double>(value), static_cast<double>(lo - tol),
                                        static_cast<double>(hi + tol)));
}

}  // namespace overshoot::selfcheck
