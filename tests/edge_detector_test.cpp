// Tests of networks/edge_detector.hpp: the width RC ln 1.5 derived here, the
// customary 1-10 us trigger pulses, a Boost.Odeint integration of the
// capacitor's equation across the input step, worst case against a dense grid,
// synthesis re-checked independently, solve_slot, the trigger-window checks
// and bad inputs.
#include "approx.hpp"
#include "ode_reference.hpp"
#include "random_cases.hpp"

#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/edge_detector.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <random>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

using tauforge_test::unit;
using tauforge_test::between;

namespace ode = tauforge_test::ode;

void report(const char* what, double worst) {
    if (const char* e = std::getenv("TAUFORGE_TEST_REPORT"); e && *e == '1')
        std::printf("%s: worst relative difference %.3g\n", what, worst);
}

// Derivation. Let q = v - u be the capacitor's voltage (node v, input u). The
// pull-up gives C dq/dt = (Vdd - v) / R = (Vdd - q - u) / R. At rest (u = V for a
// long time) q = Vdd - V and v = Vdd. The falling step sets u = 0 at t = 0; q is
// continuous, so v jumps to Vdd - V and then v = q = Vdd - V e^(-t/RC). It stays
// below k Vdd until V e^(-t/RC) = (1 - k) Vdd: width = RC ln(V / ((1 - k) Vdd)),
// RC ln 1.5 for V = Vdd and k = 1/3.
double ref_width(double r, double c, double vdd, double v, double k) { return r * c * std::log(v / ((1 - k) * vdd)); }

edge_detector make(double r, double c, double vdd, double v, double k) {
    return {.r = {.nominal = resistance::from_value(r)},
            .c = {.nominal = capacitance::from_value(c)},
            .supply = ranged<voltage>::exactly(voltage::from_value(vdd)),
            .step = ranged<voltage>::exactly(voltage::from_value(v)),
            .threshold = ranged<double>::exactly(k)};
}

double nominal_width(const edge_detector& e) { return e.evaluate(detail::nominal_point(e.ranges()))[0]; }

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

TEST_CASE("edge_detector: a full-swing step gives RC ln 1.5 below 1/3 of the supply") {
    // Derivation in the test (ref_width).
    CHECK_REL(nominal_width(make(10e3, 1e-9, 5.0, 5.0, 1.0 / 3.0)), 10e-6 * std::log(1.5), 1e-14);
    CHECK_REL(nominal_width(make(10e3, 1e-9, 12.0, 12.0, 1.0 / 3.0)), 10e-6 * std::log(1.5), 1e-14);
    CHECK_REL(nominal_width(make(10e3, 1e-9, 12.0, 12.0, 1.0 / 3.0)), 0.405465e-5, 1e-6);
    // A half-swing step below a 2/3 threshold: ln(0.5 / (1/3)) = ln 1.5 again.
    CHECK_REL(nominal_width(make(10e3, 1e-9, 5.0, 2.5, 2.0 / 3.0)), 10e-6 * std::log(1.5), 1e-14);
}

TEST_CASE("edge_detector: 10 kOhm with 330 pF to 1 nF gives trigger pulses of about 1-10 us") {
    // Common practice: trigger pulses of about 1-10 us, e.g. 10 kOhm with 100 pF-1 nF;
    // RC ln 1.5 puts 330 pF at 1.34 us and 1 nF at 4.05 us (100 pF gives 0.41 us,
    // below the customary range: the rule is approximate).
    for (double c : {330e-12, 470e-12, 1e-9}) {
        const double w = nominal_width(make(10e3, c, 5.0, 5.0, 1.0 / 3.0));
        CHECK(w > 1e-6);
        CHECK(w < 10e-6);
    }
    CHECK(nominal_width(make(10e3, 100e-12, 5.0, 5.0, 1.0 / 3.0)) < 1e-6);
}

TEST_CASE("edge_detector: Boost.Odeint integration across the input step agrees within 1e-6") {
    // The capacitor's equation is integrated from rest before the edge through a
    // falling step of the input (the input is u(t) = V before t0, 0 after); the
    // node v = q + u is watched for the threshold after the edge.
    std::mt19937_64 g(404);
    double worst = 0.0;
    for (int n = 0; n < 150; ++n) {
        const double r = std::pow(10.0, between(g, 3.0, 5.0)), c = std::pow(10.0, between(g, -11.0, -8.0));
        const double vdd = between(g, 3.0, 15.0), k = between(g, 0.2, 0.6);
        const double v = between(g, 1.05 * (1 - k), 1.3) * vdd;  // also beyond the supply
        const double tau = r * c, t0 = 3.0 * tau;
        auto rhs = [&](const ode::state<1>& q, double t) {
            const double u = t < t0 ? v : 0.0;
            return ode::state<1>{(vdd - q[0] - u) / tau};
        };
        // Before the edge: rest is q = Vdd - V; integrate up to the edge (it must stay there).
        const auto q_edge = ode::integrate<1>(rhs, ode::state<1>{vdd - v}, 0.0, t0);
        CHECK(std::abs(q_edge[0] - (vdd - v)) <= 1e-12 * vdd);
        auto path = ode::make_path<1>(rhs, q_edge, t0, tau);
        const auto t = path.first_root([&](const ode::state<1>& q) { return q[0] - k * vdd; }, t0 + 50.0 * tau);
        REQUIRE(t);
        const double w = nominal_width(make(r, c, vdd, v, k));
        INFO("case " << n);
        CHECK_REL(w, *t - t0, 1e-6);
        worst = std::max(worst, tauforge_test::rel_diff(w, *t - t0));
    }
    report("edge_detector vs Odeint", worst);
}

TEST_CASE("edge_detector: worst case equals the extremes of a dense grid") {
    edge_detector e{.r = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)},
                    .c = {.nominal = 1_nF, .tol = tolerance::symmetric(0.10)},
                    .supply = ranged<voltage>::between(4.5_V, 5.5_V),
                    .step = ranged<voltage>::between(4.2_V, 5.5_V),
                    .threshold = ranged<double>::plus_minus(1.0 / 3.0, 0.03)};
    const auto wc = worst_case(e);
    CHECK(wc.free_parameters == 5);
    double lo = 1e300, hi = 0.0;
    const double k = 1.0 / 3.0;
    for_each_grid_point<5>(
        {{{9.5e3, 10.5e3, 11}, {0.9e-9, 1.1e-9, 11}, {4.5, 5.5, 11}, {4.2, 5.5, 11}, {k - 0.03, k + 0.03, 11}}},
        [&](const std::array<double, 5>& g) {
            const double w = ref_width(g[0], g[1], g[2], g[3], g[4]);
            lo = std::min(lo, w);
            hi = std::max(hi, w);
        });
    CHECK_REL(wc[0].min.value, lo, 1e-12);
    CHECK_REL(wc[0].max.value, hi, 1e-12);
    for (std::size_t p = 0; p < wc.monotone.size(); ++p) CHECK(wc.monotone[p]);
    const auto range = e.pulse_width_range();
    CHECK_REL(range.low.value(), lo, 1e-12);
    CHECK_REL(range.high.value(), hi, 1e-12);
}

TEST_CASE("edge_detector: synthesis of a 2-6 us trigger pulse holds at worst case by the derivation") {
    // A 5 V logic output falling by 4.8-5 V; E12 resistors (10 %), E12 capacitors at 5 %.
    edge_detector e{.step = ranged<voltage>::between(4.8_V, 5_V),
                    .threshold = ranged<double>::plus_minus(1.0 / 3.0, 0.02)};
    timing_spec<edge_detector> spec;
    spec.between("pulse width", 2_us, 6_us);
    const auto rs = candidates(value_set<resistance>::from_series(e_series::e12, 1_kohm, 100_kohm));
    const auto cs =
        candidates(value_set<capacitance>::from_series(e_series::e12, 100_pF, 10_nF, tolerance::symmetric(0.05)));
    const auto res = synthesize(e, spec, {rs, cs}, {.top_k = 8});
    REQUIRE(res.designs.size() == 8);
    for (const auto& d : res.designs) {
        // Monotone (the grid test above): longest at R, C, step and threshold high
        // (the node spends longer below a higher level); shortest at their lows.
        const double r = d.parts[0].value, c = d.parts[1].value;
        CHECK(d.parts[0].tol == tolerance::symmetric(0.10));
        CHECK(d.parts[1].tol == tolerance::symmetric(0.05));
        const double w_lo = ref_width(r * 0.9, c * 0.95, 5.0, 4.8, 1.0 / 3.0 - 0.02);
        const double w_hi = ref_width(r * 1.1, c * 1.05, 5.0, 5.0, 1.0 / 3.0 + 0.02);
        CHECK(w_lo >= 2e-6 * (1 - 1e-12));
        CHECK(w_hi <= 6e-6 * (1 + 1e-12));
        CHECK_REL(d.worst_min[0], w_lo, 1e-12);
        CHECK_REL(d.worst_max[0], w_hi, 1e-12);
    }
}

TEST_CASE("edge_detector: solve_slot puts the width at its target") {
    const auto e = make(22e3, 470e-12, 5.0, 4.0, 0.4);
    const double w = nominal_width(e);
    CHECK_REL(e.solve_slot(0, 0, w, {0.0, 470e-12}), 22e3, 1e-13);
    CHECK_REL(e.solve_slot(1, 0, w, {22e3, 0.0}), 470e-12, 1e-13);
    CHECK(std::isnan(e.solve_slot(1, 1, w, {22e3, 0.0})));
}

TEST_CASE("edge_detector: a step too small to reach the threshold is a domain_error naming the values") {
    const auto e = make(10e3, 1e-9, 5.0, 3.0, 1.0 / 3.0);
    CHECK_THROWS_WITH_AS(
        nominal_width(e),
        "edge_detector::evaluate: step = 3 V is invalid; expected more than supply - threshold = 5 V - "
        "1.66667 V = 3.33333 V, or the node (down to 2 V) never falls below the threshold",
        domain_error);
    // At worst case: the smallest step at the highest supply and lowest threshold.
    edge_detector f{.r = {.nominal = 10_kohm},
                    .c = {.nominal = 1_nF},
                    .supply = ranged<voltage>::between(4.5_V, 5.5_V),
                    .step = ranged<voltage>::between(3.5_V, 5_V)};
    CHECK_THROWS_WITH_AS(
        metric_bounds(f),
        "edge_detector::evaluate: step = 3.5 V is invalid; expected more than supply - threshold = 5.5 V - "
        "1.83333 V = 3.66667 V, or the node (down to 2 V) never falls below the threshold",
        domain_error);
}

TEST_CASE("edge_detector: thresholds outside the supply and other bad inputs are rejected") {
    auto e = make(10e3, 1e-9, 5.0, 5.0, 1.0);
    CHECK_THROWS_WITH_AS(e.ranges(),
                         "edge_detector::ranges: threshold.high = 1 is invalid; expected a ratio of the supply "
                         "strictly between 0 and 1",
                         domain_error);
    e.threshold = ranged<double>::between(-0.1, 0.3);
    CHECK_THROWS_WITH_AS(e.ranges(),
                         "edge_detector::ranges: threshold.low = -0.1 is invalid; expected a ratio of the supply "
                         "strictly between 0 and 1",
                         domain_error);
    e.threshold = ranged<double>::exactly(1.0 / 3.0);
    e.step = ranged<voltage>::exactly(0_V);
    CHECK_THROWS_WITH_AS(e.ranges(),
                         "edge_detector::ranges: step.low = 0 V is invalid; expected a positive step amplitude",
                         invalid_argument);
}

TEST_CASE("edge_detector: check_trigger passes a pulse inside the window") {
    edge_detector e{.r = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)},
                    .c = {.nominal = 1_nF, .tol = tolerance::symmetric(0.10)}};
    CHECK(check_trigger(e, trigger_window{.min_width = 1_us, .one_shot_width = 1_ms, .max_fraction = 0.1}).empty());
}

TEST_CASE("edge_detector: check_trigger reports pulses too short or too long and a step beyond the supply") {
    // 10 kOhm +/-5 %, 1 nF +/-10 %, steps of 5-5.5 V at 5 V: 3.467 .. 5.784 us (derivation).
    edge_detector e{.r = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)},
                    .c = {.nominal = 1_nF, .tol = tolerance::symmetric(0.10)},
                    .step = ranged<voltage>::between(5_V, 5.5_V)};
    const double w_lo = ref_width(9.5e3, 0.9e-9, 5.0, 5.0, 1.0 / 3.0),
                 w_hi = ref_width(10.5e3, 1.1e-9, 5.0, 5.5, 1.0 / 3.0);
    CHECK_REL(w_lo, 3.467e-6, 2e-4);
    const auto f = check_trigger(e, trigger_window{.min_width = 4_us, .one_shot_width = 8_us, .max_fraction = 0.5});
    REQUIRE(f.size() == 3);
    CHECK(f[0].rule == "trigger_too_short");
    CHECK(f[0].level == severity::violation);
    CHECK(f[0].message ==
          "the trigger pulse can be as short as 3.467 \u00B5s, not longer than the trigger input's "
          "minimum width of 4 \u00B5s");
    CHECK(f[1].rule == "trigger_too_long");
    CHECK(format(duration::from_value(w_hi), {.digits = 4}) == "5.784 \u00B5s");
    CHECK(f[1].message ==
          "the trigger pulse can last 5.784 \u00B5s, not shorter than 50 % of the one-shot's "
          "shortest pulse 8 \u00B5s = 4 \u00B5s");
    CHECK(f[2].rule == "below_ground");
    CHECK(f[2].level == severity::warning);
    CHECK(f[2].message ==
          "the step (up to 5.5 V) exceeds the supply (down to 5 V): the node dips below 0 V, where "
          "an input clamp would conduct and shorten the pulse");
    CHECK_THROWS_WITH_AS(check_trigger(e, trigger_window{.min_width = 1_us}),
                         "check_trigger: one_shot_width = 0 s is invalid; expected a positive, finite time",
                         invalid_argument);
}

TEST_CASE("edge_detector: checked against the one-shot it triggers") {
    // The one-shot: 10 kOhm +/-1 %, 10 nF +/-10 %, shortest pulse 0.99 x 0.9 x 0.1 ms x ln 3
    // = 97.9 us (common practice relation); its trigger input needs 1 us.
    const timer_monostable one_shot{.r = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.01)},
                                    .c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)},
                                    .min_trigger_width = 1_us};
    edge_detector e{.r = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)},
                    .c = {.nominal = 470_pF, .tol = tolerance::symmetric(0.10)}};
    CHECK(check_trigger(e, one_shot).empty());
    CHECK(check_design(one_shot, e.pulse_width_range()).empty());
    // 10 % of the one-shot's shortest pulse is 9.79 us: a 4.7 nF capacitor's pulse lasts up to 22 us.
    e.c.nominal = 4.7_nF;
    const auto f = check_trigger(e, one_shot, 0.1);
    REQUIRE(f.size() == 1);
    CHECK(f[0].rule == "trigger_too_long");
    CHECK(f[0].message ==
          "the trigger pulse can last 22.01 \u00B5s, not shorter than 10 % of the one-shot's "
          "shortest pulse 97.89 \u00B5s = 9.789 \u00B5s");
    e.c.nominal = 100_pF;  // at most 0.47 us: shorter than the 1 us the trigger input needs
    const auto g = check_design(one_shot, e.pulse_width_range());
    REQUIRE(g.size() == 1);
    CHECK(g[0].rule == "trigger_too_short");
}
