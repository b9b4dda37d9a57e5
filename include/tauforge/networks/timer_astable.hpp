#pragma once
/// The comparator-timer oscillator with two resistors and a capacitor: C
/// charges through Ra + Rb from the lower to the upper threshold (output high)
/// and discharges through Rb into the discharge switch back to the lower one
/// (output low). Thresholds are fractions of the supply (1/3 and 2/3 for the
/// classic part). Duty cycle here is the HIGH fraction t_high / period.
/// Synthesis chooses Ra, Rb and C.
///
///     timer_astable osc{.ra = {.nominal = 1.78_kohm}, .rb = {.nominal = 4.12_kohm}, .c = {.nominal = 10_nF}};
///     auto wc = tauforge::worst_case(osc);   // analysis/worst_case.hpp; nominal 40.9 µs high, 28.6 µs low
///
/// The circuit:
/// - high (switch open): v -> V_cc with tau = (Ra + Rb) C, from V_L to V_H;
/// - low (switch closed, a source V_sat): v -> V_sat with tau = Rb C, from V_H to V_L,
///   so t_low = Rb C ln((V_H - V_sat) / (V_L - V_sat)).
/// - `steering_diode`: a diode across Rb (anode at the discharge node) carries the
///   charge, so C charges through Ra towards V_cc - V_d while the diode conducts,
///   i.e. while the current through Ra exceeds V_d / Rb: below the knee
///   V_knee = V_cc - V_d (1 + Ra / Rb). Above the knee the diode is off and C charges
///   through Ra + Rb towards V_cc (constant-drop diode model). The discharge is as
///   above (the diode is reverse biased), so the duty falls below 50 % with Ra < Rb.
///
/// Every metric is monotone in every parameter, with one exception: with both
/// V_sat and V_d non-zero, high and low time both shrink as the supply rises and
/// the duty can turn inside the supply range (worst_case searches there;
/// metric_bounds and synthesis take corners).

#include "tauforge/concepts.hpp"
#include "tauforge/detail/monotone_solve.hpp"
#include "tauforge/detail/validate.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <string>
#include <string_view>

namespace tauforge {

/// The two resistors of an oscillator design.
struct astable_resistors {
    resistance ra;  ///< supply to discharge node
    resistance rb;  ///< discharge node to capacitor
};

/// The comparator-timer oscillator; see the header comment for the circuit.
struct timer_astable {
    resistor ra{};   ///< from the supply to the discharge node
    resistor rb{};   ///< from the discharge node to the capacitor
    capacitor c{};   ///< timing capacitor
    ranged<voltage> supply = ranged<voltage>::exactly(voltage::from_value(5.0));  ///< V_cc
    ranged<double> lower_threshold = ranged<double>::exactly(1.0 / 3.0);  ///< trigger level / supply
    ranged<double> upper_threshold = ranged<double>::exactly(2.0 / 3.0);  ///< threshold level / supply
    operating_conditions conditions{};  ///< temperature range for the parts
    ranged<voltage> discharge_saturation = ranged<voltage>::exactly(voltage::from_value(0.0));  ///< V_sat, >= 0
    bool steering_diode = false;  ///< a diode across Rb: charge through Ra only, duty below 50 %
    /// The diode's forward drop V_d when `steering_diode` is set (a silicon
    /// small-signal diode is about 0.6-0.7 V, common practice); unused otherwise.
    ranged<voltage> diode_drop = ranged<voltage>::exactly(voltage::from_value(0.7));

    /// Indices into `metrics` and `evaluate`'s result.
    enum metric_index : std::size_t { high_time, low_time, period, frequency, duty };

    /// Ra, Rb, C, supply, threshold ratios, V_sat, V_d (appended after the original six).
    static constexpr std::array<quantity_info, 8> parameters{{{"Ra", "\u03A9"},
                                                              {"Rb", "\u03A9"},
                                                              {"C", "F"},
                                                              {"supply", "V"},
                                                              {"lower threshold", "V/V"},
                                                              {"upper threshold", "V/V"},
                                                              {"discharge saturation", "V"},
                                                              {"diode drop", "V"}}};
    /// Output high and low time, period, frequency, duty (the high fraction).
    static constexpr std::array<quantity_info, 5> metrics{
        {{"high time", "s"}, {"low time", "s"}, {"period", "s"}, {"frequency", "Hz"}, {"duty", ""}}};
    /// The parts synthesis chooses.
    static constexpr std::array<design_slot, 3> design_slots{
        {{"Ra", part_kind::resistor, 0}, {"Rb", part_kind::resistor, 1}, {"C", part_kind::capacitor, 2}}};

    /// Each parameter's interval (the diode drop fixed at 0 without the diode).
    /// Throws `domain_error` unless 0 < lower < upper < 1 and V_sat stays below the
    /// lower threshold at every corner; `invalid_argument` for a negative V_sat or V_d.
    /// With a saturated discharge switch and the steering diode the duty can
    /// turn inside the supply range; then corners are not bounds.
    bool corners_are_bounds() const {
        return !c.dc_bias && !(steering_diode && discharge_saturation.high.value() > 0.0);
    }

    std::array<interval, 8> ranges() const {
        constexpr std::string_view fn = "timer_astable::ranges";
        std::array<interval, 8> x{ra.range(conditions),          rb.range(conditions),
                                  c.range(conditions),           supply.as_interval(),
                                  lower_threshold.as_interval(), upper_threshold.as_interval(),
                                  discharge_saturation.as_interval(),
                                  steering_diode ? diode_drop.as_interval() : interval::exactly(0.0)};
        check_levels(fn, x);
        // C swings between the thresholds; a fault can put the supply across it.
        c.check_rating(fn, "supply.high", supply.high);
        c.check_bias_covers(fn, "upper_threshold.high x supply.high",
                            voltage::from_value(x[5].high * x[3].high));
        return x;
    }

    /// High and low times per unit time constant (C at 0 V bias): charge from lower
    /// to upper threshold towards the supply, discharge from upper to lower towards V_sat.
    std::array<double, 2> per_tau(double vs, double lo, double hi, double vsat = 0.0) const {
        return {c.crossing_per_tau(lo * vs, vs, hi * vs), c.crossing_per_tau(hi * vs, vsat, lo * vs)};
    }

    /// The charge from v_lo to v_hi with the steering diode (see the header comment).
    double diode_charge_time(double ra_v, double rb_v, double c_v, double vs, double vd, double v_lo,
                             double v_hi) const {
        const double knee = vs - vd * (1.0 + ra_v / rb_v);
        if (v_hi <= knee) return ra_v * c_v * c.crossing_per_tau(v_lo, vs - vd, v_hi);
        if (v_lo >= knee) return (ra_v + rb_v) * c_v * c.crossing_per_tau(v_lo, vs, v_hi);
        return ra_v * c_v * c.crossing_per_tau(v_lo, vs - vd, knee) +
               (ra_v + rb_v) * c_v * c.crossing_per_tau(knee, vs, v_hi);
    }

    /// All five metrics at one set of parameter values (SI units).
    std::array<double, 5> evaluate(const std::array<double, 8>& x) const {
        const auto k = per_tau(x[3], x[4], x[5], x[6]);
        const double th = steering_diode ? diode_charge_time(x[0], x[1], x[2], x[3], x[7], x[4] * x[3], x[5] * x[3])
                                         : k[0] * (x[0] + x[1]) * x[2];
        const double tl = k[1] * x[1] * x[2];
        const double t = th + tl;
        return {th, tl, t, 1.0 / t, th / t};
    }

    /// A copy with Ra, Rb and C bought at the given values and tolerances.
    timer_astable with_parts(const std::array<part_choice, 3>& p) const {
        timer_astable a = *this;
        a.ra = ra.with_choice(p[0]);
        a.rb = rb.with_choice(p[1]);
        a.c = c.with_choice(p[2]);
        return a;
    }

    /// The Ra, Rb or C that puts a time metric (or the frequency) at `target`,
    /// the others at `values`; NaN for the duty, which does not scale with one
    /// part, and for a metric the slot does not change; 0 when the target is
    /// shorter than any value gives, +inf when longer.
    double solve_slot(std::size_t slot, std::size_t metric, double target, const std::array<double, 3>& v) const {
        constexpr double nan = std::numeric_limits<double>::quiet_NaN();
        if (!(target > 0.0) || slot > 2 || metric > frequency) return nan;
        const double vs = supply.nominal.value(), vsat = discharge_saturation.nominal.value();
        const auto k = per_tau(vs, lower_threshold.nominal, upper_threshold.nominal, vsat);
        const double t = metric == frequency ? 1.0 / target : target;
        const std::size_t m = metric == frequency ? std::size_t{period} : metric;
        if (steering_diode) return solve_with_diode(slot, m, t, v, k[1]);
        // Each time metric is C (a Ra + b Rb).
        double a = 0.0, b = 0.0;
        switch (m) {
            case high_time: a = k[0]; b = k[0]; break;
            case low_time: a = 0.0; b = k[1]; break;
            default: a = k[0]; b = k[0] + k[1]; break;
        }
        const double ra_v = v[0], rb_v = v[1], c_v = v[2];
        switch (slot) {
            case 0: return a > 0.0 ? (t / c_v - b * rb_v) / a : nan;
            case 1: return (t / c_v - a * ra_v) / b;
            default: return t / (a * ra_v + b * rb_v);
        }
    }

    /// Ra and Rb for a frequency and a duty (the high fraction) with capacitor `cap`,
    /// at the nominal supply, thresholds, V_sat and V_d. Throws `domain_error` for a
    /// duty the topology cannot reach: at or below t_H / (t_H + t_L) per unit R
    /// (50 % for thresholds 1/3, 2/3) without the steering diode, below the
    /// diode's Ra -> 0 limit with it.
    astable_resistors resistors_for(tauforge::frequency f, double duty_cycle, capacitance cap) const {
        constexpr std::string_view fn = "timer_astable::resistors_for";
        detail::require_positive(fn, "f", f, "a positive, finite frequency");
        detail::require_positive(fn, "cap", cap, "a positive, finite capacitance");
        if (!(duty_cycle > 0.0 && duty_cycle < 1.0))
            detail::fail_invalid(fn, "duty", duty_cycle, "a high fraction strictly between 0 and 1");
        check_levels(fn, {interval{}, interval{}, interval{}, supply.as_interval(), lower_threshold.as_interval(),
                          upper_threshold.as_interval(), discharge_saturation.as_interval(),
                          steering_diode ? diode_drop.as_interval() : interval::exactly(0.0)});
        const double vs = supply.nominal.value(), vsat = discharge_saturation.nominal.value();
        const auto k = per_tau(vs, lower_threshold.nominal, upper_threshold.nominal, vsat);
        const double t_high = duty_cycle / f.value(), t_low = (1.0 - duty_cycle) / f.value();
        const double rb_v = t_low / (k[1] * cap.value());
        if (!steering_diode) {
            const double ra_v = t_high / (k[0] * cap.value()) - rb_v;
            const double least = k[0] / (k[0] + k[1]);
            if (!(ra_v > 0.0))
                detail::parts_fail_domain(fn, "duty", format_percent(duty_cycle),
                                          "a duty above " + format_percent(least) +
                                              " without a steering diode (Ra > 0); set steering_diode for less");
            return {resistance::from_value(ra_v), resistance::from_value(rb_v)};
        }
        const double ra_v = solve_with_diode(0, high_time, t_high, {0.0, rb_v, cap.value()}, k[1]);
        if (!(ra_v > 0.0 && std::isfinite(ra_v))) {
            const double th0 = diode_charge_time(0.0, rb_v, cap.value(), vs, diode_drop.nominal.value(),
                                                 lower_threshold.nominal * vs, upper_threshold.nominal * vs);
            detail::parts_fail_domain(fn, "duty", format_percent(duty_cycle),
                                      "a duty above " + format_percent(th0 / (th0 + t_low)) +
                                          ", the Ra -> 0 limit with the diode drop " +
                                          detail::value_text(diode_drop.nominal) + " at this frequency");
        }
        return {resistance::from_value(ra_v), resistance::from_value(rb_v)};
    }

private:
    /// 0 < lower < upper < 1, V_sat below the lower threshold, V_d >= 0 at every corner.
    void check_levels(std::string_view fn, const std::array<interval, 8>& x) const {
        const auto ratio = [](double v) { return detail::quoted_value(v); };
        if (!(x[3].low > 0.0)) detail::fail_invalid(fn, "supply.low", supply.low, "a positive supply voltage");
        if (!(x[4].low > 0.0))
            detail::parts_fail_domain(fn, "lower_threshold.low", ratio(x[4].low),
                                      "a ratio above 0 (0 < lower < upper < 1)");
        if (!(x[5].high < 1.0))
            detail::parts_fail_domain(fn, "upper_threshold.high", ratio(x[5].high),
                                      "a ratio below 1 (0 < lower < upper < 1)");
        if (!(x[4].high < x[5].low))
            detail::parts_fail_domain(fn, "lower_threshold.high", ratio(x[4].high),
                                      "a ratio below upper_threshold.low = " + ratio(x[5].low) +
                                          " (0 < lower < upper < 1 at every corner)");
        if (!(x[6].low >= 0.0))
            detail::fail_invalid(fn, "discharge_saturation.low", discharge_saturation.low, "a non-negative voltage");
        if (!(x[6].high < x[4].low * x[3].low))
            detail::parts_fail_domain(fn, "discharge_saturation.high", detail::value_text(discharge_saturation.high),
                                      "a level below the lowest lower threshold, lower_threshold.low x supply.low = " +
                                          detail::value_text(voltage::from_value(x[4].low * x[3].low)));
        if (!(x[7].low >= 0.0)) detail::fail_invalid(fn, "diode_drop.low", diode_drop.low, "a non-negative voltage");
    }

    /// With the diode every time is proportional to C; high time and period grow
    /// with Ra and Rb, not in closed form: detail::solve_monotone_positive.
    double solve_with_diode(std::size_t slot, std::size_t m, double t, const std::array<double, 3>& v,
                            double k_low) const {
        constexpr double nan = std::numeric_limits<double>::quiet_NaN();
        std::array<double, 8> x{v[0], v[1], v[2], supply.nominal.value(), lower_threshold.nominal,
                                upper_threshold.nominal, discharge_saturation.nominal.value(),
                                diode_drop.nominal.value()};
        if (slot == 2) {
            x[2] = 1.0;
            return t / evaluate(x)[m];
        }
        if (m == low_time) return slot == 1 ? t / (k_low * v[2]) : nan;
        auto time = [&](double r) {
            x[slot] = r;
            return evaluate(x)[m];
        };
        return detail::solve_monotone_positive(time, t, v[slot] > 0.0 ? v[slot] : 1e4, true);
    }
};

static_assert(SolvableNetwork<timer_astable>, "timer_astable must satisfy SolvableNetwork");

}  // namespace tauforge
