#pragma once
// One-dimensional root finding in a bracket, for the solvers of rc.hpp, the
// networks and the analyses: Brent's method (R. P. Brent, Algorithms for
// Minimization without Derivatives, 1973, ch. 4, "zero"): inverse quadratic or
// secant steps while they shrink the bracket fast enough, bisection otherwise, so
// it converges superlinearly on smooth functions and never slower than bisection.
// Our own few lines instead of Boost.Math's TOMS 748, whose headers alone cost a
// sixth of the umbrella header's compile time.

#include <algorithm>
#include <cmath>
#include <limits>

namespace tauforge::detail {

/// Relative width to which `bracketed_root` narrows the bracket by default: 4 ulp.
inline constexpr double root_rel_tol = 4.0 * std::numeric_limits<double>::epsilon();

/// A root of f in [a, b], given fa = f(a) and fb = f(b) of opposite signs (or one of
/// them zero): the point where the bracket has shrunk to rel_tol |x| (or f is exactly
/// 0). At most `max_evaluations` further calls of f.
template <class F>
double bracketed_root(F&& f, double a, double b, double fa, double fb, double rel_tol = root_rel_tol,
                      int max_evaluations = 200) {
    if (fa == 0.0) return a;
    if (fb == 0.0) return b;
    double c = a, fc = fa, d = b - a, e = d;
    for (int n = 0; n < max_evaluations; ++n) {
        if ((fb > 0.0) == (fc > 0.0)) {  // keep the root between b and c
            c = a, fc = fa;
            d = e = b - a;
        }
        if (std::abs(fc) < std::abs(fb)) {  // b is the best estimate
            a = b, b = c, c = a;
            fa = fb, fb = fc, fc = fa;
        }
        const double tol = 0.5 * rel_tol * std::abs(b) + std::numeric_limits<double>::denorm_min();
        const double m = 0.5 * (c - b);
        if (std::abs(m) <= tol || fb == 0.0) return b;
        if (std::abs(e) >= tol && std::abs(fa) > std::abs(fb)) {
            const double s = fb / fa;
            double p, q;
            if (a == c) {  // secant
                p = 2.0 * m * s;
                q = 1.0 - s;
            } else {  // inverse quadratic interpolation
                const double qa = fa / fc, r = fb / fc;
                p = s * (2.0 * m * qa * (qa - r) - (b - a) * (r - 1.0));
                q = (qa - 1.0) * (r - 1.0) * (s - 1.0);
            }
            if (p > 0.0)
                q = -q;
            else
                p = -p;
            if (2.0 * p < std::min(3.0 * m * q - std::abs(tol * q), std::abs(e * q))) {
                e = d;
                d = p / q;
            } else {  // the step would not shrink the bracket enough: bisect
                d = m;
                e = m;
            }
        } else {
            d = m;
            e = m;
        }
        a = b, fa = fb;
        b += std::abs(d) > tol ? d : (m > 0.0 ? tol : -tol);
        fb = f(b);
    }
    return b;
}

}  // namespace tauforge::detail
