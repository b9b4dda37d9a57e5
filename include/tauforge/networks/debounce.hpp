#pragma once
/// A switch debouncer: R1 from the supply to the contact node, R2 from there to
/// C at a Schmitt-trigger input (thresholds VT+ rising, VT- falling). The contact
/// shorts its node to 0 V while pressed.
///
///   press:   C, charged to the supply, discharges through R2 towards 0 V;
///            the input sees the press when it falls to VT-:
///            t_press = R2 C ln(Vdd / VT-)
///   release: C, discharged to 0 V, charges through R1 + R2 towards the supply;
///            the input sees the release when it rises to VT+:
///            t_release = (R1 + R2) C ln(Vdd / (Vdd - VT+))
///
/// Both start from a settled capacitor (the contact has rested longer than a few
/// time constants), and the Schmitt input draws no current. While the contact
/// bounces, the capacitor can only be slower than the continuous press (or
/// release), so an input that does not switch within t_press (t_release) ignores a
/// bounce shorter than that: a debouncer needs both delays longer than the bounce
/// time and shorter than the response it must give. `check_debounce` says which
/// holds at worst case; `synthesize` with at_least / at_most windows designs one.
///
///     tauforge::debounce d{.r1 = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)},
///                          .r2 = {.nominal = 47_kohm, .tol = tolerance::symmetric(0.05)},
///                          .c = {.nominal = 330_nF, .tol = tolerance::symmetric(0.10)}};
///     d.upper_threshold = ranged<voltage>::between(1.6_V, 2.3_V);   // absolute VT+
///     auto f = tauforge::check_debounce(d, 10_ms, 60_ms);          // f.holds(), f.problems
///
/// Each delay moves one way with every parameter, so corner bounds are exact; also
/// with a DC-bias curve on C (dc_bias.hpp), which only ever lowers C as the voltage
/// rises: the press integral of k(v)/v from VT- to Vdd grows with Vdd and falls
/// with VT-, the release integral of k(v)/(Vdd - v) from 0 to VT+ the other way.

#include "tauforge/concepts.hpp"
#include "tauforge/detail/analysis_common.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <string>
#include <string_view>
#include <variant>
#include <vector>

namespace tauforge {

/// A switch debouncer with a pull-up, a series resistor and a Schmitt-trigger input.
struct debounce {
    /// A threshold as a ratio of the supply (with spread) or as an absolute voltage.
    using level = std::variant<ranged<double>, ranged<voltage>>;

    resistor r1{};   ///< pull-up from the supply to the contact node
    resistor r2{};   ///< series resistor from the contact node to the capacitor
    capacitor c{};   ///< capacitor at the Schmitt input
    ranged<voltage> supply = ranged<voltage>::exactly(voltage::from_value(5.0));  ///< Vdd
    level upper_threshold = ranged<double>::exactly(2.0 / 3.0);  ///< VT+, the rising threshold
    level lower_threshold = ranged<double>::exactly(1.0 / 3.0);  ///< VT-, the falling threshold
    operating_conditions conditions{};  ///< temperature range for the parts

    /// Parameter indices.
    enum parameter_index : std::size_t { p_r1, p_r2, p_c, p_supply, p_upper, p_lower, p_upper_v, p_lower_v };
    /// Metric indices.
    enum metric_index : std::size_t { press_delay, release_delay };

    /// R1, R2, C, supply, VT+ and VT- as ratios, VT+ and VT- as voltages. For each
    /// threshold the form not in use is fixed at the equivalent nominal value and
    /// does not enter the metrics.
    static constexpr std::array<quantity_info, 8> parameters{{{"R1", "\u03A9"},
                                                              {"R2", "\u03A9"},
                                                              {"C", "F"},
                                                              {"supply", "V"},
                                                              {"VT+ ratio", "V/V"},
                                                              {"VT- ratio", "V/V"},
                                                              {"VT+", "V"},
                                                              {"VT-", "V"}}};
    /// Time from the contact closing (opening) until the input falls to VT- (rises to VT+).
    static constexpr std::array<quantity_info, 2> metrics{{{"press delay", "s"}, {"release delay", "s"}}};
    /// Synthesis chooses R1, R2 and C.
    static constexpr std::array<design_slot, 3> design_slots{
        {{"R1", part_kind::resistor, 0}, {"R2", part_kind::resistor, 1}, {"C", part_kind::capacitor, 2}}};

    /// Each parameter's interval at the operating conditions; throws for a
    /// threshold outside the supply.
    std::array<interval, 8> ranges() const {
        constexpr std::string_view fn = "debounce::ranges";
        const interval vs = supply.as_interval();
        if (!(vs.low > 0.0))
            detail::parts_fail(fn, "supply.low", detail::value_text(supply.low), "a positive supply voltage");
        const auto up = threshold_ranges(fn, "upper_threshold", upper_threshold, vs, supply.low);
        const auto down = threshold_ranges(fn, "lower_threshold", lower_threshold, vs, supply.low);
        c.check_rating(fn, "supply.high", supply.high);
        c.check_bias_covers(fn, "supply.high", supply.high);  // C charges to the supply between presses
        return {r1.range(conditions), r2.range(conditions), c.range(conditions), vs,
                up[0],                down[0],              up[1],              down[1]};
    }

    /// Press and release delay at one point.
    std::array<double, 2> evaluate(const std::array<double, 8>& x) const {
        const double vdd = x[p_supply];
        const double vt_up = uses_ratio(upper_threshold) ? x[p_upper] * vdd : x[p_upper_v];
        const double vt_down = uses_ratio(lower_threshold) ? x[p_lower] * vdd : x[p_lower_v];
        return {x[p_r2] * x[p_c] * c.crossing_per_tau(vdd, 0.0, vt_down),
                (x[p_r1] + x[p_r2]) * x[p_c] * c.crossing_per_tau(0.0, vdd, vt_up)};
    }

    /// A copy with R1, R2 and C bought at the given values and tolerances.
    debounce with_parts(const std::array<part_choice, 3>& p) const {
        debounce d = *this;
        d.r1 = r1.with_choice(p[0]);
        d.r2 = r2.with_choice(p[1]);
        d.c = c.with_choice(p[2]);
        return d;
    }

    /// The R1, R2 or C that puts a delay at `target`, the others at `values`, at the
    /// nominal supply and thresholds; NaN for R1 and the press delay (R1 is not in
    /// the discharge path); a non-positive value when no value reaches the target.
    double solve_slot(std::size_t slot, std::size_t metric, double target, const std::array<double, 3>& v) const {
        constexpr double nan = std::numeric_limits<double>::quiet_NaN();
        if (!(target > 0.0) || slot > 2 || metric > 1) return nan;
        const double vdd = supply.nominal.value();
        if (metric == press_delay) {
            const double k = c.crossing_per_tau(vdd, 0.0, nominal_level(lower_threshold, vdd));
            if (slot == 0) return nan;
            return slot == 1 ? target / (k * v[2]) : target / (k * v[1]);
        }
        const double k = c.crossing_per_tau(0.0, vdd, nominal_level(upper_threshold, vdd));
        switch (slot) {
            case 0: return target / (k * v[2]) - v[1];
            case 1: return target / (k * v[2]) - v[0];
            default: return target / (k * (v[0] + v[1]));
        }
    }

    /// Whether a threshold is given as a ratio of the supply.
    static bool uses_ratio(const level& l) { return std::holds_alternative<ranged<double>>(l); }

private:
    static double nominal_level(const level& l, double vdd) {
        return uses_ratio(l) ? std::get<ranged<double>>(l).nominal * vdd : std::get<ranged<voltage>>(l).nominal.value();
    }

    /// {ratio interval, voltage interval} of one threshold, validated.
    static std::array<interval, 2> threshold_ranges(std::string_view fn, std::string_view name, const level& l,
                                                    const interval& vs, voltage supply_low) {
        const std::string n(name);
        if (uses_ratio(l)) {
            const interval k = std::get<ranged<double>>(l).as_interval();
            if (!(k.low > 0.0 && k.high < 1.0))
                detail::parts_fail(fn, n + (k.low > 0.0 ? ".high" : ".low"),
                                   detail::quoted_value(k.low > 0.0 ? k.high : k.low),
                                   "a ratio of the supply strictly between 0 and 1");
            return {k, interval::exactly(k.nominal * vs.nominal)};
        }
        const auto& r = std::get<ranged<voltage>>(l);
        const interval v = r.as_interval();
        if (!(v.low > 0.0)) detail::parts_fail(fn, n + ".low", detail::value_text(r.low), "a threshold above 0 V");
        if (!(v.high < vs.low))
            detail::parts_fail_domain(fn, n + ".high", detail::value_text(r.high),
                                      "a threshold below the lowest supply, supply.low = " +
                                          detail::value_text(supply_low));
        return {interval::exactly(v.nominal / vs.nominal), v};
    }
};

static_assert(SolvableNetwork<debounce>, "debounce must satisfy SolvableNetwork");

/// What `check_debounce` found: the worst-case delays and every requirement that fails.
struct debounce_findings {
    interval press;    ///< press delay: nominal and worst-case extremes (s)
    interval release;  ///< release delay: nominal and worst-case extremes (s)
    std::vector<std::string> problems;  ///< one sentence per failed requirement; empty when all hold
    /// True when both delays are at least the bounce time and at most the limit at every corner.
    bool holds() const noexcept { return problems.empty(); }
};

/// Checks a debouncer at worst case: each delay must be at least `bounce` (so a
/// bouncing contact cannot toggle the input) and at most `response_limit` (so a
/// real press is seen in time). The bounds are the corners of the parameters'
/// intervals, exact because each delay is monotone in every parameter.
inline debounce_findings check_debounce(const debounce& d, duration bounce, duration response_limit) {
    constexpr std::string_view fn = "check_debounce";
    detail::require_positive(fn, "bounce", bounce, "a positive, finite time");
    detail::require_positive(fn, "response_limit", response_limit, "a positive, finite time");
    if (!(response_limit > bounce))
        detail::fail_invalid(fn, "response_limit", response_limit,
                             "a limit longer than bounce = " + detail::value_text(bounce));
    const auto r = d.ranges();
    const auto fs = detail::free_parameters(r);
    detail::check_corner_count(fn, fs.count);
    auto x = detail::nominal_point(r);
    const auto nominal = d.evaluate(x);
    std::array<interval, 2> b{{{nominal[0], nominal[0], nominal[0]}, {nominal[1], nominal[1], nominal[1]}}};
    detail::for_each_corner(r, fs, x, [&](std::uint32_t) {
        const auto v = d.evaluate(x);
        for (std::size_t m = 0; m < 2; ++m) b[m].low = std::min(b[m].low, v[m]), b[m].high = std::max(b[m].high, v[m]);
    });
    debounce_findings f{b[0], b[1], {}};
    const std::string bounce_text = detail::value_text(bounce), limit_text = detail::value_text(response_limit);
    for (std::size_t m = 0; m < 2; ++m) {
        const std::string name(debounce::metrics[m].name);
        if (b[m].low < bounce.value())
            f.problems.push_back(name + " can be as short as " + detail::value_text(duration::from_value(b[m].low)) +
                                 ", less than the bounce time " + bounce_text +
                                 ": a bouncing contact can toggle the input");
        if (b[m].high > response_limit.value())
            f.problems.push_back(name + " can be as long as " + detail::value_text(duration::from_value(b[m].high)) +
                                 ", more than the response limit " + limit_text);
    }
    return f;
}

}  // namespace tauforge
