#pragma once
/// The comparator-timer oscillator with two resistors and a capacitor: C
/// charges through Ra + Rb from the lower to the upper threshold (output high)
/// and discharges through Rb into the discharge switch back to the lower one
/// (output low). Thresholds are fractions of the supply (1/3 and 2/3 for the
/// classic part). Duty cycle here is the HIGH fraction t_high / period.
/// Synthesis chooses Ra, Rb and C.

#include "tauforge/concepts.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>

namespace tauforge {

struct timer_astable {
    resistor ra{};   ///< from the supply to the discharge node
    resistor rb{};   ///< from the discharge node to the capacitor
    capacitor c{};   ///< timing capacitor
    ranged<voltage> supply = ranged<voltage>::exactly(voltage::from_value(5.0));
    ranged<double> lower_threshold = ranged<double>::exactly(1.0 / 3.0);  ///< trigger level / supply
    ranged<double> upper_threshold = ranged<double>::exactly(2.0 / 3.0);  ///< threshold level / supply
    operating_conditions conditions{};

    enum metric_index : std::size_t { high_time, low_time, period, frequency, duty };

    static constexpr std::array<quantity_info, 6> parameters{{{"Ra", "\u03A9"},
                                                              {"Rb", "\u03A9"},
                                                              {"C", "F"},
                                                              {"supply", "V"},
                                                              {"lower threshold", "V/V"},
                                                              {"upper threshold", "V/V"}}};
    static constexpr std::array<quantity_info, 5> metrics{
        {{"high time", "s"}, {"low time", "s"}, {"period", "s"}, {"frequency", "Hz"}, {"duty", ""}}};
    static constexpr std::array<design_slot, 3> design_slots{
        {{"Ra", part_kind::resistor, 0}, {"Rb", part_kind::resistor, 1}, {"C", part_kind::capacitor, 2}}};

    std::array<interval, 6> ranges() const {
        return {ra.range(conditions),       rb.range(conditions),          c.range(conditions),
                supply.as_interval(),       lower_threshold.as_interval(), upper_threshold.as_interval()};
    }

    /// High and low times per unit time constant: charge from lower to upper
    /// threshold towards the supply, discharge from upper to lower towards 0 V.
    static std::array<double, 2> per_tau(double vs, double lo, double hi) {
        return {detail::rc::crossing_time(lo * vs, vs, hi * vs, 1.0),
                detail::rc::crossing_time(hi * vs, 0.0, lo * vs, 1.0)};
    }

    std::array<double, 5> evaluate(const std::array<double, 6>& x) const {
        const auto k = per_tau(x[3], x[4], x[5]);
        const double th = k[0] * (x[0] + x[1]) * x[2];
        const double tl = k[1] * x[1] * x[2];
        const double t = th + tl;
        return {th, tl, t, 1.0 / t, th / t};
    }

    timer_astable with_parts(const std::array<part_choice, 3>& p) const {
        timer_astable a = *this;
        a.ra = ra.with_choice(p[0]);
        a.rb = rb.with_choice(p[1]);
        a.c = c.with_choice(p[2]);
        return a;
    }

    /// The Ra, Rb or C that puts a time metric (or the frequency) at `target`,
    /// the others at `values`; NaN for the duty, which does not scale with one part.
    double solve_slot(std::size_t slot, std::size_t metric, double target, const std::array<double, 3>& v) const {
        constexpr double nan = std::numeric_limits<double>::quiet_NaN();
        if (!(target > 0.0) || slot > 2) return nan;
        const auto k = per_tau(supply.nominal.value(), lower_threshold.nominal, upper_threshold.nominal);
        // Each time metric is C (a Ra + b Rb).
        double a = 0.0, b = 0.0, t = target;
        switch (metric) {
            case high_time: a = k[0]; b = k[0]; break;
            case low_time: a = 0.0; b = k[1]; break;
            case period: a = k[0]; b = k[0] + k[1]; break;
            case frequency: a = k[0]; b = k[0] + k[1]; t = 1.0 / target; break;
            default: return nan;
        }
        const double ra_v = v[0], rb_v = v[1], c_v = v[2];
        switch (slot) {
            case 0: return a > 0.0 ? (t / c_v - b * rb_v) / a : nan;
            case 1: return (t / c_v - a * ra_v) / b;
            default: return t / (a * ra_v + b * rb_v);
        }
    }
};

static_assert(SolvableNetwork<timer_astable>, "timer_astable must satisfy SolvableNetwork");

}  // namespace tauforge
