#pragma once
// Errors the library reports to its caller. The CLI turns each into one line on
// stderr and exit status 2; the library itself never prints.
#include <stdexcept>
#include <string>

namespace overshoot {

// Bad input from the user: a malformed spec, an invalid board, a bad file.
struct InputError : std::runtime_error {
    using std::runtime_error::runtime_error;
};

// An input that is well formed but would exceed a documented resource limit.
struct LimitError : InputError {
    using InputError::InputError;
};

// A violated internal invariant (a probability vector that does not sum to 1).
struct InternalError : std::runtime_error {
    using std::runtime_error::runtime_error;
};

}  // namespace overshoot
