#pragma once
// The exact solution of a two-capacitor RC ladder, on plain doubles in SI units:
//
//   u --R1-- node 1 (C1 to ground) --R2-- node 2 (C2 to ground, the output)
//
//   C1 v1' = (u - v1)/R1 - (v1 - v2)/R2,   C2 v2' = (v1 - v2)/R2,
//
// i.e. x' = A x + b u with a11 = -(1/(R1 C1) + 1/(R2 C1)), a12 = 1/(R2 C1),
// a21 = 1/(R2 C2), a22 = -1/(R2 C2), b = (1/(R1 C1), 0). Users: the two-stage
// pulse filter (second stage loading the first) and the ADC input with an
// external capacitor (R1 = source, C1 = external, R2 = switch, C2 = sampling).
//
// Closed forms, no numerical integration. With h = (a11 - a22)/2 and
// r = sqrt(h^2 + a12 a21) the eigenvalues are real and distinct,
//   lambda_fast = (a11 + a22)/2 - r,  lambda_slow = det A / lambda_fast,
// and alpha = a11 - lambda_fast = r + h, beta = a22 - lambda_fast = r - h are both
// positive with alpha beta = a12 a21 (the smaller one is formed as a12 a21 over the
// larger, so nothing cancels). Sylvester's formula gives the transition matrix
//   Phi(t) = [(A - lambda_f I) e^(lambda_s t) - (A - lambda_s I) e^(lambda_f t)] / (2 r),
// e.g. Phi22 = (beta e_s + alpha e_f) / (2 r). The eigenvectors are columns of
// A - lambda_f I and A - lambda_s I: v_s = (alpha, a21), v_f = (-beta, a21). In the
// scaled modal coordinates
//   zeta_s = (a21 x1 + beta x2) / (2 r),  zeta_f = (alpha x2 - a21 x1) / (2 r)
// the output is v2 = zeta_s + zeta_f and each mode is a first-order stage with
// time constant -1/lambda that approaches g u, g_s = a21 b1 / (2 r |lambda_s|),
// g_f = -a21 b1 / (2 r |lambda_f|) (g_s + g_f = a21 b1 / det A, the DC gain: 1 for
// the ladder). So every exponential of a mode goes through rc.hpp's first-order
// functions; only the 2x2 algebra lives here.

#include "tauforge/rc.hpp"

#include "tauforge/detail/root_find.hpp"

#include <algorithm>
#include <array>
#include <cmath>

namespace tauforge::detail::two_stage {

/// The ladder's modes: time constants and the coefficients above.
struct modes {
    double tau_slow = 0.0;  ///< -1 / lambda_slow (the larger time constant)
    double tau_fast = 0.0;  ///< -1 / lambda_fast
    double alpha = 0.0;     ///< a11 - lambda_fast (> 0)
    double beta = 0.0;      ///< a22 - lambda_fast (> 0)
    double a21 = 0.0;       ///< 1 / (R2 C2)
    double two_r = 0.0;     ///< lambda_slow - lambda_fast (> 0)
    double gain_slow = 0.0; ///< g_s: the slow mode's final value per volt of input
    double gain_fast = 0.0; ///< g_f (< 0)
};

/// The modes of the ladder R1 C1 R2 C2 (all positive, unchecked).
inline modes ladder_modes(double r1, double c1, double r2, double c2) {
    const double k1 = 1.0 / (r1 * c1), k12 = 1.0 / (r2 * c1), k2 = 1.0 / (r2 * c2);
    const double a11 = -(k1 + k12), a12 = k12, a21 = k2, a22 = -k2;
    const double det = k1 * k2;  // a11 a22 - a12 a21 = 1 / (R1 C1 R2 C2), formed without cancellation
    const double h = (a11 - a22) / 2.0;
    const double r = std::hypot(h, std::sqrt(a12 * a21));
    const double big = r + std::abs(h), small = a12 * a21 / big;
    modes m;
    m.alpha = h >= 0.0 ? big : small;
    m.beta = h >= 0.0 ? small : big;
    m.a21 = a21;
    m.two_r = 2.0 * r;
    const double lambda_fast = (a11 + a22) / 2.0 - r;
    const double lambda_slow = det / lambda_fast;
    m.tau_fast = -1.0 / lambda_fast;
    m.tau_slow = -1.0 / lambda_slow;
    const double ab = a21 * k1 / m.two_r;  // a21 b1 / (2 r)
    m.gain_slow = ab * m.tau_slow;
    m.gain_fast = -ab * m.tau_fast;
    return m;
}

/// The modal coordinates (zeta_s, zeta_f) of the state (x1, x2).
inline std::array<double, 2> to_modes(const modes& m, double x1, double x2) {
    return {(m.a21 * x1 + m.beta * x2) / m.two_r, (m.alpha * x2 - m.a21 * x1) / m.two_r};
}

/// Phi22(t) = (beta e^(-t/tau_s) + alpha e^(-t/tau_f)) / (2 r): the output's free
/// response per volt of initial output with node 1 at zero (the ADC's sampling
/// capacitor holding the previous value while the pin is settled).
inline double phi22(const modes& m, double t) {
    return (m.beta * rc::voltage_at(1.0, 0.0, m.tau_slow, t) + m.alpha * rc::voltage_at(1.0, 0.0, m.tau_fast, t)) /
           m.two_r;
}

/// The first t >= 0 at which c_s e^(-t/tau_s) + c_f e^(-t/tau_f), which is 1 at t = 0
/// and falls monotonically (the caller guarantees it), reaches `level` in (0, 1).
/// The root lies in [0, tau_s ln((|c_s| + |c_f|) / level)] (the sum is at most
/// (|c_s| + |c_f|) e^(-t/tau_s) there); bracketed_root finds it to about 2e-15 relative.
inline double decay_crossing(const modes& m, double c_s, double c_f, double level) {
    auto f = [&](double t) {
        return c_s * rc::voltage_at(1.0, 0.0, m.tau_slow, t) + c_f * rc::voltage_at(1.0, 0.0, m.tau_fast, t) - level;
    };
    double hi = m.tau_slow * std::log((std::abs(c_s) + std::abs(c_f)) / level);
    double f_hi = f(hi);
    for (int n = 0; n < 64 && f_hi > 0.0; ++n) f_hi = f(hi *= 1.0 + 1e-12 * (n + 1));  // rounding at the bound
    if (f_hi >= 0.0) return hi;
    return bracketed_root(f, 0.0, hi, 1.0 - level, f_hi, 0x1p-49);
}

/// Time for the output's step response to come within `fraction` of its final
/// value: 1 - s(t) = (g_s e_s + g_f e_f) / (g_s + g_f), monotone for the ladder
/// (its transfer function has two real poles and no zero, so its impulse response
/// is positive).
inline double step_settling_time(const modes& m, double fraction) {
    const double dc = m.gain_slow + m.gain_fast;
    return decay_crossing(m, m.gain_slow / dc, m.gain_fast / dc, fraction);
}

/// The output over one period of the steady state for an input at v_high for
/// t_high, then 0 for t_low: its extremes relative to the value when the input
/// steps high, and their difference (the peak-to-peak ripple).
struct periodic_output {
    double at_rise = 0.0;  ///< output when the input steps high
    double lowest = 0.0;   ///< smallest output minus at_rise (<= 0)
    double highest = 0.0;  ///< largest output minus at_rise (>= 0)
    double ripple = 0.0;   ///< highest - lowest
};

/// The periodic steady state of the ladder's output. Each mode is a first-order
/// stage driven between g v_high and 0 (rc::periodic_steady_state). Within an
/// interval the output minus its value at the interval's start is
/// sum_i k_i (1 - e^(-t/tau_i)); its derivative vanishes where
/// k_s/tau_s e^(-t/tau_s) = -k_f/tau_f e^(-t/tau_f), i.e. at
/// t* = ln(-(k_f tau_s)/(k_s tau_f)) / (1/tau_f - 1/tau_s) when the two terms have
/// opposite signs. The extremes are the larger and smaller of the interval ends and
/// t* where it falls inside: exact, no sampling.
inline periodic_output periodic_steady_state(const modes& m, double v_high, double t_high, double t_low) {
    const auto s = rc::periodic_steady_state(m.gain_slow * v_high, 0.0, t_high, t_low, m.tau_slow);
    const auto f = rc::periodic_steady_state(m.gain_fast * v_high, 0.0, t_high, t_low, m.tau_fast);
    periodic_output out;
    out.at_rise = s.at_rise + f.at_rise;
    const double rate = 1.0 / m.tau_fast - 1.0 / m.tau_slow;
    // The change within an interval of length len from amplitudes k_s, k_f.
    auto change = [&](double k_s, double k_f, double t) {
        return k_s * rc::voltage_at(0.0, 1.0, m.tau_slow, t) + k_f * rc::voltage_at(0.0, 1.0, m.tau_fast, t);
    };
    auto visit = [&](double base, double k_s, double k_f, double len) {
        const double end = base + change(k_s, k_f, len);
        out.lowest = std::min(out.lowest, end);
        out.highest = std::max(out.highest, end);
        const double q = -(k_f * m.tau_slow) / (k_s * m.tau_fast);
        if (q > 1.0) {
            const double t = std::log(q) / rate;
            if (t < len) {
                const double v = base + change(k_s, k_f, t);
                out.lowest = std::min(out.lowest, v);
                out.highest = std::max(out.highest, v);
            }
        }
        return end;
    };
    // High interval: each mode moves by its rise gap times (1 - e^(-t/tau)); low
    // interval: by minus its fall gap (towards 0) from the end of the high interval.
    const double after_high = visit(0.0, s.rise_gap, f.rise_gap, t_high);
    (void)visit(after_high, -s.fall_gap, -f.fall_gap, t_low);
    out.ripple = out.highest - out.lowest;
    return out;
}

}  // namespace tauforge::detail::two_stage
