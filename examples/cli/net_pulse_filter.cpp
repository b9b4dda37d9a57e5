// Catalogue entry: the one-stage pulse-train averaging filter (tauforge::pulse_filter).
#include "network_defs.hpp"
#include "pulse_train.hpp"
#include "trace.hpp"

#include <tauforge/networks/pulse_filter.hpp>

namespace tfcli {
namespace {

using pf = tauforge::pulse_filter;

/// One period of the periodic steady state (rc.hpp's periodic_steady_state): from
/// the input's rising edge the output charges towards the high level for T1, then
/// falls towards 0 V for T2.
waveform trace(const pf& n, const point<pf>& x, std::size_t, double t_end) {
    const bool duty = n.input.uses_duty();
    const double v = x[pf::p_high], period = x[pf::p_period];
    const double th = duty ? x[pf::p_duty] * period : x[pf::p_width], tl = period - th;
    const double tau = x[pf::p_r] * x[pf::p_c];
    const auto ss = tauforge::detail::rc::periodic_steady_state(v, 0.0, th, tl, tau);
    trace_builder b("filter output in the steady state", t_end);
    // About its own average, so that the ripple of every corner shows at one scale.
    b.axis("output minus its average", "V", false);
    b.offset(v * th / period);
    b.threshold("average", 0.0);
    b.event("input falls", th);
    b.event("period", period);
    const double end = b.end(period);
    for (double t0 = 0.0; t0 < end && !b.full(); t0 += period) {
        b.segment(t0, th, ss.at_rise, v, tau);
        b.segment(t0 + th, tl, ss.at_fall, 0.0, tau);
    }
    return std::move(b).take();
}

}  // namespace

network_def<pf> pulse_filter_def() {
    network_def<pf> d;
    d.name = "pulse_filter";
    d.title = "RC averaging filter for a pulse train (PWM to DC)";
    d.summary =
        "A rectangular pulse train between 0 V and its high level drives R into C. Metrics: the average output, "
        "the peak-to-peak ripple in the periodic steady state, and the settling time of the envelope after a step.";
    d.aliases = {"pwm-filter", "averaging-filter"};
    d.parts = {{"R", &pf::r, pf::p_r}, {"C", &pf::c, pf::p_c}};
    d.settings = pulse_train_settings<pf>();
    d.default_metric = pf::ripple;
    d.example_parts = {"R=10k,1%", "C=1u,10%"};
    d.example_settings = pulse_train_example_settings;
    d.example_spec = {"ripple<=20mV", "settling<=60ms"};
    d.trace = trace;
    return d;
}

network_entry pulse_filter_entry() { return make_entry(pulse_filter_def()); }

}  // namespace tfcli
