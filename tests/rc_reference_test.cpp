// Tests of rc.hpp against independent numerical references:
//  - the closed forms evaluated in Boost.Multiprecision cpp_bin_float_50 from the same
//    double inputs (differences of the doubles are exact there);
//  - Boost.Odeint integration of dv/dt = (u(t) - v)/tau, and of the capacitor node equation
//    with a shunt resistor or a leakage current, with the threshold crossing located by event
//    detection (sign change over a step, bisection on the dense output).
// No reference here calls tauforge. Random cases come from std::mt19937_64 (its sequence is
// standardized) through the transforms below, never from std::*_distribution.
// Set TAUFORGE_TEST_REPORT=1 to print the worst error each test measured.
#include "approx.hpp"

#include <tauforge/rc.hpp>

#include <boost/multiprecision/cpp_bin_float.hpp>
#include <boost/numeric/odeint.hpp>

#include <doctest/doctest.h>

#include <algorithm>
#include <array>
#include <bit>
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <random>
#include <string>
#include <vector>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

using mp = boost::multiprecision::cpp_bin_float_50;

// ---------------------------------------------------------------- reproducible inputs

/// [0, 1) from the top 53 bits of the engine's output.
double unit_draw(std::mt19937_64& g) { return static_cast<double>(g() >> 11) * 0x1p-53; }
double uniform_draw(std::mt19937_64& g, double lo, double hi) { return lo + (hi - lo) * unit_draw(g); }
/// Log-uniform in [lo, hi).
double log_uniform_draw(std::mt19937_64& g, double lo, double hi) {
    return lo * std::exp(std::log(hi / lo) * unit_draw(g));
}

// ---------------------------------------------------------------- bookkeeping

/// The largest error seen and the case it came from; a NaN error sticks.
struct worst_error {
    double error = 0.0;
    std::string where;
    template <class Describe>
    void update(double e, Describe&& describe) {
        if (std::isnan(error)) return;
        if (!(e <= error)) {
            error = e;
            where = describe();
        }
    }
};

/// Assert the worst error is within `allowed`, naming the case on failure.
void check_worst(const std::string& what, const worst_error& w, double allowed) {
    if (std::getenv("TAUFORGE_TEST_REPORT")) MESSAGE(what << ": worst error " << w.error << " at " << w.where);
    INFO(what << ": worst error " << w.error << " (allowed " << allowed << ") at " << w.where);
    CHECK(w.error <= allowed);
}

double rel_error(const mp& value, const mp& reference) {
    if (value == reference) return 0.0;
    return static_cast<double>(abs(value - reference) / abs(reference));
}

std::string text(double v) { return tauforge_test::full(v); }

voltage volts(double v) { return voltage::from_value(v); }
duration seconds(double t) { return duration::from_value(t); }

// ---------------------------------------------------------------- step cases

struct step_case {
    double vs, vf, vth, tau;
    std::string describe() const {
        return "vs = " + text(vs) + ", vf = " + text(vf) + ", vth = " + text(vth) + ", tau = " + text(tau);
    }
};

enum class placement { interior, near_start, near_final, graded };

/// Voltages uniform in [-20, 20] V, tau log-uniform in [1 ns, 100 s], the threshold placed
/// strictly between start and final value: uniformly (interior), within 1e-15..1e-9 of the step
/// from the start or the final value, or at a log-uniform 1e-9..0.5 of the step from either end.
step_case draw_step_case(std::mt19937_64& g, placement where) {
    for (;;) {
        const double vs = uniform_draw(g, -20.0, 20.0), vf = uniform_draw(g, -20.0, 20.0);
        const double tau = log_uniform_draw(g, 1e-9, 100.0);
        const double step = vf - vs;
        double vth = vs;
        switch (where) {
            case placement::interior: vth = vs + unit_draw(g) * step; break;
            case placement::near_start: vth = vs + log_uniform_draw(g, 1e-15, 1e-9) * step; break;
            case placement::near_final: vth = vf - log_uniform_draw(g, 1e-15, 1e-9) * step; break;
            case placement::graded: {
                const double q = log_uniform_draw(g, 1e-9, 0.5);
                vth = unit_draw(g) < 0.5 ? vs + q * step : vf - q * step;
                break;
            }
        }
        if ((vs < vth && vth < vf) || (vf < vth && vth < vs)) return {vs, vf, vth, tau};
    }
}

std::vector<step_case> draw_step_cases(std::uint64_t seed, int per_placement) {
    std::mt19937_64 g(seed);
    std::vector<step_case> cases;
    for (placement where : {placement::interior, placement::near_start, placement::near_final, placement::graded})
        for (int i = 0; i < per_placement; ++i) cases.push_back(draw_step_case(g, where));
    return cases;
}

/// ln((vs - vf) / (vth - vf)) in 50 digits from the double inputs.
mp log_ratio_reference(double vs, double vf, double vth) {
    return log((mp(vs) - mp(vf)) / (mp(vth) - mp(vf)));
}

/// v(t) = vf + (vs - vf) e^(-t/tau) in 50 digits.
mp step_voltage_reference(double vs, double vf, double tau, double t) {
    return mp(vf) + (mp(vs) - mp(vf)) * exp(-mp(t) / mp(tau));
}

/// The size of the rounding error any double evaluation of v = vs w + vf (1 - w), w = e^(-t/tau),
/// must be allowed, in units of the unit roundoff: the convex combination's own terms, plus the
/// sensitivity x w |vs - vf| to the rounding of x = t / tau. Derivation: perturbing vs, vf and x
/// by relative eps changes v by eps (|vs| w + |vf| (1 - w) + x w |vs - vf|) to first order.
double step_voltage_scale(double vs, double vf, double tau, double t) {
    const double x = t / tau, w = std::exp(-x);
    return std::abs(vs) * w + std::abs(vf) * (1.0 - w) + x * w * std::abs(vs - vf);
}

// ---------------------------------------------------------------- ramp cases

struct ramp_case {
    double v_begin, v_end, rise, v_cap0, vth, tau;
    ramp_input input() const { return {volts(v_begin), volts(v_end), seconds(rise)}; }
    std::string describe() const {
        return "v_begin = " + text(v_begin) + ", v_end = " + text(v_end) + ", rise = " + text(rise) +
               ", v_cap0 = " + text(v_cap0) + ", vth = " + text(vth) + ", tau = " + text(tau);
    }
    /// The capacitor first moves away from v_end: v_begin lies beyond v_cap0 on the far side.
    bool moves_away() const { return (v_end > v_cap0) ? v_begin < v_cap0 : v_begin > v_cap0; }
};

/// tau log-uniform in [1 ns, 100 s], rise_time / tau log-uniform in [1e-4, 1e4], voltages uniform in
/// [-20, 20] V; a third of the cases start at the ramp's beginning (power-on), a third start between
/// v_begin and v_end (the capacitor first moves away), the rest anywhere. The threshold is placed
/// between v_cap0 and v_end as for the step cases.
ramp_case draw_ramp_case(std::mt19937_64& g, placement where, int start_kind) {
    for (;;) {
        const double tau = log_uniform_draw(g, 1e-9, 100.0);
        const double rise = tau * log_uniform_draw(g, 1e-4, 1e4);
        const double vb = uniform_draw(g, -20.0, 20.0), ve = uniform_draw(g, -20.0, 20.0);
        double v0 = uniform_draw(g, -20.0, 20.0);
        if (start_kind == 1) v0 = vb;
        if (start_kind == 2) v0 = vb + uniform_draw(g, 0.05, 0.95) * (ve - vb);
        const double step = ve - v0;
        double vth = v0;
        switch (where) {
            case placement::interior: vth = v0 + unit_draw(g) * step; break;
            case placement::near_start: vth = v0 + log_uniform_draw(g, 1e-15, 1e-9) * step; break;
            case placement::near_final: vth = ve - log_uniform_draw(g, 1e-15, 1e-9) * step; break;
            case placement::graded: {
                const double q = log_uniform_draw(g, 1e-9, 0.5);
                vth = unit_draw(g) < 0.5 ? v0 + q * step : ve - q * step;
                break;
            }
        }
        if ((v0 < vth && vth < ve) || (ve < vth && vth < v0)) return {vb, ve, rise, v0, vth, tau};
    }
}

std::vector<ramp_case> draw_ramp_cases(std::uint64_t seed, int per_kind) {
    std::mt19937_64 g(seed);
    std::vector<ramp_case> cases;
    for (placement where : {placement::interior, placement::near_start, placement::near_final, placement::graded})
        for (int start_kind = 0; start_kind < 3; ++start_kind)
            for (int i = 0; i < per_kind; ++i) cases.push_back(draw_ramp_case(g, where, start_kind));
    return cases;
}

/// Capacitor voltage for the ramp input in 50 digits. Derivation: with u(t) = vb + s t,
/// s = (ve - vb) / rise, the solution of tau v' = u - v with v(0) = v0 is
/// v(t) = u(t) - s tau + (v0 - vb + s tau) e^(-t/tau) (substitute: tau v' = s tau - (v0 - vb + s tau)
/// e^(-t/tau) = u - v). After the ramp it is the step response from v(rise) towards ve.
mp ramp_voltage_reference(const ramp_case& c, const mp& t) {
    const mp tau = c.tau, vb = c.v_begin, ve = c.v_end, v0 = c.v_cap0, rise = c.rise;
    if (c.rise == 0.0) return ve + (v0 - ve) * exp(-t / tau);
    const mp s = (ve - vb) / rise;
    const auto during = [&](const mp& tt) { return vb + s * tt - s * tau + (v0 - vb + s * tau) * exp(-tt / tau); };
    if (t <= rise) return during(t);
    return ve + (during(rise) - ve) * exp(-(t - rise) / tau);
}

double from_bits(std::uint64_t b) { return std::bit_cast<double>(b); }
std::uint64_t to_bits(double d) { return std::bit_cast<std::uint64_t>(d); }

/// The first crossing of vth in 50 digits. g(t) = sign (v(t) - vth) is negative at t = 0.
/// If g(rise) < 0 the crossing is after the ramp, in closed form. Otherwise g has exactly one
/// zero in (0, rise]: during the ramp tau v'' = s - v', so v' - s = (v'(0) - s) e^(-t/tau) is
/// monotone and v is convex or concave there; a convex or concave function that is negative at 0
/// and non-negative at rise changes sign exactly once. The zero is found by bisection over the
/// ordered bit patterns of the doubles in [0, rise], then by linear interpolation between the two
/// neighbouring doubles (error far below one ulp).
mp ramp_crossing_reference(const ramp_case& c) {
    const mp sign = c.v_end > c.v_cap0 ? 1 : -1;
    const auto g = [&](double t) { return sign * (ramp_voltage_reference(c, mp(t)) - mp(c.vth)); };
    if (c.rise == 0.0 || g(c.rise) < 0) {
        const mp v_rise = ramp_voltage_reference(c, mp(c.rise));
        return mp(c.rise) + mp(c.tau) * log((v_rise - mp(c.v_end)) / (mp(c.vth) - mp(c.v_end)));
    }
    std::uint64_t lo = to_bits(0.0), hi = to_bits(c.rise);
    while (hi - lo > 1) {
        const std::uint64_t mid = lo + (hi - lo) / 2;
        (g(from_bits(mid)) < 0 ? lo : hi) = mid;
    }
    const mp a = from_bits(lo), b = from_bits(hi), ga = g(from_bits(lo)), gb = g(from_bits(hi));
    return a + (b - a) * (-ga / (gb - ga));
}

// ---------------------------------------------------------------- Boost.Odeint references

namespace odeint = boost::numeric::odeint;
using ode_state = std::array<double, 1>;

/// Integration of dy/ds = rhs(s, y) with runge_kutta_dopri5, error control 1e-12 absolute and
/// 1e-12 relative, dense output. Starts with a tiny step so that the first steps resolve a
/// crossing close to s0 (the controller then grows the step at most fivefold per step).
template <class Rhs>
class ode_path {
public:
    ode_path(Rhs rhs, double s0, double y0)
        : rhs_(rhs), stepper_(odeint::make_dense_output(1e-12, 1e-12, odeint::runge_kutta_dopri5<ode_state>())),
          s0_(s0), y0_(y0) {
        stepper_.initialize(ode_state{y0}, s0, s0 > 0.0 ? 1e-13 * s0 : 1e-16);
    }

    /// y(s), for s not before the start of the last step taken.
    double at(double s) {
        if (s == s0_) return y0_;
        while (stepper_.current_time() < s) step();
        ode_state y;
        stepper_.calc_state(s, y);
        return y[0];
    }

    /// The first s in (s0, s_end] where y reaches `target` (y(s0) must lie on one side of it):
    /// event detection by the sign of y - target at each step's end, then bisection on the
    /// dense output to a relative width of 1e-16. Returns a negative value if not reached.
    double first_crossing(double target, double s_end) {
        const double side = y0_ < target ? -1.0 : 1.0;
        const auto before = [&](double y) { return (y - target) * side > 0.0; };
        while (stepper_.current_time() < s_end) {
            step();
            const double b = std::min(stepper_.current_time(), s_end);
            ode_state y;
            stepper_.calc_state(b, y);
            if (!before(y[0])) {
                double lo = stepper_.previous_time(), hi = b;
                for (int i = 0; i < 200 && hi - lo > 1e-16 * hi; ++i) {
                    const double mid = lo + (hi - lo) / 2.0;
                    if (mid == lo || mid == hi) break;
                    stepper_.calc_state(mid, y);
                    (before(y[0]) ? lo : hi) = mid;
                }
                return lo + (hi - lo) / 2.0;
            }
        }
        return -1.0;
    }

private:
    void step() {
        auto system = [this](const ode_state& y, ode_state& dy, double s) { dy[0] = rhs_(s, y[0]); };
        stepper_.do_step(system);
    }
    Rhs rhs_;
    decltype(odeint::make_dense_output(1e-12, 1e-12, odeint::runge_kutta_dopri5<ode_state>())) stepper_;
    double s0_, y0_;
};

template <class Rhs>
ode_path<Rhs> make_path(Rhs rhs, double s0, double y0) {
    return ode_path<Rhs>(rhs, s0, y0);
}

/// The variables the ramp case is integrated in: time s = t / tau, voltage
/// y = (v - origin) / scale, where origin is v_cap0 or v_end, whichever is nearer the
/// threshold, and scale = |vth - origin|; the integrator's relative error control then
/// acts on the small distance that decides the crossing. dv/dt = (u(t) - v)/tau becomes
/// dy/ds = (u - origin)/scale - y, with u - origin = (vb - origin)(1 - s/r) + (ve - origin) s/r
/// during the ramp (r = rise / tau; exact at both ends) and ve - origin after it.
struct ramp_ode {
    double origin, scale, target, y0, r, a_begin, a_end;
    explicit ramp_ode(const ramp_case& c)
        : origin(std::abs(c.vth - c.v_cap0) <= std::abs(c.vth - c.v_end) ? c.v_cap0 : c.v_end),
          scale(std::abs(c.vth - origin)),
          target((c.vth - origin) / scale),
          y0((c.v_cap0 - origin) / scale),
          r(c.rise / c.tau),
          a_begin((c.v_begin - origin) / scale),
          a_end((c.v_end - origin) / scale) {}
    /// During the ramp, continued linearly past s = r so that a step overshooting r stays smooth.
    auto ramp_rhs() const {
        return [a0 = a_begin, a1 = a_end, r = r](double s, double y) {
            const double p = s / r;
            return a0 * (1.0 - p) + a1 * p - y;
        };
    }
    auto hold_rhs() const {
        return [a1 = a_end](double, double y) { return a1 - y; };
    }
};

/// First crossing time of the threshold by Odeint; negative if not found within 1000 tau after the ramp.
double ode_ramp_crossing(const ramp_case& c) {
    const ramp_ode ode(c);
    double s_hold = 0.0, y_hold = ode.y0;
    if (ode.r > 0.0) {
        auto ramp = make_path(ode.ramp_rhs(), 0.0, ode.y0);
        const double s = ramp.first_crossing(ode.target, ode.r);
        if (s >= 0.0) return s * c.tau;
        s_hold = ode.r;
        y_hold = ramp.at(ode.r);
    }
    auto hold = make_path(ode.hold_rhs(), s_hold, y_hold);
    const double s = hold.first_crossing(ode.target, s_hold + 1000.0);
    return s >= 0.0 ? s * c.tau : -1.0;
}

/// Capacitor voltages at the times t_over_tau (ascending) by Odeint, in plain volts.
std::vector<double> ode_ramp_voltages(const ramp_case& c, const std::vector<double>& t_over_tau) {
    const double r = c.rise / c.tau;
    const auto ramp = [vb = c.v_begin, ve = c.v_end, r](double s, double v) {
        const double p = s / r;
        return vb * (1.0 - p) + ve * p - v;
    };
    const auto hold = [ve = c.v_end](double, double v) { return ve - v; };
    std::vector<double> out;
    auto during = make_path(ramp, 0.0, c.v_cap0);
    std::size_t i = 0;
    for (; i < t_over_tau.size() && t_over_tau[i] <= r; ++i) out.push_back(during.at(t_over_tau[i]));
    auto after = make_path(hold, r, r > 0.0 ? during.at(r) : c.v_cap0);
    for (; i < t_over_tau.size(); ++i) out.push_back(after.at(t_over_tau[i]));
    return out;
}

}  // namespace

// ================================================================ 1. closed form, 50 digits

TEST_CASE("step response: crossing_time, time_constant_for and voltage_at match the closed form in 50 digits") {
    // Reference: Boost.Multiprecision cpp_bin_float_50 closed form t = tau ln((vs - vf)/(vth - vf))
    // from the same double inputs; tau = t / ln(...) for the inverse; v = vf + (vs - vf) e^(-t/tau).
    const auto cases = draw_step_cases(20240611, 300);
    int rising = 0, falling = 0, near_start = 0, near_final = 0;
    worst_error crossing, kernel_crossing, inverse, voltage_same_sign, voltage_scaled, kernel_voltage;
    for (const auto& c : cases) {
        const mp dv = abs(mp(c.vf) - mp(c.vs));
        (c.vf > c.vs ? rising : falling) += 1;
        if (abs(mp(c.vth) - mp(c.vs)) <= 1e-9 * dv) ++near_start;
        if (abs(mp(c.vth) - mp(c.vf)) <= 1e-9 * dv) ++near_final;
        const auto describe = [&] { return c.describe(); };

        const mp t_ref = mp(c.tau) * log_ratio_reference(c.vs, c.vf, c.vth);
        const double t = crossing_time(volts(c.vs), volts(c.vf), volts(c.vth), seconds(c.tau)).value();
        crossing.update(rel_error(t, t_ref), describe);
        kernel_crossing.update(rel_error(detail::rc::crossing_time(c.vs, c.vf, c.vth, c.tau), t_ref), describe);

        // The inverse at the double nearest the reference crossing time.
        const double t_in = static_cast<double>(t_ref);
        const mp tau_ref = mp(t_in) / log_ratio_reference(c.vs, c.vf, c.vth);
        inverse.update(rel_error(time_constant_for(volts(c.vs), volts(c.vf), volts(c.vth), seconds(t_in)).value(),
                                 tau_ref),
                       describe);

        // The voltage at that time: relative to itself where start and final value have the same sign
        // (then |v| bounds every term), else relative to step_voltage_scale (cancellation in the exact v).
        const mp v_ref = step_voltage_reference(c.vs, c.vf, c.tau, t_in);
        const double v = voltage_at(volts(c.vs), volts(c.vf), seconds(c.tau), seconds(t_in)).value();
        if (c.vs * c.vf >= 0.0) voltage_same_sign.update(rel_error(v, v_ref), describe);
        const double scale = step_voltage_scale(c.vs, c.vf, c.tau, t_in);
        voltage_scaled.update(static_cast<double>(abs(mp(v) - v_ref) / scale), describe);
        kernel_voltage.update(
            static_cast<double>(abs(mp(detail::rc::voltage_at(c.vs, c.vf, c.tau, t_in)) - v_ref) / scale), describe);
    }
    CHECK(cases.size() >= 1000);
    CHECK(rising >= 100);
    CHECK(falling >= 100);
    CHECK(near_start >= 100);
    CHECK(near_final >= 100);
    check_worst("crossing_time vs cpp_bin_float_50", crossing, 1e-13);
    check_worst("detail::rc::crossing_time vs cpp_bin_float_50", kernel_crossing, 1e-13);
    check_worst("time_constant_for vs cpp_bin_float_50", inverse, 1e-13);
    check_worst("voltage_at vs cpp_bin_float_50, same-sign cases, relative", voltage_same_sign, 1e-13);
    check_worst("voltage_at vs cpp_bin_float_50, relative to the condition scale", voltage_scaled, 1e-13);
    check_worst("detail::rc::voltage_at vs cpp_bin_float_50, condition scale", kernel_voltage, 1e-13);
}

TEST_CASE("voltage_at keeps full relative precision just after leaving 0 V and just before reaching 0 V") {
    // Reference: Boost.Multiprecision cpp_bin_float_50 closed form. Leaving vs = 0 V, v(t) is about
    // vf t / tau: evaluated as vf + (vs - vf) e^(-t/tau) it would keep only an absolute error of
    // eps |vf|, a relative error of eps tau / t. Approaching vf = 0 V, v = vs e^(-t/tau) is a product.
    std::mt19937_64 g(7);
    worst_error leaving, arriving;
    for (int i = 0; i < 200; ++i) {
        const double v_other = uniform_draw(g, -20.0, 20.0), tau = log_uniform_draw(g, 1e-9, 100.0);
        const double t_leave = tau * log_uniform_draw(g, 1e-12, 0.69);
        const double t_arrive = tau * uniform_draw(g, 0.7, 40.0);
        const auto describe = [&] { return "v = " + text(v_other) + ", tau = " + text(tau); };
        leaving.update(rel_error(voltage_at(0_V, volts(v_other), seconds(tau), seconds(t_leave)).value(),
                                 step_voltage_reference(0.0, v_other, tau, t_leave)),
                       describe);
        arriving.update(rel_error(voltage_at(volts(v_other), 0_V, seconds(tau), seconds(t_arrive)).value(),
                                  step_voltage_reference(v_other, 0.0, tau, t_arrive)),
                        describe);
    }
    // Allowed: a few roundings plus x eps from rounding x = t / tau (x <= 40).
    check_worst("voltage_at leaving 0 V, relative", leaving, 1e-14);
    check_worst("voltage_at arriving at 0 V, relative", arriving, 1e-14);
}

TEST_CASE("ramp input: crossing_time and voltage_at match the closed form in 50 digits") {
    // Reference: Boost.Multiprecision cpp_bin_float_50 closed form of the ramp response
    // (derivation at ramp_voltage_reference), crossing by bisection on the doubles in 50 digits.
    // Required: 1e-12 relative for the crossing time.
    const auto cases = draw_ramp_cases(99, 40);
    int during = 0, after = 0, away = 0;
    worst_error crossing, kernel_crossing, voltage;
    for (const auto& c : cases) {
        const auto describe = [&] { return c.describe(); };
        const mp t_ref = ramp_crossing_reference(c);
        (t_ref <= c.rise ? during : after) += 1;
        if (c.moves_away() && t_ref <= c.rise) ++away;
        const double t = crossing_time(c.input(), volts(c.v_cap0), volts(c.vth), seconds(c.tau)).value();
        crossing.update(rel_error(t, t_ref), describe);
        kernel_crossing.update(
            rel_error(detail::rc::ramp_crossing_time(c.v_begin, c.v_end, c.rise, c.v_cap0, c.vth, c.tau), t_ref),
            describe);
        // Voltages during and after the ramp, relative to the largest voltage of the case (the
        // result is an absolute voltage: a change far smaller than v_cap0 cannot be resolved in it).
        const double v_scale = std::max({std::abs(c.v_begin), std::abs(c.v_end), std::abs(c.v_cap0)});
        for (double t_probe : {0.3 * c.rise, c.rise, c.rise + 0.5 * c.tau, c.rise + 5.0 * c.tau}) {
            const double v = voltage_at(c.input(), volts(c.v_cap0), seconds(c.tau), seconds(t_probe)).value();
            voltage.update(static_cast<double>(abs(mp(v) - ramp_voltage_reference(c, mp(t_probe))) / v_scale),
                           [&] { return c.describe() + ", t = " + text(t_probe); });
        }
    }
    CHECK(during >= 100);
    CHECK(after >= 100);
    CHECK(away >= 20);
    check_worst("ramp crossing_time vs cpp_bin_float_50", crossing, 1e-12);
    check_worst("detail::rc::ramp_crossing_time vs cpp_bin_float_50", kernel_crossing, 1e-12);
    check_worst("ramp voltage_at vs cpp_bin_float_50, relative to the largest voltage", voltage, 1e-13);
}

TEST_CASE("detail::rc::ramp_lag_term is x + expm1(-x) without cancellation") {
    // Reference: Boost.Multiprecision cpp_bin_float_50 x + expm1(-x) (50 digits absorb the
    // cancellation down to x = 1e-12). The kernel switches from its series to the direct form at x = 0.1.
    std::mt19937_64 g(17);
    worst_error lag;
    // Down to x = 1e-150: below about 1e-154, x^2 / 2 itself is subnormal and has no relative precision.
    std::vector<double> xs{0.1, std::nextafter(0.1, 0.0), std::nextafter(0.1, 1.0), 1e-150, 1e-20};
    for (int i = 0; i < 2000; ++i) xs.push_back(log_uniform_draw(g, 1e-12, 50.0));
    for (double x : xs) {
        const mp m = x;
        // Below x = 1e-12 the 50-digit difference would cancel more than 24 digits: use the Taylor
        // series x^2/2 - x^3/6 + x^4/24 there instead (remainder below x^5/120, relative 1e-37).
        const mp reference = x >= 1e-12 ? m + expm1(-m) : m * m / 2 - m * m * m / 6 + m * m * m * m / 24;
        lag.update(rel_error(detail::rc::ramp_lag_term(x), reference), [&] { return "x = " + text(x); });
    }
    CHECK(detail::rc::ramp_lag_term(0.0) == 0.0);
    check_worst("ramp_lag_term vs cpp_bin_float_50", lag, 1e-14);
}

TEST_CASE("ramp input of zero rise time is the step response") {
    // Reference: Boost.Multiprecision cpp_bin_float_50 closed form of the step from v_cap_start towards v_end.
    const ramp_input step{0_V, 5_V, 0_s};
    const double tau = 1e-3;
    CHECK_REL(crossing_time(step, 1_V, 4_V, seconds(tau)).value(),
              static_cast<double>(mp(tau) * log(mp(1 - 5) / mp(4 - 5))), 1e-15);
    CHECK(voltage_at(step, 1_V, seconds(tau), 0_s).value() == 1.0);
    CHECK_REL(voltage_at(step, 1_V, seconds(tau), seconds(2 * tau)).value(),
              static_cast<double>(step_voltage_reference(1.0, 5.0, tau, 2 * tau)), 1e-15);
}

// ================================================================ 2. Boost.Odeint

TEST_CASE("step response: crossing_time and voltage_at agree with a Boost.Odeint integration") {
    // Reference: Boost.Odeint runge_kutta_dopri5 (1e-12 abs/rel) integration of dv/dt = (vf - v)/tau,
    // crossing by event detection and bisection on the dense output. Required: 1e-7 relative.
    const auto cases = draw_step_cases(31337, 50);
    worst_error crossing, voltage;
    for (const auto& c : cases) {
        const auto describe = [&] { return c.describe(); };
        const ramp_case as_ramp{c.vf, c.vf, 0.0, c.vs, c.vth, c.tau};
        const double t_ode = ode_ramp_crossing(as_ramp);
        REQUIRE(t_ode > 0.0);
        crossing.update(tauforge_test::rel_diff(
                            crossing_time(volts(c.vs), volts(c.vf), volts(c.vth), seconds(c.tau)).value(), t_ode),
                        describe);
        const std::vector<double> probes{0.5, 2.0, 10.0};
        const auto v_ode = ode_ramp_voltages(as_ramp, probes);
        const double v_scale = std::max(std::abs(c.vs), std::abs(c.vf));
        for (std::size_t i = 0; i < probes.size(); ++i) {
            const double v = voltage_at(volts(c.vs), volts(c.vf), seconds(c.tau), seconds(probes[i] * c.tau)).value();
            voltage.update(std::abs(v - v_ode[i]) / v_scale, describe);
        }
    }
    check_worst("crossing_time vs Boost.Odeint", crossing, 1e-7);
    check_worst("voltage_at vs Boost.Odeint, relative to the largest voltage", voltage, 1e-7);
}

TEST_CASE("ramp input: crossing_time and voltage_at agree with a Boost.Odeint integration") {
    // Reference: Boost.Odeint runge_kutta_dopri5 (1e-12 abs/rel) integration of
    // dv/dt = (u(t) - v)/tau, u rising or falling linearly from v_begin to v_end over rise_time,
    // then constant; crossing by event detection and bisection on the dense output.
    // Required: 1e-7 relative.
    auto cases = draw_ramp_cases(4242, 16);
    // Named cases besides the random ones (tau = 1 ms):
    cases.push_back({0.0, 5.0, 10e-3, 0.0, 2.5, 1e-3});      // power-on ramp, crossed during the ramp
    cases.push_back({0.0, 5.0, 10e-3, 0.0, 4.99, 1e-3});     // crossed after the ramp
    cases.push_back({0.0, 5.0, 1e-7, 0.0, 3.3, 1e-3});       // rise_time << tau: nearly a step
    cases.push_back({0.0, 5.0, 1e2, 0.0, 3.3, 1e-3});        // rise_time >> tau: the capacitor tracks the ramp
    cases.push_back({0.0, 5.0, 5e-3, 2.0, 3.0, 1e-3});       // v_cap_start above v_begin: first falls, then rises
    cases.push_back({0.0, 5.0, 5e-3, 2.0, 2.0 + 1e-12, 1e-3});  // ... and a threshold just above the start
    cases.push_back({5.0, 0.0, 10e-3, 5.0, 1.0, 1e-3});      // falling ramp, crossed during it
    cases.push_back({5.0, 0.0, 2e-3, 5.0, 0.01, 1e-3});      // falling ramp, crossed after it
    cases.push_back({5.0, 0.0, 4e-3, 3.0, 2.0, 1e-3});       // falling, v_cap_start below v_begin: first rises
    cases.push_back({12.0, -5.0, 3e-3, 12.0, -4.9, 1e-3});   // falling across 0 V, crossed after the ramp
    int during = 0, after = 0, away = 0, falling = 0, short_rise = 0, long_rise = 0;
    worst_error crossing, voltage;
    for (const auto& c : cases) {
        const auto describe = [&] { return c.describe(); };
        const double t_ode = ode_ramp_crossing(c);
        INFO(c.describe());
        REQUIRE(t_ode > 0.0);
        (t_ode <= c.rise ? during : after) += 1;
        if (c.moves_away() && t_ode <= c.rise) ++away;
        if (c.v_end < c.v_begin) ++falling;
        if (c.rise < 0.01 * c.tau) ++short_rise;
        if (c.rise > 100.0 * c.tau) ++long_rise;
        crossing.update(tauforge_test::rel_diff(
                            crossing_time(c.input(), volts(c.v_cap0), volts(c.vth), seconds(c.tau)).value(), t_ode),
                        describe);
        const double r = c.rise / c.tau;
        const std::vector<double> probes{0.25 * r, 0.5 * r, r, r + 0.5, r + 3.0};
        const auto v_ode = ode_ramp_voltages(c, probes);
        const double v_scale = std::max({std::abs(c.v_begin), std::abs(c.v_end), std::abs(c.v_cap0)});
        for (std::size_t i = 0; i < probes.size(); ++i) {
            const double v =
                voltage_at(c.input(), volts(c.v_cap0), seconds(c.tau), seconds(probes[i] * c.tau)).value();
            voltage.update(std::abs(v - v_ode[i]) / v_scale, describe);
        }
    }
    CHECK(during >= 20);
    CHECK(after >= 20);
    CHECK(away >= 10);
    CHECK(falling >= 20);
    CHECK(short_rise >= 10);
    CHECK(long_rise >= 10);
    check_worst("ramp crossing_time vs Boost.Odeint", crossing, 1e-7);
    check_worst("ramp voltage_at vs Boost.Odeint, relative to the largest voltage", voltage, 1e-7);
}

// ================================================================ 3. Thevenin reductions

namespace {

/// The node equation in s = t / (r_source c): C dv/dt = (v_source - v)/r_source + extra(v), i.e.
/// dv/ds = v_source - v + r_source extra(v). Returns the final voltage (integrated until the
/// remaining transient is below e^(-60)) given the decay rate k of the homogeneous equation.
template <class Rhs>
double ode_final_voltage(Rhs rhs, double k) {
    auto path = make_path(rhs, 0.0, 0.0);
    return path.at(60.0 / k);
}

}  // namespace

TEST_CASE("with_shunt gives the final voltage and time constant of the two-resistor node") {
    // Reference: Boost.Odeint runge_kutta_dopri5 (1e-12 abs/rel) integration of the node equation
    // C dv/dt = (v_source - v)/r_source + (v_shunt - v)/r_shunt from v = 0 V; final voltage after
    // 60 decay constants, crossings by event detection. Required: 1e-7 relative.
    std::mt19937_64 g(5);
    worst_error final_v, crossing, tau_err;
    int cases = 0;
    while (cases < 40) {
        const double vs = uniform_draw(g, -20.0, 20.0), vsh = uniform_draw(g, -20.0, 20.0);
        const double rs = log_uniform_draw(g, 100.0, 10e6), rp = log_uniform_draw(g, 100.0, 10e6);
        const double c = log_uniform_draw(g, 10e-12, 100e-6);
        const double k = 1.0 + rs / rp;  // dv/ds = (vs - v) + (vsh - v) rs/rp: decay rate 1 + rs/rp
        const auto node = [vs, vsh, ratio = rs / rp](double, double v) { return (vs - v) + (vsh - v) * ratio; };
        const double v_inf = ode_final_voltage(node, k);
        const double v_scale = std::max(std::abs(vs), std::abs(vsh));
        if (std::abs(v_inf) < 0.05 * v_scale) continue;  // keep clear of an almost cancelled final value
        ++cases;
        const auto describe = [&] {
            return "vs = " + text(vs) + ", rs = " + text(rs) + ", c = " + text(c) + ", rp = " + text(rp) +
                   ", vsh = " + text(vsh);
        };
        const rc_drive drive = with_shunt(volts(vs), resistance::from_value(rs), capacitance::from_value(c),
                                          resistance::from_value(rp), volts(vsh));
        final_v.update(std::abs(drive.v_final.value() - v_inf) / v_scale, describe);
        // 1 - 1/e of the way is reached after exactly one time constant.
        const std::array<double, 2> fractions{1.0 - std::exp(-1.0), uniform_draw(g, 0.02, 0.98)};
        for (std::size_t i = 0; i < fractions.size(); ++i) {
            const double vth = fractions[i] * v_inf;
            auto path = make_path(node, 0.0, 0.0);
            const double t_ode = path.first_crossing(vth, 100.0) * rs * c;
            REQUIRE(t_ode > 0.0);
            crossing.update(tauforge_test::rel_diff(crossing_time(0_V, drive.v_final, volts(vth), drive.tau).value(),
                                                    t_ode),
                            describe);
            if (i == 0) tau_err.update(tauforge_test::rel_diff(drive.tau.value(), t_ode), describe);
        }
    }
    check_worst("with_shunt final voltage vs Boost.Odeint, relative to the largest source", final_v, 1e-7);
    check_worst("crossing time with with_shunt vs Boost.Odeint", crossing, 1e-7);
    check_worst("with_shunt tau vs Boost.Odeint time to 1 - 1/e", tau_err, 1e-7);
}

TEST_CASE("with_leakage_current gives the final voltage and time constant of the node with a current sink") {
    // Reference: Boost.Odeint runge_kutta_dopri5 (1e-12 abs/rel) integration of the node equation
    // C dv/dt = (v_source - v)/r_source - i_leak from v = 0 V. Required: 1e-7 relative.
    std::mt19937_64 g(11);
    worst_error final_v, crossing;
    int cases = 0;
    while (cases < 40) {
        const double vs = uniform_draw(g, -20.0, 20.0);
        const double rs = log_uniform_draw(g, 100.0, 10e6), c = log_uniform_draw(g, 10e-12, 100e-6);
        const double i_leak = uniform_draw(g, -10.0, 10.0) / rs;  // a drop of up to 10 V across r_source
        const auto node = [vs, drop = i_leak * rs](double, double v) { return (vs - v) - drop; };
        const double v_inf = ode_final_voltage(node, 1.0);
        const double v_scale = std::max(std::abs(vs), std::abs(i_leak * rs));
        if (std::abs(v_inf) < 0.05 * v_scale) continue;
        ++cases;
        const auto describe = [&] {
            return "vs = " + text(vs) + ", rs = " + text(rs) + ", c = " + text(c) + ", i_leak = " + text(i_leak);
        };
        const rc_drive drive = with_leakage_current(volts(vs), resistance::from_value(rs),
                                                    capacitance::from_value(c), current::from_value(i_leak));
        final_v.update(std::abs(drive.v_final.value() - v_inf) / v_scale, describe);
        for (double p : {1.0 - std::exp(-1.0), uniform_draw(g, 0.02, 0.98)}) {
            const double vth = p * v_inf;
            auto path = make_path(node, 0.0, 0.0);
            const double t_ode = path.first_crossing(vth, 100.0) * rs * c;
            REQUIRE(t_ode > 0.0);
            crossing.update(tauforge_test::rel_diff(crossing_time(0_V, drive.v_final, volts(vth), drive.tau).value(),
                                                    t_ode),
                            describe);
        }
    }
    check_worst("with_leakage_current final voltage vs Boost.Odeint", final_v, 1e-7);
    check_worst("crossing time with with_leakage_current vs Boost.Odeint", crossing, 1e-7);
}

TEST_CASE("a shunt that holds the capacitor below the threshold makes the crossing impossible") {
    // 5 V through 10 kOhm into 100 nF with 20 kOhm to ground: the node settles at 5 V * 20/30 = 3.333 V
    // (derivation: voltage divider), so a 3.5 V threshold is never reached. Reference for "never":
    // Boost.Odeint integration of C dv/dt = (5 V - v)/10 kOhm - v/20 kOhm over 50 r_source c.
    const rc_drive drive = with_shunt(5_V, 10_kohm, 100_nF, 20_kohm);
    CHECK_REL(drive.v_final.value(), 10.0 / 3.0, 1e-15);
    CHECK_REL(drive.tau.value(), 100e-9 * (10e3 * 20e3 / 30e3), 1e-15);
    const auto node = [](double, double v) { return (5.0 - v) - v * 0.5; };  // s = t / (10 kOhm 100 nF)
    auto path = make_path(node, 0.0, 0.0);
    CHECK(path.first_crossing(3.5, 50.0) < 0.0);
    CHECK_REL(path.at(50.0), 10.0 / 3.0, 1e-9);
    CHECK_THROWS_WITH_AS(crossing_time(0_V, drive.v_final, 3.5_V, drive.tau),
                         "crossing_time: v_threshold = 3.5 V is not reached from v_start = 0 V towards v_final = "
                         "3.33333 V; expected a threshold strictly between start and final value, or equal to the start",
                         tauforge::domain_error);
    // Without the shunt the same threshold is reached: 5 V (1 - e^(-t/RC)) = 3.5 V at RC ln(1/0.3).
    CHECK_REL(crossing_time(0_V, 5_V, 3.5_V, 10_kohm * 100_nF).value(), 1e-3 * std::log(1.0 / 0.3), 1e-14);
}
