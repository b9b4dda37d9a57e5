// Tests of rc.hpp against handbook relations and derivations written here.
// Independent numerical references (Boost.Multiprecision closed form,
// Boost.Odeint integration) live in rc_reference_test.cpp.
#include "approx.hpp"

#include <tauforge/rc.hpp>

#include <doctest/doctest.h>

#include <cmath>

using namespace tauforge;
using namespace tauforge::literals;

TEST_CASE("one-shot width charging from 0 to 2/3 of the supply is RC ln 3") {
    // Common practice: thresholds at 1/3 and 2/3 of the supply, width = RC ln 3 ~ 1.1 RC.
    // Derivation: 2/3 V = V (1 - e^(-t/RC))  =>  t = RC ln 3.
    const duration tau = 100_kohm * 10_nF;
    const duration t = crossing_time(0_V, 9_V, 6_V, tau);
    CHECK_REL(t.value(), 1e-3 * std::log(3.0), 1e-15);
    CHECK_REL(t.value() / tau.value(), 1.0986122886681098, 1e-15);
    // The handbook's 1.1 RC is 0.13 % high (common practice).
    CHECK(std::abs(1.1 / std::log(3.0) - 1.0) == doctest::Approx(0.00126).epsilon(0.01));
}

TEST_CASE("edge-detector pulse below 1/3 of the supply after a full falling step lasts RC ln 1.5") {
    // Derivation: the node jumps from V to 0 and recovers towards V:
    // v(t) = V (1 - e^(-t/RC)) crosses V/3 at t = RC ln(3/2).
    const duration tau = 10_kohm * 470_pF;
    const duration t = crossing_time(0_V, 5_V, 5.0_V / 3.0, tau);
    CHECK_REL(t.value(), tau.value() * std::log(1.5), 1e-15);
}

TEST_CASE("half-LSB settling of a 12-bit input needs ln(2^13) time constants") {
    // Common practice: (N + 1) ln 2 time constants; 12 bits -> 9.011.
    CHECK_REL(half_lsb_time_constants(12), 13.0 * std::log(2.0), 1e-15);
    CHECK(half_lsb_time_constants(12) == doctest::Approx(9.011).epsilon(1e-4));
    CHECK(half_lsb_time_constants(8) == doctest::Approx(6.238).epsilon(1e-4));
    CHECK(half_lsb_time_constants(16) == doctest::Approx(11.784).epsilon(1e-4));
}

TEST_CASE("settling to within a fraction of the step is tau ln(1/fraction)") {
    // Textbook: 10 % 2.303 tau, 1 % 4.605 tau, 0.1 % 6.908 tau.
    const duration tau = 1_ms;
    CHECK(settling_time(0.1, tau).value() == doctest::Approx(2.303e-3).epsilon(2e-4));
    CHECK(settling_time(0.01, tau).value() == doctest::Approx(4.605e-3).epsilon(2e-4));
    CHECK(settling_time(0.001, tau).value() == doctest::Approx(6.908e-3).epsilon(2e-4));
}
