#pragma once
// Argument checks shared by every public function: one wording for each rule.
// Messages read "<function>: <parameter> = <value with unit> is invalid; expected <rule>".

#include "tauforge/error.hpp"
#include "tauforge/notation.hpp"

#include <cmath>
#include <string>
#include <string_view>

namespace tauforge::detail {

inline std::string quoted_value(double v) {
    char buf[40];
    std::snprintf(buf, sizeof buf, "%.6g", v);
    return buf;
}

template <class Q>
std::string value_text(Q q) {
    return format(q, {.digits = 6});
}
inline std::string value_text(double v) { return quoted_value(v); }

template <class Q>
[[noreturn]] void fail_invalid(std::string_view function, std::string_view parameter, Q value,
                               std::string_view expected) {
    throw invalid_argument(std::string(function) + ": " + std::string(parameter) + " = " +
                           value_text(value) + " is invalid; expected " + std::string(expected));
}

template <class Q>
double finite_value(std::string_view function, std::string_view parameter, Q value,
                    std::string_view expected) {
    double v;
    if constexpr (std::is_arithmetic_v<Q>) v = value; else v = value.value();
    if (!std::isfinite(v)) fail_invalid(function, parameter, value, expected);
    return v;
}

/// Finite and > 0.
template <class Q>
void require_positive(std::string_view function, std::string_view parameter, Q value,
                      std::string_view what = "a positive, finite value") {
    if (!(finite_value(function, parameter, value, what) > 0.0)) fail_invalid(function, parameter, value, what);
}

/// Finite and >= 0.
template <class Q>
void require_non_negative(std::string_view function, std::string_view parameter, Q value,
                          std::string_view what = "a non-negative, finite value") {
    if (!(finite_value(function, parameter, value, what) >= 0.0)) fail_invalid(function, parameter, value, what);
}

/// Finite (any sign).
template <class Q>
void require_finite(std::string_view function, std::string_view parameter, Q value,
                    std::string_view what = "a finite value") {
    (void)finite_value(function, parameter, value, what);
}

/// "\"a\", \"b\", \"c\"": the names of a network's table, for "expected one of" messages.
template <class Table>
std::string quoted_names(const Table& table) {
    std::string out;
    for (const auto& entry : table) {
        out += out.empty() ? "\"" : ", \"";
        out += entry.name;
        out += '"';
    }
    return out;
}

}  // namespace tauforge::detail
