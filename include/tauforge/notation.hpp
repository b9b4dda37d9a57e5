#pragma once
/// Reading and writing values the way engineers write them: SI prefixes,
/// RKM code (IEC 60062), tolerance letters.
///
///     format(4.7_kohm)                          // "4.7 kΩ"
///     format(100_nF, {.chars = charset::ascii}) // "100 nF"
///     format_rkm(4.7_kohm)                      // "4K7"
///     parse<resistance>("4k7")                  // 4700 Ω
///     parse<capacitance>("100 nF")              // 1e-7 F
///     parse_tolerance("J")                      // {0.05, 0.05}
///
/// Parsing (`parse<Q>`, Q one of resistance, capacitance, duration, voltage,
/// current, frequency) reads, after trimming spaces:
///  - a decimal number with optional fraction and exponent: `4700`, `4.7e3`, `.5`;
///  - then, after optional spaces, nothing, the unit (`V`, `ohm`), an SI prefix f p n
///    u/µ m k/K M G T and the unit (`4.7 kΩ`, `10 µs`, `100nF`), or one of the
///    quantity's own letters without a unit (`4.7k`, `100n`, `470R`, `38k`);
///  - for resistances and capacitances also the RKM code, whose letter stands at the
///    decimal point (IEC 60062, from memory): `4k7`, `4R7`, `R47`, `0R1`, `47K3`,
///    `2n2`, `1µ0`, `p47`, optionally followed by the bare unit (`4k7 ohm`).
/// Letters without a unit (and RKM letters):
///  - resistance: R r (units), m, k K, M, G, T;
///  - capacitance: p P, n N, u U µ, m, F;
///  - duration, current: p, n, u µ, m;  voltage: u µ, m, k K;  frequency: k K, M, G.
/// With a unit symbol any SI prefix from f to T is read (it is what `format` writes).
/// Unit spellings: Ω (U+03A9 or U+2126), ohm, Ohm, OHM, ohms, Ohms; F; s; V; A; Hz.
/// Micro is `u`, U+00B5 or U+03BC. Separators: ASCII blanks, U+00A0, U+2009, U+202F.
///
/// Signs: voltages and currents may be negative (`-12 V`; '+', '-' and U+2212 are
/// read). Resistances, capacitances, durations and frequencies must not be: a minus
/// sign is an error ("a resistance cannot be negative"). Zero is accepted for all
/// (a 0R link is a real part); functions that need a positive value say so themselves.
///
/// The value is the correctly rounded double of the decimal text (the digits and the
/// prefix's exponent go into one decimal string for std::from_chars). Results beyond
/// the double range, or non-zero but below the smallest normal double, are errors.
///
/// Every error is a tauforge::parse_error whose text() is the input and whose message
/// reads `parse: "<text>" is not a <quantity>: <reason>; expected e.g. <examples>`
/// (`parse_ratio: ...`, `parse_tolerance: ...` for those functions).

#include "tauforge/detail/notation_parse.hpp"
#include "tauforge/error.hpp"
#include "tauforge/units.hpp"

#include <algorithm>
#include <array>
#include <climits>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <optional>
#include <span>
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
/// value ≈ mantissa_text × 10^exponent, exponent a multiple of 3 within the prefix
/// range. Outside that range the mantissa carries its own exponent ("1.5e-18") and
/// `exponent` is 0.
struct engineering_parts {
    std::string mantissa;  ///< e.g. "4.7", "-100", "0", "2e15"
    int exponent = 0;      ///< multiple of 3 in [-15, 12]
};

inline std::string trim_fraction_zeros(std::string s) {
    if (s.find('.') == std::string::npos) return s;
    while (!s.empty() && s.back() == '0') s.pop_back();
    if (!s.empty() && s.back() == '.') s.pop_back();
    return s;
}

/// A finite, non-zero double rounded to `digits` significant figures by printf's
/// correctly rounded %e: value = [-] d.ddd × 10^exponent.
struct rounded_decimal {
    bool negative = false;
    std::string digits;  ///< exactly `digits` digits, no point: "470"
    int exponent = 0;    ///< decimal exponent of the first digit
};

inline rounded_decimal round_significant(double v, int digits) {
    char buf[48];
    std::snprintf(buf, sizeof buf, "%.*e", digits - 1, v);
    rounded_decimal r;
    const char* p = buf;
    if (*p == '-') {
        r.negative = true;
        ++p;
    }
    for (; *p != '\0' && *p != 'e'; ++p)
        if (*p != '.') r.digits += *p;
    r.exponent = *p == 'e' ? std::atoi(p + 1) : 0;
    return r;
}

/// The digits with the decimal point after the first `int_len` of them; zeros are
/// added in front (int_len <= 0) or behind (int_len > digits). Exact: the point
/// moves in the text, not by floating-point scaling.
inline std::string place_point(std::string_view digits, long int_len, bool trailing_zeros) {
    std::string out;
    const long n = static_cast<long>(digits.size());
    if (int_len <= 0) {
        out = "0.";
        out.append(static_cast<std::size_t>(-int_len), '0');
        out += digits;
    } else if (int_len >= n) {
        out = digits;
        out.append(static_cast<std::size_t>(int_len - n), '0');
    } else {
        out = std::string(digits.substr(0, static_cast<std::size_t>(int_len))) + "." +
              std::string(digits.substr(static_cast<std::size_t>(int_len)));
    }
    return trailing_zeros ? out : trim_fraction_zeros(std::move(out));
}

inline void check_digits(std::string_view function, int digits) {
    if (digits < 1 || digits > 17)
        throw invalid_argument(std::string(function) + ": digits = " + std::to_string(digits) +
                               " is invalid; expected 1 to 17 significant digits");
}

/// Round first, then choose the prefix, so 999.96 at 3 digits becomes "1 k", not "1000".
inline engineering_parts split_engineering(double v, int digits, bool trailing_zeros) {
    check_digits("format", digits);
    if (v == 0.0) return {trailing_zeros && digits > 1 ? "0." + std::string(digits - 1, '0') : "0", 0};
    const rounded_decimal r = round_significant(v, digits);
    const int e = r.exponent;
    const int eng = e >= 0 ? e / 3 * 3 : -((-e + 2) / 3 * 3);
    std::string m = r.negative ? "-" : "";
    if (eng < si_prefixes.front().exponent || eng > si_prefixes.back().exponent) {
        m += place_point(r.digits, 1, trailing_zeros);
        m += 'e';
        m += std::to_string(e);
        return {std::move(m), 0};
    }
    m += place_point(r.digits, e - eng + 1, trailing_zeros);
    return {std::move(m), eng};
}

inline std::string_view prefix_text(int exponent, charset chars) {
    for (const auto& p : si_prefixes)
        if (p.exponent == exponent) return chars == charset::unicode ? p.unicode : p.ascii;
    return {};
}

/// One RKM letter: used for rounded values whose decimal exponent is at least
/// `from_exponent` (up to the next letter's), standing for 10^exponent.
struct rkm_letter {
    int from_exponent;
    int exponent;
    std::string_view symbol;
};

/// RKM code of a finite v >= 0: at least two significant digits (IEC 60062's tables
/// write 1K0, R10, 10K), trailing zeros beyond that dropped.
inline std::string rkm_text(double v, int digits, std::span<const rkm_letter> letters, std::string_view zero) {
    if (v == 0.0) return std::string(zero);
    const rounded_decimal r = round_significant(v, digits);
    const rkm_letter* letter = &letters.front();
    for (const rkm_letter& l : letters)
        if (r.exponent >= l.from_exponent) letter = &l;
    std::string d = r.digits;
    while (d.size() > 2 && d.back() == '0') d.pop_back();
    if (d.size() < 2) d.append(2 - d.size(), '0');
    const long int_len = static_cast<long>(r.exponent) - letter->exponent + 1;
    const long n = static_cast<long>(d.size());
    if (int_len <= 0) return std::string(letter->symbol) + std::string(static_cast<std::size_t>(-int_len), '0') + d;
    if (int_len >= n) return d + std::string(static_cast<std::size_t>(int_len - n), '0') + std::string(letter->symbol);
    return d.substr(0, static_cast<std::size_t>(int_len)) + std::string(letter->symbol) +
           d.substr(static_cast<std::size_t>(int_len));
}

inline constexpr rkm_letter resistor_rkm[] = {{INT_MIN, 0, "R"}, {3, 3, "K"}, {6, 6, "M"}, {9, 9, "G"}, {12, 12, "T"}};
inline constexpr rkm_letter capacitor_rkm_lower[] = {
    {INT_MIN, -12, "p"}, {-9, -9, "n"}, {-6, -6, "u"}, {-3, -3, "m"}, {0, 0, "F"}};
// Upper case: P N U; milli stays "m" (an "M" would read as mega).
inline constexpr rkm_letter capacitor_rkm_upper[] = {
    {INT_MIN, -12, "P"}, {-9, -9, "N"}, {-6, -6, "U"}, {-3, -3, "m"}, {0, 0, "F"}};

/// A fraction as a percentage, exactly: the decimal point moves two places in the text.
inline std::string percent_text(double fraction, const format_options& opt) {
    if (fraction == 0.0) return opt.trailing_zeros && opt.digits > 1 ? "0." + std::string(opt.digits - 1, '0') : "0";
    const rounded_decimal r = round_significant(fraction, opt.digits);
    return (r.negative ? "-" : "") + place_point(r.digits, static_cast<long>(r.exponent) + 3, opt.trailing_zeros);
}

}  // namespace detail

/// A value in the SI base unit named by its symbol ("Ω", "F", "s", "V", "Hz",
/// "A", ...) in engineering notation; a dimensionless unit ("" or a ratio
/// such as "V/V") is written as a plain number without a prefix. This is how
/// networks' parameters and metrics, known only by their unit symbol, are shown.
inline std::string format_si(double v, std::string_view unit, format_options opt = {}) {
    const bool ratio = unit.empty() || unit.find('/') != std::string_view::npos;
    if (opt.chars == charset::ascii && unit == unit_symbol<resistance>::unicode) unit = unit_symbol<resistance>::ascii;
    std::string out;
    int exponent = 0;
    if (std::isnan(v)) {
        out = "nan";
    } else if (std::isinf(v)) {
        out = v < 0 ? "-inf" : "inf";
    } else if (ratio) {
        if (opt.digits < 1 || opt.digits > 17) (void)detail::split_engineering(v, opt.digits, opt.trailing_zeros);
        char buf[64];
        std::snprintf(buf, sizeof buf, opt.trailing_zeros ? "%#.*g" : "%.*g", opt.digits, v);
        out = buf;
    } else {
        auto parts = detail::split_engineering(v, opt.digits, opt.trailing_zeros);
        out = std::move(parts.mantissa);
        exponent = parts.exponent;
    }
    const std::string_view prefix = ratio ? std::string_view{} : detail::prefix_text(exponent, opt.chars);
    if (!unit.empty() || !prefix.empty()) {
        out += ' ';
        out += prefix;
        out += unit;
    }
    return out;
}

/// A quantity in engineering notation with an SI prefix: 4700 Ω -> "4.7 kΩ".
/// The value is rounded to `digits` significant figures first, then the prefix is
/// chosen (999.96 Ω -> "1 kΩ"). Beyond femto .. tera the number gets an exponent
/// instead of a prefix ("1e-18 F"). NaN and infinities are written "nan" and "inf"
/// with the unit. For the quantities `parse` reads, every finite result reads back
/// as the correctly rounded double of the printed decimal (unless rounding carried
/// it out of the normal double range, e.g. 1.79e308 at 1 digit is "2e308").
template <class Unit>
std::string format(si_quantity<Unit> q, format_options opt = {}) {
    using Q = si_quantity<Unit>;
    return format_si(q.value(), unit_symbol<Q>::unicode, opt);
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

/// A resistance in RKM code (IEC 60062, from memory), rounded to `digits` significant
/// figures: 4.7 kΩ -> "4K7", 4.7 Ω -> "4R7", 470 Ω -> "470R", 1.5 MΩ -> "1M5",
/// 0.47 Ω -> "R47", 10 kΩ -> "10K", 1 kΩ -> "1K0", 0 Ω -> "0R". Letters R K M G T;
/// at least two significant digits are shown. Reads back with parse<resistance>.
/// Throws tauforge::invalid_argument for a negative or non-finite value.
inline std::string format_rkm(resistance r, int digits = 3) {
    detail::check_digits("format_rkm", digits);
    if (!std::isfinite(r.value()) || r.value() < 0.0)
        throw invalid_argument("format_rkm: resistance = " + format(r, {.digits = 6}) +
                               " is invalid; expected a non-negative, finite resistance");
    return detail::rkm_text(r.value(), digits, detail::resistor_rkm, "0R");
}

/// Letter case of capacitor RKM codes: IEC 60062 "2n2" or the upper-case "2N2".
enum class rkm_case { lower, upper };

/// A capacitance in RKM code, rounded to `digits` significant figures: 2.2 nF -> "2n2",
/// 100 nF -> "100n", 10 pF -> "10p", 1 µF -> "1u0", 0.47 pF -> "p47", 0 F -> "0p".
/// Letters p n u m F (upper case: P N U m F); ASCII "u" for micro. At least two
/// significant digits are shown. Reads back with parse<capacitance>.
/// Throws tauforge::invalid_argument for a negative or non-finite value.
inline std::string format_rkm(capacitance c, int digits = 3, rkm_case letters = rkm_case::lower) {
    detail::check_digits("format_rkm", digits);
    if (!std::isfinite(c.value()) || c.value() < 0.0)
        throw invalid_argument("format_rkm: capacitance = " + format(c, {.digits = 6}) +
                               " is invalid; expected a non-negative, finite capacitance");
    return letters == rkm_case::upper ? detail::rkm_text(c.value(), digits, detail::capacitor_rkm_upper, "0P")
                                      : detail::rkm_text(c.value(), digits, detail::capacitor_rkm_lower, "0p");
}

/// Reads a value of quantity Q as engineers write it (see the top of this header):
/// parse<resistance>("4k7") is 4700 Ω, parse<capacitance>("100 nF") is 1e-7 F.
/// Throws tauforge::parse_error naming the text and what is wrong with it.
template <class Q>
    requires detail::parsable_quantity<Q>
Q parse(std::string_view text) {
    return Q::from_value(detail::parse_quantity(text, detail::grammar_of<Q>::value));
}

/// A plain number ("0.5", "1e-3", "-2") or a percentage ("50 %" is 0.5).
/// Throws tauforge::parse_error as `parse` does (finite values only).
inline double parse_ratio(std::string_view text) { return detail::parse_ratio_value(text); }

/// Reads a tolerance band:
///  - symmetric: "5%", "5 %", "±5 %", "+/-5 %", "+-0.5%";
///  - asymmetric, in either order: "+80/-20%", "-20/+80 %", "+80 %/-20 %";
///  - an IEC 60062 letter (from memory; lower case accepted): B ±0.1 %, C ±0.25 %,
///    D ±0.5 %, F ±1 %, G ±2 %, J ±5 %, K ±10 %, M ±20 %, Z +80/-20 %.
/// The "%" is required (a bare "5" is ambiguous). The minus side must be below 100 %.
/// Letters are always read as relative bands: IEC 60062's absolute pF meaning of
/// B C D F G for capacitors below 10 pF is not represented.
/// Throws tauforge::parse_error: `parse_tolerance: "<text>" is not a tolerance: <reason>; ...`.
inline tolerance parse_tolerance(std::string_view text) { return detail::parse_tolerance_value(text); }

/// The IEC 60062 letter of a standard band (B C D F G J K M Z), if `t` is one, to
/// within 1e-9 relative (so a band computed in floating point still finds its letter).
inline std::optional<char> tolerance_letter(tolerance t) {
    const auto near = [](double a, double b) { return std::fabs(a - b) <= 1e-9 * b; };
    for (const auto& c : detail::tolerance_codes)
        if (near(t.minus, c.band.minus) && near(t.plus, c.band.plus)) return c.letter;
    return std::nullopt;
}

/// A tolerance band as text: symmetric "±5 %" (ASCII "+/-5 %"), otherwise plus side
/// first, "+80/-20 %". Percentages with `opt.digits` significant figures. Reads back
/// with parse_tolerance. Throws tauforge::invalid_argument unless 0 <= minus < 1,
/// 0 <= plus and both are finite.
inline std::string format_tolerance(tolerance t, format_options opt = {}) {
    detail::check_digits("format_tolerance", opt.digits);
    if (!(std::isfinite(t.minus) && std::isfinite(t.plus) && t.minus >= 0.0 && t.minus < 1.0 && t.plus >= 0.0)) {
        char buf[96];
        std::snprintf(buf, sizeof buf, "{minus = %.6g, plus = %.6g}", t.minus, t.plus);
        throw invalid_argument(std::string("format_tolerance: tolerance = ") + buf +
                               " is invalid; expected 0 <= minus < 1 and 0 <= plus, both finite");
    }
    // Sides that read the same at the requested digits are shown as one band: a band
    // computed in floating point (a pair's) may differ in its last bits on the two sides.
    const std::string plus = detail::percent_text(t.plus, opt), minus = detail::percent_text(t.minus, opt);
    if (plus == minus) return (opt.chars == charset::unicode ? "\u00B1" : "+/-") + plus + " %";
    return "+" + plus + "/-" + minus + " %";
}

}  // namespace tauforge
