#pragma once
/// DC-bias derating of class 2 ceramic capacitors: the capacitance as a fraction
/// of its 0 V value against the DC voltage across the part, and the exact
/// effective capacitance of an RC crossing over a swing.
///
/// A class 2 dielectric (X5R, X7R, Y5V ...) loses capacitance as the DC voltage
/// across it rises (common practice). Give the curve from the part's datasheet
/// as points, or take `dc_bias_curve::class2_estimate`, a rough generic envelope
/// by rated voltage and case size marked as an estimate:
///
///     using namespace tauforge::literals;
///     tauforge::dc_bias_curve curve{.volts = {0.0, 5.0, 10.0, 16.0}, .retained = {1.0, 0.8, 0.6, 0.45}};
///     double k = curve.crossing_factor(0.0, 5.0, 5.0 * 2 / 3);   // C_eff / C(0 V) for a 0 -> 2/3 charge
///
/// The effective capacitance of a crossing is not the charge-weighted mean
/// Q / dV (that one is exact only for a constant charging current): for an RC
/// charge, C(v) dv/dt = (v_final - v) / R, so each volt of the swing is weighted
/// by the time spent on it, 1 / (v_final - v). `crossing_factor` is that mean,
/// exact for the piecewise-linear curve (rc.hpp's crossing_per_tau_varying);
/// `charge_factor` is Q / dV, for constant-current charging.

#include "tauforge/detail/validate.hpp"
#include "tauforge/error.hpp"
#include "tauforge/rc.hpp"
#include "tauforge/units.hpp"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <initializer_list>
#include <string>
#include <string_view>
#include <vector>

namespace tauforge {

/// Case sizes (EIA inch codes) for the generic class 2 DC-bias estimate.
enum class ceramic_case { c0402, c0603, c0805, c1206, c1210 };

/// A capacitance-versus-DC-voltage curve: `retained[i]` is the capacitance at
/// `volts[i]` (magnitude across the part) as a fraction of its 0 V value;
/// linear between points. Valid: at least two points, volts strictly increasing
/// from exactly 0, retained[0] = 1, retained non-increasing and positive.
struct dc_bias_curve {
    std::vector<double> volts;     ///< V, strictly increasing, volts[0] = 0
    std::vector<double> retained;  ///< fraction of the 0 V capacitance, retained[0] = 1, non-increasing, > 0
    bool estimate = false;         ///< a generic envelope, not the part's own curve
    /// Memberwise equality.
    friend bool operator==(const dc_bias_curve&, const dc_bias_curve&) = default;

    /// A rough generic envelope for a class 2 ceramic of the given rated voltage and
    /// case size (common practice, an estimate; replace it with the datasheet's
    /// curve): k(v) = 1 - (1 - k_rated) sqrt(v / V_rated), sampled at 0, 1/16, 1/4,
    /// 9/16 and 1 of the rated voltage, with k_rated, the fraction kept at the rated
    /// voltage, 0.25 (0402), 0.30 (0603), 0.40 (0805), 0.50 (1206), 0.55 (1210).
    /// Smaller cases and higher capacitance per volume lose more; the square root
    /// makes the loss steep at low voltage, as on typical curves.
    static dc_bias_curve class2_estimate(voltage rated, ceramic_case size) {
        detail::require_positive("dc_bias_curve::class2_estimate", "rated", rated, "a positive, finite rated voltage");
        constexpr double kept[] = {0.25, 0.30, 0.40, 0.50, 0.55};
        const double k_rated = kept[static_cast<std::size_t>(size)], vr = rated.value();
        dc_bias_curve c{.volts = {}, .retained = {}, .estimate = true};
        for (double s : {0.0, 0.25, 0.5, 0.75, 1.0}) {
            c.volts.push_back(vr * s * s);
            c.retained.push_back(1.0 - (1.0 - k_rated) * s);
        }
        return c;
    }

    /// The highest voltage the curve describes.
    voltage covers() const { return voltage::from_value(volts.empty() ? 0.0 : volts.back()); }

    /// Throws `invalid_argument` naming `owner` ("capacitor::range: dc_bias...") unless
    /// the curve is valid and, when `rated` is positive, ends at or below it.
    void validate(std::string_view owner, voltage rated = voltage::from_value(0.0)) const {
        // Builds no text unless something is wrong: ranges() call this once per design.
        auto fail = [&](const std::string& member, const std::string& value, const std::string& expected) {
            throw invalid_argument(std::string(owner) + ": dc_bias." + member + " = " + value +
                                   " is invalid; expected " + expected);
        };
        const std::size_t n = volts.size();
        if (n < 2 || n != retained.size())
            fail("volts", std::to_string(n) + " points with " + std::to_string(retained.size()) + " retained fractions",
                 "at least two points, one retained fraction for each");
        for (std::size_t i = 0; i < n; ++i) {
            const bool volts_ok = std::isfinite(volts[i]) && (i == 0 ? volts[i] == 0.0 : volts[i] > volts[i - 1]);
            const bool kept_ok = std::isfinite(retained[i]) && retained[i] > 0.0 &&
                                 (i == 0 ? retained[i] == 1.0 : retained[i] <= retained[i - 1]);
            if (volts_ok && kept_ok) continue;
            const std::string at = "[" + std::to_string(i) + "]", before = "[" + std::to_string(i - 1) + "]";
            if (!volts_ok)
                fail("volts" + at, detail::value_text(voltage::from_value(volts[i])),
                     i == 0 ? std::string("0 V: the curve starts at no bias")
                            : "a voltage above dc_bias.volts" + before + " = " +
                                  detail::value_text(voltage::from_value(volts[i - 1])));
            fail("retained" + at, detail::quoted_value(retained[i]),
                 i == 0 ? std::string("1: fractions are of the 0 V capacitance")
                        : "a positive fraction at most dc_bias.retained" + before + " = " +
                              detail::quoted_value(retained[i - 1]) + " (capacitance does not rise with bias)");
        }
        if (rated.value() > 0.0 && volts.back() > rated.value())
            fail("volts[" + std::to_string(n - 1) + "]", detail::value_text(covers()),
                 "a voltage within the rated voltage " + detail::value_text(rated));
    }

    /// `domain_error` naming `fn` unless every |v| of `vs` lies within the curve.
    void require_within(std::string_view fn, std::initializer_list<double> vs) const {
        for (double v : vs)
            if (!(std::abs(v) <= covers().value()))
                throw domain_error(std::string(fn) + ": v = " + detail::value_text(voltage::from_value(v)) +
                                   " is invalid; expected a voltage within the DC-bias curve, up to " +
                                   detail::value_text(covers()) + " either way");
    }

    /// The retained fraction at DC voltage v (either polarity); |v| within the curve
    /// (unchecked here: beyond the last point the last piece is extended).
    double at(double v) const {
        const double u = std::abs(v);
        std::size_t i = 1;
        while (i + 1 < volts.size() && volts[i] < u) ++i;
        const double f = (u - volts[i - 1]) / (volts[i] - volts[i - 1]);
        return retained[i - 1] + f * (retained[i] - retained[i - 1]);
    }

    /// The point nearest p strictly between p and q where at(v)'s slope changes
    /// (0 or +/- an inner point of the curve), or q when there is none.
    double next_break(double p, double q) const {
        const double dir = q > p ? 1.0 : -1.0;
        double best = q;
        auto consider = [&](double b) {
            if ((b - p) * dir > 0.0 && (best - b) * dir > 0.0) best = b;
        };
        consider(0.0);
        for (std::size_t i = 1; i + 1 < volts.size(); ++i) {
            consider(volts[i]);
            consider(-volts[i]);
        }
        return best;
    }

    /// t / (R C(0 V)) for an RC crossing from v_start to v_threshold towards v_final
    /// (rc.hpp's crossing_per_tau_varying over this curve); `domain_error` for a start or
    /// threshold beyond the curve.
    double crossing_per_tau(double v_start, double v_final, double v_threshold) const {
        require_within("dc_bias_curve::crossing_per_tau", {v_start, v_threshold});
        return detail::rc::crossing_per_tau_varying(
            v_start, v_final, v_threshold, [this](double p, double q) { return next_break(p, q); },
            [this](double v) { return at(v); });
    }

    /// The crossing time for a ramp input (rc.hpp's ramp_crossing_time) into C(0 V) k(v),
    /// tau = R C(0 V): rc.hpp's ramp_crossing_time_varying over this curve.
    double ramp_crossing_time(double v_begin, double v_end, double rise, double v_start, double v_threshold,
                              double tau) const {
        require_within("dc_bias_curve::ramp_crossing_time", {v_begin, v_start, v_threshold});
        return detail::rc::ramp_crossing_time_varying(
            v_begin, v_end, rise, v_start, v_threshold, tau, [this](double p, double q) { return next_break(p, q); },
            [this](double v) { return at(v); });
    }

    /// C_eff / C(0 V) for an RC crossing from v_start to v_threshold towards v_final:
    /// the exact time-weighted mean of the curve over the swing (see the header
    /// comment); at(v_start) for a threshold at the start.
    double crossing_factor(double v_start, double v_final, double v_threshold) const {
        const double plain = detail::rc::crossing_time(v_start, v_final, v_threshold, 1.0);
        return plain > 0.0 ? crossing_per_tau(v_start, v_final, v_threshold) / plain : at(v_start);
    }

    /// Q / dV over [v1, v2] divided by C(0 V): the plain mean of the curve, exact for a
    /// constant charging current (the trapezoid rule is exact on each linear piece).
    double charge_factor(double v1, double v2) const {
        require_within("dc_bias_curve::charge_factor", {v1, v2});
        if (v1 == v2) return at(v1);
        const double lo = std::min(v1, v2), hi = std::max(v1, v2);
        double area = 0.0, p = lo;
        while (p < hi) {
            const double q = next_break(p, hi);
            area += 0.5 * (at(p) + at(q)) * (q - p);
            p = q;
        }
        return area / (hi - lo);
    }
};

}  // namespace tauforge
