// Tests of capacitor_kinds.hpp and of the capacitor's ageing, wear-out and leakage
// rules (parts.hpp). Figures: EIA-198 class codes (from memory), electrolytic
// tolerance and the 0.01 CV leakage rule and 10 K life rule (common practice),
// worked by hand beside each check.
#include "approx.hpp"

#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/capacitor_kinds.hpp>
#include <tauforge/networks/rc_delay.hpp>

#include <doctest/doctest.h>

#include <cmath>
#include <variant>

using namespace tauforge;
using namespace tauforge::literals;

TEST_CASE("each kind carries its usual tolerance and temperature behaviour") {
    // Electrolytic +/-20 % (M) and the class 2 envelopes: REFERENCES.md (common practice, EIA-198 from memory).
    const capacitor al = make_capacitor(al_electrolytic, 100_uF);
    CHECK(al.tol == tolerance::symmetric(0.20));
    CHECK(std::get<dielectric_class>(al.tempco).minus == 0.30);
    CHECK(al.leakage_limit.has_value());
    CHECK(al.end_of_life.has_value());
    const capacitor x = make_capacitor(x7r_ceramic, 100_nF, tolerance::symmetric(0.05));
    CHECK(x.tol == tolerance::symmetric(0.05));
    CHECK(std::get<dielectric_class>(x.tempco) == x7r);
    CHECK(x.aging_per_decade == 0.025);
    CHECK(make_capacitor(y5v_ceramic, 1_uF).tol == tolerance{0.20, 0.80});
    CHECK(std::get<ppm_band>(make_capacitor(c0g_ceramic, 1_nF).tempco) == c0g);
    CHECK(make_capacitor(c0g_ceramic, 1_nF).aging_per_decade == 0.0);
    CHECK(std::get<ppm_band>(make_capacitor(pp_film, 10_nF).tempco).high < 0.0);  // PP: negative TC
    CHECK(x7r_ceramic.technology == capacitor_technology::ceramic_class2);
    CHECK(tantalum_mno2.usual_tolerance == tolerance::symmetric(0.10));
}

TEST_CASE("class 2 ageing: 2.5 % per decade of hours over ten years") {
    // Marked value at 1000 h after de-ageing; ten years = 87,660 h, log10(87.66) = 1.942802,
    // loss 0.025 x 1.942802 = 4.857 %. 100 nF +/-10 % X7R at -40..+85 °C, by hand:
    //   low = 100 nF x 0.9 x 0.85 x (1 - 0.0485700) = 72.784 nF; high stays 126.5 nF (losses only).
    const capacitor c = make_capacitor(x7r_ceramic, 100_nF);
    const operating_conditions ten_years{.t_min = celsius{-40.0}, .t_max = 85_degC, .service_hours = 87'660.0};
    const interval r = c.range(ten_years);
    CHECK_REL(r.low, 100e-9 * 0.9 * 0.85 * (1.0 - 0.025 * std::log10(87.66)), 1e-14);
    CHECK_REL(r.high, 126.5e-9, 1e-14);
    CHECK_REL(c.range({.t_min = celsius{-40.0}, .t_max = 85_degC, .service_hours = 500.0}).low, 76.5e-9, 1e-14);
}

TEST_CASE("electrolytic wear-out: 10 K rule life and linear loss, an error past the end of life") {
    // 2000 h at 105 °C; at t_max = 65 °C the life is 2000 x 2^4 = 32,000 h (10 K rule, common
    // practice). Half of it used: loss 20 % x 0.5 = 10 %. 100 µF +/-20 %, envelope -30/+10 %:
    //   low = 100 µF x 0.8 x 0.7 x 0.9 = 50.4 µF; high = 100 µF x 1.2 x 1.1 = 132 µF.
    const capacitor c = make_capacitor(al_electrolytic, 100_uF);
    const interval r = c.range({.t_min = 0_degC, .t_max = 65_degC, .service_hours = 16'000.0});
    CHECK_REL(r.low, 50.4e-6, 1e-14);
    CHECK_REL(r.high, 132e-6, 1e-14);
    CHECK_THROWS_WITH_AS(c.range({.t_min = 0_degC, .t_max = 65_degC, .service_hours = 40'000.0}),
                         "capacitor::range: service_hours = 40000 h is invalid; expected at most the part's life at "
                         "t_max = 65 \u00B0C, 32000 h (2000 h at 105 \u00B0C, doubling per 10 K below)",
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(c.range({.service_hours = -1.0}),
                         "capacitor::range: service_hours = -1 h is invalid; expected a non-negative, finite number "
                         "of hours",
                         tauforge::invalid_argument);
}

TEST_CASE("electrolytic leakage max(0.01 C V, 3 µA) loads an RC delay") {
    // Common practice rule: 100 µF at 5 V -> 0.01 x 100 µF x 5 V = 5 µA (above the 3 µA floor);
    // 10 µF -> 0.5 µA, so the floor 3 µA.
    CHECK_REL(make_capacitor(al_electrolytic, 100_uF).leakage_at(5_V)->value(), 5e-6, 1e-14);
    CHECK_REL(make_capacitor(al_electrolytic, 10_uF).leakage_at(5_V)->value(), 3e-6, 1e-14);
    CHECK_FALSE(make_capacitor(c0g_ceramic, 10_nF).leakage_at(5_V).has_value());
    // 100 kΩ, 100 µF +/-20 % at 25 °C, 5 V step, threshold 2/3. The leakage range [0, 5 µA]
    // drops up to 0.5 V across R (Thevenin: the node approaches 5 V - I R = 4.5 V), so by hand
    //   longest  = 100 kΩ x 120 µF x ln(4.5 / (4.5 - 10/3)),  shortest = 100 kΩ x 80 µF x ln 3.
    rc_delay d;
    d.r = {.nominal = 100_kohm};
    d.c = make_capacitor(al_electrolytic, 100_uF);
    const auto b = metric_bounds(d)[0];
    CHECK_REL(b.high, 100e3 * 120e-6 * std::log(4.5 / (4.5 - 10.0 / 3.0)), 1e-12);
    CHECK_REL(b.low, 100e3 * 80e-6 * std::log(3.0), 1e-12);
}

TEST_CASE("over the rating: an error, or a finding when the part allows it") {
    rc_delay d;
    d.r = {.nominal = 10_kohm};
    d.c = make_capacitor(x7r_ceramic, 1_uF);
    d.c.rated_voltage = 4_V;
    CHECK_THROWS_WITH_AS(d.ranges(),
                         "rc_delay::ranges: c.rated_voltage = 4 V is invalid; expected at least the 5 V that "
                         "supply.high can put across c",
                         tauforge::domain_error);
    d.c.allow_over_rating = true;
    CHECK_NOTHROW(d.ranges());
    const auto f = rating_findings(d.c, d.supply.high);
    REQUIRE(f.size() == 1);
    CHECK(f[0].level == severity::violation);
    CHECK(f[0].rule == "over_rating");
    CHECK(f[0].message == "C sees up to 5 V, above its rated 4 V; expected a part rated for at least 5 V");
    d.c.rated_voltage = 6.3_V;
    CHECK(rating_findings(d.c, d.supply.high).empty());
    d.c.rated_voltage.reset();
    CHECK(rating_findings(d.c, d.supply.high)[0].rule == "no_rating");
}
