#pragma once
/// Reading and writing values the way engineers write them: SI prefixes,
/// RKM code (IEC 60062), tolerance letters.
///
///     format(4.7_kohm)                       // "4.7 kΩ"
///     format(100_nF, {.chars = charset::ascii}) // "100 nF"

#include "tauforge/error.hpp"
#include "tauforge/units.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <string_view>

namespace tauforge {

/// Unicode (Ω, µ) for people, ASCII (ohm, u) for terminals, CSV and file names.
enum class charset { unicode, ascii };

/// How `format` writes a value.
struct format_options {
    int digits = 3;                       ///< significant digits, 1..17
    charset chars = charset::unicode;     ///< Ω and µ, or ohm and u
    bool trailing_zeros = false;          ///< keep "4.70 kΩ" instead of "4.7 kΩ"
};

/// The unit symbol of a quantity type, in either character set.
template <class Q>
struct unit_symbol;
template <> struct unit_symbol<resistance> {
    static constexpr std::string_view unicode = "\u03A9", ascii = "ohm";
};
template <> struct unit_symbol<capacitance> { static constexpr std::string_view unicode = "F", ascii = "F"; };
template <> struct unit_symbol<duration> { static constexpr std::string_view unicode = "s", ascii = "s"; };
template <> struct unit_symbol<voltage> { static constexpr std::string_view unicode = "V", ascii = "V"; };
template <> struct unit_symbol<current> { static constexpr std::string_view unicode = "A", ascii = "A"; };
template <> struct unit_symbol<frequency> { static constexpr std::string_view unicode = "Hz", ascii = "Hz"; };
template <> struct unit_symbol<conductance> { static constexpr std::string_view unicode = "S", ascii = "S"; };
template <> struct unit_symbol<charge> { static constexpr std::string_view unicode = "C", ascii = "C"; };
template <> struct unit_symbol<power> { static constexpr std::string_view unicode = "W", ascii = "W"; };
template <> struct unit_symbol<ratio> { static constexpr std::string_view unicode = "", ascii = ""; };

namespace detail {

struct si_prefix {
    int exponent;
    std::string_view unicode;
    std::string_view ascii;
};
// femto .. tera: the range component values live in.
inline constexpr std::array<si_prefix, 10> si_prefixes{{
    {-15, "f", "f"}, {-12, "p", "p"}, {-9, "n", "n"}, {-6, "\u00B5", "u"}, {-3, "m", "m"},
    {0, "", ""}, {3, "k", "k"}, {6, "M", "M"}, {9, "G", "G"}, {12, "T", "T"},
}};

/// A value rounded to `digits` significant figures, split for engineering notation:
/// value ≈ mantissa_text × 10^exponent, exponent a multiple of 3 within the prefix range.
struct engineering_parts {
    std::string mantissa;  ///< e.g. "4.7", "-100", "0"
    int exponent = 0;      ///< multiple of 3 in [-15, 12]
};

inline std::string trim_fraction_zeros(std::string s) {
    if (s.find('.') == std::string::npos) return s;
    while (!s.empty() && s.back() == '0') s.pop_back();
    if (!s.empty() && s.back() == '.') s.pop_back();
    return s;
}

/// Round first, then choose the prefix, so 999.96 at 3 digits becomes "1 k", not "1000".
inline engineering_parts split_engineering(double v, int digits, bool trailing_zeros) {
    if (digits < 1 || digits > 17)
        throw invalid_argument("format: digits = " + std::to_string(digits) +
                               " is invalid; expected 1 to 17 significant digits");
    if (v == 0.0) return {trailing_zeros && digits > 1 ? "0." + std::string(digits - 1, '0') : "0", 0};
    // The decimal exponent of the value after rounding to `digits` figures,
    // read back from printf's own correctly rounded %e output.
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.*e", digits - 1, v);
    const char* e_pos = buf;
    while (*e_pos != 'e') ++e_pos;
    const int decimal_exponent = std::atoi(e_pos + 1);
    int eng = decimal_exponent >= 0 ? decimal_exponent / 3 * 3 : -((-decimal_exponent + 2) / 3 * 3);
    eng = std::clamp(eng, si_prefixes.front().exponent, si_prefixes.back().exponent);
    const int decimals = std::max(0, digits - 1 - (decimal_exponent - eng));
    // Scale the already rounded value: printing the rounded text avoids a second rounding.
    const double rounded = std::strtod(buf, nullptr);
    std::snprintf(buf, sizeof buf, "%.*f", decimals, rounded / std::pow(10.0, eng));
    std::string m = buf;
    if (!trailing_zeros) m = trim_fraction_zeros(std::move(m));
    return {std::move(m), eng};
}

inline std::string_view prefix_text(int exponent, charset chars) {
    for (const auto& p : si_prefixes)
        if (p.exponent == exponent) return chars == charset::unicode ? p.unicode : p.ascii;
    return {};
}

}  // namespace detail

/// A quantity in engineering notation with an SI prefix: 4700 Ω -> "4.7 kΩ".
/// NaN and infinities are written "nan" and "inf" with the unit.
template <class Unit>
std::string format(si_quantity<Unit> q, format_options opt = {}) {
    using Q = si_quantity<Unit>;
    const std::string_view unit = opt.chars == charset::unicode ? unit_symbol<Q>::unicode : unit_symbol<Q>::ascii;
    const double v = q.value();
    std::string out;
    int exponent = 0;
    if (std::isnan(v)) {
        out = "nan";
    } else if (std::isinf(v)) {
        out = v < 0 ? "-inf" : "inf";
    } else {
        auto parts = detail::split_engineering(v, opt.digits, opt.trailing_zeros);
        out = std::move(parts.mantissa);
        exponent = parts.exponent;
    }
    const std::string_view prefix = detail::prefix_text(exponent, opt.chars);
    if (!unit.empty() || !prefix.empty()) {
        out += ' ';
        out += prefix;
        out += unit;
    }
    return out;
}

/// A temperature as "-40 °C" (ASCII: "-40 degC").
inline std::string format(celsius t, format_options opt = {}) {
    std::string s = detail::trim_fraction_zeros([&] {
        char buf[64];
        std::snprintf(buf, sizeof buf, "%.*g", opt.digits, t.value);
        return std::string(buf);
    }());
    return s + (opt.chars == charset::unicode ? " \u00B0C" : " degC");
}

/// A relative amount as a percentage with `digits` significant figures: 0.05 -> "5 %".
inline std::string format_percent(double fraction, int digits = 3) {
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.*g", digits, fraction * 100.0);
    return std::string(buf) + " %";
}

}  // namespace tauforge
