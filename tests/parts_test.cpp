// Tests of parts.hpp: each part's interval at the operating conditions, worked
// by hand in the comments; class 2 codes and C0G from REFERENCES.md
// ("EIA-198 (from memory)"), electrolytic tolerance "common practice".
#include "approx.hpp"

#include <tauforge/parts.hpp>

#include <doctest/doctest.h>

#include <cmath>

using namespace tauforge;
using namespace tauforge::literals;

namespace {
const operating_conditions industrial{.t_min = celsius{-40.0}, .t_max = 85_degC};
}

TEST_CASE("a class 2 envelope multiplies the purchase tolerance (X7R, -40 to +85 °C)") {
    // EIA-198 (from memory): X7R stays within +/-15 % of its 25 °C value over -55..+125 °C.
    // -40..+85 °C lies inside the rated range, the curve is unknown, so the whole
    // envelope applies. By hand, 100 nF +/-10 %:
    //   low  = 100 nF x (1 - 0.10) x (1 - 0.15) = 100 x 0.9 x 0.85 = 76.5 nF
    //   high = 100 nF x (1 + 0.10) x (1 + 0.15) = 100 x 1.1 x 1.15 = 126.5 nF
    // (multiplicative, not the additive 75..125 nF).
    const capacitor c{.nominal = 100_nF, .tol = tolerance::symmetric(0.10), .tempco = x7r};
    const interval r = c.range(industrial);
    CHECK_REL(r.nominal, 100e-9, 1e-15);
    CHECK_REL(r.low, 76.5e-9, 1e-14);
    CHECK_REL(r.high, 126.5e-9, 1e-14);
}

TEST_CASE("the class 2 code letters give the envelopes of REFERENCES.md") {
    // EIA-198 (from memory): X/Y/Z = -55/-30/+10 °C; 5/6/7/8 = +85/+105/+125/+150 °C;
    // R +/-15 %, S +/-22 %, T +22/-33 %, V +22/-82 %, U +22/-56 %.
    CHECK(x7r.rated_min == celsius{-55.0});
    CHECK(x7r.rated_max == 125_degC);
    CHECK(x7r.minus == 0.15);
    CHECK(x7r.plus == 0.15);
    CHECK(x5r.rated_max == 85_degC);
    CHECK(x5r.minus == 0.15);
    CHECK(x6s.rated_max == 105_degC);
    CHECK(x6s.plus == 0.22);
    CHECK(x8r.rated_max == 150_degC);
    CHECK(x7t.minus == 0.33);
    CHECK(x7t.plus == 0.22);
    CHECK(y5v.rated_min == celsius{-30.0});
    CHECK(y5v.rated_max == 85_degC);
    CHECK(y5v.minus == 0.82);
    CHECK(y5v.plus == 0.22);
    CHECK(z5u.rated_min == 10_degC);
    CHECK(z5u.minus == 0.56);
    CHECK(z5u.plus == 0.22);
}

TEST_CASE("a Y5V envelope is asymmetric: +22/-82 %") {
    // EIA-198 (from memory). 1 uF +/-20 % at 0..+50 °C, by hand:
    //   low  = 1 uF x 0.8 x (1 - 0.82) = 0.144 uF;  high = 1 uF x 1.2 x 1.22 = 1.464 uF
    const capacitor c{.nominal = 1_uF, .tol = tolerance::symmetric(0.20), .tempco = y5v};
    const interval r = c.range({.t_min = 0_degC, .t_max = 50_degC});
    CHECK_REL(r.low, 0.144e-6, 1e-14);
    CHECK_REL(r.high, 1.464e-6, 1e-14);
}

TEST_CASE("a class 2 part used at exactly 25 °C has no temperature spread") {
    // The envelope is referenced to 25 °C (EIA-198 (from memory)); at that single
    // temperature only the purchase tolerance remains: 100 nF +/-10 % -> 90..110 nF.
    const capacitor c{.nominal = 100_nF, .tol = tolerance::symmetric(0.10), .tempco = x7r};
    const interval r = c.range();
    CHECK_REL(r.low, 90e-9, 1e-15);
    CHECK_REL(r.high, 110e-9, 1e-15);
}

TEST_CASE("Y5V used at -40 °C is an error that names its rated range") {
    const capacitor c{.nominal = 1_uF, .tol = tolerance::symmetric(0.20), .tempco = y5v};
    CHECK_THROWS_WITH_AS(c.range(industrial),
                         "capacitor::range: t_min = -40 \u00B0C is invalid; expected a temperature within the "
                         "rated range of Y5V, -30 \u00B0C to 85 \u00B0C",
                         tauforge::domain_error);
    // +85 °C is the top of the range and allowed; +100 °C is not.
    CHECK_NOTHROW(c.range({.t_min = celsius{-30.0}, .t_max = 85_degC}));
    CHECK_THROWS_WITH_AS(c.range({.t_min = 0_degC, .t_max = 100_degC}),
                         "capacitor::range: t_max = 100 \u00B0C is invalid; expected a temperature within the "
                         "rated range of Y5V, -30 \u00B0C to 85 \u00B0C",
                         tauforge::domain_error);
}

TEST_CASE("C0G: 0 +/- 30 ppm/K over -55 to +125 °C") {
    // EIA-198 class 1 (from memory). By hand, 1 nF +/-5 %, t_ref 25 °C:
    //   excursions d = T - 25 K in [-80, +100]; coefficient a in [-30, +30] ppm/K;
    //   a d spans the corners {-30 x -80, -30 x 100, 30 x -80, 30 x 100} ppm
    //   = {+2400, -3000, -2400, +3000} ppm -> factor in [0.997, 1.003]
    //   low = 1 nF x 0.95 x 0.997 = 0.94715 nF; high = 1 nF x 1.05 x 1.003 = 1.05315 nF
    CHECK(c0g.low == -30.0);
    CHECK(c0g.high == 30.0);
    const capacitor c{.nominal = 1_nF, .tol = tolerance::symmetric(0.05), .tempco = c0g};
    const interval r = c.range({.t_min = celsius{-55.0}, .t_max = 125_degC});
    CHECK_REL(r.nominal, 1e-9, 1e-15);
    CHECK_REL(r.low, 0.94715e-9, 1e-14);
    CHECK_REL(r.high, 1.05315e-9, 1e-14);
    CHECK_THROWS_WITH_AS(c.range({.t_min = celsius{-60.0}, .t_max = 25_degC}),
                         "capacitor::range: t_min = -60 \u00B0C is invalid; expected a temperature within the "
                         "rated range of C0G, -55 \u00B0C to 125 \u00B0C",
                         tauforge::domain_error);
}

TEST_CASE("a resistor TCR band folds with the larger excursion on each side") {
    // By hand: 10 kOhm +/-1 %, TCR in [+50, +200] ppm/K (not symmetric), -40..+85 °C,
    // t_ref 25 °C: d in [-65, +60] K. a d at the corners:
    //   50 x -65 = -3250, 50 x 60 = 3000, 200 x -65 = -13000, 200 x 60 = 12000 ppm
    //   -> factor in [1 - 0.013, 1 + 0.012]
    //   low  = 10 kOhm x 0.99 x 0.987 = 9771.3 Ohm;  high = 10 kOhm x 1.01 x 1.012 = 10221.2 Ohm
    // The nominal is the marked value (t_ref lies in the range, so T = t_ref).
    const resistor r{.nominal = 10_kohm, .tol = tolerance::symmetric(0.01), .tcr = {50.0, 200.0}};
    const interval i = r.range(industrial);
    CHECK_REL(i.nominal, 10e3, 1e-15);
    CHECK_REL(i.low, 9771.3, 1e-13);
    CHECK_REL(i.high, 10221.2, 1e-13);
}

TEST_CASE("a symmetric thick-film TCR over an industrial range") {
    // Common practice: thick film +/-100 ppm/K. By hand, 1 kOhm, tolerance 0:
    // d in [-65, +60] K -> a d in [-6500, +6500] ppm -> 993.5 .. 1006.5 Ohm.
    const resistor r{.nominal = 1_kohm, .tcr = ppm_band::symmetric(100.0)};
    const interval i = r.range(industrial);
    CHECK_REL(i.low, 993.5, 1e-13);
    CHECK_REL(i.high, 1006.5, 1e-13);
}

TEST_CASE("an operating range that excludes t_ref moves the nominal to the nearest temperature") {
    // By hand: 1 kOhm, TCR exactly +100 ppm/K, 50..70 °C, t_ref 25 °C: d in [25, 45] K,
    // range 1002.5 .. 1004.5 Ohm; the nominal is taken at 50 °C (nearest t_ref): 1002.5 Ohm.
    const resistor r{.nominal = 1_kohm, .tcr = {100.0, 100.0}};
    const interval i = r.range({.t_min = 50_degC, .t_max = 70_degC});
    CHECK_REL(i.low, 1002.5, 1e-14);
    CHECK_REL(i.high, 1004.5, 1e-14);
    CHECK_REL(i.nominal, 1002.5, 1e-14);
}

TEST_CASE("electrolytic -20/+80 % tolerance") {
    // Common practice: an electrolytic is M (+/-20 %) or Z (-20/+80 %).
    // 10 uF Z at 25 °C: 8 .. 18 uF, nominal 10 uF (the marked value).
    const capacitor c{.nominal = 10_uF, .tol = {0.20, 0.80}};
    const interval r = c.range();
    CHECK_REL(r.low, 8e-6, 1e-15);
    CHECK_REL(r.high, 18e-6, 1e-15);
    CHECK_REL(r.nominal, 10e-6, 1e-15);
}

TEST_CASE("ageing is one more multiplicative factor, in both directions") {
    // By hand: 47 kOhm +/-5 %, ageing +/-1 %: 47 x 0.95 x 0.99 = 44.2035, 47 x 1.05 x 1.01 = 49.8435 kOhm.
    const resistor r{.nominal = 47_kohm, .tol = tolerance::symmetric(0.05), .aging = 0.01};
    const interval i = r.range();
    CHECK_REL(i.low, 44203.5, 1e-14);
    CHECK_REL(i.high, 49843.5, 1e-14);
}

TEST_CASE("with_choice keeps the temperature behaviour and replaces value and tolerance") {
    const capacitor c{.nominal = 100_nF, .tol = tolerance::symmetric(0.10), .tempco = x7r, .aging = 0.02};
    const capacitor d = c.with_choice({.value = 220e-9, .tol = tolerance::symmetric(0.05)});
    CHECK(d.nominal.value() == 220e-9);
    CHECK(d.tol == tolerance::symmetric(0.05));
    CHECK(std::get<dielectric_class>(d.tempco) == x7r);
    CHECK(d.aging == 0.02);
    const resistor r = resistor{.nominal = 1_kohm, .tcr = ppm_band::symmetric(50)}.with_choice({4700.0, {0.01, 0.01}});
    CHECK(r.nominal.value() == 4700.0);
    CHECK(r.tcr == ppm_band::symmetric(50));
}

TEST_CASE("bad part data is an error that names the part and the field") {
    CHECK_THROWS_WITH_AS(resistor{.nominal = -1_kohm}.range(),
                         "resistor::range: nominal = -1 k\u03A9 is invalid; expected a positive, finite resistance",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS((resistor{.nominal = 1_kohm, .tol = {1.0, 0.1}}.range()),
                         "resistor::range: tol.minus = 100 % is invalid; expected a fraction from 0 up to, not "
                         "including, 100 %",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS((capacitor{.nominal = 1_nF, .tol = {0.1, -0.1}}.range()),
                         "capacitor::range: tol.plus = -10 % is invalid; expected a finite, non-negative fraction",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS((resistor{.nominal = 1_kohm, .tcr = {100.0, -100.0}}.range()),
                         "resistor::range: tcr.low = 100 ppm/K is invalid; expected at most tcr.high = -100 ppm/K",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS((resistor{.nominal = 1_kohm, .aging = -0.01}.range()),
                         "resistor::range: aging = -1 % is invalid; expected a drift magnitude from 0 up to, not "
                         "including, 100 %",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(resistor{.nominal = 1_kohm}.range({.t_min = 85_degC, .t_max = celsius{-40.0}}),
                         "resistor::range: t_min = 85 \u00B0C is invalid; expected at most t_max = -40 \u00B0C",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS((capacitor{.nominal = 1_nF, .tempco = ppm_band{-1e6, 0.0}}.range(industrial)),
                         "capacitor::range: tempco.low = -1e+06 ppm/K is invalid; expected a coefficient that keeps "
                         "the value positive over -40 \u00B0C to 85 \u00B0C",
                         tauforge::domain_error);
}

TEST_CASE("ranged values: supply, threshold ratio, delay") {
    // 5 V +/-10 % is 4.5 .. 5.5 V; a -5 V rail +/-10 % is -5.5 .. -4.5 V.
    const interval v = ranged<voltage>::around(5_V, tolerance::symmetric(0.10)).as_interval();
    CHECK_REL(v.low, 4.5, 1e-15);
    CHECK_REL(v.high, 5.5, 1e-15);
    CHECK(v.nominal == 5.0);
    const interval n = ranged<voltage>::around(-5_V, tolerance::symmetric(0.10)).as_interval();
    CHECK_REL(n.low, -5.5, 1e-15);
    CHECK_REL(n.high, -4.5, 1e-15);
    // A threshold ratio 2/3 +/- 0.02 of the supply.
    const interval t = ranged<double>::plus_minus(2.0 / 3.0, 0.02).as_interval();
    CHECK_REL(t.low, 2.0 / 3.0 - 0.02, 1e-15);
    CHECK_REL(t.high, 2.0 / 3.0 + 0.02, 1e-15);
    // A propagation delay between 50 and 200 ns: nominal at the midpoint, 125 ns.
    const interval d = ranged<duration>::between(50_ns, 200_ns).as_interval();
    CHECK_REL(d.nominal, 125e-9, 1e-15);
    CHECK(ranged<voltage>::exactly(0.4_V).as_interval().is_fixed());
}

TEST_CASE("an inconsistent ranged value is an error") {
    CHECK_THROWS_WITH_AS((ranged<voltage>{5_V, 5.5_V, 4.5_V}.as_interval()),
                         "ranged::as_interval: low = 5.5 V is invalid; expected at most high = 4.5 V",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS((ranged<voltage>{6_V, 4.5_V, 5.5_V}.as_interval()),
                         "ranged::as_interval: nominal = 6 V is invalid; expected a value from low = 4.5 V to high = "
                         "5.5 V",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS((ranged<double>{0.5, 0.4, std::nan("")}.as_interval()),
                         "ranged::as_interval: high = nan is invalid; expected a finite value",
                         tauforge::invalid_argument);
}
