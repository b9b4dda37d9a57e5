// Every input rc.hpp rejects, with its documented error type and its message word for word
// (the texts are stable API, see error.hpp), and the one boundary that is not an error:
// a threshold equal to the start is reached at t = 0.
#include <tauforge/rc.hpp>

#include <doctest/doctest.h>

#include <algorithm>
#include <cstddef>
#include <limits>
#include <stdexcept>

using namespace tauforge;
using namespace tauforge::literals;

namespace {
constexpr double nan_value = std::numeric_limits<double>::quiet_NaN();
constexpr double inf_value = std::numeric_limits<double>::infinity();
voltage volts(double v) { return voltage::from_value(v); }
duration seconds(double t) { return duration::from_value(t); }
}  // namespace

TEST_CASE("the error types derive from the standard exceptions") {
    CHECK_THROWS_AS(crossing_time(0_V, 5_V, 1_V, 0_s), std::invalid_argument);
    CHECK_THROWS_AS(crossing_time(0_V, 5_V, 6_V, 1_ms), std::domain_error);
}

TEST_CASE("a time constant must be positive and finite") {
    CHECK_THROWS_WITH_AS(crossing_time(0_V, 5_V, 1_V, 0_s),
                         "crossing_time: tau = 0 s is invalid; expected a positive, finite time constant",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(crossing_time(0_V, 5_V, 1_V, seconds(-1e-3)),
                         "crossing_time: tau = -1 ms is invalid; expected a positive, finite time constant",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(crossing_time(0_V, 5_V, 1_V, seconds(nan_value)),
                         "crossing_time: tau = nan s is invalid; expected a positive, finite time constant",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(crossing_time(0_V, 5_V, 1_V, seconds(inf_value)),
                         "crossing_time: tau = inf s is invalid; expected a positive, finite time constant",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(voltage_at(0_V, 5_V, 0_s, 1_ms),
                         "voltage_at: tau = 0 s is invalid; expected a positive, finite time constant",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(settling_time(0.01, seconds(-2e-6)),
                         "settling_time: tau = -2 \u00B5s is invalid; expected a positive, finite time constant",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(crossing_time(ramp_input{0_V, 5_V, 1_ms}, 2_V, 3_V, 0_s),
                         "crossing_time: tau = 0 s is invalid; expected a positive, finite time constant",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(voltage_at(ramp_input{0_V, 5_V, 1_ms}, 0_V, seconds(-1e-3), 1_ms),
                         "voltage_at: tau = -1 ms is invalid; expected a positive, finite time constant",
                         tauforge::invalid_argument);
    // The plain-double kernel validates the same way.
    CHECK_THROWS_WITH_AS(detail::rc::crossing_time(0.0, 5.0, 1.0, -1e-3),
                         "crossing_time: tau = -1 ms is invalid; expected a positive, finite time constant",
                         tauforge::invalid_argument);
}

TEST_CASE("voltages must be finite") {
    CHECK_THROWS_WITH_AS(crossing_time(volts(nan_value), 5_V, 1_V, 1_ms),
                         "crossing_time: v_start = nan V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(crossing_time(0_V, volts(inf_value), 1_V, 1_ms),
                         "crossing_time: v_final = inf V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(crossing_time(0_V, 5_V, volts(-inf_value), 1_ms),
                         "crossing_time: v_threshold = -inf V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(voltage_at(volts(nan_value), 5_V, 1_ms, 1_ms),
                         "voltage_at: v_start = nan V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(voltage_at(0_V, volts(inf_value), 1_ms, 1_ms),
                         "voltage_at: v_final = inf V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    // Checked before the threshold rules, so inf == inf is not mistaken for "threshold equals start".
    CHECK_THROWS_WITH_AS(time_constant_for(volts(inf_value), 5_V, volts(inf_value), 2_ms),
                         "time_constant_for: v_start = inf V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(crossing_time(ramp_input{volts(nan_value), 5_V, 1_ms}, 2_V, 3_V, 1_ms),
                         "crossing_time: v_begin = nan V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(crossing_time(ramp_input{0_V, volts(-inf_value), 1_ms}, 2_V, 3_V, 1_ms),
                         "crossing_time: v_end = -inf V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(crossing_time(ramp_input{0_V, 5_V, 1_ms}, volts(inf_value), 3_V, 1_ms),
                         "crossing_time: v_cap_start = inf V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(crossing_time(ramp_input{0_V, 5_V, 1_ms}, 2_V, volts(inf_value), 1_ms),
                         "crossing_time: v_threshold = inf V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
}

TEST_CASE("a threshold outside the reachable range is a domain error naming the three voltages") {
    const char* const rule = "; expected a threshold strictly between start and final value, or equal to the start";
    CHECK_THROWS_WITH_AS(crossing_time(0_V, 5_V, 6_V, 1_ms),
                         (std::string("crossing_time: v_threshold = 6 V is not reached from v_start = 0 V towards "
                                      "v_final = 5 V") + rule).c_str(),
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(crossing_time(1_V, 5_V, 0.5_V, 1_ms),
                         (std::string("crossing_time: v_threshold = 500 mV is not reached from v_start = 1 V towards "
                                      "v_final = 5 V") + rule).c_str(),
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(crossing_time(0_V, 5_V, 5_V, 1_ms),
                         (std::string("crossing_time: v_threshold = 5 V is not reached from v_start = 0 V towards "
                                      "v_final = 5 V") + rule).c_str(),
                         tauforge::domain_error);
    // Falling: the threshold lies above the start.
    CHECK_THROWS_WITH_AS(crossing_time(5_V, 0_V, 6_V, 1_ms),
                         (std::string("crossing_time: v_threshold = 6 V is not reached from v_start = 5 V towards "
                                      "v_final = 0 V") + rule).c_str(),
                         tauforge::domain_error);
    // No step at all: start equals final value.
    CHECK_THROWS_WITH_AS(crossing_time(2_V, 2_V, 1_V, 1_ms),
                         (std::string("crossing_time: v_threshold = 1 V is not reached from v_start = 2 V towards "
                                      "v_final = 2 V") + rule).c_str(),
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(detail::rc::crossing_time(0.0, 5.0, 6.0, 1e-3),
                         (std::string("crossing_time: v_threshold = 6 V is not reached from v_start = 0 V towards "
                                      "v_final = 5 V") + rule).c_str(),
                         tauforge::domain_error);
}

TEST_CASE("time_constant_for needs a threshold strictly between start and final value") {
    CHECK_THROWS_WITH_AS(time_constant_for(1_V, 5_V, 1_V, 2_ms),
                         "time_constant_for: v_threshold = 1 V equals v_start, which is reached at t = 0 for every "
                         "time constant, not after t = 2 ms; expected a threshold strictly between start and final value",
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(time_constant_for(0_V, 5_V, 5_V, 2_ms),
                         "time_constant_for: v_threshold = 5 V is not reached from v_start = 0 V towards v_final = 5 V; "
                         "expected a threshold strictly between start and final value",
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(time_constant_for(0_V, 5_V, -1_V, 2_ms),
                         "time_constant_for: v_threshold = -1 V is not reached from v_start = 0 V towards v_final = 5 V; "
                         "expected a threshold strictly between start and final value",
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(time_constant_for(0_V, 5_V, 1_V, 0_s),
                         "time_constant_for: t = 0 s is invalid; expected a positive, finite time",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(time_constant_for(0_V, 5_V, 1_V, seconds(-1e-3)),
                         "time_constant_for: t = -1 ms is invalid; expected a positive, finite time",
                         tauforge::invalid_argument);
}

TEST_CASE("a threshold equal to the start is reached at t = 0") {
    // The documented rule, also when there is no step at all and for the ramp input.
    CHECK(crossing_time(2_V, 5_V, 2_V, 1_ms).value() == 0.0);
    CHECK(crossing_time(5_V, 2_V, 5_V, 1_ms).value() == 0.0);
    CHECK(crossing_time(2_V, 2_V, 2_V, 1_ms).value() == 0.0);
    CHECK(detail::rc::crossing_time(-3.0, 4.0, -3.0, 1.0) == 0.0);
    CHECK(crossing_time(ramp_input{0_V, 5_V, 1_ms}, 2_V, 2_V, 1_ms).value() == 0.0);
    CHECK(crossing_time(ramp_input{0_V, 5_V, 0_s}, 2_V, 2_V, 1_ms).value() == 0.0);
    // The tau check still comes first.
    CHECK_THROWS_AS(crossing_time(2_V, 5_V, 2_V, 0_s), tauforge::invalid_argument);
}

TEST_CASE("settling_time needs a fraction strictly between 0 and 1") {
    CHECK_THROWS_WITH_AS(settling_time(0.0, 1_ms),
                         "settling_time: fraction = 0 is invalid; expected a fraction of the step strictly between 0 and 1",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(settling_time(1.0, 1_ms),
                         "settling_time: fraction = 1 is invalid; expected a fraction of the step strictly between 0 and 1",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(settling_time(1.5, 1_ms),
                         "settling_time: fraction = 1.5 is invalid; expected a fraction of the step strictly between 0 and 1",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(settling_time(nan_value, 1_ms),
                         "settling_time: fraction = nan is invalid; expected a fraction of the step strictly between 0 and 1",
                         tauforge::invalid_argument);
}

TEST_CASE("half_lsb_time_constants needs 1 to 32 bits") {
    CHECK_THROWS_WITH_AS(half_lsb_time_constants(0),
                         "half_lsb_time_constants: bits = 0 is invalid; expected a resolution of 1 to 32 bits",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(half_lsb_time_constants(33),
                         "half_lsb_time_constants: bits = 33 is invalid; expected a resolution of 1 to 32 bits",
                         tauforge::invalid_argument);
    // The ends of the range are accepted: (N + 1) ln 2 (common practice).
    CHECK(half_lsb_time_constants(1) == doctest::Approx(2.0 * 0.6931471805599453));
    CHECK(half_lsb_time_constants(32) == doctest::Approx(33.0 * 0.6931471805599453));
}

TEST_CASE("times must not be negative") {
    CHECK_THROWS_WITH_AS(voltage_at(0_V, 5_V, 1_ms, seconds(-1e-6)),
                         "voltage_at: t = -1 \u00B5s is invalid; expected a non-negative, finite time",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(voltage_at(ramp_input{0_V, 5_V, 1_ms}, 0_V, 1_ms, seconds(-1e-3)),
                         "voltage_at: t = -1 ms is invalid; expected a non-negative, finite time",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(voltage_at(0_V, 5_V, 1_ms, seconds(inf_value)),
                         "voltage_at: t = inf s is invalid; expected a non-negative, finite time",
                         tauforge::invalid_argument);
    // t = 0 is the start itself.
    CHECK(voltage_at(1.5_V, 5_V, 1_ms, 0_s).value() == 1.5);
}

TEST_CASE("a ramp's rise time must not be negative") {
    CHECK_THROWS_WITH_AS(crossing_time(ramp_input{0_V, 5_V, seconds(-1e-3)}, 0_V, 1_V, 1_ms),
                         "crossing_time: rise_time = -1 ms is invalid; expected a non-negative, finite time",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(voltage_at(ramp_input{0_V, 5_V, seconds(-1e-3)}, 0_V, 1_ms, 1_ms),
                         "voltage_at: rise_time = -1 ms is invalid; expected a non-negative, finite time",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(voltage_at(ramp_input{0_V, 5_V, seconds(nan_value)}, 0_V, 1_ms, 1_ms),
                         "voltage_at: rise_time = nan s is invalid; expected a non-negative, finite time",
                         tauforge::invalid_argument);
}

TEST_CASE("a ramp threshold must lie between the capacitor's start and the ramp's end") {
    // 2 V start, ramp from 0 V: the capacitor first falls, and may cross 1 V on the way down,
    // but only thresholds between v_cap_start and v_end are supported; the message says so
    // rather than claiming 1 V is never reached.
    CHECK_THROWS_WITH_AS(crossing_time(ramp_input{0_V, 5_V, 1_ms}, 2_V, 1_V, 1_ms),
                         "crossing_time: v_threshold = 1 V does not lie between v_cap_start = 2 V and v_end = 5 V; "
                         "expected a threshold strictly between them, or equal to v_cap_start",
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(crossing_time(ramp_input{5_V, 0_V, 1_ms}, 5_V, 0_V, 1_ms),
                         "crossing_time: v_threshold = 0 V does not lie between v_cap_start = 5 V and v_end = 0 V; "
                         "expected a threshold strictly between them, or equal to v_cap_start",
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(detail::rc::ramp_crossing_time(0.0, 5.0, 1e-3, 0.0, 7.5, 1e-3),
                         "crossing_time: v_threshold = 7.5 V does not lie between v_cap_start = 0 V and v_end = 5 V; "
                         "expected a threshold strictly between them, or equal to v_cap_start",
                         tauforge::domain_error);
}

TEST_CASE("with_shunt and with_leakage_current reject non-physical parts") {
    CHECK_THROWS_WITH_AS(with_shunt(5_V, 10_kohm, 100_nF, 0_ohm),
                         "with_shunt: r_shunt = 0 \u03A9 is invalid; expected a positive, finite resistance "
                         "(without a shunt, tau is r_source c)",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(with_shunt(5_V, 0_ohm, 100_nF, 10_kohm),
                         "with_shunt: r_source = 0 \u03A9 is invalid; expected a positive, finite resistance",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(with_shunt(5_V, 10_kohm, 0_nF, 10_kohm),
                         "with_shunt: c = 0 F is invalid; expected a positive, finite capacitance",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(with_shunt(5_V, 10_kohm, 1_nF, 10_kohm, volts(nan_value)),
                         "with_shunt: v_shunt = nan V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(with_shunt(volts(inf_value), 10_kohm, 1_nF, 10_kohm),
                         "with_shunt: v_source = inf V is invalid; expected a finite voltage",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(with_leakage_current(5_V, 0_ohm, 1_nF, 1_uA),
                         "with_leakage_current: r_source = 0 \u03A9 is invalid; expected a positive, finite resistance",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(with_leakage_current(5_V, 1_kohm, capacitance::from_value(-1e-9), 1_uA),
                         "with_leakage_current: c = -1 nF is invalid; expected a positive, finite capacitance",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(with_leakage_current(5_V, 1_kohm, 1_nF, current::from_value(inf_value)),
                         "with_leakage_current: i_leak = inf A is invalid; expected a finite current",
                         tauforge::invalid_argument);
}

TEST_CASE("the block kernel crossing_times gives crossing_time's values and errors element by element") {
    // Derivation: the block kernel is the same formula with the checks run over the
    // block first, so every element must match crossing_time bit for bit, and a bad
    // element must raise crossing_time's own message for that element.
    constexpr std::size_t n = 7;
    const double vs[n] = {0.0, 5.0, 1.0, 0.0, -2.0, 3.0, 0.0};
    const double vf[n] = {5.0, 0.0, 4.0, -5.0, 2.0, 3.5, 1.0};
    const double vth[n] = {3.3333, 1.6667, 1.0, -0.1, 1.999, 3.2, 1e-9};  // [2]: at the start, t = 0
    const double tau[n] = {1e-3, 2e-6, 5.0, 1e-9, 0.1, 47e-6, 1.0};
    double out[n];
    detail::rc::crossing_times(n, vs, vf, vth, tau, out);
    for (std::size_t k = 0; k < n; ++k) {
        INFO("k = " << k);
        CHECK(out[k] == detail::rc::crossing_time(vs[k], vf[k], vth[k], tau[k]));
    }
    CHECK(out[2] == 0.0);
    // Constant arguments mixed with columns.
    detail::rc::crossing_times(1, 0.0, 1.0, vth + 6, tau, out);  // one element: vth[6], tau[0]
    CHECK(out[0] == detail::rc::crossing_time(0.0, 1.0, 1e-9, 1e-3));
    // A bad element (here the fifth: a threshold beyond the final value) throws its own message.
    double bad_vth[n];
    std::copy(vth, vth + n, bad_vth);
    bad_vth[4] = 2.5;
    CHECK_THROWS_WITH_AS(detail::rc::crossing_times(n, vs, vf, bad_vth, tau, out),
                         "crossing_time: v_threshold = 2.5 V is not reached from v_start = -2 V towards v_final = "
                         "2 V; expected a threshold strictly between start and final value, or equal to the start",
                         tauforge::domain_error);
    double bad_tau[n];
    std::copy(tau, tau + n, bad_tau);
    bad_tau[3] = nan_value;
    CHECK_THROWS_WITH_AS(detail::rc::crossing_times(n, vs, vf, vth, bad_tau, out),
                         "crossing_time: tau = nan s is invalid; expected a positive, finite time constant",
                         tauforge::invalid_argument);
}
