// Two RC oscillators for a 1 kHz clock: a comparator timer with a steering
// diode for a 30-40 % duty cycle (the high fraction), and a Schmitt-trigger
// inverter oscillator, each checked at every corner of tolerance, supply and
// threshold spread. The numbers are invented for the demo. Results are design
// estimates: verify on hardware.
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/schmitt_oscillator.hpp>
#include <tauforge/networks/timer_astable.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <cstdio>

int main() {
    using namespace tauforge;
    using namespace tauforge::literals;

    const auto r_set = value_set<resistance>::from_series(e_series::e96, 1_kohm, 100_kohm);  // 1 %
    const auto c_set = value_set<capacitance>::from_series(e_series::e12, 10_nF, 1_uF, tolerance::symmetric(0.05));

    // Comparator timer: below 50 % duty needs the diode across Rb.
    timer_astable timer{.supply = ranged<voltage>::between(4.75_V, 5.25_V),
                        .discharge_saturation = ranged<voltage>::between(0_V, 0.1_V),
                        .steering_diode = true,
                        .diode_drop = ranged<voltage>::between(0.6_V, 0.75_V)};
    const auto start = timer.resistors_for(1_kHz, 0.35, 100_nF);
    std::printf("timer, nominal start at 100 nF: Ra = %s, Rb = %s\n", format(start.ra).c_str(),
                format(start.rb).c_str());
    timing_spec<timer_astable> tspec;
    tspec.around("frequency", 1_kHz, tolerance::symmetric(0.15)).between("duty", 0.30, 0.40);
    const auto tres = synthesize(timer, tspec, {candidates(r_set), candidates(r_set), candidates(c_set)}, {.top_k = 3});
    if (!tres.feasible()) {
        std::printf("no timer design: %s\n", tres.reason.c_str());
        return 1;
    }
    std::printf("timer with steering diode, 1 kHz +/-15 %%, duty 30-40 %%:\n");
    for (const auto& d : tres.designs) std::printf("  %s\n", describe(d, tspec).c_str());

    // Schmitt-trigger inverter: absolute thresholds with a wide part-to-part spread,
    // so only a loose window holds at worst case: a clock for non-critical timing.
    schmitt_oscillator schmitt{.supply = ranged<voltage>::between(4.75_V, 5.25_V),
                               .upper_threshold = ranged<voltage>::between(2.9_V, 3.3_V),
                               .lower_threshold = ranged<voltage>::between(1.6_V, 2.0_V),
                               .output_high_drop = ranged<voltage>::between(0_V, 0.2_V),
                               .output_low = ranged<voltage>::between(0_V, 0.1_V)};
    timing_spec<schmitt_oscillator> sspec;
    sspec.around("frequency", 1_kHz, tolerance::symmetric(0.50));
    // A logic output drives R: keep it at 10 kOhm or more.
    const auto r_light = value_set<resistance>::from_series(e_series::e96, 10_kohm, 1_Mohm);
    const auto sres = synthesize(schmitt, sspec, {candidates(r_light), candidates(c_set)}, {.top_k = 3});
    if (!sres.feasible()) {
        std::printf("no Schmitt design: %s\n", sres.reason.c_str());
        return 1;
    }
    std::printf("Schmitt-trigger oscillator, 1 kHz +/-50 %%:\n");
    for (const auto& d : sres.designs) std::printf("  %s\n", describe(d, sspec).c_str());
    const auto wc = worst_case(sres.designs.front().network);
    std::printf("best: duty %s .. %s\n", format_percent(wc[schmitt_oscillator::duty].min.value).c_str(),
                format_percent(wc[schmitt_oscillator::duty].max.value).c_str());
}
