#pragma once
/// Production test limits and lab read-back.
///
/// Guard band (the rule): a tester measuring with standard uncertainty u and
/// coverage factor k (expanded uncertainty U = k u, k = 2 by default) accepts a
/// unit when its measured value lies in the window shrunk by U on each side
/// that is set: [low + U, high - U]. An accepted unit then meets the window
/// with roughly the one-sided coverage of k (97.7 % for k = 2) even at the
/// acceptance edge. The window to guard is the specification, or the design's
/// own spread (worst-case bounds, or Monte Carlo percentiles) when the tester
/// screens for assembly faults.
///
/// The price is false rejects: good units (true value inside the window)
/// whose measurement, true value plus a normal error of standard deviation u,
/// falls outside the acceptance window. `screening` computes its expected rate
/// from a Monte Carlo distribution of true values: for each sample x the
/// rejection probability Phi((A_lo - x)/u) + Phi((x - A_hi)/u) is averaged
/// exactly, so no second random draw is needed.
///
/// Read-back: from a measured metric and the other parts' intervals, the value
/// of one part (the capacitor of an RC delay): solve metric(x) = measured for
/// that parameter (bracketed, Brent's method), then again at every corner of the other
/// free parameters and at measured +/- U, which bounds the part's value when
/// the solution is monotone in each of them (true for RC delays).

#include "tauforge/analysis/common.hpp"
#include "tauforge/analysis/monte_carlo.hpp"
#include "tauforge/analysis/worst_case.hpp"
#include "tauforge/concepts.hpp"
#include "tauforge/detail/analysis_common.hpp"

#include "tauforge/detail/root_find.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <span>
#include <string>
#include <utility>

namespace tauforge {

/// A measurement's uncertainty: standard uncertainty u and coverage factor k.
struct measurement_uncertainty {
    double standard = 0.0;  ///< u, in the metric's SI unit
    double coverage = 2.0;  ///< k
    /// U = k u.
    constexpr double expanded() const { return coverage * standard; }
};

namespace detail {
inline void check_uncertainty(std::string_view fn, const measurement_uncertainty& u, std::string_view unit = "") {
    if (!(std::isfinite(u.standard) && u.standard >= 0.0))
        analysis_fail(fn, "u.standard", info_value_text(u.standard, unit),
                      "a non-negative, finite standard uncertainty");
    if (!(std::isfinite(u.coverage) && u.coverage > 0.0))
        analysis_fail(fn, "u.coverage", quoted_value(u.coverage), "a positive, finite coverage factor");
}
}  // namespace detail

/// The window a tester accepts: each set side moved inwards by U = k u.
/// Throws domain_error when the guard bands meet (2U at least the window's width).
inline spec_window guard_banded(const spec_window& window, const measurement_uncertainty& u) {
    constexpr std::string_view fn = "guard_banded";
    detail::check_window(fn, "window", "", window);
    detail::check_uncertainty(fn, u);
    const double g = u.expanded();
    spec_window a = window;
    if (a.low) *a.low += g;
    if (a.high) *a.high -= g;
    if (a.low && a.high && !(*a.low < *a.high))
        detail::analysis_fail_domain(fn, "U", detail::quoted_value(g),
                                     "less than half the window's width " +
                                         detail::quoted_value(*window.high - *window.low) +
                                         "; the measurement is too uncertain for this window");
    return a;
}

/// The design's worst-case spread of a metric as a window.
inline spec_window window_from(const bounds& b) { return spec_window::between(b.low, b.high); }
/// The worst-case extremes of a metric as a window.
template <std::size_t P>
spec_window window_from(const metric_extremes<P>& e) {
    return spec_window::between(e.min.value, e.max.value);
}
/// The [p_low, p_high] percentile range of a Monte Carlo distribution (run with keep_distribution).
template <std::size_t P>
spec_window window_from_percentiles(const metric_statistics<P>& s, double p_low, double p_high) {
    constexpr std::string_view fn = "window_from_percentiles";
    if (s.distribution.empty())
        detail::analysis_fail(fn, "distribution", "empty", "a Monte Carlo result run with keep_distribution = true");
    if (!(p_low >= 0.0 && p_low <= 1.0))
        detail::analysis_fail(fn, "p_low", detail::quoted_value(p_low), "a probability from 0 to 1");
    if (!(p_high >= p_low && p_high <= 1.0))
        detail::analysis_fail(fn, "p_high", detail::quoted_value(p_high), "a probability from p_low to 1");
    return spec_window::between(detail::sorted_percentile(s.distribution, p_low),
                                detail::sorted_percentile(s.distribution, p_high));
}

/// Expected outcome of screening a population with a guard-banded window.
struct screening_rates {
    std::size_t samples = 0;         ///< population size (Monte Carlo samples)
    double good_fraction = 0.0;      ///< true value inside the window
    double reject_fraction = 0.0;    ///< expected fraction measured outside the acceptance window
    double false_reject_rate = 0.0;  ///< P(rejected | good)
    double false_accept_rate = 0.0;  ///< P(accepted | not good); 0 when every unit is good
};

/// Screening rates for true values `values` (any order), judged good against
/// `window`, accepted when the measurement (value + N(0, u^2)) lies in `acceptance`.
inline screening_rates screening(std::span<const double> values, const spec_window& window,
                                 const spec_window& acceptance, double u_standard) {
    constexpr std::string_view fn = "screening";
    if (values.empty()) detail::analysis_fail(fn, "values", "empty", "at least one true value");
    detail::check_window(fn, "window", "", window);
    detail::check_window(fn, "acceptance", "", acceptance);
    detail::check_uncertainty(fn, {u_standard, 1.0});
    auto phi = [](double z) { return 0.5 * std::erfc(-z / std::sqrt(2.0)); };  // standard normal CDF
    double good = 0.0, bad = 0.0, rej_good = 0.0, acc_bad = 0.0, rej = 0.0;
    for (const double x : values) {
        double p_rej;
        if (u_standard == 0.0) {
            p_rej = acceptance.contains(x) ? 0.0 : 1.0;
        } else {
            p_rej = 0.0;
            // Beyond 10 sigma Phi is below 1e-23: skip the erfc.
            if (acceptance.low) {
                const double z = (*acceptance.low - x) / u_standard;
                if (z > -10.0) p_rej += phi(z);
            }
            if (acceptance.high) {
                const double z = (x - *acceptance.high) / u_standard;
                if (z > -10.0) p_rej += phi(z);
            }
            p_rej = std::min(p_rej, 1.0);
        }
        rej += p_rej;
        if (window.contains(x)) {
            good += 1.0;
            rej_good += p_rej;
        } else {
            bad += 1.0;
            acc_bad += 1.0 - p_rej;
        }
    }
    const double n = static_cast<double>(values.size());
    return {values.size(), good / n, rej / n, good > 0.0 ? rej_good / good : 0.0, bad > 0.0 ? acc_bad / bad : 0.0};
}

/// Screening rates from a Monte Carlo metric (run with keep_distribution).
template <std::size_t P>
screening_rates screening(const metric_statistics<P>& s, const spec_window& window, const spec_window& acceptance,
                          double u_standard) {
    if (s.distribution.empty())
        detail::analysis_fail("screening", "distribution", "empty",
                              "a Monte Carlo result run with keep_distribution = true");
    return screening(std::span<const double>(s.distribution), window, acceptance, u_standard);
}

/// A production test for one metric: the window, the tester's acceptance window and its expected cost.
struct production_test {
    spec_window window;      ///< what a good unit meets
    spec_window acceptance;  ///< what the tester accepts: window shrunk by `guard` per side
    double guard = 0.0;      ///< U = k u
    screening_rates rates;   ///< expected outcome over the Monte Carlo population
};

/// The guard-banded acceptance window for `window` and the expected screening
/// rates over a Monte Carlo distribution (run with keep_distribution).
template <std::size_t P>
production_test production_test_limits(const metric_statistics<P>& s, const spec_window& window,
                                       const measurement_uncertainty& u) {
    const spec_window a = guard_banded(window, u);
    return {window, a, u.expanded(), screening(s, window, a, u.standard)};
}

namespace detail {

/// The value of parameter p at which metric m of n equals target, others at x.
/// The bracket starts at the parameter's interval and grows (halving and doubling
/// a positive parameter, else doubling the width) until the sign changes; a side
/// stops growing where the network rejects the value with a tauforge error.
template <TimingNetwork N>
double analysis_solve_for(std::string_view fn, const N& n, std::array<double, parameter_count_v<N>> x, std::size_t p,
                          std::size_t m, double target, const interval& start) {
    auto g = [&](double v) {
        x[p] = v;
        return n.evaluate(x)[m] - target;
    };
    double a = start.low, b = start.high;
    if (a == b) {
        if (a > 0.0)
            a *= 0.999, b *= 1.001;
        else
            a -= 1e-3, b += 1e-3;
    }
    const bool positive = a > 0.0;
    double ga = g(a), gb = g(b);
    bool a_open = true, b_open = true;
    auto widen = [&](double& end, double& g_end, bool& open, bool lower) {
        if (!open) return;
        const double w = b - a;
        const double next = positive ? (lower ? end / 2.0 : end * 2.0) : (lower ? end - w : end + w);
        try {
            const double gn = g(next);
            if (!std::isfinite(gn)) {
                open = false;
                return;
            }
            end = next, g_end = gn;
        } catch (const tauforge::domain_error&) {
            open = false;
        } catch (const tauforge::invalid_argument&) {
            open = false;
        }
    };
    for (int i = 0; i < 64 && ga * gb > 0.0 && (a_open || b_open); ++i) {
        widen(a, ga, a_open, true);
        if (ga * gb <= 0.0) break;
        widen(b, gb, b_open, false);
    }
    if (ga == 0.0) return a;
    if (gb == 0.0) return b;
    if (!(ga * gb < 0.0))
        analysis_fail_domain(fn, "measured", info_value_text(target, N::metrics[m].unit),
                             "a value that " + std::string(N::metrics[m].name) + " reaches for " +
                                 std::string(N::parameters[p].name) + " between " +
                                 info_value_text(a, N::parameters[p].unit) + " and " +
                                 info_value_text(b, N::parameters[p].unit) + " (the searched range)");
    return bracketed_root(g, a, b, ga, gb, 0x1p-49);
}

}  // namespace detail

/// The largest number of other free parameters `estimate_parameter` takes corners of.
inline constexpr std::size_t readback_parameter_limit = 16;

/// Read-back: the value of parameter `p` for which metric `m` equals `measured`
/// (others at nominal, as `nominal`), and the interval of values consistent
/// with the other parameters' intervals and measured +/- U (as low, high).
template <TimingNetwork N>
interval estimate_parameter(const N& n, std::size_t p, std::size_t m, double measured,
                            const measurement_uncertainty& u) {
    constexpr std::string_view fn = "estimate_parameter";
    constexpr std::size_t P = parameter_count_v<N>, M = metric_count_v<N>;
    if (p >= P) detail::analysis_fail_index(fn, "parameter", p, P);
    if (m >= M) detail::analysis_fail_index(fn, "metric", m, M);
    if (!std::isfinite(measured))
        detail::analysis_fail(fn, "measured", detail::info_value_text(measured, N::metrics[m].unit), "a finite value");
    detail::check_uncertainty(fn, u, N::metrics[m].unit);
    const auto r = detail::checked_ranges(fn, n);
    auto others = r;
    others[p] = interval::exactly(r[p].nominal);
    const auto fs = detail::free_parameters(others);
    detail::check_corner_count(fn, fs.count, readback_parameter_limit);
    const double U = u.expanded();
    interval out{detail::analysis_solve_for(fn, n, detail::nominal_point(r), p, m, measured, r[p]),
                 std::numeric_limits<double>::infinity(), -std::numeric_limits<double>::infinity()};
    auto x = detail::nominal_point(r);
    detail::for_each_corner(others, fs, x, [&](std::uint32_t) {
        for (const double t : {measured - U, measured + U}) {
            const double v = detail::analysis_solve_for(fn, n, x, p, m, t, r[p]);
            out.low = std::min(out.low, v);
            out.high = std::max(out.high, v);
        }
    });
    out.low = std::min(out.low, out.nominal);
    out.high = std::max(out.high, out.nominal);
    return out;
}

/// Read-back with the measurement as a quantity: estimate_parameter(n, 1, 0, 1.2_ms, u).
template <TimingNetwork N, class Unit>
interval estimate_parameter(const N& n, std::size_t p, std::size_t m, si_quantity<Unit> measured,
                            const measurement_uncertainty& u) {
    return estimate_parameter(n, p, m, measured.value(), u);
}

}  // namespace tauforge
