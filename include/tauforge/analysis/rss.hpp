#pragma once
/// Root-sum-square spread: each parameter's interval read as a distribution
/// (default: the half-width is 3 sigma, common practice), propagated to first
/// order through the sensitivities:
///
///     sigma_m = sqrt( sum_j (dm/dx_j sigma_j)^2 ),   sigma_j = (high_j - low_j) / (2 k)
///
/// An asymmetric interval (an electrolytic's -20/+80 %) is read as centred on
/// its midpoint, not on its nominal: the first-order mean moves by
/// sum_j dm/dx_j (mid_j - nominal_j), reported as `center`, and the band is
/// center +/- band_sigmas sigma.
///
///     auto s = tauforge::rss(one_shot);
///     double rel = s[0].relative_half_band;   // 0.1005 for 1 % R and 10 % C at 3 sigma

#include "tauforge/analysis/common.hpp"
#include "tauforge/analysis/sensitivity.hpp"
#include "tauforge/concepts.hpp"

#include <array>
#include <cmath>
#include <cstddef>

namespace tauforge {

/// How `rss` reads intervals and how wide a band it reports.
struct rss_options {
    spread_convention convention{};     ///< half-width = k sigma (default k = 3)
    double band_sigmas = 3.0;           ///< the reported band is center +/- band_sigmas sigma
    sensitivity_options sensitivity{};  ///< how derivatives are taken
};

/// One metric's RSS spread.
struct rss_metric {
    double nominal = 0.0;             ///< metric at the nominal point
    double center = 0.0;              ///< first-order mean: nominal shifted by asymmetric intervals
    double sigma = 0.0;               ///< first-order standard deviation (SI unit)
    double low = 0.0;                 ///< center - band_sigmas sigma
    double high = 0.0;                ///< center + band_sigmas sigma
    double relative_sigma = 0.0;      ///< sigma / |nominal|
    double relative_half_band = 0.0;  ///< band_sigmas sigma / |nominal|
};

/// RSS spread of every metric, with the sensitivities it used.
template <std::size_t P, std::size_t M>
struct rss_result {
    std::array<rss_metric, M> metrics{};       ///< per metric
    std::array<double, P> parameter_sigma{};   ///< sigma_j of each parameter (SI units)
    sensitivity_result<P, M> sensitivities{};  ///< derivatives at the nominal point
    /// The spread of metric m.
    const rss_metric& operator[](std::size_t m) const { return metrics[m]; }
};

/// Root-sum-square spread of every metric of a network.
template <TimingNetwork N>
rss_result<parameter_count_v<N>, metric_count_v<N>> rss(const N& n, const rss_options& opt = {}) {
    constexpr std::string_view fn = "rss";
    constexpr std::size_t P = parameter_count_v<N>, M = metric_count_v<N>;
    detail::check_convention(fn, opt.convention);
    if (!(std::isfinite(opt.band_sigmas) && opt.band_sigmas > 0.0))
        detail::analysis_fail(fn, "band_sigmas", detail::quoted_value(opt.band_sigmas), "a positive, finite width");
    const auto r = detail::checked_ranges(fn, n);
    rss_result<P, M> out{};
    out.sensitivities = sensitivity_at(n, detail::nominal_point(r), r, opt.sensitivity);
    const double k = opt.convention.sigmas_per_half_width;
    for (std::size_t j = 0; j < P; ++j) out.parameter_sigma[j] = (r[j].high - r[j].low) / (2.0 * k);
    for (std::size_t m = 0; m < M; ++m) {
        double var = 0.0, shift = 0.0;
        for (std::size_t j = 0; j < P; ++j) {
            const double d = out.sensitivities.derivative[m][j];
            const double c = d * out.parameter_sigma[j];
            var += c * c;
            shift += d * (0.5 * (r[j].low + r[j].high) - r[j].nominal);
        }
        rss_metric& s = out.metrics[m];
        s.nominal = out.sensitivities.value[m];
        s.center = s.nominal + shift;
        s.sigma = std::sqrt(var);
        s.low = s.center - opt.band_sigmas * s.sigma;
        s.high = s.center + opt.band_sigmas * s.sigma;
        s.relative_sigma = s.sigma / std::abs(s.nominal);
        s.relative_half_band = opt.band_sigmas * s.relative_sigma;
    }
    return out;
}

}  // namespace tauforge
