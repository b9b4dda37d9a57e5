#pragma once
/// An edge detector that turns a falling edge into a short trigger pulse: a
/// series capacitor C from the input into a trigger input, a pull-up R from
/// that node to the supply. At rest the node sits at V_dd. A falling input step
/// of amplitude V carries the node down to V_dd - V (C cannot change its voltage
/// at once); it then recovers towards V_dd with tau = R C. The trigger pulse is
/// the time the node spends below the trigger threshold k V_dd:
///
///     width = R C ln(V / (V_dd - k V_dd)),   R C ln 1.5 for a full-swing step and k = 1/3.
///
/// The step must carry the node below the threshold: V > (1 - k) V_dd, or there
/// is no pulse (a `domain_error` that names the values). A step larger than
/// the supply takes the node below 0 V, where an input clamp diode would
/// conduct; that is not modelled (check_trigger warns).
///
///     edge_detector e{.r = {.nominal = 10_kohm}, .c = {.nominal = 470_pF}};
///     auto findings = check_trigger(e, one_shot);     // against a timer_monostable

#include "tauforge/concepts.hpp"
#include "tauforge/detail/validate.hpp"
#include "tauforge/networks/timer_monostable.hpp"
#include "tauforge/notation.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <string>
#include <string_view>
#include <vector>

namespace tauforge {

/// The edge detector; see the header comment for the circuit.
struct edge_detector {
    resistor r{};  ///< pull-up, supply to the trigger node
    capacitor c{};  ///< series capacitor, input to the trigger node
    ranged<voltage> supply = ranged<voltage>::exactly(voltage::from_value(5.0));  ///< V_dd
    ranged<voltage> step = ranged<voltage>::exactly(voltage::from_value(5.0));  ///< falling edge amplitude V
    ranged<double> threshold = ranged<double>::exactly(1.0 / 3.0);  ///< trigger level / supply, in (0, 1)
    operating_conditions conditions{};  ///< temperature range for the parts

    /// Index into `metrics` and `evaluate`'s result.
    enum metric_index : std::size_t { pulse_width };
    /// Indices into `parameters`, `ranges()` and `evaluate`'s argument.
    enum parameter_index : std::size_t { p_r, p_c, p_supply, p_step, p_threshold };

    /// The uncertain parameters, in SI units.
    static constexpr std::array<quantity_info, 5> parameters{
        {{"R", "\u03A9"}, {"C", "F"}, {"supply", "V"}, {"step", "V"}, {"threshold", "V/V"}}};
    /// The width of the pulse below the threshold.
    static constexpr std::array<quantity_info, 1> metrics{{{"pulse width", "s"}}};
    /// The parts synthesis chooses.
    static constexpr std::array<design_slot, 2> design_slots{
        {{"R", part_kind::resistor, p_r}, {"C", part_kind::capacitor, p_c}}};

    /// Each parameter's interval. Throws `domain_error` for a threshold ratio
    /// outside (0, 1), `invalid_argument` for a non-positive supply or step.
    std::array<interval, 5> ranges() const {
        constexpr std::string_view fn = "edge_detector::ranges";
        c.require_no_bias_curve(fn);
        std::array<interval, 5> x{r.range(conditions), c.range(conditions), supply.as_interval(), step.as_interval(),
                                  threshold.as_interval()};
        // Input and trigger node can together put up to supply + step across the series C.
        c.check_rating(fn, "supply.high + step.high", supply.high + step.high);
        if (!(x[p_supply].low > 0.0)) detail::fail_invalid(fn, "supply.low", supply.low, "a positive supply voltage");
        if (!(x[p_step].low > 0.0)) detail::fail_invalid(fn, "step.low", step.low, "a positive step amplitude");
        if (!(x[p_threshold].low > 0.0))
            detail::parts_fail_domain(fn, "threshold.low", detail::quoted_value(threshold.low),
                                      "a ratio of the supply strictly between 0 and 1");
        if (!(x[p_threshold].high < 1.0))
            detail::parts_fail_domain(fn, "threshold.high", detail::quoted_value(threshold.high),
                                      "a ratio of the supply strictly between 0 and 1");
        return x;
    }

    /// The width of the pulse below the threshold. Throws `domain_error` when the
    /// step does not carry the node below the threshold.
    std::array<double, 1> evaluate(const std::array<double, 5>& x) const {
        const double vdd = x[p_supply], v = x[p_step], vth = x[p_threshold] * vdd;
        const double dip = vdd - v;
        if (!(dip < vth))
            throw domain_error(
                "edge_detector::evaluate: step = " + detail::value_text(voltage::from_value(v)) +
                " is invalid; expected more than supply - threshold = " + detail::value_text(voltage::from_value(vdd)) +
                " - " + detail::value_text(voltage::from_value(vth)) + " = " +
                detail::value_text(voltage::from_value(vdd - vth)) + ", or the node (down to " +
                detail::value_text(voltage::from_value(dip)) + ") never falls below the threshold");
        return {detail::rc::crossing_time(dip, vdd, vth, x[p_r] * x[p_c])};
    }

    /// A copy with R and C bought at the given values and tolerances.
    edge_detector with_parts(const std::array<part_choice, 2>& p) const {
        edge_detector e = *this;
        e.r = r.with_choice(p[0]);
        e.c = c.with_choice(p[1]);
        return e;
    }

    /// The R (slot 0) or C (slot 1) that gives a pulse of `target` with the other
    /// at `values` (width = R C times a constant), at the nominal supply, step and threshold.
    double solve_slot(std::size_t slot, std::size_t metric, double target, const std::array<double, 2>& values) const {
        if (slot > 1 || metric != pulse_width || !(target > 0.0)) return std::numeric_limits<double>::quiet_NaN();
        std::array<double, 5> x{1.0, 1.0, supply.nominal.value(), step.nominal.value(), threshold.nominal};
        return target / evaluate(x)[0] / values[1 - slot];
    }

    /// The pulse width over the parts' and conditions' ranges (corners; the width
    /// is monotone in every parameter), as a trigger pulse for `check_design`.
    ranged<duration> pulse_width_range() const {
        const interval w = detail::corner_bounds(*this)[pulse_width];
        return {duration::from_value(w.nominal), duration::from_value(w.low), duration::from_value(w.high)};
    }
};

static_assert(SolvableNetwork<edge_detector>, "edge_detector must satisfy SolvableNetwork");

/// The pulse widths a trigger input accepts: longer than its minimum width,
/// shorter than `max_fraction` of the shortest output pulse of the one-shot it starts.
struct trigger_window {
    duration min_width = duration::from_value(0.0);  ///< the trigger input's minimum pulse width
    duration one_shot_width = duration::from_value(0.0);  ///< the one-shot's shortest output pulse
    double max_fraction = 1.0;  ///< 1: the trigger must end before the output pulse; less for margin
};

/// Checks the edge detector's pulse at worst case against a trigger window:
/// - violation "trigger_too_short": the pulse can be as short as the minimum width;
/// - violation "trigger_too_long": the pulse can last `max_fraction` of the one-shot's width;
/// - warning "below_ground": the step can exceed the supply, so the node dips below 0 V.
inline std::vector<finding> check_trigger(const edge_detector& e, const trigger_window& w) {
    constexpr std::string_view fn = "check_trigger";
    detail::require_non_negative(fn, "min_width", w.min_width, "a non-negative, finite time");
    detail::require_positive(fn, "one_shot_width", w.one_shot_width, "a positive, finite time");
    if (!(w.max_fraction > 0.0 && std::isfinite(w.max_fraction)))
        detail::fail_invalid(fn, "max_fraction", w.max_fraction, "a positive fraction of the one-shot's width");
    const auto x = e.ranges();
    const interval p = detail::corner_bounds(e)[edge_detector::pulse_width];
    const auto t = [](double s) { return format(duration::from_value(s), {.digits = 4}); };
    std::vector<finding> out;
    if (p.low <= w.min_width.value())
        out.push_back({severity::violation, "trigger_too_short",
                       "the trigger pulse can be as short as " + t(p.low) +
                           ", not longer than the trigger input's minimum width of " + t(w.min_width.value())});
    const double limit = w.max_fraction * w.one_shot_width.value();
    if (p.high >= limit)
        out.push_back({severity::violation, "trigger_too_long",
                       "the trigger pulse can last " + t(p.high) + ", not shorter than " +
                           format_percent(w.max_fraction) + " of the one-shot's shortest pulse " +
                           t(w.one_shot_width.value()) + " = " + t(limit)});
    if (x[edge_detector::p_step].high > x[edge_detector::p_supply].low)
        out.push_back({severity::warning, "below_ground",
                       "the step (up to " + format(voltage::from_value(x[edge_detector::p_step].high), {.digits = 4}) +
                           ") exceeds the supply (down to " +
                           format(voltage::from_value(x[edge_detector::p_supply].low), {.digits = 4}) +
                           "): the node dips below 0 V, where an input clamp would conduct and shorten the pulse"});
    return out;
}

/// The same check against the one-shot it triggers: its `min_trigger_width` and
/// its shortest pulse at worst case.
inline std::vector<finding> check_trigger(const edge_detector& e, const timer_monostable& one_shot,
                                          double max_fraction = 1.0) {
    const interval w = detail::corner_bounds(one_shot)[timer_monostable::pulse_width];
    return check_trigger(e, trigger_window{one_shot.min_trigger_width, duration::from_value(w.low), max_fraction});
}

}  // namespace tauforge
