// A push button debounced by R1, R2 and C into a Schmitt-trigger input: both
// the press and the release delay must outlast a 10 ms bounce and stay below a
// 60 ms response limit at every corner of tolerance, supply (3.0-3.6 V) and the
// input's threshold spread (1/3 .. 2/3 of the supply, both with +/-0.05 spread).
// The numbers are invented for the demo. Results are design estimates: verify on
// hardware with the real switch.
#include <tauforge/tauforge.hpp>

#include <cstdio>

int main() {
    using namespace tauforge;
    using namespace tauforge::literals;

    debounce net;
    net.supply = ranged<voltage>::between(3.0_V, 3.6_V);
    net.upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, 0.05);
    net.lower_threshold = ranged<double>::plus_minus(1.0 / 3.0, 0.05);
    net.conditions = {.t_min = -20.0_degC, .t_max = 70.0_degC};

    timing_spec<debounce> spec;
    spec.between("press delay", 10_ms, 60_ms).between("release delay", 10_ms, 60_ms);

    const auto r = candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm));
    const auto c = candidates(value_set<capacitance>::from_series(e_series::e12, 10_nF, 10_uF));
    const auto result = synthesize(net, spec, {r, r, c}, {.top_k = 3});
    if (!result.feasible()) {
        std::printf("no design: %s\n", result.reason.c_str());
        return 1;
    }
    for (const auto& d : result.designs) std::printf("%s\n", describe(d, spec).c_str());

    // The best design, checked again by the network's own requirement check.
    const auto check = check_debounce(result.designs.front().network, 10_ms, 60_ms);
    std::printf("press %s .. %s, release %s .. %s: %s\n", format(duration::from_value(check.press.low)).c_str(),
                format(duration::from_value(check.press.high)).c_str(),
                format(duration::from_value(check.release.low)).c_str(),
                format(duration::from_value(check.release.high)).c_str(), check.holds() ? "holds" : "FAILS");
    return check.holds() ? 0 : 1;
}
