#pragma once
/// A plain RC delay: a supply step charges C through R from 0 V until the node
/// crosses a threshold given as a fraction of the supply (a logic input, a
/// comparator). Metric: the delay. Synthesis chooses R and C.
///
///     tauforge::rc_delay d{.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
///                          .c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};
///     auto w = tauforge::analysis::worst_case(d);

#include "tauforge/concepts.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>

namespace tauforge {

struct rc_delay {
    resistor r{};                                            ///< charging resistor
    capacitor c{};                                           ///< timing capacitor
    ranged<voltage> supply = ranged<voltage>::exactly(voltage::from_value(5.0));  ///< step height
    ranged<double> threshold = ranged<double>::exactly(2.0 / 3.0);  ///< crossing level / supply, in (0, 1)
    operating_conditions conditions{};                       ///< temperature range for the parts

    static constexpr std::array<quantity_info, 4> parameters{{
        {"R", "\u03A9"}, {"C", "F"}, {"supply", "V"}, {"threshold", "V/V"}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"delay", "s"}}};
    static constexpr std::array<design_slot, 2> design_slots{{
        {"R", part_kind::resistor, 0}, {"C", part_kind::capacitor, 1}}};

    /// Each parameter's interval at the operating conditions.
    std::array<interval, 4> ranges() const {
        return {r.range(conditions), c.range(conditions), supply.as_interval(), threshold.as_interval()};
    }

    /// delay = crossing time from 0 V towards the supply to threshold x supply.
    std::array<double, 1> evaluate(const std::array<double, 4>& x) const {
        return {detail::rc::crossing_time(0.0, x[2], x[3] * x[2], x[0] * x[1])};
    }

    /// A copy with R and C bought at the given values and tolerances.
    rc_delay with_parts(const std::array<part_choice, 2>& p) const {
        rc_delay d = *this;
        d.r = r.with_choice(p[0]);
        d.c = c.with_choice(p[1]);
        return d;
    }

    /// The R (slot 0) or C (slot 1) that gives `target` delay with the other at `values`.
    double solve_slot(std::size_t slot, std::size_t metric, double target, const std::array<double, 2>& values) const {
        if (metric != 0 || slot > 1 || !(target > 0.0)) return std::numeric_limits<double>::quiet_NaN();
        const double vs = supply.nominal.value();
        // Delay per unit time constant at nominal supply and threshold.
        const double per_tau = detail::rc::crossing_time(0.0, vs, threshold.nominal * vs, 1.0);
        return target / per_tau / values[1 - slot];
    }
};

static_assert(SolvableNetwork<rc_delay>, "rc_delay must satisfy SolvableNetwork");

}  // namespace tauforge
