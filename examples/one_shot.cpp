// A comparator-timer one-shot stretches a short falling edge into a 10 ms pulse
// (+/-15 % at every corner) on a 4.5-5.5 V rail from -20 °C to +70 °C; an RC edge
// detector turns the input's falling edge into the timer's trigger pulse.
// The numbers are invented for the demo. Results are design estimates: verify on
// hardware, and follow the applicable standards for safety-relevant timing.
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/edge_detector.hpp>
#include <tauforge/networks/timer_monostable.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <cstdio>

int main() {
    using namespace tauforge;
    using namespace tauforge::literals;

    const operating_conditions env{.t_min = celsius{-20}, .t_max = celsius{70}};
    // A CMOS timer: thresholds at 2/3 of the supply with some spread, a small
    // discharge switch, a threshold input that draws almost nothing.
    timer_monostable one_shot{.r = {.tcr = ppm_band::symmetric(100)},
                              .c = {.tempco = c0g},
                              .supply = ranged<voltage>::between(4.5_V, 5.5_V),
                              .upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, 0.01),
                              .discharge_saturation = ranged<voltage>::between(0_V, 0.1_V),
                              .discharge_resistance = ranged<resistance>::between(10_ohm, 40_ohm),
                              .propagation_delay = ranged<duration>::between(50_ns, 300_ns),
                              .threshold_bias = ranged<current>::between(0_nA, 1_nA),
                              .min_trigger_width = 100_ns,
                              .conditions = env};

    timing_spec<timer_monostable> spec;
    spec.around("pulse width", 10_ms, tolerance::symmetric(0.15));
    const auto r_set = value_set<resistance>::from_series(e_series::e96, 1_kohm, 1_Mohm);  // 1 %
    const auto c_set = value_set<capacitance>::from_series(e_series::e12, 1_nF, 100_nF, tolerance::symmetric(0.05));
    const auto result = synthesize(one_shot, spec, {candidates(r_set), candidates(c_set)}, {.top_k = 3});
    if (!result.feasible()) {
        std::printf("no design: %s\n", result.reason.c_str());
        return 1;
    }
    std::printf("one-shot, 10 ms +/-15 %% at worst case:\n");
    for (const auto& d : result.designs) std::printf("  %s\n", describe(d, spec).c_str());

    const timer_monostable& best = result.designs.front().network;
    const auto wc = worst_case(best);
    std::printf("best: pulse %s .. %s, recovery up to %s, retriggerable up to %s\n",
                format(duration::from_value(wc[timer_monostable::pulse_width].min.value)).c_str(),
                format(duration::from_value(wc[timer_monostable::pulse_width].max.value)).c_str(),
                format(duration::from_value(wc[timer_monostable::recovery_time].max.value)).c_str(),
                format(frequency::from_value(wc[timer_monostable::retrigger_rate].min.value)).c_str());
    std::printf("      largest usable timing resistor: %s\n", format(best.max_timing_resistance()).c_str());

    // The trigger: 10 kOhm pull-up, 470 pF series capacitor. The driving gate swings
    // 4.3-4.5 V: step and supply vary independently here, so a step above the lowest
    // rail would be counted at that rail too (check_trigger warns about it).
    edge_detector edge{.r = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)},
                       .c = {.nominal = 470_pF, .tol = tolerance::symmetric(0.10), .tempco = c0g},
                       .supply = ranged<voltage>::between(4.5_V, 5.5_V),
                       .step = ranged<voltage>::between(4.3_V, 4.5_V),
                       .threshold = ranged<double>::plus_minus(1.0 / 3.0, 0.01),
                       .conditions = env};
    const auto trigger = edge.pulse_width_range();
    std::printf("trigger pulse from the edge detector: %s .. %s\n", format(trigger.low).c_str(),
                format(trigger.high).c_str());

    auto findings = check_design(best, trigger);
    const auto more = check_trigger(edge, best, 0.1);  // end within 10 % of the shortest pulse
    findings.insert(findings.end(), more.begin(), more.end());
    if (findings.empty()) std::printf("checks: no findings\n");
    for (const auto& f : findings)
        std::printf("%s [%s]: %s\n", f.level == severity::violation ? "violation" : "warning",
                    std::string(f.rule).c_str(), f.message.c_str());
    return has_violation(findings) ? 1 : 0;
}
