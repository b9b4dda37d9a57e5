#pragma once
/// The comparator-timer one-shot (monostable): a trigger opens the discharge
/// switch, C charges through R from the level the switch held it at towards
/// the supply, and the output pulse ends when the node reaches the upper
/// threshold (a ratio of the supply, or an absolute control voltage); then the
/// switch discharges C again. Metrics: pulse width (with the propagation
/// delay), recovery time, maximum retrigger rate. Synthesis chooses R and C.
///
///     timer_monostable m{.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
///                        .c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};
///     auto w = tauforge::metric_bounds(m)[timer_monostable::pulse_width];  // RC ln 3 x [0.891, 1.111]
///     for (const auto& f : check_design(m, ranged<duration>::between(2_us, 5_us))) std::puts(f.message.c_str());
///
/// The circuit, with the threshold input drawing a bias current I_b from the node:
/// - held (switch on, a source V_sat behind R_on): the node sits at
///   V_hold = V_sat + R_on (V_cc - V_sat - I_b R) / (R + R_on)  (V_sat when R_on = 0);
/// - pulse (switch off): v -> V_cc - I_b R with tau = R C, from V_hold to V_th;
///   pulse width = R C ln((V_cc - I_b R - V_hold) / (V_cc - I_b R - V_th)) + t_pd;
/// - recovery (switch on again): v -> V_hold with tau = C (R || R_on), from V_th.
///   Recovery time is defined as the time until the node is within
///   `recovery_fraction` (1 %) of that step from V_hold: C (R || R_on) ln(1 / fraction).
///   A pulse triggered earlier starts above V_hold and is shorter.
/// - maximum retrigger rate = 1 / (pulse width + recovery time).
///
/// Largest timing resistor (derivation): the node charges towards V_cc - I_b R,
/// so the threshold is reached only while I_b R < V_cc - V_th, i.e.
/// R < R_max = (V_cc - V_th) / I_b. At 15 V with V_th = 10 V a bias current of
/// 250 nA gives 20 MΩ, the order common practice quotes for bipolar parts.
/// Near R_max the width grows without bound; to first order the bias current
/// lengthens the charge by I_b R (V_th - V_hold) / (A B ln(A / B)), A = V_cc - V_hold,
/// B = V_cc - V_th: 0.607 I_b R / (V_cc - V_th) for thresholds 0 -> 2/3, so keeping
/// it below 1 % needs I_b R below about 1.6 % of the headroom V_cc - V_th.
/// `check_design` reports R >= R_max at worst case as a violation and an exact
/// lengthening above `bias_shift_limit` as a warning.

#include "tauforge/concepts.hpp"
#include "tauforge/findings.hpp"
#include "tauforge/detail/analysis_common.hpp"
#include "tauforge/detail/monotone_solve.hpp"
#include "tauforge/detail/validate.hpp"
#include "tauforge/notation.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace tauforge {

namespace detail {

/// A value in a finding's message, four significant digits.
inline std::string finding_text(double v, std::string_view unit) { return format_si(v, unit, {.digits = 4}); }

}  // namespace detail

/// The comparator-timer one-shot; see the header comment for the circuit.
struct timer_monostable {
    resistor r{};  ///< timing resistor, supply to the timing node
    capacitor c{};  ///< timing capacitor, node to ground
    ranged<voltage> supply = ranged<voltage>::exactly(voltage::from_value(5.0));  ///< V_cc
    ranged<double> upper_threshold = ranged<double>::exactly(2.0 / 3.0);  ///< threshold level / supply, in (0, 1)
    std::optional<ranged<voltage>> control_voltage{};  ///< absolute threshold; overrides upper_threshold when set
    ranged<voltage> discharge_saturation = ranged<voltage>::exactly(voltage::from_value(0.0));  ///< V_sat of the switch
    ranged<resistance> discharge_resistance =
        ranged<resistance>::exactly(resistance::from_value(0.0));  ///< R_on; 0 = ideal
    ranged<duration> propagation_delay = ranged<duration>::exactly(duration::from_value(0.0));  ///< threshold to output
    ranged<current> threshold_bias = ranged<current>::exactly(current::from_value(0.0));  ///< drawn from the node, >= 0
    double recovery_fraction = 0.01;  ///< recovery ends within this fraction of the step from the held level
    duration min_trigger_width = duration::from_value(0.0);  ///< shortest trigger pulse the part responds to
    operating_conditions conditions{};  ///< temperature range for the parts

    /// Indices into `metrics` and `evaluate`'s result.
    enum metric_index : std::size_t { pulse_width, recovery_time, retrigger_rate };
    /// Indices into `parameters`, `ranges()` and `evaluate`'s argument.
    enum parameter_index : std::size_t { p_r, p_c, p_supply, p_ratio, p_control, p_sat, p_ron, p_delay, p_bias };

    /// The uncertain parameters, in SI units.
    static constexpr std::array<quantity_info, 9> parameters{{{"R", "\u03A9"},
                                                              {"C", "F"},
                                                              {"supply", "V"},
                                                              {"upper threshold", "V/V"},
                                                              {"control voltage", "V"},
                                                              {"discharge saturation", "V"},
                                                              {"discharge resistance", "\u03A9"},
                                                              {"propagation delay", "s"},
                                                              {"threshold bias", "A"}}};
    /// Pulse width (with the delay), recovery time, maximum retrigger rate.
    static constexpr std::array<quantity_info, 3> metrics{
        {{"pulse width", "s"}, {"recovery time", "s"}, {"retrigger rate", "Hz"}}};
    /// The parts synthesis chooses.
    static constexpr std::array<design_slot, 2> design_slots{
        {{"R", part_kind::resistor, p_r}, {"C", part_kind::capacitor, p_c}}};

    /// Corners bound every metric, except with a DC-bias curve on C: then the bias
    /// current and the curve together are not proven monotone in the supply, and
    /// analysis searches the interior.
    bool corners_are_bounds() const { return !c.dc_bias; }

    /// Each parameter's interval; the unused one of threshold ratio and control
    /// voltage is fixed at 0. Throws `domain_error` for a threshold outside
    /// (V_sat, V_cc) at some corner, `invalid_argument` for negative delays,
    /// resistances or currents and a recovery fraction outside (0, 1).
    std::array<interval, 9> ranges() const {
        constexpr std::string_view fn = "timer_monostable::ranges";
        if (!(recovery_fraction > 0.0 && recovery_fraction < 1.0))
            detail::fail_invalid(fn, "recovery_fraction", recovery_fraction, "a fraction strictly between 0 and 1");
        std::array<interval, 9> x{r.range(conditions),
                                  c.range(conditions),
                                  supply.as_interval(),
                                  control_voltage ? interval::exactly(0.0) : upper_threshold.as_interval(),
                                  control_voltage ? control_voltage->as_interval() : interval::exactly(0.0),
                                  discharge_saturation.as_interval(),
                                  discharge_resistance.as_interval(),
                                  propagation_delay.as_interval(),
                                  threshold_bias.as_interval()};
        if (!(x[p_supply].low > 0.0)) detail::fail_invalid(fn, "supply.low", supply.low, "a positive supply voltage");
        if (!(x[p_ron].low >= 0.0))
            detail::fail_invalid(fn, "discharge_resistance.low", discharge_resistance.low, "a non-negative resistance");
        if (!(x[p_delay].low >= 0.0))
            detail::fail_invalid(fn, "propagation_delay.low", propagation_delay.low, "a non-negative time");
        if (!(x[p_bias].low >= 0.0))
            detail::fail_invalid(fn, "threshold_bias.low", threshold_bias.low,
                                 "a non-negative current drawn from the timing node");
        c.check_rating(fn, "supply.high", supply.high);
        c.check_bias_covers(fn, control_voltage ? "control_voltage.high" : "upper_threshold.high x supply.high",
                            voltage::from_value(control_voltage ? x[p_control].high
                                                                : x[p_ratio].high * x[p_supply].high));
        const double vsat = x[p_sat].high;
        if (control_voltage) {
            if (!(x[p_control].high < x[p_supply].low))
                detail::parts_fail_domain(fn, "control_voltage.high", detail::value_text(control_voltage->high),
                                          "a threshold below supply.low = " + detail::value_text(supply.low));
            if (!(x[p_control].low > vsat))
                detail::parts_fail_domain(
                    fn, "control_voltage.low", detail::value_text(control_voltage->low),
                    "a threshold above discharge_saturation.high = " + detail::value_text(discharge_saturation.high));
        } else {
            if (!(x[p_ratio].low > 0.0 && x[p_ratio].high < 1.0))
                detail::parts_fail_domain(fn, x[p_ratio].low > 0.0 ? "upper_threshold.high" : "upper_threshold.low",
                                          detail::quoted_value(x[p_ratio].low > 0.0 ? x[p_ratio].high : x[p_ratio].low),
                                          "a ratio of the supply strictly between 0 and 1");
            if (!(x[p_ratio].low * x[p_supply].low > vsat))
                detail::parts_fail_domain(
                    fn, "discharge_saturation.high", detail::value_text(discharge_saturation.high),
                    "a level below the lowest threshold, upper_threshold.low x supply.low = " +
                        detail::value_text(voltage::from_value(x[p_ratio].low * x[p_supply].low)));
        }
        return x;
    }

    /// Pulse width, recovery time and maximum retrigger rate at one set of values.
    std::array<double, 3> evaluate(const std::array<double, 9>& x) const {
        const double rr = x[p_r], cc = x[p_c], vcc = x[p_supply], vsat = x[p_sat], ron = x[p_ron], ib = x[p_bias];
        const double vth = control_voltage ? x[p_control] : x[p_ratio] * vcc;
        const double v_final = vcc - ib * rr;
        if (!(v_final > vth)) bias_too_large(ib, vcc, vth, rr);
        const double v_hold = held_level(rr, vcc, vsat, ron, ib);
        const double width = rr * cc * c.crossing_per_tau(v_hold, v_final, vth) + x[p_delay];
        const double tau_discharge = cc * (rr * ron / (rr + ron));
        const double recovery =
            !(ron > 0.0) ? 0.0
            : c.dc_bias  ? tau_discharge * c.crossing_per_tau(vth, v_hold, v_hold + recovery_fraction * (vth - v_hold))
                         : settling_time(recovery_fraction, duration::from_value(tau_discharge)).value();
        return {width, recovery, 1.0 / (width + recovery)};
    }

    /// The error of evaluate, out of its line so that evaluate stays small enough to inline.
    [[noreturn]] static void bias_too_large(double ib, double vcc, double vth, double rr) {
        throw domain_error("timer_monostable::evaluate: threshold_bias = " +
                           detail::value_text(current::from_value(ib)) +
                           " is invalid; expected below (supply - threshold) / R = (" +
                           detail::value_text(voltage::from_value(vcc)) + " - " +
                           detail::value_text(voltage::from_value(vth)) + ") / " +
                           detail::value_text(resistance::from_value(rr)) + " = " +
                           detail::value_text(current::from_value((vcc - vth) / rr)) +
                           ", or the capacitor never reaches the threshold");
    }

    /// The level the switch holds the node at: V_sat + R_on (V_cc - V_sat - I_b R) / (R + R_on).
    static double held_level(double rr, double vcc, double vsat, double ron, double ib) {
        return ron > 0.0 ? vsat + ron * (vcc - vsat - ib * rr) / (rr + ron) : vsat;
    }

    /// A copy with R and C bought at the given values and tolerances.
    timer_monostable with_parts(const std::array<part_choice, 2>& p) const {
        timer_monostable m = *this;
        m.r = r.with_choice(p[0]);
        m.c = c.with_choice(p[1]);
        return m;
    }

    /// The R (slot 0) or C (slot 1) that puts `metric` at `target` with the other
    /// part at `values` and everything else nominal (marked values); 0 when the
    /// target is shorter than any value gives, +inf when longer, NaN for the
    /// recovery time of an ideal switch (always 0).
    double solve_slot(std::size_t slot, std::size_t metric, double target, const std::array<double, 2>& values) const {
        constexpr double nan = std::numeric_limits<double>::quiet_NaN();
        if (slot > 1 || metric > retrigger_rate || !(target > 0.0)) return nan;
        auto x = nominal_values();
        if (metric == recovery_time && !(x[p_ron] > 0.0)) return nan;
        x[p_r] = values[0];
        x[p_c] = values[1];
        if (slot == 1) {  // every metric is t_pd + C k (the rate its inverse): k from C = 1 F
            x[p_c] = 1.0;
            const auto k = evaluate(x);
            const double t_pd = x[p_delay];
            switch (metric) {
                case pulse_width: return std::max(0.0, (target - t_pd) / (k[0] - t_pd));
                case recovery_time: return target / k[1];
                default: return std::max(0.0, (1.0 / target - t_pd) / (k[0] - t_pd + k[1]));
            }
        }
        // R: every metric rises with R (the rate falls) over the R that keep the held
        // level below the threshold (R > r_lo) and the final level above it (R < r_hi);
        // towards r_lo the charge takes no time, towards r_hi for ever.
        const double vcc = x[p_supply], vsat = x[p_sat], ron = x[p_ron], ib = x[p_bias], cc = x[p_c];
        const double vth = control_voltage ? x[p_control] : x[p_ratio] * vcc;
        const double r_lo = ron > 0.0 ? ron * (vcc - vth) / (vth - vsat + ron * ib) : 0.0;
        const double r_hi = ib > 0.0 ? (vcc - vth) / ib : std::numeric_limits<double>::infinity();
        if (metric == recovery_time) {  // C (R || R_on) ln(1 / fraction) = target
            const double rp = target / settling_time(recovery_fraction, duration::from_value(cc)).value();
            return rp < ron ? rp * ron / (ron - rp) : std::numeric_limits<double>::infinity();
        }
        auto time = [&](double rr) {
            if (rr >= r_hi) return std::numeric_limits<double>::infinity();
            x[p_r] = rr;
            if (rr > r_lo) {
                const auto v = evaluate(x);
                return metric == pulse_width ? v[pulse_width] : v[pulse_width] + v[recovery_time];
            }
            const double rec =
                metric == pulse_width || !(ron > 0.0)
                    ? 0.0
                    : settling_time(recovery_fraction, duration::from_value(cc * rr * ron / (rr + ron))).value();
            return x[p_delay] + rec;
        };
        const double goal = metric == retrigger_rate ? 1.0 / target : target;
        const double guess = std::max(r_lo * 2.0, goal / (cc * detail::rc::crossing_time(0.0, 1.0, 2.0 / 3.0, 1.0)));
        return detail::solve_monotone_positive(time, goal, guess, true);
    }

    /// The largest R for which the threshold is reached at every corner of the
    /// supply, threshold and bias current: min(V_cc - V_th) / max(I_b); infinite
    /// without a bias current. See the header comment for the derivation.
    resistance max_timing_resistance() const {
        const auto x = ranges();
        const double headroom =
            control_voltage ? x[p_supply].low - x[p_control].high : x[p_supply].low * (1.0 - x[p_ratio].high);
        return resistance::from_value(x[p_bias].high > 0.0 ? headroom / x[p_bias].high
                                                           : std::numeric_limits<double>::infinity());
    }

private:
    std::array<double, 9> nominal_values() const {
        return {r.nominal.value(),
                c.nominal.value(),
                supply.nominal.value(),
                control_voltage ? 0.0 : upper_threshold.nominal,
                control_voltage ? control_voltage->nominal.value() : 0.0,
                discharge_saturation.nominal.value(),
                discharge_resistance.nominal.value(),
                propagation_delay.nominal.value(),
                threshold_bias.nominal.value()};
    }
};

static_assert(SolvableNetwork<timer_monostable>, "timer_monostable must satisfy SolvableNetwork");

/// Limits of `check_design`.
struct monostable_check_options {
    double bias_shift_limit = 0.01;  ///< largest lengthening of the charge by the bias current (warning)
    resistance min_resistance = resistance::from_value(1e3);  ///< below it a warning (common practice: about 1 kΩ)
};

/// Checks a one-shot and the trigger pulse that drives it at worst case:
/// - violation "bias_limit": R reaches (V_cc - V_th) / I_b, the threshold is never reached;
/// - warning "bias_shift": the bias current lengthens the charge by more than `bias_shift_limit`;
/// - warning "small_resistor": R below `min_resistance`;
/// - violation "trigger_too_long": the trigger can last as long as the shortest output pulse;
/// - violation "trigger_too_short": the trigger can be as short as `min_trigger_width`.
inline std::vector<finding> check_design(const timer_monostable& m, const ranged<duration>& trigger_pulse,
                                         const monostable_check_options& opt = {}) {
    constexpr std::string_view fn = "check_design";
    using detail::finding_text;
    using tm = timer_monostable;
    const interval trig = trigger_pulse.as_interval();
    if (!(trig.low >= 0.0)) detail::fail_invalid(fn, "trigger_pulse.low", trigger_pulse.low, "a non-negative time");
    detail::require_non_negative(fn, "min_trigger_width", m.min_trigger_width, "a non-negative, finite time");
    if (!(opt.bias_shift_limit > 0.0 && std::isfinite(opt.bias_shift_limit)))
        detail::fail_invalid(fn, "bias_shift_limit", opt.bias_shift_limit, "a positive fraction");
    const auto x = m.ranges();
    std::vector<finding> out;
    const double r_hi = x[tm::p_r].high, ib_hi = x[tm::p_bias].high;
    const resistance r_max = m.max_timing_resistance();
    if (r_hi >= r_max.value()) {
        out.push_back({severity::violation, "bias_limit",
                       "R up to " + finding_text(r_hi, "\u03A9") + " with a threshold bias current up to " +
                           finding_text(ib_hi, "A") + " drops " + finding_text(r_hi * ib_hi, "V") +
                           ", as much as the headroom from the threshold to the supply; the capacitor never "
                           "reaches the threshold. Expected R below (supply - threshold) / bias = " +
                           finding_text(r_max.value(), "\u03A9")});
        return out;  // the width is unbounded: the remaining checks have nothing to compare
    }
    if (ib_hi > 0.0) {
        double shift = 0.0;
        const auto fs = detail::free_parameters(x);
        auto y = detail::nominal_point(x);
        detail::for_each_corner(x, fs, y, [&](std::uint32_t) {
            auto z = y;
            z[tm::p_bias] = 0.0;
            const double with = m.evaluate(y)[0] - y[tm::p_delay], without = m.evaluate(z)[0] - z[tm::p_delay];
            shift = std::max(shift, with / without - 1.0);
        });
        if (shift > opt.bias_shift_limit)
            out.push_back({severity::warning, "bias_shift",
                           "the threshold bias current (up to " + finding_text(ib_hi, "A") + ") through R (up to " +
                               finding_text(r_hi, "\u03A9") + ") lengthens the charge by up to " +
                               format_percent(shift) + ", more than the " + format_percent(opt.bias_shift_limit) +
                               " allowed; the threshold is lost at R = " + finding_text(r_max.value(), "\u03A9")});
    }
    if (x[tm::p_r].low < opt.min_resistance.value())
        out.push_back({severity::warning, "small_resistor",
                       "R down to " + finding_text(x[tm::p_r].low, "\u03A9") +
                           " is below the usual smallest timing resistor of about " +
                           finding_text(opt.min_resistance.value(), "\u03A9") +
                           "; the discharge switch carries up to " +
                           format(current::from_value(x[tm::p_supply].high / x[tm::p_r].low), {.digits = 4}) +
                           " from the supply"});
    const interval w = detail::corner_bounds(m)[tm::pulse_width];
    if (trig.high >= w.low)
        out.push_back({severity::violation, "trigger_too_long",
                       "the trigger pulse lasts up to " + finding_text(trig.high, "s") +
                           ", not shorter than the shortest output pulse, " + finding_text(w.low, "s") +
                           "; expected a trigger pulse that ends before the output pulse"});
    if (trig.low <= m.min_trigger_width.value())
        out.push_back({severity::violation, "trigger_too_short",
                       "the trigger pulse can be as short as " + finding_text(trig.low, "s") +
                           ", not longer than the minimum trigger width of " +
                           finding_text(m.min_trigger_width.value(), "s")});
    return out;
}

}  // namespace tauforge
