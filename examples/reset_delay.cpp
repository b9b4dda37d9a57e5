// A power-on reset from an RC network: the MCU's reset input must stay low for
// at least 20 ms after the supply rail has finished rising, at every corner of
// tolerance, temperature, supply, input threshold, rise time and pin leakage.
// The numbers are invented for the demo. Results are design estimates: verify on
// hardware, and follow the applicable standards for safety-relevant resets.
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/rc_delay.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <cstdio>

int main() {
    using namespace tauforge;
    using namespace tauforge::literals;

    rc_delay por{.r = {.tol = tolerance::symmetric(0.05), .tcr = ppm_band::symmetric(100)},
                 .c = {.tol = tolerance::symmetric(0.10), .tempco = x7r}};
    por.conditions = {.t_min = celsius{-40}, .t_max = celsius{85}};
    por.supply = ranged<voltage>::around(3.3_V, tolerance::symmetric(0.05));
    por.threshold = ranged<double>::between(0.3, 0.7);         // reset input releases somewhere in 30..70 % of VDD
    por.rise_time = ranged<duration>::between(0.1_ms, 10_ms);  // the rail takes up to 10 ms to come up
    por.leakage = ranged<current>::between(-1_uA, 1_uA);       // reset pin leakage, either direction

    // The delay counts from the start of the rise, so "20 ms after the rail is up"
    // is at least 20 ms + the longest rise time; cap the reset at 250 ms.
    const duration longest_rise = por.rise_time.high;
    timing_spec<rc_delay> spec;
    spec.at_least("delay", 20_ms + longest_rise).at_most("delay", 250_ms);

    const auto r_set = value_set<resistance>::from_series(e_series::e24, 1_kohm, 220_kohm);  // 5 %
    const auto c_set = value_set<capacitance>::from_series(e_series::e12, 100_nF, 10_uF);    // 10 %
    const auto result = synthesize(por, spec, {candidates(r_set), candidates(c_set)}, {.top_k = 3});
    if (!result.feasible()) {
        std::printf("no design: %s\n", result.reason.c_str());
        return 1;
    }
    std::printf("power-on reset, reset held >= 20 ms after a rail rising in up to %s\n",
                format(longest_rise).c_str());
    for (const auto& d : result.designs) std::printf("  %s\n", describe(d, spec).c_str());

    // The best design at worst case, with the corner that gives the shortest reset.
    const auto& best = result.designs.front();
    const auto wc = worst_case(best.network);
    std::printf("best: reset released %s .. %s after the rail starts rising\n",
                format(duration::from_value(wc[0].min.value)).c_str(),
                format(duration::from_value(wc[0].max.value)).c_str());
    std::printf("      shortest hold after the rail is up: %s\n",
                format(duration::from_value(wc[0].min.value) - longest_rise).c_str());
    std::printf("      shortest at:");
    for (std::size_t p = 0; p < rc_delay::parameters.size(); ++p)
        if (wc[0].min.positions[p] == corner_position::low || wc[0].min.positions[p] == corner_position::high)
            std::printf(" %s %s;", std::string(rc_delay::parameters[p].name).c_str(),
                        wc[0].min.positions[p] == corner_position::low ? "low" : "high");
    std::printf("\n");
}
