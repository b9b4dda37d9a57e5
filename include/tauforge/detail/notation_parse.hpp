#pragma once
// Internals of tauforge/notation.hpp: the scanner behind parse<Q>, parse_ratio
// and parse_tolerance, the symbol tables and the error wording. Not API.
//
// Grammar of a quantity (after trimming spaces; the RKM form only for R and C):
//
//     value   := sign? ( si | rkm ) | empty
//     si      := number exponent? space* suffix?
//     rkm     := digits? LETTER digits space* unit?      (the letter stands at the decimal point)
//     number  := digits ( "." digits? )? | "." digits
//     suffix  := unit | prefix unit | LETTER             (LETTER: the quantity's own letters)
//
// The value is the correctly rounded double of the decimal text: the digits and the
// summed exponent are written into one decimal string for std::from_chars, never
// multiplied by a power of ten in floating point.

#include "tauforge/error.hpp"
#include "tauforge/units.hpp"

#include <algorithm>
#include <cfloat>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <span>
#include <stdexcept>
#include <string>
#include <string_view>
#include <system_error>

namespace tauforge::detail {

// ---------------------------------------------------------------- text helpers

constexpr bool is_digit(char c) { return c >= '0' && c <= '9'; }

/// Bytes of the UTF-8 sequence led by `lead` (1 for a stray or invalid byte).
constexpr std::size_t utf8_length(unsigned char lead) {
    if (lead < 0xC0) return 1;
    if (lead < 0xE0) return 2;
    if (lead < 0xF0) return 3;
    if (lead < 0xF8) return 4;
    return 1;
}

/// The first code point of a non-empty `s`, as bytes.
inline std::string_view first_code_point(std::string_view s) {
    return s.substr(0, std::min(s.size(), utf8_length(static_cast<unsigned char>(s[0]))));
}

/// Separators between number and unit: ASCII blanks, no-break space, thin space and
/// narrow no-break space (the SI brochure's recommended separator).
inline constexpr std::string_view space_symbols[] = {" ", "\t", "\n", "\r", "\u00A0", "\u2009", "\u202F"};

inline std::size_t space_length_at(std::string_view s, std::size_t i) {
    if (i >= s.size()) return 0;
    const char c = s[i];
    if (c != ' ' && c != '\t' && c != '\n' && c != '\r' && c != '\xC2' && c != '\xE2') return 0;
    for (std::string_view sp : space_symbols)
        if (s.substr(i).starts_with(sp)) return sp.size();
    return 0;
}

inline std::size_t skip_spaces(std::string_view s, std::size_t i) {
    while (i < s.size()) {
        const std::size_t n = space_length_at(s, i);
        if (n == 0) break;
        i += n;
    }
    return i;
}

inline std::string_view trim_spaces(std::string_view s) {
    s.remove_prefix(std::min(s.size(), skip_spaces(s, 0)));
    for (bool again = true; again && !s.empty();) {
        again = false;
        const char last = s.back();  // each separator ends in one of these bytes
        if (last != ' ' && last != '\t' && last != '\n' && last != '\r' && last != '\xA0' && last != '\x89' &&
            last != '\xAF')
            break;
        for (std::string_view sp : space_symbols)
            if (s.ends_with(sp)) {
                s.remove_suffix(sp.size());
                again = true;
                break;
            }
    }
    return s;
}

inline bool starts_with_nocase(std::string_view s, std::string_view lower_prefix) {
    if (s.size() < lower_prefix.size()) return false;
    for (std::size_t i = 0; i < lower_prefix.size(); ++i) {
        char c = s[i];
        if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
        if (c != lower_prefix[i]) return false;
    }
    return true;
}

inline bool has_digit(std::string_view s) { return std::any_of(s.begin(), s.end(), is_digit); }
inline bool all_digits(std::string_view s) { return std::all_of(s.begin(), s.end(), is_digit); }

/// `s` in double quotes for a message: quotes, backslashes and control bytes
/// escaped, cut to about 60 bytes (at a code point boundary) with "...".
inline std::string quoted(std::string_view s) {
    constexpr std::size_t limit = 60;
    bool cut = false;
    if (s.size() > limit) {
        std::size_t n = limit - 3;
        while (n > 0 && (static_cast<unsigned char>(s[n]) & 0xC0) == 0x80) --n;
        s = s.substr(0, n);
        cut = true;
    }
    std::string out = "\"";
    for (const char ch : s) {
        const auto c = static_cast<unsigned char>(ch);
        if (c == '"' || c == '\\') {
            out += '\\';
            out += ch;
        } else if (c < 0x20 || c == 0x7F) {
            char buf[8];
            std::snprintf(buf, sizeof buf, "\\x%02X", static_cast<unsigned>(c));
            out += buf;
        } else {
            out += ch;
        }
    }
    if (cut) out += "...";
    out += '"';
    return out;
}

// ---------------------------------------------------------------- symbol tables

/// A prefix or code letter and the power of ten it stands for.
struct multiplier {
    std::string_view symbol;
    int exponent;
};

/// SI prefixes accepted before a unit symbol: femto to tera (what `format` writes),
/// with `u` and both micro signs (U+00B5, U+03BC) for micro and `K` for kilo.
inline constexpr multiplier si_prefixes_in[] = {
    {"f", -15}, {"p", -12}, {"n", -9}, {"u", -6}, {"\u00B5", -6}, {"\u03BC", -6},
    {"m", -3},  {"k", 3},   {"K", 3},  {"M", 6},  {"G", 9},       {"T", 12},
};

// Letters written without a unit ("4.7k", "100n"); for R and C also RKM code letters.
// Resistors (IEC 60062 RKM, from memory): R = units, k/K, M, G, T; m = milli is common practice.
inline constexpr multiplier resistance_letters[] = {
    {"R", 0}, {"r", 0}, {"m", -3}, {"k", 3}, {"K", 3}, {"M", 6}, {"G", 9}, {"T", 12},
};
// Capacitors (IEC 60062 RKM, from memory): p, n, µ, m, F; u for µ and the
// upper-case P, N, U spellings are common practice.
inline constexpr multiplier capacitance_letters[] = {
    {"p", -12}, {"P", -12}, {"n", -9},       {"N", -9},       {"u", -6},
    {"U", -6},  {"\u00B5", -6}, {"\u03BC", -6}, {"m", -3}, {"F", 0},
};
inline constexpr multiplier small_letters[] = {  // durations and currents
    {"p", -12}, {"n", -9}, {"u", -6}, {"\u00B5", -6}, {"\u03BC", -6}, {"m", -3},
};
inline constexpr multiplier voltage_letters[] = {
    {"u", -6}, {"\u00B5", -6}, {"\u03BC", -6}, {"m", -3}, {"k", 3}, {"K", 3},
};
inline constexpr multiplier frequency_letters[] = {{"k", 3}, {"K", 3}, {"M", 6}, {"G", 9}};

/// Letters that are a multiplier for some quantity, for the "not a ... multiplier" message.
inline constexpr std::string_view any_letter[] = {"R", "r", "F", "P", "N", "U"};

struct unit_spelling {
    std::string_view symbol;
    std::string_view quantity;
};
/// Unit symbols tauforge reads, and the quantity each belongs to.
inline constexpr unit_spelling unit_spellings[] = {
    {"\u03A9", "resistance"}, {"\u2126", "resistance"}, {"ohms", "resistance"}, {"ohm", "resistance"},
    {"Ohms", "resistance"},   {"Ohm", "resistance"},    {"OHM", "resistance"},  {"F", "capacitance"},
    {"s", "duration"},        {"V", "voltage"},         {"A", "current"},       {"Hz", "frequency"},
    {"S", "conductance"},     {"C", "charge"},          {"W", "power"},
};

/// How one quantity is written.
struct quantity_grammar {
    std::string_view name;         ///< "resistance"
    std::string_view letter_list;  ///< the letters for messages: "R, m, k, M, G or T"
    std::string_view examples;     ///< for messages: "\"4.7k\", \"4k7\" or \"4.7 kohm\""
    std::span<const multiplier> letters;
    bool code_letters;      ///< RKM: the letter may stand at the decimal point ("4k7")
    bool negative_allowed;  ///< voltages and currents have a sign; components and times do not
};

template <class Q>
struct grammar_of;  // defined for the quantities `parse` reads
template <>
struct grammar_of<resistance> {
    static constexpr quantity_grammar value{"resistance", "R, m, k, M, G or T",
                                            "\"4.7k\", \"4k7\" or \"4.7 kohm\"", resistance_letters, true, false};
};
template <>
struct grammar_of<capacitance> {
    static constexpr quantity_grammar value{"capacitance", "p, n, u, m or F", "\"100n\", \"2n2\" or \"100 nF\"",
                                            capacitance_letters, true, false};
};
template <>
struct grammar_of<duration> {
    static constexpr quantity_grammar value{"duration", "p, n, u or m", "\"10us\", \"1.5 ms\" or \"2 s\"",
                                            small_letters, false, false};
};
template <>
struct grammar_of<voltage> {
    static constexpr quantity_grammar value{"voltage", "u, m or k", "\"3.3\", \"2.2 V\" or \"-12 V\"",
                                            voltage_letters, false, true};
};
template <>
struct grammar_of<current> {
    static constexpr quantity_grammar value{"current", "p, n, u or m", "\"10 mA\", \"4.7uA\" or \"-1.5 A\"",
                                            small_letters, false, true};
};
template <>
struct grammar_of<frequency> {
    static constexpr quantity_grammar value{"frequency", "k, M or G", "\"38 kHz\", \"38k\" or \"50 Hz\"",
                                            frequency_letters, false, false};
};

template <class Q>
concept parsable_quantity = requires { grammar_of<Q>::value; };

inline const multiplier* find_multiplier(std::span<const multiplier> table, std::string_view symbol) {
    for (const multiplier& m : table)
        if (m.symbol == symbol) return &m;
    return nullptr;
}

inline const multiplier* multiplier_at(std::span<const multiplier> table, std::string_view s, std::size_t i) {
    for (const multiplier& m : table)
        if (s.substr(i).starts_with(m.symbol)) return &m;
    return nullptr;
}

inline const unit_spelling* find_unit(std::string_view symbol) {
    for (const unit_spelling& u : unit_spellings)
        if (u.symbol == symbol) return &u;
    return nullptr;
}

inline bool is_unit_of(std::string_view symbol, std::string_view quantity) {
    const unit_spelling* u = find_unit(symbol);
    return u != nullptr && u->quantity == quantity;
}

/// The quantity `symbol` (optionally SI-prefixed) is a unit of, if that is not `own`.
inline const unit_spelling* foreign_unit(std::string_view symbol, std::string_view own) {
    if (const unit_spelling* u = find_unit(symbol); u != nullptr && u->quantity != own) return u;
    for (const multiplier& p : si_prefixes_in)
        if (symbol.starts_with(p.symbol))
            if (const unit_spelling* u = find_unit(symbol.substr(p.symbol.size())); u != nullptr && u->quantity != own)
                return u;
    return nullptr;
}

// ---------------------------------------------------------------- errors

/// Throws `parse_error` with the message
/// `<function>: "<text>" is not <what>: <reason>; expected e.g. <examples>`.
struct parse_failure {
    std::string_view function;
    std::string_view text;
    std::string_view what;  ///< "resistance": the message says "is not a resistance"
    std::string_view examples;

    [[noreturn]] void operator()(const std::string& reason) const {
        std::string message = std::string(function) + ": " + quoted(text) + " is not a " + std::string(what) + ": " +
                              reason + "; expected e.g. " + std::string(examples);
        throw parse_error(std::string(text), message);
    }
};

inline std::string unexpected(std::string_view rest, std::string_view before) {
    std::string r = "unexpected " + quoted(rest);
    if (!before.empty()) r += " after " + quoted(before);
    return r;
}

// ---------------------------------------------------------------- numbers

/// The decimal number at the start of some text, as written.
struct number_text {
    bool negative = false;
    std::string_view int_digits;   ///< "4" of "4.7e3"
    std::string_view frac_digits;  ///< "7" of "4.7e3"; also the digits after an RKM letter
    bool point = false;            ///< a decimal point was written
    bool second_point = false;     ///< "1..2", "1.2.3"
    bool has_exponent = false;
    long long exponent = 0;        ///< the written e-exponent, saturated at +-10^12
    std::size_t end = 0;           ///< index just past the number

    bool has_digits() const { return !int_digits.empty() || !frac_digits.empty(); }
};

/// Reads an optional sign ('+', '-' or U+2212 MINUS SIGN) at s[i].
inline std::size_t scan_sign(std::string_view s, std::size_t i, bool& negative) {
    negative = false;
    if (s.substr(i).starts_with("+")) return i + 1;
    if (s.substr(i).starts_with("-")) {
        negative = true;
        return i + 1;
    }
    if (s.substr(i).starts_with("\u2212")) {
        negative = true;
        return i + 3;
    }
    return i;
}

/// Reads digits, an optional fraction and an optional exponent at s[i] (no sign).
inline number_text scan_number(std::string_view s, std::size_t i) {
    number_text n;
    std::size_t j = i;
    while (j < s.size() && is_digit(s[j])) ++j;
    n.int_digits = s.substr(i, j - i);
    if (j < s.size() && s[j] == '.') {
        n.point = true;
        const std::size_t f = ++j;
        while (j < s.size() && is_digit(s[j])) ++j;
        n.frac_digits = s.substr(f, j - f);
        if (j < s.size() && s[j] == '.') n.second_point = true;
    }
    if (n.has_digits() && j < s.size() && (s[j] == 'e' || s[j] == 'E')) {
        std::size_t k = j + 1;
        bool negative_exponent = false;
        if (k < s.size() && (s[k] == '+' || s[k] == '-')) negative_exponent = s[k++] == '-';
        if (k < s.size() && is_digit(s[k])) {
            n.has_exponent = true;
            long long e = 0;
            for (; k < s.size() && is_digit(s[k]); ++k)
                if (e < 1'000'000'000'000LL) e = e * 10 + (s[k] - '0');
            n.exponent = negative_exponent ? -e : e;
            j = k;
        }
    }
    n.end = j;
    return n;
}

enum class range_problem { none, overflow, underflow };

struct decimal_value {
    double value = 0.0;
    range_problem problem = range_problem::none;
};

/// The correctly rounded double of the number times 10^extra_exponent. Results
/// beyond the largest double overflow; non-zero results below the smallest normal
/// double underflow (subnormals are refused: no component value lives there).
inline decimal_value to_double(const number_text& n, int extra_exponent) {
    const auto nonzero = [](std::string_view d) { return d.find_first_not_of('0') != std::string_view::npos; };
    if (!nonzero(n.int_digits) && !nonzero(n.frac_digits)) return {n.negative ? -0.0 : 0.0, range_problem::none};
    const long long exponent = n.exponent + extra_exponent;
    std::string text;
    text.reserve(n.int_digits.size() + n.frac_digits.size() + 24);
    if (n.negative) text += '-';
    text += n.int_digits.empty() ? std::string_view("0") : n.int_digits;
    if (!n.frac_digits.empty()) {
        text += '.';
        text += n.frac_digits;
    }
    text += 'e';
    text += std::to_string(exponent);
    double v = 0.0;
    const auto [ptr, ec] = std::from_chars(text.data(), text.data() + text.size(), v);
    if (ec != std::errc() && ec != std::errc::result_out_of_range)
        throw std::logic_error("tauforge: from_chars rejected the decimal text \"" + text + "\"");
    if (ec == std::errc() && ptr != text.data() + text.size())
        throw std::logic_error("tauforge: from_chars stopped early in \"" + text + "\"");
    if (ec == std::errc() && std::isfinite(v) && std::fabs(v) >= DBL_MIN) return {v, range_problem::none};
    // Out of range: the decimal exponent of the leading non-zero digit tells which way.
    const std::size_t lead_int = n.int_digits.find_first_not_of('0');
    const long long lead = lead_int != std::string_view::npos
                               ? static_cast<long long>(n.int_digits.size() - lead_int) - 1 + exponent
                               : -static_cast<long long>(n.frac_digits.find_first_not_of('0')) - 1 + exponent;
    return {0.0, lead > 0 ? range_problem::overflow : range_problem::underflow};
}

inline void check_range(const decimal_value& v, const parse_failure& fail) {
    if (v.problem == range_problem::overflow) fail("the value overflows a double");
    if (v.problem == range_problem::underflow) fail("the value underflows a double");
}

/// Common start of every parser: trimmed text, sign, nan/inf, the number itself.
inline number_text scan_value_start(std::string_view s, std::string_view text, const parse_failure& fail,
                                    std::size_t& after_sign) {
    if (text.empty()) fail("empty text");
    if (s.empty()) fail("blank text");
    bool negative = false;
    after_sign = scan_sign(s, 0, negative);
    const std::string_view rest = s.substr(after_sign);
    if (starts_with_nocase(rest, "nan") || starts_with_nocase(rest, "inf")) fail("not a finite number");
    number_text n = scan_number(s, after_sign);
    n.negative = negative;
    if (n.second_point) fail("more than one decimal point");
    return n;
}

[[noreturn]] inline void fail_no_number(std::string_view s, std::size_t after_sign, const parse_failure& fail) {
    const std::string_view rest = s.substr(after_sign);
    if (!has_digit(rest)) fail("no digits");
    fail(unexpected(rest, s.substr(0, after_sign)));
}

// ---------------------------------------------------------------- quantities

/// Why `suffix` (after "<before>") is not a unit or letter of the quantity `g`.
inline std::string diagnose_suffix(std::string_view suffix, const quantity_grammar& g, std::string_view before,
                                   bool after_code, bool after_point) {
    if (const unit_spelling* u = foreign_unit(suffix, g.name))
        return quoted(suffix) + " is a " + std::string(u->quantity) + " unit";
    if (after_code) return unexpected(suffix, before);
    for (const unit_spelling& u : unit_spellings) {
        if (u.quantity != g.name || !suffix.ends_with(u.symbol) || suffix.size() == u.symbol.size()) continue;
        const std::string_view prefix = suffix.substr(0, suffix.size() - u.symbol.size());
        if (first_code_point(prefix).size() == prefix.size())
            return "unknown prefix " + quoted(prefix) + " before " + quoted(u.symbol);
    }
    const std::string_view letter = first_code_point(suffix);
    const std::string_view rest = suffix.substr(letter.size());
    if (all_digits(rest)) {
        if (find_multiplier(g.letters, letter) != nullptr) {
            if (g.code_letters && after_point && !rest.empty())
                return "more than one decimal point (" + quoted(letter) + " marks one)";
        } else if (find_multiplier(si_prefixes_in, letter) != nullptr ||
                   std::find(std::begin(any_letter), std::end(any_letter), letter) != std::end(any_letter)) {
            return quoted(letter) + " is not a " + std::string(g.name) + " multiplier (" + std::string(g.letter_list) +
                   ")";
        }
    }
    return unexpected(suffix, before);
}

/// parse<Q>'s work, in base SI units.
inline double parse_quantity(std::string_view text, const quantity_grammar& g) {
    const parse_failure fail{"parse", text, g.name, g.examples};
    const std::string_view s = trim_spaces(text);
    std::size_t after_sign = 0;
    number_text n = scan_value_start(s, text, fail, after_sign);

    int exponent = 0;
    bool code = false;
    std::size_t end = n.end;
    if (g.code_letters && !n.point && !n.has_exponent) {
        if (const multiplier* m = multiplier_at(g.letters, s, n.end)) {
            std::size_t j = n.end + m->symbol.size();
            if (j < s.size() && is_digit(s[j])) {
                const std::size_t f = j;
                while (j < s.size() && is_digit(s[j])) ++j;
                code = true;
                exponent = m->exponent;
                n.frac_digits = s.substr(f, j - f);
                end = j;
                if (j < s.size() && s[j] == '.')
                    fail("more than one decimal point (" + quoted(m->symbol) + " marks one)");
            }
        }
    }
    if (!code && !n.has_digits()) fail_no_number(s, after_sign, fail);

    const std::string_view before = s.substr(0, end);
    const std::string_view suffix = s.substr(skip_spaces(s, end));
    if (!suffix.empty()) {
        // After an RKM code only the bare unit may follow ("4k7 ohm"); after a number
        // the unit, an SI prefix and the unit, or one of the quantity's letters.
        bool found = is_unit_of(suffix, g.name);
        if (!found && !code) {
            if (const multiplier* m = find_multiplier(g.letters, suffix)) {
                exponent = m->exponent;
                found = true;
            }
            for (const multiplier& p : si_prefixes_in)
                if (!found && suffix.starts_with(p.symbol) && is_unit_of(suffix.substr(p.symbol.size()), g.name)) {
                    exponent = p.exponent;
                    found = true;
                }
        }
        if (!found) fail(diagnose_suffix(suffix, g, before, code, n.point));
    }
    if (n.negative && !g.negative_allowed) fail("a " + std::string(g.name) + " cannot be negative");
    const decimal_value v = to_double(n, exponent);
    check_range(v, fail);
    return v.value;
}

/// parse_ratio's work: a plain number, or a number and "%".
inline double parse_ratio_value(std::string_view text) {
    const parse_failure fail{"parse_ratio", text, "ratio", "\"0.5\", \"50 %\" or \"1e-3\""};
    const std::string_view s = trim_spaces(text);
    std::size_t after_sign = 0;
    const number_text n = scan_value_start(s, text, fail, after_sign);
    if (!n.has_digits()) fail_no_number(s, after_sign, fail);
    const std::string_view suffix = s.substr(skip_spaces(s, n.end));
    int exponent = 0;
    if (suffix == "%")
        exponent = -2;
    else if (!suffix.empty())
        fail(unexpected(suffix, s.substr(0, n.end)));
    const decimal_value v = to_double(n, exponent);
    check_range(v, fail);
    return v.value;
}

// ---------------------------------------------------------------- tolerances

/// IEC 60062 tolerance letters (from memory): B C D F G J K M symmetric, Z = +80/-20 %.
struct tolerance_code {
    char letter;
    tolerance band;
};
inline constexpr tolerance_code tolerance_codes[] = {
    {'B', {0.001, 0.001}}, {'C', {0.0025, 0.0025}}, {'D', {0.005, 0.005}}, {'F', {0.01, 0.01}}, {'G', {0.02, 0.02}},
    {'J', {0.05, 0.05}},   {'K', {0.1, 0.1}},       {'M', {0.2, 0.2}},     {'Z', {0.2, 0.8}},
};

enum class side_sign { none, plus, minus, plus_minus };

struct tolerance_side {
    side_sign sign = side_sign::none;
    number_text number;
    std::size_t number_start = 0;
    bool percent = false;
    std::size_t end = 0;
};

inline tolerance_side scan_tolerance_side(std::string_view s, std::size_t i, const parse_failure& fail) {
    tolerance_side side;
    const std::string_view at = s.substr(i);
    if (at.starts_with("\u00B1")) {
        side.sign = side_sign::plus_minus;
        i += 2;
    } else if (at.starts_with("+/-")) {
        side.sign = side_sign::plus_minus;
        i += 3;
    } else if (at.starts_with("+-")) {
        side.sign = side_sign::plus_minus;
        i += 2;
    } else {
        bool negative = false;
        const std::size_t j = scan_sign(s, i, negative);
        if (j != i) side.sign = negative ? side_sign::minus : side_sign::plus;
        i = j;
    }
    i = skip_spaces(s, i);
    const std::string_view rest = s.substr(i);
    if (starts_with_nocase(rest, "nan") || starts_with_nocase(rest, "inf")) fail("not a finite number");
    side.number_start = i;
    side.number = scan_number(s, i);
    if (side.number.second_point) fail("more than one decimal point");
    if (!side.number.has_digits()) {
        if (!has_digit(rest)) fail("no digits");
        fail(unexpected(rest, s.substr(0, i)));
    }
    std::size_t j = skip_spaces(s, side.number.end);
    if (j < s.size() && s[j] == '%') {
        side.percent = true;
        j = skip_spaces(s, j + 1);
    }
    side.end = j;
    return side;
}

inline double tolerance_fraction(const tolerance_side& side, const parse_failure& fail) {
    const decimal_value v = to_double(side.number, -2);
    check_range(v, fail);
    return v.value;
}

/// parse_tolerance's work.
inline tolerance parse_tolerance_value(std::string_view text) {
    const parse_failure fail{"parse_tolerance", text, "tolerance",
                             "\"5 %\", \"\u00B11 %\", \"+80/-20 %\" or a letter such as \"J\""};
    const std::string_view s = trim_spaces(text);
    if (text.empty()) fail("empty text");
    if (s.empty()) fail("blank text");
    if (s.size() == 1 && ((s[0] >= 'A' && s[0] <= 'Z') || (s[0] >= 'a' && s[0] <= 'z'))) {
        const char upper = s[0] >= 'a' ? static_cast<char>(s[0] - 'a' + 'A') : s[0];
        for (const tolerance_code& c : tolerance_codes)
            if (c.letter == upper) return c.band;
        fail(quoted(s) + " is not a tolerance letter (B, C, D, F, G, J, K, M or Z)");
    }
    const tolerance_side first = scan_tolerance_side(s, 0, fail);
    tolerance t;
    if (first.end == s.size()) {
        if (!first.percent) fail("missing \"%\"");
        if (first.sign == side_sign::plus || first.sign == side_sign::minus) {
            const std::string number(s.substr(first.number_start, first.number.end - first.number_start));
            fail("one side only; write \"\u00B1" + number + " %\" or both sides as \"" +
                 (first.sign == side_sign::plus ? "+" + number + "/-0" : "+0/-" + number) + " %\"");
        }
        t = tolerance::symmetric(tolerance_fraction(first, fail));
    } else {
        if (s[first.end] != '/') fail(unexpected(s.substr(first.end), trim_spaces(s.substr(0, first.end))));
        const tolerance_side second = scan_tolerance_side(s, skip_spaces(s, first.end + 1), fail);
        if (second.end != s.size()) fail(unexpected(s.substr(second.end), trim_spaces(s.substr(0, second.end))));
        if (!second.percent) fail("missing \"%\"");
        const bool plus_first = first.sign == side_sign::plus && second.sign == side_sign::minus;
        const bool minus_first = first.sign == side_sign::minus && second.sign == side_sign::plus;
        if (!plus_first && !minus_first) fail("the two sides need one \"+\" and one \"-\" sign");
        const double a = tolerance_fraction(first, fail), b = tolerance_fraction(second, fail);
        t = plus_first ? tolerance{b, a} : tolerance{a, b};
    }
    if (!(t.minus < 1.0)) fail("the minus side must be below 100 %");
    return t;
}

}  // namespace tauforge::detail
