// Tests of analysis/rss.hpp: REFERENCES.md stack-up and one-shot ("computed"),
// and against Monte Carlo sigma for small tolerances.
#include "approx.hpp"

#include <tauforge/analysis/function_network.hpp>
#include <tauforge/analysis/monte_carlo.hpp>
#include <tauforge/analysis/rss.hpp>
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/parts.hpp>
#include <tauforge/rc.hpp>

#include <doctest/doctest.h>

#include <cmath>

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

struct stack_names {
    static constexpr std::array<quantity_info, 3> parameters{{{"d1", ""}, {"d2", ""}, {"d3", ""}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"total", ""}}};
};
struct x_names {
    static constexpr std::array<quantity_info, 1> parameters{{{"x", ""}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"f", ""}}};
};

}  // namespace

TEST_CASE("stack-up 1 % + 1 % + 1.5 %: worst case 3.5 %, RSS 2.06 %") {
    // Computed (REFERENCES.md): worst case adds the half-widths, 1 + 1 + 1.5 = 3.5 %;
    // RSS at the same (3 sigma) confidence is sqrt(1 + 1 + 2.25) = 2.0616 %.
    const auto net = make_function_network<stack_names>(
        {interval{0.0, -0.01, 0.01}, interval{0.0, -0.01, 0.01}, interval{0.0, -0.015, 0.015}},
        [](const std::array<double, 3>& d) { return std::array<double, 1>{1.0 + d[0] + d[1] + d[2]}; });
    const auto wc = worst_case(net);
    CHECK_REL(wc[0].max.value - 1.0, 0.035, 1e-12);
    CHECK_REL(1.0 - wc[0].min.value, 0.035, 1e-12);
    const auto s = rss(net);
    CHECK_REL(s[0].relative_half_band, 0.0206, 2.5e-3);  // 3 figures: half a unit in the last
    CHECK_REL(s[0].relative_half_band, std::sqrt(4.25) / 100.0, 1e-9);
    CHECK_REL(s[0].sigma, std::sqrt(4.25) / 300.0, 1e-9);
    CHECK_REL(s[0].high - s[0].center, s[0].relative_half_band, 1e-9);
}

TEST_CASE("one-shot 100 kOhm +/-1 %, 10 nF +/-10 %: RSS +/-10.05 %") {
    // Computed (REFERENCES.md): sensitivities 1 and 1, sqrt(1^2 + 10^2) = 10.05 %.
    const one_shot n{{.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                     {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};
    const auto s = rss(n);
    CHECK_REL(s[0].nominal, 1.09861e-3, 5e-6);
    CHECK_REL(s[0].relative_half_band, 0.1005, 5e-4);
    CHECK_REL(s[0].relative_half_band, std::sqrt(1.01e-2), 1e-8);
    CHECK_REL(s.parameter_sigma[0], 1000.0 / 3.0, 1e-12);
    // 2 sigma band: two thirds of the 3 sigma one.
    const auto s2 = rss(n, {.band_sigmas = 2.0});
    CHECK_REL(s2[0].relative_half_band, s[0].relative_half_band * 2.0 / 3.0, 1e-12);
}

TEST_CASE("RSS sigma against Monte Carlo sigma for small tolerances") {
    // Both read the intervals as uniform (sigma = half-width / sqrt 3). For
    // t = k R C with relative half-widths a = 0.2 %, b = 0.5 %, the exact relative
    // variance is (1 + a^2/3)(1 + b^2/3) - 1 = a^2/3 + b^2/3 + a^2 b^2 / 9 (see
    // monte_carlo_test.cpp); RSS drops the last term, 1e-6 of the total here.
    // Monte Carlo's sigma from n = 200,000 samples has a relative standard error
    // sqrt((kurtosis - 1) / 4n) < sqrt(2 / 4n) = 0.0016 (kurtosis below the normal's 3
    // for sums of uniforms); allowed 5 standard errors.
    const one_shot n{{.nominal = 100_kohm, .tol = tolerance::symmetric(0.002)},
                     {.nominal = 10_nF, .tol = tolerance::symmetric(0.005)}};
    const auto s = rss(n, {.convention = spread_convention::uniform()});
    monte_carlo_options<one_shot> opt;
    opt.samples = 200'000;
    opt.distributions[0] = parameter_distribution::uniform();
    opt.distributions[1] = parameter_distribution::uniform();
    opt.percentiles.clear();
    opt.worst_samples = 0;
    const auto mc = monte_carlo(n, opt);
    CHECK_REL(s[0].sigma, mc[0].stddev, 5 * 0.0016);
    const double a = 0.002, b = 0.005;
    CHECK_REL(s[0].relative_sigma, std::sqrt(a * a / 3 + b * b / 3), 1e-8);
}

TEST_CASE("an asymmetric interval moves the RSS center to its midpoint") {
    // Linear f = x on [0.8, 1.8] with nominal 1 (an electrolytic's -20/+80 %):
    // center = 1 + (1.3 - 1) = 1.3; sigma = 1.0 / 6 at 3 sigma per half-width.
    const auto net = make_function_network<x_names>(
        {interval{1.0, 0.8, 1.8}}, [](const std::array<double, 1>& x) { return std::array<double, 1>{x[0]}; });
    const auto s = rss(net);
    CHECK_REL(s[0].nominal, 1.0, 1e-15);
    CHECK_REL(s[0].center, 1.3, 1e-9);
    CHECK_REL(s[0].sigma, 1.0 / 6.0, 1e-9);
}

TEST_CASE("a bad convention is an error") {
    const one_shot n{{.nominal = 1_kohm}, {.nominal = 1_nF}};
    CHECK_THROWS_WITH_AS(rss(n, {.convention = {0.0}}),
                         "rss: convention.sigmas_per_half_width = 0 is invalid; expected a positive, finite number of "
                         "standard deviations",
                         tauforge::invalid_argument);
}
