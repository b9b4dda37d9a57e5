// Catalogue entry: the two-stage pulse-train averaging filter (tauforge::two_stage_pulse_filter).
#include "network_defs.hpp"
#include "pulse_train.hpp"
#include "trace.hpp"

#include <tauforge/detail/two_stage.hpp>
#include <tauforge/networks/pulse_filter.hpp>

namespace tfcli {
namespace {

using tf = tauforge::two_stage_pulse_filter;

/// One period of the output's periodic steady state: the ladder's two modes are
/// each a first-order stage driven between (gain x high level) and 0 V, so each is
/// rc.hpp's periodic steady state and the output is their sum (two_stage.hpp).
waveform trace(const tf& n, const point<tf>& x, std::size_t, double t_end) {
    namespace rc = tauforge::detail::rc;
    const bool duty = n.input.uses_duty();
    const double v = x[tf::p_high], period = x[tf::p_period];
    const double th = duty ? x[tf::p_duty] * period : x[tf::p_width], tl = period - th;
    const auto m = tauforge::detail::two_stage::ladder_modes(x[tf::p_r1], x[tf::p_c1], x[tf::p_r2], x[tf::p_c2]);
    const auto s = rc::periodic_steady_state(m.gain_slow * v, 0.0, th, tl, m.tau_slow);
    const auto f = rc::periodic_steady_state(m.gain_fast * v, 0.0, th, tl, m.tau_fast);
    trace_builder b("second-stage output in the steady state", t_end);
    // About its own average, so that the ripple of every corner shows at one scale.
    b.axis("output minus its average", "V", false);
    b.offset(v * th / period);
    b.threshold("average", 0.0);
    b.event("input falls", th);
    b.event("period", period);
    const double end = b.end(period);
    for (double t0 = 0.0; t0 < end && !b.full(); t0 += period) {
        b.sampled(t0, th, [&](double t) {
            return rc::voltage_at(s.at_rise, m.gain_slow * v, m.tau_slow, t) + rc::voltage_at(f.at_rise, m.gain_fast * v, m.tau_fast, t);
        });
        b.sampled(t0 + th, tl, [&](double t) {
            return rc::voltage_at(s.at_fall, 0.0, m.tau_slow, t) + rc::voltage_at(f.at_fall, 0.0, m.tau_fast, t);
        });
    }
    return std::move(b).take();
}

}  // namespace

network_def<tf> two_stage_pulse_filter_def() {
    network_def<tf> d;
    d.name = "two_stage_pulse_filter";
    d.title = "two-stage RC averaging filter for a pulse train";
    d.summary =
        "The pulse train drives R1 into C1, R2 runs from C1 to C2 (the second stage loads the first), the output is "
        "C2. Metrics: average, peak-to-peak ripple in the steady state, settling time of the envelope.";
    d.aliases = {"two-stage-filter", "pwm-filter-2"};
    d.parts = {{"R1", &tf::r1, tf::p_r1}, {"C1", &tf::c1, tf::p_c1}, {"R2", &tf::r2, tf::p_r2}, {"C2", &tf::c2, tf::p_c2}};
    d.settings = pulse_train_settings<tf>();
    d.default_metric = tf::ripple;
    d.example_parts = {"R1=10k,1%", "C1=100n,10%", "R2=10k,1%", "C2=100n,10%"};
    d.example_settings = pulse_train_example_settings;
    d.example_spec = {"ripple<=5mV", "settling<=20ms"};
    // Four parts over the default sets are 73 x 49 x 73 x 49 combinations, each with a
    // full worst-case search (the duty makes the corners not bounds): minutes. E6 over
    // two decades each keeps the example to about a second.
    d.example_resistors = "E6,1k..100k";
    d.example_capacitors = "E6,10n..1u";
    d.trace = trace;
    return d;
}

network_entry two_stage_pulse_filter_entry() { return make_entry(two_stage_pulse_filter_def()); }

}  // namespace tfcli
