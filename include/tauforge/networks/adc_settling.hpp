#pragma once
/// The input of a sampling ADC: a source with resistance Rs drives the pin; at
/// the start of sampling a switch (resistance Rsw) connects the sampling
/// capacitor Cs, which still holds the previous conversion's voltage. The
/// acquisition time is how long Cs needs to settle within half an LSB of an
/// N-bit conversion, at worst case a full-scale step (previous sample at one end
/// of the range, the input at the other).
///
/// Without an external capacitor it is one time constant, (Rs + Rsw) Cs, and the
/// time is (N + 1) ln 2 of them (common practice): the error falls as
/// e^(-t/tau) from full scale to 2^-(N+1) of it.
///
/// With an external capacitor Ce at the pin (charge sharing): Ce starts at the
/// input voltage (the source has recharged it since the previous sample) and Cs a
/// full scale away. First Cs shares charge with Ce through Rsw, then both recover
/// through Rs. With the errors e1 (pin) and e2 (Cs) from the final value,
///   Ce e1' = -e1/Rs - (e1 - e2)/Rsw,   Cs e2' = (e1 - e2)/Rsw,   e1(0) = 0, e2(0) = -FS,
/// the two-capacitor ladder of detail/two_stage.hpp, solved exactly:
///   e2(t) / e2(0) = Phi22(t) = (beta e^(-t/tau_slow) + alpha e^(-t/tau_fast)) / (2 r),
/// with alpha, beta > 0, so |e2| falls monotonically; the acquisition time is
/// where it reaches 2^-(N+1). (Rs = 0 holds the pin: Rsw Cs alone.)
///
/// Worst case: the time grows with Rs, Rsw and Cs. It does NOT move one way with
/// Ce: a small Ce shares little charge but recovers fast, a huge Ce holds the pin
/// but a medium one recovers slowly, so the longest time can lie inside Ce's
/// range. `acquisition_bounds` and `choose_sampling_time` search it; `worst_case`
/// finds it too, corner bounds (`metric_bounds`) may not.
///
///     tauforge::adc_settling in{.source = ranged<resistance>::between(1_kohm, 10_kohm),
///                            .switch_resistance = ranged<resistance>::between(0.5_kohm, 1.5_kohm),
///                            .sample_capacitance = ranged<capacitance>::between(5_pF, 8_pF), .bits = 12};
///     auto s = tauforge::choose_sampling_time(in, 14_MHz, {1.5, 7.5, 13.5, 28.5, 41.5, 55.5, 71.5, 239.5});

#include "tauforge/concepts.hpp"
#include "tauforge/detail/two_stage.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace tauforge {

/// A sampling ADC's input: source, sampling switch and capacitor, optional external capacitor.
struct adc_settling {
    ranged<resistance> source = ranged<resistance>::exactly(resistance::from_value(0.0));  ///< Rs, >= 0
    ranged<resistance> switch_resistance{};    ///< Rsw of the sampling switch, > 0
    ranged<capacitance> sample_capacitance{};  ///< Cs, > 0
    std::optional<capacitor> external{};       ///< Ce at the pin, if fitted
    int bits = 12;                             ///< resolution N: settle within 1/2 LSB = 2^-(N+1) of full scale
    operating_conditions conditions{};         ///< temperature range for the external capacitor

    /// Parameter indices.
    enum parameter_index : std::size_t { p_source, p_switch, p_sample, p_external };

    /// Rs, Rsw, Cs, Ce (fixed at 0 F when no external capacitor is fitted).
    static constexpr std::array<quantity_info, 4> parameters{{{"source resistance", "\u03A9"},
                                                              {"switch resistance", "\u03A9"},
                                                              {"sampling capacitance", "F"},
                                                              {"external capacitance", "F"}}};
    /// Time for the sampling capacitor to settle within 1/2 LSB after a full-scale step.
    static constexpr std::array<quantity_info, 1> metrics{{{"acquisition time", "s"}}};

    /// Each parameter's interval; validated.
    std::array<interval, 4> ranges() const {
        constexpr std::string_view fn = "adc_settling::ranges";
        if (bits < 1 || bits > 32)
            detail::parts_fail(fn, "bits", std::to_string(bits), "a resolution of 1 to 32 bits");
        const interval rs = source.as_interval(), rsw = switch_resistance.as_interval();
        const interval cs = sample_capacitance.as_interval();
        if (!(rs.low >= 0.0))
            detail::parts_fail(fn, "source.low", detail::value_text(source.low), "a non-negative resistance");
        if (!(rsw.low > 0.0))
            detail::parts_fail(fn, "switch_resistance.low", detail::value_text(switch_resistance.low),
                               "a positive resistance");
        if (!(cs.low > 0.0))
            detail::parts_fail(fn, "sample_capacitance.low", detail::value_text(sample_capacitance.low),
                               "a positive capacitance");
        if (external) external->require_no_bias_curve(fn, "external");
        return {rs, rsw, cs, external ? external->range(conditions) : interval::exactly(0.0)};
    }

    /// The acquisition time at one point.
    std::array<double, 1> evaluate(const std::array<double, 4>& x) const {
        const double rs = x[p_source], rsw = x[p_switch], cs = x[p_sample], ce = x[p_external];
        const double k = half_lsb_time_constants(bits);  // (N + 1) ln 2
        if (ce == 0.0) return {(rs + rsw) * cs * k};
        if (rs == 0.0) return {rsw * cs * k};
        const auto m = detail::two_stage::ladder_modes(rs, ce, rsw, cs);
        const auto z = detail::two_stage::to_modes(m, 0.0, 1.0);  // e1 = 0, e2 = 1 (per unit of the step)
        return {detail::two_stage::decay_crossing(m, z[0], z[1], std::ldexp(1.0, -(bits + 1)))};
    }
};

static_assert(TimingNetwork<adc_settling>, "adc_settling must satisfy TimingNetwork");

/// The acquisition time's nominal and worst-case extremes, and where the longest occurs.
struct acquisition_bounds_result {
    interval time;                     ///< nominal, shortest, longest (s)
    std::array<double, 4> longest_at{};  ///< Rs, Rsw, Cs, Ce where the longest occurs
};

namespace detail {

/// Golden-section search for the largest sign * f on [a, b].
template <class F>
std::pair<double, double> adc_golden(F&& f, double a, double b, double sign) {
    constexpr double inv_phi = 0.6180339887498949;
    double c = b - inv_phi * (b - a), d = a + inv_phi * (b - a), fc = f(c), fd = f(d);
    for (int it = 0; it < 200 && (b - a) > 1e-12 * b; ++it) {
        if (sign * fc > sign * fd) b = d, d = c, fd = fc, c = b - inv_phi * (b - a), fc = f(c);
        else a = c, c = d, fc = fd, d = a + inv_phi * (b - a), fd = f(d);
    }
    return sign * fc > sign * fd ? std::pair{c, fc} : std::pair{d, fd};
}

}  // namespace detail

/// The acquisition time over every corner of Rs, Rsw and Cs and the whole range of
/// Ce: a 33-point grid over Ce, refined by golden-section search between the grid
/// neighbours of the best point (the time is unimodal in Ce).
inline acquisition_bounds_result acquisition_bounds(const adc_settling& in) {
    const auto r = in.ranges();
    std::array<double, 4> x{r[0].nominal, r[1].nominal, r[2].nominal, r[3].nominal};
    acquisition_bounds_result out;
    const double nominal = in.evaluate(x)[0];
    out.time = {nominal, nominal, nominal};
    out.longest_at = x;
    const interval& ce = r[adc_settling::p_external];
    constexpr int grid = 33;
    for (unsigned mask = 0; mask < 8; ++mask) {
        for (std::size_t j = 0; j < 3; ++j) x[j] = (mask >> j & 1u) ? r[j].high : r[j].low;
        auto at = [&](double c) {
            auto y = x;
            y[adc_settling::p_external] = c;
            return in.evaluate(y)[0];
        };
        for (const double sign : {1.0, -1.0}) {
            double best_c = ce.low, best = at(ce.low);
            int best_g = 0;
            for (int g = 1; g < grid && !ce.is_fixed(); ++g) {
                const double c = g + 1 == grid ? ce.high : ce.low + (ce.high - ce.low) * g / (grid - 1);
                const double v = at(c);
                if (sign * v > sign * best) best = v, best_c = c, best_g = g;
            }
            if (!ce.is_fixed() && best_g > 0 && best_g < grid - 1) {
                const double step = (ce.high - ce.low) / (grid - 1);
                const auto [c, v] = detail::adc_golden(at, best_c - step, best_c + step, sign);
                if (sign * v > sign * best) best = v, best_c = c;
            }
            if (sign > 0.0 && best > out.time.high) {
                out.time.high = best;
                out.longest_at = x;
                out.longest_at[adc_settling::p_external] = best_c;
            }
            if (sign < 0.0) out.time.low = std::min(out.time.low, best);
        }
    }
    return out;
}

/// The sampling setting `choose_sampling_time` picked, or why none suffices.
struct sampling_choice {
    std::optional<std::size_t> index{};  ///< position in the given settings; empty when none suffices
    double cycles = 0.0;                 ///< the chosen setting (the longest one when none suffices)
    duration window = duration::from_value(0.0);    ///< cycles / clock
    duration required = duration::from_value(0.0);  ///< worst-case acquisition time
    duration margin = duration::from_value(0.0);    ///< window - required (negative when none suffices)
    double cycles_needed = 0.0;          ///< required x clock: the shortest setting that would do
    std::string reason;                  ///< the ruling constraint when none suffices
    /// True when a setting suffices.
    bool found() const noexcept { return index.has_value(); }
};

/// The shortest of the ADC's sampling settings (in clock cycles, any order) whose
/// window, cycles / clock, is at least the worst-case acquisition time; with its
/// margin. When none suffices the result is empty and `reason` says by how much the
/// longest falls short, and at which source, switch and capacitances.
inline sampling_choice choose_sampling_time(const adc_settling& in, frequency clock, const std::vector<double>& settings) {
    constexpr std::string_view fn = "choose_sampling_time";
    detail::require_positive(fn, "clock", clock, "a positive, finite clock frequency");
    if (settings.empty()) detail::parts_fail(fn, "settings", "(none)", "at least one sampling setting in cycles");
    for (std::size_t i = 0; i < settings.size(); ++i)
        if (!(settings[i] > 0.0 && std::isfinite(settings[i])))
            detail::parts_fail(fn, "settings[" + std::to_string(i) + "]", detail::quoted_value(settings[i]),
                               "a positive, finite number of cycles");
    const auto b = acquisition_bounds(in);
    const double f = clock.value(), need = b.time.high;
    sampling_choice s;
    s.required = duration::from_value(need);
    s.cycles_needed = need * f;
    std::size_t longest = 0;
    for (std::size_t i = 0; i < settings.size(); ++i) {
        if (settings[i] > settings[longest]) longest = i;
        if (settings[i] / f >= need && (!s.index || settings[i] < settings[*s.index])) s.index = i;
    }
    const std::size_t pick = s.index ? *s.index : longest;
    s.cycles = settings[pick];
    s.window = duration::from_value(s.cycles / f);
    s.margin = s.window - s.required;
    if (!s.index) {
        const auto& p = b.longest_at;
        s.reason = "no sampling setting suffices for " + std::to_string(in.bits) + " bits: the longest, " +
                   detail::quoted_value(s.cycles) + " cycles at " + detail::value_text(clock) + " = " +
                   detail::value_text(s.window) + ", is shorter than the worst-case acquisition time " +
                   detail::value_text(s.required) + " (source " + detail::value_text(resistance::from_value(p[0])) +
                   ", switch " + detail::value_text(resistance::from_value(p[1])) + ", sampling " +
                   detail::value_text(capacitance::from_value(p[2])) + ", external " +
                   detail::value_text(capacitance::from_value(p[3])) + "); it needs at least " +
                   detail::quoted_value(s.cycles_needed) + " cycles";
    }
    return s;
}

}  // namespace tauforge
