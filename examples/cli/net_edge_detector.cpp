// Catalogue entry: the falling-edge trigger (tauforge::edge_detector).
#include "network_defs.hpp"
#include "trace.hpp"

#include <tauforge/networks/edge_detector.hpp>

namespace tfcli {
namespace {

using ed = tauforge::edge_detector;

/// At t = 0 the input falls by the step and carries the node down with it (C cannot
/// change its voltage at once); the pull-up then brings it back towards V_dd.
waveform trace(const ed& n, const point<ed>& x, std::size_t, double t_end) {
    const double vdd = x[ed::p_supply], v = x[ed::p_step], vth = x[ed::p_threshold] * vdd;
    const double tau = x[ed::p_r] * x[ed::p_c], width = n.evaluate(x)[0];
    trace_builder b("trigger node voltage after the falling edge", t_end);
    b.threshold("trigger threshold", vth);
    b.event("edge", 0.0);
    b.event("pulse ends", width);
    b.hold(0.0, 0.0, vdd);
    b.segment(0.0, b.end(3.0 * width), vdd - v, vdd, tau, 240);
    return std::move(b).take();
}

}  // namespace

network_def<ed> edge_detector_def() {
    network_def<ed> d;
    d.name = "edge_detector";
    d.title = "falling-edge trigger (series C, pull-up R)";
    d.summary =
        "A falling input step carries the trigger node below the trigger threshold through a series C; the pull-up "
        "R recovers it. Metric: the pulse width below the threshold, R C ln(V / (V_dd - V_th)).";
    d.aliases = {"edge-trigger", "differentiator"};
    d.parts = {{"R", &ed::r, ed::p_r}, {"C", &ed::c, ed::p_c}};
    d.settings = {
        ranged_setting("supply", "V_dd: 5V or 4.5V..5.5V", &ed::supply),
        ranged_setting("step", "amplitude of the falling input edge: 5V or 4.5V..5.5V", &ed::step),
        ranged_setting("threshold", "trigger level / supply: 1/3 or 0.3..0.37", &ed::threshold),
    };
    d.default_metric = 0;
    d.example_parts = {"R=10k,5%", "C=470p,10%"};
    d.example_spec = {"pulse-width=1us..5us"};
    d.trace = trace;
    return d;
}

network_entry edge_detector_entry() { return make_entry(edge_detector_def()); }

}  // namespace tfcli
