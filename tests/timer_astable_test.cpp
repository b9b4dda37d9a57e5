// Tests of networks/timer_astable.hpp: the textbook timer relations and the
// REFERENCES.md check vector, the discharge saturation, the steering-diode
// variant (charge time by Boost.Math Gauss-Kronrod quadrature of the charging
// current written here), Boost.Odeint simulation with switching events from
// 0 V, worst case against dense grids, synthesis re-checked independently,
// resistors_for and bad inputs.
#include "approx.hpp"
#include "ode_reference.hpp"
#include "random_cases.hpp"

#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/timer_astable.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <boost/math/quadrature/gauss_kronrod.hpp>

#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstdint>
#include <random>
#include <string>
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

// One operating point, SI units; vl, vh absolute levels.
struct point {
    double ra, rb, c, vcc, vl, vh, vsat, vd;
};

// The charging current into C with the steering diode (derivation): with the
// diode off the node between Ra and Rb sits at the divider (Vcc Rb + v Ra) / (Ra + Rb);
// the diode conducts when that puts more than Vd across it, and then clamps
// the node to v + Vd, so the current is (Vcc - v - Vd) / Ra; otherwise it is
// (Vcc - v) / (Ra + Rb).
double diode_current(const point& p, double v) {
    const double node_off = (p.vcc * p.rb + v * p.ra) / (p.ra + p.rb);
    return node_off - v > p.vd ? (p.vcc - v - p.vd) / p.ra : (p.vcc - v) / (p.ra + p.rb);
}

// t_high = integral of C dv / i(v) from vl to vh, split where the diode stops
// conducting (node_off - v = Vd), each piece smooth; Gauss-Kronrod 61 points.
double ref_high_diode(const point& p) {
    const double knee = p.vcc - p.vd * (p.ra + p.rb) / p.rb;
    auto f = [&](double v) { return p.c / diode_current(p, v); };
    using gk = boost::math::quadrature::gauss_kronrod<double, 61>;
    const double a = p.vl, b = p.vh;
    if (knee <= a || knee >= b) return gk::integrate(f, a, b, 15, 1e-14);
    return gk::integrate(f, a, knee, 15, 1e-14) + gk::integrate(f, knee, b, 15, 1e-14);
}

// Textbook timer relations (common practice), with the discharge towards Vsat:
// t_high = (Ra + Rb) C ln((Vcc - VL) / (Vcc - VH)), t_low = Rb C ln((VH - Vsat) / (VL - Vsat)).
std::array<double, 5> ref_metrics(const point& p, bool diode) {
    const double th = diode ? ref_high_diode(p) : (p.ra + p.rb) * p.c * std::log((p.vcc - p.vl) / (p.vcc - p.vh));
    const double tl = p.rb * p.c * std::log((p.vh - p.vsat) / (p.vl - p.vsat));
    return {th, tl, th + tl, 1.0 / (th + tl), th / (th + tl)};
}

std::array<double, 8> params(const point& p) {
    return {p.ra, p.rb, p.c, p.vcc, p.vl / p.vcc, p.vh / p.vcc, p.vsat, p.vd};
}

// Odeint: from 0 V, charge until VH, discharge towards Vsat through Rb until VL,
// and so on for `cycles` more cycles; the last low and high phases give the times.
std::array<double, 3> ode_cycle(const point& p, bool diode, int cycles = 4) {
    const auto charge = [p, diode](double, double v) {
        return (diode ? diode_current(p, v) : (p.vcc - v) / (p.ra + p.rb)) / p.c;
    };
    const auto discharge = [p](double, double v) { return (p.vsat - v) / (p.rb * p.c); };
    const double span = 100.0 * (p.ra + p.rb) * p.c;
    const auto t = switching_times(charge, p.vh, discharge, p.vl, 0.0, 1 + 2 * cycles, span);
    REQUIRE(t.size() == static_cast<std::size_t>(1 + 2 * cycles));
    const std::size_t n = t.size();
    return {t[n - 1] - t[n - 2], t[n - 2] - t[n - 3], t[n - 1] - t[n - 3]};  // ends at VH
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

TEST_CASE("timer_astable: t_high = ln 2 (Ra + Rb) C and t_low = ln 2 Rb C at thresholds 1/3, 2/3") {
    // Common practice (textbook timer relations), REFERENCES.md.
    timer_astable a{.ra = {.nominal = 10_kohm}, .rb = {.nominal = 47_kohm}, .c = {.nominal = 100_nF}};
    const auto v = a.evaluate(detail::nominal_point(a.ranges()));
    const double ln2 = std::log(2.0);
    CHECK_REL(v[timer_astable::high_time], ln2 * 57e3 * 100e-9, 1e-14);
    CHECK_REL(v[timer_astable::low_time], ln2 * 47e3 * 100e-9, 1e-14);
    CHECK_REL(v[timer_astable::frequency], 1.0 / (ln2 * 104e3 * 100e-9), 1e-14);
    CHECK_REL(v[timer_astable::frequency], 1.44 / (104e3 * 100e-9), 2e-3);  // 1/ln 2 = 1.4427
    CHECK_REL(v[timer_astable::duty], 57.0 / 104.0, 1e-14);
}

TEST_CASE("timer_astable: the REFERENCES.md check vector Ra 1.78 kOhm, Rb 4.12 kOhm, C 10 nF") {
    // Computed from the relations: t_high 40.90 us, t_low 28.56 us, f 14.398 kHz, high fraction 58.9 %.
    timer_astable a{.ra = {.nominal = 1.78_kohm}, .rb = {.nominal = 4.12_kohm}, .c = {.nominal = 10_nF}};
    const auto v = a.evaluate(detail::nominal_point(a.ranges()));
    CHECK_REL(v[timer_astable::high_time], 40.90e-6, 1.5e-4);  // given to 4 figures
    CHECK_REL(v[timer_astable::low_time], 28.56e-6, 2e-4);
    CHECK_REL(v[timer_astable::frequency], 14.398e3, 5e-5);
    CHECK_REL(v[timer_astable::duty], 0.589, 1e-3);
}

TEST_CASE("timer_astable: the defaults keep the original network's results") {
    // Without saturation voltage or diode, bit for bit the two-resistor relations
    // through per_tau as before the extension.
    timer_astable a{.ra = {.nominal = 2.2_kohm}, .rb = {.nominal = 6.8_kohm}, .c = {.nominal = 47_nF}};
    const auto x = detail::nominal_point(a.ranges());
    CHECK(x[6] == 0.0);
    CHECK(x[7] == 0.0);  // the unused diode drop is fixed at 0
    const auto k = timer_astable{}.per_tau(5.0, 1.0 / 3.0, 2.0 / 3.0);
    const auto v = a.evaluate(x);
    CHECK(v[0] == k[0] * (2.2e3 + 6.8e3) * 47e-9);
    CHECK(v[1] == k[1] * 6.8e3 * 47e-9);
    CHECK(timer_astable::parameters[5].name == "upper threshold");
    CHECK(timer_astable::metrics[4].name == "duty");
}

TEST_CASE("timer_astable: Boost.Odeint simulation from 0 V gives the period after start-up within 1e-6") {
    // 120 random oscillators, half with the steering diode; thresholds anywhere in
    // 0 < VL < VH < Vcc, saturation up to 0.3 V, the diode's knee inside or outside
    // the charging range.
    std::mt19937_64 g(555);
    double worst = 0.0;
    for (int n = 0; n < 120; ++n) {
        const bool diode = n % 2;
        point p{};
        p.ra = std::pow(10.0, between(g, 3.0, 5.0));
        p.rb = std::pow(10.0, between(g, 3.0, 5.0));
        p.c = std::pow(10.0, between(g, -9.0, -6.0));
        p.vcc = between(g, 4.5, 15.0);
        p.vl = p.vcc * between(g, 0.2, 0.45);
        p.vh = p.vcc * between(g, 0.55, 0.75);
        p.vsat = between(g, 0.0, std::min(0.3, 0.5 * p.vl));
        p.vd = diode ? between(g, 0.3, 0.8) : 0.0;
        timer_astable a;
        a.steering_diode = diode;
        const auto v = a.evaluate(params(p));
        const auto sim = ode_cycle(p, diode);
        INFO("case " << n << " diode " << diode);
        CHECK_REL(v[timer_astable::high_time], sim[0], 1e-6);
        CHECK_REL(v[timer_astable::low_time], sim[1], 1e-6);
        CHECK_REL(v[timer_astable::period], sim[2], 1e-6);
        for (int j = 0; j < 3; ++j)
            worst = std::max(worst, tauforge_test::rel_diff(v[static_cast<std::size_t>(j)], sim[j]));
        // The quadrature reference agrees too (it is exact to ~1e-14).
        CHECK_REL(v[timer_astable::high_time], ref_metrics(p, diode)[0], 1e-12);
    }
    report("timer_astable vs Odeint", worst);
}

TEST_CASE("timer_astable: the first high time from 0 V is (Ra + Rb) C ln 3 at thresholds 1/3, 2/3") {
    // Derivation: from 0 towards Vcc, 2/3 Vcc is reached after tau ln 3; thereafter ln 2 per half cycle.
    const point p{10e3, 20e3, 10e-9, 5.0, 5.0 / 3.0, 10.0 / 3.0, 0.0, 0.0};
    const auto charge = [p](double, double v) { return (p.vcc - v) / ((p.ra + p.rb) * p.c); };
    const auto e = first_crossing(charge, 0.0, 0.0, p.vh, 1e-2);
    CHECK_REL(e.t, 30e3 * 10e-9 * std::log(3.0), 1e-9);
    CHECK(e.t > timer_astable{}.per_tau(5.0, 1.0 / 3.0, 2.0 / 3.0)[0] * 30e3 * 10e-9);
}

TEST_CASE("timer_astable: the saturation voltage lengthens the low time to Rb C ln((VH - Vsat)/(VL - Vsat))") {
    // Derivation (ref_metrics): discharge towards Vsat instead of 0 V.
    timer_astable a{.ra = {.nominal = 1_kohm},
                    .rb = {.nominal = 10_kohm},
                    .c = {.nominal = 10_nF},
                    .discharge_saturation = ranged<voltage>::exactly(0.2_V)};
    const auto v = a.evaluate(detail::nominal_point(a.ranges()));
    CHECK_REL(v[timer_astable::low_time], 1e-4 * std::log((10.0 / 3.0 - 0.2) / (5.0 / 3.0 - 0.2)), 1e-14);
    CHECK(v[timer_astable::low_time] > 1e-4 * std::log(2.0));
}

TEST_CASE("timer_astable: the steering diode charges through Ra alone while it conducts") {
    // Derivation: with the diode on from VL to VH, t_high = Ra C ln((Vcc - Vd - VL)/(Vcc - Vd - VH)),
    // independent of Rb; 0.7 V drop, 5 V, Ra = Rb: knee = 5 - 0.7 x 2 = 3.6 V above VH = 3.33 V.
    timer_astable a{
        .ra = {.nominal = 10_kohm}, .rb = {.nominal = 10_kohm}, .c = {.nominal = 10_nF}, .steering_diode = true};
    const auto v = a.evaluate(detail::nominal_point(a.ranges()));
    CHECK_REL(v[timer_astable::high_time], 1e-4 * std::log((4.3 - 5.0 / 3.0) / (4.3 - 10.0 / 3.0)), 1e-14);
    a.rb.nominal = 22_kohm;
    CHECK(a.evaluate(detail::nominal_point(a.ranges()))[timer_astable::high_time] == v[timer_astable::high_time]);
    // The drop slows the charge: Ra = Rb is still above 50 %, Ra = Rb / 2 is below it.
    CHECK(v[timer_astable::duty] > 0.5);
    a.rb.nominal = 20_kohm;
    CHECK(a.evaluate(detail::nominal_point(a.ranges()))[timer_astable::duty] < 0.5);
    // With Rb << Ra the knee (5 - 0.7 x 11 < 0) lies below VL: the diode never conducts.
    a.rb.nominal = 1_kohm;
    const auto w = a.evaluate(detail::nominal_point(a.ranges()));
    CHECK_REL(w[timer_astable::high_time], 11e3 * 10e-9 * std::log(2.0), 1e-14);
}

TEST_CASE("timer_astable: worst case equals the extremes of a dense grid, plain variant") {
    timer_astable a{.ra = {.nominal = 4.7_kohm, .tol = tolerance::symmetric(0.05)},
                    .rb = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)},
                    .c = {.nominal = 22_nF, .tol = tolerance::symmetric(0.10)},
                    .supply = ranged<voltage>::between(4.5_V, 5.5_V),
                    .lower_threshold = ranged<double>::plus_minus(1.0 / 3.0, 0.02),
                    .upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, 0.02),
                    .discharge_saturation = ranged<voltage>::between(0_V, 0.3_V)};
    const auto wc = worst_case(a);
    CHECK(wc.free_parameters == 7);
    std::array<double, 5> lo, hi;
    lo.fill(1e300);
    hi.fill(-1e300);
    const double k = 1.0 / 3.0;
    for_each_grid_point<7>({{{4.7e3 * 0.95, 4.7e3 * 1.05, 5},
                             {10e3 * 0.95, 10e3 * 1.05, 5},
                             {22e-9 * 0.9, 22e-9 * 1.1, 5},
                             {4.5, 5.5, 5},
                             {k - 0.02, k + 0.02, 5},
                             {2 * k - 0.02, 2 * k + 0.02, 5},
                             {0.0, 0.3, 5}}},
                           [&](const std::array<double, 7>& g) {
                               const point p{g[0], g[1], g[2], g[3], g[4] * g[3], g[5] * g[3], g[6], 0.0};
                               const auto v = ref_metrics(p, false);
                               for (std::size_t j = 0; j < 5; ++j)
                                   lo[j] = std::min(lo[j], v[j]), hi[j] = std::max(hi[j], v[j]);
                           });
    for (std::size_t j = 0; j < 5; ++j) {
        INFO("metric " << timer_astable::metrics[j].name);
        CHECK_REL(wc[j].min.value, lo[j], 1e-12);
        CHECK_REL(wc[j].max.value, hi[j], 1e-12);
    }
    for (std::size_t p = 0; p < wc.monotone.size(); ++p) CHECK(wc.monotone[p]);
}

TEST_CASE("timer_astable: worst case equals the extremes of a dense grid, steering diode") {
    timer_astable a{.ra = {.nominal = 6.8_kohm, .tol = tolerance::symmetric(0.05)},
                    .rb = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)},
                    .c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)},
                    .supply = ranged<voltage>::between(4.5_V, 5.5_V),
                    .discharge_saturation = ranged<voltage>::between(0_V, 0.2_V),
                    .steering_diode = true,
                    .diode_drop = ranged<voltage>::between(0.55_V, 0.75_V)};
    const auto wc = worst_case(a);
    CHECK(wc.free_parameters == 6);
    std::array<double, 5> lo, hi;
    lo.fill(1e300);
    hi.fill(-1e300);
    for_each_grid_point<6>({{{6.8e3 * 0.95, 6.8e3 * 1.05, 7},
                             {10e3 * 0.95, 10e3 * 1.05, 7},
                             {9e-9, 11e-9, 2},
                             {4.5, 5.5, 7},
                             {0.0, 0.2, 7},
                             {0.55, 0.75, 7}}},
                           [&](const std::array<double, 6>& g) {
                               const point p{g[0], g[1], g[2], g[3], g[3] / 3.0, g[3] * 2.0 / 3.0, g[4], g[5]};
                               const auto v = ref_metrics(p, true);
                               for (std::size_t j = 0; j < 5; ++j)
                                   lo[j] = std::min(lo[j], v[j]), hi[j] = std::max(hi[j], v[j]);
                           });
    for (std::size_t j = 0; j < 5; ++j) {
        INFO("metric " << timer_astable::metrics[j].name);
        CHECK_REL(wc[j].min.value, lo[j], 1e-12);
        CHECK_REL(wc[j].max.value, hi[j], 1e-12);
    }
}

TEST_CASE("timer_astable: synthesis with the steering diode reaches a 30-40 % duty at 1 kHz") {
    // Recomputed here at every corner of the quadrature reference (Ra, Rb, C, supply, diode drop).
    timer_astable a{.supply = ranged<voltage>::between(4.75_V, 5.25_V),
                    .steering_diode = true,
                    .diode_drop = ranged<voltage>::between(0.6_V, 0.75_V)};
    timing_spec<timer_astable> spec;
    spec.around("frequency", 1_kHz, tolerance::symmetric(0.15)).between("duty", 0.30, 0.40);
    // E24 values bought at 1 %, E12 capacitors at 5 %.
    const auto r24 =
        candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 100_kohm, tolerance::symmetric(0.01)));
    const auto c12 =
        candidates(value_set<capacitance>::from_series(e_series::e12, 10_nF, 1_uF, tolerance::symmetric(0.05)));
    const auto res = synthesize(a, spec, {r24, r24, c12}, {.top_k = 5});
    REQUIRE(res.feasible());
    for (const auto& d : res.designs) {
        std::array<double, 5> lo, hi;
        lo.fill(1e300);
        hi.fill(-1e300);
        for (int mask = 0; mask < 32; ++mask) {
            const auto bit = [&](int b, double x, double y) { return (mask >> b & 1) ? y : x; };
            point p{d.parts[0].value * bit(0, 0.99, 1.01),
                    d.parts[1].value * bit(1, 0.99, 1.01),
                    d.parts[2].value * bit(2, 0.95, 1.05),
                    bit(3, 4.75, 5.25),
                    0.0,
                    0.0,
                    0.0,
                    bit(4, 0.6, 0.75)};
            p.vl = p.vcc / 3.0;
            p.vh = p.vcc * 2.0 / 3.0;
            const auto v = ref_metrics(p, true);
            for (std::size_t j = 0; j < 5; ++j) lo[j] = std::min(lo[j], v[j]), hi[j] = std::max(hi[j], v[j]);
        }
        CHECK(lo[timer_astable::frequency] >= 850.0 * (1 - 1e-12));
        CHECK(hi[timer_astable::frequency] <= 1150.0 * (1 + 1e-12));
        CHECK(lo[timer_astable::duty] >= 0.30 - 1e-12);
        CHECK(hi[timer_astable::duty] <= 0.40 + 1e-12);
        CHECK_REL(d.worst_min[timer_astable::duty], lo[timer_astable::duty], 1e-12);
        CHECK_REL(d.worst_max[timer_astable::duty], hi[timer_astable::duty], 1e-12);
        CHECK_REL(d.worst_min[timer_astable::frequency], lo[timer_astable::frequency], 1e-12);
        CHECK_REL(d.worst_max[timer_astable::frequency], hi[timer_astable::frequency], 1e-12);
    }
    // The fast path returns exactly the exhaustive top 5 on the same spec.
    const auto r24_5 = candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 100_kohm));
    const auto c6 =
        candidates(value_set<capacitance>::from_series(e_series::e6, 10_nF, 1_uF, tolerance::symmetric(0.05)));
    const auto fast = synthesize(a, spec, {r24_5, r24_5, c6}, {.top_k = 5, .method = search_method::fast});
    const auto full = synthesize(a, spec, {r24_5, r24_5, c6}, {.top_k = 5, .method = search_method::exhaustive});
    REQUIRE(full.feasible());
    REQUIRE(fast.designs.size() == full.designs.size());
    for (std::size_t i = 0; i < fast.designs.size(); ++i)
        for (std::size_t s = 0; s < 3; ++s) CHECK(fast.designs[i].parts[s].value == full.designs[i].parts[s].value);
}

TEST_CASE("timer_astable: without the diode a duty below 50 % is out of reach") {
    timer_astable a;
    timing_spec<timer_astable> spec;
    spec.around("frequency", 1_kHz, tolerance::symmetric(0.15)).between("duty", 0.30, 0.40);
    const auto r = candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 100_kohm));
    const auto c = candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF));
    const auto res = synthesize(a, spec, {r, r, c});
    CHECK_FALSE(res.feasible());
    CHECK(res.why == infeasibility::out_of_reach);
    CHECK(res.reason.rfind("no design holds duty within [", 0) == 0);
    CHECK(res.reason.find("the value sets do not reach it") != std::string::npos);
    CHECK(res.reason.find("above the maximum") != std::string::npos);
}

TEST_CASE("timer_astable: resistors_for solves Ra and Rb for a frequency and a duty") {
    timer_astable a;
    const auto p = a.resistors_for(2.4_kHz, 0.6, 10_nF);
    a.ra.nominal = p.ra;
    a.rb.nominal = p.rb;
    a.c.nominal = 10_nF;
    auto v = a.evaluate(detail::nominal_point(a.ranges()));
    CHECK_REL(v[timer_astable::frequency], 2400.0, 1e-12);
    CHECK_REL(v[timer_astable::duty], 0.6, 1e-12);
    // Textbook relations: Rb = (1 - D) / (f ln 2 C), Ra = D / (f ln 2 C) - Rb.
    CHECK_REL(p.rb.value(), 0.4 / (2400.0 * std::log(2.0) * 10e-9), 1e-12);
    CHECK_REL(p.ra.value(), 0.2 / (2400.0 * std::log(2.0) * 10e-9), 1e-12);
    CHECK_THROWS_WITH_AS(a.resistors_for(2.4_kHz, 0.4, 10_nF),
                         "timer_astable::resistors_for: duty = 40 % is invalid; expected a duty above 50 % without a "
                         "steering diode (Ra > 0); set steering_diode for less",
                         domain_error);
    CHECK_THROWS_WITH_AS(a.resistors_for(2.4_kHz, 1.0, 10_nF),
                         "timer_astable::resistors_for: duty = 1 is invalid; expected a high fraction strictly "
                         "between 0 and 1",
                         invalid_argument);
    a.steering_diode = true;
    const auto q = a.resistors_for(2.4_kHz, 0.35, 10_nF);
    a.ra.nominal = q.ra;
    a.rb.nominal = q.rb;
    v = a.evaluate(detail::nominal_point(a.ranges()));
    CHECK_REL(v[timer_astable::frequency], 2400.0, 1e-12);
    CHECK_REL(v[timer_astable::duty], 0.35, 1e-12);
    // Ra -> 0 with Vd = 0.7 V: the diode charges through nothing up to 4.3 V > VH, so
    // every duty above 0 is reachable; a 4.5 V drop leaves the knee below VH.
    a.diode_drop = ranged<voltage>::exactly(1.5_V);  // knee at 3.5 V - 1.5 V Ra/Rb
    CHECK_NOTHROW(a.resistors_for(2.4_kHz, 0.01, 10_nF));
    a.upper_threshold = ranged<double>::exactly(0.75);  // VH = 3.75 V above the 3.5 V knee
    CHECK_THROWS_AS(a.resistors_for(2.4_kHz, 0.01, 10_nF), domain_error);
}

TEST_CASE("timer_astable: solve_slot with the steering diode puts each time metric at its target") {
    std::mt19937_64 g(31);
    for (int n = 0; n < 50; ++n) {
        timer_astable a{.steering_diode = true};
        const std::array<double, 3> v0{std::pow(10.0, between(g, 3.0, 5.0)), std::pow(10.0, between(g, 3.0, 5.0)),
                                       std::pow(10.0, between(g, -9.0, -6.0))};
        a.ra.nominal = resistance::from_value(v0[0]);
        a.rb.nominal = resistance::from_value(v0[1]);
        a.c.nominal = capacitance::from_value(v0[2]);
        const auto m = a.evaluate(detail::nominal_point(a.ranges()));
        for (std::size_t metric = 0; metric < 4; ++metric)
            for (std::size_t slot = 0; slot < 3; ++slot) {
                auto v = v0;
                v[slot] = 1.0;
                const double s = a.solve_slot(slot, metric, m[metric], v);
                INFO("case " << n << " metric " << metric << " slot " << slot);
                if (metric == timer_astable::low_time && slot == 0) {
                    CHECK(std::isnan(s));
                    continue;
                }
                // Round trip on the metric ...
                auto b = a;
                b.ra.nominal = resistance::from_value(slot == 0 ? s : v0[0]);
                b.rb.nominal = resistance::from_value(slot == 1 ? s : v0[1]);
                b.c.nominal = capacitance::from_value(slot == 2 ? s : v0[2]);
                CHECK_REL(b.evaluate(detail::nominal_point(b.ranges()))[metric], m[metric], 1e-12);
                // ... and on the value, unless the diode conducts all the way (knee
                // 5 - 0.7 (1 + Ra/Rb) at or above VH): then Rb does not change t_high.
                const bool flat =
                    metric == timer_astable::high_time && slot == 1 && 5.0 - 0.7 * (1.0 + v0[0] / v0[1]) >= 10.0 / 3.0;
                if (!flat) CHECK_REL(s, v0[slot], 1e-9);
            }
        CHECK(std::isnan(a.solve_slot(0, timer_astable::duty, 0.4, v0)));
    }
}

TEST_CASE("timer_astable: thresholds must satisfy 0 < lower < upper < 1 and Vsat stay below the lower one") {
    timer_astable a{.ra = {.nominal = 1_kohm}, .rb = {.nominal = 1_kohm}, .c = {.nominal = 1_nF}};
    a.lower_threshold = ranged<double>::between(0.5, 0.7);
    CHECK_THROWS_WITH_AS(a.ranges(),
                         "timer_astable::ranges: lower_threshold.high = 0.7 is invalid; expected a ratio below "
                         "upper_threshold.low = 0.666667 (0 < lower < upper < 1 at every corner)",
                         domain_error);
    a.lower_threshold = ranged<double>::exactly(0.0);
    CHECK_THROWS_WITH_AS(a.ranges(),
                         "timer_astable::ranges: lower_threshold.low = 0 is invalid; expected a ratio above 0 "
                         "(0 < lower < upper < 1)",
                         domain_error);
    a.lower_threshold = ranged<double>::exactly(1.0 / 3.0);
    a.upper_threshold = ranged<double>::between(0.9, 1.05);
    CHECK_THROWS_WITH_AS(metric_bounds(a),
                         "timer_astable::ranges: upper_threshold.high = 1.05 is invalid; expected a ratio below 1 "
                         "(0 < lower < upper < 1)",
                         domain_error);
    a.upper_threshold = ranged<double>::exactly(2.0 / 3.0);
    a.discharge_saturation = ranged<voltage>::between(0_V, 2_V);
    CHECK_THROWS_WITH_AS(a.ranges(),
                         "timer_astable::ranges: discharge_saturation.high = 2 V is invalid; expected a level below "
                         "the lowest lower threshold, lower_threshold.low x supply.low = 1.66667 V",
                         domain_error);
    a.discharge_saturation = ranged<voltage>::exactly(0_V);
    a.steering_diode = true;
    a.diode_drop = ranged<voltage>::exactly(-0.1_V);
    CHECK_THROWS_WITH_AS(a.ranges(),
                         "timer_astable::ranges: diode_drop.low = -100 mV is invalid; expected a non-negative voltage",
                         invalid_argument);
}
