#pragma once
// Solving a monotone function of one positive part value for a target: the
// fast path of networks whose metric is not a plain product of R and C.

#include "tauforge/detail/root_find.hpp"

#include <cmath>
#include <limits>

namespace tauforge::detail {

/// The x > 0 where f(x) = target, for f continuous and monotone (rising when
/// `rising`, else falling) on x > 0. f may return +infinity where the metric is
/// unreachable (it must then stay so beyond). The bracket grows geometrically from
/// `guess` (factor 2, at most 2^-300 .. 2^300 times guess), then Brent's method (root_find.hpp) refines
/// ln x to about 1e-15 relative. Returns 0 when f is on the far side of target for
/// every x down to the lower limit (no value is small enough), +infinity when for
/// every x up to the upper limit (no value is large enough), NaN for a non-positive
/// or non-finite guess.
template <class F>
double solve_monotone_positive(F&& f, double target, double guess, bool rising) {
    if (!(guess > 0.0 && std::isfinite(guess)) || std::isnan(target)) return std::numeric_limits<double>::quiet_NaN();
    // g(u) < 0 on the small-x side of the solution, > 0 on the large-x side.
    const double sign = rising ? 1.0 : -1.0;
    auto g = [&](double u) {
        const double v = f(std::exp(u));
        if (v == std::numeric_limits<double>::infinity()) return rising ? 1.0 : -1.0;  // unreachable: above target
        return sign * (v - target);
    };
    const double u0 = std::log(guess);
    constexpr double step = 0.6931471805599453;  // ln 2
    double lo = u0, hi = u0;
    double g_lo = g(lo), g_hi = g_lo;
    if (g_lo == 0.0) return guess;
    if (g_lo < 0.0) {
        int n = 0;
        do {
            lo = hi, g_lo = g_hi;
            hi += step;
            g_hi = g(hi);
        } while (g_hi < 0.0 && ++n < 300);
        if (g_hi < 0.0) return std::numeric_limits<double>::infinity();
    } else {
        int n = 0;
        do {
            hi = lo, g_hi = g_lo;
            lo -= step;
            g_lo = g(lo);
        } while (g_lo > 0.0 && ++n < 300);
        if (g_lo > 0.0) return 0.0;
    }
    if (g_lo == 0.0) return std::exp(lo);
    if (g_hi == 0.0) return std::exp(hi);
    return std::exp(bracketed_root(g, lo, hi, g_lo, g_hi, 0x1p-49));
}

}  // namespace tauforge::detail
