// Tests of analysis/test_limits.hpp: the guard-band rule, false-reject rates
// against closed forms derived here (Boost.Math normal distribution for Phi),
// and the read-back of a part against a hand-computed RC delay.
#include "approx.hpp"

#include <tauforge/analysis/function_network.hpp>
#include <tauforge/analysis/monte_carlo.hpp>
#include <tauforge/analysis/test_limits.hpp>
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/parts.hpp>
#include <tauforge/rc.hpp>

#include <boost/math/distributions/normal.hpp>

#include <doctest/doctest.h>

#include <cmath>
#include <vector>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

struct one_shot {
    static constexpr std::array<quantity_info, 3> parameters{{{"R", "\u03A9"}, {"C", "F"}, {"ratio", ""}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"width", "s"}}};
    resistor r;
    capacitor c;
    ranged<double> ratio = ranged<double>::exactly(2.0 / 3.0);
    std::array<interval, 3> ranges() const { return {r.range(), c.range(), ratio.as_interval()}; }
    std::array<double, 1> evaluate(const std::array<double, 3>& x) const {
        return {detail::rc::crossing_time(0.0, 1.0, x[2], x[0] * x[1])};
    }
};

struct x_names {
    static constexpr std::array<quantity_info, 1> parameters{{{"x", ""}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"f", ""}}};
};

const boost::math::normal_distribution<double> standard_normal;
double Phi(double z) { return boost::math::cdf(standard_normal, z); }
double phi(double z) { return boost::math::pdf(standard_normal, z); }

}  // namespace

TEST_CASE("the guard band shrinks each side of the window by U = k u") {
    // Rule (header): acceptance = [low + k u, high - k u]. 0.9..1.3 ms, u = 10 us, k = 2: 0.92..1.28 ms.
    const auto a = guard_banded(spec_window::between(0.9_ms, 1.3_ms), {.standard = 10e-6});
    CHECK_REL(*a.low, 0.92e-3, 1e-12);
    CHECK_REL(*a.high, 1.28e-3, 1e-12);
    // One-sided: only the set side moves. k = 3.
    const auto b = guard_banded(spec_window::at_least(20_ms), {.standard = 1e-3, .coverage = 3.0});
    CHECK_REL(*b.low, 23e-3, 1e-12);
    CHECK_FALSE(b.high.has_value());
    CHECK_THROWS_WITH_AS(guard_banded(spec_window::between(1.0, 1.2), {.standard = 0.05}),
                         "guard_banded: U = 0.1 is invalid; expected less than half the window's width 0.2; the "
                         "measurement is too uncertain for this window",
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(guard_banded(spec_window::between(1.0, 1.2), {.standard = -0.05}),
                         "guard_banded: u.standard = -0.05 is invalid; expected a non-negative, finite standard "
                         "uncertainty",
                         tauforge::invalid_argument);
}

TEST_CASE("false rejects of units all at one value: 2 Phi(-(w - U) / u)") {
    // Derivation: true value x0 at the centre of a window of half-width w = 5u;
    // acceptance half-width w - 2u = 3u; P(|x0 + e - x0| > 3u) = 2 Phi(-3) = 0.0027 (Boost.Math).
    const double u = 0.01;
    const std::vector<double> population(100, 1.0);
    const auto w = spec_window::between(1.0 - 5 * u, 1.0 + 5 * u);
    const auto a = guard_banded(w, {.standard = u});
    const auto r = screening(population, w, a, u);
    CHECK(r.good_fraction == 1.0);
    CHECK_REL(r.false_reject_rate, 2 * Phi(-3.0), 1e-9);
    CHECK_REL(r.reject_fraction, 2 * Phi(-3.0), 1e-9);
    CHECK(r.false_accept_rate == 0.0);
    // Without measurement error nothing inside the acceptance window is rejected.
    CHECK(screening(population, w, a, 0.0).false_reject_rate == 0.0);
}

TEST_CASE("false-reject rate of a uniform population against its closed form") {
    // Derivation: X uniform on [a, b] inside the window (every unit good); the
    // acceptance window [A_lo, A_hi]; a unit at x is rejected with probability
    // Phi((A_lo - x)/u) + Phi((x - A_hi)/u). With G(t) = t Phi(t) + phi(t), G' = Phi:
    //   FRR = u / (b - a) [G((A_lo - a)/u) - G((A_lo - b)/u) + G((b - A_hi)/u) - G((a - A_hi)/u)].
    // Here window = [a, b] = [-1, 1], u = 0.1, k = 2, A = [-0.8, 0.8]:
    //   FRR = 0.1 [G(2) - G(-18)] = 0.200849.
    // The Monte Carlo estimate averages values in [0, 1], so its standard error is at
    // most sqrt(FRR (1 - FRR) / n) (Var Y <= E Y - (E Y)^2 for Y in [0, 1]); 5 allowed.
    const double a = -1.0, b = 1.0, u = 0.1;
    const auto G = [](double t) { return t * Phi(t) + phi(t); };
    const double A_lo = -0.8, A_hi = 0.8;
    const double frr = u / (b - a) * (G((A_lo - a) / u) - G((A_lo - b) / u) + G((b - A_hi) / u) - G((a - A_hi) / u));
    CHECK(frr == doctest::Approx(0.200849).epsilon(1e-5));

    const auto net = make_function_network<x_names>(
        {interval{0.0, a, b}}, [](const std::array<double, 1>& x) { return std::array<double, 1>{x[0]}; });
    monte_carlo_options<decltype(net)> opt;
    opt.samples = 200'000;
    opt.distributions[0] = parameter_distribution::uniform();
    opt.keep_distribution = true;
    const auto mc = monte_carlo(net, opt);
    const auto plan = production_test_limits(mc[0], spec_window::between(a, b), {.standard = u});
    CHECK_REL(*plan.acceptance.low, A_lo, 1e-12);
    CHECK_REL(*plan.acceptance.high, A_hi, 1e-12);
    CHECK(plan.guard == doctest::Approx(0.2));
    CHECK(plan.rates.good_fraction == 1.0);
    const double n = static_cast<double>(opt.samples);
    CHECK(std::abs(plan.rates.false_reject_rate - frr) <= 5 * std::sqrt(frr * (1 - frr) / n));
}

TEST_CASE("units outside the window that measure inside are false accepts") {
    // Derivation: a unit 1 u beyond the acceptance edge of a zero-width guard band
    // (k = 0 is not allowed, so take acceptance = window by hand) is accepted with
    // probability Phi(-1) = 0.158655 (Boost.Math).
    const std::vector<double> population{1.1, 0.5};
    const auto w = spec_window::between(0.0, 1.0);
    const auto r = screening(population, w, w, 0.1);
    CHECK(r.good_fraction == 0.5);
    CHECK_REL(r.false_accept_rate, Phi(-1.0), 1e-9);
}

TEST_CASE("test limits from the worst-case spread of a one-shot") {
    // The worst-case extremes (REFERENCES.md, computed: 0.97886..1.22056 ms) as the
    // window, u = 5 us, k = 2: acceptance 0.98886..1.21056 ms. Every Monte Carlo
    // unit lies inside the worst-case window (the normal is truncated at the intervals).
    const one_shot n{{.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                     {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};
    const auto window = window_from(worst_case(n)[0]);
    monte_carlo_options<one_shot> opt;
    opt.samples = 50'000;
    opt.keep_distribution = true;
    const auto mc = monte_carlo(n, opt);
    const auto plan = production_test_limits(mc[0], window, {.standard = 5e-6});
    CHECK_REL(*plan.acceptance.low, 0.98886e-3, 1e-5);
    CHECK_REL(*plan.acceptance.high, 1.21056e-3, 1e-5);
    CHECK(plan.rates.good_fraction == 1.0);
    CHECK(plan.rates.false_reject_rate > 0.0);
    CHECK(plan.rates.false_reject_rate < 0.01);
    // The percentile window of the same run lies inside the worst-case one.
    const auto p = window_from_percentiles(mc[0], 0.00135, 0.99865);
    CHECK(*p.low >= *window.low);
    CHECK(*p.high <= *window.high);
}

TEST_CASE("read-back: the capacitor of an RC delay from a measured time") {
    // By hand: t = R C ln 3 (rc_test.cpp's one-shot relation), so C = t / (R ln 3).
    // t = 1.2 ms, R = 100 kOhm: C = 1.2e-3 / (1e5 x 1.0986123) = 10.92290 nF.
    // With R +/-1 % and U = 2 x 5 us: C from 1.19 ms / (101 kOhm ln 3) to 1.21 ms / (99 kOhm ln 3).
    const one_shot n{{.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                     {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};
    const interval c = estimate_parameter(n, 1, 0, 1.2_ms, {.standard = 5e-6});
    CHECK_REL(c.nominal, 1.2e-3 / (1e5 * std::log(3.0)), 1e-12);
    CHECK(c.nominal == doctest::Approx(10.92290e-9).epsilon(1e-6));
    CHECK_REL(c.low, 1.19e-3 / (1.01e5 * std::log(3.0)), 1e-12);
    CHECK_REL(c.high, 1.21e-3 / (0.99e5 * std::log(3.0)), 1e-12);
}

TEST_CASE("read-back with a threshold spread: the ratio's extremes widen the interval") {
    // By hand: C = t / (R ln(1 / (1 - r))), r in [0.65, 0.68], R +/-1 %, U = 0:
    //   low  = 1.2 ms / (101 kOhm ln(1 / 0.32)), high = 1.2 ms / (99 kOhm ln(1 / 0.35)).
    one_shot n{{.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)}, {.nominal = 10_nF}};
    n.ratio = ranged<double>{2.0 / 3.0, 0.65, 0.68};
    const interval c = estimate_parameter(n, 1, 0, 1.2e-3, {});
    CHECK_REL(c.low, 1.2e-3 / (1.01e5 * std::log(1 / 0.32)), 1e-12);
    CHECK_REL(c.high, 1.2e-3 / (0.99e5 * std::log(1 / 0.35)), 1e-12);
}

TEST_CASE("read-back of a threshold ratio stays inside the ratios the network accepts") {
    // By hand: 1 ms = R C ln(1 / (1 - r)) with R C = 1 ms gives r = 1 - 1/e = 0.6321206.
    // The bracket grows from the fixed 2/3 and stops where crossing_time rejects r >= 1.
    const one_shot n{{.nominal = 100_kohm}, {.nominal = 10_nF}};
    const interval r = estimate_parameter(n, 2, 0, 1e-3, {});
    CHECK_REL(r.nominal, 1.0 - std::exp(-1.0), 1e-12);
    CHECK(r.low == r.nominal);
    CHECK(r.high == r.nominal);
}

TEST_CASE("read-back of an unreachable measurement is an error") {
    // A negative time no capacitor produces.
    const one_shot n{{.nominal = 100_kohm}, {.nominal = 10_nF}};
    CHECK_THROWS_WITH_AS(
        estimate_parameter(n, 1, 0, -1e-3, {}),
        "estimate_parameter: measured = -0.001 s is invalid; expected a value that width reaches for C "
        "between 5.41559e-28 F and 1.84652e+11 F (the searched range)",
        tauforge::domain_error);
    CHECK_THROWS_WITH_AS(estimate_parameter(n, 3, 0, 1e-3, {}),
                         "estimate_parameter: parameter = 3 is invalid; expected an index below 3",
                         tauforge::invalid_argument);
}
