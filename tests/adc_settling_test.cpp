// Tests of networks/adc_settling.hpp: the (N + 1) ln 2 table (common practice;
// computed), Boost.Odeint integration of the two-capacitor circuit for the
// charge-sharing case, its limits by derivation, worst case (with its maximum
// inside the external capacitor's range) against a dense brute-force grid, the
// choice of a sampling setting and its reasons, errors word for word.
// Set TAUFORGE_TEST_REPORT=1 to print the worst error each comparison measured.
#include "approx.hpp"
#include "ode_reference.hpp"
#include "random_cases.hpp"

#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/adc_settling.hpp>

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

void report(const std::string& what, double worst) {
    const std::string text = what + ": worst relative error " + tauforge_test::full(worst);
    if (std::getenv("TAUFORGE_TEST_REPORT")) MESSAGE(text);
}

/// Boost.Odeint of the circuit: the source Vin behind Rs charges the pin capacitor Ce
/// (starting at Vin) and, through the switch Rsw, the sampling capacitor Cs (starting at
/// 0 V, a full scale Vin away):
///   Ce v1' = (Vin - v1)/Rs - (v1 - v2)/Rsw,   Cs v2' = (v1 - v2)/Rsw.
/// Returns the first time Vin - v2 falls to Vin / 2^(N+1), half an LSB.
double ode_acquisition(double rs, double rsw, double cs, double ce, int bits) {
    const double vin = 3.3, level = vin * std::ldexp(1.0, -(bits + 1));
    auto f = [=](const ode::state<2>& v, double) {
        return ode::state<2>{((vin - v[0]) / rs - (v[0] - v[1]) / rsw) / ce, (v[0] - v[1]) / (rsw * cs)};
    };
    auto p = ode::make_path<2>(f, ode::state<2>{vin, 0.0}, 0.0, rsw * cs);
    const auto t = p.first_root([=](const ode::state<2>& v) { return (vin - v[1]) - level; }, 1e4 * (rs + rsw) * (cs + ce));
    return t ? *t : std::numeric_limits<double>::infinity();
}

adc_settling fixed(double rs, double rsw, double cs, int bits) {
    return {.source = ranged<resistance>::exactly(resistance::from_value(rs)),
            .switch_resistance = ranged<resistance>::exactly(resistance::from_value(rsw)),
            .sample_capacitance = ranged<capacitance>::exactly(capacitance::from_value(cs)),
            .bits = bits};
}

}  // namespace

TEST_CASE("adc_settling: half an LSB takes (N + 1) ln 2 time constants") {
    // Common practice; computed: 8 bits 6.238, 10 bits 7.625, 12 bits 9.011, 14 bits 10.397, 16 bits 11.784.
    const std::array<std::pair<int, double>, 5> table{{{8, 6.238}, {10, 7.625}, {12, 9.011}, {14, 10.397}, {16, 11.784}}};
    for (const auto& [bits, k] : table) {
        const auto a = fixed(9e3, 1e3, 10e-12, bits);  // tau = (Rs + Rsw) Cs = 100 ns
        INFO(bits << " bits");
        CHECK_REL(a.evaluate({9e3, 1e3, 10e-12, 0.0})[0] / 100e-9, k, 1e-4);  // common practice; computed
        CHECK_REL(a.evaluate({9e3, 1e3, 10e-12, 0.0})[0], 100e-9 * (bits + 1) * std::log(2.0), 1e-14);
    }
}

TEST_CASE("adc_settling: charge sharing with an external capacitor agrees with Boost.Odeint within 1e-6") {
    std::mt19937_64 g(0xadc);
    double worst = 0.0;
    for (int n = 0; n < 40; ++n) {
        const double rs = log_uniform(g, 10.0, 100e3), rsw = log_uniform(g, 50.0, 5e3);
        const double cs = log_uniform(g, 1e-12, 50e-12), ce = cs * log_uniform(g, 0.01, 1e5);
        const int bits = 8 + static_cast<int>(unit(g) * 9);
        const auto a = fixed(rs, rsw, cs, bits);
        const double t = a.evaluate({rs, rsw, cs, ce})[0];
        const double ref = ode_acquisition(rs, rsw, cs, ce, bits);
        INFO("case " << n << ": Rs " << rs << " Rsw " << rsw << " Cs " << cs << " Ce " << ce << " bits " << bits);
        CHECK_REL(t, ref, 1e-6);  // Boost.Odeint
        worst = std::max(worst, tauforge_test::rel_diff(t, ref));
    }
    report("acquisition vs Odeint", worst);
}

TEST_CASE("adc_settling: the limits of the charge-sharing response") {
    // Derivation: Ce -> 0 leaves one loop, (Rs + Rsw) Cs; Ce -> infinity holds the pin at
    // the input, Rsw Cs alone; Rs = 0 holds the pin exactly.
    const double rs = 5e3, rsw = 1e3, cs = 8e-12, k = 13 * std::log(2.0);  // 12 bits
    const auto a = fixed(rs, rsw, cs, 12);
    CHECK_REL(a.evaluate({rs, rsw, cs, 1e-21})[0], (rs + rsw) * cs * k, 1e-6);
    CHECK_REL(a.evaluate({rs, rsw, cs, 1.0})[0], rsw * cs * k, 1e-6);
    CHECK_REL(a.evaluate({0.0, rsw, cs, 1e-9})[0], rsw * cs * k, 1e-15);
    // A medium Ce is slower than either: it shares enough charge to need the slow
    // recovery through Rs (Rs (Ce + Cs) ln(Cs 2^13 / (Ce + Cs)), largest near Ce + Cs = Cs 2^13 / e).
    const double ce_mid = cs * std::ldexp(1.0, 13) / std::exp(1.0);
    CHECK(a.evaluate({rs, rsw, cs, ce_mid})[0] > 100 * (rs + rsw) * cs * k);
    CHECK_REL(a.evaluate({rs, rsw, cs, ce_mid})[0], ode_acquisition(rs, rsw, cs, ce_mid, 12), 1e-6);  // Boost.Odeint
}

TEST_CASE("adc_settling: worst case with its maximum inside Ce's range equals a dense brute-force grid") {
    // Ce = 22 nF +/-20 %, X7R: 15 to 30.4 nF, around the slowest Ce (about 24 nF for 8 pF, 12 bits).
    adc_settling a{.source = ranged<resistance>::between(1_kohm, 2_kohm),
                   .switch_resistance = ranged<resistance>::between(500_ohm, 1500_ohm),
                   .sample_capacitance = ranged<capacitance>::between(6_pF, 8_pF),
                   .external = capacitor{.nominal = 22_nF, .tol = tolerance::symmetric(0.2), .tempco = x7r},
                   .bits = 12,
                   .conditions = {.t_min = celsius{-40}, .t_max = celsius{85}}};
    const auto r = a.ranges();
    double lo = std::numeric_limits<double>::infinity(), hi = -lo;
    std::array<double, 4> arg{};
    constexpr int n = 5, m = 401;
    for (int i = 0; i < n; ++i)
        for (int j = 0; j < n; ++j)
            for (int k = 0; k < n; ++k)
                for (int l = 0; l < m; ++l) {
                    auto at = [](const interval& v, int q, int count) {
                        return q == count - 1 ? v.high : v.low + (v.high - v.low) * q / (count - 1);
                    };
                    const std::array<double, 4> x{at(r[0], i, n), at(r[1], j, n), at(r[2], k, n), at(r[3], l, m)};
                    const double t = a.evaluate(x)[0];
                    lo = std::min(lo, t);
                    if (t > hi) hi = t, arg = x;
                }
    const auto b = acquisition_bounds(a);
    const auto wc = worst_case(a);
    CHECK_REL(b.time.low, lo, 1e-12);
    CHECK(b.time.high >= hi);
    CHECK_REL(b.time.high, hi, 1e-5);  // the grid's spacing around a smooth maximum
    CHECK_REL(wc[0].max.value, b.time.high, 1e-9);
    CHECK_REL(wc[0].min.value, lo, 1e-12);
    CHECK_FALSE(wc.monotone[adc_settling::p_external]);
    CHECK(wc[0].max.positions[adc_settling::p_external] == corner_position::interior);
    // The longest is at the highest Rs, Rsw, Cs, and agrees with Boost.Odeint there.
    CHECK(b.longest_at[0] == r[0].high);
    CHECK(b.longest_at[1] == r[1].high);
    CHECK(b.longest_at[2] == r[2].high);
    const auto& p = b.longest_at;
    CHECK_REL(b.time.high, ode_acquisition(p[0], p[1], p[2], p[3], 12), 1e-6);  // Boost.Odeint
    CHECK_REL(hi, ode_acquisition(arg[0], arg[1], arg[2], arg[3], 12), 1e-6);   // Boost.Odeint
}

TEST_CASE("adc_settling: the shortest sufficient sampling setting and its margin") {
    // Invented demo numbers: a 12-bit ADC at 14 MHz, settings in cycles in no particular order.
    adc_settling a{.source = ranged<resistance>::between(1_kohm, 10_kohm),
                   .switch_resistance = ranged<resistance>::between(500_ohm, 1500_ohm),
                   .sample_capacitance = ranged<capacitance>::between(5_pF, 8_pF),
                   .bits = 12};
    const std::vector<double> settings{239.5, 1.5, 7.5, 13.5, 28.5, 41.5, 55.5, 71.5};
    const auto s = choose_sampling_time(a, 14_MHz, settings);
    REQUIRE(s.found());
    // Worst case by the relation: (10 k + 1.5 k) x 8 pF x 13 ln 2 = 828.9 ns = 11.6 cycles.
    const double need = 11.5e3 * 8e-12 * 13 * std::log(2.0);
    CHECK_REL(s.required.value(), need, 1e-14);  // common practice
    CHECK(*s.index == 3);
    CHECK(s.cycles == 13.5);
    CHECK_REL(s.window.value(), 13.5 / 14e6, 1e-15);
    CHECK_REL(s.margin.value(), 13.5 / 14e6 - need, 1e-12);
    CHECK_REL(s.cycles_needed, need * 14e6, 1e-14);
    CHECK(s.reason.empty());
    // With a 10 nF external capacitor near the slowest value, nothing suffices: the reason
    // names the shortfall and where it occurs.
    a.external = capacitor{.nominal = 10_nF, .tol = tolerance::symmetric(0.1)};
    const auto none = choose_sampling_time(a, 14_MHz, settings);
    CHECK_FALSE(none.found());
    CHECK(none.cycles == 239.5);
    CHECK(none.margin.value() < 0.0);
    CHECK_REL(none.required.value(), ode_acquisition(10e3, 1.5e3, 8e-12, 11e-9, 12), 1e-6);  // Boost.Odeint
    CHECK(none.reason ==
          "no sampling setting suffices for 12 bits: the longest, 239.5 cycles at 14 MHz = 17.1071 \u00B5s, is "
          "shorter than the worst-case acquisition time 196.404 \u00B5s (source 10 k\u03A9, switch 1.5 k\u03A9, "
          "sampling 8 pF, external 11 nF); it needs at least 2749.66 cycles");
}

TEST_CASE("adc_settling: bad inputs are rejected word for word") {
    adc_settling a = fixed(1e3, 1e3, 5e-12, 12);
    a.bits = 0;
    CHECK_THROWS_WITH_AS(a.ranges(), "adc_settling::ranges: bits = 0 is invalid; expected a resolution of 1 to 32 bits",
                         invalid_argument);
    a.bits = 12;
    a.switch_resistance = ranged<resistance>::exactly(0_ohm);
    CHECK_THROWS_WITH_AS(a.ranges(),
                         "adc_settling::ranges: switch_resistance.low = 0 \u03A9 is invalid; expected a positive "
                         "resistance",
                         invalid_argument);
    a.switch_resistance = ranged<resistance>::exactly(1_kohm);
    a.sample_capacitance = ranged<capacitance>{};
    CHECK_THROWS_WITH_AS(a.ranges(),
                         "adc_settling::ranges: sample_capacitance.low = 0 F is invalid; expected a positive "
                         "capacitance",
                         invalid_argument);
    a.sample_capacitance = ranged<capacitance>::exactly(5_pF);
    CHECK_THROWS_WITH_AS(choose_sampling_time(a, 14_MHz, {}),
                         "choose_sampling_time: settings = (none) is invalid; expected at least one sampling setting "
                         "in cycles",
                         invalid_argument);
    CHECK_THROWS_WITH_AS(choose_sampling_time(a, 14_MHz, {7.5, -1.0}),
                         "choose_sampling_time: settings[1] = -1 is invalid; expected a positive, finite number of "
                         "cycles",
                         invalid_argument);
    CHECK_THROWS_WITH_AS(choose_sampling_time(a, 0_Hz, {7.5}),
                         "choose_sampling_time: clock = 0 Hz is invalid; expected a positive, finite clock frequency",
                         invalid_argument);
}
