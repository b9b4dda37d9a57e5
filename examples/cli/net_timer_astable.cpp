// Catalogue entry: the comparator-timer oscillator (tauforge::timer_astable).
#include "network_defs.hpp"
#include "trace.hpp"

#include <tauforge/networks/timer_astable.hpp>

namespace tfcli {
namespace {

using ta = tauforge::timer_astable;

/// Steady state from the start of a high phase: C charges from the lower to the
/// upper threshold (through Ra + Rb, or through Ra alone below the diode's knee),
/// then discharges through Rb towards V_sat; repeated up to the plot's end.
waveform trace(const ta& n, const point<ta>& x, std::size_t, double t_end) {
    const double ra = x[0], rb = x[1], c = x[2], vs = x[3], vl = x[4] * vs, vh = x[5] * vs, vsat = x[6], vd = x[7];
    const auto times = n.evaluate(x);
    const double th = times[ta::high_time], tl = times[ta::low_time], period = th + tl;
    trace_builder b("timing capacitor voltage over one period", t_end);
    b.threshold("lower threshold", vl);
    b.threshold("upper threshold", vh);
    b.event("high ends", th);
    b.event("period", period);
    const double end = b.end(period);
    for (double t0 = 0.0; t0 < end && !b.full(); t0 += period) {
        if (n.steering_diode) {
            const double knee = vs - vd * (1.0 + ra / rb);
            if (vl < knee) {
                const double v_top = std::min(knee, vh);
                const double t1 = ra * c * tauforge::detail::rc::crossing_time(vl, vs - vd, v_top, 1.0);
                b.segment(t0, t1, vl, vs - vd, ra * c, 120);
                if (v_top < vh) b.segment(t0 + t1, th - t1, knee, vs, (ra + rb) * c, 60);
            } else {
                b.segment(t0, th, vl, vs, (ra + rb) * c);
            }
        } else {
            b.segment(t0, th, vl, vs, (ra + rb) * c);
        }
        b.segment(t0 + th, tl, vh, vsat, rb * c);
    }
    return std::move(b).take();
}

}  // namespace

network_def<ta> timer_astable_def() {
    network_def<ta> d;
    d.name = "timer_astable";
    d.title = "comparator-timer oscillator";
    d.summary =
        "C charges through Ra + Rb from the lower to the upper threshold (output high) and discharges through Rb "
        "(output low). Metrics: high time, low time, period, frequency and duty (the high fraction).";
    d.aliases = {"astable", "timer-oscillator"};
    d.parts = {{"Ra", &ta::ra, 0}, {"Rb", &ta::rb, 1}, {"C", &ta::c, 2}};
    d.settings = {
        ranged_setting("supply", "V_cc: 5V, 4.5V..5.5V or 5V,10%", &ta::supply),
        ranged_setting("lower-threshold", "trigger level / supply: 1/3 or 0.32..0.35", &ta::lower_threshold),
        ranged_setting("upper-threshold", "threshold level / supply: 2/3 or 0.65..0.68", &ta::upper_threshold),
        ranged_setting("saturation", "V_sat of the discharge switch: 0V..0.15V", &ta::discharge_saturation),
        switch_setting("steering-diode", "a diode across Rb (duty below 50 %): on or off", &ta::steering_diode),
        ranged_setting("diode-drop", "forward drop of the steering diode: 0.6V..0.75V", &ta::diode_drop),
    };
    d.default_metric = ta::frequency;
    d.example_parts = {"Ra=1.78k,1%", "Rb=4.12k,1%", "C=10n,5%"};
    d.example_spec = {"frequency=13kHz..16kHz"};
    d.trace = trace;
    return d;
}

network_entry timer_astable_entry() { return make_entry(timer_astable_def()); }

}  // namespace tfcli
