// Catalogue entry: the RC delay (tauforge::rc_delay).
#include "network_defs.hpp"
#include "trace.hpp"

#include <tauforge/networks/rc_delay.hpp>

namespace tfcli {
namespace {

using rd = tauforge::rc_delay;

/// The node from 0 V as the supply steps (or ramps) up, with leakage and the
/// capacitor's insulation folded into one source by rc.hpp's Thevenin helpers.
waveform trace(const rd& n, const point<rd>& x, std::size_t, double t_end) {
    using namespace tauforge;
    const double vs = x[rd::p_supply], rise = x[rd::p_rise], leak = x[rd::p_leak], g = x[rd::p_shunt];
    const double vth = n.threshold_voltage ? x[rd::p_vth] : x[rd::p_ratio] * vs;
    const auto r = resistance::from_value(x[rd::p_r]);
    const auto c = capacitance::from_value(x[rd::p_c]);
    auto reduce = [&](double u) {
        const rc_drive a = with_leakage_current(voltage::from_value(u), r, c, current::from_value(leak));
        if (g == 0.0) return a;
        return with_shunt(a.v_final, r, c, resistance::from_value(1.0 / g));
    };
    const rc_drive begin = reduce(0.0), final_drive = reduce(vs);
    const double tau = final_drive.tau.value(), v_begin = begin.v_final.value(), v_end = final_drive.v_final.value();
    const double delay = n.evaluate(x)[0];
    trace_builder b("delay capacitor voltage as the supply rises", t_end);
    b.threshold("threshold", vth);
    b.event("delay", delay);
    const double end = b.end(1.6 * delay);
    if (rise == 0.0) {
        b.segment(0.0, end, 0.0, v_end, tau, 240);
    } else {
        b.sampled(0.0, end, [&](double t) { return detail::rc::ramp_voltage_at(v_begin, v_end, rise, 0.0, tau, t); }, 240);
    }
    return std::move(b).take();
}

}  // namespace

network_def<rd> rc_delay_def() {
    network_def<rd> d;
    d.name = "rc_delay";
    d.title = "RC delay (power-on reset, enable delay)";
    d.summary =
        "The supply steps or ramps up from 0 V and charges C through R until the node crosses a logic threshold; "
        "pin leakage lowers the level the node approaches. Metric: delay from the start of the rise.";
    d.aliases = {"delay", "reset-delay", "power-on-reset"};
    d.parts = {{"R", &rd::r, rd::p_r, [](const rd& n) { return n.internal_pullup.has_value(); }}, {"C", &rd::c, rd::p_c}};
    d.settings = {
        ranged_setting("supply", "final supply voltage: 3.3V, 3.135V..3.465V or 3.3V,5%", &rd::supply),
        ranged_setting("threshold", "crossing level / supply: 2/3, 0.6..0.7", &rd::threshold),
        optional_setting("threshold-voltage", "absolute crossing level replacing the ratio: 1.4V..1.8V (off)",
                         &rd::threshold_voltage),
        ranged_setting("rise-time", "time the supply takes to rise from 0 V: 0 (a step), 1ms..5ms", &rd::rise_time),
        optional_setting("internal-pullup", "a pin's internal pull-up replacing R: 30k..80k (off)", &rd::internal_pullup),
        ranged_setting("leakage", "current drawn from the node: 0..1uA", &rd::leakage),
    };
    d.default_metric = 0;
    d.example_parts = {"R=10k,5%", "C=100n,10%"};
    d.example_spec = {"delay=0.8ms..1.4ms"};
    d.trace = trace;
    return d;
}

network_entry rc_delay_entry() { return make_entry(rc_delay_def()); }

}  // namespace tfcli
