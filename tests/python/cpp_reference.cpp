// The C++ side of tests/python/test_same_as_cpp.py: the library's API called directly
// (no catalogue, no text), on the inputs that test gives the Python module, printing
// every number as JSON with 17 significant digits so the comparison is exact.
#include <tauforge/tauforge.hpp>

#include <nlohmann/json.hpp>

#include <array>
#include <cstddef>
#include <cstdio>

/// The network with its fixed parameters held at their value while one is stepped:
/// the module (like the command line) takes sensitivities and RSS on this, since a
/// parameter fixed at 0 (a bias current) stepped by the library's absolute 1e-4
/// leaves the network's valid range.
template <class N>
struct pinned {
    static constexpr auto parameters = N::parameters;
    static constexpr auto metrics = N::metrics;
    const N* net;
    std::array<tauforge::interval, N::parameters.size()> r;
    auto ranges() const { return r; }
    auto evaluate(std::array<double, N::parameters.size()> x) const {
        for (std::size_t j = 0; j < x.size(); ++j)
            if (r[j].is_fixed()) x[j] = r[j].nominal;
        return net->evaluate(x);
    }
};

int main() {
    using namespace tauforge;
    using namespace tauforge::literals;
    nlohmann::json out;

    out["crossing_time"] = crossing_time(0_V, 5_V, 5.0_V * 2.0 / 3.0, 100_kohm * 10_nF).value();

    // synthesize: the README's 1 ms delay, E24 resistors, E12 capacitors, top 3.
    {
        rc_delay net;
        timing_spec<rc_delay> spec;
        spec.around("delay", 1_ms, tolerance::symmetric(0.20));
        const auto r = value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm);
        const auto c = value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF);
        const auto res = synthesize(net, spec, {candidates(r), candidates(c)}, {.top_k = 3});
        for (const auto& d : res.designs)
            out["synthesize"].push_back({{"R", d.parts[0].value}, {"C", d.parts[1].value}, {"margin", d.margin},
                                         {"worst_min", d.worst_min[0]}, {"worst_max", d.worst_max[0]}});
        out["synthesize_evaluated"] = res.evaluated;
    }

    // The one-shot of the catalogue's example: R 100 kΩ ±1 %, C 10 nF ±10 %, 5 V, 2/3.
    timer_monostable one;
    one.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)};
    one.c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)};
    const auto wc = worst_case(one);
    out["worst_case"] = {wc[0].nominal, wc[0].min.value, wc[0].max.value};
    const pinned<timer_monostable> held{&one, one.ranges()};
    const auto rs = rss(held);
    out["rss"] = {rs[0].sigma, rs[0].low, rs[0].high};
    const auto sens = sensitivity(held);
    out["sensitivity"] = {sens.normalized[0][0], sens.normalized[0][1]};

    monte_carlo_options<timer_monostable> mo;
    mo.seed = 7;
    mo.samples = 20000;
    mo.worst_samples = 0;
    mo.keep_distribution = true;
    mo.spec[0] = spec_window::between(0.9_ms, 1.3_ms);
    const auto mc = monte_carlo(one, mo);
    out["monte_carlo"] = {{"yield", {mc.yield.estimate, mc.yield.low, mc.yield.high}},
                          {"mean", mc[0].mean},
                          {"stddev", mc[0].stddev},
                          {"min", mc[0].min},
                          {"max", mc[0].max},
                          {"median", mc[0].percentiles[2].value}};
    const auto limits = production_test_limits(mc[0], mo.spec[0], {10e-6, 2.0});
    out["test_limits"] = {*limits.acceptance.low, *limits.acceptance.high, limits.rates.false_reject_rate};
    const auto est = estimate_parameter(one, timer_monostable::p_c, timer_monostable::pulse_width, 1.05e-3, {5e-6, 2.0});
    out["read_back"] = {est.nominal, est.low, est.high};

    std::printf("%s\n", out.dump().c_str());
}
