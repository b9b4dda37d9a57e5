#pragma once
/// IEC 60063 preferred-number series, value sets (a series over a range or a stock
/// list), O(log n) queries on them, and the best two-part (series / parallel) pairs.
///
///     using namespace tauforge::literals;
///     using tauforge::resistance;
///     auto e96 = tauforge::value_set<resistance>::from_series(tauforge::e_series::e96, 10_ohm, 1_Mohm);
///     e96.nearest(4.8_kohm).value;                                          // 4.75 kΩ
///     tauforge::best_pairs(e96, 4.8_kohm, tauforge::connection::series, 5); // 5 best series pairs
///
/// The tables live in detail/series_tables.hpp; the pair search in detail::search_pairs.

#include "tauforge/concepts.hpp"
#include "tauforge/detail/series_tables.hpp"
#include "tauforge/detail/validate.hpp"
#include "tauforge/error.hpp"
#include "tauforge/notation.hpp"
#include "tauforge/units.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <concepts>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <istream>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <type_traits>
#include <utility>
#include <vector>

namespace tauforge {

/// The IEC 60063 series, coarsest first.
enum class e_series { e3, e6, e12, e24, e48, e96, e192 };

/// Every series, coarsest first: the order `coarsest_series` tries them in.
inline constexpr std::array<e_series, 7> all_e_series{e_series::e3,  e_series::e6,  e_series::e12, e_series::e24,
                                                      e_series::e48, e_series::e96, e_series::e192};

/// The series' name as the standard writes it: "E3" ... "E192".
constexpr std::string_view series_name(e_series s) {
    constexpr std::array<std::string_view, 7> names{"E3", "E6", "E12", "E24", "E48", "E96", "E192"};
    return names[static_cast<std::size_t>(s)];
}

/// One decade's integer mantissas, ascending: 10..47 for E3, 10..91 for E24, 100..988 for E192.
constexpr std::span<const std::uint16_t> series_mantissas(e_series s) {
    namespace t = detail::tables;
    switch (s) {
        case e_series::e3: return t::e3;
        case e_series::e6: return t::e6;
        case e_series::e12: return t::e12;
        case e_series::e24: return t::e24;
        case e_series::e48: return t::e48;
        case e_series::e96: return t::e96;
        case e_series::e192: break;
    }
    return t::e192;
}

/// Values per decade, the N of EN: 3 for E3 ... 192 for E192.
constexpr std::size_t series_size(e_series s) { return series_mantissas(s).size(); }

/// Significant figures of the mantissas: 2 for E3..E24, 3 for E48..E192.
constexpr int series_digits(e_series s) { return s <= e_series::e24 ? 2 : 3; }

/// The tolerance parts of a series are customarily sold at (common practice):
/// E6 20 %, E12 10 %, E24 5 %, E48 2 %, E96 1 %, E192 0.5 %. E3 is meant for
/// tolerances wider than 20 %; ±20 % is returned for it as a lower bound, so pass
/// the parts' real tolerance to `value_set::from_series` when using E3.
constexpr tolerance customary_tolerance(e_series s) {
    constexpr std::array<double, 7> fraction{0.20, 0.20, 0.10, 0.05, 0.02, 0.01, 0.005};
    return tolerance::symmetric(fraction[static_cast<std::size_t>(s)]);
}

/// (k - 1)/(k + 1) with k = 10^(1/N): the tolerance at which the bands of
/// neighbouring values of the ideal geometric series touch (E12 9.56 %, E24 4.79 %).
inline double half_step(e_series s) {
    const double k = std::pow(10.0, 1.0 / static_cast<double>(series_size(s)));
    return (k - 1.0) / (k + 1.0);
}

namespace detail {

/// The double nearest to mantissa * 10^exponent. For |exponent| <= 22 one correctly
/// rounded multiplication or division of two exact operands gives it; beyond, strtod.
inline double scaled_decimal(unsigned mantissa, int exponent) {
    const double m = static_cast<double>(mantissa);
    if (exponent >= 0 && exponent <= 22) return m * tables::exact_powers_of_ten[static_cast<std::size_t>(exponent)];
    if (exponent < 0 && exponent >= -22) return m / tables::exact_powers_of_ten[static_cast<std::size_t>(-exponent)];
    char buf[32];
    std::snprintf(buf, sizeof buf, "%ue%d", mantissa, exponent);
    return std::strtod(buf, nullptr);
}

[[noreturn]] inline void fail_text(std::string_view function, std::string_view parameter, std::string_view value,
                                   std::string_view expected) {
    throw invalid_argument(std::string(function) + ": " + std::string(parameter) + " = " + std::string(value) +
                           " is invalid; expected " + std::string(expected));
}

inline bool is_valid_tolerance(tolerance t) {
    return std::isfinite(t.minus) && std::isfinite(t.plus) && t.minus >= 0.0 && t.minus < 1.0 && t.plus >= 0.0;
}

/// A band as notation.hpp writes it ("±5 %", "+80/-20 %"); an invalid one as its fields.
inline std::string tolerance_text(tolerance t) {
    if (is_valid_tolerance(t)) return format_tolerance(t, {.digits = 6});
    char buf[96];
    std::snprintf(buf, sizeof buf, "{minus = %.6g, plus = %.6g}", t.minus, t.plus);
    return buf;
}

inline constexpr std::string_view valid_tolerance = "0 <= minus < 1 and 0 <= plus, both finite";

inline void check_relative(std::string_view function, double rel) {
    if (!(std::isfinite(rel) && rel >= 0.0 && rel < 1.0))
        fail_invalid(function, "rel_tol", rel, "a relative tolerance from 0 up to (not including) 1");
}

}  // namespace detail

/// The exact double of the series' index-th value in the decade whose leading digit
/// stands at 10^decade: preferred_number(e_series::e24, 16, 3) == 4700.
inline double preferred_number(e_series s, std::size_t index, int decade) {
    const auto m = series_mantissas(s);
    if (index >= m.size())
        detail::fail_invalid("preferred_number", "index", static_cast<double>(index),
                             "an index below " + std::to_string(m.size()) + " for " + std::string(series_name(s)));
    return detail::scaled_decimal(m[index], decade - series_digits(s) + 1);
}

/// Relative match tolerance used when none is given: absorbs the rounding of a
/// value typed as a literal (4.7_kohm) or computed, nothing more.
inline constexpr double default_match_tolerance = 1e-9;

/// The quantities a value set holds: resistance or capacitance.
template <class Q>
concept PartQuantity = Resistance<Q> || Capacitance<Q>;

/// The kind of part a quantity is bought as (it decides the combining rules).
template <PartQuantity Q>
inline constexpr part_kind part_kind_of = std::is_same_v<Q, resistance> ? part_kind::resistor : part_kind::capacitor;

namespace detail {
template <PartQuantity Q>
inline constexpr std::string_view positive_quantity =
    std::is_same_v<Q, resistance> ? "a positive, finite resistance" : "a positive, finite capacitance";
}  // namespace detail

/// True if some value of series s (any decade) lies within rel_tol of x: |v - x| <= rel_tol x.
template <PartQuantity Q>
bool in_series(e_series s, Q x, double rel_tol = default_match_tolerance) {
    detail::require_positive("in_series", "x", x, detail::positive_quantity<Q>);
    detail::check_relative("in_series", rel_tol);
    const double v = x.value();
    const auto m = series_mantissas(s);
    const int leading = static_cast<int>(std::floor(std::log10(v)));
    // log10 may be off by one at a decade edge; the neighbouring decades cover it.
    for (int decade = leading - 1; decade <= leading + 1; ++decade) {
        const double unit = detail::scaled_decimal(1, decade - series_digits(s) + 1);
        const auto it = std::lower_bound(m.begin(), m.end(), v / unit);
        for (auto c : {it, it == m.begin() ? it : it - 1}) {
            if (c == m.end()) continue;
            const double p = preferred_number(s, static_cast<std::size_t>(c - m.begin()), decade);
            if (std::abs(p - v) <= rel_tol * v) return true;
        }
    }
    return false;
}

/// The coarsest series that has x (within rel_tol): 4.7 kΩ -> E3, 5.1 kΩ -> E24,
/// 4.99 kΩ -> E96; std::nullopt if no series has it.
template <PartQuantity Q>
std::optional<e_series> coarsest_series(Q x, double rel_tol = default_match_tolerance) {
    detail::require_positive("coarsest_series", "x", x, detail::positive_quantity<Q>);
    detail::check_relative("coarsest_series", rel_tol);
    for (e_series s : all_e_series)
        if (in_series(s, x, rel_tol)) return s;
    return std::nullopt;
}

/// One value of a set with the tolerance it is bought at and where it came from.
template <PartQuantity Q>
struct part_value {
    Q value{};                          ///< nominal value, SI base unit
    tolerance tol{};                    ///< the band it is bought with
    std::optional<e_series> series{};   ///< the series it was generated from; empty for a stock value
    friend bool operator==(const part_value&, const part_value&) = default;
};

/// The values at or below and at or above a query; either side empty when none.
template <PartQuantity Q>
struct value_bracket {
    std::optional<part_value<Q>> below;  ///< largest value <= x
    std::optional<part_value<Q>> above;  ///< smallest value >= x
};

/// A sorted, duplicate-free, never empty set of part values of one quantity
/// (resistance or capacitance) with O(log n) queries.
template <PartQuantity Q>
class value_set {
public:
    using quantity_type = Q;

    /// Every value of series s in [min, max] (inclusive, with a relative slack of
    /// 1e-9 for bounds typed as literals), each at the series' customary tolerance.
    static value_set from_series(e_series s, Q min, Q max) {
        return from_series(s, min, max, customary_tolerance(s));
    }

    /// As above, every value bought at tolerance tol.
    static value_set from_series(e_series s, Q min, Q max, tolerance tol) {
        constexpr std::string_view fn = "value_set::from_series";
        detail::require_positive(fn, "min", min, detail::positive_quantity<Q>);
        detail::require_positive(fn, "max", max, detail::positive_quantity<Q>);
        if (max < min) detail::fail_invalid(fn, "max", max, "a value at or above min = " + detail::value_text(min));
        if (!detail::is_valid_tolerance(tol))
            detail::fail_text(fn, "tol", detail::tolerance_text(tol), detail::valid_tolerance);
        const double lo = min.value() * (1.0 - 1e-9), hi = max.value() * (1.0 + 1e-9);
        value_set out;
        const int first = static_cast<int>(std::floor(std::log10(lo))) - 1;
        const int last = static_cast<int>(std::floor(std::log10(hi))) + 1;
        for (int decade = first; decade <= last; ++decade)
            for (std::size_t i = 0; i < series_size(s); ++i) {
                const double v = preferred_number(s, i, decade);
                if (v >= lo && v <= hi) out.push(part_value<Q>{Q::from_value(v), tol, s});
            }
        if (out.parts_.empty())
            detail::fail_text(fn, "range", detail::value_text(min) + " to " + detail::value_text(max),
                              "a range that contains at least one " + std::string(series_name(s)) + " value");
        return out;
    }

    /// A stock list built in code, in any order. Values equal in value and tolerance
    /// are merged into one (the first one's origin is kept); the same value with two
    /// different tolerances is an error, as are an empty list and invalid entries
    /// (all of them are listed in one message).
    static value_set from_list(std::vector<part_value<Q>> parts) {
        if (parts.empty()) detail::fail_text("value_set::from_list", "parts", "(none)", "at least one value");
        std::vector<labelled> items;
        std::vector<problem> problems;
        for (std::size_t i = 0; i < parts.size(); ++i) {
            const std::string where = "parts[" + std::to_string(i) + "]";
            const part_value<Q>& p = parts[i];
            if (!(std::isfinite(p.value.value()) && p.value.value() > 0.0))
                problems.push_back({i, where + ".value = " + detail::value_text(p.value) + " is invalid; expected " +
                                           std::string(detail::positive_quantity<Q>), ""});
            else if (!detail::is_valid_tolerance(p.tol))
                problems.push_back({i, where + ".tol = " + detail::tolerance_text(p.tol) + " is invalid; expected " +
                                           std::string(detail::valid_tolerance), ""});
            else
                items.push_back({p, i, where, ""});
        }
        return build(std::move(items), std::move(problems), [](const std::vector<problem>& all) {
            std::string msg = "value_set::from_list: ";
            for (std::size_t i = 0; i < all.size(); ++i) msg += (i ? "; " : "") + all[i].message;
            throw invalid_argument(msg);
        });
    }

    /// Reads a stock list: one value per line in engineering notation or RKM code
    /// (`4k7`, `100n`, `4.7 kΩ`; see `parse`), optionally a comma, semicolon or tab and
    /// a tolerance (`5%`, `+80/-20 %`, `J`; see `parse_tolerance`). Lines without one
    /// take `default_tol`; with neither the line is bad. `#` starts a comment; blank
    /// lines, surrounding blanks, CR-LF and a UTF-8 byte order mark are fine. Lines
    /// equal in value and tolerance (`4k7, J` and `4.7 kΩ; 5 %`) are merged into one;
    /// one value with two tolerances is a bad line. Every bad line is listed, by line
    /// number, in one tauforge::parse_error whose text() holds those lines; nothing is
    /// dropped. `source` names the input in messages.
    static value_set read_stock(std::istream& in, std::optional<tolerance> default_tol = std::nullopt,
                                std::string_view source = "stock list") {
        std::string text, line;
        while (std::getline(in, line)) text.append(line).push_back('\n');
        if (in.bad()) detail::fail_text("value_set::read_stock", "source", std::string(source), "a readable stream");
        return read_lines("value_set::read_stock", text, default_tol, source);
    }

    /// As `read_stock`, from a file; its path names it in messages. (Read with <cstdio>:
    /// <filesystem> and <fstream> would add a third to every includer's compile time.)
    static value_set read_stock_file(const std::string& path, std::optional<tolerance> default_tol = std::nullopt) {
        constexpr std::string_view fn = "value_set::read_stock_file";
        std::string text;
        std::FILE* f = std::fopen(path.c_str(), "rb");
        if (f != nullptr) {
            char buf[4096];
            for (std::size_t n; (n = std::fread(buf, 1, sizeof buf, f)) > 0;) text.append(buf, n);
            const bool failed = std::ferror(f) != 0;
            std::fclose(f);
            if (failed) f = nullptr;
        }
        if (f == nullptr) detail::fail_text(fn, "path", "\"" + path + "\"", "a readable stock file");
        return read_lines(fn, text, default_tol, path);
    }
    /// As above, for a path object (std::filesystem::path) given by its string().
    template <class Path>
    requires(!std::convertible_to<const Path&, std::string> &&
             requires(const Path& p) { { p.string() } -> std::convertible_to<std::string>; })
    static value_set read_stock_file(const Path& path, std::optional<tolerance> default_tol = std::nullopt) {
        return read_stock_file(std::string(path.string()), default_tol);
    }

    /// Number of values.
    std::size_t size() const noexcept { return parts_.size(); }
    /// The i-th smallest value (no bounds check).
    const part_value<Q>& operator[](std::size_t i) const noexcept { return parts_[i]; }
    /// All values, ascending.
    std::span<const part_value<Q>> parts() const noexcept { return parts_; }
    /// All nominal values in the SI base unit, ascending: for the plain-double hot loops.
    std::span<const double> si_values() const noexcept { return values_; }
    /// Iteration over the values, ascending.
    auto begin() const noexcept { return parts_.begin(); }
    /// End of iteration.
    auto end() const noexcept { return parts_.end(); }
    /// The smallest value.
    const part_value<Q>& front() const noexcept { return parts_.front(); }
    /// The largest value.
    const part_value<Q>& back() const noexcept { return parts_.back(); }

    /// The value nearest to x by ratio (smallest |ln(v/x)|); an exact tie between
    /// two neighbours (x their geometric mean) goes to the lower one.
    const part_value<Q>& nearest(Q x) const {
        const std::size_t i = lower_index("value_set::nearest", x);
        if (i == 0) return parts_.front();
        if (i == size()) return parts_.back();
        const double v = x.value();
        return v / values_[i - 1] <= values_[i] / v ? parts_[i - 1] : parts_[i];
    }

    /// The largest value <= x and the smallest value >= x (both x itself if it is in the set).
    value_bracket<Q> bracket(Q x) const { return {below("value_set::bracket", x), above("value_set::bracket", x)}; }

    /// The largest value <= x, or std::nullopt if x is below the set.
    std::optional<part_value<Q>> round_down(Q x) const { return below("value_set::round_down", x); }

    /// The smallest value >= x, or std::nullopt if x is above the set.
    std::optional<part_value<Q>> round_up(Q x) const { return above("value_set::round_up", x); }

    /// The value closest to x among those with |v - x| <= rel_tol x (ties to the lower), if any.
    std::optional<part_value<Q>> find(Q x, double rel_tol = default_match_tolerance) const {
        return match("value_set::find", x, rel_tol);
    }

    /// True if some value lies within rel_tol of x: |v - x| <= rel_tol x.
    bool contains(Q x, double rel_tol = default_match_tolerance) const {
        return match("value_set::contains", x, rel_tol).has_value();
    }

private:
    struct labelled {
        part_value<Q> part;
        std::size_t order;  // list index or line number: messages keep this order
        std::string where;  // "parts[3]" or "line 7"
        std::string text;   // the line as read (stock files only)
    };
    struct problem {
        std::size_t order;
        std::string message;
        std::string text;
    };

    value_set() = default;

    void push(const part_value<Q>& p) {
        parts_.push_back(p);
        values_.push_back(p.value.value());
    }

    // Sorts the valid items, merges exact duplicates, adds a problem for each value
    // given two tolerances; if there is any problem, calls fail (which throws) with
    // all of them in input order.
    template <class Fail>
    static value_set build(std::vector<labelled> items, std::vector<problem> problems, Fail fail) {
        std::stable_sort(items.begin(), items.end(),
                         [](const labelled& a, const labelled& b) { return a.part.value < b.part.value; });
        for (std::size_t i = 1; i < items.size(); ++i) {
            const labelled& prev = items[i - 1];
            const labelled& cur = items[i];
            if (cur.part.value == prev.part.value && !(cur.part.tol == prev.part.tol))
                problems.push_back({cur.order,
                                    cur.where + (cur.text.empty() ? "" : ": part") + " = " +
                                        detail::value_text(cur.part.value) + " " +
                                        detail::tolerance_text(cur.part.tol) +
                                        " is invalid; expected one tolerance per value, as " + prev.where +
                                        " gives it " + detail::tolerance_text(prev.part.tol),
                                    cur.text});
        }
        if (!problems.empty()) {
            std::stable_sort(problems.begin(), problems.end(),
                             [](const problem& a, const problem& b) { return a.order < b.order; });
            fail(problems);
        }
        value_set out;
        for (const auto& it : items)
            if (out.parts_.empty() || !(out.parts_.back().value == it.part.value)) out.push(it.part);
        return out;
    }

    static std::string_view trim(std::string_view s) {
        while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
        while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r')) s.remove_suffix(1);
        return s;
    }

    static value_set read_lines(std::string_view fn, std::string_view text, std::optional<tolerance> default_tol,
                                std::string_view source) {
        if (default_tol && !detail::is_valid_tolerance(*default_tol))
            detail::fail_text(fn, "default_tol", detail::tolerance_text(*default_tol), detail::valid_tolerance);
        std::vector<labelled> items;
        std::vector<problem> problems;
        for (std::size_t number = 1; !text.empty(); ++number) {
            const std::size_t end = text.find('\n');
            const std::string_view line = text.substr(0, end);
            text.remove_prefix(end == text.npos ? text.size() : end + 1);
            std::string_view rest = line;
            if (number == 1 && rest.starts_with("\xEF\xBB\xBF")) rest.remove_prefix(3);
            rest = trim(rest.substr(0, rest.find('#')));
            if (rest.empty()) continue;
            const std::string where = "line " + std::to_string(number);
            auto bad = [&](const std::string& why) {
                problems.push_back({number, where + ": " + why, std::string(rest)});
            };
            const auto cut = rest.find_first_of(",;\t");
            const std::string_view value_column = trim(rest.substr(0, cut));
            const std::string_view tol_column = cut == rest.npos ? std::string_view{} : trim(rest.substr(cut + 1));
            if (tol_column.find_first_of(",;\t") != tol_column.npos) {
                bad("columns = 3 or more is invalid; expected a value and an optional tolerance");
                continue;
            }
            try {
                const Q value = parse<Q>(value_column);
                if (!(value.value() > 0.0)) {
                    bad("value = " + detail::value_text(value) + " is invalid; expected " +
                        std::string(detail::positive_quantity<Q>));
                    continue;
                }
                const std::optional<tolerance> tol = tol_column.empty() ? default_tol : parse_tolerance(tol_column);
                if (!tol) {
                    bad("tolerance = (none) is invalid; expected a second column such as 5% or J, or a default "
                        "tolerance");
                    continue;
                }
                items.push_back({part_value<Q>{value, *tol, std::nullopt}, number, where, std::string(rest)});
            } catch (const parse_error& e) {
                bad(e.what());
            }
        }
        if (problems.empty() && items.empty())
            detail::fail_text(fn, "source", std::string(source) + " (no values)", "at least one value line");
        return build(std::move(items), std::move(problems), [&](const std::vector<problem>& all) {
            std::string msg = std::string(fn) + ": " + std::string(source) + " has " + std::to_string(all.size()) +
                              (all.size() == 1 ? " bad line:" : " bad lines:");
            std::string text;
            for (std::size_t i = 0; i < all.size(); ++i) {
                msg += "\n" + all[i].message;
                text += (i ? "\n" : "") + all[i].text;
            }
            throw parse_error(text, msg);
        });
    }

    std::size_t lower_index(std::string_view fn, Q x) const {
        detail::require_positive(fn, "x", x, detail::positive_quantity<Q>);
        return static_cast<std::size_t>(std::lower_bound(values_.begin(), values_.end(), x.value()) - values_.begin());
    }
    std::optional<part_value<Q>> below(std::string_view fn, Q x) const {
        detail::require_positive(fn, "x", x, detail::positive_quantity<Q>);
        const auto i = std::upper_bound(values_.begin(), values_.end(), x.value()) - values_.begin();
        if (i == 0) return std::nullopt;
        return parts_[static_cast<std::size_t>(i - 1)];
    }
    std::optional<part_value<Q>> above(std::string_view fn, Q x) const {
        const std::size_t i = lower_index(fn, x);
        if (i == size()) return std::nullopt;
        return parts_[i];
    }
    std::optional<part_value<Q>> match(std::string_view fn, Q x, double rel_tol) const {
        detail::check_relative(fn, rel_tol);
        const std::size_t i = lower_index(fn, x);
        const double v = x.value();
        std::optional<std::size_t> best;
        // The closest value in absolute distance is one of the two neighbours of x.
        for (std::size_t j : {i - 1, i}) {
            if (j >= size()) continue;  // i - 1 wraps when i == 0
            const double d = std::abs(values_[j] - v);
            if (d <= rel_tol * v && (!best || d < std::abs(values_[*best] - v))) best = j;
        }
        if (!best) return std::nullopt;
        return parts_[*best];
    }

    std::vector<part_value<Q>> parts_;
    std::vector<double> values_;
};

/// How two parts are connected.
enum class connection { series, parallel };

/// "series" or "parallel".
constexpr std::string_view connection_name(connection c) { return c == connection::series ? "series" : "parallel"; }

/// Two parts of a value set combined to approach a target.
template <PartQuantity Q>
struct pair_combination {
    part_value<Q> first;   ///< the smaller part
    part_value<Q> second;  ///< the larger part; equal to first for two parts of one value
    connection how{};      ///< series or parallel
    Q value{};             ///< effective value of the pair
    double error = 0.0;    ///< relative error, value / target - 1 (signed)
    tolerance tol{};       ///< worst-case relative band of the effective value
};

namespace detail {

/// Resistors in series and capacitors in parallel add; the other two connections
/// take the reciprocal of the summed reciprocals (product over sum).
enum class combine_rule { sum, reciprocal_sum };

constexpr combine_rule rule_for(part_kind kind, connection how) {
    return (kind == part_kind::resistor) == (how == connection::series) ? combine_rule::sum
                                                                         : combine_rule::reciprocal_sum;
}

/// The combined value. Written so that every rounded step is monotone in each
/// argument (1/(1/a + 1/b) rather than a b / (a + b)): the pair search relies on it.
template <combine_rule R>
inline double combine(double a, double b) {
    if constexpr (R == combine_rule::sum) return a + b;
    else return 1.0 / (1.0 / a + 1.0 / b);
}

/// Worst-case band of a combination; both rules are increasing in a and in b, so the
/// extremes are at (a(1-ma), b(1-mb)) and (a(1+pa), b(1+pb)).
/// Sum S = a + b: S(1+p) = a(1+pa) + b(1+pb) gives p = (a pa + b pb)/(a + b), and
/// likewise m: the value-weighted average of the parts' bands.
/// Reciprocal sum P = 1/G, G = ga + gb, ga = 1/a: a part at a(1+pa) has conductance
/// ga/(1+pa) = ga(1 - pa/(1+pa)) and at a(1-ma) ga(1 + ma/(1-ma)). So G's band is the
/// conductance-weighted average (weights ga/G = b/(a+b), gb/G = a/(a+b)) of those,
/// mG = wa pa/(1+pa) + wb pb/(1+pb), pG = wa ma/(1-ma) + wb mb/(1-mb), and P = 1/G
/// has plus = mG/(1 - mG), minus = pG/(1 + pG). (Equal bands give that band back.)
inline tolerance combined_band(combine_rule r, double a, tolerance ta, double b, tolerance tb) {
    const double wa = a / (a + b), wb = b / (a + b);
    if (r == combine_rule::sum) return {wa * ta.minus + wb * tb.minus, wa * ta.plus + wb * tb.plus};
    const double ca = wb, cb = wa;  // conductance weights ga/G, gb/G
    const double m_g = ca * ta.plus / (1.0 + ta.plus) + cb * tb.plus / (1.0 + tb.plus);
    const double p_g = ca * ta.minus / (1.0 - ta.minus) + cb * tb.minus / (1.0 - tb.minus);
    return {p_g / (1.0 + p_g), m_g / (1.0 - m_g)};
}

/// A pair by index into the sorted values (i <= j) with its combined value and error.
struct pair_hit {
    std::size_t i = 0, j = 0;
    double value = 0.0;
    double error = 0.0;  // value / target - 1
};

/// The ranking: smaller |error| first, then smaller first index, then smaller second.
inline bool ranks_before(const pair_hit& x, const pair_hit& y) {
    const double ex = std::abs(x.error), ey = std::abs(y.error);
    if (ex != ey) return ex < ey;
    return x.i != y.i ? x.i < y.i : x.j < y.j;
}

/// The partner value b that puts combine(a, b) at the target: a first guess only.
template <combine_rule R>
inline double partner_guess(double a, double target) {
    if constexpr (R == combine_rule::sum) return target - a;
    else return 1.0 / target > 1.0 / a ? 1.0 / (1.0 / target - 1.0 / a) : HUGE_VAL;
}

/// The k best pairs (i <= j) of ascending values v for target, in ranking order.
/// combine is non-decreasing in each argument (each rounded step is), so in row i the
/// pairs below the target come before the split s_i = first j >= i with
/// combine(v[i], v[j]) >= target, and walking away from s_i in either direction |error|
/// never falls: the row's best pair is next to s_i. Pass 1 finds every split (binary
/// search for a guessed partner, corrected with the exact predicate) and row best;
/// the k-th smallest row best, T, bounds the answer (k distinct pairs reach it), so
/// pass 2 walks only rows whose best is within T, each walk stopping at its first
/// pair beyond T or beyond the worst of the k kept so far (in a heap); pairs equal to
/// that bound go on to the ranking's tie-break. O(n log n + k log k) in the usual case.
template <combine_rule R>
std::vector<pair_hit> search_pairs(std::span<const double> v, double target, std::size_t k) {
    const std::size_t n = v.size();
    auto hit = [&](std::size_t i, std::size_t j) {
        const double c = combine<R>(v[i], v[j]);
        return pair_hit{i, j, c, c / target - 1.0};
    };
    std::vector<std::size_t> split(n);
    std::vector<double> row_best(n, HUGE_VAL);
    // Once a whole row lies at or above the target (split == i) so do all later rows,
    // and their bests, the pairs (i, i), only grow: k such rows are enough to bound
    // the answer, and any later pair ties with it at best and ranks after.
    std::size_t rows = n;
    for (std::size_t i = 0, above = 0; i < n && above < k; ++i) {
        const double a = v[i];
        const auto row = v.begin() + static_cast<std::ptrdiff_t>(i);
        const auto guess = std::lower_bound(row, v.end(), partner_guess<R>(a, target));
        std::size_t s = static_cast<std::size_t>(guess - v.begin());
        while (s > i && combine<R>(a, v[s - 1]) >= target) --s;
        while (s < n && combine<R>(a, v[s]) < target) ++s;
        split[i] = s;
        if (s == i) ++above;
        rows = i + 1;
        row_best[i] = std::min(s > i ? std::abs(hit(i, s - 1).error) : HUGE_VAL,
                               s < n ? std::abs(hit(i, s).error) : HUGE_VAL);
    }
    double bound = HUGE_VAL;
    if (k <= n) {
        std::vector<double> best = row_best;
        std::nth_element(best.begin(), best.begin() + static_cast<std::ptrdiff_t>(k - 1), best.end());
        bound = best[k - 1];
    }
    std::vector<pair_hit> heap;  // max-heap under ranks_before: front() ranks last
    heap.reserve(std::min(k, n * (n + 1) / 2));
    auto beyond = [&](const pair_hit& h) {
        const double e = std::abs(h.error);
        return e > bound || (heap.size() == k && e > std::abs(heap.front().error));
    };
    auto offer = [&](const pair_hit& h) {
        if (heap.size() == k) {
            if (!ranks_before(h, heap.front())) return;
            std::pop_heap(heap.begin(), heap.end(), ranks_before);
            heap.pop_back();
        }
        heap.push_back(h);
        std::push_heap(heap.begin(), heap.end(), ranks_before);
    };
    for (std::size_t i = 0; i < rows; ++i) {
        if (row_best[i] > bound) continue;
        for (std::size_t j = split[i]; j > i; --j) {
            const pair_hit h = hit(i, j - 1);
            if (beyond(h)) break;
            offer(h);
        }
        for (std::size_t j = split[i]; j < n; ++j) {
            const pair_hit h = hit(i, j);
            if (beyond(h)) break;
            offer(h);
        }
    }
    std::sort_heap(heap.begin(), heap.end(), ranks_before);
    return heap;
}

}  // namespace detail

/// The effective value of a and b connected `how` (resistors in series and
/// capacitors in parallel add; otherwise product over sum).
template <PartQuantity Q>
Q combined_value(Q a, Q b, connection how) {
    const double x = a.value(), y = b.value();
    return Q::from_value(detail::rule_for(part_kind_of<Q>, how) == detail::combine_rule::sum
                             ? detail::combine<detail::combine_rule::sum>(x, y)
                             : detail::combine<detail::combine_rule::reciprocal_sum>(x, y));
}

/// The worst-case relative band of a and b connected `how` (derivation at detail::combined_band).
template <PartQuantity Q>
tolerance combined_tolerance(const part_value<Q>& a, const part_value<Q>& b, connection how) {
    return detail::combined_band(detail::rule_for(part_kind_of<Q>, how), a.value.value(), a.tol, b.value.value(),
                                 b.tol);
}

/// The k best pairs from `set` connected `how` for `target`, best first, ranked by
/// |relative error|, ties by the smaller first part, then the smaller second part.
/// Each unordered pair appears once; two parts of the same value count as a pair;
/// a single part does not (compare with `best_single`). Fewer than k are returned
/// only when the set has fewer pairs. O(n log n) for a fixed k.
template <PartQuantity Q>
std::vector<pair_combination<Q>> best_pairs(const value_set<Q>& set, Q target, connection how, std::size_t k = 1) {
    detail::require_positive("best_pairs", "target", target, detail::positive_quantity<Q>);
    if (k == 0) detail::fail_invalid("best_pairs", "k", 0.0, "at least 1");
    using detail::combine_rule;
    const auto hits = detail::rule_for(part_kind_of<Q>, how) == combine_rule::sum
                          ? detail::search_pairs<combine_rule::sum>(set.si_values(), target.value(), k)
                          : detail::search_pairs<combine_rule::reciprocal_sum>(set.si_values(), target.value(), k);
    std::vector<pair_combination<Q>> out;
    out.reserve(hits.size());
    for (const auto& h : hits)
        out.push_back({set[h.i], set[h.j], how, Q::from_value(h.value), h.error,
                       combined_tolerance(set[h.i], set[h.j], how)});
    return out;
}

/// The single value with the smallest |value / target - 1| (the ranking `best_pairs`
/// uses); a tie goes to the lower value.
template <PartQuantity Q>
const part_value<Q>& best_single(const value_set<Q>& set, Q target) {
    detail::require_positive("best_single", "target", target, detail::positive_quantity<Q>);
    const auto v = set.si_values();
    const double t = target.value();
    const std::size_t i = static_cast<std::size_t>(std::lower_bound(v.begin(), v.end(), t) - v.begin());
    if (i == 0) return set.front();
    if (i == v.size()) return set.back();
    return std::abs(v[i - 1] / t - 1.0) <= std::abs(v[i] / t - 1.0) ? set[i - 1] : set[i];
}

}  // namespace tauforge
