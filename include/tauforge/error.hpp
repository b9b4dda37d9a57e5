#pragma once
/// tauforge's exceptions: invalid input is an error, an infeasible design is not.
///
/// Every message names the function, the parameter, its value with its unit and
/// what would be valid, e.g.
/// "crossing_time: tau = -1 ms is invalid; expected a positive, finite time constant".
/// Message texts are stable and tested word for word.

#include <stdexcept>
#include <string>

namespace tauforge {

/// A parameter value that no computation accepts: non-positive R or C, NaN,
/// infinity, a tolerance of 100 % or more, an empty value set, an inverted range.
class invalid_argument : public std::invalid_argument {
public:
    using std::invalid_argument::invalid_argument;
};

/// Text that does not read as a value of the expected quantity.
class parse_error : public invalid_argument {
public:
    parse_error(std::string text, const std::string& message)
        : invalid_argument(message), text_(std::move(text)) {}
    /// The text that was rejected.
    const std::string& text() const noexcept { return text_; }

private:
    std::string text_;
};

/// Valid values that together ask for the impossible: a threshold the RC
/// network can never reach, a duty cycle the topology cannot produce.
class domain_error : public std::domain_error {
public:
    using std::domain_error::domain_error;
};

}  // namespace tauforge
