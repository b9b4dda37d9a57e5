// Choosing an ADC's sampling time: a 12-bit converter at a 14 MHz ADC clock
// reads a sensor whose output resistance lies between 1 and 10 kOhm. Which of
// the converter's sampling settings settles within half an LSB at worst case, and
// what an external capacitor at the pin does to it. The numbers are invented for
// the demo; take the switch and sampling capacitor ranges from your part's data.
#include <tauforge/networks/adc_settling.hpp>

#include <cstdio>
#include <vector>

int main() {
    using namespace tauforge;
    using namespace tauforge::literals;

    adc_settling in{.source = ranged<resistance>::between(1_kohm, 10_kohm),
                    .switch_resistance = ranged<resistance>::between(500_ohm, 1500_ohm),
                    .sample_capacitance = ranged<capacitance>::between(5_pF, 8_pF),
                    .bits = 12};
    const std::vector<double> settings{1.5, 7.5, 13.5, 28.5, 41.5, 55.5, 71.5, 239.5};  // cycles
    const frequency clock = 14_MHz;

    auto show = [&](const char* what) {
        const auto b = acquisition_bounds(in);
        const auto s = choose_sampling_time(in, clock, settings);
        std::printf("%s: acquisition %s .. %s\n", what, format(duration::from_value(b.time.low)).c_str(),
                    format(duration::from_value(b.time.high)).c_str());
        if (s.found())
            std::printf("  use %g cycles = %s, margin %s (needs %.1f cycles)\n", s.cycles, format(s.window).c_str(),
                        format(s.margin).c_str(), s.cycles_needed);
        else
            std::printf("  %s\n", s.reason.c_str());
    };
    show("no external capacitor");
    in.external = capacitor{.nominal = 10_nF, .tol = tolerance::symmetric(0.10), .tempco = x7r};
    show("10 nF at the pin (shares too little charge, recovers slowly)");
    in.external = capacitor{.nominal = 100_nF, .tol = tolerance::symmetric(0.10), .tempco = x7r};
    show("100 nF at the pin (holds the pin within half an LSB)");
    std::printf("(an external capacitor must be recharged by the source between samples)\n");
}
