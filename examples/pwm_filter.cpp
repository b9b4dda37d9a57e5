// Turning a PWM output into a DC level: how much ripple and how slow a settling a
// one-stage RC filter must trade, and a two-stage filter where one stage cannot
// do both. The numbers are invented for the demo.
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/pulse_filter.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <cstdio>

int main() {
    using namespace tauforge;
    using namespace tauforge::literals;

    // 3.3 V PWM at 20 kHz, duty 20 to 40 %. Parts: E96 resistors, E12 capacitors.
    const pulse_train pwm{.high = ranged<voltage>::exactly(3.3_V), .width = ranged<double>::between(0.2, 0.4),
                          .period = ranged<duration>::exactly(50_us)};
    const auto r96 = candidates(value_set<resistance>::from_series(e_series::e96, 1_kohm, 100_kohm));
    const auto c12 = candidates(value_set<capacitance>::from_series(e_series::e12, 10_nF, 10_uF));

    pulse_filter one{.r = {.tol = tolerance::symmetric(0.01)}, .c = {.tol = tolerance::symmetric(0.10)}, .input = pwm};
    for (const auto& [ripple, settling] : {std::pair{10_mV, 40_ms}, std::pair{1_mV, 20_ms}}) {
        const auto t = ripple_settling_tradeoff(one, ripple, settling);
        std::printf("one stage, ripple <= %s, 1 %% settling <= %s:\n", format(ripple).c_str(), format(settling).c_str());
        if (!t.feasible()) {
            std::printf("  %s\n", t.reason.c_str());
            continue;
        }
        std::printf("  time constant %s .. %s; marked R C %s .. %s\n", format(t.tau_min).c_str(),
                    format(t.tau_max).c_str(), format(t.rc_min).c_str(), format(t.rc_max).c_str());
        timing_spec<pulse_filter> spec;
        spec.at_most("ripple", ripple).at_most("settling", settling);
        const auto res = synthesize(one, spec, {r96, c12}, {.top_k = 1});
        if (res.feasible()) std::printf("  %s\n", describe(res.designs.front(), spec).c_str());
    }

    // Two stages, the second loading the first, for 1 mV and 20 ms.
    two_stage_pulse_filter two{.r1 = {.tol = tolerance::symmetric(0.01)},
                               .c1 = {.tol = tolerance::symmetric(0.10)},
                               .r2 = {.tol = tolerance::symmetric(0.01)},
                               .c2 = {.tol = tolerance::symmetric(0.10)},
                               .input = pwm};
    timing_spec<two_stage_pulse_filter> spec;
    spec.at_most("ripple", 1_mV).at_most("settling", 20_ms);
    const auto r6 = candidates(value_set<resistance>::from_series(e_series::e6, 1_kohm, 100_kohm));
    const auto c6 = candidates(value_set<capacitance>::from_series(e_series::e6, 10_nF, 1_uF));
    const auto res = synthesize(two, spec, {r6, c6, r6, c6}, {.top_k = 3});
    std::printf("two stages, ripple <= 1 mV, 1 %% settling <= 20 ms:\n");
    if (!res.feasible()) {
        std::printf("  %s\n", res.reason.c_str());
        return 1;
    }
    for (const auto& d : res.designs) std::printf("  %s\n", describe(d, spec).c_str());
    // The duty range here stays below 50 %, so corner bounds are exact; worst_case
    // confirms it (it also searches a duty range that contains 50 %).
    const auto wc = worst_case(res.designs.front().network);
    std::printf("  best at worst case: average %s .. %s, ripple up to %s\n",
                format(voltage::from_value(wc[0].min.value)).c_str(),
                format(voltage::from_value(wc[0].max.value)).c_str(),
                format(voltage::from_value(wc[1].max.value)).c_str());
}
