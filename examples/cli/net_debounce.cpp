// Catalogue entry: the switch debouncer (tauforge::debounce).
#include "network_defs.hpp"
#include "trace.hpp"

#include <tauforge/networks/debounce.hpp>

namespace tfcli {
namespace {

using db = tauforge::debounce;

/// The press (C discharging through R2 to VT-) or the release (C charging through
/// R1 + R2 to VT+), whichever metric is plotted.
waveform trace(const db& n, const point<db>& x, std::size_t metric, double t_end) {
    const double vdd = x[db::p_supply];
    const double vt_up = db::uses_ratio(n.upper_threshold) ? x[db::p_upper] * vdd : x[db::p_upper_v];
    const double vt_down = db::uses_ratio(n.lower_threshold) ? x[db::p_lower] * vdd : x[db::p_lower_v];
    const auto m = n.evaluate(x);
    trace_builder b("Schmitt input voltage", t_end);
    if (metric == db::press_delay) {
        b.threshold("VT-", vt_down);
        b.event("contact closes", 0.0);
        b.event("press seen", m[db::press_delay]);
        b.segment(0.0, b.end(2.0 * m[db::press_delay]), vdd, 0.0, x[db::p_r2] * x[db::p_c], 240);
    } else {
        b.threshold("VT+", vt_up);
        b.event("contact opens", 0.0);
        b.event("release seen", m[db::release_delay]);
        b.segment(0.0, b.end(2.0 * m[db::release_delay]), 0.0, vdd, (x[db::p_r1] + x[db::p_r2]) * x[db::p_c], 240);
    }
    return std::move(b).take();
}

}  // namespace

network_def<db> debounce_def() {
    network_def<db> d;
    d.name = "debounce";
    d.title = "switch debouncer (R1 pull-up, R2 and C into a Schmitt input)";
    d.summary =
        "The contact shorts its node while pressed: C discharges through R2 (press delay until VT-) and, on "
        "release, charges through R1 + R2 (release delay until VT+). Both delays must outlast the bounce.";
    d.aliases = {"debouncer", "button-debounce"};
    d.parts = {{"R1", &db::r1, db::p_r1}, {"R2", &db::r2, db::p_r2}, {"C", &db::c, db::p_c}};
    d.settings = {
        ranged_setting("supply", "V_dd: 3.3V or 3.3V,5%", &db::supply),
        level_setting("upper-threshold", "VT+ as a ratio of the supply (0.6..0.7) or in volts (1.6V..2.3V)",
                      &db::upper_threshold),
        level_setting("lower-threshold", "VT- as a ratio of the supply (0.3..0.4) or in volts (0.9V..1.4V)",
                      &db::lower_threshold),
    };
    d.default_metric = db::press_delay;
    d.example_parts = {"R1=10k,5%", "R2=47k,5%", "C=330n,10%"};
    d.example_settings = {"upper-threshold=0.6..0.7", "lower-threshold=0.3..0.4"};
    d.example_spec = {"press-delay=10ms..40ms", "release-delay=10ms..40ms"};
    d.trace = trace;
    return d;
}

network_entry debounce_entry() { return make_entry(debounce_def()); }

}  // namespace tfcli
