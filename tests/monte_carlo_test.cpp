// Tests of analysis/monte_carlo.hpp and its random streams: published
// reference outputs (from memory), closed forms derived here, Boost.Math normal,
// beta and binomial distributions as independent references.
#include "approx.hpp"

#include <tauforge/analysis/function_network.hpp>
#include <tauforge/analysis/monte_carlo.hpp>
#include <tauforge/detail/random_streams.hpp>
#include <tauforge/networks/timer_astable.hpp>
#include <tauforge/parts.hpp>
#include <tauforge/rc.hpp>

#include <boost/math/distributions/binomial.hpp>
#include <boost/math/distributions/normal.hpp>

#include <doctest/doctest.h>

#include <algorithm>
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
    // The same on a block (Monte Carlo's block path), through rc.hpp's block kernel.
    void evaluate_block(std::size_t count, const std::array<const double*, 3>& x,
                        const std::array<double*, 1>& out) const {
        for (std::size_t k = 0; k < count; ++k) out[0][k] = x[0][k] * x[1][k];
        detail::rc::crossing_times(count, 0.0, 1.0, x[2], static_cast<const double*>(out[0]), out[0]);
    }
};
static_assert(BlockEvaluableNetwork<one_shot>);

/// The same network without a block evaluation: Monte Carlo evaluates it point by point.
struct one_shot_pointwise {
    static constexpr auto parameters = one_shot::parameters;
    static constexpr auto metrics = one_shot::metrics;
    one_shot n;
    std::array<interval, 3> ranges() const { return n.ranges(); }
    std::array<double, 1> evaluate(const std::array<double, 3>& x) const { return n.evaluate(x); }
};
static_assert(!BlockEvaluableNetwork<one_shot_pointwise>);

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

// ---- the block path (samples drawn and evaluated in chunks, parameters as columns) ----

namespace {

timer_astable test_oscillator() {  // near 1.24 kHz: 1.44 / ((Ra + 2 Rb) C), common practice
    timer_astable n;
    n.ra = {.nominal = 4.7_kohm, .tol = tolerance::symmetric(0.01), .tcr = ppm_band::symmetric(200)};
    n.rb = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)};
    n.c = {.nominal = 47_nF, .tol = tolerance::symmetric(0.1), .tempco = c0g};
    n.supply = ranged<voltage>::between(11.4_V, 12.6_V);
    n.lower_threshold = ranged<double>::plus_minus(1.0 / 3.0, 0.01);
    n.upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, 0.01);
    n.discharge_saturation = ranged<voltage>::between(0_V, 0.2_V);
    n.conditions = {.t_min = celsius{0.0}, .t_max = celsius{50.0}};
    return n;
}

/// Every metric's sample values as monte_carlo_sample and evaluate give them one
/// sample at a time (the scalar path), sorted, and the joint pass count.
template <class N>
std::pair<std::array<std::vector<double>, metric_count_v<N>>, std::size_t> pointwise_samples(
    const N& n, const monte_carlo_options<N>& opt) {
    constexpr std::size_t M = metric_count_v<N>;
    std::array<std::vector<double>, M> v;
    std::size_t pass = 0;
    for (std::size_t i = 0; i < opt.samples; ++i) {
        const auto y = n.evaluate(monte_carlo_sample(n, opt, i));
        bool ok = true;
        for (std::size_t m = 0; m < M; ++m) {
            v[m].push_back(y[m]);
            ok = ok && (!opt.spec[m].low || y[m] >= *opt.spec[m].low) && (!opt.spec[m].high || y[m] <= *opt.spec[m].high);
        }
        pass += ok;
    }
    for (auto& x : v) std::sort(x.begin(), x.end());
    return {v, pass};
}

template <std::size_t P, std::size_t M>
void check_same_result(const monte_carlo_result<P, M>& a, const monte_carlo_result<P, M>& b) {
    CHECK(a.passing == b.passing);
    for (std::size_t m = 0; m < M; ++m) {
        CHECK(same_bits(a[m].mean, b[m].mean));
        CHECK(same_bits(a[m].stddev, b[m].stddev));
        CHECK(same_bits(a[m].min, b[m].min));
        CHECK(same_bits(a[m].max, b[m].max));
        CHECK(a[m].inside == b[m].inside);
        REQUIRE(a[m].percentiles.size() == b[m].percentiles.size());
        for (std::size_t i = 0; i < a[m].percentiles.size(); ++i)
            CHECK(same_bits(a[m].percentiles[i].value, b[m].percentiles[i].value));
        REQUIRE(a[m].worst.size() == b[m].worst.size());
        for (std::size_t i = 0; i < a[m].worst.size(); ++i) CHECK(a[m].worst[i].index == b[m].worst[i].index);
        REQUIRE(a[m].distribution.size() == b[m].distribution.size());
        for (std::size_t i = 0; i < a[m].distribution.size(); ++i)
            CHECK(same_bits(a[m].distribution[i], b[m].distribution[i]));
    }
}

/// The block path against the scalar path (every sample drawn and evaluated on
/// its own, bit for bit), and 1 thread against 2 (the whole result, bit for bit).
template <class N>
void check_block_path(const N& n, monte_carlo_options<N> opt) {
    constexpr std::size_t M = metric_count_v<N>;
    opt.keep_distribution = true;
    opt.threads = 1;
    const auto one = monte_carlo(n, opt);
    const auto [values, pass] = pointwise_samples(n, opt);
    CHECK(one.passing == pass);
    for (std::size_t m = 0; m < M; ++m) {
        REQUIRE(one[m].distribution.size() == values[m].size());
        std::size_t differ = 0;
        for (std::size_t i = 0; i < values[m].size(); ++i) differ += !same_bits(one[m].distribution[i], values[m][i]);
        CHECK(differ == 0);
    }
    opt.threads = 2;
    check_same_result(one, monte_carlo(n, opt));
}

}  // namespace

TEST_CASE("the block path gives bit for bit what sample-by-sample evaluation gives, on 1 and 2 threads") {
    // Derivation: the block path draws the same stream numbers (sample i, parameter j
    // -> splitmix64 output i P + j) through the same transforms, so every sample, and
    // with it every statistic, must match the scalar path exactly. Sample counts are
    // not multiples of the chunk (256) or the block (4096).
    SUBCASE("one-shot with a block evaluation (rc.hpp's block kernel), normal parameters") {
        monte_carlo_options<one_shot> opt;
        opt.samples = 10'007;
        opt.seed = 5;
        opt.spec[0] = spec_window::between(1.0_ms, 1.2_ms);
        check_block_path(reference_one_shot, opt);
        // The network with and without evaluate_block: the same result.
        opt.keep_distribution = false;
        check_same_result(monte_carlo(reference_one_shot, opt),
                          monte_carlo(one_shot_pointwise{reference_one_shot}, monte_carlo_options<one_shot_pointwise>{
                                                                                  .seed = opt.seed,
                                                                                  .samples = opt.samples,
                                                                                  .spec = opt.spec}));
    }
    SUBCASE("one-shot, uniform parameters, an asymmetric interval") {
        one_shot n = reference_one_shot;
        n.ratio = ranged<double>::between(0.6, 0.7);
        n.ratio.nominal = 0.62;
        monte_carlo_options<one_shot> opt;
        opt.samples = 4'099;
        opt.distributions[0] = parameter_distribution::uniform();
        opt.spec[0] = spec_window::between(0.9_ms, 1.2_ms);
        check_block_path(n, opt);
    }
    SUBCASE("oscillator (timer_astable, five metrics), evaluated point by point") {
        monte_carlo_options<timer_astable> opt;
        opt.samples = 9'001;
        opt.seed = 77;
        opt.spec[timer_astable::frequency] = spec_window::between(1.15_kHz, 1.35_kHz);
        check_block_path(test_oscillator(), opt);
    }
    SUBCASE("custom distributions mixed with normal and uniform ones") {
        monte_carlo_options<timer_astable> opt;
        opt.samples = 5'000;
        opt.distributions[0] = parameter_distribution::custom([](double u) { return 4.6e3 + 200.0 * u * u; });
        opt.distributions[2] = parameter_distribution::uniform();
        opt.distributions[3] = parameter_distribution::custom([](double u) { return 11.4 + 1.2 * std::sqrt(u); });
        opt.spec[timer_astable::frequency] = spec_window::between(1.15_kHz, 1.35_kHz);
        check_block_path(test_oscillator(), opt);
    }
}

TEST_CASE("the block draws equal the sample-by-sample draws, tails of the normal included") {
    // Derivation: draw_block must reproduce draw() for every sample and parameter;
    // a truncation at k = 2.5 sigma puts about 2.6 % of the p values of Acklam's
    // lower tail region (p < 0.02425) in every chunk.
    const one_shot n = reference_one_shot;
    monte_carlo_options<one_shot> opt;
    opt.convention.sigmas_per_half_width = 2.5;
    opt.distributions[1] = parameter_distribution::uniform();
    const auto r = n.ranges();
    const auto s = detail::make_sampler<one_shot>("test", r, opt);
    constexpr std::size_t C = detail::monte_carlo_chunk;
    std::vector<double> columns(3 * C);
    std::array<double*, 3> col{columns.data(), columns.data() + C, columns.data() + 2 * C};
    std::size_t differ = 0;
    for (const std::size_t i0 : {std::size_t{0}, std::size_t{1000}, std::size_t{123'457}})
        for (const std::size_t count : {C, std::size_t{1}, std::size_t{97}}) {
            s.draw_block(i0, count, col);
            for (std::size_t k = 0; k < count; ++k) {
                auto x = detail::nominal_point(r);
                s.draw(i0 + k, x);
                for (std::size_t j = 0; j < 3; ++j) differ += !same_bits(col[j][k], x[j]);
            }
        }
    CHECK(differ == 0);
}

TEST_CASE("the block inverse normal CDF equals the pointwise one, in the centre and both tails") {
    // Derivation: the same formulas element by element; p spans both of Acklam's tail
    // regions (p < 0.02425 and p > 0.97575) and the centre.
    constexpr std::size_t N = 64;
    std::array<double, N> p{}, z{};
    for (std::size_t i = 0; i < N; ++i) p[i] = std::pow(10.0, -12.0 + 12.0 * static_cast<double>(i) / N);
    for (std::size_t i = N / 2; i < N; ++i) p[i] = 1.0 - p[i - N / 2];
    for (const std::size_t n : {N, std::size_t{40}, std::size_t{1}}) {
        z.fill(0.0);
        detail::inverse_normal_cdf_block<N>(p.data(), z.data(), n);
        for (std::size_t i = 0; i < n; ++i) CHECK(same_bits(z[i], detail::inverse_normal_cdf(p[i])));
    }
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
