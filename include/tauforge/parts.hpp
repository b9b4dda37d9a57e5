#pragma once
/// Uncertain parts and operating conditions: each part becomes ONE uncertain
/// parameter of a network, its `interval` at the operating conditions.
///
/// A part folds its purchase tolerance, its temperature behaviour (a TCR band
/// in ppm/K, or a class 2 dielectric envelope) and its ageing drift into one
/// interval:
///
///     using namespace tauforge::literals;
///     tauforge::operating_conditions env{.t_min = tauforge::celsius{-40.0}, .t_max = 85_degC};
///     tauforge::capacitor c{.nominal = 100_nF, .tol = tauforge::tolerance::symmetric(0.10),
///                           .tempco = tauforge::x7r};
///     tauforge::interval farads = c.range(env);   // 100 nF x [0.9 x 0.85, 1.1 x 1.15]
///
/// Temperature is folded into each part independently: every part takes its own
/// worst temperature. When several parts drift with temperature, a network's
/// corners then include combinations no single temperature produces (part A at
/// its -40 °C extreme and part B at its +85 °C extreme), so the result is a
/// conservative bound; when one part drifts, it is exact.
///
/// Supplies, thresholds and delays are `ranged<Q>` values: a supply
/// `ranged<voltage>::around(5_V, tolerance::symmetric(0.1))`, a threshold as a
/// ratio of the supply `ranged<double>::plus_minus(2.0 / 3, 0.02)` or absolute
/// `ranged<voltage>::between(1.3_V, 1.7_V)`, a propagation delay
/// `ranged<duration>::between(50_ns, 200_ns)`, a saturation voltage
/// `ranged<voltage>::between(0_V, 0.4_V)`.

#include "tauforge/concepts.hpp"
#include "tauforge/dc_bias.hpp"
#include "tauforge/detail/validate.hpp"
#include "tauforge/error.hpp"
#include "tauforge/findings.hpp"
#include "tauforge/notation.hpp"
#include "tauforge/units.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <optional>
#include <string>
#include <string_view>
#include <type_traits>
#include <variant>

namespace tauforge {

/// The temperature range a design must work over, and the reference
/// temperature at which marked values and TCR bands apply (usually 25 °C).
/// Validated where it is used: finite, t_min <= t_max.
struct operating_conditions {
    celsius t_min{25.0};  ///< lowest ambient
    celsius t_max{25.0};  ///< highest ambient
    celsius t_ref{25.0};  ///< where the marked value holds and TCR is measured from
    double service_hours = 0.0;  ///< how long the design must hold in service; parts age over it (0: new parts)
};

/// A temperature coefficient band: the actual coefficient of a part lies
/// somewhere in [low, high] ppm/K. A class 1 dielectric (C0G) or a resistor
/// TCR. An optional rated temperature range (infinite by default) is checked
/// against the operating conditions.
struct ppm_band {
    double low = 0.0;                                             ///< ppm/K
    double high = 0.0;                                            ///< ppm/K
    celsius rated_min{-std::numeric_limits<double>::infinity()};  ///< lowest rated temperature
    celsius rated_max{std::numeric_limits<double>::infinity()};   ///< highest rated temperature
    std::string_view name{};                                      ///< "C0G", for messages; empty for a plain TCR band

    /// 0 +/- ppm_per_k: ppm_band::symmetric(100) is a +/-100 ppm/K thick-film TCR.
    static constexpr ppm_band symmetric(double ppm_per_k) { return {-ppm_per_k, ppm_per_k}; }
    /// Memberwise equality.
    friend constexpr bool operator==(const ppm_band&, const ppm_band&) = default;
};

/// C0G (NP0) class 1 dielectric: 0 +/- 30 ppm/K over -55 °C to +125 °C
/// (EIA-198 class 1 (from memory)).
inline constexpr ppm_band c0g{-30.0, 30.0, celsius{-55.0}, celsius{125.0}, "C0G"};

/// A class 2 dielectric: the capacitance stays within [-minus, +plus] of its
/// 25 °C value anywhere in [rated_min, rated_max]. Only the envelope is known,
/// not the curve, so the whole envelope applies at any operating range other
/// than exactly 25 °C. Code letters: EIA-198 (from memory).
struct dielectric_class {
    std::string_view name;  ///< "X7R"
    celsius rated_min;      ///< first letter: X -55 °C, Y -30 °C, Z +10 °C
    celsius rated_max;      ///< digit: 5 +85 °C, 6 +105 °C, 7 +125 °C, 8 +150 °C
    double minus = 0.0;     ///< largest fall below the 25 °C value (0.15 for R)
    double plus = 0.0;      ///< largest rise above the 25 °C value
    /// Memberwise equality.
    friend constexpr bool operator==(const dielectric_class&, const dielectric_class&) = default;
};

/// The temperature at which class 2 envelopes are referenced (EIA-198 (from memory)).
inline constexpr celsius dielectric_reference{25.0};

/// X5R: +/-15 % over -55 °C to +85 °C.
inline constexpr dielectric_class x5r{"X5R", celsius{-55.0}, celsius{85.0}, 0.15, 0.15};
/// X6S: +/-22 % over -55 °C to +105 °C.
inline constexpr dielectric_class x6s{"X6S", celsius{-55.0}, celsius{105.0}, 0.22, 0.22};
/// X7R: +/-15 % over -55 °C to +125 °C.
inline constexpr dielectric_class x7r{"X7R", celsius{-55.0}, celsius{125.0}, 0.15, 0.15};
/// X7S: +/-22 % over -55 °C to +125 °C.
inline constexpr dielectric_class x7s{"X7S", celsius{-55.0}, celsius{125.0}, 0.22, 0.22};
/// X7T: +22/-33 % over -55 °C to +125 °C.
inline constexpr dielectric_class x7t{"X7T", celsius{-55.0}, celsius{125.0}, 0.33, 0.22};
/// X8R: +/-15 % over -55 °C to +150 °C.
inline constexpr dielectric_class x8r{"X8R", celsius{-55.0}, celsius{150.0}, 0.15, 0.15};
/// Y5V: +22/-82 % over -30 °C to +85 °C.
inline constexpr dielectric_class y5v{"Y5V", celsius{-30.0}, celsius{85.0}, 0.82, 0.22};
/// Z5U: +22/-56 % over +10 °C to +85 °C.
inline constexpr dielectric_class z5u{"Z5U", celsius{10.0}, celsius{85.0}, 0.56, 0.22};

namespace detail {

[[noreturn]] inline void parts_fail(std::string_view function, std::string_view parameter, const std::string& value,
                                    std::string_view expected) {
    throw invalid_argument(std::string(function) + ": " + std::string(parameter) + " = " + value +
                           " is invalid; expected " + std::string(expected));
}

[[noreturn]] inline void parts_fail_domain(std::string_view function, std::string_view parameter,
                                           const std::string& value, const std::string& expected) {
    throw domain_error(std::string(function) + ": " + std::string(parameter) + " = " + value +
                       " is invalid; expected " + expected);
}

inline std::string ppm_text(double v) { return quoted_value(v) + " ppm/K"; }

inline void check_conditions(std::string_view fn, const operating_conditions& c) {
    const auto finite = [&](std::string_view p, celsius t) {
        if (!std::isfinite(t.value)) parts_fail(fn, p, format(t, {.digits = 6}), "a finite temperature");
    };
    finite("t_min", c.t_min);
    finite("t_max", c.t_max);
    finite("t_ref", c.t_ref);
    if (c.t_min > c.t_max)
        parts_fail(fn, "t_min", format(c.t_min, {.digits = 6}), "at most t_max = " + format(c.t_max, {.digits = 6}));
    if (!(std::isfinite(c.service_hours) && c.service_hours >= 0.0))
        parts_fail(fn, "service_hours", quoted_value(c.service_hours) + " h", "a non-negative, finite number of hours");
}

/// A fraction in [0, 1): a loss, a drift, the lower side of a band. `expected` ends
/// the message; the default names the range.
inline void check_fraction_below_one(std::string_view fn, std::string_view parameter, double v,
                                     std::string_view expected = "a fraction from 0 up to, not including, 100 %") {
    if (!(std::isfinite(v) && v >= 0.0 && v < 1.0)) parts_fail(fn, parameter, format_percent(v, 6), expected);
}

/// Positive and finite, in hours.
inline void check_hours(std::string_view fn, std::string_view parameter, double hours) {
    if (!(std::isfinite(hours) && hours > 0.0))
        parts_fail(fn, parameter, quoted_value(hours) + " h", "a positive, finite number of hours");
}

inline void check_tolerance(std::string_view fn, const tolerance& t) {
    check_fraction_below_one(fn, "tol.minus", t.minus);
    if (!(std::isfinite(t.plus) && t.plus >= 0.0))
        parts_fail(fn, "tol.plus", format_percent(t.plus, 6), "a finite, non-negative fraction");
}

inline void check_aging(std::string_view fn, double aging) {
    check_fraction_below_one(fn, "aging", aging, "a drift magnitude from 0 up to, not including, 100 %");
}

inline void check_rated(std::string_view fn, std::string_view what, celsius rated_min, celsius rated_max,
                        const operating_conditions& c) {
    if (!(c.t_min < rated_min) && !(c.t_max > rated_max)) return;  // the hot path builds no message
    const std::string rated = "a temperature within the rated range of " + std::string(what) + ", " +
                              format(rated_min, {.digits = 6}) + " to " + format(rated_max, {.digits = 6});
    if (c.t_min < rated_min) parts_fail_domain(fn, "t_min", format(c.t_min, {.digits = 6}), rated);
    parts_fail_domain(fn, "t_max", format(c.t_max, {.digits = 6}), rated);
}

/// Relative factors for the temperature part of a range.
struct factor_span {
    double nominal = 1.0, low = 1.0, high = 1.0;
    /// Both factors positive, so the extremes of the product are the products of the extremes.
    friend factor_span operator*(const factor_span& a, const factor_span& b) {
        return {a.nominal * b.nominal, a.low * b.low, a.high * b.high};
    }
};

/// The factor 1 + a (T - t_ref) over a in [low, high] ppm/K and T in [t_min, t_max].
/// a d is bilinear in (a, d), d = T - t_ref in [d_min, d_max], so its extremes over
/// the box lie at its four corners (a bilinear function has no interior extremum
/// on a box: along each edge it is linear). The nominal is the band's mid
/// coefficient at the operating temperature nearest t_ref.
inline factor_span tcr_factor(std::string_view fn, std::string_view member, const ppm_band& b,
                              const operating_conditions& c) {
    const std::string m(member);
    if (!std::isfinite(b.low)) parts_fail(fn, m + ".low", ppm_text(b.low), "a finite coefficient");
    if (!std::isfinite(b.high)) parts_fail(fn, m + ".high", ppm_text(b.high), "a finite coefficient");
    if (b.low > b.high) parts_fail(fn, m + ".low", ppm_text(b.low), "at most " + m + ".high = " + ppm_text(b.high));
    if (std::isnan(b.rated_min.value) || std::isnan(b.rated_max.value) || b.rated_min > b.rated_max)
        parts_fail(fn, m + ".rated_min", format(b.rated_min, {.digits = 6}),
                   "at most " + m + ".rated_max = " + format(b.rated_max, {.digits = 6}));
    check_rated(fn, b.name.empty() ? std::string("the TCR band") : std::string(b.name), b.rated_min, b.rated_max, c);
    const double d_min = kelvin_between(c.t_ref, c.t_min), d_max = kelvin_between(c.t_ref, c.t_max);
    const double lo = b.low * 1e-6, hi = b.high * 1e-6;
    const double p[4] = {lo * d_min, lo * d_max, hi * d_min, hi * d_max};
    const double d_nom = std::clamp(0.0, d_min, d_max);
    factor_span f{1.0 + 0.5 * (lo + hi) * d_nom, 1.0 + *std::min_element(p, p + 4), 1.0 + *std::max_element(p, p + 4)};
    if (!(f.low > 0.0))
        parts_fail_domain(fn, m + ".low", ppm_text(b.low),
                          "a coefficient that keeps the value positive over " + format(c.t_min, {.digits = 6}) +
                              " to " + format(c.t_max, {.digits = 6}));
    return f;
}

inline factor_span class_factor(std::string_view fn, const dielectric_class& d, const operating_conditions& c) {
    check_fraction_below_one(fn, "tempco.minus", d.minus);
    if (!(std::isfinite(d.plus) && d.plus >= 0.0))
        parts_fail(fn, "tempco.plus", format_percent(d.plus, 6), "a finite, non-negative fraction");
    check_rated(fn, std::string(d.name), d.rated_min, d.rated_max, c);
    if (c.t_min == dielectric_reference && c.t_max == dielectric_reference) return {};
    return {1.0, 1.0 - d.minus, 1.0 + d.plus};
}

/// nominal x tolerance x temperature x ageing, each factor positive, so the
/// extremes of the product are the products of the extremes.
inline interval fold(double nominal, const tolerance& t, const factor_span& temp, double aging) {
    return {nominal * temp.nominal, nominal * (1.0 - t.minus) * temp.low * (1.0 - aging),
            nominal * (1.0 + t.plus) * temp.high * (1.0 + aging)};
}

template <class Q>
constexpr double ranged_si(Q q) {
    if constexpr (std::is_arithmetic_v<Q>)
        return static_cast<double>(q);
    else
        return q.value();
}

template <class Q>
std::string ranged_text(Q q) {
    if constexpr (std::is_arithmetic_v<Q>)
        return quoted_value(static_cast<double>(q));
    else
        return value_text(q);
}

}  // namespace detail

/// A value known to lie in [low, high], with a nominal: a supply, a threshold
/// (absolute, or as a ratio of the supply with Q = double), a propagation
/// delay, a saturation voltage. Q is a base-SI quantity or double.
template <class Q>
struct ranged {
    Q nominal{};
    Q low{};
    Q high{};

    /// A value without spread.
    static constexpr ranged exactly(Q v) { return {v, v, v}; }
    /// Anywhere in [lo, hi]; the nominal is the midpoint.
    static constexpr ranged between(Q lo, Q hi) { return {lo + (hi - lo) / 2.0, lo, hi}; }
    /// nominal +/- delta (absolute): a threshold ratio 2/3 +/- 0.02.
    static constexpr ranged plus_minus(Q nominal, Q delta) { return {nominal, nominal - delta, nominal + delta}; }
    /// nominal with a relative tolerance: 5 V +/- 10 % is [4.5 V, 5.5 V]. A
    /// negative nominal (a negative rail) keeps low <= high: -5 V +/- 10 % is [-5.5 V, -4.5 V].
    static ranged around(Q nominal, tolerance t) {
        detail::check_tolerance("ranged::around", t);
        const Q a = nominal * (1.0 - t.minus), b = nominal * (1.0 + t.plus);
        return detail::ranged_si(nominal) < 0.0 ? ranged{nominal, b, a} : ranged{nominal, a, b};
    }
    /// In the SI base unit; validated: finite, low <= nominal <= high.
    interval as_interval() const {
        constexpr std::string_view fn = "ranged::as_interval";
        const double n = detail::ranged_si(nominal), lo = detail::ranged_si(low), hi = detail::ranged_si(high);
        if (!std::isfinite(lo)) detail::parts_fail(fn, "low", detail::ranged_text(low), "a finite value");
        if (!std::isfinite(hi)) detail::parts_fail(fn, "high", detail::ranged_text(high), "a finite value");
        if (!std::isfinite(n)) detail::parts_fail(fn, "nominal", detail::ranged_text(nominal), "a finite value");
        if (!(lo <= hi))
            detail::parts_fail(fn, "low", detail::ranged_text(low), "at most high = " + detail::ranged_text(high));
        if (!(lo <= n && n <= hi))
            detail::parts_fail(
                fn, "nominal", detail::ranged_text(nominal),
                "a value from low = " + detail::ranged_text(low) + " to high = " + detail::ranged_text(high));
        return {n, lo, hi};
    }
    /// Memberwise equality.
    friend constexpr bool operator==(const ranged&, const ranged&) = default;
};

/// A resistor: marked value, purchase tolerance, TCR band, ageing drift (+/-).
struct resistor {
    resistance nominal = resistance::from_value(0.0);  ///< marked value (at t_ref)
    tolerance tol{};                                   ///< purchase tolerance
    ppm_band tcr{};                                    ///< temperature coefficient band
    double aging = 0.0;                                ///< relative drift magnitude, +/- (0.005 for 0.5 %)

    /// Its value range in ohms at the operating conditions:
    /// R (1 + [-minus, plus]) (1 + tcr (T - t_ref)) (1 + [-aging, aging]), each
    /// factor at its own extreme (tolerance, T in [t_min, t_max], tcr in the band).
    /// The nominal is the marked value at the operating temperature nearest t_ref
    /// with the band's mid coefficient.
    interval range(const operating_conditions& c = {}) const {
        constexpr std::string_view fn = "resistor::range";
        detail::require_positive(fn, "nominal", nominal, "a positive, finite resistance");
        detail::check_tolerance(fn, tol);
        detail::check_aging(fn, aging);
        detail::check_conditions(fn, c);
        return detail::fold(nominal.value(), tol, detail::tcr_factor(fn, "tcr", tcr, c), aging);
    }
    /// The same resistor bought at another value and tolerance (synthesis' `part_choice`),
    /// with the behaviour of the choice's model when it has one.
    resistor with_choice(const part_choice& p) const {
        resistor r = p.resistor_model ? *p.resistor_model : *this;
        r.nominal = resistance::from_value(p.value);
        r.tol = p.tol;
        return r;
    }
    /// Memberwise equality.
    friend bool operator==(const resistor&, const resistor&) = default;
};

/// Wear-out of an aluminium electrolytic: it loses up to `loss` of its capacitance
/// by the end of its rated life, `rated_hours` at `rated_temperature`. The life at
/// the highest operating temperature T follows the 10 K rule (common practice):
/// L(T) = rated_hours 2^((rated_temperature - T) / 10 K). Over a service time S the
/// loss is taken as growing linearly to `loss` at L(T) (an estimate); a service
/// time beyond L(T) is an error, since nothing bounds the part after its end of life.
struct wear_out {
    double loss = 0.20;                   ///< capacitance lost at end of life (an end-of-life criterion)
    double rated_hours = 2000.0;          ///< endurance rating, hours
    celsius rated_temperature{105.0};     ///< at this temperature
    /// Memberwise equality.
    friend constexpr bool operator==(const wear_out&, const wear_out&) = default;
};

/// A leakage limit of the form I <= max(k C V, floor), C the marked capacitance and
/// V the voltage applied: for aluminium electrolytics k = 0.01 per second (0.01 CV,
/// in µA with C in µF) or 3 µA, whichever is greater (common practice).
struct leakage_rule {
    double per_cv = 0.01;                                 ///< k, in A / (F V) = 1/s
    current floor = current::from_value(0.0);             ///< the least the limit allows
    /// Memberwise equality.
    friend bool operator==(const leakage_rule&, const leakage_rule&) = default;
};

/// A capacitor: marked value, purchase tolerance, temperature behaviour (a ppm
/// band such as `c0g`, or a class 2 envelope such as `x7r`), ageing drift, and
/// optional leakage data for networks that model it.
struct capacitor {
    capacitance nominal = capacitance::from_value(0.0);            ///< marked value (at 25 °C / t_ref)
    tolerance tol{};                                               ///< purchase tolerance
    std::variant<ppm_band, dielectric_class> tempco = ppm_band{};  ///< temperature behaviour
    double aging = 0.0;                                            ///< relative drift magnitude, +/-
    std::optional<resistance> insulation{};                        ///< lowest insulation resistance, if modelled
    std::optional<current> leakage{};                              ///< largest leakage current, if modelled
    std::optional<voltage> rated_voltage{};  ///< DC rating; networks check the highest voltage they apply against it
    std::optional<dc_bias_curve> dc_bias{};  ///< capacitance against DC voltage (class 2 ceramics)
    double aging_per_decade = 0.0;           ///< class 2 ageing: fraction lost per decade of hours in service
    double aging_reference_hours = 1000.0;   ///< hours after the last de-ageing at which the marked value holds (1000 h: from memory)
    std::optional<wear_out> end_of_life{};   ///< electrolytic wear-out over the service time
    std::optional<leakage_rule> leakage_limit{};  ///< leakage from k C V (electrolytics), at the applied voltage
    bool allow_over_rating = false;  ///< a voltage above rated_voltage is a finding (rating_findings), not an error

    /// Its value range in farads at the operating conditions:
    /// C (1 + [-minus, plus]) (temperature factor) (1 + [-aging, aging]). A ppm
    /// band folds as for a resistor; a dielectric class contributes its whole
    /// envelope [1 - minus, 1 + plus] unless the range is exactly 25 °C. An
    /// operating range beyond the class's (or band's) rated range is a
    /// `domain_error` that names the limit.
    interval range(const operating_conditions& c = {}) const {
        constexpr std::string_view fn = "capacitor::range";
        detail::require_positive(fn, "nominal", nominal, "a positive, finite capacitance");
        detail::check_tolerance(fn, tol);
        detail::check_aging(fn, aging);
        detail::check_conditions(fn, c);
        if (insulation) detail::require_positive(fn, "insulation", *insulation, "a positive, finite resistance");
        if (leakage) detail::require_non_negative(fn, "leakage", *leakage, "a non-negative, finite current");
        if (rated_voltage) detail::require_positive(fn, "rated_voltage", *rated_voltage, "a positive, finite voltage");
        if (dc_bias) dc_bias->validate(fn, rated_voltage.value_or(voltage::from_value(0.0)));
        if (leakage_limit) {
            if (!(std::isfinite(leakage_limit->per_cv) && leakage_limit->per_cv >= 0.0))
                detail::parts_fail(fn, "leakage_limit.per_cv", detail::quoted_value(leakage_limit->per_cv) + " A/(F V)",
                                   "a non-negative, finite coefficient");
            detail::require_non_negative(fn, "leakage_limit.floor", leakage_limit->floor,
                                         "a non-negative, finite current");
        }
        const detail::factor_span temp = std::holds_alternative<ppm_band>(tempco)
                                             ? detail::tcr_factor(fn, "tempco", std::get<ppm_band>(tempco), c)
                                             : detail::class_factor(fn, std::get<dielectric_class>(tempco), c);
        return detail::fold(nominal.value(), tol, temp * service_factor(c), aging);
    }

    /// The crossing time over R C for a charge from v_start to v_threshold towards
    /// v_final (volts across the part), C the value without bias: with a DC-bias
    /// curve, the exact integral over the curve (dc_bias.hpp); without one,
    /// ln((v_start - v_final)/(v_threshold - v_final)). Networks call it where they
    /// would call rc.hpp's crossing_time with tau = R C; voltages checked by `check_bias_covers`.
    double crossing_per_tau(double v_start, double v_final, double v_threshold) const {
        return dc_bias ? dc_bias->crossing_per_tau(v_start, v_final, v_threshold)
                       : detail::rc::crossing_time(v_start, v_final, v_threshold, 1.0);
    }

    /// rc.hpp's ramp_crossing_time (tau = R C without bias), or with a DC-bias curve the
    /// integration over it (dc_bias_curve::ramp_crossing_time).
    double ramp_crossing_time(double v_begin, double v_end, double rise, double v_start, double v_threshold,
                              double tau) const {
        return dc_bias ? dc_bias->ramp_crossing_time(v_begin, v_end, rise, v_start, v_threshold, tau)
                       : detail::rc::ramp_crossing_time(v_begin, v_end, rise, v_start, v_threshold, tau);
    }

    /// For network `fn`: `domain_error` when the highest voltage the network can put
    /// across the part, `v_max` (from `what`, e.g. "supply.high"), exceeds `rated_voltage`,
    /// unless `allow_over_rating` (then `rating_findings` reports it).
    void check_rating(std::string_view fn, std::string_view what, voltage v_max, std::string_view part = "c") const {
        if (rated_voltage && v_max > *rated_voltage && !allow_over_rating)
            detail::parts_fail_domain(fn, std::string(part) + ".rated_voltage", detail::value_text(*rated_voltage),
                                      "at least the " + detail::value_text(v_max) + " that " + std::string(what) +
                                          " can put across " + std::string(part));
    }

    /// For network `fn`: `domain_error` when the timed swing reaches `v_max` (from
    /// `what`) beyond the DC-bias curve, which cannot say what happens past its last point.
    void check_bias_covers(std::string_view fn, std::string_view what, voltage v_max,
                           std::string_view part = "c") const {
        if (dc_bias && v_max > dc_bias->covers())
            detail::parts_fail_domain(fn, std::string(part) + ".dc_bias",
                                      "a curve up to " + detail::value_text(dc_bias->covers()),
                                      "a curve that covers the " + detail::value_text(v_max) + " that " +
                                          std::string(what) + " puts across " + std::string(part));
    }

    /// For networks that do not follow C's voltage: `invalid_argument` when a
    /// DC-bias curve is set, rather than a timing that silently ignores it.
    void require_no_bias_curve(std::string_view fn, std::string_view part = "c") const {
        if (dc_bias)
            detail::parts_fail(fn, std::string(part) + ".dc_bias", "a curve up to " + detail::value_text(dc_bias->covers()),
                               "no DC-bias curve: this network does not follow the voltage across " +
                                   std::string(part) + "; give its derated value instead (dc_bias_curve::at)");
    }

    /// The largest leakage current at `applied` volts: `leakage`, or
    /// max(k C V, floor) from `leakage_limit`, the larger of the two when both are set.
    std::optional<current> leakage_at(voltage applied) const {
        std::optional<current> out = leakage;
        if (leakage_limit) {
            const current rule = std::max(current::from_value(leakage_limit->per_cv * nominal.value() *
                                                              std::abs(applied.value())),
                                          leakage_limit->floor);
            out = out ? std::max(*out, rule) : rule;
        }
        return out;
    }
    /// The same capacitor bought at another value and tolerance (synthesis' `part_choice`),
    /// with the behaviour of the choice's model when it has one.
    capacitor with_choice(const part_choice& p) const {
        capacitor r = p.capacitor_model ? *p.capacitor_model : *this;
        r.nominal = capacitance::from_value(p.value);
        r.tol = p.tol;
        return r;
    }
    /// Memberwise equality.
    friend bool operator==(const capacitor&, const capacitor&) = default;
private:
    /// The factor that ageing over `c.service_hours` applies: class 2 ceramics lose
    /// `aging_per_decade` per decade of hours past `aging_reference_hours`
    /// (1 - a log10(S / S_ref), common practice: X7R/X5R about 1-4 % per decade,
    /// Y5V 6-10 %); electrolytics lose up to `end_of_life->loss` over their life (see
    /// `wear_out`). Only losses: the value above the marking soon after a de-ageing
    /// is not credited. {1, 1, 1} for new parts.
    detail::factor_span service_factor(const operating_conditions& c) const {
        constexpr std::string_view fn = "capacitor::range";
        detail::check_fraction_below_one(fn, "aging_per_decade", aging_per_decade,
                                         "a fraction per decade of hours from 0 up to, not including, 100 %");
        detail::check_hours(fn, "aging_reference_hours", aging_reference_hours);
        double kept = 1.0;
        if (aging_per_decade > 0.0 && c.service_hours > aging_reference_hours) {
            kept -= aging_per_decade * std::log10(c.service_hours / aging_reference_hours);
            if (!(kept > 0.0))
                detail::parts_fail_domain(fn, "service_hours", detail::quoted_value(c.service_hours) + " h",
                                          "a service time over which " + format_percent(aging_per_decade, 6) +
                                              " per decade of hours leaves some capacitance");
        }
        if (end_of_life) {
            const wear_out& w = *end_of_life;
            detail::check_fraction_below_one(fn, "end_of_life.loss", w.loss);
            detail::check_hours(fn, "end_of_life.rated_hours", w.rated_hours);
            if (!std::isfinite(w.rated_temperature.value))
                detail::parts_fail(fn, "end_of_life.rated_temperature", format(w.rated_temperature, {.digits = 6}),
                                   "a finite temperature");
            const double life = w.rated_hours * std::exp2((w.rated_temperature.value - c.t_max.value) / 10.0);
            if (c.service_hours > life)
                detail::parts_fail_domain(
                    fn, "service_hours", detail::quoted_value(c.service_hours) + " h",
                    "at most the part's life at t_max = " + format(c.t_max, {.digits = 6}) + ", " +
                        detail::quoted_value(life) + " h (" + detail::quoted_value(w.rated_hours) + " h at " +
                        format(w.rated_temperature, {.digits = 6}) + ", doubling per 10 K below)");
            kept *= 1.0 - w.loss * c.service_hours / life;
        }
        return {1.0, kept, 1.0};
    }
};

/// A kind of part a synthesis slot may be bought as: a name for reports and the
/// part's behaviour apart from value and tolerance (its nominal and tol are
/// replaced by each candidate's). See synthesis.hpp's `candidates(set, model)`.
struct part_model {
    std::string name;                       ///< "X7R ceramic", "PP film", shown in designs and notes
    std::variant<resistor, capacitor> part;  ///< the behaviour: TCR, dielectric, DC bias, ageing, leakage

    /// The part_choice pointers for this model.
    const resistor* as_resistor() const { return std::get_if<resistor>(&part); }
    const capacitor* as_capacitor() const { return std::get_if<capacitor>(&part); }
};

/// The voltage rating as a finding: a violation "over_rating" when `applied` (the
/// highest voltage across the part, e.g. the supply's high end) exceeds
/// `c.rated_voltage`; a warning "no_rating" when the part has none. For parts whose
/// `allow_over_rating` lets networks accept them.
inline std::vector<finding> rating_findings(const capacitor& c, voltage applied, std::string_view part = "C") {
    std::vector<finding> out;
    const std::string name(part);
    if (!c.rated_voltage)
        out.push_back({severity::warning, "no_rating", name + " has no rated voltage; " + detail::value_text(applied) +
                                                           " is applied across it"});
    else if (applied > *c.rated_voltage)
        out.push_back({severity::violation, "over_rating",
                       name + " sees up to " + detail::value_text(applied) + ", above its rated " +
                           detail::value_text(*c.rated_voltage) + "; expected a part rated for at least " +
                           detail::value_text(applied)});
    return out;
}

}  // namespace tauforge
