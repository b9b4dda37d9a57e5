#pragma once
/// Averaging filters for a rectangular pulse train (a PWM output turned into a
/// DC level): one RC stage, or two stages R1 C1 then R2 C2 where the second
/// stage loads the first (solved exactly from the 2x2 state equations, not as two
/// independent stages). The filters drive a high-impedance input (unloaded).
///
/// The pulse train is 0 V or `high` (ranged), high for a width T1 = D T (give the
/// duty D, the high fraction, or the width), period T. Metrics:
/// - average: V D, the output's mean over a period in steady state (unloaded);
/// - ripple: the exact peak-to-peak output in the periodic steady state; one
///   stage: V (1 - e^(-T1/tau))(1 - e^(-T2/tau)) / (1 - e^(-T/tau)), T2 = T - T1
///   (V tanh(T / (4 tau)) at D = 1/2, about V D (1 - D) T / tau when small); two
///   stages: max - min of the output over the period of the steady state, each
///   extremum found in closed form (detail/two_stage.hpp);
/// - settling: after a step of the input's average (a change of duty, level or
///   period), the time until the output's envelope comes within
///   `settling_fraction` (eps) of the step and stays there. The envelope is the
///   ripple-free part of the output: the filter's response to the input's period
///   average (the deviation from the new periodic steady state decays by exactly
///   this law). One stage: tau ln(1/eps) (10 % 2.303 tau, 1 % 4.605 tau, 0.1 %
///   6.908 tau). Two stages: the step response 1 - (lf e^(ls t) - ls e^(lf t)) /
///   (lf - ls) with eigenvalues ls (slower) and lf, which is monotone and is solved
///   exactly; its tail, and so most of the time, is set by the slower eigenvalue.
///
/// Worst case: the ripple grows with V, T1 and T2 and falls with every R and C;
/// at a fixed period it is largest at D = 1/2 (symmetric in D and 1 - D), so it is
/// NOT monotone in the duty (or the width) when its range contains half the
/// period. `worst_case` finds that interior maximum; corner bounds
/// (`metric_bounds`, and so `synthesize`) do not: give such a duty range to the
/// analysis, or check designs with `worst_case`. `ripple_settling_tradeoff` below
/// accounts for it.
///
///     tauforge::pulse_filter f{.r = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.01)},
///                              .c = {.nominal = 1_uF, .tol = tolerance::symmetric(0.10)}};
///     f.input = {.high = ranged<voltage>::exactly(3.3_V), .width = ranged<double>::between(0.2, 0.4),
///                .period = ranged<duration>::exactly(50_us)};
///     auto t = tauforge::ripple_settling_tradeoff(f, 10_mV, 60_ms);  // window of tau, or why not

#include "tauforge/concepts.hpp"
#include "tauforge/detail/monotone_solve.hpp"
#include "tauforge/detail/two_stage.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <string>
#include <string_view>
#include <variant>

namespace tauforge {

/// A rectangular pulse train between 0 V and `high`.
struct pulse_train {
    ranged<voltage> high = ranged<voltage>::exactly(voltage::from_value(5.0));  ///< the high level V
    /// The duty cycle D = T1 / T (high fraction, in (0, 1)) or the high time T1 (shorter than the period).
    std::variant<ranged<double>, ranged<duration>> width = ranged<double>::exactly(0.5);
    ranged<duration> period = ranged<duration>::exactly(duration::from_value(0.0));  ///< T; must be set

    /// Whether the width is given as a duty cycle.
    bool uses_duty() const { return std::holds_alternative<ranged<double>>(width); }
};

namespace detail {

/// High level, duty, width, period intervals of a pulse train, validated; of duty and
/// width the one not given is fixed at the equivalent nominal value (and unused).
inline std::array<interval, 4> pulse_ranges(std::string_view fn, const pulse_train& p) {
    const interval v = p.high.as_interval(), t = p.period.as_interval();
    if (!(v.low > 0.0)) parts_fail(fn, "input.high.low", value_text(p.high.low), "a positive high level");
    if (!(t.low > 0.0)) parts_fail(fn, "input.period.low", value_text(p.period.low), "a positive period");
    if (p.uses_duty()) {
        const interval d = std::get<ranged<double>>(p.width).as_interval();
        if (!(d.low > 0.0 && d.high < 1.0))
            parts_fail(fn, d.low > 0.0 ? "input.width.high" : "input.width.low",
                       quoted_value(d.low > 0.0 ? d.high : d.low),
                       "a duty cycle (high fraction) strictly between 0 and 1");
        return {v, d, interval::exactly(d.nominal * t.nominal), t};
    }
    const auto& w = std::get<ranged<duration>>(p.width);
    const interval wi = w.as_interval();
    if (!(wi.low > 0.0)) parts_fail(fn, "input.width.low", value_text(w.low), "a positive high time");
    if (!(wi.high < t.low))
        parts_fail_domain(fn, "input.width.high", value_text(w.high),
                          "a high time shorter than the shortest period, input.period.low = " +
                              value_text(p.period.low));
    return {v, interval::exactly(wi.nominal / t.nominal), wi, t};
}

/// eps must lie strictly between 0 and 1.
inline void check_settling_fraction(std::string_view fn, double eps) {
    if (!(eps > 0.0 && eps < 1.0))
        parts_fail(fn, "settling_fraction", quoted_value(eps), "a fraction of the step strictly between 0 and 1");
}

/// High and low time of one period at one point: the duty form keeps T2 = (1 - D) T exact.
struct pulse_times {
    double t_high, t_low, duty;
};
/// T1 = D T and T2 = (1 - D) T from the duty, or T1 = width and T2 = T - width.
inline pulse_times pulse_times_at(bool duty_form, double duty, double width, double period) {
    if (duty_form) return {duty * period, (1.0 - duty) * period, duty};
    return {width, period - width, width / period};
}

/// The high and low time of the nominal pulse train.
inline pulse_times nominal_pulse_times(const pulse_train& p) {
    const bool d = p.uses_duty();
    return pulse_times_at(d, d ? std::get<ranged<double>>(p.width).nominal : 0.0,
                          d ? 0.0 : std::get<ranged<duration>>(p.width).nominal.value(), p.period.nominal.value());
}

/// ln(1/eps) through rc.hpp: the time constants a first-order step needs to come within eps.
inline double settling_time_constants(double eps) { return rc::crossing_time(1.0, 0.0, eps, 1.0); }

}  // namespace detail

/// One RC stage averaging a pulse train. Synthesis chooses R and C.
struct pulse_filter {
    resistor r{};  ///< series resistor
    capacitor c{}; ///< capacitor to ground (the output)
    pulse_train input{};  ///< the pulse train driving the filter
    double settling_fraction = 0.01;  ///< eps: settled within this fraction of the step
    operating_conditions conditions{};  ///< temperature range for the parts

    /// Parameter indices.
    enum parameter_index : std::size_t { p_r, p_c, p_high, p_duty, p_width, p_period };
    /// Metric indices.
    enum metric_index : std::size_t { average, ripple, settling };

    /// R, C, high level, duty, width, period (of duty and width, the one not given is fixed and unused).
    static constexpr std::array<quantity_info, 6> parameters{
        {{"R", "\u03A9"}, {"C", "F"}, {"high level", "V"}, {"duty", "V/V"}, {"width", "s"}, {"period", "s"}}};
    /// Mean output, peak-to-peak ripple in the steady state, settling time of the envelope.
    static constexpr std::array<quantity_info, 3> metrics{{{"average", "V"}, {"ripple", "V"}, {"settling", "s"}}};
    /// The ripple can peak inside the duty range (at 1/2): corners are not bounds.
    bool corners_are_bounds() const { return false; }
    /// Synthesis chooses R and C.
    static constexpr std::array<design_slot, 2> design_slots{
        {{"R", part_kind::resistor, 0}, {"C", part_kind::capacitor, 1}}};

    /// Each parameter's interval at the operating conditions.
    std::array<interval, 6> ranges() const {
        constexpr std::string_view fn = "pulse_filter::ranges";
        detail::check_settling_fraction(fn, settling_fraction);
        c.require_no_bias_curve(fn);
        const auto p = detail::pulse_ranges(fn, input);
        c.check_rating(fn, "the input's amplitude", voltage::from_value(p[0].high));
        return {r.range(conditions), c.range(conditions), p[0], p[1], p[2], p[3]};
    }

    /// Average, ripple and settling time at one point.
    std::array<double, 3> evaluate(const std::array<double, 6>& x) const {
        const auto t = detail::pulse_times_at(input.uses_duty(), x[p_duty], x[p_width], x[p_period]);
        const double tau = x[p_r] * x[p_c];
        return {x[p_high] * t.duty, detail::rc::periodic_steady_state(x[p_high], 0.0, t.t_high, t.t_low, tau).swing,
                tau * detail::settling_time_constants(settling_fraction)};
    }

    /// A copy with R and C bought at the given values and tolerances.
    pulse_filter with_parts(const std::array<part_choice, 2>& p) const {
        pulse_filter f = *this;
        f.r = r.with_choice(p[0]);
        f.c = c.with_choice(p[1]);
        return f;
    }

    /// The R or C that puts the ripple or the settling time at `target` with the
    /// other part at `values` and the pulse train at its nominal; NaN for the average
    /// (no part changes it); 0 when no value is small enough (a ripple target of V or more).
    double solve_slot(std::size_t slot, std::size_t metric, double target, const std::array<double, 2>& values) const {
        if (slot > 1 || !(target > 0.0) || (metric != ripple && metric != settling))
            return std::numeric_limits<double>::quiet_NaN();
        const double tau = metric == settling ? target / detail::settling_time_constants(settling_fraction)
                                              : nominal_tau_for_ripple(target);
        return tau / values[1 - slot];
    }

    /// The time constant whose ripple at the nominal pulse train is `target` (0 when none is short enough).
    double nominal_tau_for_ripple(double target) const {
        const auto t = detail::nominal_pulse_times(input);
        return tau_for_ripple(input.high.nominal.value(), t.t_high, t.t_low, target);
    }

    /// The time constant whose ripple is `target` for level v and times t_high, t_low;
    /// the ripple falls monotonically with tau, from v (tau -> 0) towards 0.
    static double tau_for_ripple(double v, double t_high, double t_low, double target) {
        if (!(target < v)) return 0.0;
        const double guess = v * t_high * t_low / (t_high + t_low) / target;  // small-ripple approximation
        auto f = [&](double tau) { return detail::rc::periodic_steady_state(v, 0.0, t_high, t_low, tau).swing; };
        return detail::solve_monotone_positive(f, target, guess, false);
    }
};

static_assert(SolvableNetwork<pulse_filter>, "pulse_filter must satisfy SolvableNetwork");

/// Two RC stages, the second loading the first: the pulse train drives R1 into
/// C1, R2 runs from C1 to C2, the output is C2. Synthesis chooses R1, C1, R2, C2.
struct two_stage_pulse_filter {
    resistor r1{};   ///< first series resistor
    capacitor c1{};  ///< first capacitor to ground
    resistor r2{};   ///< second series resistor, from C1 to C2
    capacitor c2{};  ///< second capacitor to ground (the output)
    pulse_train input{};  ///< the pulse train driving the filter
    double settling_fraction = 0.01;  ///< eps: settled within this fraction of the step
    operating_conditions conditions{};  ///< temperature range for the parts

    /// Parameter indices.
    enum parameter_index : std::size_t { p_r1, p_c1, p_r2, p_c2, p_high, p_duty, p_width, p_period };
    /// Metric indices.
    enum metric_index : std::size_t { average, ripple, settling };

    /// R1, C1, R2, C2, high level, duty, width, period (of duty and width, the one not given is fixed and unused).
    static constexpr std::array<quantity_info, 8> parameters{{{"R1", "\u03A9"},
                                                              {"C1", "F"},
                                                              {"R2", "\u03A9"},
                                                              {"C2", "F"},
                                                              {"high level", "V"},
                                                              {"duty", "V/V"},
                                                              {"width", "s"},
                                                              {"period", "s"}}};
    /// Mean output, peak-to-peak ripple in the steady state, settling time of the envelope.
    static constexpr std::array<quantity_info, 3> metrics{{{"average", "V"}, {"ripple", "V"}, {"settling", "s"}}};
    /// The ripple can peak inside the duty range (at 1/2): corners are not bounds.
    bool corners_are_bounds() const { return false; }
    /// Synthesis chooses R1, C1, R2 and C2.
    static constexpr std::array<design_slot, 4> design_slots{{{"R1", part_kind::resistor, 0},
                                                              {"C1", part_kind::capacitor, 1},
                                                              {"R2", part_kind::resistor, 2},
                                                              {"C2", part_kind::capacitor, 3}}};

    /// Each parameter's interval at the operating conditions.
    std::array<interval, 8> ranges() const {
        constexpr std::string_view fn = "two_stage_pulse_filter::ranges";
        detail::check_settling_fraction(fn, settling_fraction);
        c1.require_no_bias_curve(fn, "c1");
        c2.require_no_bias_curve(fn, "c2");
        const auto p = detail::pulse_ranges(fn, input);
        const voltage amplitude = voltage::from_value(p[0].high);
        c1.check_rating(fn, "the input's amplitude", amplitude, "c1");
        c2.check_rating(fn, "the input's amplitude", amplitude, "c2");
        return {r1.range(conditions), c1.range(conditions), r2.range(conditions), c2.range(conditions),
                p[0],                 p[1],                 p[2],                 p[3]};
    }

    /// Average, ripple and settling time at one point.
    std::array<double, 3> evaluate(const std::array<double, 8>& x) const {
        const auto t = detail::pulse_times_at(input.uses_duty(), x[p_duty], x[p_width], x[p_period]);
        const auto m = detail::two_stage::ladder_modes(x[p_r1], x[p_c1], x[p_r2], x[p_c2]);
        return {x[p_high] * t.duty, detail::two_stage::periodic_steady_state(m, x[p_high], t.t_high, t.t_low).ripple,
                detail::two_stage::step_settling_time(m, settling_fraction)};
    }

    /// A copy with R1, C1, R2 and C2 bought at the given values and tolerances.
    two_stage_pulse_filter with_parts(const std::array<part_choice, 4>& p) const {
        two_stage_pulse_filter f = *this;
        f.r1 = r1.with_choice(p[0]);
        f.c1 = c1.with_choice(p[1]);
        f.r2 = r2.with_choice(p[2]);
        f.c2 = c2.with_choice(p[3]);
        return f;
    }

    /// The value of one part that puts the ripple (falling with every part) or the
    /// settling time (rising with every part) at `target`, the others at `values`,
    /// the pulse train at its nominal; solved numerically. NaN for the average.
    double solve_slot(std::size_t slot, std::size_t metric, double target, const std::array<double, 4>& values) const {
        if (slot > 3 || !(target > 0.0) || (metric != ripple && metric != settling))
            return std::numeric_limits<double>::quiet_NaN();
        std::array<double, 8> x{};
        const auto t = detail::nominal_pulse_times(input);
        x[p_high] = input.high.nominal.value();
        x[p_period] = t.t_high + t.t_low;
        x[p_duty] = t.duty;
        x[p_width] = t.t_high;
        for (std::size_t s = 0; s < 4; ++s) x[s] = values[s];
        auto f = [&](double v) {
            x[slot] = v;
            return evaluate(x)[metric];
        };
        // Guess: the sum of time constants R1 C1 + R1 C2 + R2 C2, linear in each part,
        // set from the one-stage relations for the target.
        const double sum = metric == settling ? target / detail::settling_time_constants(settling_fraction)
                                              : x[p_high] * t.t_high * t.t_low / (t.t_high + t.t_low) / target;
        const double r1 = values[0], c1 = values[1], r2 = values[2], c2 = values[3];
        double guess = 0.0;
        switch (slot) {
            case 0: guess = (sum - r2 * c2) / (c1 + c2); break;
            case 1: guess = (sum - (r1 + r2) * c2) / r1; break;
            case 2: guess = (sum - r1 * (c1 + c2)) / c2; break;
            default: guess = (sum - r1 * c1) / (r1 + r2); break;
        }
        const double scale = slot == 0 ? sum / (c1 + c2) : slot == 1 ? sum / r1 : slot == 2 ? sum / c2 : sum / (r1 + r2);
        guess = std::max(guess, 1e-3 * scale);
        return detail::solve_monotone_positive(f, target, guess, metric == settling);
    }
};

static_assert(SolvableNetwork<two_stage_pulse_filter>, "two_stage_pulse_filter must satisfy SolvableNetwork");

/// What `ripple_settling_tradeoff` found for a one-stage filter.
struct filter_tradeoff {
    duration tau_min;  ///< smallest time constant whose worst-case ripple is at most the limit (0: any)
    duration tau_max;  ///< largest time constant whose settling is at most the limit
    duration rc_min;   ///< smallest marked R C whose every corner lies in [tau_min, tau_max]
    duration rc_max;   ///< largest such marked R C
    voltage ripple_at_settling_limit;  ///< worst-case ripple at tau_max: the least the settling limit allows
    double spread_low = 1.0;   ///< R C at its lowest corner / marked R C
    double spread_high = 1.0;  ///< R C at its highest corner / marked R C
    std::string reason;        ///< why no R C works; empty when one does
    /// True when some marked R C holds both limits at every corner.
    bool feasible() const noexcept { return reason.empty(); }
};

/// The trade-off between ripple and settling of a one-stage filter: the ripple
/// falls and the settling time grows with tau, so both limits hold for tau in
/// [tau_min, tau_max]; with the parts' spread (tolerance, temperature, ageing of
/// r and c, whatever their marked values) the marked R C must lie in
/// [tau_min / spread_low, tau_max / spread_high]. The worst-case ripple at a
/// given tau takes the highest level and period and the duty (or width) nearest
/// half the period. An infeasible result says which limit rules: both cannot be
/// met (the least ripple at the settling limit is above the ripple limit), or the
/// parts' spread is wider than the window.
inline filter_tradeoff ripple_settling_tradeoff(const pulse_filter& f, voltage max_ripple, duration max_settling) {
    constexpr std::string_view fn = "ripple_settling_tradeoff";
    detail::require_positive(fn, "max_ripple", max_ripple, "a positive, finite voltage");
    detail::require_positive(fn, "max_settling", max_settling, "a positive, finite time");
    detail::check_settling_fraction(fn, f.settling_fraction);
    const auto p = detail::pulse_ranges(fn, f.input);
    const double v = p[0].high, period = p[3].high;
    // The worst train: highest period; duty (width) nearest half of it.
    const double t_high = f.input.uses_duty() ? std::clamp(0.5, p[1].low, p[1].high) * period
                                              : std::clamp(period / 2.0, p[2].low, p[2].high);
    const double t_low = f.input.uses_duty() ? (1.0 - std::clamp(0.5, p[1].low, p[1].high)) * period : period - t_high;
    auto unit_part = [](auto part, double marked) {
        part.nominal = decltype(part.nominal)::from_value(marked);
        return part;
    };
    const interval rr = unit_part(f.r, 1.0).range(f.conditions), cc = unit_part(f.c, 1.0).range(f.conditions);
    filter_tradeoff t;
    t.spread_low = rr.low * cc.low;
    t.spread_high = rr.high * cc.high;
    const double tau_min = pulse_filter::tau_for_ripple(v, t_high, t_low, max_ripple.value());
    const double tau_max = max_settling.value() / detail::settling_time_constants(f.settling_fraction);
    t.tau_min = duration::from_value(tau_min);
    t.tau_max = duration::from_value(tau_max);
    t.rc_min = duration::from_value(tau_min / t.spread_low);
    t.rc_max = duration::from_value(tau_max / t.spread_high);
    t.ripple_at_settling_limit =
        voltage::from_value(detail::rc::periodic_steady_state(v, 0.0, t_high, t_low, tau_max).swing);
    const std::string limits = "ripple at most " + detail::value_text(max_ripple) + " and settling at most " +
                               detail::value_text(max_settling);
    if (tau_min > tau_max)
        t.reason = limits + " cannot both be met: the ripple needs a time constant of at least " +
                   detail::value_text(t.tau_min) + ", the settling allows at most " + detail::value_text(t.tau_max) +
                   ", where the worst-case ripple is " + detail::value_text(t.ripple_at_settling_limit);
    else if (t.rc_min > t.rc_max)
        t.reason = limits + " leave time constants from " + detail::value_text(t.tau_min) + " to " +
                   detail::value_text(t.tau_max) + ", narrower than the parts' spread of R C (x" +
                   detail::quoted_value(t.spread_low) + " to x" + detail::quoted_value(t.spread_high) + ")";
    return t;
}

}  // namespace tauforge
