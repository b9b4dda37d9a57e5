// Tests of analysis/sensitivity.hpp against derivatives worked in the comments.
#include "approx.hpp"

#include <tauforge/analysis/function_network.hpp>
#include <tauforge/analysis/sensitivity.hpp>
#include <tauforge/parts.hpp>
#include <tauforge/rc.hpp>

#include <doctest/doctest.h>

#include <cmath>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

// A one-shot: width = R C ln(1 / (1 - ratio)) through rc.hpp.
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

// The same network with analytic derivatives of t = R C L(r), L = -ln(1 - r):
// dt/dR = C L, dt/dC = R L, dt/dr = R C / (1 - r). L comes from the network's
// own evaluate (t / (R C)), not a second copy of the formula.
struct one_shot_with_jacobian : one_shot {
    std::array<std::array<double, 3>, 1> jacobian(const std::array<double, 3>& x) const {
        const double t = evaluate(x)[0], L = t / (x[0] * x[1]);
        return {{{x[1] * L, x[0] * L, x[0] * x[1] / (1.0 - x[2])}}};
    }
};
static_assert(!HasJacobian<one_shot>);
static_assert(HasJacobian<one_shot_with_jacobian>);

const one_shot base{{.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                    {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};

struct x_names {
    static constexpr std::array<quantity_info, 1> parameters{{{"x", ""}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"f", ""}}};
};

}  // namespace

TEST_CASE("one-shot: normalized sensitivities 1 to R and C, 2 / ln 3 to the threshold ratio") {
    // t = R C L(r), L = ln(1/(1 - r)): d ln t / d ln R = d ln t / d ln C = 1;
    // d ln t / d ln r = r L'(r) / L = r / ((1 - r) L) = (2/3) / ((1/3) ln 3) = 2 / ln 3 at r = 2/3.
    const auto s = sensitivity(base);
    CHECK(s.method == derivative_method::central_difference);
    CHECK(s.consistent);
    CHECK_REL(s.normalized[0][0], 1.0, 1e-9);
    CHECK_REL(s.normalized[0][1], 1.0, 1e-9);
    CHECK_REL(s.normalized[0][2], 2.0 / std::log(3.0), 1e-8);
    // Absolute: dt/dR = C ln 3 = 1e-8 x ln 3 s/Ohm.
    CHECK_REL(s.derivative[0][0], 1e-8 * std::log(3.0), 1e-9);
    CHECK(s.disagreement[0][0] < 1e-6);
}

TEST_CASE("an analytic jacobian is detected and used") {
    const one_shot_with_jacobian n{base};
    const auto s = sensitivity(n);
    CHECK(s.method == derivative_method::analytic);
    CHECK(s.disagreement[0][2] == 0.0);
    CHECK_REL(s.normalized[0][2], 2.0 / std::log(3.0), 1e-14);
    const auto numeric = sensitivity(n, {.use_analytic = false});
    CHECK(numeric.method == derivative_method::central_difference);
    CHECK_REL(numeric.normalized[0][2], s.normalized[0][2], 1e-8);
}

TEST_CASE("a kink between the two steps makes the estimate inconsistent") {
    // f = x + 10 max(0, x - k) with the kink k = x0 (1 + 0.75 h), h = 1e-4 relative.
    // Step h crosses the kink: D(h) = 1 + 10 (0.25 h x0) / (2 h x0) = 2.25; step h/2
    // does not: D(h/2) = 1. The disagreement in normalized units is 1.25 x0 / f(x0) = 1.25.
    const double x0 = 2.0, k = x0 * (1.0 + 0.75e-4);
    const auto net = make_function_network<x_names>({interval{x0, 1.0, 3.0}}, [k](const std::array<double, 1>& x) {
        return std::array<double, 1>{x[0] + 10.0 * std::max(0.0, x[0] - k)};
    });
    const auto s = sensitivity(net);
    CHECK_FALSE(s.consistent);
    CHECK_REL(s.disagreement[0][0], 1.25, 1e-6);
}

TEST_CASE("a metric that is zero at the nominal has no normalized sensitivity") {
    const auto net = make_function_network<x_names>(
        {interval{0.0, -1.0, 1.0}}, [](const std::array<double, 1>& x) { return std::array<double, 1>{3.0 * x[0]}; });
    const auto s = sensitivity(net);
    CHECK(std::isnan(s.normalized[0][0]));
    CHECK_REL(s.derivative[0][0], 3.0, 1e-12);  // the step for x = 0 is 1e-4 of the width
}

TEST_CASE("a bad step is an error") {
    CHECK_THROWS_WITH_AS(sensitivity(base, {.relative_step = 0.0}),
                         "sensitivity: relative_step = 0 is invalid; expected a step between 0 and 0.1 (relative)",
                         tauforge::invalid_argument);
}
