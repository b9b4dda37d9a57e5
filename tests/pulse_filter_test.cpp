// Tests of networks/pulse_filter.hpp: the one-stage steady state against its
// derivation (written here) and the computed vectors of REFERENCES.md, settling
// against the textbook values, both filters against Boost.Odeint integration of
// their circuit equations over many periods of the pulse train (ripple, average,
// settling, the decay of the period average after a duty step), worst case against
// dense brute-force grids, the ripple/settling trade-off, synthesis re-checked by
// Odeint, and errors word for word.
// Set TAUFORGE_TEST_REPORT=1 to print the worst error each comparison measured.
#include "approx.hpp"
#include "ode_reference.hpp"
#include "random_cases.hpp"

#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/pulse_filter.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <doctest/doctest.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <limits>
#include <random>
#include <string>
#include <vector>

using namespace tauforge;
using namespace tauforge::literals;
namespace ode = tauforge_test::ode;

namespace {

using tauforge_test::unit;
using tauforge_test::log_uniform;

double uniform(std::mt19937_64& g, double lo, double hi) { return lo + (hi - lo) * unit(g); }

void report(const std::string& what, double worst) {
    const std::string text = what + ": worst relative error " + tauforge_test::full(worst);
    if (std::getenv("TAUFORGE_TEST_REPORT")) MESSAGE(text);
}

// Derivation (one stage, tau = RC, input V for T1 then 0 for T2, T = T1 + T2).
// Let v0 be the voltage when the input steps high. After the high interval
// v1 = V + (v0 - V) e^(-T1/tau); after the low interval v0 = v1 e^(-T2/tau). Solving,
//   v0 = V (e^(-T2/tau) - e^(-T/tau)) / (1 - e^(-T/tau))   (the minimum),
//   v1 = V (1 - e^(-T1/tau)) / (1 - e^(-T/tau))            (the maximum),
// and the ripple v1 - v0 = V (1 - e^(-T1/tau))(1 - e^(-T2/tau)) / (1 - e^(-T/tau)).
// At T1 = T2 = T/2, with a = e^(-T/(2 tau)): V (1 - a)^2 / (1 - a^2) = V (1 - a)/(1 + a)
// = V tanh(T / (4 tau)).
double ripple_formula(double v, double t1, double t2, double tau) {
    return v * (1 - std::exp(-t1 / tau)) * (1 - std::exp(-t2 / tau)) / (1 - std::exp(-(t1 + t2) / tau));
}

pulse_filter one_stage(double duty, double period) {
    pulse_filter f;
    f.input = {.high = ranged<voltage>::exactly(1_V), .width = ranged<double>::exactly(duty),
               .period = ranged<duration>::exactly(duration::from_value(period))};
    return f;
}

struct steady {
    double max, min, ripple, average;
};

/// Boost.Odeint, one stage: v' = (u - v)/tau, u = V while high; x[1] accumulates the
/// integral of v. Each interval is integrated on its own, `periods` times from v = V D.
steady ode_one_stage(double tau, double v, double t1, double t2, int periods) {
    auto high = [=](const ode::state<2>& x, double) { return ode::state<2>{(v - x[0]) / tau, x[0]}; };
    auto low = [=](const ode::state<2>& x, double) { return ode::state<2>{-x[0] / tau, x[0]}; };
    ode::state<2> x{v * t1 / (t1 + t2), 0.0};
    double hi = 0.0, lo = 0.0;
    for (int k = 0; k < periods; ++k) {
        x[1] = 0.0;
        x = ode::integrate<2>(high, x, 0.0, t1);
        hi = x[0];
        x = ode::integrate<2>(low, x, t1, t1 + t2);
        lo = x[0];
    }
    return {hi, lo, hi - lo, x[1] / (t1 + t2)};
}

/// The ladder's equations: C1 v1' = (u - v1)/R1 - (v1 - v2)/R2, C2 v2' = (v1 - v2)/R2;
/// x[2] accumulates the integral of v2.
struct ladder {
    double r1, c1, r2, c2;
    ode::state<3> rhs(const ode::state<3>& x, double u) const {
        return {((u - x[0]) / r1 - (x[0] - x[1]) / r2) / c1, (x[0] - x[1]) / (r2 * c2), x[1]};
    }
    /// R1 C1 + R1 C2 + R2 C2: the sum of the time constants (the coefficient of s in the
    /// characteristic polynomial P s^2 + S s + 1, P = R1 C1 R2 C2), at least the slow one.
    double sum() const { return r1 * c1 + r1 * c2 + r2 * c2; }
    /// The slow eigenvalue from P s^2 + S s + 1 = 0 (derivation: det(sI - A) of the
    /// equations above, times P): s = -2 / (S + sqrt(S^2 - 4 P)).
    double slow_rate() const {
        const double p = r1 * c1 * r2 * c2, s = sum();
        return -2.0 / (s + std::sqrt(s * s - 4 * p));
    }
};

/// Boost.Odeint, two stages: many periods to the steady state (20 times the sum of the
/// time constants, which is at least the slow one: the start's deviation shrinks by e^-20), then the last period with its extrema: the interval ends and every
/// point where v2' = 0, i.e. where v1 - v2 changes sign, located on the dense output.
steady ode_two_stage(const ladder& l, double v, double t1, double t2) {
    auto high = [=](const ode::state<3>& x, double) { return l.rhs(x, v); };
    auto low = [=](const ode::state<3>& x, double) { return l.rhs(x, 0.0); };
    const int periods = static_cast<int>(std::ceil(20.0 * l.sum() / (t1 + t2))) + 2;
    ode::state<3> x{v * t1 / (t1 + t2), v * t1 / (t1 + t2), 0.0};
    for (int k = 0; k < periods; ++k) {
        x = ode::integrate<3>(high, x, 0.0, t1);
        x = ode::integrate<3>(low, x, t1, t1 + t2);
    }
    x[2] = 0.0;
    double hi = x[1], lo = x[1];
    auto extremes = [&](auto f, const ode::state<3>& start, double a, double b) {
        auto p = ode::make_path<3>(f, start, a, b - a);
        p.roots([](const ode::state<3>& y) { return y[0] - y[1]; }, b, [&](double t) {
            const double y = p.at(t)[1];
            hi = std::max(hi, y), lo = std::min(lo, y);
        });
    };
    extremes(high, x, 0.0, t1);
    const auto mid = ode::integrate<3>(high, x, 0.0, t1);
    hi = std::max(hi, mid[1]), lo = std::min(lo, mid[1]);
    extremes(low, mid, t1, t1 + t2);
    const auto end = ode::integrate<3>(low, mid, t1, t1 + t2);
    return {hi, lo, hi - lo, end[2] / (t1 + t2)};
}

/// Boost.Odeint: the ladder's step response from rest with u = 1; the time it reaches 1 - eps.
double ode_two_stage_settling(const ladder& l, double eps) {
    auto f = [=](const ode::state<3>& x, double) { return l.rhs(x, 1.0); };
    auto p = ode::make_path<3>(f, ode::state<3>{0.0, 0.0, 0.0}, 0.0, l.sum());
    return *p.first_root([=](const ode::state<3>& x) { return x[1] - (1.0 - eps); }, 100.0 * l.sum());
}

}  // namespace

TEST_CASE("pulse_filter: the computed ripple vectors of REFERENCES.md") {
    // Computed (REFERENCES.md), V = 1: D 0.5, T/tau 0.1: 0.0249948; D 0.25, T/tau 1: 0.184636.
    const double tau = 1e-3;
    CHECK_REL(one_stage(0.5, 0.1 * tau).evaluate({1e3, 1e-6, 1.0, 0.5, 0.0, 0.1 * tau})[1], 0.0249948, 5e-6);
    CHECK_REL(one_stage(0.25, tau).evaluate({1e3, 1e-6, 1.0, 0.25, 0.0, tau})[1], 0.184636, 5e-6);
    // D = 1/2: V tanh(T / (4 tau)) (derivation above).
    for (double x : {1e-6, 1e-3, 0.1, 1.0, 4.0, 30.0})
        CHECK_REL(one_stage(0.5, x * tau).evaluate({1e3, 1e-6, 1.0, 0.5, 0.0, x * tau})[1], std::tanh(x / 4), 1e-13);
}

TEST_CASE("pulse_filter: steady-state ripple follows the derivation, and the small-ripple approximation") {
    std::mt19937_64 g(11);
    for (int n = 0; n < 200; ++n) {
        const double tau = log_uniform(g, 1e-6, 1.0), v = uniform(g, 0.5, 24.0), d = uniform(g, 0.02, 0.98);
        const double period = tau * log_uniform(g, 1e-2, 20.0);
        auto f = one_stage(d, period);
        f.input.high = ranged<voltage>::exactly(voltage::from_value(v));
        const auto m = f.evaluate({tau / 1e-6, 1e-6, v, d, 0.0, period});
        INFO("case " << n);
        CHECK_REL(m[pulse_filter::ripple], ripple_formula(v, d * period, (1 - d) * period, tau), 1e-12);  // derivation
        CHECK_REL(m[pulse_filter::average], v * d, 1e-15);
    }
    // Small ripple: V D (1 - D) T / tau (derivation: first order in T / tau), and full
    // precision even at T / tau = 1e-9, where 1 - e^(-x) would lose half the digits.
    for (double x : {1e-9, 1e-6, 1e-4}) {
        const double d = 0.3;
        const auto m = one_stage(d, x * 1e-3).evaluate({1e3, 1e-6, 1.0, d, 0.0, x * 1e-3});
        CHECK_REL(m[pulse_filter::ripple], d * (1 - d) * x, 2 * x);
    }
}

TEST_CASE("pulse_filter: settling takes tau ln(1/eps): 2.303, 4.605, 6.908 time constants") {
    // Textbook: 10 % 2.303 tau, 1 % 4.605 tau, 0.1 % 6.908 tau.
    const std::array<std::pair<double, double>, 3> cases{{{0.1, 2.303}, {0.01, 4.605}, {0.001, 6.908}}};
    for (const auto& [eps, k] : cases) {
        auto f = one_stage(0.5, 1e-4);
        f.settling_fraction = eps;
        CHECK_REL(f.evaluate({1e3, 1e-6, 1.0, 0.5, 0.0, 1e-4})[pulse_filter::settling], k * 1e-3, 2e-4);  // textbook
    }
}

TEST_CASE("pulse_filter: one stage agrees with Boost.Odeint over many periods within 1e-6") {
    double worst = 0.0;
    for (double x : {0.1, 0.5, 1.0, 3.0})
        for (double d : {0.1, 0.25, 0.5, 0.8}) {
            const double tau = 2e-3, period = x * tau, v = 3.3;
            auto f = one_stage(d, period);
            f.input.high = ranged<voltage>::exactly(3.3_V);
            const auto m = f.evaluate({2e3, 1e-6, v, d, 0.0, period});
            const int periods = static_cast<int>(std::ceil(30.0 / x));
            const auto ref = ode_one_stage(tau, v, d * period, (1 - d) * period, periods);
            INFO("T/tau " << x << " D " << d);
            CHECK_REL(m[pulse_filter::ripple], ref.ripple, 1e-6);    // Boost.Odeint
            CHECK_REL(m[pulse_filter::average], ref.average, 1e-6);  // Boost.Odeint
            worst = std::max({worst, tauforge_test::rel_diff(m[1], ref.ripple), tauforge_test::rel_diff(m[0], ref.average)});
        }
    report("one stage vs Odeint", worst);
}

TEST_CASE("pulse_filter: two stages agree with Boost.Odeint over many periods within 1e-6") {
    // Loading from light (R2 >> R1) to heavy (C2 >> C1), duty from 0.1 to 0.9.
    const std::array<ladder, 5> ls{{{1e3, 1e-6, 10e3, 100e-9},
                                    {1e3, 1e-6, 1e3, 1e-6},
                                    {10e3, 100e-9, 1e3, 1e-6},
                                    {4.7e3, 220e-9, 47e3, 22e-9},
                                    {2.2e3, 1e-6, 100, 4.7e-6}}};
    double worst_ripple = 0.0, worst_average = 0.0, worst_settling = 0.0;
    for (const auto& l : ls)
        for (double d : {0.1, 0.5, 0.9}) {
            const double v = 5.0, period = 0.4 * l.sum();
            two_stage_pulse_filter f;
            f.input = {.high = ranged<voltage>::exactly(5_V), .width = ranged<double>::exactly(d),
                       .period = ranged<duration>::exactly(duration::from_value(period))};
            const auto m = f.evaluate({l.r1, l.c1, l.r2, l.c2, v, d, 0.0, period});
            const auto ref = ode_two_stage(l, v, d * period, (1 - d) * period);
            const double settle = ode_two_stage_settling(l, 0.01);
            INFO("R1 " << l.r1 << " C1 " << l.c1 << " R2 " << l.r2 << " C2 " << l.c2 << " D " << d);
            CHECK_REL(m[1], ref.ripple, 1e-6);   // Boost.Odeint
            CHECK_REL(m[0], ref.average, 1e-6);  // Boost.Odeint
            CHECK_REL(m[2], settle, 1e-6);       // Boost.Odeint
            worst_ripple = std::max(worst_ripple, tauforge_test::rel_diff(m[1], ref.ripple));
            worst_average = std::max(worst_average, tauforge_test::rel_diff(m[0], ref.average));
            worst_settling = std::max(worst_settling, tauforge_test::rel_diff(m[2], settle));
        }
    report("two-stage ripple vs Odeint", worst_ripple);
    report("two-stage average vs Odeint", worst_average);
    report("two-stage settling vs Odeint", worst_settling);
}

TEST_CASE("pulse_filter: two-stage settling for 10 %, 1 %, 0.1 % against Boost.Odeint") {
    const ladder l{10e3, 100e-9, 22e3, 47e-9};
    for (double eps : {0.1, 0.01, 0.001}) {
        two_stage_pulse_filter f;
        f.settling_fraction = eps;
        f.input.period = ranged<duration>::exactly(1_ms);
        const double t = f.evaluate({l.r1, l.c1, l.r2, l.c2, 1.0, 0.5, 0.0, 1e-3})[2];
        CHECK_REL(t, ode_two_stage_settling(l, eps), 1e-6);  // Boost.Odeint
        // Its tail is the slow mode: later than tau_slow ln(1/eps), earlier than S ln(1/eps) + S.
        CHECK(t > -std::log(eps) / -l.slow_rate());
    }
}

TEST_CASE("pulse_filter: after a duty step the period average settles by the slow mode (Odeint)") {
    // Derivation: the deviation of the state from the new periodic steady state obeys the
    // unforced equations, so the period average's deviation from the new average V D2
    // shrinks by e^(-T/tau) per period (one stage), and by e^(s_slow T) once the fast
    // mode has died out (two stages; s_slow from P s^2 + S s + 1 = 0 above).
    const double v = 1.0, d1 = 0.2, d2 = 0.7;
    {
        const double tau = 1e-3, period = 0.3e-3;
        auto run = [&](double d, ode::state<2> x) {
            auto high = [=](const ode::state<2>& y, double) { return ode::state<2>{(v - y[0]) / tau, y[0]}; };
            auto low = [=](const ode::state<2>& y, double) { return ode::state<2>{-y[0] / tau, y[0]}; };
            x[1] = 0.0;
            x = ode::integrate<2>(high, x, 0.0, d * period);
            return ode::integrate<2>(low, x, d * period, period);
        };
        ode::state<2> x{0.0, 0.0};
        for (int k = 0; k < 150; ++k) x = run(d1, x);
        std::vector<double> dev;
        for (int k = 0; k < 8; ++k) {
            x = run(d2, x);
            dev.push_back(x[1] / period - v * d2);
        }
        for (std::size_t k = 1; k < dev.size(); ++k) CHECK_REL(dev[k] / dev[k - 1], std::exp(-period / tau), 1e-6);
    }
    {
        const ladder l{1e3, 1e-6, 10e3, 470e-9};  // slow mode about 9 times slower than the fast one
        const double period = 0.2 * l.sum();
        auto run = [&](double d, ode::state<3> x) {
            auto high = [=](const ode::state<3>& y, double) { return l.rhs(y, v); };
            auto low = [=](const ode::state<3>& y, double) { return l.rhs(y, 0.0); };
            x[2] = 0.0;
            x = ode::integrate<3>(high, x, 0.0, d * period);
            return ode::integrate<3>(low, x, d * period, period);
        };
        ode::state<3> x{0.0, 0.0, 0.0};
        for (int k = 0; k < 200; ++k) x = run(d1, x);
        std::vector<double> dev;
        for (int k = 0; k < 40; ++k) {
            x = run(d2, x);
            dev.push_back(x[2] / period - v * d2);
        }
        CHECK_REL(dev[39] / dev[38], std::exp(l.slow_rate() * period), 1e-6);
        // And the settling metric's slow time constant is the same mode.
        two_stage_pulse_filter f;
        f.input.period = ranged<duration>::exactly(duration::from_value(period));
        f.settling_fraction = 1e-9;
        const double t9 = f.evaluate({l.r1, l.c1, l.r2, l.c2, 1.0, 0.5, 0.0, period})[2];
        f.settling_fraction = 1e-10;
        const double t10 = f.evaluate({l.r1, l.c1, l.r2, l.c2, 1.0, 0.5, 0.0, period})[2];
        CHECK_REL(t10 - t9, std::log(10.0) / -l.slow_rate(), 1e-9);
    }
}

TEST_CASE("pulse_filter: worst case finds the ripple maximum at D = 1/2 inside the duty range (grid)") {
    pulse_filter f{.r = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)},
                   .c = {.nominal = 100_nF, .tol = tolerance::symmetric(0.10)}};
    f.input = {.high = ranged<voltage>::around(5_V, tolerance::symmetric(0.05)),
               .width = ranged<double>::between(0.4, 0.6),
               .period = ranged<duration>::between(0.8_ms, 1.2_ms)};
    const auto r = f.ranges();
    const auto wc = worst_case(f);
    constexpr int n = 9;
    std::array<double, 6> x{};
    for (std::size_t i = 0; i < 6; ++i) x[i] = r[i].nominal;
    const std::array<std::size_t, 5> free{pulse_filter::p_r, pulse_filter::p_c, pulse_filter::p_high,
                                          pulse_filter::p_duty, pulse_filter::p_period};
    std::array<double, 3> lo{1e300, 1e300, 1e300}, hi{-1e300, -1e300, -1e300};
    std::array<int, 5> idx{};
    for (;;) {
        for (std::size_t j = 0; j < 5; ++j) {
            const interval& i = r[free[j]];
            x[free[j]] = idx[j] == n - 1 ? i.high : i.low + (i.high - i.low) * idx[j] / (n - 1);
        }
        const auto m = f.evaluate(x);
        for (int k = 0; k < 3; ++k) lo[k] = std::min(lo[k], m[k]), hi[k] = std::max(hi[k], m[k]);
        std::size_t j = 0;
        while (j < 5 && ++idx[j] == n) idx[j++] = 0;
        if (j == 5) break;
    }
    for (int k = 0; k < 3; ++k) {
        CHECK_REL(wc[k].min.value, lo[k], 1e-9);
        CHECK_REL(wc[k].max.value, hi[k], 1e-9);
    }
    CHECK_FALSE(wc.monotone[pulse_filter::p_duty]);
    CHECK(wc[1].max.positions[pulse_filter::p_duty] == corner_position::nominal);  // D = 0.5
    // The largest ripple by the derivation: R, C low; V, T high; D = 1/2.
    CHECK_REL(hi[1], ripple_formula(5.25, 0.6e-3, 0.6e-3, 10e3 * 0.95 * 100e-9 * 0.9), 1e-12);
    // Corner bounds alone miss it, as the header says.
    CHECK(metric_bounds(f)[1].high < wc[1].max.value * (1 - 1e-3));
}

TEST_CASE("pulse_filter: two-stage worst case equals the extremes of a dense brute-force grid") {
    two_stage_pulse_filter f{.r1 = {.nominal = 4.7_kohm, .tol = tolerance::symmetric(0.05)},
                             .c1 = {.nominal = 220_nF, .tol = tolerance::symmetric(0.10)},
                             .r2 = {.nominal = 47_kohm, .tol = tolerance::symmetric(0.05)},
                             .c2 = {.nominal = 22_nF, .tol = tolerance::symmetric(0.10)}};
    f.input = {.high = ranged<voltage>::around(3.3_V, tolerance::symmetric(0.05)),
               .width = ranged<double>::between(0.4, 0.6),
               .period = ranged<duration>::between(0.9_ms, 1.1_ms)};
    const auto r = f.ranges();
    const auto wc = worst_case(f);
    constexpr int n = 5;
    std::array<double, 8> x{};
    for (std::size_t i = 0; i < 8; ++i) x[i] = r[i].nominal;
    const std::array<std::size_t, 7> free{0, 1, 2, 3, two_stage_pulse_filter::p_high, two_stage_pulse_filter::p_duty,
                                          two_stage_pulse_filter::p_period};
    std::array<double, 3> lo{1e300, 1e300, 1e300}, hi{-1e300, -1e300, -1e300};
    std::array<int, 7> idx{};
    for (;;) {
        for (std::size_t j = 0; j < 7; ++j) {
            const interval& i = r[free[j]];
            x[free[j]] = idx[j] == n - 1 ? i.high : i.low + (i.high - i.low) * idx[j] / (n - 1);
        }
        const auto m = f.evaluate(x);
        for (int k = 0; k < 3; ++k) lo[k] = std::min(lo[k], m[k]), hi[k] = std::max(hi[k], m[k]);
        std::size_t j = 0;
        while (j < 7 && ++idx[j] == n) idx[j++] = 0;
        if (j == 7) break;
    }
    for (int k = 0; k < 3; ++k) {
        CHECK_REL(wc[k].min.value, lo[k], 1e-9);
        CHECK_REL(wc[k].max.value, hi[k], 1e-9);
    }
    for (std::size_t p = 0; p < 4; ++p) CHECK(wc.monotone[p]);  // every part moves ripple and settling one way
    // The extreme ripple by Boost.Odeint at its corner.
    const auto& c = wc[1].max.parameters;
    const auto ref = ode_two_stage({c[0], c[1], c[2], c[3]}, c[4], c[5] * c[7], (1 - c[5]) * c[7]);
    CHECK_REL(wc[1].max.value, ref.ripple, 1e-6);  // Boost.Odeint
}

TEST_CASE("pulse_filter: the ripple/settling trade-off of one stage") {
    // Invented demo numbers: 3.3 V PWM, duty 0.2 to 0.4, 20 kHz; R +/-1 %, C +/-10 %.
    pulse_filter f{.r = {.tol = tolerance::symmetric(0.01)}, .c = {.tol = tolerance::symmetric(0.10)}};
    f.input = {.high = ranged<voltage>::exactly(3.3_V), .width = ranged<double>::between(0.2, 0.4),
               .period = ranged<duration>::exactly(50_us)};
    const auto t = ripple_settling_tradeoff(f, 10_mV, 40_ms);
    REQUIRE(t.feasible());
    // tau_min: the ripple formula (D = 0.4, nearest 1/2) at tau_min is the limit.
    CHECK_REL(ripple_formula(3.3, 0.4 * 50e-6, 0.6 * 50e-6, t.tau_min.value()), 10e-3, 1e-12);  // derivation
    CHECK_REL(t.tau_max.value(), 40e-3 / std::log(100.0), 1e-14);                             // textbook
    CHECK_REL(t.spread_low, 0.99 * 0.9, 1e-15);
    CHECK_REL(t.spread_high, 1.01 * 1.1, 1e-15);
    CHECK_REL(t.rc_min.value(), t.tau_min.value() / (0.99 * 0.9), 1e-15);
    CHECK_REL(t.rc_max.value(), t.tau_max.value() / (1.01 * 1.1), 1e-15);
    CHECK_REL(t.ripple_at_settling_limit.value(), ripple_formula(3.3, 20e-6, 30e-6, t.tau_max.value()), 1e-12);
    // A width and a period instead: the worst is the longest period, 50 us, with the width
    // nearest half of it, 20 us (the ripple grows with T2 at a fixed width).
    pulse_filter w = f;
    w.input.width = ranged<duration>::between(10_us, 20_us);
    w.input.period = ranged<duration>::between(40_us, 50_us);
    const auto tw = ripple_settling_tradeoff(w, 10_mV, 40_ms);
    CHECK_REL(ripple_formula(3.3, 20e-6, 30e-6, tw.tau_min.value()), 10e-3, 1e-12);  // derivation
    // Synthesis finds designs, every one inside the window and holding by the derivation.
    timing_spec<pulse_filter> spec;
    spec.at_most("ripple", 10_mV).at_most("settling", 40_ms);
    const auto res = synthesize(f, spec,
                                {candidates(value_set<resistance>::from_series(e_series::e96, 1_kohm, 100_kohm)),
                                 candidates(value_set<capacitance>::from_series(e_series::e12, 10_nF, 10_uF))},
                                {.top_k = 20});
    REQUIRE(res.feasible());
    for (const auto& d : res.designs) {
        const double rc = d.parts[0].value * d.parts[1].value;
        INFO(describe(d, spec));
        CHECK(rc >= t.rc_min.value() * (1 - 1e-12));
        CHECK(rc <= t.rc_max.value() * (1 + 1e-12));
        CHECK(ripple_formula(3.3, 20e-6, 30e-6, rc * 0.99 * 0.9) <= 10e-3 * (1 + 1e-12));  // derivation
        CHECK(rc * 1.01 * 1.1 * std::log(100.0) <= 40e-3 * (1 + 1e-12));                    // textbook
        CHECK_REL(d.worst_max[pulse_filter::ripple], ripple_formula(3.3, 20e-6, 30e-6, rc * 0.99 * 0.9), 1e-12);
    }
}

TEST_CASE("pulse_filter: ripple and settling that cannot both be met say so, with the least ripple") {
    pulse_filter f{.r = {.tol = tolerance::symmetric(0.01)}, .c = {.tol = tolerance::symmetric(0.10)}};
    f.input = {.high = ranged<voltage>::exactly(3.3_V), .width = ranged<double>::between(0.2, 0.4),
               .period = ranged<duration>::exactly(50_us)};
    const auto t = ripple_settling_tradeoff(f, 1_mV, 10_ms);
    CHECK_FALSE(t.feasible());
    CHECK(t.tau_min > t.tau_max);
    CHECK_REL(t.ripple_at_settling_limit.value(), ripple_formula(3.3, 20e-6, 30e-6, 10e-3 / std::log(100.0)), 1e-12);
    CHECK(t.reason ==
          "ripple at most 1 mV and settling at most 10 ms cannot both be met: the ripple needs a time constant of "
          "at least 39.6 ms, the settling allows at most 2.17147 ms, where the worst-case ripple is 18.2363 mV");
    // Feasible time constants, but a window narrower than the parts' spread.
    const auto narrow = ripple_settling_tradeoff(f, 10_mV, 19_ms);
    CHECK_FALSE(narrow.feasible());
    CHECK(narrow.tau_min <= narrow.tau_max);
    CHECK(narrow.reason.rfind("ripple at most 10 mV and settling at most 19 ms leave time constants from", 0) == 0);
    CHECK_THROWS_WITH_AS(ripple_settling_tradeoff(f, 0_V, 10_ms),
                         "ripple_settling_tradeoff: max_ripple = 0 V is invalid; expected a positive, finite voltage",
                         invalid_argument);
}

TEST_CASE("pulse_filter: two stages meet what one stage cannot; synthesis re-checked by Boost.Odeint") {
    pulse_filter one{.r = {.tol = tolerance::symmetric(0.01)}, .c = {.tol = tolerance::symmetric(0.10)}};
    one.input = {.high = ranged<voltage>::exactly(3.3_V), .width = ranged<double>::between(0.2, 0.4),
                 .period = ranged<duration>::exactly(50_us)};
    CHECK_FALSE(ripple_settling_tradeoff(one, 1_mV, 20_ms).feasible());
    two_stage_pulse_filter two{.r1 = {.tol = tolerance::symmetric(0.01)},
                               .c1 = {.tol = tolerance::symmetric(0.10)},
                               .r2 = {.tol = tolerance::symmetric(0.01)},
                               .c2 = {.tol = tolerance::symmetric(0.10)}};
    two.input = one.input;
    timing_spec<two_stage_pulse_filter> spec;
    spec.at_most("ripple", 1_mV).at_most("settling", 20_ms);
    const auto rs = candidates(value_set<resistance>::from_series(e_series::e6, 1_kohm, 100_kohm));
    const auto cs = candidates(value_set<capacitance>::from_series(e_series::e6, 10_nF, 1_uF));
    const auto res = synthesize(two, spec, {rs, cs, rs, cs}, {.top_k = 3});
    REQUIRE(res.feasible());
    for (const auto& d : res.designs) {
        // The parts are bought at the E6 customary tolerance, +/-20 % (common practice).
        std::array<double, 4> low{}, high{};
        for (std::size_t s = 0; s < 4; ++s) {
            CHECK(d.parts[s].tol == tolerance::symmetric(0.20));
            low[s] = d.parts[s].value * (1 - d.parts[s].tol.minus);
            high[s] = d.parts[s].value * (1 + d.parts[s].tol.plus);
        }
        INFO(describe(d, spec));
        // Largest ripple: every part at its low end, D = 0.4 (nearest 1/2; the grid test
        // above shows the ripple falls with every part). Longest settling: every part high.
        const auto ripple = ode_two_stage({low[0], low[1], low[2], low[3]}, 3.3, 20e-6, 30e-6);
        const double settle = ode_two_stage_settling({high[0], high[1], high[2], high[3]}, 0.01);
        CHECK(ripple.ripple <= 1e-3 * (1 + 1e-6));
        CHECK(settle <= 20e-3 * (1 + 1e-6));
        CHECK_REL(d.worst_max[1], ripple.ripple, 1e-6);  // Boost.Odeint
        CHECK_REL(d.worst_max[2], settle, 1e-6);         // Boost.Odeint
    }
}

TEST_CASE("pulse_filter: the fast path returns exactly the exhaustive top-k, one and two stages") {
    std::mt19937_64 g(99);
    const auto r3 = candidates(value_set<resistance>::from_series(e_series::e3, 1_kohm, 100_kohm));
    const auto c3 = candidates(value_set<capacitance>::from_series(e_series::e3, 10_nF, 1_uF));
    const auto r12 = candidates(value_set<resistance>::from_series(e_series::e12, 1_kohm, 100_kohm));
    const auto c12 = candidates(value_set<capacitance>::from_series(e_series::e12, 10_nF, 10_uF));
    for (int n = 0; n < 6; ++n) {
        const pulse_train in{.high = ranged<voltage>::exactly(5_V), .width = ranged<double>::between(0.1, 0.3),
                             .period = ranged<duration>::exactly(duration::from_value(log_uniform(g, 10e-6, 1e-3)))};
        const double ripple = log_uniform(g, 1e-3, 0.1), settle = log_uniform(g, 1e-3, 0.3);
        pulse_filter one{.r = {.tol = tolerance::symmetric(0.01)}, .c = {.tol = tolerance::symmetric(0.10)}, .input = in};
        timing_spec<pulse_filter> s1;
        s1.at_most("ripple", voltage::from_value(ripple)).at_most("settling", duration::from_value(settle));
        const auto a = synthesize(one, s1, {r12, c12}, {.top_k = 5, .method = search_method::fast});
        const auto b = synthesize(one, s1, {r12, c12}, {.top_k = 5, .method = search_method::exhaustive});
        REQUIRE(a.designs.size() == b.designs.size());
        for (std::size_t i = 0; i < a.designs.size(); ++i)
            for (std::size_t s = 0; s < 2; ++s) CHECK(a.designs[i].parts[s].value == b.designs[i].parts[s].value);
        if (n % 2) continue;  // the two-stage exhaustive search is the slow part: every other case
        two_stage_pulse_filter two{.r1 = {.tol = tolerance::symmetric(0.01)},
                                   .c1 = {.tol = tolerance::symmetric(0.10)},
                                   .r2 = {.tol = tolerance::symmetric(0.01)},
                                   .c2 = {.tol = tolerance::symmetric(0.10)},
                                   .input = in};
        timing_spec<two_stage_pulse_filter> s2;
        s2.at_most("ripple", voltage::from_value(ripple / 20)).at_most("settling", duration::from_value(settle));
        const auto c = synthesize(two, s2, {r3, c3, r3, c3}, {.top_k = 5, .method = search_method::fast});
        const auto d = synthesize(two, s2, {r3, c3, r3, c3}, {.top_k = 5, .method = search_method::exhaustive});
        INFO("case " << n);
        REQUIRE(c.designs.size() == d.designs.size());
        for (std::size_t i = 0; i < c.designs.size(); ++i)
            for (std::size_t s = 0; s < 4; ++s) CHECK(c.designs[i].parts[s].value == d.designs[i].parts[s].value);
    }
}

TEST_CASE("pulse_filter: solve_slot inverts settling exactly and ripple by its derivation") {
    auto f = one_stage(0.3, 100e-6);
    const double ln100 = std::log(100.0);
    CHECK_REL(f.solve_slot(0, pulse_filter::settling, 46.0517e-3, {0.0, 1e-6}), 46.0517e-3 / ln100 / 1e-6, 1e-14);
    CHECK_REL(f.solve_slot(1, pulse_filter::settling, 46.0517e-3, {10e3, 0.0}), 46.0517e-3 / ln100 / 10e3, 1e-14);
    const double r = f.solve_slot(0, pulse_filter::ripple, 2e-3, {0.0, 1e-6});
    CHECK_REL(ripple_formula(1.0, 30e-6, 70e-6, r * 1e-6), 2e-3, 1e-12);  // derivation
    CHECK(std::isnan(f.solve_slot(0, pulse_filter::average, 0.3, {0.0, 1e-6})));
    CHECK(f.solve_slot(0, pulse_filter::ripple, 1.5, {0.0, 1e-6}) == 0.0);  // ripple never reaches V
    two_stage_pulse_filter two;
    two.input = {.high = ranged<voltage>::exactly(1_V), .width = ranged<double>::exactly(0.3),
                 .period = ranged<duration>::exactly(100_us)};
    const std::array<double, 4> parts{4.7e3, 100e-9, 10e3, 47e-9};
    for (std::size_t slot = 0; slot < 4; ++slot) {
        const double v = two.solve_slot(slot, two_stage_pulse_filter::settling, 10e-3, parts);
        auto l = ladder{parts[0], parts[1], parts[2], parts[3]};
        (slot == 0 ? l.r1 : slot == 1 ? l.c1 : slot == 2 ? l.r2 : l.c2) = v;
        INFO("slot " << slot);
        CHECK_REL(ode_two_stage_settling(l, 0.01), 10e-3, 1e-6);  // Boost.Odeint
    }
}

TEST_CASE("pulse_filter: bad pulse trains and settling fractions are rejected word for word") {
    pulse_filter f{.r = {.nominal = 10_kohm}, .c = {.nominal = 1_uF}};
    CHECK_THROWS_WITH_AS(f.ranges(), "pulse_filter::ranges: input.period.low = 0 s is invalid; expected a positive period",
                         invalid_argument);
    f.input.period = ranged<duration>::exactly(50_us);
    f.input.width = ranged<double>::between(0.0, 0.5);
    CHECK_THROWS_WITH_AS(f.ranges(),
                         "pulse_filter::ranges: input.width.low = 0 is invalid; expected a duty cycle (high fraction) "
                         "strictly between 0 and 1",
                         invalid_argument);
    f.input.width = ranged<duration>::between(10_us, 50_us);
    CHECK_THROWS_WITH_AS(f.ranges(),
                         "pulse_filter::ranges: input.width.high = 50 \u00B5s is invalid; expected a high time shorter "
                         "than the shortest period, input.period.low = 50 \u00B5s",
                         domain_error);
    f.input.width = ranged<duration>::between(10_us, 20_us);
    CHECK_NOTHROW(f.ranges());
    CHECK(f.ranges()[pulse_filter::p_duty].nominal == doctest::Approx(0.3).epsilon(1e-14));
    f.settling_fraction = 1.0;
    CHECK_THROWS_WITH_AS(f.ranges(),
                         "pulse_filter::ranges: settling_fraction = 1 is invalid; expected a fraction of the step "
                         "strictly between 0 and 1",
                         invalid_argument);
    two_stage_pulse_filter t;
    t.input.period = ranged<duration>::exactly(50_us);
    t.input.high = ranged<voltage>::exactly(0_V);
    CHECK_THROWS_WITH_AS(t.ranges(),
                         "two_stage_pulse_filter::ranges: input.high.low = 0 V is invalid; expected a positive high "
                         "level",
                         invalid_argument);
}
