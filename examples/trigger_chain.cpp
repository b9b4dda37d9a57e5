// A chain of stages: an RC edge detector turns a falling input edge into the
// trigger pulse of a comparator-timer one-shot that stretches it to 5 ms +/- 25 %. The
// trigger pulse must last 1-10 us (common practice for such edge detectors) and
// end before half the output pulse; both stages' parts are chosen together and
// the chain is verified at worst case. The numbers are invented for the demo.
// Results are design estimates: verify on hardware.
#include <tauforge/tauforge.hpp>

#include <cstdio>

int main() {
    using namespace tauforge;
    using namespace tauforge::literals;

    designable_chain<edge_detector, timer_monostable, trigger_link> net;
    net.first.supply = net.second.supply = ranged<voltage>::between(4.5_V, 5.5_V);
    net.first.step = ranged<voltage>::between(4.5_V, 5.5_V);
    net.second.upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, 0.02);

    timing_spec<decltype(net)> spec;
    spec.around("one-shot: pulse width", 5_ms, tolerance::symmetric(0.25))
        .between("edge detector: pulse width", 1_us, 10_us)
        .at_most("trigger / output", 0.5);

    const auto r = candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm));
    const auto r_timer = candidates(value_set<resistance>::from_series(e_series::e96, 1_kohm, 1_Mohm));
    const auto c_edge = candidates(value_set<capacitance>::from_series(e_series::e12, 100_pF, 10_nF));
    const auto c_timer = candidates(value_set<capacitance>::from_series(e_series::e12, 10_nF, 1_uF));
    const auto result = synthesize(net, spec, {r, c_edge, r_timer, c_timer}, {.top_k = 1});
    if (!result.feasible()) {
        std::printf("no design: %s\n", result.reason.c_str());
        return 1;
    }
    const auto& best = result.designs.front();
    std::printf("%s\n", describe(best, spec).c_str());

    // The same chain, proved with the full worst-case search.
    const auto proof = verify(best.network, {{"one-shot: pulse width", spec_window::between(3.75_ms, 6.25_ms)},
                                             {"edge detector: pulse width", spec_window::between(1_us, 10_us)},
                                             {"trigger / output", spec_window::at_most(0.5)}});
    for (const auto& v : proof.verdicts) std::printf("  %s\n", v.message.c_str());
    return proof.holds() ? 0 : 1;
}
