// Tests of networks/timer_monostable.hpp: the handbook one-shot relation, the
// REFERENCES.md one-shot extremes, a Boost.Odeint integration of the timing
// node (charge with the threshold event, discharge for the recovery time),
// worst case against a dense grid of formulas written here, solve_slot,
// synthesis re-checked independently, the design checks and bad inputs.
#include "approx.hpp"
#include "ode_reference.hpp"
#include "random_cases.hpp"

#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/timer_monostable.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstdint>
#include <random>
#include <vector>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

using tauforge_test::unit;
using tauforge_test::between;
using tauforge_test::ode::first_crossing;

namespace ode = tauforge_test::ode;

// With TAUFORGE_TEST_REPORT=1, prints the worst difference a test measured.
void report(const char* what, double worst) {
    if (const char* e = std::getenv("TAUFORGE_TEST_REPORT"); e && *e == '1')
        std::printf("%s: worst relative difference %.3g\n", what, worst);
}

// One operating point of the circuit, SI units.
struct point {
    double r, c, vcc, vth, vsat, ron, tpd, ib;
};

// Reference relations (derivation). The timing node obeys
//   C dv/dt = (Vcc - v) / R - Ib                      switch open (pulse),
//   C dv/dt = (Vcc - v) / R + (Vsat - v) / Ron - Ib   switch closed (held, recovering).
// Held level: the closed circuit's steady state, a conductance-weighted mean.
// Pulse: v = Vf + (v_hold - Vf) e^(-t / RC) with Vf = Vcc - Ib R, so the
// threshold is crossed after RC ln((Vf - v_hold) / (Vf - Vth)).
// Recovery: v - v_hold = (Vth - v_hold) e^(-t / (C R Ron / (R + Ron))), within a
// fraction eps after C (R || Ron) ln(1 / eps).
double ref_hold(const point& p) {
    if (p.ron == 0.0) return p.vsat;
    return (p.vcc / p.r + p.vsat / p.ron - p.ib) / (1.0 / p.r + 1.0 / p.ron);
}
double ref_width(const point& p) {
    const double vf = p.vcc - p.ib * p.r;
    return p.r * p.c * std::log((vf - ref_hold(p)) / (vf - p.vth)) + p.tpd;
}
double ref_recovery(const point& p, double eps = 0.01) {
    if (p.ron == 0.0) return 0.0;
    return p.c / (1.0 / p.r + 1.0 / p.ron) * std::log(1.0 / eps);
}

std::array<double, 9> params(const point& p, bool control) {
    return {p.r, p.c, p.vcc, control ? 0.0 : p.vth / p.vcc, control ? p.vth : 0.0, p.vsat, p.ron, p.tpd, p.ib};
}

// One axis of a brute-force grid: n equally spaced points from lo to hi inclusive.
struct axis {
    double lo, hi;
    int n;
};
// Visits every point of the grid spanned by the axes (an odometer over the indices).
template <std::size_t D, class F>
void for_each_grid_point(const std::array<axis, D>& axes, F&& visit) {
    std::array<int, D> idx{};
    std::array<double, D> x{};
    for (;;) {
        for (std::size_t d = 0; d < D; ++d)
            x[d] = idx[d] + 1 == axes[d].n ? axes[d].hi
                                           : axes[d].lo + (axes[d].hi - axes[d].lo) * idx[d] / (axes[d].n - 1);
        visit(x);
        std::size_t d = 0;
        while (d < D && ++idx[d] == axes[d].n) idx[d++] = 0;
        if (d == D) return;
    }
}

}  // namespace

TEST_CASE("timer_monostable: width = R C ln 3 with thresholds at 2/3 from 0 V") {
    // Common practice; derivation in the test: V (1 - e^(-t/RC)) = 2/3 V gives t = RC ln 3,
    // and the handbook's 1.1 RC is 0.13 % off (REFERENCES.md).
    timer_monostable m{.r = {.nominal = 100_kohm}, .c = {.nominal = 10_nF}};
    const auto v = m.evaluate(detail::nominal_point(m.ranges()));
    CHECK_REL(v[timer_monostable::pulse_width], 1e-3 * std::log(3.0), 1e-15);
    CHECK_REL(v[timer_monostable::pulse_width], 1.1e-3, 1.3e-3);
    CHECK_FALSE(tauforge_test::close_rel(v[timer_monostable::pulse_width], 1.1e-3, 1.2e-3));
    CHECK(v[timer_monostable::recovery_time] == 0.0);  // an ideal switch
    CHECK_REL(v[timer_monostable::retrigger_rate], 1.0 / (1e-3 * std::log(3.0)), 1e-15);
}

TEST_CASE("timer_monostable: the one-shot 100 kOhm +/-1 %, 10 nF +/-10 % of REFERENCES.md") {
    // Computed (REFERENCES.md): nominal 1.09861 ms, extremes 0.97886-1.22056 ms.
    timer_monostable m{.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                       .c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};
    const auto wc = worst_case(m);
    CHECK(wc.free_parameters == 2);
    CHECK_REL(wc[timer_monostable::pulse_width].nominal, 1.09861e-3, 5e-6);
    CHECK_REL(wc[timer_monostable::pulse_width].min.value, 0.97886e-3, 5e-6);
    CHECK_REL(wc[timer_monostable::pulse_width].max.value, 1.22056e-3, 5e-6);
    const auto b = metric_bounds(m);
    CHECK_REL(b[timer_monostable::pulse_width].low, 0.99 * 0.9 * 1e-3 * std::log(3.0), 1e-14);
    CHECK_REL(b[timer_monostable::pulse_width].high, 1.01 * 1.1 * 1e-3 * std::log(3.0), 1e-14);
}

TEST_CASE("timer_monostable: recovery is C (R || Ron) ln(1 / fraction) and sets the retrigger rate") {
    // Derivation in the test (ref_recovery): 1 % settling takes ln 100 = 4.605 time constants.
    timer_monostable m{.r = {.nominal = 100_kohm},
                       .c = {.nominal = 10_nF},
                       .discharge_resistance = ranged<resistance>::exactly(20_ohm)};
    const auto v = m.evaluate(detail::nominal_point(m.ranges()));
    const point p{100e3, 10e-9, 5.0, 5.0 * 2.0 / 3.0, 0.0, 20.0, 0.0, 0.0};
    CHECK_REL(v[timer_monostable::recovery_time], ref_recovery(p), 1e-13);
    CHECK_REL(v[timer_monostable::recovery_time], 10e-9 * (100e3 * 20.0 / 100020.0) * 4.605170186, 1e-9);
    CHECK_REL(v[timer_monostable::pulse_width], ref_width(p), 1e-13);
    CHECK_REL(v[timer_monostable::retrigger_rate], 1.0 / (ref_width(p) + ref_recovery(p)), 1e-13);
    m.recovery_fraction = 0.001;  // 0.1 %: ln 1000 = 6.908 time constants (REFERENCES.md, textbook)
    const auto w = m.evaluate(detail::nominal_point(m.ranges()));
    CHECK_REL(w[timer_monostable::recovery_time], 10e-9 * (100e3 * 20.0 / 100020.0) * 6.907755279, 1e-9);
}

TEST_CASE("timer_monostable: Boost.Odeint charge and discharge of the timing node agree within 1e-6") {
    // 200 random circuits: ratio or control-voltage threshold, saturation, on-resistance,
    // bias current and delay. The integration starts at the held level (the closed
    // circuit's steady state) and stops at the threshold event; the recovery integration
    // starts at the threshold with the switch closed and stops 1 % from the held level.
    std::mt19937_64 g(5150);
    double worst = 0.0;
    for (int n = 0; n < 200; ++n) {
        const bool control = n % 3 == 0;
        point p{};
        p.r = std::pow(10.0, between(g, 3.0, 6.5));
        p.c = std::pow(10.0, between(g, -10.0, -5.0));
        p.vcc = between(g, 4.5, 15.0);
        p.vsat = n % 4 == 0 ? 0.0 : between(g, 0.0, 0.4);
        p.ron = n % 5 == 0 ? 0.0 : between(g, 5.0, 100.0);
        p.tpd = between(g, 0.0, 200e-9);
        p.ib = n % 2 ? 0.0 : between(g, 0.0, 0.2) * (p.vcc / 3.0) / p.r;  // up to 20 % of the headroom
        p.vth = p.vcc * (control ? between(g, 0.3, 0.8) : between(g, 0.6, 0.72));
        timer_monostable m;
        if (control) m.control_voltage = ranged<voltage>::exactly(voltage::from_value(p.vth));
        const auto v = m.evaluate(params(p, control));
        INFO("case " << n);
        const double hold = ref_hold(p), tau = p.r * p.c;
        const auto charge = first_crossing([&](double, double x) { return ((p.vcc - x) / p.r - p.ib) / p.c; }, 0.0,
                                           hold, p.vth, 50.0 * tau);
        REQUIRE(charge.t > 0.0);
        CHECK_REL(v[timer_monostable::pulse_width], charge.t + p.tpd, 1e-6);
        worst = std::max(worst, tauforge_test::rel_diff(v[timer_monostable::pulse_width], charge.t + p.tpd));
        if (p.ron > 0.0) {
            const auto discharge = first_crossing(
                [&](double, double x) { return ((p.vcc - x) / p.r + (p.vsat - x) / p.ron - p.ib) / p.c; }, 0.0, p.vth,
                hold + 0.01 * (p.vth - hold), 50.0 * p.c * p.ron);
            REQUIRE(discharge.t > 0.0);
            CHECK_REL(v[timer_monostable::recovery_time], discharge.t, 1e-6);
            worst = std::max(worst, tauforge_test::rel_diff(v[timer_monostable::recovery_time], discharge.t));
        }
    }
    report("timer_monostable vs Odeint", worst);
}

TEST_CASE("timer_monostable: worst case equals the extremes of a dense grid of the reference relations") {
    timer_monostable m{.r = {.nominal = 470_kohm, .tol = tolerance::symmetric(0.05)},
                       .c = {.nominal = 22_nF, .tol = tolerance::symmetric(0.10)},
                       .supply = ranged<voltage>::between(4.5_V, 5.5_V),
                       .upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, 0.02),
                       .discharge_saturation = ranged<voltage>::between(0_V, 0.3_V),
                       .discharge_resistance = ranged<resistance>::between(10_ohm, 60_ohm),
                       .propagation_delay = ranged<duration>::between(50_ns, 300_ns),
                       .threshold_bias = ranged<current>::between(0_nA, 100_nA)};
    const auto wc = worst_case(m);
    CHECK(wc.free_parameters == 8);
    // The grid: 5 points per parameter over the intervals written out here.
    std::array<double, 3> lo{1e300, 1e300, 1e300}, hi{-1e300, -1e300, -1e300};
    const double eps = 0.01, ln = std::log(1.0 / eps), k = 2.0 / 3.0;
    for_each_grid_point<8>({{{470e3 * 0.95, 470e3 * 1.05, 5},
                             {22e-9 * 0.9, 22e-9 * 1.1, 5},
                             {4.5, 5.5, 5},
                             {k - 0.02, k + 0.02, 5},
                             {0.0, 0.3, 5},
                             {10.0, 60.0, 5},
                             {50e-9, 300e-9, 5},
                             {0.0, 100e-9, 5}}},
                           [&](const std::array<double, 8>& g) {
                               const point p{g[0], g[1], g[2], g[3] * g[2], g[4], g[5], g[6], g[7]};
                               const double w = ref_width(p), rec = p.c / (1.0 / p.r + 1.0 / p.ron) * ln;
                               const std::array<double, 3> v{w, rec, 1.0 / (w + rec)};
                               for (int j = 0; j < 3; ++j) lo[j] = std::min(lo[j], v[j]), hi[j] = std::max(hi[j], v[j]);
                           });
    for (std::size_t j = 0; j < 3; ++j) {
        INFO("metric " << j);
        CHECK_REL(wc[j].min.value, lo[j], 1e-12);
        CHECK_REL(wc[j].max.value, hi[j], 1e-12);
    }
    for (std::size_t p = 0; p < wc.monotone.size(); ++p) CHECK(wc.monotone[p]);
    const auto b = metric_bounds(m);
    CHECK_REL(b[0].low, lo[0], 1e-12);
    CHECK_REL(b[0].high, hi[0], 1e-12);
}

TEST_CASE("timer_monostable: the control voltage overrides the threshold ratio") {
    // Derivation: from 0 V towards 5 V, a 4 V threshold is crossed after RC ln(5 / 1).
    timer_monostable m{.r = {.nominal = 10_kohm},
                       .c = {.nominal = 100_nF},
                       .upper_threshold = ranged<double>::exactly(0.5),
                       .control_voltage = ranged<voltage>::between(3.9_V, 4.1_V)};
    const auto r = m.ranges();
    CHECK(r[timer_monostable::p_ratio] == interval::exactly(0.0));
    CHECK(r[timer_monostable::p_control] == interval{4.0, 3.9, 4.1});
    const auto b = metric_bounds(m);
    CHECK_REL(b[0].nominal, 1e-3 * std::log(5.0), 1e-14);
    CHECK_REL(b[0].low, 1e-3 * std::log(5.0 / 1.1), 1e-14);
    CHECK_REL(b[0].high, 1e-3 * std::log(5.0 / 0.9), 1e-14);
}

TEST_CASE("timer_monostable: solve_slot puts each metric at its target") {
    std::mt19937_64 g(99);
    for (int n = 0; n < 60; ++n) {
        timer_monostable m;
        m.propagation_delay = ranged<duration>::exactly(duration::from_value(between(g, 0.0, 1e-6)));
        if (n % 2) m.discharge_resistance = ranged<resistance>::exactly(resistance::from_value(between(g, 5.0, 50.0)));
        if (n % 3) m.threshold_bias = ranged<current>::exactly(current::from_value(between(g, 0.0, 200e-9)));
        if (n % 4 == 0) m.control_voltage = ranged<voltage>::exactly(voltage::from_value(between(g, 2.0, 4.0)));
        const double r0 = std::pow(10.0, between(g, 3.0, 5.5)), c0 = std::pow(10.0, between(g, -9.0, -6.0));
        m.r.nominal = resistance::from_value(r0);
        m.c.nominal = capacitance::from_value(c0);
        const auto x = detail::nominal_point(m.ranges());
        const auto v = m.evaluate(x);
        for (std::size_t metric = 0; metric < 3; ++metric) {
            if (metric == timer_monostable::recovery_time && !(x[timer_monostable::p_ron] > 0.0)) {
                CHECK(std::isnan(m.solve_slot(0, metric, 1e-3, {r0, c0})));
                continue;
            }
            INFO("case " << n << " metric " << metric);
            CHECK_REL(m.solve_slot(0, metric, v[metric], {1.0, c0}), r0, 1e-9);
            CHECK_REL(m.solve_slot(1, metric, v[metric], {r0, 1.0}), c0, 1e-12);
        }
    }
    timer_monostable m{.propagation_delay = ranged<duration>::exactly(1_us)};
    CHECK(m.solve_slot(0, timer_monostable::pulse_width, 0.5e-6, {0.0, 1e-9}) <= 0.0);  // shorter than the delay
    CHECK(m.solve_slot(1, timer_monostable::pulse_width, 0.5e-6, {1e3, 0.0}) <= 0.0);
    CHECK(std::isnan(m.solve_slot(2, timer_monostable::pulse_width, 1e-3, {1e3, 1e-9})));
}

TEST_CASE("timer_monostable: synthesis of a 10 ms one-shot holds at worst case by the reference relations") {
    // 4.5-5.5 V, threshold 2/3 +/- 0.02, saturation up to 0.2 V, delay up to 1 us,
    // bias up to 50 nA; E24 resistors (5 %) and E12 capacitors bought at 5 %.
    timer_monostable m{.supply = ranged<voltage>::between(4.5_V, 5.5_V),
                       .upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, 0.02),
                       .discharge_saturation = ranged<voltage>::between(0_V, 0.2_V),
                       .propagation_delay = ranged<duration>::between(0_us, 1_us),
                       .threshold_bias = ranged<current>::between(0_nA, 50_nA)};
    timing_spec<timer_monostable> spec;
    spec.around("pulse width", 10_ms, tolerance::symmetric(0.25));
    const auto rs = candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm));
    const auto cs =
        candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 10_uF, tolerance::symmetric(0.05)));
    const auto res = synthesize(m, spec, {rs, cs}, {.top_k = 10});
    REQUIRE(res.feasible());
    CHECK(res.designs.size() == 10);
    for (const auto& d : res.designs) {
        const double r = d.parts[0].value, c = d.parts[1].value;
        double lo = 1e300, hi = 0.0;
        // Every corner of the reference relation (monotone in each parameter).
        for (int mask = 0; mask < 64; ++mask) {
            const auto bit = [&](int b, double a, double z) { return (mask >> b & 1) ? z : a; };
            point p{r * bit(0, 0.95, 1.05), c * bit(1, 0.95, 1.05), bit(2, 4.5, 5.5), 0.0, bit(3, 0.0, 0.2), 0.0,
                    bit(4, 0.0, 1e-6),      bit(5, 0.0, 50e-9)};
            for (double k : {2.0 / 3.0 - 0.02, 2.0 / 3.0 + 0.02}) {
                p.vth = k * p.vcc;
                lo = std::min(lo, ref_width(p));
                hi = std::max(hi, ref_width(p));
            }
        }
        CHECK(lo >= 7.5e-3 * (1 - 1e-12));
        CHECK(hi <= 12.5e-3 * (1 + 1e-12));
        CHECK_REL(d.worst_min[0], lo, 1e-12);
        CHECK_REL(d.worst_max[0], hi, 1e-12);
    }
}

TEST_CASE("timer_monostable: the fast path returns exactly the exhaustive top-k on 20 random specs") {
    // The fast path solves R (in closed form, or by root finding with a bias current
    // and an on-resistance) and walks its neighbours; the margin is unimodal along R.
    std::mt19937_64 g(2718);
    int feasible = 0;
    const auto rs = candidates(value_set<resistance>::from_series(e_series::e12, 1_kohm, 1_Mohm));
    const auto cs = candidates(value_set<capacitance>::from_series(e_series::e6, 1_nF, 10_uF));
    for (int n = 0; n < 20; ++n) {
        timer_monostable m{.supply = ranged<voltage>::between(4.5_V, 5.5_V),
                           .discharge_resistance = ranged<resistance>::between(5_ohm, 50_ohm),
                           .propagation_delay = ranged<duration>::between(0_us, 2_us),
                           .threshold_bias = ranged<current>::between(0_nA, 200_nA)};
        timing_spec<timer_monostable> spec;
        const double centre = 1e-5 * std::pow(10.0, 3.0 * unit(g));
        spec.around("pulse width", duration::from_value(centre), tolerance::symmetric(0.3 + 0.2 * unit(g)));
        if (n % 3 == 0) spec.at_least("retrigger rate", frequency::from_value(0.5 / centre));
        const std::size_t k = 1 + static_cast<std::size_t>(unit(g) * 8);
        const auto fast = synthesize(m, spec, {rs, cs}, {.top_k = k, .method = search_method::fast});
        const auto full = synthesize(m, spec, {rs, cs}, {.top_k = k, .method = search_method::exhaustive});
        INFO("spec " << n << " centre " << centre);
        REQUIRE(fast.designs.size() == full.designs.size());
        for (std::size_t i = 0; i < fast.designs.size(); ++i) {
            CHECK(fast.designs[i].parts[0].value == full.designs[i].parts[0].value);
            CHECK(fast.designs[i].parts[1].value == full.designs[i].parts[1].value);
        }
        CHECK(fast.evaluated < full.evaluated);
        feasible += full.feasible();
    }
    CHECK(feasible >= 15);
}

TEST_CASE("timer_monostable: the largest timing resistor is (supply - threshold) / bias current") {
    // Common practice: of the order of 20 MOhm total timing resistance at 15 V for
    // bipolar parts; 5 V of headroom above a 2/3 threshold over 250 nA is exactly that.
    timer_monostable m{.r = {.nominal = 1_Mohm},
                       .c = {.nominal = 1_nF},
                       .supply = ranged<voltage>::exactly(15_V),
                       .threshold_bias = ranged<current>::between(0_nA, 250_nA)};
    CHECK_REL(m.max_timing_resistance().value(), 20e6, 1e-14);
    m.supply = ranged<voltage>::between(13.5_V, 16.5_V);  // the lowest supply and highest bias decide
    CHECK_REL(m.max_timing_resistance().value(), 13.5 / 3.0 / 250e-9, 1e-14);
    CHECK(
        std::isinf(timer_monostable{.r = {.nominal = 1_Mohm}, .c = {.nominal = 1_nF}}.max_timing_resistance().value()));
}

TEST_CASE("timer_monostable: check_design passes a sound one-shot and trigger") {
    timer_monostable m{.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                       .c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)},
                       .min_trigger_width = 100_ns};
    CHECK(check_design(m, ranged<duration>::between(1_us, 10_us)).empty());
}

TEST_CASE("timer_monostable: check_design reports a trigger longer than the pulse or too short") {
    timer_monostable m{.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                       .c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)},
                       .min_trigger_width = 100_ns};
    // The shortest pulse is 0.97886 ms (REFERENCES.md, computed).
    const auto f = check_design(m, ranged<duration>::between(50_ns, 1_ms));
    REQUIRE(f.size() == 2);
    CHECK(has_violation(f));
    CHECK(f[0].level == severity::violation);
    CHECK(f[0].rule == "trigger_too_long");
    CHECK(f[0].message ==
          "the trigger pulse lasts up to 1 ms, not shorter than the shortest output pulse, "
          "978.9 \u00B5s; expected a trigger pulse that ends before the output pulse");
    CHECK(f[1].rule == "trigger_too_short");
    CHECK(f[1].message ==
          "the trigger pulse can be as short as 50 ns, not longer than the minimum trigger width of 100 ns");
}

TEST_CASE("timer_monostable: check_design reports the bias current limit and shift") {
    // 15 V, threshold 10 V, 250 nA: R_max = 20 MOhm (common practice order).
    timer_monostable m{.r = {.nominal = 22_Mohm},
                       .c = {.nominal = 1_nF},
                       .supply = ranged<voltage>::exactly(15_V),
                       .threshold_bias = ranged<current>::between(0_nA, 250_nA)};
    const auto f = check_design(m, ranged<duration>::exactly(1_us));
    REQUIRE(f.size() == 1);
    CHECK(f[0].level == severity::violation);
    CHECK(f[0].rule == "bias_limit");
    CHECK(f[0].message ==
          "R up to 22 M\u03A9 with a threshold bias current up to 250 nA drops 5.5 V, as much as the "
          "headroom from the threshold to the supply; the capacitor never reaches the threshold. "
          "Expected R below (supply - threshold) / bias = 20 M\u03A9");
    // At 1 MOhm the bias drops 0.25 V (5 % of the headroom): the exact lengthening is
    // ln((15 - 0.25) / (5 - 0.25)) / ln 3 - 1 (derivation: ref_width with and without Ib).
    m.r.nominal = 1_Mohm;
    const auto g = check_design(m, ranged<duration>::exactly(1_us));
    REQUIRE(g.size() == 1);
    CHECK(g[0].level == severity::warning);
    CHECK(g[0].rule == "bias_shift");
    const double shift = std::log(14.75 / 4.75) / std::log(3.0) - 1.0;
    CHECK(format_percent(shift) == "3.14 %");
    CHECK(g[0].message ==
          "the threshold bias current (up to 250 nA) through R (up to 1 M\u03A9) lengthens the charge "
          "by up to 3.14 %, more than the 1 % allowed; the threshold is lost at R = 20 M\u03A9");
    CHECK_FALSE(has_violation(g));
    CHECK(check_design(m, ranged<duration>::exactly(1_us), {.bias_shift_limit = 0.05}).empty());
}

TEST_CASE("timer_monostable: check_design warns about a timing resistor below about 1 kOhm") {
    // Common practice: smallest timing resistor about 1 kOhm.
    timer_monostable m{.r = {.nominal = 820_ohm, .tol = tolerance::symmetric(0.05)}, .c = {.nominal = 1_uF}};
    const auto f = check_design(m, ranged<duration>::exactly(1_us));
    REQUIRE(f.size() == 1);
    CHECK(f[0].level == severity::warning);
    CHECK(f[0].rule == "small_resistor");
    CHECK(f[0].message ==
          "R down to 779 \u03A9 is below the usual smallest timing resistor of about 1 k\u03A9; "
          "the discharge switch carries up to 6.418 mA from the supply");
}

TEST_CASE("timer_monostable: thresholds outside the supply and other bad inputs are rejected") {
    timer_monostable m{.r = {.nominal = 100_kohm}, .c = {.nominal = 1_nF}};
    m.upper_threshold = ranged<double>::between(0.6, 1.0);
    CHECK_THROWS_WITH_AS(m.ranges(),
                         "timer_monostable::ranges: upper_threshold.high = 1 is invalid; expected a ratio of the "
                         "supply strictly between 0 and 1",
                         domain_error);
    m.upper_threshold = ranged<double>::exactly(0.0);
    CHECK_THROWS_WITH_AS(m.ranges(),
                         "timer_monostable::ranges: upper_threshold.low = 0 is invalid; expected a ratio of the "
                         "supply strictly between 0 and 1",
                         domain_error);
    m.upper_threshold = ranged<double>::exactly(2.0 / 3.0);
    m.control_voltage = ranged<voltage>::between(4_V, 5_V);
    CHECK_THROWS_WITH_AS(m.ranges(),
                         "timer_monostable::ranges: control_voltage.high = 5 V is invalid; expected a threshold below "
                         "supply.low = 5 V",
                         domain_error);
    m.control_voltage.reset();
    m.discharge_saturation = ranged<voltage>::exactly(3.5_V);
    CHECK_THROWS_WITH_AS(metric_bounds(m),
                         "timer_monostable::ranges: discharge_saturation.high = 3.5 V is invalid; expected a level "
                         "below the lowest threshold, upper_threshold.low x supply.low = 3.33333 V",
                         domain_error);
    m.discharge_saturation = ranged<voltage>::exactly(0_V);
    m.recovery_fraction = 0.0;
    CHECK_THROWS_WITH_AS(m.ranges(),
                         "timer_monostable::ranges: recovery_fraction = 0 is invalid; expected a fraction strictly "
                         "between 0 and 1",
                         invalid_argument);
    m.recovery_fraction = 0.01;
    m.threshold_bias = ranged<current>::exactly(-1_nA);
    CHECK_THROWS_WITH_AS(m.ranges(),
                         "timer_monostable::ranges: threshold_bias.low = -1 nA is invalid; expected a non-negative "
                         "current drawn from the timing node",
                         invalid_argument);
    // A bias current the capacitor cannot charge past: the corner names its values.
    m.threshold_bias = ranged<current>::exactly(20_uA);
    CHECK_THROWS_WITH_AS(metric_bounds(m),
                         "timer_monostable::evaluate: threshold_bias = 20 \u00B5A is invalid; expected below (supply - "
                         "threshold) / R = (5 V - 3.33333 V) / 100 k\u03A9 = 16.6667 \u00B5A, or the capacitor never "
                         "reaches the threshold",
                         domain_error);
    CHECK_THROWS_WITH_AS(check_design(timer_monostable{.r = {.nominal = 1_kohm}, .c = {.nominal = 1_nF}},
                                      ranged<duration>::between(-1_us, 1_us)),
                         "check_design: trigger_pulse.low = -1 \u00B5s is invalid; expected a non-negative time",
                         invalid_argument);
}
