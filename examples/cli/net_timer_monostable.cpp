// Catalogue entry: the comparator-timer one-shot (tauforge::timer_monostable).
#include "network_defs.hpp"
#include "trace.hpp"

#include <tauforge/networks/timer_monostable.hpp>

namespace tfcli {
namespace {

using tauforge::timer_monostable;
using tm = timer_monostable;

/// Trigger at t = 0: C charges from the held level towards V_cc - I_b R until the
/// threshold; after the propagation delay the switch discharges it again.
waveform trace(const tm& n, const point<tm>& x, std::size_t, double t_end) {
    const double rr = x[tm::p_r], cc = x[tm::p_c], vcc = x[tm::p_supply], vsat = x[tm::p_sat];
    const double ron = x[tm::p_ron], ib = x[tm::p_bias], tpd = x[tm::p_delay];
    const double vth = n.control_voltage ? x[tm::p_control] : x[tm::p_ratio] * vcc;
    const double v_hold = tm::held_level(rr, vcc, vsat, ron, ib), v_final = vcc - ib * rr;
    const double t_cross = tauforge::detail::rc::crossing_time(v_hold, v_final, vth, rr * cc);
    const double t_off = t_cross + tpd;
    const double tau_off = ron > 0.0 ? cc * (rr * ron / (rr + ron)) : 0.0;
    trace_builder b("timing capacitor voltage over one pulse", t_end);
    b.threshold("threshold", vth);
    b.event("trigger", 0.0);
    b.event("pulse ends", t_off);
    const double v_off = b.segment(0.0, t_off, v_hold, v_final, rr * cc, 240);
    const double end = b.end(t_off * 1.2 + 5.0 * tau_off);
    if (tau_off > 0.0) {
        b.segment(t_off, std::min(end - t_off, 5.0 * tau_off), v_off, v_hold, tau_off, 80);
        b.hold(t_off + 5.0 * tau_off, end, tauforge::detail::rc::voltage_at(v_off, v_hold, tau_off, 5.0 * tau_off));
    } else {
        b.hold(t_off, end, v_hold);
    }
    return std::move(b).take();
}

}  // namespace

network_def<tm> timer_monostable_def() {
    network_def<tm> d;
    d.name = "timer_monostable";
    d.title = "comparator-timer one-shot";
    d.summary =
        "A trigger releases C, which charges through R towards the supply; the output pulse ends when the node "
        "reaches the upper threshold (2/3 of the supply for the classic part). Metrics: pulse width, recovery "
        "time (until the discharge switch has settled), retrigger rate.";
    d.aliases = {"one-shot", "monostable", "pulse-stretcher"};
    d.parts = {{"R", &tm::r, tm::p_r}, {"C", &tm::c, tm::p_c}};
    d.settings = {
        ranged_setting("supply", "V_cc: 5V, 4.5V..5.5V or 5V,10%", &tm::supply),
        ranged_setting("threshold", "upper threshold / supply: 2/3, 0.647..0.687 or 2/3+-0.02", &tm::upper_threshold),
        optional_setting("control-voltage", "absolute threshold replacing the ratio: 3.3V..3.4V (off: use threshold)",
                         &tm::control_voltage),
        ranged_setting("saturation", "V_sat of the discharge switch: 0V..0.15V", &tm::discharge_saturation),
        ranged_setting("discharge-resistance", "R_on of the discharge switch: 5..20 (ohms; 0 = ideal, recovery 0)",
                       &tm::discharge_resistance),
        ranged_setting("propagation-delay", "threshold to output delay: 100ns..300ns", &tm::propagation_delay),
        ranged_setting("threshold-bias", "current drawn by the threshold input: 0..250nA", &tm::threshold_bias),
        value_setting("recovery-fraction", "recovery ends within this fraction of the step: 1%", &tm::recovery_fraction),
    };
    d.default_metric = tm::pulse_width;
    d.example_parts = {"R=100k,1%", "C=10n,10%"};
    d.example_spec = {"pulse-width=0.9ms..1.3ms"};
    d.trace = trace;
    return d;
}

network_entry timer_monostable_entry() { return make_entry(timer_monostable_def()); }

}  // namespace tfcli
