// Tests of networks/schmitt_oscillator.hpp: the period relation derived here,
// 2 ln 2 RC at thresholds 1/3 and 2/3, Boost.Odeint simulation with switching
// events from 0 V, worst case against dense grids (including a duty that turns
// inside a threshold range), synthesis re-checked independently, solve_slot
// and bad inputs.
#include "approx.hpp"
#include "ode_reference.hpp"
#include "random_cases.hpp"

#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/schmitt_oscillator.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <random>
#include <vector>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

using tauforge_test::unit;
using tauforge_test::between;
using tauforge_test::ode::first_crossing;
using tauforge_test::ode::switching_times;

namespace ode = tauforge_test::ode;

// With TAUFORGE_TEST_REPORT=1, prints the worst difference a test measured.
void report(const char* what, double worst) {
    if (const char* e = std::getenv("TAUFORGE_TEST_REPORT"); e && *e == '1')
        std::printf("%s: worst relative difference %.3g\n", what, worst);
}

// Derivation. The input node obeys C dv/dt = (u - v) / R with u the output level.
// Output high (u = VOH, input rising from VT-): v = VOH - (VOH - VT-) e^(-t/RC)
// reaches VT+ after RC ln((VOH - VT-)/(VOH - VT+)). Output low (u = VOL, falling
// from VT+): v = VOL + (VT+ - VOL) e^(-t/RC) reaches VT- after RC ln((VT+ - VOL)/(VT- - VOL)).
// With VOL = 0, VOH = Vdd the sum is RC [ln(VT+/VT-) + ln((Vdd - VT-)/(Vdd - VT+))].
struct point {
    double r, c, vtp, vtm, voh, vol;
};
std::array<double, 5> ref_metrics(const point& p) {
    const double th = p.r * p.c * std::log((p.voh - p.vtm) / (p.voh - p.vtp));
    const double tl = p.r * p.c * std::log((p.vtp - p.vol) / (p.vtm - p.vol));
    return {th, tl, th + tl, 1.0 / (th + tl), th / (th + tl)};
}

schmitt_oscillator absolute(double r, double c, double vdd, double vtp, double vtm) {
    return {.r = {.nominal = resistance::from_value(r)},
            .c = {.nominal = capacitance::from_value(c)},
            .supply = ranged<voltage>::exactly(voltage::from_value(vdd)),
            .upper_threshold = ranged<voltage>::exactly(voltage::from_value(vtp)),
            .lower_threshold = ranged<voltage>::exactly(voltage::from_value(vtm))};
}

std::array<double, 5> nominal(const schmitt_oscillator& s) { return s.evaluate(detail::nominal_point(s.ranges())); }

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

TEST_CASE("schmitt_oscillator: period = RC [ln(VT+/VT-) + ln((Vdd - VT-)/(Vdd - VT+))]") {
    // Derivation in the test (ref_metrics), rail-to-rail output.
    const double pairs[][2] = {{3.0, 2.0}, {2.9, 1.6}, {3.4, 2.1}, {4.0, 1.0}, {2.6, 2.4}};
    for (const auto& q : pairs) {
        const auto v = nominal(absolute(10e3, 100e-9, 5.0, q[0], q[1]));
        const double period = 1e-3 * (std::log(q[0] / q[1]) + std::log((5.0 - q[1]) / (5.0 - q[0])));
        INFO("VT+ " << q[0] << " VT- " << q[1]);
        CHECK_REL(v[schmitt_oscillator::period], period, 1e-14);
        CHECK_REL(v[schmitt_oscillator::frequency], 1.0 / period, 1e-14);
        CHECK_REL(v[schmitt_oscillator::duty], std::log((5.0 - q[1]) / (5.0 - q[0])) / (period * 1e3), 1e-14);
    }
}

TEST_CASE("schmitt_oscillator: thresholds at 1/3 and 2/3 give T = 2 ln 2 RC = 1.386 RC") {
    // Derivation: each half is RC ln((1 - 1/3)/(1 - 2/3)) = RC ln 2; the duty is 50 %.
    schmitt_oscillator s{.r = {.nominal = 47_kohm}, .c = {.nominal = 10_nF}};
    const auto v = nominal(s);
    CHECK_REL(v[schmitt_oscillator::period], 2.0 * std::log(2.0) * 470e-6, 1e-14);
    CHECK_REL(v[schmitt_oscillator::period], 1.386 * 470e-6, 4e-4);  // given to 4 figures
    CHECK_REL(v[schmitt_oscillator::duty], 0.5, 1e-14);
}

TEST_CASE("schmitt_oscillator: output levels below the rails lengthen both halves") {
    // ref_metrics with VOH = 5 - 0.3 V and VOL = 0.2 V (derivation above).
    schmitt_oscillator s{.r = {.nominal = 10_kohm},
                         .c = {.nominal = 100_nF},
                         .output_high_drop = ranged<voltage>::exactly(0.3_V),
                         .output_low = ranged<voltage>::exactly(0.2_V)};
    const auto v = nominal(s);
    const auto ref = ref_metrics({10e3, 100e-9, 10.0 / 3.0, 5.0 / 3.0, 4.7, 0.2});
    for (std::size_t j = 0; j < 5; ++j) CHECK_REL(v[j], ref[j], 1e-14);
    CHECK(v[schmitt_oscillator::period] > 2.0 * std::log(2.0) * 1e-3);
}

TEST_CASE("schmitt_oscillator: Boost.Odeint simulation with switching events agrees within 1e-6") {
    // 100 random oscillators, thresholds as ratios or absolute levels; from 0 V the
    // output is high, C charges to VT+, the output falls, C discharges to VT-, ...;
    // the last of four cycles is compared.
    std::mt19937_64 g(1234);
    double worst = 0.0;
    for (int n = 0; n < 100; ++n) {
        point p{};
        p.r = std::pow(10.0, between(g, 3.0, 6.0));
        p.c = std::pow(10.0, between(g, -10.0, -6.0));
        const double vdd = between(g, 3.0, 15.0);
        p.vtm = vdd * between(g, 0.2, 0.45);
        p.vtp = vdd * between(g, 0.5, 0.8);
        p.voh = vdd - between(g, 0.0, 0.1 * vdd);
        p.vol = between(g, 0.0, 0.5 * p.vtm);
        schmitt_oscillator s{.r = {.nominal = resistance::from_value(p.r)},
                             .c = {.nominal = capacitance::from_value(p.c)},
                             .supply = ranged<voltage>::exactly(voltage::from_value(vdd)),
                             .output_high_drop = ranged<voltage>::exactly(voltage::from_value(vdd - p.voh)),
                             .output_low = ranged<voltage>::exactly(voltage::from_value(p.vol))};
        if (n % 2) {
            s.upper_threshold = ranged<double>::exactly(p.vtp / vdd);
            s.lower_threshold = ranged<voltage>::exactly(voltage::from_value(p.vtm));
        } else {
            s.upper_threshold = ranged<voltage>::exactly(voltage::from_value(p.vtp));
            s.lower_threshold = ranged<double>::exactly(p.vtm / vdd);
        }
        const auto v = nominal(s);
        const auto high = [p](double, double x) { return (p.voh - x) / (p.r * p.c); };
        const auto low = [p](double, double x) { return (p.vol - x) / (p.r * p.c); };
        const auto t = switching_times(high, p.vtp, low, p.vtm, 0.0, 9, 100.0 * p.r * p.c);
        REQUIRE(t.size() == 9);
        const double th = t[8] - t[7], tl = t[7] - t[6], period = t[8] - t[6];
        INFO("case " << n);
        CHECK_REL(v[schmitt_oscillator::high_time], th, 1e-6);
        CHECK_REL(v[schmitt_oscillator::low_time], tl, 1e-6);
        CHECK_REL(v[schmitt_oscillator::period], period, 1e-6);
        worst = std::max({worst, tauforge_test::rel_diff(v[0], th), tauforge_test::rel_diff(v[1], tl),
                          tauforge_test::rel_diff(v[2], period)});
        // The start-up half from 0 V is longer: RC ln(VOH / (VOH - VT+)).
        CHECK_REL(t[0], p.r * p.c * std::log(p.voh / (p.voh - p.vtp)), 1e-6);
    }
    report("schmitt_oscillator vs Odeint", worst);
}

TEST_CASE("schmitt_oscillator: worst case equals the extremes of a dense grid") {
    schmitt_oscillator s{.r = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)},
                         .c = {.nominal = 100_nF, .tol = tolerance::symmetric(0.10)},
                         .supply = ranged<voltage>::between(4.5_V, 5.5_V),
                         .upper_threshold = ranged<voltage>::between(2.9_V, 3.4_V),
                         .lower_threshold = ranged<voltage>::between(1.4_V, 2.1_V),
                         .output_high_drop = ranged<voltage>::between(0_V, 0.3_V),
                         .output_low = ranged<voltage>::between(0_V, 0.2_V)};
    const auto wc = worst_case(s);
    CHECK(wc.free_parameters == 7);
    std::array<double, 5> lo, hi;
    lo.fill(1e300);
    hi.fill(-1e300);
    // Axes: R, C, supply, VT+, VT-, output high drop, output low.
    for_each_grid_point<7>({{{9.5e3, 10.5e3, 5},
                             {90e-9, 110e-9, 5},
                             {4.5, 5.5, 5},
                             {2.9, 3.4, 5},
                             {1.4, 2.1, 5},
                             {0.0, 0.3, 5},
                             {0.0, 0.2, 5}}},
                           [&](const std::array<double, 7>& g) {
                               const auto v = ref_metrics({g[0], g[1], g[3], g[4], g[2] - g[5], g[6]});
                               for (std::size_t j = 0; j < 5; ++j)
                                   lo[j] = std::min(lo[j], v[j]), hi[j] = std::max(hi[j], v[j]);
                           });
    for (std::size_t j = 0; j < 5; ++j) {
        INFO("metric " << schmitt_oscillator::metrics[j].name);
        CHECK_REL(wc[j].min.value, lo[j], 1e-12);
        CHECK_REL(wc[j].max.value, hi[j], 1e-12);
    }
    for (std::size_t p = 0; p < wc.monotone.size(); ++p) CHECK(wc.monotone[p]);
}

TEST_CASE("schmitt_oscillator: the duty rises with either threshold") {
    // Derivation (see the header): d(duty)/d(VT+) has the sign of
    // (b + h) ln(1 + h/b) - a ln(1 + h/a) > 0 with a = VOH - VT+, b = VT- - VOL, h = VT+ - VT-;
    // likewise for VT-. Checked here on a fine line through each threshold's range.
    double prev_up = -1.0, prev_lo = -1.0;
    for (int i = 0; i <= 400; ++i) {
        const double up = ref_metrics({1.0, 1.0, 2.0 + 2.5 * i / 400.0, 1.5, 5.0, 0.2})[4];
        const double lo = ref_metrics({1.0, 1.0, 3.5, 0.3 + 3.0 * i / 400.0, 5.0, 0.2})[4];
        CHECK(up > prev_up);
        CHECK(lo > prev_lo);
        prev_up = up;
        prev_lo = lo;
    }
    schmitt_oscillator s{.r = {.nominal = 10_kohm},
                         .c = {.nominal = 100_nF},
                         .upper_threshold = ranged<double>::between(0.4, 0.8),
                         .lower_threshold = ranged<double>::between(0.1, 0.35)};
    const auto wc = worst_case(s);
    CHECK(wc.monotone[schmitt_oscillator::p_upper_ratio]);
    CHECK(wc.monotone[schmitt_oscillator::p_lower_ratio]);
    CHECK_REL(wc[schmitt_oscillator::duty].min.value, ref_metrics({1.0, 1.0, 2.0, 0.5, 5.0, 0.0})[4], 1e-13);
    CHECK_REL(wc[schmitt_oscillator::duty].max.value, ref_metrics({1.0, 1.0, 4.0, 1.75, 5.0, 0.0})[4], 1e-13);
}

TEST_CASE("schmitt_oscillator: with both output levels off the rails the duty turns inside the supply range") {
    // Ratio thresholds 0.62 and 0.25, VOH = Vdd - 0.8 V, VOL = 0.55 V: high and low time
    // both fall as Vdd rises and the duty peaks near 3 V (a fine line of ref_metrics).
    // worst_case finds that interior maximum; the corners alone miss it.
    schmitt_oscillator s{.r = {.nominal = 10_kohm},
                         .c = {.nominal = 100_nF},
                         .supply = ranged<voltage>::between(2.5_V, 5_V),
                         .upper_threshold = ranged<double>::exactly(0.62),
                         .lower_threshold = ranged<double>::exactly(0.25),
                         .output_high_drop = ranged<voltage>::exactly(0.8_V),
                         .output_low = ranged<voltage>::exactly(0.55_V)};
    const auto wc = worst_case(s);
    CHECK_FALSE(wc.monotone[schmitt_oscillator::p_supply]);
    double line_max = 0.0, at = 0.0;
    for (int i = 0; i <= 4000; ++i) {
        const double vdd = 2.5 + 2.5 * i / 4000.0;
        const double d = ref_metrics({1.0, 1.0, 0.62 * vdd, 0.25 * vdd, vdd - 0.8, 0.55})[4];
        if (d > line_max) line_max = d, at = vdd;
    }
    CHECK(at > 2.6);
    CHECK(at < 4.9);
    CHECK(wc[schmitt_oscillator::duty].max.value >= line_max * (1 - 1e-12));
    CHECK_REL(wc[schmitt_oscillator::duty].max.value, line_max, 1e-8);
    CHECK(wc[schmitt_oscillator::duty].max.positions[schmitt_oscillator::p_supply] == corner_position::interior);
    CHECK(metric_bounds(s)[schmitt_oscillator::duty].high < line_max * (1 - 1e-3));
}

TEST_CASE("schmitt_oscillator: synthesis for 1 kHz holds at worst case by the relations derived here") {
    schmitt_oscillator s{.upper_threshold = ranged<voltage>::between(3.1_V, 3.3_V),
                         .lower_threshold = ranged<voltage>::between(1.7_V, 1.9_V)};
    timing_spec<schmitt_oscillator> spec;
    spec.around("frequency", 1_kHz, tolerance::symmetric(0.30));
    const auto rs = candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm));
    const auto cs =
        candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF, tolerance::symmetric(0.05)));
    const auto res = synthesize(s, spec, {rs, cs}, {.top_k = 10});
    REQUIRE(res.designs.size() == 10);
    for (const auto& d : res.designs) {
        double f_lo = 1e300, f_hi = 0.0;
        for (int mask = 0; mask < 16; ++mask) {
            const auto bit = [&](int b, double x, double y) { return (mask >> b & 1) ? y : x; };
            const point p{d.parts[0].value * bit(0, 0.95, 1.05),
                          d.parts[1].value * bit(1, 0.95, 1.05),
                          bit(2, 3.1, 3.3),
                          bit(3, 1.7, 1.9),
                          5.0,
                          0.0};
            const double f = ref_metrics(p)[3];
            f_lo = std::min(f_lo, f);
            f_hi = std::max(f_hi, f);
        }
        CHECK(f_lo >= 700.0 * (1 - 1e-12));
        CHECK(f_hi <= 1300.0 * (1 + 1e-12));
        CHECK_REL(d.worst_min[schmitt_oscillator::frequency], f_lo, 1e-12);
        CHECK_REL(d.worst_max[schmitt_oscillator::frequency], f_hi, 1e-12);
    }
}

TEST_CASE("schmitt_oscillator: solve_slot puts each time metric and the frequency at its target") {
    schmitt_oscillator s{.r = {.nominal = 33_kohm},
                         .c = {.nominal = 4.7_nF},
                         .upper_threshold = ranged<voltage>::exactly(3.2_V),
                         .lower_threshold = ranged<double>::exactly(0.35)};
    const auto v = nominal(s);
    for (std::size_t m = 0; m < 4; ++m) {
        CHECK_REL(s.solve_slot(0, m, v[m], {0.0, 4.7e-9}), 33e3, 1e-13);
        CHECK_REL(s.solve_slot(1, m, v[m], {33e3, 0.0}), 4.7e-9, 1e-13);
    }
    CHECK(std::isnan(s.solve_slot(0, schmitt_oscillator::duty, 0.5, {0.0, 4.7e-9})));
}

TEST_CASE("schmitt_oscillator: thresholds outside the output swing or inverted are rejected") {
    auto s = absolute(10e3, 1e-9, 5.0, 5.2, 2.0);
    CHECK_THROWS_WITH_AS(s.ranges(),
                         "schmitt_oscillator::ranges: upper_threshold.high = 5.2 V is invalid; expected a threshold "
                         "below the lowest output high level, supply.low - output_high_drop.high = 5 V",
                         domain_error);
    s.upper_threshold = ranged<double>::exactly(0.7);
    s.output_high_drop = ranged<voltage>::between(0_V, 1.6_V);
    CHECK_THROWS_WITH_AS(metric_bounds(s),
                         "schmitt_oscillator::ranges: upper_threshold.high = 0.7 (3.5 V at supply.low) is invalid; "
                         "expected a threshold below the lowest output high level, supply.low - "
                         "output_high_drop.high = 3.4 V",
                         domain_error);
    s.output_high_drop = ranged<voltage>::exactly(0_V);
    s.output_low = ranged<voltage>::exactly(2.5_V);
    CHECK_THROWS_WITH_AS(s.ranges(),
                         "schmitt_oscillator::ranges: lower_threshold.low = 2 V is invalid; expected a threshold above "
                         "the highest output low level, output_low.high = 2.5 V",
                         domain_error);
    s.output_low = ranged<voltage>::exactly(0_V);
    s.lower_threshold = ranged<voltage>::between(3_V, 3.6_V);
    CHECK_THROWS_WITH_AS(s.ranges(),
                         "schmitt_oscillator::ranges: lower_threshold.high = 3.6 V is invalid; expected a threshold "
                         "below upper_threshold.low = 0.7 (3.5 V at supply.low) (VT- < VT+)",
                         domain_error);
    // A ratio VT- under an absolute VT+ is closest to it at the highest supply.
    s.upper_threshold = ranged<voltage>::exactly(3_V);
    s.lower_threshold = ranged<double>::exactly(0.5);
    s.supply = ranged<voltage>::between(4.5_V, 6.5_V);
    CHECK_THROWS_WITH_AS(s.ranges(),
                         "schmitt_oscillator::ranges: lower_threshold.high = 0.5 (3.25 V at supply.high) is invalid; "
                         "expected a threshold below upper_threshold.low = 3 V (VT- < VT+)",
                         domain_error);
    s.supply = ranged<voltage>::exactly(5_V);
    s.output_low = ranged<voltage>::exactly(-0.1_V);
    CHECK_THROWS_WITH_AS(s.ranges(),
                         "schmitt_oscillator::ranges: output_low.low = -100 mV is invalid; expected a non-negative "
                         "voltage",
                         invalid_argument);
}
