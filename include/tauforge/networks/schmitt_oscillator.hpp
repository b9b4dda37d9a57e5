#pragma once
/// The Schmitt-trigger RC oscillator: an inverter with hysteresis, R from its
/// output to its input, C from the input to ground. While the output is high
/// (V_OH) C charges through R from VT- up to VT+; then the output falls to V_OL
/// and C discharges through R from VT+ down to VT-:
///
///     t_high = R C ln((V_OH - VT-) / (V_OH - VT+)),   t_low = R C ln((VT+ - V_OL) / (VT- - V_OL)).
///
/// With V_OL = 0 and V_OH = V_dd the period is R C [ln(VT+/VT-) + ln((V_dd - VT-)/(V_dd - VT+))],
/// 2 ln 2 R C for thresholds at 1/3 and 2/3. Duty cycle is the HIGH fraction.
/// Thresholds are ratios of the supply or absolute voltages, each with its spread.
///
///     schmitt_oscillator osc{.r = {.nominal = 10_kohm}, .c = {.nominal = 100_nF},
///                            .upper_threshold = ranged<voltage>::between(2.9_V, 3.4_V),
///                            .lower_threshold = ranged<voltage>::between(1.6_V, 2.1_V)};
///
/// Every metric is monotone in every parameter, with one exception: with ratio
/// thresholds and both output levels off the rails, high and low time both shrink
/// as the supply rises and the duty can turn inside the supply range (worst_case
/// searches there; metric_bounds and synthesis take corners). The duty rises with
/// either threshold: d(duty)/d(VT+) has the sign of (b + h) ln(1 + h/b) - a ln(1 + h/a)
/// with a = V_OH - VT+, b = VT- - V_OL, h = VT+ - VT-, which is positive because
/// x ln(1 + h/x) < h < (x + h) ln(1 + h/x).

#include "tauforge/concepts.hpp"
#include "tauforge/detail/validate.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <limits>
#include <string>
#include <string_view>
#include <variant>

namespace tauforge {

/// A switching threshold: a ratio of the supply (`ranged<double>`) or an
/// absolute level (`ranged<voltage>`), each with its spread.
using threshold_level = std::variant<ranged<double>, ranged<voltage>>;

/// The Schmitt-trigger RC oscillator; see the header comment for the circuit.
struct schmitt_oscillator {
    resistor r{};  ///< feedback resistor, output to input
    capacitor c{};  ///< timing capacitor, input to ground
    ranged<voltage> supply = ranged<voltage>::exactly(voltage::from_value(5.0));  ///< V_dd
    threshold_level upper_threshold = ranged<double>::exactly(2.0 / 3.0);  ///< VT+ (rising input)
    threshold_level lower_threshold = ranged<double>::exactly(1.0 / 3.0);  ///< VT- (falling input)
    ranged<voltage> output_high_drop = ranged<voltage>::exactly(voltage::from_value(0.0));  ///< V_dd - V_OH, >= 0
    ranged<voltage> output_low = ranged<voltage>::exactly(voltage::from_value(0.0));  ///< V_OL, >= 0
    operating_conditions conditions{};  ///< temperature range for the parts

    /// Indices into `metrics` and `evaluate`'s result.
    enum metric_index : std::size_t { high_time, low_time, period, frequency, duty };
    /// Indices into `parameters`, `ranges()` and `evaluate`'s argument.
    enum parameter_index : std::size_t {
        p_r,
        p_c,
        p_supply,
        p_upper_ratio,
        p_upper,
        p_lower_ratio,
        p_lower,
        p_drop,
        p_low
    };

    /// The uncertain parameters; a threshold's unused form is fixed at 0.
    static constexpr std::array<quantity_info, 9> parameters{{{"R", "\u03A9"},
                                                              {"C", "F"},
                                                              {"supply", "V"},
                                                              {"upper threshold ratio", "V/V"},
                                                              {"upper threshold", "V"},
                                                              {"lower threshold ratio", "V/V"},
                                                              {"lower threshold", "V"},
                                                              {"output high drop", "V"},
                                                              {"output low", "V"}}};
    /// Output high and low time, period, frequency, duty (the high fraction).
    static constexpr std::array<quantity_info, 5> metrics{
        {{"high time", "s"}, {"low time", "s"}, {"period", "s"}, {"frequency", "Hz"}, {"duty", ""}}};
    /// The parts synthesis chooses.
    static constexpr std::array<design_slot, 2> design_slots{
        {{"R", part_kind::resistor, p_r}, {"C", part_kind::capacitor, p_c}}};

    /// Each parameter's interval: a threshold given as a ratio fixes its absolute
    /// entry at 0 and the other way round. Throws `domain_error` unless
    /// V_OL < VT- < VT+ < V_OH at every corner, `invalid_argument` for a negative
    /// output level or drop.
    /// The duty can turn inside the supply range when ratio thresholds meet
    /// output levels off the rails; then corners are not bounds.
    bool corners_are_bounds() const {
        if (c.dc_bias) return false;  // the duty can turn with the supply through the DC-bias curve
        const bool rails = output_high_drop.high.value() == 0.0 && output_low.high.value() == 0.0;
        return rails || (std::holds_alternative<ranged<voltage>>(upper_threshold) &&
                         std::holds_alternative<ranged<voltage>>(lower_threshold));
    }

    std::array<interval, 9> ranges() const {
        constexpr std::string_view fn = "schmitt_oscillator::ranges";
        const bool up_ratio = std::holds_alternative<ranged<double>>(upper_threshold);
        const bool lo_ratio = std::holds_alternative<ranged<double>>(lower_threshold);
        const auto as_ratio = [](const threshold_level& t, bool ratio) {
            return ratio ? std::get<ranged<double>>(t).as_interval() : interval::exactly(0.0);
        };
        const auto as_volts = [](const threshold_level& t, bool ratio) {
            return ratio ? interval::exactly(0.0) : std::get<ranged<voltage>>(t).as_interval();
        };
        std::array<interval, 9> x{r.range(conditions),
                                  c.range(conditions),
                                  supply.as_interval(),
                                  as_ratio(upper_threshold, up_ratio),
                                  as_volts(upper_threshold, up_ratio),
                                  as_ratio(lower_threshold, lo_ratio),
                                  as_volts(lower_threshold, lo_ratio),
                                  output_high_drop.as_interval(),
                                  output_low.as_interval()};
        if (!(x[p_supply].low > 0.0)) detail::fail_invalid(fn, "supply.low", supply.low, "a positive supply voltage");
        if (!(x[p_drop].low >= 0.0))
            detail::fail_invalid(fn, "output_high_drop.low", output_high_drop.low, "a non-negative voltage");
        if (!(x[p_low].low >= 0.0))
            detail::fail_invalid(fn, "output_low.low", output_low.low, "a non-negative voltage");
        // Each condition is hardest at the lowest supply, where the levels that scale
        // with it come closest to the fixed ones; VT- as a ratio below an absolute VT+
        // is hardest at the highest supply.
        const double vdd = x[p_supply].low, vdd_hi = x[p_supply].high;
        const double up_lo = up_ratio ? x[p_upper_ratio].low * vdd : x[p_upper].low;
        const double up_hi = up_ratio ? x[p_upper_ratio].high * vdd : x[p_upper].high;
        const double lo_lo = lo_ratio ? x[p_lower_ratio].low * vdd : x[p_lower].low;
        const double lo_vdd = up_ratio ? vdd : vdd_hi;
        const double lo_hi = lo_ratio ? x[p_lower_ratio].high * lo_vdd : x[p_lower].high;
        const double voh = vdd - x[p_drop].high, vol = x[p_low].high;
        const auto text = [&](bool ratio, double ratio_v, double volts, std::string_view at) {
            return ratio ? detail::quoted_value(ratio_v) + " (" + detail::value_text(voltage::from_value(volts)) +
                               " at " + std::string(at) + ")"
                         : detail::value_text(voltage::from_value(volts));
        };
        const auto v = [](double volts) { return detail::value_text(voltage::from_value(volts)); };
        if (!(up_hi < voh))
            detail::parts_fail_domain(fn, "upper_threshold.high",
                                      text(up_ratio, x[p_upper_ratio].high, up_hi, "supply.low"),
                                      "a threshold below the lowest output high level, supply.low - "
                                      "output_high_drop.high = " +
                                          v(voh));
        if (!(lo_lo > vol))
            detail::parts_fail_domain(fn, "lower_threshold.low",
                                      text(lo_ratio, x[p_lower_ratio].low, lo_lo, "supply.low"),
                                      "a threshold above the highest output low level, output_low.high = " + v(vol));
        if (!(lo_hi < up_lo))
            detail::parts_fail_domain(
                fn, "lower_threshold.high",
                text(lo_ratio, x[p_lower_ratio].high, lo_hi, up_ratio ? "supply.low" : "supply.high"),
                "a threshold below upper_threshold.low = " + text(up_ratio, x[p_upper_ratio].low, up_lo, "supply.low") +
                    " (VT- < VT+)");
        // C swings between the thresholds; the output can put up to the supply across it.
        c.check_rating(fn, "supply.high", supply.high);
        c.check_bias_covers(fn, "the upper threshold",
                            voltage::from_value(up_ratio ? x[p_upper_ratio].high * vdd_hi : x[p_upper].high));
        return x;
    }

    /// High time, low time, period, frequency and duty at one set of values.
    std::array<double, 5> evaluate(const std::array<double, 9>& x) const {
        const auto k = per_tau(x);
        const double tau = x[p_r] * x[p_c];
        const double th = k[0] * tau, tl = k[1] * tau, t = th + tl;
        return {th, tl, t, 1.0 / t, th / t};
    }

    /// High and low time per unit time constant.
    std::array<double, 2> per_tau(const std::array<double, 9>& x) const {
        const double vdd = x[p_supply];
        const double vtp =
            std::holds_alternative<ranged<double>>(upper_threshold) ? x[p_upper_ratio] * vdd : x[p_upper];
        const double vtm =
            std::holds_alternative<ranged<double>>(lower_threshold) ? x[p_lower_ratio] * vdd : x[p_lower];
        const double voh = vdd - x[p_drop], vol = x[p_low];
        return {c.crossing_per_tau(vtm, voh, vtp), c.crossing_per_tau(vtp, vol, vtm)};
    }

    /// A copy with R and C bought at the given values and tolerances.
    schmitt_oscillator with_parts(const std::array<part_choice, 2>& p) const {
        schmitt_oscillator s = *this;
        s.r = r.with_choice(p[0]);
        s.c = c.with_choice(p[1]);
        return s;
    }

    /// The R (slot 0) or C (slot 1) that puts a time metric or the frequency at
    /// `target` with the other at `values` (every time is R C times a constant);
    /// NaN for the duty, which neither changes.
    double solve_slot(std::size_t slot, std::size_t metric, double target, const std::array<double, 2>& values) const {
        constexpr double nan = std::numeric_limits<double>::quiet_NaN();
        if (slot > 1 || metric > frequency || !(target > 0.0)) return nan;
        const auto k = per_tau(nominal_values());
        const double per = metric == high_time ? k[0] : metric == low_time ? k[1] : k[0] + k[1];
        const double t = metric == frequency ? 1.0 / target : target;
        return t / per / values[1 - slot];
    }

private:
    std::array<double, 9> nominal_values() const {
        const auto ratio = [](const threshold_level& t) {
            return std::holds_alternative<ranged<double>>(t) ? std::get<ranged<double>>(t).nominal : 0.0;
        };
        const auto volts = [](const threshold_level& t) {
            return std::holds_alternative<ranged<voltage>>(t) ? std::get<ranged<voltage>>(t).nominal.value() : 0.0;
        };
        return {
            r.nominal.value(),         c.nominal.value(),      supply.nominal.value(), ratio(upper_threshold),
            volts(upper_threshold),    ratio(lower_threshold), volts(lower_threshold), output_high_drop.nominal.value(),
            output_low.nominal.value()};
    }
};

static_assert(SolvableNetwork<schmitt_oscillator>, "schmitt_oscillator must satisfy SolvableNetwork");

}  // namespace tauforge
