#pragma once
// Shared internals of analysis/*: checked parameter ranges, the set of free
// (non-fixed) parameters, Gray-code corner enumeration, message texts.

#include "tauforge/concepts.hpp"
#include "tauforge/detail/validate.hpp"
#include "tauforge/error.hpp"

#include <algorithm>
#include <array>
#include <bit>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

namespace tauforge::detail {

/// "4700 Ω": a plain double with the unit symbol of a quantity_info.
inline std::string info_value_text(double v, std::string_view unit) {
    std::string s = quoted_value(v);
    if (!unit.empty()) {
        s += ' ';
        s += unit;
    }
    return s;
}

[[noreturn]] inline void analysis_fail(std::string_view function, std::string_view parameter, const std::string& value,
                                       std::string_view expected) {
    throw invalid_argument(std::string(function) + ": " + std::string(parameter) + " = " + value +
                           " is invalid; expected " + std::string(expected));
}

[[noreturn]] inline void analysis_fail_domain(std::string_view function, std::string_view parameter,
                                              const std::string& value, std::string_view expected) {
    throw domain_error(std::string(function) + ": " + std::string(parameter) + " = " + value +
                       " is invalid; expected " + std::string(expected));
}

[[noreturn]] inline void analysis_fail_index(std::string_view function, std::string_view parameter, std::size_t index,
                                             std::size_t count) {
    analysis_fail(function, parameter, std::to_string(index), "an index below " + std::to_string(count));
}

/// The network's ranges, each checked: finite, low <= nominal <= high.
/// No allocation unless a range is bad (metric_bounds sits in solver loops).
template <TimingNetwork N>
std::array<interval, N::parameters.size()> checked_ranges(std::string_view fn, const N& n) {
    const auto r = n.ranges();
    for (std::size_t j = 0; j < r.size(); ++j) {
        const interval& i = r[j];
        if (std::isfinite(i.nominal) && std::isfinite(i.low) && std::isfinite(i.high) && i.low <= i.nominal &&
            i.nominal <= i.high)
            continue;
        const auto& info = N::parameters[j];
        const std::string name = std::string(info.name);
        if (!std::isfinite(i.nominal))
            analysis_fail(fn, name + ".nominal", info_value_text(i.nominal, info.unit), "a finite value");
        if (!std::isfinite(i.low))
            analysis_fail(fn, name + ".low", info_value_text(i.low, info.unit), "a finite value");
        if (!std::isfinite(i.high))
            analysis_fail(fn, name + ".high", info_value_text(i.high, info.unit), "a finite value");
        analysis_fail(fn, name + ".nominal", info_value_text(i.nominal, info.unit),
                      "a value from low = " + info_value_text(i.low, info.unit) +
                          " to high = " + info_value_text(i.high, info.unit));
    }
    return r;
}

/// A metric value must be finite: a NaN would silently drop out of every comparison.
template <TimingNetwork N>
inline void check_metric(std::string_view fn, std::size_t m, double v) {
    if (!std::isfinite(v))
        analysis_fail_domain(fn, std::string(N::metrics[m].name), info_value_text(v, N::metrics[m].unit),
                             "a finite metric at every evaluated point");
}

/// The parameters with low < high, in parameter order.
template <std::size_t P>
struct free_set {
    std::array<std::size_t, P> index{};
    std::size_t count = 0;
};

template <std::size_t P>
constexpr free_set<P> free_parameters(const std::array<interval, P>& r) {
    free_set<P> f;
    for (std::size_t j = 0; j < P; ++j)
        if (!r[j].is_fixed()) f.index[f.count++] = j;
    return f;
}

template <std::size_t P>
constexpr std::array<double, P> nominal_point(const std::array<interval, P>& r) {
    std::array<double, P> x{};
    for (std::size_t j = 0; j < P; ++j) x[j] = r[j].nominal;
    return x;
}

/// The largest number of free parameters whose 2^k corners are enumerated.
inline constexpr std::size_t corner_parameter_limit = 20;

inline void check_corner_count(std::string_view fn, std::size_t k, std::size_t limit = corner_parameter_limit) {
    if (k > limit)
        analysis_fail(fn, "free parameters", std::to_string(k),
                      "at most " + std::to_string(limit) + " (2^" + std::to_string(limit) +
                          " corners); fix some parameters or use monte_carlo");
}

/// Visit every corner of the free parameters in Gray-code order: one parameter
/// changes between visits, no allocation. Bit b of the mask set means free
/// parameter b sits at its high end. x must hold the values of the fixed parameters.
template <std::size_t P, class Visit>
void for_each_corner(const std::array<interval, P>& r, const free_set<P>& fs, std::array<double, P>& x, Visit&& visit) {
    for (std::size_t b = 0; b < fs.count; ++b) x[fs.index[b]] = r[fs.index[b]].low;
    std::uint32_t gray = 0;
    visit(gray);
    const std::uint32_t total = std::uint32_t{1} << fs.count;
    for (std::uint32_t i = 1; i < total; ++i) {
        const int b = std::countr_zero(i);
        gray ^= std::uint32_t{1} << b;
        const std::size_t p = fs.index[static_cast<std::size_t>(b)];
        x[p] = (gray >> b & 1u) ? r[p].high : r[p].low;
        visit(gray);
    }
}

/// The parameter values of a corner mask from for_each_corner.
template <std::size_t P>
constexpr std::array<double, P> corner_point(const std::array<interval, P>& r, const free_set<P>& fs,
                                             std::uint32_t mask) {
    auto x = nominal_point(r);
    for (std::size_t b = 0; b < fs.count; ++b)
        x[fs.index[b]] = (mask >> b & 1u) ? r[fs.index[b]].high : r[fs.index[b]].low;
    return x;
}

/// Every metric's nominal, low and high over the corners of the free
/// parameters (exact when each metric is monotone in each parameter), without
/// heap allocation: the one corner loop behind `metric_bounds` and the
/// networks' own checks. Throws above 20 free parameters or on a NaN metric.
template <TimingNetwork N>
std::array<interval, N::metrics.size()> corner_bounds(const N& n, const std::array<interval, N::parameters.size()>& r,
                                                    std::string_view fn = "corner_bounds") {
    constexpr std::size_t M = N::metrics.size();
    const auto fs = free_parameters(r);
    check_corner_count(fn, fs.count);
    auto x = nominal_point(r);
    const auto nominal = n.evaluate(x);
    std::array<interval, M> out{};
    for (std::size_t m = 0; m < M; ++m) out[m] = {nominal[m], nominal[m], nominal[m]};
    bool finite = true;
    for_each_corner(r, fs, x, [&](std::uint32_t) {
        const auto v = n.evaluate(x);
        for (std::size_t m = 0; m < M; ++m) {
            out[m].low = std::min(out[m].low, v[m]);
            out[m].high = std::max(out[m].high, v[m]);
            finite = finite && std::isfinite(v[m]);
        }
    });
    for (std::size_t m = 0; m < M; ++m) {
        check_metric<N>(fn, m, nominal[m]);
        if (!finite) {
            check_metric<N>(fn, m, out[m].low);
            check_metric<N>(fn, m, out[m].high);
        }
    }
    if (!finite)  // a NaN slipped past min/max: find it
        for_each_corner(r, fs, x, [&](std::uint32_t) {
            const auto v = n.evaluate(x);
            for (std::size_t m = 0; m < M; ++m) check_metric<N>(fn, m, v[m]);
        });
    return out;
}

/// corner_bounds over the network's own (checked) ranges.
template <TimingNetwork N>
std::array<interval, N::metrics.size()> corner_bounds(const N& n) {
    return corner_bounds(n, checked_ranges("corner_bounds", n), "corner_bounds");
}

}  // namespace tauforge::detail
