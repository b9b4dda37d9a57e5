// Catalogue entry: a sampling ADC's input (tauforge::adc_settling). Nothing to
// design here (the source and the converter are given), so: check, limits, readback.
#include "network_defs.hpp"
#include "trace.hpp"

#include <tauforge/detail/two_stage.hpp>
#include <tauforge/networks/adc_settling.hpp>

#include <cmath>

namespace tfcli {
namespace {

using as = tauforge::adc_settling;

/// The sampling capacitor per volt of a full-scale step: 1 - e^(-t/tau) without an
/// external capacitor, 1 - Phi22(t) with one (charge sharing, then recovery through
/// the source; two_stage.hpp, its exponentials from rc.hpp).
waveform trace(const as& n, const point<as>& x, std::size_t, double t_end) {
    const double rs = x[as::p_source], rsw = x[as::p_switch], cs = x[as::p_sample], ce = x[as::p_external];
    const double t_acq = n.evaluate(x)[0];
    // The remaining error, a fraction of the full-scale step, on a logarithmic axis:
    // e^(-t/tau) without an external capacitor, Phi22(t) with one.
    trace_builder b("sampling capacitor's error after a full-scale step", t_end);
    b.axis("error, fraction of full scale", "", true);
    b.threshold("half an LSB", std::ldexp(1.0, -(n.bits + 1)));
    b.event("settled", t_acq);
    const double end = b.end(1.25 * t_acq);
    if (ce == 0.0 || rs == 0.0) {
        b.segment(0.0, end, 1.0, 0.0, (ce == 0.0 ? rs + rsw : rsw) * cs, 240);
    } else {
        const auto m = tauforge::detail::two_stage::ladder_modes(rs, ce, rsw, cs);
        b.sampled(0.0, end, [&](double t) { return tauforge::detail::two_stage::phi22(m, t); }, 240);
    }
    return std::move(b).take();
}

}  // namespace

network_def<as> adc_settling_def() {
    network_def<as> d;
    d.name = "adc_settling";
    d.title = "sampling ADC input settling to half an LSB";
    d.summary =
        "A source Rs drives the pin; the sampling switch Rsw connects the sampling capacitor Cs, a full scale away. "
        "An optional external capacitor Ce at the pin shares its charge. Metric: the acquisition time to settle "
        "within half an LSB of an N-bit conversion.";
    d.aliases = {"adc-input", "acquisition"};
    d.parts = {{"Ce", &as::external, as::p_external, [](const as& n) { return !n.external.has_value(); }}};
    d.settings = {
        ranged_setting("source", "source resistance Rs: 0 .. 10k (ohms)", &as::source),
        ranged_setting("switch-resistance", "sampling switch Rsw: 500..1.5k (ohms)", &as::switch_resistance),
        ranged_setting("sample-capacitance", "sampling capacitor Cs: 5p..8p", &as::sample_capacitance),
        count_setting("bits", "resolution N: 12", &as::bits, 1, 32),
    };
    d.default_metric = 0;
    d.example_parts = {"Ce=1n,10%,C0G"};
    d.example_settings = {"source=100..470", "switch-resistance=500..1.5k", "sample-capacitance=5p..8p", "bits=12"};
    d.example_spec = {"acquisition-time<=5us"};
    d.trace = trace;
    return d;
}

network_entry adc_settling_entry() { return make_entry(adc_settling_def()); }

}  // namespace tfcli
