// Tests of networks/debounce.hpp: the press and release delays against their
// derivation (written here) and against Boost.Odeint integration of the circuit,
// including a bouncing contact; worst case against a dense brute-force grid; the
// findings of check_debounce word for word; synthesis with at_least / at_most
// windows whose designs are re-checked here with the derived relations.
// Set TAUFORGE_TEST_REPORT=1 to print the worst error each comparison measured.
#include "approx.hpp"
#include "ode_reference.hpp"
#include "random_cases.hpp"

#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/debounce.hpp>
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

// Derivation: pressed, the contact holds the node between R1 and R2 at 0 V, so C
// discharges through R2 from Vdd: v = Vdd e^(-t/(R2 C)) = VT-  =>  t = R2 C ln(Vdd/VT-).
// Released, C charges through R1 + R2 from 0 V: v = Vdd (1 - e^(-t/((R1+R2) C))) = VT+
// =>  t = (R1 + R2) C ln(Vdd / (Vdd - VT+)).
double press_formula(double r2, double c, double vdd, double vt_down) { return r2 * c * std::log(vdd / vt_down); }
double release_formula(double r1, double r2, double c, double vdd, double vt_up) {
    return (r1 + r2) * c * std::log(vdd / (vdd - vt_up));
}

/// The circuit's equation for the capacitor voltage v with the contact closed or open.
/// Node A (between R1 and R2) obeys (Vdd - A)/R1 = (A - v)/R2 when open (no contact
/// current) and A = 0 when closed; then C v' = (A - v)/R2.
ode::state<1> circuit(double r1, double r2, double c, double vdd, bool closed, const ode::state<1>& v) {
    const double a = closed ? 0.0 : (vdd * r2 + v[0] * r1) / (r1 + r2);
    return {(a - v[0]) / (r2 * c)};
}

/// Boost.Odeint: time for v to cross `level` from v0 with the contact held closed or open.
double ode_crossing(double r1, double r2, double c, double vdd, bool closed, double v0, double level) {
    auto f = [=](const ode::state<1>& v, double) { return circuit(r1, r2, c, vdd, closed, v); };
    auto p = ode::make_path<1>(f, ode::state<1>{v0}, 0.0, r2 * c);
    const auto t = p.first_root([=](const ode::state<1>& v) { return v[0] - level; }, 1e3 * (r1 + r2) * c);
    return t ? *t : std::numeric_limits<double>::infinity();
}

std::array<double, 8> point(double r1, double r2, double c, double vdd, double up, double down) {
    return {r1, r2, c, vdd, up, down, up * vdd, down * vdd};
}

}  // namespace

TEST_CASE("debounce: thresholds at 1/3 and 2/3 give R2 C ln 3 and (R1 + R2) C ln 3") {
    debounce d;  // VT+ = 2/3, VT- = 1/3 of the supply
    const auto t = d.evaluate(point(10e3, 100e3, 100e-9, 5.0, 2.0 / 3.0, 1.0 / 3.0));
    CHECK_REL(t[debounce::press_delay], 100e3 * 100e-9 * std::log(3.0), 1e-14);  // derivation
    CHECK_REL(t[debounce::release_delay], 110e3 * 100e-9 * std::log(3.0), 1e-14);
    CHECK_REL(t[debounce::press_delay], 10.98612e-3, 1e-6);  // 1.098612 x 10 ms
}

TEST_CASE("debounce: absolute Schmitt thresholds follow the derivation") {
    debounce d{.r1 = {.nominal = 22_kohm}, .r2 = {.nominal = 68_kohm}, .c = {.nominal = 220_nF}};
    d.supply = ranged<voltage>::exactly(3.3_V);
    d.upper_threshold = ranged<voltage>::exactly(2.0_V);
    d.lower_threshold = ranged<voltage>::exactly(1.2_V);
    const auto r = d.ranges();
    std::array<double, 8> x{};
    for (std::size_t i = 0; i < 8; ++i) x[i] = r[i].nominal;
    x[debounce::p_r1] = 22e3, x[debounce::p_r2] = 68e3, x[debounce::p_c] = 220e-9;
    const auto t = d.evaluate(x);
    CHECK_REL(t[0], press_formula(68e3, 220e-9, 3.3, 1.2), 1e-14);          // derivation
    CHECK_REL(t[1], release_formula(22e3, 68e3, 220e-9, 3.3, 2.0), 1e-14);  // derivation
    CHECK_REL(r[debounce::p_upper].nominal, 2.0 / 3.3, 1e-15);  // fixed, for information only
}

TEST_CASE("debounce: both delays agree with Boost.Odeint of the circuit within 1e-6") {
    std::mt19937_64 g(0xdeb0);
    double worst = 0.0;
    for (int n = 0; n < 40; ++n) {
        const double r1 = log_uniform(g, 1e3, 1e6), r2 = log_uniform(g, 1e3, 1e6), c = log_uniform(g, 1e-9, 1e-5);
        const double vdd = uniform(g, 1.8, 15.0), up = uniform(g, 0.5, 0.85), down = uniform(g, 0.15, 0.5);
        debounce d;
        const auto t = d.evaluate(point(r1, r2, c, vdd, up, down));
        const double press = ode_crossing(r1, r2, c, vdd, true, vdd, down * vdd);
        const double release = ode_crossing(r1, r2, c, vdd, false, 0.0, up * vdd);
        INFO("case " << n);
        CHECK_REL(t[0], press, 1e-6);    // Boost.Odeint
        CHECK_REL(t[1], release, 1e-6);  // Boost.Odeint
        worst = std::max({worst, tauforge_test::rel_diff(t[0], press), tauforge_test::rel_diff(t[1], release)});
    }
    report("debounce vs Odeint", worst);
}

TEST_CASE("debounce: a contact bouncing for less than the press delay cannot toggle the input (Odeint)") {
    // Boost.Odeint of the circuit under a random bounce: closed and open intervals of
    // 0.05 to 1 ms for 80 % of the press delay, then closed. The input first falls to
    // VT- no earlier than the press delay (a steady press is the fastest discharge)
    // and only after the bouncing has ended.
    const double r1 = 10e3, r2 = 47e3, c = 330e-9, vdd = 5.0, down = 1.0 / 3.0;
    debounce d;
    const double press = d.evaluate(point(r1, r2, c, vdd, 2.0 / 3.0, down))[0];
    std::mt19937_64 g(77);
    for (int trial = 0; trial < 10; ++trial) {
        double t = 0.0, v = vdd, first = -1.0;
        bool closed = true;
        const double bounce_end = 0.8 * press;
        while (first < 0.0) {
            const double len = t < bounce_end ? std::min(uniform(g, 0.05e-3, 1e-3), bounce_end - t) : 1.0;
            const bool cl = t < bounce_end ? closed : true;
            auto f = [=](const ode::state<1>& s, double) { return circuit(r1, r2, c, vdd, cl, s); };
            auto p = ode::make_path<1>(f, ode::state<1>{v}, t, r2 * c);
            if (auto hit = p.first_root([=](const ode::state<1>& s) { return s[0] - down * vdd; }, t + len)) {
                first = *hit;
                break;
            }
            v = ode::integrate<1>(f, ode::state<1>{v}, t, t + len)[0];
            t += len;
            closed = !closed;
        }
        INFO("trial " << trial);
        CHECK(first >= bounce_end);
        CHECK(first >= press * (1 - 1e-9));
    }
}

TEST_CASE("debounce: worst case equals the extremes of a dense brute-force grid") {
    debounce d{.r1 = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05), .tcr = ppm_band::symmetric(200)},
               .r2 = {.nominal = 47_kohm, .tol = tolerance::symmetric(0.01)},
               .c = {.nominal = 330_nF, .tol = tolerance::symmetric(0.10), .tempco = x7r}};
    d.conditions = {.t_min = celsius{-20}, .t_max = celsius{70}};
    d.supply = ranged<voltage>::around(3.3_V, tolerance::symmetric(0.1));
    d.upper_threshold = ranged<voltage>::between(1.6_V, 2.3_V);
    d.lower_threshold = ranged<double>::between(0.25, 0.4);
    const auto r = d.ranges();
    const auto wc = worst_case(d);
    const auto mb = metric_bounds(d);
    const auto f = check_debounce(d, 5_ms, 100_ms);
    const std::array<std::size_t, 6> free{debounce::p_r1,     debounce::p_r2,    debounce::p_c,
                                          debounce::p_supply, debounce::p_lower, debounce::p_upper_v};
    constexpr int n = 9;
    std::array<double, 8> x{};
    for (std::size_t i = 0; i < 8; ++i) x[i] = r[i].nominal;
    std::array<double, 2> lo{1e300, 1e300}, hi{-1e300, -1e300};
    std::array<int, 6> idx{};
    for (;;) {
        for (std::size_t j = 0; j < 6; ++j) {
            const interval& i = r[free[j]];
            x[free[j]] = idx[j] == n - 1 ? i.high : i.low + (i.high - i.low) * idx[j] / (n - 1);
        }
        const auto v = d.evaluate(x);
        for (int m = 0; m < 2; ++m) lo[m] = std::min(lo[m], v[m]), hi[m] = std::max(hi[m], v[m]);
        std::size_t j = 0;
        while (j < 6 && ++idx[j] == n) idx[j++] = 0;
        if (j == 6) break;
    }
    for (int m = 0; m < 2; ++m) {
        CHECK_REL(wc[m].min.value, lo[m], 1e-13);
        CHECK_REL(wc[m].max.value, hi[m], 1e-13);
        CHECK_REL(mb[m].low, lo[m], 1e-13);
        CHECK_REL(mb[m].high, hi[m], 1e-13);
    }
    CHECK_REL(f.press.low, lo[0], 1e-13);
    CHECK_REL(f.press.high, hi[0], 1e-13);
    CHECK_REL(f.release.low, lo[1], 1e-13);
    CHECK_REL(f.release.high, hi[1], 1e-13);
    // The press delay's extremes by the derivation: R2, C at their ends, VT- at the other end.
    CHECK_REL(hi[0], press_formula(r[1].high, r[2].high, 1.0, r[debounce::p_lower].low), 1e-13);
    CHECK_REL(lo[0], press_formula(r[1].low, r[2].low, 1.0, r[debounce::p_lower].high), 1e-13);
    // The release delay at an absolute VT+: longest at the highest VT+ and lowest supply.
    CHECK_REL(hi[1], release_formula(r[0].high, r[1].high, r[2].high, r[3].low, 2.3), 1e-13);
}

TEST_CASE("debounce: check_debounce names every requirement that fails") {
    debounce d{.r1 = {.nominal = 10_kohm}, .r2 = {.nominal = 47_kohm}, .c = {.nominal = 100_nF}};
    // press = 47k x 100n x ln 3 = 5.16348 ms, release = 57k x 100n x ln 3 = 6.26209 ms.
    auto f = check_debounce(d, 4_ms, 20_ms);
    CHECK(f.holds());
    CHECK(f.problems.empty());
    f = check_debounce(d, 6_ms, 6.2_ms);
    CHECK_FALSE(f.holds());
    REQUIRE(f.problems.size() == 2);
    CHECK(f.problems[0] ==
          "press delay can be as short as 5.16348 ms, less than the bounce time 6 ms: a bouncing contact can "
          "toggle the input");
    CHECK(f.problems[1] == "release delay can be as long as 6.26209 ms, more than the response limit 6.2 ms");
    CHECK_THROWS_WITH_AS(check_debounce(d, 0_ms, 6_ms),
                         "check_debounce: bounce = 0 s is invalid; expected a positive, finite time", invalid_argument);
    CHECK_THROWS_WITH_AS(check_debounce(d, 6_ms, 5_ms),
                         "check_debounce: response_limit = 5 ms is invalid; expected a limit longer than bounce = 6 ms",
                         invalid_argument);
}

TEST_CASE("debounce: thresholds outside the supply are rejected word for word") {
    debounce d{.r1 = {.nominal = 10_kohm}, .r2 = {.nominal = 47_kohm}, .c = {.nominal = 100_nF}};
    d.upper_threshold = ranged<double>::between(0.6, 1.05);
    CHECK_THROWS_WITH_AS(d.ranges(),
                         "debounce::ranges: upper_threshold.high = 1.05 is invalid; expected a ratio of the supply "
                         "strictly between 0 and 1",
                         invalid_argument);
    d.upper_threshold = ranged<double>::exactly(0.6);
    d.supply = ranged<voltage>::between(3_V, 3.6_V);
    d.lower_threshold = ranged<voltage>::between(1_V, 3.1_V);
    CHECK_THROWS_WITH_AS(d.ranges(),
                         "debounce::ranges: lower_threshold.high = 3.1 V is invalid; expected a threshold below the "
                         "lowest supply, supply.low = 3 V",
                         domain_error);
    d.lower_threshold = ranged<voltage>::between(-0.1_V, 1_V);
    CHECK_THROWS_WITH_AS(d.ranges(),
                         "debounce::ranges: lower_threshold.low = -100 mV is invalid; expected a threshold above 0 V",
                         invalid_argument);
}

TEST_CASE("debounce: synthesis with at_least / at_most windows holds by the derived relations") {
    // Bounce up to 5 ms; the press and the release must each be seen within 40 ms.
    debounce d{.r1 = {.tol = tolerance::symmetric(0.05)},
               .r2 = {.tol = tolerance::symmetric(0.05)},
               .c = {.tol = tolerance::symmetric(0.10)}};
    d.upper_threshold = ranged<double>::between(0.55, 0.7);
    d.lower_threshold = ranged<double>::between(0.3, 0.45);
    timing_spec<debounce> spec;
    spec.at_least("press delay", 5_ms).at_most("press delay", 40_ms);
    spec.at_least("release delay", 5_ms).at_most("release delay", 40_ms);
    const auto rs = candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 220_kohm));
    const auto cs = candidates(value_set<capacitance>::from_series(e_series::e12, 10_nF, 1_uF));
    const auto res = synthesize(d, spec, {rs, rs, cs}, {.top_k = 5});
    REQUIRE(res.feasible());
    for (const auto& des : res.designs) {
        const double r1 = des.parts[0].value, r2 = des.parts[1].value, c = des.parts[2].value;
        // Each delay rises with every part and falls with its threshold's distance from
        // the start: the extremes are at the matching ends (derivation above).
        const double p_min = press_formula(r2 * 0.95, c * 0.9, 1.0, 0.45), p_max = press_formula(r2 * 1.05, c * 1.1, 1.0, 0.3);
        const double r_min = release_formula(r1 * 0.95, r2 * 0.95, c * 0.9, 1.0, 0.55);
        const double r_max = release_formula(r1 * 1.05, r2 * 1.05, c * 1.1, 1.0, 0.7);
        INFO(describe(des, spec));
        CHECK(p_min >= 5e-3 * (1 - 1e-12));
        CHECK(p_max <= 40e-3 * (1 + 1e-12));
        CHECK(r_min >= 5e-3 * (1 - 1e-12));
        CHECK(r_max <= 40e-3 * (1 + 1e-12));
        CHECK_REL(des.worst_min[0], p_min, 1e-12);
        CHECK_REL(des.worst_max[1], r_max, 1e-12);
        CHECK(check_debounce(des.network, 5_ms, 40_ms).holds());
    }
    // Thresholds and tolerances alone spread the press delay by a factor
    // ln(1/0.3)/ln(1/0.45) x (1.05 x 1.1)/(0.95 x 0.9) = 2.04: a 20 to 30 ms window cannot hold it.
    timing_spec<debounce> tight;
    tight.at_least("press delay", 20_ms).at_most("press delay", 30_ms);
    const auto r12 = candidates(value_set<resistance>::from_series(e_series::e12, 1_kohm, 100_kohm));
    const auto none = synthesize(d, tight, {r12, r12, cs});
    CHECK_FALSE(none.feasible());
    timing_spec<debounce> window;
    window.between("press delay", 20_ms, 30_ms);
    const auto too_wide = synthesize(d, window, {r12, r12, cs});
    CHECK_FALSE(too_wide.feasible());
    CHECK(too_wide.why == infeasibility::tolerance_too_wide);
    CHECK(too_wide.reason.rfind("no design holds press delay within [20 ms, 30 ms]: the parts' tolerances and "
                                "operating ranges alone spread it wider than the window",
                                0) == 0);
}

TEST_CASE("debounce: the fast path returns exactly the exhaustive top-k") {
    std::mt19937_64 g(5);
    const auto rs = candidates(value_set<resistance>::from_series(e_series::e6, 1_kohm, 100_kohm));
    const auto cs = candidates(value_set<capacitance>::from_series(e_series::e6, 10_nF, 1_uF));
    debounce d{.r1 = {.tol = tolerance::symmetric(0.05)},
               .r2 = {.tol = tolerance::symmetric(0.05)},
               .c = {.tol = tolerance::symmetric(0.10)}};
    for (int n = 0; n < 10; ++n) {
        const double bounce = 1e-4 * std::pow(10.0, 2.0 * unit(g)), limit = bounce * uniform(g, 3.0, 20.0);
        timing_spec<debounce> spec;
        spec.between("press delay", duration::from_value(bounce), duration::from_value(limit));
        spec.between("release delay", duration::from_value(bounce), duration::from_value(limit));
        const auto fast = synthesize(d, spec, {rs, rs, cs}, {.top_k = 4, .method = search_method::fast});
        const auto full = synthesize(d, spec, {rs, rs, cs}, {.top_k = 4, .method = search_method::exhaustive});
        INFO("spec " << n);
        REQUIRE(fast.designs.size() == full.designs.size());
        for (std::size_t i = 0; i < fast.designs.size(); ++i)
            for (std::size_t s = 0; s < 3; ++s) CHECK(fast.designs[i].parts[s].value == full.designs[i].parts[s].value);
    }
}

TEST_CASE("debounce: solve_slot inverts each delay") {
    debounce d;  // 1/3 and 2/3: press = R2 C ln 3, release = (R1 + R2) C ln 3 (derivation)
    const double ln3 = std::log(3.0);
    CHECK_REL(d.solve_slot(1, debounce::press_delay, 10e-3, {0.0, 0.0, 100e-9}), 10e-3 / (ln3 * 100e-9), 1e-14);
    CHECK_REL(d.solve_slot(2, debounce::press_delay, 10e-3, {0.0, 47e3, 0.0}), 10e-3 / (ln3 * 47e3), 1e-14);
    CHECK(std::isnan(d.solve_slot(0, debounce::press_delay, 10e-3, {0.0, 47e3, 100e-9})));
    CHECK_REL(d.solve_slot(0, debounce::release_delay, 10e-3, {0.0, 47e3, 100e-9}), 10e-3 / (ln3 * 100e-9) - 47e3,
              1e-13);
    CHECK_REL(d.solve_slot(2, debounce::release_delay, 10e-3, {10e3, 47e3, 0.0}), 10e-3 / (ln3 * 57e3), 1e-14);
    CHECK(d.solve_slot(0, debounce::release_delay, 1e-6, {0.0, 47e3, 100e-9}) <= 0.0);  // R2 alone is too slow
}
