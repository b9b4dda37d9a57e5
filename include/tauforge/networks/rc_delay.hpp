#pragma once
/// An RC delay: a power-on reset, an enable delay. The supply rises from 0 V to
/// its final value as a step or a linear ramp and charges C through a pull-up R
/// (a resistor, or a pin's internal pull-up given as a range) until the node
/// crosses a logic threshold (a ratio of the supply, or an absolute voltage).
/// Leakage drawn from the node (a pin's input current, the capacitor's rated
/// leakage) and the capacitor's insulation resistance lower the voltage the node
/// approaches; they are folded into one source and one time constant with
/// rc.hpp's Thevenin helpers. Metric: the delay from the start of the supply's
/// rise to the crossing. Synthesis chooses R and C.
///
///     tauforge::rc_delay d{.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
///                          .c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};
///     d.rise_time = ranged<duration>::between(1_ms, 5_ms);
///     d.leakage = ranged<current>::between(0_A, 1_uA);
///     auto w = tauforge::worst_case(d);
///
/// The node equation, with u(t) the supply (0 -> V over the rise time), I the
/// leakage and G = 1 / R_insulation:  C v' = (u - v)/R - I - G v. It is the
/// ramp response of rc.hpp with the Thevenin source u/(1 + G R) - I R/(1 + G R)
/// and tau = C R/(1 + G R). A leakage is a constant current (conservative: a
/// real pin's current falls as the node nears 0 V, so the capacitor does not
/// really dip below 0 V as this model lets it at the start of a slow ramp).
/// Every parameter moves the delay one way (longer with R, C, threshold, rise
/// time, leakage, insulation conductance; shorter with the supply at an absolute
/// threshold), so corner bounds are exact. When leakage keeps the node below the
/// threshold at some corner, evaluation throws a domain_error that says so.

#include "tauforge/concepts.hpp"
#include "tauforge/detail/monotone_solve.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <optional>
#include <string>

namespace tauforge {

/// A supply step or ramp charging a capacitor through a pull-up to a threshold.
struct rc_delay {
    resistor r{};   ///< pull-up resistor (ignored for its range when internal_pullup is set)
    capacitor c{};  ///< timing capacitor; its `insulation` and `leakage`, when set, load the node
    ranged<voltage> supply = ranged<voltage>::exactly(voltage::from_value(5.0));  ///< final supply voltage
    ranged<double> threshold = ranged<double>::exactly(2.0 / 3.0);  ///< crossing level / supply, in (0, 1)
    operating_conditions conditions{};  ///< temperature range for the parts
    /// Absolute crossing level, in (0 V, lowest supply); when set it replaces `threshold`.
    std::optional<ranged<voltage>> threshold_voltage{};
    /// Time the supply takes to rise linearly from 0 V to its final value; 0 = a step.
    ranged<duration> rise_time = ranged<duration>::exactly(duration::from_value(0.0));
    /// A pin's internal pull-up as a range; when set it replaces r's range (R is then not designable).
    std::optional<ranged<resistance>> internal_pullup{};
    /// Current drawn from the node (a pin's input leakage); negative = sourced into it.
    ranged<current> leakage = ranged<current>::exactly(current::from_value(0.0));

    /// Parameter indices.
    enum parameter_index : std::size_t { p_r, p_c, p_supply, p_ratio, p_vth, p_rise, p_leak, p_shunt };

    /// R, C, supply, threshold ratio, threshold voltage, rise time, leakage
    /// (pin + capacitor), insulation conductance. Of the two thresholds the one not
    /// in use is fixed at the equivalent nominal value and does not enter the delay.
    static constexpr std::array<quantity_info, 8> parameters{{{"R", "\u03A9"},
                                                              {"C", "F"},
                                                              {"supply", "V"},
                                                              {"threshold", "V/V"},
                                                              {"threshold voltage", "V"},
                                                              {"rise time", "s"},
                                                              {"leakage", "A"},
                                                              {"insulation conductance", "S"}}};
    /// The delay from the start of the supply's rise to the threshold crossing.
    static constexpr std::array<quantity_info, 1> metrics{{{"delay", "s"}}};
    /// Synthesis chooses R and C.
    static constexpr std::array<design_slot, 2> design_slots{{
        {"R", part_kind::resistor, 0}, {"C", part_kind::capacitor, 1}}};

    /// Corners bound the delay: it rises with R, C, the threshold and the leakage and
    /// falls with the supply. With a DC-bias curve that holds for a plain step (the
    /// integral of k(v)/(vs - v) falls as vs rises, with k non-increasing); with a
    /// ramp, leakage or insulation too it is not proven, so analysis searches the interior.
    bool corners_are_bounds() const {
        const bool loaded = leakage.high.value() != 0.0 || leakage.low.value() != 0.0 || c.leakage ||
                            c.leakage_limit || c.insulation || rise_time.high.value() > 0.0;
        return !(c.dc_bias && loaded);
    }

    /// Each parameter's interval at the operating conditions. The capacitor's rated
    /// leakage adds [0, c.leakage] to the pin's leakage; its insulation resistance
    /// gives a conductance in [0, 1 / c.insulation] (nominal 0: a rated limit, not a
    /// typical value). Throws for a threshold outside the supply.
    std::array<interval, 8> ranges() const {
        constexpr std::string_view fn = "rc_delay::ranges";
        const interval rr = internal_pullup ? internal_pullup->as_interval() : r.range(conditions);
        if (internal_pullup && !(rr.low > 0.0))
            detail::parts_fail(fn, "internal_pullup.low", detail::value_text(internal_pullup->low),
                               "a positive resistance");
        const interval cc = c.range(conditions);
        const interval vs = supply.as_interval();
        if (!(vs.low > 0.0))
            detail::parts_fail(fn, "supply.low", detail::value_text(supply.low), "a positive supply voltage");
        const interval k = threshold.as_interval();
        interval vth{};
        if (threshold_voltage) {
            vth = threshold_voltage->as_interval();
            if (!(vth.low > 0.0))
                detail::parts_fail(fn, "threshold_voltage.low", detail::value_text(threshold_voltage->low),
                                   "a threshold above 0 V");
            if (!(vth.high < vs.low))
                detail::parts_fail_domain(fn, "threshold_voltage.high", detail::value_text(threshold_voltage->high),
                                          "a threshold below the lowest supply, supply.low = " +
                                              detail::value_text(supply.low));
        } else {
            if (!(k.low > 0.0 && k.high < 1.0))
                detail::parts_fail(fn, k.low > 0.0 ? "threshold.high" : "threshold.low",
                                   detail::quoted_value(k.low > 0.0 ? k.high : k.low),
                                   "a ratio of the supply strictly between 0 and 1");
        }
        const interval rise = rise_time.as_interval();
        if (!(rise.low >= 0.0))
            detail::parts_fail(fn, "rise_time.low", detail::value_text(rise_time.low), "a non-negative time");
        c.check_rating(fn, "supply.high", supply.high);
        c.check_bias_covers(fn, threshold_voltage ? "threshold_voltage.high" : "threshold.high x supply.high",
                            voltage::from_value(threshold_voltage ? vth.high : k.high * vs.high));
        interval leak = leakage.as_interval();
        const double c_leak = c.leakage_at(supply.high).value_or(current::from_value(0.0)).value();
        leak.high += c_leak;
        const double g = c.insulation ? 1.0 / c.insulation->value() : 0.0;
        const interval fixed_vth = interval::exactly(k.nominal * vs.nominal);
        const interval fixed_ratio = interval::exactly(vth.nominal / vs.nominal);
        return {rr,   cc,   vs, threshold_voltage ? fixed_ratio : k, threshold_voltage ? vth : fixed_vth,
                rise, leak, {0.0, 0.0, g}};
    }

    /// The delay at one point; throws domain_error when the node never reaches the threshold.
    std::array<double, 1> evaluate(const std::array<double, 8>& x) const {
        const double vs = x[p_supply], vth = threshold_voltage ? x[p_vth] : x[p_ratio] * x[p_supply];
        if (x[p_rise] == 0.0 && x[p_leak] == 0.0 && x[p_shunt] == 0.0)
            return {x[p_r] * x[p_c] * c.crossing_per_tau(0.0, vs, vth)};
        const auto d = drive(x[p_r], x[p_c], vs, x[p_leak], x[p_shunt]);
        if (!(vth < d.v_end)) unreachable(x, vth, d.v_end);
        return {time_to(d, x[p_rise], vth)};
    }

    /// A copy with R and C bought at the given values and tolerances.
    rc_delay with_parts(const std::array<part_choice, 2>& p) const {
        rc_delay d = *this;
        d.r = r.with_choice(p[0]);
        d.c = c.with_choice(p[1]);
        return d;
    }

    /// The R (slot 0) or C (slot 1) that gives `target` delay with the other at
    /// `values` and every other parameter at its nominal; NaN for R when an internal
    /// pull-up is set. A step without leakage is R C times a constant; otherwise the
    /// delay rises monotonically with either part and is solved numerically
    /// (0 when the target is shorter than any value gives, +inf when longer).
    double solve_slot(std::size_t slot, std::size_t metric, double target, const std::array<double, 2>& values) const {
        constexpr double nan = std::numeric_limits<double>::quiet_NaN();
        if (metric != 0 || slot > 1 || !(target > 0.0) || (slot == 0 && internal_pullup)) return nan;
        const double vs = supply.nominal.value();
        const double vth = threshold_voltage ? threshold_voltage->nominal.value() : threshold.nominal * vs;
        const double rise = rise_time.nominal.value(), leak = leakage.nominal.value();
        const double other = slot == 1 && internal_pullup ? internal_pullup->nominal.value() : values[1 - slot];
        // Delay per unit time constant at nominal supply and threshold.
        const double per_tau = c.crossing_per_tau(0.0, vs, vth);
        if (rise == 0.0 && leak == 0.0) return target / per_tau / other;
        auto delay = [&](double v) {
            const double rv = slot == 0 ? v : other, cv = slot == 0 ? other : v;
            const auto d = drive(rv, cv, vs, leak, 0.0);
            if (!(vth < d.v_end)) return std::numeric_limits<double>::infinity();
            return time_to(d, rise, vth);
        };
        const double guess = target / per_tau / other;
        return detail::solve_monotone_positive(delay, target, guess, true);
    }

private:
    struct node_drive {
        double v_begin, v_end, tau;
    };

    /// The Thevenin source seen by the capacitor at the start (supply at 0 V) and
    /// after the rise (supply at vs): leakage through R first, then the insulation shunt.
    static node_drive drive(double r, double c, double vs, double i_leak, double g) {
        const auto rr = resistance::from_value(r);
        const auto cc = capacitance::from_value(c);
        const auto il = current::from_value(i_leak);
        auto reduce = [&](double u) {
            const rc_drive a = with_leakage_current(voltage::from_value(u), rr, cc, il);
            if (g == 0.0) return a;
            return with_shunt(a.v_final, rr, cc, resistance::from_value(1.0 / g));
        };
        const rc_drive begin = reduce(0.0), end = reduce(vs);
        return {begin.v_final.value(), end.v_final.value(), end.tau.value()};
    }

    /// The crossing of vth from 0 V under drive d (with C's DC-bias curve, if any).
    double time_to(const node_drive& d, double rise, double vth) const {
        return c.ramp_crossing_time(d.v_begin, d.v_end, rise, 0.0, vth, d.tau);
    }

    [[noreturn]] void unreachable(const std::array<double, 8>& x, double vth, double v_end) const {
        detail::parts_fail_domain(
            "rc_delay::evaluate", "threshold", detail::value_text(voltage::from_value(vth)),
            "a threshold below the node's final voltage " + detail::value_text(voltage::from_value(v_end)) +
                " (supply " + detail::value_text(voltage::from_value(x[p_supply])) + ", R = " +
                detail::value_text(resistance::from_value(x[p_r])) + ", leakage " +
                detail::value_text(current::from_value(x[p_leak])) + ", insulation conductance " +
                detail::value_text(conductance::from_value(x[p_shunt])) +
                "): the leakage keeps the node from reaching the threshold");
    }
};

static_assert(SolvableNetwork<rc_delay>, "rc_delay must satisfy SolvableNetwork");

}  // namespace tauforge
