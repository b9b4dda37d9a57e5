// Tests of chains of stages (networks/chain.hpp, networks/links.hpp) and of
// verify (analysis/verify.hpp): tables, evaluation against each stage alone,
// worst-case checks that name the failing constraint and corner, and joint
// synthesis of both stages' parts.
#include "approx.hpp"

#include <tauforge/analysis/verify.hpp>
#include <tauforge/networks/links.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <doctest/doctest.h>

#include <cmath>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

using trigger_chain = designable_chain<edge_detector, timer_monostable, trigger_link>;
using period_chain = designable_chain<pulse_input, timer_monostable, input_period_link>;

edge_detector make_edge() {
    edge_detector e;
    e.r = {.nominal = 10_kohm, .tol = tolerance::symmetric(0.05)};
    e.c = {.nominal = 100_pF, .tol = tolerance::symmetric(0.10)};
    return e;
}

timer_monostable make_one_shot() {
    timer_monostable m;
    m.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)};
    m.c = {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)};
    return m;
}

}  // namespace

TEST_CASE("chain: parameters, metrics and slots carry their stage's name") {
    CHECK(trigger_chain::parameters.size() == edge_detector::parameters.size() + timer_monostable::parameters.size());
    CHECK(trigger_chain::parameters[0].name == "edge detector: R");
    CHECK(trigger_chain::parameters[edge_detector::parameters.size()].name == "one-shot: R");
    CHECK(trigger_chain::parameters[0].unit == "\u03A9");
    CHECK(trigger_chain::metrics[0].name == "edge detector: pulse width");
    CHECK(trigger_chain::metrics[1].name == "one-shot: pulse width");
    CHECK(trigger_chain::metrics.back().name == "trigger / output");
    CHECK(trigger_chain::design_slots[2].name == "one-shot: R");
    CHECK(trigger_chain::design_slots[2].parameter == edge_detector::parameters.size() + timer_monostable::p_r);
    static_assert(SolvableNetwork<trigger_chain>);
}

TEST_CASE("chain: evaluation equals each stage alone, and the link metric is their ratio") {
    const trigger_chain c{{make_edge(), make_one_shot()}};
    const auto r = c.ranges();
    std::array<double, trigger_chain::parameters.size()> x{};
    for (std::size_t i = 0; i < x.size(); ++i) x[i] = r[i].nominal;
    const auto m = c.evaluate(x);
    // Independent: edge pulse below 1/3 after a full falling step = RC ln 1.5,
    // one-shot = RC ln 3 (derivation in rc_test.cpp; common practice).
    const double edge = 10e3 * 100e-12 * std::log(1.5), one_shot = 100e3 * 10e-9 * std::log(3.0);
    CHECK_REL(m[0], edge, 1e-12);
    CHECK_REL(m[1], one_shot, 1e-12);
    CHECK_REL(m.back(), edge / one_shot, 1e-12);
}

TEST_CASE("chain check: an edge detector pulse inside the one-shot's trigger window holds") {
    // Edge 10k/100p: 0.405 us nominal; one-shot 1.1 ms: the ratio stays far below 1.
    const trigger_chain c{{make_edge(), make_one_shot()}};
    const auto v = verify(c, {{"trigger / output", spec_window::at_most(1.0)},
                              {"edge detector: pulse width", spec_window::at_least(0.2_us)}});
    CHECK(v.holds());
    REQUIRE(v.verdicts.size() == 2);
    // Worst-case maximum of the ratio: edge at R, C high over one-shot at R, C low.
    const double worst = (10e3 * 1.05 * 100e-12 * 1.1 * std::log(1.5)) / (100e3 * 0.99 * 10e-9 * 0.9 * std::log(3.0));
    CHECK_REL(v.verdicts[0].worst_max, worst, 1e-9);
}

TEST_CASE("chain check: a trigger pulse longer than the output names the constraint and the corner") {
    // Edge 220k/10n: 0.892 ms nominal against a one-shot of 10k/100n, 1.099 ms:
    // the ratio's worst-case maximum (edge high, one-shot low) is 1.05 > 0.9.
    auto e = make_edge();
    e.r.nominal = 220_kohm;
    e.c.nominal = 10_nF;
    auto m = make_one_shot();
    m.r.nominal = 10_kohm;
    m.c.nominal = 100_nF;
    const trigger_chain c{{e, m}};
    const auto v = verify(c, {{"trigger / output", spec_window::at_most(0.9)}});
    CHECK_FALSE(v.holds());
    const auto f = v.failures();
    REQUIRE(f.size() == 1);
    CHECK(f[0].fails_high);
    CHECK(f[0].corner == "edge detector: R high, edge detector: C high, one-shot: R low, one-shot: C low");
    CHECK(f[0].message.rfind("trigger / output fails: maximum ", 0) == 0);
    CHECK(f[0].message.find("is above 0.9 at edge detector: R high") != std::string::npos);
    const double worst = (220e3 * 1.05 * 10e-9 * 1.1 * std::log(1.5)) / (10e3 * 0.99 * 100e-9 * 0.9 * std::log(3.0));
    CHECK_REL(f[0].worst_max, worst, 1e-9);
}

TEST_CASE("chain check: a one-shot averaging a pulse train stays below 90 % of the shortest period") {
    // Common practice: width <= 90 % of the shortest input period. Input 1.0 ..
    // 1.25 ms (800 Hz .. 1 kHz); one-shot 100k/8.2n: 0.901 ms nominal, up to
    // 100k x 1.01 x 8.2n x 1.1 x ln 3 = 1.0009 ms at worst case: 1.0009 / 1.0 > 0.9.
    period_chain c;
    c.first.period = ranged<duration>::between(1.0_ms, 1.25_ms);
    c.second = make_one_shot();
    c.second.c.nominal = 8.2_nF;
    auto v = verify(c, {{"width / period", spec_window::at_most(averaging_width_fraction)}});
    CHECK_FALSE(v.holds());
    CHECK_REL(v.verdicts[0].worst_max, 100e3 * 1.01 * 8.2e-9 * 1.1 * std::log(3.0) / 1e-3, 1e-9);
    CHECK(v.verdicts[0].corner == "input: period low, one-shot: R high, one-shot: C high");
    // With 6.8 nF the worst case is 0.830 ms / 1 ms: it holds.
    c.second.c.nominal = 6.8_nF;
    v = verify(c, {{"width / period", spec_window::at_most(averaging_width_fraction)}});
    CHECK(v.holds());
}

TEST_CASE("chain synthesis chooses both stages' parts together; fast path equals exhaustive") {
    // One-shot 1 ms +/- 25 %, edge pulse at least 1 us (common practice: trigger
    // pulses of about 1-10 us), and the trigger shorter than half the output.
    trigger_chain c{{make_edge(), make_one_shot()}};
    timing_spec<trigger_chain> spec;
    spec.around("one-shot: pulse width", 1_ms, tolerance::symmetric(0.25))
        .between("edge detector: pulse width", 1_us, 10_us)
        .at_most("trigger / output", 0.5);
    // E24 resistors (5 %), E12 capacitors (10 %; customary, common practice).
    const auto r = candidates(value_set<resistance>::from_series(e_series::e24, 10_kohm, 100_kohm));
    const auto c_edge = candidates(value_set<capacitance>::from_series(e_series::e12, 100_pF, 1_nF));
    const auto c_os = candidates(value_set<capacitance>::from_series(e_series::e12, 10_nF, 100_nF));
    const auto fast = synthesize(c, spec, {r, c_edge, r, c_os}, {.top_k = 5, .method = search_method::fast});
    const auto full = synthesize(c, spec, {r, c_edge, r, c_os}, {.top_k = 5, .method = search_method::exhaustive});
    REQUIRE(fast.feasible());
    REQUIRE(fast.designs.size() == full.designs.size());
    for (std::size_t i = 0; i < fast.designs.size(); ++i)
        for (std::size_t s = 0; s < 4; ++s) CHECK(fast.designs[i].parts[s].value == full.designs[i].parts[s].value);
    // Each design re-checked with the relations written here.
    for (const auto& d : fast.designs) {
        const double er = d.parts[0].value, ec = d.parts[1].value, mr = d.parts[2].value, mc = d.parts[3].value;
        const double edge_lo = er * 0.95 * ec * 0.9 * std::log(1.5), edge_hi = er * 1.05 * ec * 1.1 * std::log(1.5);
        const double os_lo = mr * 0.95 * mc * 0.9 * std::log(3.0), os_hi = mr * 1.05 * mc * 1.1 * std::log(3.0);
        CHECK(os_lo >= 0.75e-3 * (1 - 1e-12));
        CHECK(os_hi <= 1.25e-3 * (1 + 1e-12));
        CHECK(edge_lo >= 1e-6 * (1 - 1e-12));
        CHECK(edge_hi <= 10e-6 * (1 + 1e-12));
        CHECK(edge_hi / os_lo <= 0.5 * (1 + 1e-12));
    }
}

TEST_CASE("verify rejects unknown metrics and invalid windows") {
    const trigger_chain c{{make_edge(), make_one_shot()}};
    CHECK_THROWS_WITH_AS(verify(c, {{"width", spec_window::at_most(1.0)}}),
                         "verify: metric = \"width\" is invalid; expected one of \"edge detector: pulse width\", "
                         "\"one-shot: pulse width\", \"one-shot: recovery time\", \"one-shot: retrigger rate\", "
                         "\"trigger / output\"",
                         invalid_argument);
}
