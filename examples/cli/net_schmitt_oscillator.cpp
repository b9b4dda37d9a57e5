// Catalogue entry: the Schmitt-trigger RC oscillator (tauforge::schmitt_oscillator).
#include "network_defs.hpp"
#include "trace.hpp"

#include <tauforge/networks/schmitt_oscillator.hpp>

#include <variant>

namespace tfcli {
namespace {

using so = tauforge::schmitt_oscillator;

/// From the start of a high phase: C charges through R from VT- towards V_OH up to
/// VT+, then discharges towards V_OL down to VT-; repeated up to the plot's end.
waveform trace(const so& n, const point<so>& x, std::size_t, double t_end) {
    const double vdd = x[so::p_supply];
    const bool up_ratio = std::holds_alternative<tauforge::ranged<double>>(n.upper_threshold);
    const bool lo_ratio = std::holds_alternative<tauforge::ranged<double>>(n.lower_threshold);
    const double vtp = up_ratio ? x[so::p_upper_ratio] * vdd : x[so::p_upper];
    const double vtm = lo_ratio ? x[so::p_lower_ratio] * vdd : x[so::p_lower];
    const double voh = vdd - x[so::p_drop], vol = x[so::p_low], tau = x[so::p_r] * x[so::p_c];
    const auto m = n.evaluate(x);
    const double th = m[so::high_time], tl = m[so::low_time], period = th + tl;
    trace_builder b("timing capacitor voltage over one period", t_end);
    b.threshold("VT-", vtm);
    b.threshold("VT+", vtp);
    b.event("high ends", th);
    b.event("period", period);
    const double end = b.end(period);
    for (double t0 = 0.0; t0 < end && !b.full(); t0 += period) {
        b.segment(t0, th, vtm, voh, tau);
        b.segment(t0 + th, tl, vtp, vol, tau);
    }
    return std::move(b).take();
}

}  // namespace

network_def<so> schmitt_oscillator_def() {
    network_def<so> d;
    d.name = "schmitt_oscillator";
    d.title = "Schmitt-trigger RC oscillator";
    d.summary =
        "An inverter with hysteresis, R from its output to its input and C from the input to ground: C swings "
        "between VT- and VT+. Metrics: high time, low time, period, frequency and duty (the high fraction).";
    d.aliases = {"schmitt", "relaxation-oscillator"};
    d.parts = {{"R", &so::r, so::p_r}, {"C", &so::c, so::p_c}};
    d.settings = {
        ranged_setting("supply", "V_dd: 5V, 4.5V..5.5V or 3.3V,10%", &so::supply),
        level_setting("upper-threshold", "VT+ as a ratio of the supply (0.55..0.7) or in volts (2.9V..3.4V)",
                      &so::upper_threshold),
        level_setting("lower-threshold", "VT- as a ratio of the supply (0.3..0.45) or in volts (1.6V..2.1V)",
                      &so::lower_threshold),
        ranged_setting("output-high-drop", "V_dd - V_OH: 0V..0.2V", &so::output_high_drop),
        ranged_setting("output-low", "V_OL: 0V..0.2V", &so::output_low),
    };
    d.default_metric = so::frequency;
    d.example_parts = {"R=10k,1%", "C=100n,5%"};
    d.example_settings = {"upper-threshold=0.6..0.7", "lower-threshold=0.3..0.4"};
    d.example_spec = {"frequency=500Hz..1.4kHz"};
    d.trace = trace;
    return d;
}

network_entry schmitt_oscillator_entry() { return make_entry(schmitt_oscillator_def()); }

}  // namespace tfcli
