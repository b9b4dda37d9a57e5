// Tests of analysis/monte_carlo.hpp and its random streams: published
// reference outputs (from memory), closed forms derived here, Boost.Math normal,
// beta and binomial distributions as independent references.
#include "approx.hpp"

#include <tauforge/analysis/function_network.hpp>
#include <tauforge/analysis/monte_carlo.hpp>
#include <tauforge/detail/random_streams.hpp>
#include <tauforge/parts.hpp>
#include <tauforge/rc.hpp>

#include <boost/math/distributions/binomial.hpp>
#include <boost/math/distributions/normal.hpp>

#include <doctest/doctest.h>

#include <cmath>
#include <cstring>

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

const one_shot reference_one_shot{{.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                                  {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)},
                                  ranged<double>::plus_minus(2.0 / 3.0, 0.01)};

struct x_names {
    static constexpr std::array<quantity_info, 1> parameters{{{"x", ""}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"f", ""}}};
};
struct ab_names {
    static constexpr std::array<quantity_info, 2> parameters{{{"a", ""}, {"b", ""}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"product", ""}}};
};

auto identity_net(interval i) {
    return make_function_network<x_names>({i},
                                          [](const std::array<double, 1>& x) { return std::array<double, 1>{x[0]}; });
}

bool same_bits(double a, double b) { return std::memcmp(&a, &b, sizeof a) == 0; }

}  // namespace

TEST_CASE("splitmix64 reproduces its published reference outputs") {
    // splitmix64 seeded with 1234567: the first five outputs (reference values of
    // the algorithm by Steele, Lea and Flood, from memory).
    detail::splitmix64 g{1234567};
    CHECK(g() == 6457827717110365317ull);
    CHECK(g() == 3203168211198807973ull);
    CHECK(g() == 9817491932198370423ull);
    CHECK(g() == 4593380528125082431ull);
    CHECK(g() == 16408922859458223821ull);
    // Counter-based access gives the same numbers without stepping.
    CHECK(detail::splitmix_at(1234567, 0) == 6457827717110365317ull);
    CHECK(detail::splitmix_at(1234567, 4) == 16408922859458223821ull);
}

TEST_CASE("53-bit uniforms cover 0 <= u < 1 in steps of 2^-53") {
    CHECK(detail::uniform53(0) == 0.0);
    CHECK(detail::uniform53(~0ull) == 1.0 - 0x1.0p-53);
    CHECK(detail::uniform53(1ull << 11) == 0x1.0p-53);
    CHECK(detail::uniform53(1ull << 63) == 0.5);
}

TEST_CASE("the inverse normal CDF agrees with Boost.Math's quantile within Acklam's bound") {
    // Acklam's stated relative error bound is 1.15e-9; Boost.Math is the reference.
    const boost::math::normal_distribution<double> nd;
    double worst = 0.0;
    for (int i = 1; i < 2000; ++i) {
        const double p = i / 2000.0;
        const double ref = boost::math::quantile(nd, p);
        worst = std::max(worst, std::abs(detail::inverse_normal_cdf(p) - ref) / std::max(std::abs(ref), 1e-300));
    }
    for (double p : {1e-12, 1e-9, 1e-6, 1e-4, 0.001349898, 0.02425, 0.97575, 1 - 1e-6}) {
        const double ref = boost::math::quantile(nd, p);
        worst = std::max(worst, std::abs(detail::inverse_normal_cdf(p) - ref) / std::abs(ref));
    }
    CHECK(worst < 1.2e-9);
    CHECK(detail::inverse_normal_cdf(0.5) == 0.0);
}

TEST_CASE("product of two independent uniform tolerances: mean 1, variance (1 + a^2/3)(1 + b^2/3) - 1") {
    // Derivation: X = 1 + U, U uniform on [-a, a]: E X = 1, E X^2 = 1 + a^2/3.
    // For independent X, Y: E XY = 1 and E (XY)^2 = E X^2 E Y^2 = (1 + a^2/3)(1 + b^2/3),
    // so Var XY = (1 + a^2/3)(1 + b^2/3) - 1.
    // Statistical bounds for n samples, 5 standard errors each: the mean's error is
    // sigma / sqrt n; the sample variance's is sigma^2 sqrt((kurtosis - 1) / n) and the
    // kurtosis is below 3 (each factor is uniform, kurtosis 1.8), so <= sigma^2 sqrt(2 / n).
    const double a = 0.1, b = 0.2;
    const auto net = make_function_network<ab_names>(
        {interval{1.0, 1 - a, 1 + a}, interval{1.0, 1 - b, 1 + b}},
        [](const std::array<double, 2>& x) { return std::array<double, 1>{x[0] * x[1]}; });
    monte_carlo_options<decltype(net)> opt;
    opt.samples = 200'000;
    opt.seed = 20240601;
    opt.distributions.fill(parameter_distribution::uniform());
    opt.percentiles.clear();
    opt.worst_samples = 0;
    const auto mc = monte_carlo(net, opt);
    const double var = (1 + a * a / 3) * (1 + b * b / 3) - 1;
    const double n = static_cast<double>(opt.samples);
    CHECK(std::abs(mc[0].mean - 1.0) <= 5 * std::sqrt(var / n));
    CHECK(std::abs(mc[0].stddev * mc[0].stddev - var) <= 5 * var * std::sqrt(2.0 / n));
    CHECK(mc[0].min >= (1 - a) * (1 - b));
    CHECK(mc[0].max <= (1 + a) * (1 + b));
}

TEST_CASE("percentiles of a metric linear in one truncated normal parameter match Boost.Math quantiles") {
    // f = x, x normal with sigma = 1/3 of the half-width, truncated at +/-3 sigma:
    // its p-quantile is mu + sigma Phi^-1(Phi(-3) + p (1 - 2 Phi(-3))) (Boost.Math).
    // Error of a sample p-quantile: sqrt(p (1 - p) / n) / density there; 5 of them allowed.
    const auto net = identity_net({10.0, 7.0, 13.0});  // mu 10, sigma 1
    monte_carlo_options<decltype(net)> opt;
    opt.samples = 400'000;
    opt.percentiles = {0.01, 0.1, 0.5, 0.9, 0.99};
    const auto mc = monte_carlo(net, opt);
    const boost::math::normal_distribution<double> nd;
    const double c = boost::math::cdf(nd, -3.0), mass = 1 - 2 * c;
    for (const auto& pv : mc[0].percentiles) {
        const double z = boost::math::quantile(nd, c + pv.probability * mass);
        const double density = boost::math::pdf(nd, z) / mass;
        const double se = std::sqrt(pv.probability * (1 - pv.probability) / opt.samples) / density;
        INFO("p = " << pv.probability);
        CHECK(std::abs(pv.value - (10.0 + z)) <= 5 * se);
    }
    // The truncated normal's variance: 1 - 6 phi(3) / (1 - 2 Phi(-3)) (a textbook result).
    const double var = 1 - 6 * boost::math::pdf(nd, 3.0) / mass;
    CHECK(std::abs(mc[0].stddev * mc[0].stddev - var) <= 5 * var * std::sqrt(2.0 / opt.samples));
    CHECK(mc[0].min >= 7.0);
    CHECK(mc[0].max <= 13.0);
}

TEST_CASE("+/-3 sigma of an untruncated normal: 99.73 % inside, 2700 ppm outside") {
    // Common practice; Boost.Math normal distribution: 2 Phi(-3) = 0.0026998.
    const boost::math::normal_distribution<double> nd;
    CHECK(2 * boost::math::cdf(nd, -3.0) == doctest::Approx(0.0027).epsilon(1e-3));
    // A custom inverse CDF (Boost's quantile, untruncated) and a window at +/-3 sigma.
    const auto net = identity_net({0.0, -3.0, 3.0});
    monte_carlo_options<decltype(net)> opt;
    opt.samples = 400'000;
    opt.percentiles.clear();
    opt.worst_samples = 0;
    opt.distributions[0] =
        parameter_distribution::custom([nd](double u) { return u == 0.0 ? -40.0 : boost::math::quantile(nd, u); });
    opt.spec[0] = spec_window::between(-3.0, 3.0);
    const auto mc = monte_carlo(net, opt);
    // The count outside is binomial(n, 0.0027): within 5 standard deviations.
    const double p_out = 2 * boost::math::cdf(nd, -3.0), n = static_cast<double>(opt.samples);
    CHECK(std::abs((1 - mc.yield.estimate) - p_out) <= 5 * std::sqrt(p_out * (1 - p_out) / n));
    CHECK(mc.yield.low < 1 - p_out + 5e-4);
    CHECK(mc.yield.high > 1 - p_out - 5e-4);
}

TEST_CASE("Wilson and Clopper-Pearson intervals against Newcombe's worked examples") {
    // Newcombe, "Two-sided confidence intervals for the single proportion:
    // comparison of seven methods", Statistics in Medicine 17 (1998), 95 % intervals
    // (from memory): 81/263 Wilson 0.2553-0.3662, exact 0.2527-0.3676;
    // 15/148 Wilson 0.0624-0.1605, exact 0.0578-0.1617; 0/20 Wilson 0-0.1611,
    // exact 0-0.1684; 1/29 Wilson 0.0061-0.1718, exact 0.0009-0.1776.
    struct row {
        std::size_t k, n;
        double wl, wh, el, eh;
    };
    for (const row r : {row{81, 263, 0.2553, 0.3662, 0.2527, 0.3676}, row{15, 148, 0.0624, 0.1605, 0.0578, 0.1617},
                        row{0, 20, 0.0, 0.1611, 0.0, 0.1684}, row{1, 29, 0.0061, 0.1718, 0.0009, 0.1776}}) {
        INFO(r.k << "/" << r.n);
        const auto w = wilson_interval(r.k, r.n, 0.95);
        const auto e = clopper_pearson_interval(r.k, r.n, 0.95);
        CHECK(std::abs(w.low - r.wl) <= 5e-5);
        CHECK(std::abs(w.high - r.wh) <= 5e-5);
        CHECK(std::abs(e.low - r.el) <= 5e-5);
        CHECK(std::abs(e.high - r.eh) <= 5e-5);
    }
    // Derivation: for 0 successes the exact upper limit solves (1 - p)^n = alpha/2.
    CHECK_REL(clopper_pearson_interval(0, 20).high, 1 - std::pow(0.025, 1.0 / 20), 1e-12);
    CHECK_THROWS_WITH_AS(wilson_interval(3, 2),
                         "wilson_interval: successes = 3 is invalid; expected at most trials = 2",
                         tauforge::invalid_argument);
}

TEST_CASE("the same seed gives bit-identical results on 1 and 2 threads") {
    monte_carlo_options<one_shot> opt;
    opt.samples = 50'001;  // not a multiple of the block size
    opt.seed = 99;
    opt.spec[0] = spec_window::between(1.0_ms, 1.2_ms);
    auto one = monte_carlo(reference_one_shot, opt);
    opt.threads = 2;
    auto two = monte_carlo(reference_one_shot, opt);
    CHECK(same_bits(one[0].mean, two[0].mean));
    CHECK(same_bits(one[0].stddev, two[0].stddev));
    CHECK(same_bits(one[0].min, two[0].min));
    CHECK(same_bits(one[0].max, two[0].max));
    CHECK(one.passing == two.passing);
    REQUIRE(one[0].percentiles.size() == two[0].percentiles.size());
    for (std::size_t i = 0; i < one[0].percentiles.size(); ++i)
        CHECK(same_bits(one[0].percentiles[i].value, two[0].percentiles[i].value));
    REQUIRE(one[0].worst.size() == two[0].worst.size());
    for (std::size_t i = 0; i < one[0].worst.size(); ++i) CHECK(one[0].worst[i].index == two[0].worst[i].index);
    // Another seed gives another result.
    opt.seed = 100;
    CHECK_FALSE(same_bits(monte_carlo(reference_one_shot, opt)[0].mean, one[0].mean));
}

TEST_CASE("worst samples are ordered by margin and can be drawn again") {
    monte_carlo_options<one_shot> opt;
    opt.samples = 20'000;
    opt.worst_samples = 4;
    opt.spec[0] = spec_window::between(1.0_ms, 1.2_ms);
    const auto mc = monte_carlo(reference_one_shot, opt);
    REQUIRE(mc[0].worst.size() == 4);
    for (std::size_t i = 1; i < 4; ++i) CHECK(mc[0].worst[i - 1].margin <= mc[0].worst[i].margin);
    for (const auto& w : mc[0].worst) {
        const auto x = monte_carlo_sample(reference_one_shot, opt, w.index);
        CHECK(x == w.parameters);
        CHECK(reference_one_shot.evaluate(x)[0] == w.value);
        CHECK(w.margin == std::min(w.value - 1.0e-3, 1.2e-3 - w.value));
    }
    // No sample lies closer to (or farther outside) the window than the worst one.
    CHECK(mc[0].worst[0].margin <= std::min(mc[0].min - 1.0e-3, 1.2e-3 - mc[0].max));
}

TEST_CASE("yield of a uniform parameter against a window: the count is binomial") {
    // f = x uniform on [0, 1]; window [0.2, 0.9] holds 70 %. The count inside is
    // binomial(n, 0.7): check it lies within Boost.Math's central 1 - 1e-6 range.
    const auto net = identity_net({0.5, 0.0, 1.0});
    monte_carlo_options<decltype(net)> opt;
    opt.samples = 100'000;
    opt.distributions[0] = parameter_distribution::uniform();
    opt.spec[0] = spec_window::between(0.2, 0.9);
    const auto mc = monte_carlo(net, opt);
    const boost::math::binomial_distribution<double> bin(opt.samples, 0.7);
    CHECK(mc.passing >= boost::math::quantile(bin, 0.5e-6));
    CHECK(mc.passing <= boost::math::quantile(boost::math::complement(bin, 0.5e-6)));
    CHECK(mc[0].inside == mc.passing);
    CHECK(mc.yield.low < mc.yield.estimate);
    CHECK(mc.yield.high > mc.yield.estimate);
    CHECK(mc.yield_exact.low < mc.yield.estimate);
    // One-sided windows.
    opt.spec[0] = spec_window::at_least(0.25);
    const auto one_sided = monte_carlo(net, opt);
    const boost::math::binomial_distribution<double> b75(opt.samples, 0.75);
    CHECK(one_sided.passing >= boost::math::quantile(b75, 0.5e-6));
    CHECK(one_sided.passing <= boost::math::quantile(boost::math::complement(b75, 0.5e-6)));
}

TEST_CASE("an asymmetric interval is a two-piece normal with its mode at the nominal") {
    // [0.8, 1.8] with nominal 1 (-20/+80 %): sigma- = 0.2/3, sigma+ = 0.8/3; the mass
    // below the nominal is sigma- / (sigma- + sigma+) = 0.2 (derivation in the header).
    const auto net = identity_net({1.0, 0.8, 1.8});
    monte_carlo_options<decltype(net)> opt;
    opt.samples = 100'000;
    opt.spec[0] = spec_window::at_most(1.0);
    opt.keep_distribution = true;
    const auto mc = monte_carlo(net, opt);
    const boost::math::binomial_distribution<double> bin(opt.samples, 0.2);
    CHECK(mc.passing >= boost::math::quantile(bin, 0.5e-6));
    CHECK(mc.passing <= boost::math::quantile(boost::math::complement(bin, 0.5e-6)));
    CHECK(mc[0].min >= 0.8);
    CHECK(mc[0].max <= 1.8);
    // The kept distribution is sorted and gives the same percentiles as the selection.
    CHECK(std::is_sorted(mc[0].distribution.begin(), mc[0].distribution.end()));
    opt.keep_distribution = false;
    const auto sel = monte_carlo(net, opt);
    for (std::size_t i = 0; i < sel[0].percentiles.size(); ++i)
        CHECK(sel[0].percentiles[i].value == mc[0].percentiles[i].value);
}

TEST_CASE("percentiles by bucket selection equal those of a full sort") {
    // Reference: std::sort, then linear interpolation at h = (n - 1) p (type 7).
    const auto reference = [](std::vector<double> v, double p) {
        std::sort(v.begin(), v.end());
        const double h = (v.size() - 1) * p;
        const std::size_t lo = static_cast<std::size_t>(h);
        return lo + 1 < v.size() ? v[lo] + (h - lo) * (v[lo + 1] - v[lo]) : v[lo];
    };
    detail::splitmix64 g{7};
    std::vector<std::vector<double>> cases;
    cases.push_back({3.0, 1.0});
    cases.push_back(std::vector<double>(1000, 2.5));  // all equal
    std::vector<double> spread;
    for (int i = 0; i < 50'000; ++i)
        spread.push_back(detail::inverse_normal_cdf(0.001 + 0.998 * detail::uniform53(g())));
    cases.push_back(spread);
    spread.push_back(1e6);  // one far outlier: nearly everything falls into the first bucket
    cases.push_back(spread);
    for (const auto& v : cases) {
        std::vector<percentile_value> pv{{0.0, 0}, {0.00135, 0}, {0.3, 0}, {0.5, 0}, {0.999, 0}, {1.0, 0}};
        detail::select_percentiles(v, *std::min_element(v.begin(), v.end()), *std::max_element(v.begin(), v.end()), pv);
        for (const auto& q : pv) {
            INFO("n = " << v.size() << ", p = " << q.probability);
            CHECK(q.value == reference(v, q.probability));
        }
    }
}

TEST_CASE("a custom distribution maps the uniform through the user's inverse CDF") {
    // x = u^2 for u uniform on [0, 1): E x = 1/3, Var x = 1/5 - 1/9 = 4/45.
    const auto net = identity_net({0.5, 0.0, 1.0});
    monte_carlo_options<decltype(net)> opt;
    opt.samples = 100'000;
    opt.distributions[0] = parameter_distribution::custom([](double u) { return u * u; });
    const auto mc = monte_carlo(net, opt);
    CHECK(std::abs(mc[0].mean - 1.0 / 3.0) <= 5 * std::sqrt(4.0 / 45.0 / opt.samples));
}

TEST_CASE("fixed parameters keep their value") {
    const one_shot n{{.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)}, {.nominal = 10_nF}};
    monte_carlo_options<one_shot> opt;
    opt.samples = 1000;
    const auto x = monte_carlo_sample(n, opt, 17);
    CHECK(x[1] == 10e-9);
    CHECK(x[2] == 2.0 / 3.0);
    CHECK(x[0] >= 99e3);
    CHECK(x[0] <= 101e3);
}

TEST_CASE("bad Monte Carlo settings are errors") {
    monte_carlo_options<one_shot> opt;
    opt.samples = 1;
    CHECK_THROWS_WITH_AS(monte_carlo(reference_one_shot, opt),
                         "monte_carlo: samples = 1 is invalid; expected at least 2 samples",
                         tauforge::invalid_argument);
    opt.samples = 100;
    opt.spec[0] = spec_window::between(2.0_ms, 1.0_ms);
    CHECK_THROWS_WITH_AS(monte_carlo(reference_one_shot, opt),
                         "monte_carlo: spec.width.low = 0.002 s is invalid; expected at most spec.width.high = 0.001 s",
                         tauforge::invalid_argument);
    opt.spec[0] = {};
    opt.distributions[0] = parameter_distribution::custom({});
    CHECK_THROWS_WITH_AS(monte_carlo(reference_one_shot, opt),
                         "monte_carlo: distributions[0] = R is invalid; expected a callable for a custom distribution",
                         tauforge::invalid_argument);
}
