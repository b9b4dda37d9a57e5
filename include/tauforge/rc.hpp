#pragma once
/// The exact first-order RC response: the one place where exp and log of RC
/// arithmetic live. Every network composes these functions.
///
///     using namespace tauforge::literals;
///     auto tau = 100_kohm * 10_nF;
///     auto t = tauforge::crossing_time(0_V, 5_V, 5.0_V * 2 / 3, tau);  // tau * ln 3
///
/// The `detail::rc` functions are the same formulas on plain doubles in SI base
/// units for hot loops; the public functions are thin unit-typed wrappers.

#include "tauforge/detail/root_find.hpp"
#include "tauforge/detail/validate.hpp"
#include "tauforge/units.hpp"


#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <numbers>
#include <string>
#include <type_traits>
#include <utility>

namespace tauforge {

/// A capacitor's charging path reduced to one source and one time constant.
struct rc_drive {
    voltage v_final;  ///< the voltage the capacitor approaches (it can never pass it)
    duration tau;     ///< the effective time constant
};

/// A source that rises (or falls) linearly from `v_begin` to `v_end` over
/// `rise_time`, then stays at `v_end`: a supply ramping up at power-on.
/// A rise_time of 0 is a step to `v_end` at t = 0.
struct ramp_input {
    voltage v_begin;
    voltage v_end;
    duration rise_time;
};

namespace detail::rc {

/// `start_allowed`: whether a threshold equal to the start is valid (t = 0) for the caller.
[[noreturn]] inline void threshold_out_of_reach(std::string_view function, double vs, double vf, double vth,
                                                bool start_allowed = true) {
    throw domain_error(std::string(function) + ": v_threshold = " + value_text(voltage::from_value(vth)) +
                       " is not reached from v_start = " + value_text(voltage::from_value(vs)) +
                       " towards v_final = " + value_text(voltage::from_value(vf)) +
                       "; expected a threshold strictly between start and final value" +
                       (start_allowed ? ", or equal to the start" : ""));
}

/// For the ramp input: the capacitor may first move away from v_end, so say what is
/// supported rather than that the threshold is never reached.
[[noreturn]] inline void ramp_threshold_outside(std::string_view function, double v_cap0, double v_end, double vth) {
    throw domain_error(std::string(function) + ": v_threshold = " + value_text(voltage::from_value(vth)) +
                       " does not lie between v_cap_start = " + value_text(voltage::from_value(v_cap0)) +
                       " and v_end = " + value_text(voltage::from_value(v_end)) +
                       "; expected a threshold strictly between them, or equal to v_cap_start");
}

inline void check_tau(std::string_view function, double tau) {
    require_positive(function, "tau", duration::from_value(tau), "a positive, finite time constant");
}

inline void check_voltages(std::string_view function, double vs, double vf, double vth) {
    require_finite(function, "v_start", voltage::from_value(vs), "a finite voltage");
    require_finite(function, "v_final", voltage::from_value(vf), "a finite voltage");
    require_finite(function, "v_threshold", voltage::from_value(vth), "a finite voltage");
}

/// ln((vs - vf) / (vth - vf)) from the two gaps vs - vth and vth - vf, as
/// log1p(start_gap / final_gap): the one place of the crossing-time logarithm.
inline double log_ratio_from_gaps(double start_gap, double final_gap) { return std::log1p(start_gap / final_gap); }

/// ln((vs - vf) / (vth - vf)) computed as log1p((vs - vth) / (vth - vf)), so a
/// threshold near the start keeps full precision. Throws if vth is not reached.
inline double log_ratio_to_threshold(std::string_view function, double vs, double vf, double vth) {
    check_voltages(function, vs, vf, vth);
    if (vth == vs) return 0.0;
    const bool between = (vs < vth && vth < vf) || (vf < vth && vth < vs);
    if (!between) threshold_out_of_reach(function, vs, vf, vth);
    return log_ratio_from_gaps(vs - vth, vth - vf);
}

/// v(t) = vf + (vs - vf) e^(-t/tau). While e^(-t/tau) > 1/2 it is evaluated as
/// vs + (vs - vf) expm1(-t/tau), so that a small move away from vs (say from 0 V)
/// keeps full relative precision; later as written, so that the small remaining
/// distance to vf does.
inline double voltage_at(double vs, double vf, double tau, double t) {
    const double x = t / tau;
    if (x < std::numbers::ln2) return vs + (vs - vf) * std::expm1(-x);
    return vf + (vs - vf) * std::exp(-x);
}

/// Time for v to go from vs to vth while approaching vf with time constant tau.
inline double crossing_time(double vs, double vf, double vth, double tau) {
    check_tau("crossing_time", tau);
    return tau * log_ratio_to_threshold("crossing_time", vs, vf, vth);
}

/// -log1p(-g) - g = g^2/2 + g^3/3 + ... for 0 <= g < 1, without cancellation for small g.
inline double log_gap_excess(double g) {
    if (g < 0.1) {
        double power = g * g, sum = 0.0;
        for (int n = 2; n < 60 && power > 1e-18 * sum; ++n, power *= g) sum += power / n;
        return sum;
    }
    return -std::log1p(-g) - g;
}

/// The crossing time per unit time constant, R C0, for a capacitance that depends
/// on the voltage across it, C(v) = C0 k(v), with k linear between breakpoints:
/// `next_break(p, q)` returns the breakpoint nearest p strictly between p and q, or q
/// when there is none. The charge
/// balance C(v) dv/dt = (vf - v) / R gives
///   t / (R C0) = integral from vs to vth of k(v) / (vf - v) dv,
/// the time-weighted mean of k over the swing times ln((vs - vf)/(vth - vf)). On a
/// piece [p, q] where k = k(p) + s (v - p):
///   integral = k(p) L + s (vf - p) E(g),  L = ln((vf - p)/(vf - q)), g = (q - p)/(vf - p),
///   E(g) = -ln(1 - g) - g,
/// exact, with L from the crossing-time logarithm and E without cancellation.
/// The threshold must lie strictly between start and final value or equal the start.
template <class NextBreak, class K>
double crossing_per_tau_varying(double vs, double vf, double vth, NextBreak next_break, K k) {
    if (log_ratio_to_threshold("crossing_time", vs, vf, vth) == 0.0) return 0.0;  // validates the swing
    double sum = 0.0, p = vs, kp = k(vs);
    while (p != vth) {
        const double q = next_break(p, vth), kq = k(q), g = (q - p) / (vf - p);
        sum += kp * log_ratio_from_gaps(p - q, q - vf) + (kq - kp) / (q - p) * (vf - p) * log_gap_excess(g);
        p = q;
        kp = kq;
    }
    return sum;
}

/// One argument of a block kernel: the same value for every element, or one per element.
constexpr double block_lane(double v, std::size_t) { return v; }
constexpr double block_lane(const double* v, std::size_t k) { return v[k]; }

/// out[k] = crossing_time(vs, vf, vth, tau) for k < n, each argument a double (the
/// same for the whole block) or a pointer to n values: the block kernel of Monte
/// Carlo. Each element's checks are folded into one flag, without branches, in
/// the same loop as the logarithm (whose latency hides them); only when one
/// fails does the block go through crossing_time element by element, which
/// throws the first bad element's message. Every value is bit-identical to
/// crossing_time's.
template <class Vs, class Vf, class Vth, class Tau>
void crossing_times(std::size_t n, Vs vs, Vf vf, Vth vth, Tau tau, double* out) {
    constexpr double big = std::numeric_limits<double>::max();
    constexpr bool same_start_and_final = std::is_same_v<Vs, double> && std::is_same_v<Vf, double>;
    bool valid = true;
    double lo = 0.0, hi = 0.0;
    if constexpr (same_start_and_final) {  // checked once; the threshold then needs lo < vth < hi
        valid = std::abs(block_lane(vs, 0)) <= big && std::abs(block_lane(vf, 0)) <= big;
        lo = std::min(block_lane(vs, 0), block_lane(vf, 0)), hi = std::max(block_lane(vs, 0), block_lane(vf, 0));
    }
    for (std::size_t k = 0; k < n; ++k) {
        const double s = block_lane(vs, k), f = block_lane(vf, k), th = block_lane(vth, k), t = block_lane(tau, k);
        // The conditions of check_tau, check_voltages and log_ratio_to_threshold.
        bool ok;
        if constexpr (same_start_and_final)
            ok = (t > 0.0) & (t <= big) & (((lo < th) & (th < hi)) | (th == s));
        else
            ok = (t > 0.0) & (t <= big) & (std::abs(s) <= big) & (std::abs(f) <= big) & (std::abs(th) <= big) &
                 (((s < th) & (th < f)) | ((f < th) & (th < s)) | (th == s));
        valid = valid & ok;
        out[k] = t * (th == s ? 0.0 : log_ratio_from_gaps(s - th, th - f));
    }
    if (!valid)
        for (std::size_t k = 0; k < n; ++k)
            out[k] = crossing_time(block_lane(vs, k), block_lane(vf, k), block_lane(vth, k), block_lane(tau, k));
}

/// x + expm1(-x) = x^2/2 - x^3/6 + ..., without cancellation for small x.
inline double ramp_lag_term(double x) {
    if (x < 0.1) {
        double term = x * x / 2.0, sum = 0.0;
        for (int n = 3; n < 40 && std::abs(term) > 1e-18 * std::abs(sum); ++n) {
            sum += term;
            term *= -x / n;
        }
        return sum;
    }
    return x + std::expm1(-x);
}

/// The capacitor's change v(t) - v_cap0 while the input ramps (0 <= t <= rise_time):
///   v(t) - v_cap0 = (v_begin - v_cap0)(1 - e^(-x)) + slope tau (x - 1 + e^(-x)),  x = t / tau.
/// Kept apart from v_cap0 so that a threshold near v_cap0 is compared without cancellation.
inline double ramp_change_during(double v_begin, double slope, double v_cap0, double tau, double t) {
    const double x = t / tau;
    return -(v_begin - v_cap0) * std::expm1(-x) + slope * tau * ramp_lag_term(x);
}

/// Capacitor voltage at t while the input ramps (0 <= t <= rise_time), from v_cap0.
inline double ramp_voltage_during(double v_begin, double slope, double v_cap0, double tau, double t) {
    return v_cap0 + ramp_change_during(v_begin, slope, v_cap0, tau, t);
}

inline void check_ramp(std::string_view function, double v_begin, double v_end, double rise, double v_cap0,
                       double tau) {
    require_finite(function, "v_begin", voltage::from_value(v_begin), "a finite voltage");
    require_finite(function, "v_end", voltage::from_value(v_end), "a finite voltage");
    require_non_negative(function, "rise_time", duration::from_value(rise), "a non-negative, finite time");
    require_finite(function, "v_cap_start", voltage::from_value(v_cap0), "a finite voltage");
    check_tau(function, tau);
}

/// Capacitor voltage at t for the ramp input; errors are reported as from the public voltage_at.
inline double ramp_voltage_at(double v_begin, double v_end, double rise, double v_cap0, double tau, double t) {
    constexpr std::string_view fn = "voltage_at";
    check_ramp(fn, v_begin, v_end, rise, v_cap0, tau);
    require_non_negative(fn, "t", duration::from_value(t), "a non-negative, finite time");
    if (rise == 0.0) return voltage_at(v_cap0, v_end, tau, t);  // a step: no slope to divide by
    const double slope = (v_end - v_begin) / rise;
    if (t <= rise) return ramp_voltage_during(v_begin, slope, v_cap0, tau, t);
    return voltage_at(ramp_voltage_during(v_begin, slope, v_cap0, tau, rise), v_end, tau, t - rise);
}

/// The checks of a ramp crossing, reported as from the public crossing_time: false
/// when the threshold is the start (t = 0), true when the crossing lies ahead.
inline bool ramp_crossing_ahead(double v_begin, double v_end, double rise, double v_cap0, double vth, double tau) {
    constexpr std::string_view fn = "crossing_time";
    check_ramp(fn, v_begin, v_end, rise, v_cap0, tau);
    require_finite(fn, "v_threshold", voltage::from_value(vth), "a finite voltage");
    if (vth == v_cap0) return false;
    const bool between = (v_cap0 < vth && vth < v_end) || (v_end < vth && vth < v_cap0);
    if (!between) ramp_threshold_outside(fn, v_cap0, v_end, vth);
    return true;
}

/// First time the capacitor, starting at v_cap0, crosses vth while the input ramps
/// from v_begin to v_end over `rise` and then stays at v_end; errors are reported as
/// from the public crossing_time. The threshold must lie strictly between v_cap0 and
/// v_end (or equal v_cap0): a threshold beyond v_cap0 on the far side from v_end, which
/// a capacitor first moving away may cross, is rejected.
/// Within the ramp, the root is bracketed and found with Brent's method
/// (detail/root_find.hpp) down to a bracket of 4 machine epsilons relative (measured: within 2e-14 of a 50-digit reference, at most
/// about 75 iterations); after it the closed form applies.
inline double ramp_crossing_time(double v_begin, double v_end, double rise, double v_cap0, double vth, double tau) {
    if (!ramp_crossing_ahead(v_begin, v_end, rise, v_cap0, vth, tau)) return 0.0;
    if (rise == 0.0) return tau * log_ratio_from_gaps(v_cap0 - vth, vth - v_end);
    const double slope = (v_end - v_begin) / rise;
    // v' is monotone during the ramp (v'' = (slope - v') / tau), so v has at most one
    // extremum and crosses a threshold beyond the start only once.
    // f < 0 before the crossing; it is formed from the gap v_cap0 - vth and the change
    // v - v_cap0, never from v itself, so a threshold close to v_cap0 keeps its precision.
    const double sign = v_end > v_cap0 ? 1.0 : -1.0;
    const double start_gap = v_cap0 - vth;
    auto f = [&](double t) { return sign * (start_gap + ramp_change_during(v_begin, slope, v_cap0, tau, t)); };
    const double f_end = f(rise);
    // Not crossed during the ramp: a step from v(rise) towards v_end, whose gap to the
    // threshold, v(rise) - vth = sign f_end, is already at hand without cancellation.
    if (f_end < 0.0) return rise + tau * log_ratio_from_gaps(sign * f_end, vth - v_end);
    if (f_end == 0.0) return rise;
    // f(0) < 0 here; if the capacitor first moves away (v_begin beyond v_cap0 on the
    // wrong side), f stays negative until its minimum, and the bracket still holds.
    return bracketed_root(f, 0.0, rise, f(0.0), f_end);
}

/// One Dormand-Prince 5(4) step of the scalar ODE v' = f(t, v): the fifth-order
/// value and the difference to the embedded fourth-order one (the error estimate).
struct dp_step {
    double v = 0.0, error = 0.0;
};
template <class F>
dp_step dormand_prince_step(F f, double t, double v, double h) {
    const double k1 = f(t, v);
    const double k2 = f(t + h / 5.0, v + h * (k1 / 5.0));
    const double k3 = f(t + h * 0.3, v + h * (3.0 / 40.0 * k1 + 9.0 / 40.0 * k2));
    const double k4 = f(t + h * 0.8, v + h * (44.0 / 45.0 * k1 - 56.0 / 15.0 * k2 + 32.0 / 9.0 * k3));
    const double k5 = f(t + h * 8.0 / 9.0, v + h * (19372.0 / 6561.0 * k1 - 25360.0 / 2187.0 * k2 +
                                                      64448.0 / 6561.0 * k3 - 212.0 / 729.0 * k4));
    const double k6 = f(t + h, v + h * (9017.0 / 3168.0 * k1 - 355.0 / 33.0 * k2 + 46732.0 / 5247.0 * k3 +
                                        49.0 / 176.0 * k4 - 5103.0 / 18656.0 * k5));
    const double v5 =
        v + h * (35.0 / 384.0 * k1 + 500.0 / 1113.0 * k3 + 125.0 / 192.0 * k4 - 2187.0 / 6784.0 * k5 + 11.0 / 84.0 * k6);
    const double k7 = f(t + h, v5);
    const double err = h * ((35.0 / 384.0 - 5179.0 / 57600.0) * k1 + (500.0 / 1113.0 - 7571.0 / 16695.0) * k3 +
                            (125.0 / 192.0 - 393.0 / 640.0) * k4 + (-2187.0 / 6784.0 + 92097.0 / 339200.0) * k5 +
                            (11.0 / 84.0 - 187.0 / 2100.0) * k6 - 1.0 / 40.0 * k7);
    return {v5, err};
}

/// Relative accuracy of the integration in ramp_crossing_time_varying.
inline constexpr double varying_ramp_tolerance = 1e-12;

/// The ramp input of ramp_crossing_time into a capacitance C0 k(v) (see
/// crossing_per_tau_varying for k and next_break): C0 k(v) dv/dt = (u(t) - v)/R,
/// tau = R C0. During the ramp there is no closed form: the ODE is integrated with
/// an adaptive Dormand-Prince 5(4) to `varying_ramp_tolerance` of the voltage
/// scale per step, a crossing in a step located with Brent's method on the step's
/// length; after the ramp the exact closed form takes over. Same checks and
/// errors as ramp_crossing_time.
template <class NextBreak, class K>
double ramp_crossing_time_varying(double v_begin, double v_end, double rise, double v_cap0, double vth, double tau,
                                  NextBreak next_break, K k) {
    if (!ramp_crossing_ahead(v_begin, v_end, rise, v_cap0, vth, tau)) return 0.0;
    if (rise == 0.0) return tau * crossing_per_tau_varying(v_cap0, v_end, vth, next_break, k);
    const double slope = (v_end - v_begin) / rise;
    const auto f = [&](double t, double v) { return (v_begin + slope * t - v) / (tau * k(v)); };
    const double side = vth > v_cap0 ? 1.0 : -1.0;
    const double scale = varying_ramp_tolerance *
                         std::max({std::abs(v_begin), std::abs(v_end), std::abs(v_cap0), std::abs(vth)});
    double t = 0.0, v = v_cap0, h = std::min(rise, tau) * 1e-3;
    for (long steps = 0; t < rise; ++steps) {
        if (steps == 1'000'000)
            throw domain_error(std::string("crossing_time: the ramp from ") + value_text(voltage::from_value(v_begin)) +
                               " to " + value_text(voltage::from_value(v_end)) + " over " +
                               value_text(duration::from_value(rise)) +
                               " into the voltage-dependent capacitance did not converge; expected a capacitance "
                               "curve that stays positive over the swing");
        h = std::min(h, rise - t);
        const dp_step s = dormand_prince_step(f, t, v, h);
        const double err = std::abs(s.error);
        if (err <= scale) {
            if ((vth - s.v) * side <= 0.0) {  // crossed within this step: the step length that lands on vth
                const auto g = [&](double len) { return len == 0.0 ? v - vth : dormand_prince_step(f, t, v, len).v - vth; };
                return t + bracketed_root(g, 0.0, h, v - vth, s.v - vth);
            }
            t += h;
            v = s.v;
        }
        // A step whose error is not a number (a trial point off the curve) shrinks too.
        h *= err > 0.0 ? std::clamp(0.9 * std::pow(scale / err, 0.2), 0.2, 5.0) : err == 0.0 ? 5.0 : 0.2;
    }
    return rise + tau * crossing_per_tau_varying(v, v_end, vth, next_break, k);
}

/// The periodic steady state of a first-order stage (time constant tau) whose source
/// sits at v_high for t_high, then at v_low for t_low, repeating. With
/// a1 = e^(-t_high/tau), a2 = e^(-t_low/tau), a = a1 a2 and d = v_high - v_low:
///   at_fall = v_low + d (1 - a1) / (1 - a)      (end of the high interval: the extreme towards v_high)
///   at_rise = v_low + d a2 (1 - a1) / (1 - a)   (end of the low interval: the extreme towards v_low)
///   swing   = at_fall - at_rise = d (1 - a1)(1 - a2) / (1 - a)
/// Every factor 1 - e^(-x) is formed with expm1, so a small swing keeps full relative
/// precision. rise_gap = v_high - at_rise = d (1 - a2) / (1 - a) and
/// fall_gap = at_fall - v_low = d (1 - a1) / (1 - a) are the distances the stage still
/// has to go when the source switches, also without cancellation.
struct periodic_response {
    double at_rise = 0.0;   ///< voltage when the source steps to v_high
    double at_fall = 0.0;   ///< voltage when the source steps back to v_low
    double swing = 0.0;     ///< at_fall - at_rise
    double rise_gap = 0.0;  ///< v_high - at_rise
    double fall_gap = 0.0;  ///< at_fall - v_low
};

/// See periodic_response; tau > 0, t_high and t_low >= 0 with t_high + t_low > 0 (unchecked).
inline periodic_response periodic_steady_state(double v_high, double v_low, double t_high, double t_low, double tau) {
    const double d = v_high - v_low;
    const double g1 = -std::expm1(-t_high / tau), g2 = -std::expm1(-t_low / tau);
    const double g = -std::expm1(-(t_high + t_low) / tau);
    periodic_response p;
    p.fall_gap = d * g1 / g;
    p.rise_gap = d * g2 / g;
    p.swing = d * g1 * g2 / g;
    p.at_fall = v_low + p.fall_gap;
    p.at_rise = v_low + d * g1 * (1.0 - g2) / g;
    return p;
}

}  // namespace detail::rc

/// Capacitor voltage t after a step, starting at v_start and approaching v_final:
/// v(t) = v_final + (v_start - v_final) e^(-t/tau).
inline voltage voltage_at(Voltage auto v_start, Voltage auto v_final, Duration auto tau, Duration auto t) {
    detail::rc::check_tau("voltage_at", tau.value());
    detail::require_non_negative("voltage_at", "t", t, "a non-negative, finite time");
    detail::rc::check_voltages("voltage_at", v_start.value(), v_final.value(), v_final.value());
    return voltage::from_value(detail::rc::voltage_at(v_start.value(), v_final.value(), tau.value(), t.value()));
}

/// Time for the capacitor to go from v_start to v_threshold while approaching v_final:
/// t = tau ln((v_start - v_final) / (v_threshold - v_final)), computed as
/// tau log1p((v_start - v_threshold) / (v_threshold - v_final)).
/// Throws `domain_error` unless the threshold lies strictly between start and
/// final value or equals the start (then t = 0).
inline duration crossing_time(Voltage auto v_start, Voltage auto v_final, Voltage auto v_threshold, Duration auto tau) {
    return duration::from_value(
        detail::rc::crossing_time(v_start.value(), v_final.value(), v_threshold.value(), tau.value()));
}

/// The time constant for which the crossing from v_start to v_threshold takes time t.
/// Throws `domain_error` unless the threshold lies strictly between start and final value.
inline duration time_constant_for(Voltage auto v_start, Voltage auto v_final, Voltage auto v_threshold,
                                  Duration auto t) {
    constexpr std::string_view fn = "time_constant_for";
    detail::require_positive(fn, "t", t, "a positive, finite time");
    detail::rc::check_voltages(fn, v_start.value(), v_final.value(), v_threshold.value());
    const double vs = v_start.value(), vf = v_final.value(), vth = v_threshold.value();
    if (vth == vs)
        throw domain_error(std::string(fn) + ": v_threshold = " + detail::value_text(v_threshold) +
                           " equals v_start, which is reached at t = 0 for every time constant, not after t = " +
                           detail::value_text(t) + "; expected a threshold strictly between start and final value");
    if (!((vs < vth && vth < vf) || (vf < vth && vth < vs)))
        detail::rc::threshold_out_of_reach(fn, vs, vf, vth, /*start_allowed=*/false);
    return duration::from_value(t.value() / detail::rc::log_ratio_from_gaps(vs - vth, vth - vf));
}

/// Time until the capacitor is within `fraction` of the step from its final
/// value: tau ln(1 / fraction). 1 % settling is 4.605 tau.
inline duration settling_time(double fraction, Duration auto tau) {
    constexpr std::string_view fn = "settling_time";
    if (!(fraction > 0.0 && fraction < 1.0))
        detail::fail_invalid(fn, "fraction", fraction, "a fraction of the step strictly between 0 and 1");
    detail::rc::check_tau(fn, tau.value());
    return tau * -std::log(fraction);
}

/// Time constants needed to settle within half an LSB of an N-bit converter: (N + 1) ln 2.
inline double half_lsb_time_constants(int bits) {
    if (bits < 1 || bits > 32)
        detail::fail_invalid("half_lsb_time_constants", "bits", static_cast<double>(bits), "a resolution of 1 to 32 bits");
    return (bits + 1) * std::log(2.0);
}

/// Thevenin reduction of a source `v_source` behind `r_source`, charging `c`,
/// with a shunt path `r_shunt` from the capacitor to `v_shunt` (a leaky
/// capacitor, a pin's input resistance): the capacitor approaches
/// v_final = (v_source r_shunt + v_shunt r_source) / (r_source + r_shunt)
/// with tau = c (r_source || r_shunt).
inline rc_drive with_shunt(Voltage auto v_source, Resistance auto r_source, Capacitance auto c,
                           Resistance auto r_shunt, voltage v_shunt = voltage::from_value(0.0)) {
    constexpr std::string_view fn = "with_shunt";
    detail::require_finite(fn, "v_source", v_source, "a finite voltage");
    detail::require_positive(fn, "r_source", r_source, "a positive, finite resistance");
    detail::require_positive(fn, "c", c, "a positive, finite capacitance");
    detail::require_positive(fn, "r_shunt", r_shunt,
                             "a positive, finite resistance (without a shunt, tau is r_source c)");
    detail::require_finite(fn, "v_shunt", v_shunt, "a finite voltage");
    const double rs = r_source.value(), rp = r_shunt.value();
    const double vf = (v_source.value() * rp + v_shunt.value() * rs) / (rs + rp);
    return {voltage::from_value(vf), duration::from_value(c.value() * (rs * rp / (rs + rp)))};
}

/// Thevenin reduction with a constant leakage current `i_leak` drawn from the
/// capacitor node: v_final = v_source - i_leak r_source, tau = r_source c.
inline rc_drive with_leakage_current(Voltage auto v_source, Resistance auto r_source, Capacitance auto c,
                                     Current auto i_leak) {
    constexpr std::string_view fn = "with_leakage_current";
    detail::require_finite(fn, "v_source", v_source, "a finite voltage");
    detail::require_positive(fn, "r_source", r_source, "a positive, finite resistance");
    detail::require_positive(fn, "c", c, "a positive, finite capacitance");
    detail::require_finite(fn, "i_leak", i_leak, "a finite current");
    return {v_source - i_leak * r_source, r_source * c};
}

/// Capacitor voltage at t for a ramp input, starting from v_cap_start.
inline voltage voltage_at(const ramp_input& in, Voltage auto v_cap_start, Duration auto tau, Duration auto t) {
    return voltage::from_value(detail::rc::ramp_voltage_at(in.v_begin.value(), in.v_end.value(), in.rise_time.value(),
                                                           v_cap_start.value(), tau.value(), t.value()));
}

/// First time the capacitor, from v_cap_start, crosses v_threshold for a ramp input.
/// The threshold must lie strictly between v_cap_start and in.v_end, or equal v_cap_start
/// (then t = 0); otherwise `domain_error`, also for a threshold that a capacitor first
/// moving away from in.v_end would cross on the way.
inline duration crossing_time(const ramp_input& in, Voltage auto v_cap_start, Voltage auto v_threshold,
                              Duration auto tau) {
    return duration::from_value(detail::rc::ramp_crossing_time(in.v_begin.value(), in.v_end.value(),
                                                               in.rise_time.value(), v_cap_start.value(),
                                                               v_threshold.value(), tau.value()));
}

}  // namespace tauforge
