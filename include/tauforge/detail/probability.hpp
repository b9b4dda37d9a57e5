#pragma once
// The few probability functions the analyses need, in a handful of lines each,
// so that including the library does not pull in Boost.Math's distributions
// (they tripled the umbrella header's compile time). The tests check each one
// against Boost.Math.
//
// - normal_cdf:       Phi(x) = erfc(-x / sqrt 2) / 2.
// - normal_quantile:  Acklam's approximation (random_streams.hpp) polished by one
//                     Halley step on Phi, to full double precision.
// - incomplete_beta:  the regularised I_x(a, b) by its continued fraction (modified
//                     Lentz; Press et al., Numerical Recipes, "incomplete beta
//                     function"), its prefactor written about the mean with
//                     Stirling's series so that it keeps its digits at 10^7 trials.
// - beta_quantile:    I_x(a, b) = p solved for x in [0, 1] (root_find.hpp).

#include "tauforge/detail/random_streams.hpp"

#include "tauforge/detail/root_find.hpp"

#include <cmath>
#include <numbers>
#include <utility>

namespace tauforge::detail {

/// The standard normal CDF.
inline double normal_cdf(double x) { return 0.5 * std::erfc(-x / std::numbers::sqrt2); }

/// The standard normal quantile for p in (0, 1), to full double precision.
inline double normal_quantile(double p) {
    const double x = inverse_normal_cdf(p);
    // One Halley step: e = Phi(x) - p, u = e / phi(x), x -= u / (1 + x u / 2). The upper
    // tail works on the complement so that e keeps its digits there.
    const double e = p > 0.5 ? 0.5 * std::erfc(x / std::numbers::sqrt2) - (1.0 - p) : normal_cdf(x) - p;
    const double u = (p > 0.5 ? -e : e) * std::sqrt(2.0 * std::numbers::pi) * std::exp(0.5 * x * x);
    return x - u / (1.0 + 0.5 * x * u);
}

/// The continued fraction of I_x(a, b), converging fast for x < (a + 1)/(a + b + 2).
inline double incomplete_beta_fraction(double a, double b, double x) {
    constexpr double tiny = 1e-300, eps = 1e-16;
    const double qab = a + b, qap = a + 1.0, qam = a - 1.0;
    double c = 1.0, d = 1.0 - qab * x / qap;
    d = 1.0 / (std::abs(d) < tiny ? tiny : d);
    double h = d;
    // Converges in O(sqrt(max(a, b))) terms; the bound is far beyond any sample count.
    for (int m = 1; m <= 1'000'000; ++m) {
        const double m2 = 2.0 * m;
        double aa = m * (b - m) * x / ((qam + m2) * (a + m2));
        d = 1.0 + aa * d;
        d = 1.0 / (std::abs(d) < tiny ? tiny : d);
        c = 1.0 + aa / c;
        c = std::abs(c) < tiny ? tiny : c;
        h *= d * c;
        aa = -(a + m) * (qab + m) * x / ((a + m2) * (qap + m2));
        d = 1.0 + aa * d;
        d = 1.0 / (std::abs(d) < tiny ? tiny : d);
        c = 1.0 + aa / c;
        c = std::abs(c) < tiny ? tiny : c;
        const double del = d * c;
        h *= del;
        if (std::abs(del - 1.0) < eps) break;
    }
    return h;
}

/// ln Gamma(z) less Stirling's main part (z - 1/2) ln z - z + ln(2 pi)/2: the series
/// 1/(12 z) - 1/(360 z^3) + ... for z >= 10 (truncation below 2e-14), std::lgamma below.
inline double stirling_remainder(double z) {
    if (z < 10.0) return std::lgamma(z) - ((z - 0.5) * std::log(z) - z + 0.5 * std::log(2.0 * std::numbers::pi));
    const double r = 1.0 / z, r2 = r * r;
    return r * (1.0 / 12.0 - r2 * (1.0 / 360.0 - r2 * (1.0 / 1260.0 - r2 * (1.0 / 1680.0 - r2 / 1188.0))));
}

/// x^a (1 - x)^b / B(a, b), for a, b > 0 and x in (0, 1). Written about the mean
/// x0 = a / (a + b) so that nothing large cancels (std::lgamma differences lose
/// seven digits at a = 10^7): with w = x (a + b) - a, one fused rounding,
///   ln = a ln(1 + w/a) + b ln(1 - w/b) + ln(a b / (2 pi (a + b))) / 2 + remainders,
/// as x / x0 = 1 + w/a and (1 - x) / (1 - x0) = 1 - w/b.
inline double beta_density_factor(double a, double b, double x) {
    const double s = a + b, w = std::fma(x, s, -a), u = w / a, v = -w / b;
    const double ln_x = std::abs(u) < 0.5 ? std::log1p(u) : std::log(x * s / a);
    const double ln_1mx = std::abs(v) < 0.5 ? std::log1p(v) : std::log((1.0 - x) * s / b);
    return std::exp(a * ln_x + b * ln_1mx + 0.5 * std::log(a * b / (s * 2.0 * std::numbers::pi)) +
                    stirling_remainder(s) - stirling_remainder(a) - stirling_remainder(b));
}

/// I_x(a, b) and its complement 1 - I_x(a, b), each to its own relative precision
/// (the one the continued fraction gives directly; the other by subtraction from 1),
/// for a, b > 0 and x in [0, 1].
inline std::pair<double, double> incomplete_beta_both(double a, double b, double x) {
    if (x <= 0.0) return {0.0, 1.0};
    if (x >= 1.0) return {1.0, 0.0};
    const double front = beta_density_factor(a, b, x);
    if (x < (a + 1.0) / (a + b + 2.0)) {
        const double i = front * incomplete_beta_fraction(a, b, x) / a;
        return {i, 1.0 - i};
    }
    const double ic = front * incomplete_beta_fraction(b, a, 1.0 - x) / b;
    return {1.0 - ic, ic};
}

/// The regularised incomplete beta function I_x(a, b) for a, b > 0 and x in [0, 1].
inline double incomplete_beta(double a, double b, double x) { return incomplete_beta_both(a, b, x).first; }

/// The x in [0, 1] with I_x(a, b) = p, for a, b > 0 and p in (0, 1). An upper
/// probability is matched on the complement, which keeps its digits there.
inline double beta_quantile(double a, double b, double p) {
    const bool upper = p > 0.5;
    const auto f = [&](double x) {
        const auto [i, ic] = incomplete_beta_both(a, b, x);
        return upper ? (1.0 - p) - ic : i - p;
    };
    return bracketed_root(f, 0.0, 1.0, -p, 1.0 - p);
}

}  // namespace tauforge::detail
