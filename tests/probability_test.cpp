// detail/probability.hpp: the library's own normal CDF and quantile, incomplete
// beta function and beta quantile, against Boost.Math (an independent numerical
// reference), and the yield intervals built on them.
#include <tauforge/analysis/monte_carlo.hpp>
#include <tauforge/detail/probability.hpp>

#include <boost/math/distributions/beta.hpp>
#include <boost/math/distributions/normal.hpp>
#include <boost/math/special_functions/beta.hpp>

#include <doctest/doctest.h>

#include <cmath>
#include <cstddef>

#include "approx.hpp"

using namespace tauforge;

TEST_CASE("normal_cdf and normal_quantile agree with Boost.Math to full precision") {
    const boost::math::normal_distribution<double> nd;
    double worst_cdf = 0.0, worst_q = 0.0;
    for (double x = -37.0; x <= 8.0; x += 0.0625) {
        worst_cdf = std::max(worst_cdf, tauforge_test::rel_diff(detail::normal_cdf(x), boost::math::cdf(nd, x)));
    }
    // Probabilities from the far lower tail through the centre to the upper tail.
    for (double e = -300.0; e <= -1.0; e += 0.25) {
        const double p = std::pow(10.0, e);
        worst_q = std::max(worst_q, tauforge_test::rel_diff(detail::normal_quantile(p), boost::math::quantile(nd, p)));
        const double q = 1.0 - std::pow(10.0, std::max(e, -15.0));
        worst_q = std::max(worst_q, tauforge_test::rel_diff(detail::normal_quantile(q), boost::math::quantile(nd, q)));
    }
    for (double p = 0.01; p < 0.995; p += 0.01) {
        if (std::abs(p - 0.5) < 1e-9) continue;  // the quantile is 0 there; checked below
        worst_q = std::max(worst_q, tauforge_test::rel_diff(detail::normal_quantile(p), boost::math::quantile(nd, p)));
    }
    INFO("worst relative error: cdf " << worst_cdf << ", quantile " << worst_q);
    CHECK(worst_cdf <= 1e-14);
    CHECK(worst_q <= 1e-14);
    CHECK(std::abs(detail::normal_quantile(0.5)) <= 1e-16);
    // The two-sided 95 % point, 1.959963984540054 (tables, from memory).
    CHECK_REL(-detail::normal_quantile(0.025), 1.959963984540054, 1e-15);
}

TEST_CASE("incomplete_beta agrees with Boost.Math's ibeta from small to sample-count arguments") {
    double worst = 0.0;
    for (const double a : {0.5, 1.0, 2.5, 17.0, 263.0, 1.0e4, 7.0e5, 1.0e7}) {
        for (const double b : {0.5, 1.0, 3.0, 50.0, 2.0e3, 3.0e5, 1.0e7}) {
            const double mean = a / (a + b), sd = std::sqrt(a * b / ((a + b) * (a + b) * (a + b + 1.0)));
            // Around the mean, where a quantile is solved, and across [0, 1].
            for (const double z : {-6.0, -3.0, -1.0, 0.0, 1.0, 3.0, 6.0}) {
                const double x = mean + z * sd;
                if (!(x > 0.0 && x < 1.0)) continue;
                const double ref = boost::math::ibeta(a, b, x);
                if (ref < 1e-300) continue;
                worst = std::max(worst, tauforge_test::rel_diff(detail::incomplete_beta(a, b, x), ref));
            }
            for (const double x : {1e-6, 0.01, 0.3, 0.5, 0.7, 0.99}) {
                const double ref = boost::math::ibeta(a, b, x);
                if (ref < 1e-300 || ref == 1.0) continue;
                worst = std::max(worst, tauforge_test::rel_diff(detail::incomplete_beta(a, b, x), ref));
            }
        }
    }
    INFO("worst relative error " << worst);
    // Measured worst: 5.2e-10, at a = 10^7, b = 0.5 (the continued fraction's
    // rounding over its many terms); about 1e-12 where a and b are alike.
    CHECK(worst <= 1e-9);
    CHECK(detail::incomplete_beta(2.0, 3.0, 0.0) == 0.0);
    CHECK(detail::incomplete_beta(2.0, 3.0, 1.0) == 1.0);
    // Closed form: I_x(1, b) = 1 - (1 - x)^b.
    CHECK_REL(detail::incomplete_beta(1.0, 20.0, 0.1), 1.0 - std::pow(0.9, 20.0), 1e-14);
}

TEST_CASE("beta_quantile inverts the incomplete beta function as Boost.Math's ibeta_inv does") {
    double worst = 0.0;
    for (const double a : {1.0, 4.0, 81.0, 2.0e4, 7.0e5, 5.0e6}) {
        for (const double b : {1.0, 15.0, 183.0, 3.0e5, 5.0e6}) {
            for (const double p : {1e-6, 0.005, 0.025, 0.5, 0.975, 0.995}) {
                const double x = detail::beta_quantile(a, b, p);
                worst = std::max(worst, tauforge_test::rel_diff(x, boost::math::ibeta_inv(a, b, p)));
            }
        }
    }
    INFO("worst relative error " << worst);
    CHECK(worst <= 1e-10);  // measured worst: 1.8e-11
}

TEST_CASE("the yield intervals agree with intervals built on Boost.Math, up to 10^7 trials") {
    for (const std::size_t n : {std::size_t{20}, std::size_t{263}, std::size_t{10'000}, std::size_t{1'000'000},
                                std::size_t{10'000'000}}) {
        for (const double share : {0.0, 1e-4, 0.05, 0.5, 0.9973, 1.0}) {
            const auto k = static_cast<std::size_t>(std::llround(share * static_cast<double>(n)));
            INFO(k << " of " << n);
            const double kd = static_cast<double>(k), nd = static_cast<double>(n);
            for (const double conf : {0.9, 0.95, 0.9973}) {
                const double a = 1.0 - conf;
                const auto e = clopper_pearson_interval(k, n, conf);
                const double lo = k == 0 ? 0.0
                                         : boost::math::quantile(boost::math::beta_distribution<double>(kd, nd - kd + 1.0),
                                                                 a / 2.0);
                const double hi = k == n ? 1.0
                                         : boost::math::quantile(boost::math::beta_distribution<double>(kd + 1.0, nd - kd),
                                                                 1.0 - a / 2.0);
                CHECK_REL(e.low, lo, 1e-9);  // measured worst 1.1e-10 (0 of 10^7)
                CHECK_REL(e.high, hi, 1e-9);
                const double z = boost::math::quantile(
                    boost::math::complement(boost::math::normal_distribution<double>(), a / 2.0));
                const double p = kd / nd, z2 = z * z, den = 1.0 + z2 / nd;
                const double c = (p + z2 / (2.0 * nd)) / den, h = z / den * std::sqrt(p * (1.0 - p) / nd + z2 / (4.0 * nd * nd));
                const auto w = wilson_interval(k, n, conf);
                CHECK(std::abs(w.low - std::max(0.0, c - h)) <= 1e-15);
                CHECK(std::abs(w.high - std::min(1.0, c + h)) <= 1e-15);
            }
        }
    }
}
