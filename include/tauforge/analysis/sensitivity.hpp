#pragma once
/// Sensitivities of every metric to every parameter at the nominal point:
/// the partial derivatives dm/dx (SI units) and the normalized sensitivities
/// S = d ln m / d ln x = (x / m) dm/dx (a 1 % change of x moves m by S %).
///
///     auto s = tauforge::sensitivity(one_shot);
///     double s_rc = s.normalized[0][0];   // metric 0 to parameter 0: 1 for t = R C ln 3
///
/// A network that knows its derivatives provides a member
/// `jacobian(x) -> std::array<std::array<double, P>, M>` (dm_i/dx_j); it is
/// detected and used. Otherwise central differences are taken with two steps,
/// h and h/2; their Richardson combination (4 D(h/2) - D(h)) / 3 is reported,
/// and the two estimates' disagreement, in units of normalized sensitivity, says
/// whether the estimate can be trusted (a kink or noise at the nominal shows up there).

#include "tauforge/analysis/common.hpp"
#include "tauforge/concepts.hpp"
#include "tauforge/detail/analysis_common.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>

namespace tauforge {

/// `HasJacobian<N>`: N provides its partial derivatives dm_i/dx_j at a point.
template <class N>
concept HasJacobian = TimingNetwork<N> && requires(const N& n, const std::array<double, N::parameters.size()>& x) {
    { n.jacobian(x) } -> std::same_as<std::array<std::array<double, N::parameters.size()>, N::metrics.size()>>;
};

/// How the derivatives were obtained.
enum class derivative_method { analytic, central_difference };

/// Step and acceptance of the numerical derivatives.
struct sensitivity_options {
    double relative_step = 1e-4;      ///< h = relative_step |x| (x = 0: relative_step times the interval width, or 1)
    double consistency_limit = 1e-6;  ///< largest accepted disagreement between steps h and h/2
    bool use_analytic = true;         ///< use the network's jacobian when it has one
};

/// Derivatives of every metric with respect to every parameter at one point.
template <std::size_t P, std::size_t M>
struct sensitivity_result {
    std::array<double, P> at{};                           ///< the point (SI units)
    std::array<double, M> value{};                        ///< the metrics there
    std::array<std::array<double, P>, M> derivative{};    ///< dm_i/dx_j in SI units
    std::array<std::array<double, P>, M> normalized{};    ///< d ln m_i / d ln x_j; NaN where m_i = 0
    std::array<std::array<double, P>, M> disagreement{};  ///< |S(h) - S(h/2)| in normalized units (0 if analytic)
    derivative_method method = derivative_method::central_difference;  ///< analytic or numerical
    bool consistent = true;                                            ///< every disagreement within consistency_limit
};

namespace detail {
inline void check_sensitivity_options(std::string_view fn, const sensitivity_options& o) {
    if (!(std::isfinite(o.relative_step) && o.relative_step > 0.0 && o.relative_step < 0.1))
        analysis_fail(fn, "relative_step", quoted_value(o.relative_step), "a step between 0 and 0.1 (relative)");
    if (!(o.consistency_limit >= 0.0))
        analysis_fail(fn, "consistency_limit", quoted_value(o.consistency_limit), "a non-negative limit");
}
}  // namespace detail

/// Derivatives at an arbitrary point x (SI units); `ranges` set the step for a
/// parameter whose value is 0.
template <TimingNetwork N>
sensitivity_result<parameter_count_v<N>, metric_count_v<N>> sensitivity_at(
    const N& n, const std::array<double, parameter_count_v<N>>& x,
    const std::array<interval, parameter_count_v<N>>& ranges, const sensitivity_options& opt = {}) {
    constexpr std::string_view fn = "sensitivity";
    constexpr std::size_t P = parameter_count_v<N>, M = metric_count_v<N>;
    detail::check_sensitivity_options(fn, opt);
    sensitivity_result<P, M> s{};
    s.at = x;
    s.value = n.evaluate(x);
    for (std::size_t m = 0; m < M; ++m) detail::check_metric<N>(fn, m, s.value[m]);
    // Scale of each parameter for steps and for the normalized disagreement.
    std::array<double, P> scale{};
    for (std::size_t j = 0; j < P; ++j) {
        const double width = ranges[j].high - ranges[j].low;
        scale[j] = x[j] != 0.0 ? std::abs(x[j]) : width > 0.0 ? width : 1.0;
    }
    bool analytic = false;
    if constexpr (HasJacobian<N>) {
        if (opt.use_analytic) {
            s.derivative = n.jacobian(x);
            s.method = derivative_method::analytic;
            analytic = true;
        }
    }
    if (!analytic) {
        s.method = derivative_method::central_difference;
        for (std::size_t j = 0; j < P; ++j) {
            auto central = [&](double h) {
                auto y = x;
                y[j] = x[j] + h;
                const auto up = n.evaluate(y);
                y[j] = x[j] - h;
                const auto down = n.evaluate(y);
                std::array<double, M> d{};
                // The step actually taken, after rounding x +/- h.
                const double span = (x[j] + h) - (x[j] - h);
                for (std::size_t m = 0; m < M; ++m) d[m] = (up[m] - down[m]) / span;
                return d;
            };
            const double h = opt.relative_step * scale[j];
            const auto d1 = central(h), d2 = central(h / 2.0);
            for (std::size_t m = 0; m < M; ++m) {
                detail::check_metric<N>(fn, m, d1[m]);
                detail::check_metric<N>(fn, m, d2[m]);
                s.derivative[m][j] = (4.0 * d2[m] - d1[m]) / 3.0;
                const double mag =
                    std::abs(s.value[m]) > 0.0 ? std::abs(s.value[m]) : std::max(std::abs(d2[m]) * scale[j], 1e-300);
                s.disagreement[m][j] = std::abs(d1[m] - d2[m]) * scale[j] / mag;
                if (!(s.disagreement[m][j] <= opt.consistency_limit)) s.consistent = false;
            }
        }
    }
    for (std::size_t m = 0; m < M; ++m)
        for (std::size_t j = 0; j < P; ++j)
            s.normalized[m][j] =
                s.value[m] != 0.0 ? s.derivative[m][j] * x[j] / s.value[m] : std::numeric_limits<double>::quiet_NaN();
    return s;
}

/// Derivatives at the nominal point of the network's (checked) ranges.
template <TimingNetwork N>
sensitivity_result<parameter_count_v<N>, metric_count_v<N>> sensitivity(const N& n,
                                                                        const sensitivity_options& opt = {}) {
    const auto r = detail::checked_ranges("sensitivity", n);
    return sensitivity_at(n, detail::nominal_point(r), r, opt);
}

}  // namespace tauforge
