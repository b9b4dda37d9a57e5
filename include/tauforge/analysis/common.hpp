#pragma once
/// Vocabulary shared by the analysis headers: how a tolerance maps to a
/// standard deviation, and a specification window on a metric.
///
///     tauforge::spec_window w = tauforge::spec_window::between(0.9_ms, 1.3_ms);
///     tauforge::spread_convention c{};          // a tolerance is +/-3 sigma

#include "tauforge/detail/analysis_common.hpp"
#include "tauforge/units.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <optional>
#include <string>
#include <string_view>

namespace tauforge {

/// How a parameter's interval maps to a distribution: the half-width of the
/// interval is `sigmas_per_half_width` standard deviations. The default, a
/// tolerance is +/-3 sigma of a normal distribution, is common practice; a
/// uniform distribution over the interval has sigma = half-width / sqrt(3).
struct spread_convention {
    double sigmas_per_half_width = 3.0;  ///< k in half-width = k sigma

    /// half-width = k sigma of a normal distribution.
    static constexpr spread_convention normal_at(double k) { return {k}; }
    /// sigma of a uniform distribution over the interval: half-width / sqrt(3).
    static spread_convention uniform() { return {std::sqrt(3.0)}; }
};

namespace detail {
inline void check_convention(std::string_view fn, const spread_convention& c) {
    if (!(std::isfinite(c.sigmas_per_half_width) && c.sigmas_per_half_width > 0.0))
        analysis_fail(fn, "convention.sigmas_per_half_width", quoted_value(c.sigmas_per_half_width),
                      "a positive, finite number of standard deviations");
}
}  // namespace detail

/// The acceptable values of one metric, in its SI unit: [low, high], either side
/// optional (a reset pulse "at least 20 ms" has only a low side). No side at all
/// means no requirement.
struct spec_window {
    std::optional<double> low{};   ///< smallest acceptable value, if any
    std::optional<double> high{};  ///< largest acceptable value, if any

    /// [lo, hi] in SI base units.
    static constexpr spec_window between(double lo, double hi) { return {lo, hi}; }
    /// [lo, hi] as quantities: spec_window::between(0.9_ms, 1.3_ms).
    template <class Unit>
    static constexpr spec_window between(si_quantity<Unit> lo, si_quantity<Unit> hi) {
        return {lo.value(), hi.value()};
    }
    /// At least lo.
    static constexpr spec_window at_least(double lo) { return {lo, std::nullopt}; }
    /// At least lo, as a quantity.
    template <class Unit>
    static constexpr spec_window at_least(si_quantity<Unit> lo) {
        return {lo.value(), std::nullopt};
    }
    /// At most hi.
    static constexpr spec_window at_most(double hi) { return {std::nullopt, hi}; }
    /// At most hi, as a quantity.
    template <class Unit>
    static constexpr spec_window at_most(si_quantity<Unit> hi) {
        return {std::nullopt, hi.value()};
    }

    /// True when no side is set.
    constexpr bool is_open() const { return !low && !high; }
    /// low <= v <= high for the sides that are set.
    constexpr bool contains(double v) const { return (!low || v >= *low) && (!high || v <= *high); }
    /// Signed distance to the nearest set edge: positive inside, negative outside.
    /// An open window gives +infinity.
    double margin(double v) const {
        double m = std::numeric_limits<double>::infinity();
        if (low) m = std::min(m, v - *low);
        if (high) m = std::min(m, *high - v);
        return m;
    }
    /// Memberwise equality.
    friend constexpr bool operator==(const spec_window&, const spec_window&) = default;
};

namespace detail {
inline void check_window(std::string_view fn, std::string_view name, std::string_view unit, const spec_window& w) {
    const std::string n(name);
    if (w.low && !std::isfinite(*w.low)) analysis_fail(fn, n + ".low", info_value_text(*w.low, unit), "a finite limit");
    if (w.high && !std::isfinite(*w.high))
        analysis_fail(fn, n + ".high", info_value_text(*w.high, unit), "a finite limit");
    if (w.low && w.high && !(*w.low <= *w.high))
        analysis_fail(fn, n + ".low", info_value_text(*w.low, unit),
                      "at most " + n + ".high = " + info_value_text(*w.high, unit));
}
}  // namespace detail

}  // namespace tauforge
