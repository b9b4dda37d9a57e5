// The library without the command line: the worst case of a comparator-timer
// one-shot with R = 100 kΩ ±1 % and C = 10 nF ±10 %, and the corner that decides it.
#include <tauforge/networks/timer_monostable.hpp>
#include <tauforge/tauforge.hpp>

#include <cstdio>

int main() {
    using namespace tauforge;
    using namespace tauforge::literals;
    const timer_monostable one_shot{.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                                    .c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};
    const auto w = worst_case(one_shot)[timer_monostable::pulse_width];
    std::printf("pulse width %s .. %s, nominal %s; shortest at R = %s, C = %s\n",
                format(duration::from_value(w.min.value)).c_str(), format(duration::from_value(w.max.value)).c_str(),
                format(duration::from_value(w.nominal)).c_str(), format(resistance::from_value(w.min.parameters[0])).c_str(),
                format(capacitance::from_value(w.min.parameters[1])).c_str());
}
