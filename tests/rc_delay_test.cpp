// Tests of networks/rc_delay.hpp: the step relations (common practice and
// derivations written here), the ramp response against a closed form derived
// here, Boost.Odeint integration of the node equation with a ramp, leakage and
// insulation resistance, worst case against a dense brute-force grid, errors word
// for word, and a power-on reset synthesized from E24/E12 sets whose worst case is
// recomputed here by Odeint.
// Set TAUFORGE_TEST_REPORT=1 to print the worst error each comparison measured.
#include "approx.hpp"
#include "ode_reference.hpp"
#include "random_cases.hpp"

#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/rc_delay.hpp>
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

/// Boost.Odeint reference: the node equation C v' = (u(t) - v)/R - I - G v with the
/// supply u(t) = Vs min(t/Tr, 1) (a step when Tr = 0) and v(0) = 0, integrated over the
/// ramp and then the flat part separately; the delay is the first crossing of vth.
/// Returns +inf when the node has not crossed after 200 time constants.
double ode_delay(double R, double C, double Vs, double Tr, double I, double G, double vth) {
    const double tau = R * C;
    auto ramp = [=](const ode::state<1>& v, double t) { return ode::state<1>{((Vs * t / Tr - v[0]) / R - I - G * v[0]) / C}; };
    auto flat = [=](const ode::state<1>& v, double) { return ode::state<1>{((Vs - v[0]) / R - I - G * v[0]) / C}; };
    auto below = [=](const ode::state<1>& v) { return v[0] - vth; };
    ode::state<1> v{0.0};
    if (Tr > 0.0) {
        auto p = ode::make_path<1>(ramp, v, 0.0, std::min(tau, Tr));
        if (auto t = p.first_root(below, Tr)) return *t;
        v = ode::integrate<1>(ramp, v, 0.0, Tr);
    }
    auto p = ode::make_path<1>(flat, v, Tr, tau);
    if (auto t = p.first_root(below, Tr + 200 * tau)) return *t;
    return std::numeric_limits<double>::infinity();
}

std::array<double, 8> point(double R, double C, double Vs, double k, double Tr, double I, double G) {
    return {R, C, Vs, k, k * Vs, Tr, I, G};
}

}  // namespace

TEST_CASE("rc_delay: a step to 2/3 of the supply takes RC ln 3") {
    // Common practice: charging from 0 to 2/3 Vcc takes RC ln 3 = 1.098612 RC.
    rc_delay d{.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
               .c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};
    const auto x = point(100e3, 10e-9, 5.0, 2.0 / 3.0, 0.0, 0.0, 0.0);
    CHECK_REL(d.evaluate(x)[0], 1.098612e-3, 1e-6);  // common practice
    CHECK_REL(d.evaluate(x)[0], 1e-3 * std::log(3.0), 1e-15);
    // REFERENCES.md (computed): 100 kohm +/-1 %, 10 nF +/-10 %: nominal 1.09861 ms, extremes 0.97886-1.22056 ms.
    const auto wc = worst_case(d);
    CHECK_REL(wc[0].nominal, 1.09861e-3, 5e-6);
    CHECK_REL(wc[0].min.value, 0.97886e-3, 5e-6);
    CHECK_REL(wc[0].max.value, 1.22056e-3, 5e-6);
}

TEST_CASE("rc_delay: an absolute threshold takes RC ln(V / (V - Vth))") {
    // Derivation: V (1 - e^(-t/RC)) = Vth  =>  t = RC ln(V / (V - Vth)).
    rc_delay d{.r = {.nominal = 47_kohm}, .c = {.nominal = 220_nF}};
    d.threshold_voltage = ranged<voltage>::exactly(1.5_V);
    d.supply = ranged<voltage>::exactly(3.3_V);
    const auto r = d.ranges();
    CHECK(r[rc_delay::p_vth].nominal == 1.5);
    CHECK_REL(r[rc_delay::p_ratio].nominal, 1.5 / 3.3, 1e-15);  // fixed, shown for information
    const double rc = 47e3 * 220e-9;
    std::array<double, 8> x{};
    for (std::size_t i = 0; i < 8; ++i) x[i] = r[i].nominal;
    CHECK_REL(d.evaluate(x)[0], rc * std::log(3.3 / 1.8), 1e-14);
    // The ratio member no longer matters.
    x[rc_delay::p_ratio] = 0.9;
    CHECK_REL(d.evaluate(x)[0], rc * std::log(3.3 / 1.8), 1e-14);
    // A higher supply crosses a fixed threshold sooner.
    x[rc_delay::p_supply] = 3.6;
    CHECK(d.evaluate(x)[0] < rc * std::log(3.3 / 1.8));
}

TEST_CASE("rc_delay: a ramping supply matches the ramp response derived here") {
    // Derivation: with u = s t (s = V / Tr) and v(0) = 0, v' = (s t - v)/tau gives
    // v(t) = s (t - tau (1 - e^(-t/tau))) for t <= Tr. A threshold crossed after the ramp:
    // from v(Tr) towards V, t = Tr + tau ln((V - v(Tr)) / (V - Vth)).
    rc_delay d;
    const double R = 10e3, C = 1e-6, tau = R * C, V = 5.0, k = 2.0 / 3.0;
    for (double Tr : {1e-4, 1e-3, 5e-3, 2e-2}) {
        const double vr = V / Tr * (Tr - tau * (1.0 - std::exp(-Tr / tau)));
        if (vr >= k * V) continue;
        const double expected = Tr + tau * std::log((V - vr) / (V - k * V));
        INFO("rise time " << Tr);
        CHECK_REL(d.evaluate(point(R, C, V, k, Tr, 0.0, 0.0))[0], expected, 1e-12);
    }
    // Crossed during the ramp (Tr = 0.1 s >> tau): v(t) = k V solved by bisection here.
    const double Tr = 0.1, s = V / Tr;
    double lo = 0.0, hi = Tr;
    for (int i = 0; i < 200; ++i) {
        const double mid = (lo + hi) / 2.0;
        (s * (mid - tau * (1.0 - std::exp(-mid / tau))) < k * V ? lo : hi) = mid;
    }
    CHECK_REL(d.evaluate(point(R, C, V, k, Tr, 0.0, 0.0))[0], lo, 1e-12);
    // A longer ramp never shortens the delay.
    CHECK(d.evaluate(point(R, C, V, k, 0.02, 0.0, 0.0))[0] > d.evaluate(point(R, C, V, k, 0.01, 0.0, 0.0))[0]);
}

TEST_CASE("rc_delay: ramp, leakage and insulation agree with Boost.Odeint within 1e-6") {
    std::mt19937_64 g(0x52435f64656c6179ULL);
    double worst = 0.0;
    for (int n = 0; n < 60; ++n) {
        const double R = log_uniform(g, 1e3, 1e6), C = log_uniform(g, 1e-9, 1e-5), tau = R * C;
        const double Vs = uniform(g, 1.8, 12.0), k = uniform(g, 0.2, 0.8), vth = k * Vs;
        const double Tr = n % 4 == 0 ? 0.0 : tau * log_uniform(g, 0.01, 5.0);
        // Leakage and insulation that still leave the final node voltage above the threshold.
        const double G = n % 3 == 0 ? 0.0 : uniform(g, 0.0, 0.3) / R;
        const double v_no_leak = Vs / (1.0 + G * R);
        const double I = (n % 5 == 0 ? -1.0 : 1.0) * uniform(g, 0.0, 0.8) * (v_no_leak - vth) * (1.0 + G * R) / R;
        rc_delay d;
        const bool absolute = n % 2 == 1;
        if (absolute) d.threshold_voltage = ranged<voltage>::exactly(voltage::from_value(vth));
        const double t = d.evaluate(point(R, C, Vs, k, Tr, I, G))[0];
        const double ref = ode_delay(R, C, Vs, Tr, I, G, vth);
        INFO("case " << n << ": R " << R << " C " << C << " Vs " << Vs << " k " << k << " Tr " << Tr << " I " << I
                     << " G " << G);
        CHECK_REL(t, ref, 1e-6);  // Boost.Odeint
        worst = std::max(worst, tauforge_test::rel_diff(t, ref));
    }
    report("rc_delay vs Odeint", worst);
}

TEST_CASE("rc_delay: pin and capacitor leakage and insulation become parameter ranges") {
    rc_delay d{.r = {.nominal = 100_kohm}, .c = {.nominal = 1_uF}};
    d.c.insulation = 50_Mohm;
    d.c.leakage = 0.2_uA;
    d.leakage = ranged<current>::between(-0.5_uA, 1_uA);
    const auto r = d.ranges();
    CHECK(r[rc_delay::p_leak].low == doctest::Approx(-0.5e-6).epsilon(1e-12));
    CHECK(r[rc_delay::p_leak].high == doctest::Approx(1.2e-6).epsilon(1e-12));
    CHECK(r[rc_delay::p_leak].nominal == doctest::Approx(0.25e-6).epsilon(1e-12));
    CHECK(r[rc_delay::p_shunt] == interval{0.0, 0.0, 1.0 / 50e6});
    // Leakage lengthens the delay: the largest delay is at the highest leakage and conductance.
    const auto wc = worst_case(d);
    CHECK(wc[0].max.positions[rc_delay::p_leak] == corner_position::high);
    CHECK(wc[0].max.positions[rc_delay::p_shunt] == corner_position::high);
    CHECK(wc[0].min.positions[rc_delay::p_leak] == corner_position::low);
    CHECK_REL(wc[0].max.value, ode_delay(1e5, 1e-6, 5.0, 0.0, 1.2e-6, 2e-8, 10.0 / 3.0), 1e-6);  // Boost.Odeint
}

TEST_CASE("rc_delay: worst case equals the extremes of a dense brute-force grid") {
    rc_delay d{.r = {.nominal = 68_kohm, .tol = tolerance::symmetric(0.05), .tcr = ppm_band::symmetric(100)},
               .c = {.nominal = 470_nF, .tol = tolerance::symmetric(0.10), .tempco = x7r}};
    d.conditions = {.t_min = celsius{-40}, .t_max = celsius{85}};
    d.c.insulation = 100_Mohm;
    d.supply = ranged<voltage>::around(3.3_V, tolerance::symmetric(0.10));
    d.threshold = ranged<double>::between(0.3, 0.7);
    d.rise_time = ranged<duration>::between(1_ms, 30_ms);
    d.leakage = ranged<current>::between(-1_uA, 2_uA);
    const auto r = d.ranges();
    const auto wc = worst_case(d);
    const auto mb = metric_bounds(d);
    for (bool m : wc.monotone) CHECK(m);
    // Seven free parameters, seven points each (both ends included).
    constexpr int n = 7;
    const std::array<std::size_t, 7> free{rc_delay::p_r,    rc_delay::p_c,    rc_delay::p_supply, rc_delay::p_ratio,
                                          rc_delay::p_rise, rc_delay::p_leak, rc_delay::p_shunt};
    std::array<double, 8> x{};
    for (std::size_t i = 0; i < 8; ++i) x[i] = r[i].nominal;
    double lo = std::numeric_limits<double>::infinity(), hi = -lo;
    std::array<int, 7> idx{};
    for (;;) {
        for (std::size_t j = 0; j < 7; ++j) {
            const interval& i = r[free[j]];
            x[free[j]] = idx[j] == n - 1 ? i.high : i.low + (i.high - i.low) * idx[j] / (n - 1);
        }
        const double t = d.evaluate(x)[0];
        lo = std::min(lo, t), hi = std::max(hi, t);
        std::size_t j = 0;
        while (j < 7 && ++idx[j] == n) idx[j++] = 0;
        if (j == 7) break;
    }
    CHECK_REL(wc[0].min.value, lo, 1e-12);
    CHECK_REL(wc[0].max.value, hi, 1e-12);
    CHECK_REL(mb[0].low, lo, 1e-12);
    CHECK_REL(mb[0].high, hi, 1e-12);
    // And both extremes agree with Boost.Odeint at their corners.
    for (const auto* c : {&wc[0].min, &wc[0].max}) {
        const auto& p = c->parameters;
        CHECK_REL(c->value,
                  ode_delay(p[0], p[1], p[2], p[5], p[6], p[7], p[3] * p[2]), 1e-6);  // Boost.Odeint
    }
}

TEST_CASE("rc_delay: leakage that keeps the node below the threshold is a domain_error that says so") {
    // 3 uA through 1 Mohm drops 3 V: the node approaches 2 V, below 2/3 of 5 V.
    rc_delay d{.r = {.nominal = 1_Mohm}, .c = {.nominal = 100_nF}};
    CHECK_THROWS_WITH_AS(d.evaluate(point(1e6, 1e-7, 5.0, 2.0 / 3.0, 0.0, 3e-6, 0.0)),
                         "rc_delay::evaluate: threshold = 3.33333 V is invalid; expected a threshold below the "
                         "node's final voltage 2 V (supply 5 V, R = 1 M\u03A9, leakage 3 \u00B5A, insulation "
                         "conductance 0 S): the leakage keeps the node from reaching the threshold",
                         domain_error);
    // Only at one corner: the analysis layer passes the error on.
    d.leakage = ranged<current>::between(0_A, 3_uA);
    CHECK_THROWS_WITH_AS(worst_case(d),
                         "rc_delay::evaluate: threshold = 3.33333 V is invalid; expected a threshold below the "
                         "node's final voltage 2 V (supply 5 V, R = 1 M\u03A9, leakage 3 \u00B5A, insulation "
                         "conductance 0 S): the leakage keeps the node from reaching the threshold",
                         domain_error);
    d.leakage = ranged<current>::between(0_A, 1_uA);
    CHECK_NOTHROW(worst_case(d));
}

TEST_CASE("rc_delay: thresholds outside the supply and other bad inputs are rejected word for word") {
    rc_delay d{.r = {.nominal = 10_kohm}, .c = {.nominal = 1_uF}};
    d.threshold = ranged<double>::between(0.5, 1.0);
    CHECK_THROWS_WITH_AS(d.ranges(),
                         "rc_delay::ranges: threshold.high = 1 is invalid; expected a ratio of the supply strictly "
                         "between 0 and 1",
                         invalid_argument);
    d.threshold = ranged<double>::between(0.0, 0.5);
    CHECK_THROWS_WITH_AS(d.ranges(),
                         "rc_delay::ranges: threshold.low = 0 is invalid; expected a ratio of the supply strictly "
                         "between 0 and 1",
                         invalid_argument);
    d.threshold = ranged<double>::exactly(0.5);
    d.supply = ranged<voltage>::around(5_V, tolerance::symmetric(0.1));
    d.threshold_voltage = ranged<voltage>::between(2_V, 4.6_V);
    CHECK_THROWS_WITH_AS(d.ranges(),
                         "rc_delay::ranges: threshold_voltage.high = 4.6 V is invalid; expected a threshold below "
                         "the lowest supply, supply.low = 4.5 V",
                         domain_error);
    d.threshold_voltage = ranged<voltage>::between(0_V, 2_V);
    CHECK_THROWS_WITH_AS(d.ranges(),
                         "rc_delay::ranges: threshold_voltage.low = 0 V is invalid; expected a threshold above 0 V",
                         invalid_argument);
    d.threshold_voltage.reset();
    d.supply = ranged<voltage>::exactly(0_V);
    CHECK_THROWS_WITH_AS(d.ranges(),
                         "rc_delay::ranges: supply.low = 0 V is invalid; expected a positive supply voltage",
                         invalid_argument);
    d.supply = ranged<voltage>::exactly(5_V);
    d.rise_time = ranged<duration>::between(-1_ms, 1_ms);
    CHECK_THROWS_WITH_AS(d.ranges(), "rc_delay::ranges: rise_time.low = -1 ms is invalid; expected a non-negative time",
                         invalid_argument);
    d.rise_time = ranged<duration>::exactly(0_s);
    d.internal_pullup = ranged<resistance>::between(0_ohm, 50_kohm);
    CHECK_THROWS_WITH_AS(d.ranges(),
                         "rc_delay::ranges: internal_pullup.low = 0 \u03A9 is invalid; expected a positive resistance",
                         invalid_argument);
}

TEST_CASE("rc_delay: an internal pull-up replaces the resistor's range and is not designable") {
    rc_delay d{.c = {.nominal = 1_uF, .tol = tolerance::symmetric(0.1)}};  // r left unset
    d.internal_pullup = ranged<resistance>{40_kohm, 25_kohm, 55_kohm};
    const auto r = d.ranges();
    CHECK(r[rc_delay::p_r] == interval{40e3, 25e3, 55e3});
    const auto wc = worst_case(d);
    CHECK_REL(wc[0].min.value, 25e3 * 0.9e-6 * std::log(3.0), 1e-14);  // common practice: RC ln 3
    CHECK_REL(wc[0].max.value, 55e3 * 1.1e-6 * std::log(3.0), 1e-14);
    CHECK(std::isnan(d.solve_slot(0, 0, 1e-3, {1e3, 1e-6})));
    CHECK_REL(d.solve_slot(1, 0, 40e-3, {1e3, 0.0}), 40e-3 / (40e3 * std::log(3.0)), 1e-14);
}

TEST_CASE("rc_delay: solve_slot with a ramp and leakage hits the target by Boost.Odeint") {
    rc_delay d;
    d.rise_time = ranged<duration>::exactly(5_ms);
    d.leakage = ranged<current>::exactly(2_uA);
    d.supply = ranged<voltage>::exactly(3.3_V);
    d.threshold = ranged<double>::exactly(0.6);
    const double target = 25e-3;
    const double r_solved = d.solve_slot(0, 0, target, {0.0, 1e-6});
    const double c_solved = d.solve_slot(1, 0, target, {22e3, 0.0});
    REQUIRE(r_solved > 0.0);
    REQUIRE(c_solved > 0.0);
    CHECK_REL(ode_delay(r_solved, 1e-6, 3.3, 5e-3, 2e-6, 0.0, 0.6 * 3.3), target, 1e-6);  // Boost.Odeint
    CHECK_REL(ode_delay(22e3, c_solved, 3.3, 5e-3, 2e-6, 0.0, 0.6 * 3.3), target, 1e-6);  // Boost.Odeint
    // Shorter than the ramp's own time to the threshold (3 ms): no C is small enough.
    CHECK(d.solve_slot(1, 0, 2e-3, {22e3, 0.0}) == 0.0);
    CHECK(std::isnan(d.solve_slot(2, 0, target, {1.0, 1.0})));
}

TEST_CASE("rc_delay: the fast path returns exactly the exhaustive top-k with a ramp and leakage") {
    std::mt19937_64 g(2024);
    const auto rs = candidates(value_set<resistance>::from_series(e_series::e12, 1_kohm, 100_kohm));
    const auto cs = candidates(value_set<capacitance>::from_series(e_series::e6, 10_nF, 10_uF));
    for (int n = 0; n < 8; ++n) {
        rc_delay d;
        d.rise_time = ranged<duration>::between(duration::from_value(1e-4 * unit(g)), 2_ms);
        d.leakage = ranged<current>::between(0_A, current::from_value(5e-6 * unit(g)));
        timing_spec<rc_delay> spec;
        spec.around("delay", duration::from_value(2e-3 * std::pow(10.0, 2.0 * unit(g))), tolerance::symmetric(0.3));
        const auto fast = synthesize(d, spec, {rs, cs}, {.top_k = 5, .method = search_method::fast});
        const auto full = synthesize(d, spec, {rs, cs}, {.top_k = 5, .method = search_method::exhaustive});
        REQUIRE(fast.designs.size() == full.designs.size());
        for (std::size_t i = 0; i < fast.designs.size(); ++i) {
            CHECK(fast.designs[i].parts[0].value == full.designs[i].parts[0].value);
            CHECK(fast.designs[i].parts[1].value == full.designs[i].parts[1].value);
        }
        CHECK(fast.evaluated <= full.evaluated);
    }
}

TEST_CASE("rc_delay: a power-on reset held at least 20 ms after the rail rises, from E24 and E12") {
    // Invented demo numbers: a 3.3 V +/-5 % rail rising in 0.1 to 10 ms, a reset input
    // that releases somewhere between 0.3 and 0.7 of the supply, +/-1 uA pin leakage,
    // -40 to +85 degC. "Held 20 ms after the rail rises" at every corner: the delay from
    // the start of the rise must be at least 20 ms + the longest rise, 30 ms; and the
    // reset should not last beyond 250 ms.
    rc_delay por{.r = {.tol = tolerance::symmetric(0.05), .tcr = ppm_band::symmetric(100)},
                 .c = {.tol = tolerance::symmetric(0.10), .tempco = x7r}};
    por.conditions = {.t_min = celsius{-40}, .t_max = celsius{85}};
    por.supply = ranged<voltage>::around(3.3_V, tolerance::symmetric(0.05));
    por.threshold = ranged<double>::between(0.3, 0.7);
    por.rise_time = ranged<duration>::between(0.1_ms, 10_ms);
    por.leakage = ranged<current>::between(-1_uA, 1_uA);
    timing_spec<rc_delay> spec;
    spec.at_least("delay", 30_ms).at_most("delay", 250_ms);
    const auto result = synthesize(por, spec,
                                   {candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 220_kohm)),
                                    candidates(value_set<capacitance>::from_series(e_series::e12, 100_nF, 10_uF))},
                                   {.top_k = 3});
    REQUIRE(result.feasible());
    for (const auto& d : result.designs) {
        // Recomputed here: the delay at every corner of the free parameters by Boost.Odeint.
        // (Each parameter moves the delay one way, so the extremes lie at corners.)
        const auto r = d.network.ranges();
        double lo = std::numeric_limits<double>::infinity(), hi = -lo;
        const std::array<std::size_t, 6> free{rc_delay::p_r,     rc_delay::p_c,    rc_delay::p_supply,
                                              rc_delay::p_ratio, rc_delay::p_rise, rc_delay::p_leak};
        for (unsigned mask = 0; mask < 64; ++mask) {
            std::array<double, 8> x{};
            for (std::size_t i = 0; i < 8; ++i) x[i] = r[i].nominal;
            for (std::size_t j = 0; j < 6; ++j) x[free[j]] = (mask >> j & 1u) ? r[free[j]].high : r[free[j]].low;
            const double t = ode_delay(x[0], x[1], x[2], x[5], x[6], 0.0, x[3] * x[2]);
            lo = std::min(lo, t), hi = std::max(hi, t);
        }
        INFO(describe(d, spec));
        CHECK(lo >= 30e-3 * (1 - 1e-6));
        CHECK(hi <= 250e-3 * (1 + 1e-6));
        CHECK_REL(d.worst_min[0], lo, 1e-6);  // Boost.Odeint
        CHECK_REL(d.worst_max[0], hi, 1e-6);  // Boost.Odeint
    }
}
