// Tests of synthesis.hpp: a worked case by hand, the fast path against
// exhaustive enumeration on random specs, infeasible specs and their reasons,
// and every returned design re-checked with formulas written here.
#include "approx.hpp"
#include "random_cases.hpp"

#include <tauforge/capacitor_kinds.hpp>
#include <tauforge/networks/rc_delay.hpp>
#include <tauforge/networks/timer_monostable.hpp>
#include <tauforge/networks/timer_astable.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <doctest/doctest.h>

#include <cmath>
#include <cstdint>
#include <random>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

using tauforge_test::unit;

// Uniform [0, 1) from the standardized mt19937_64 sequence (not std::*_distribution).

// Independent worst case of an RC delay to a threshold ratio k of the supply:
// delay = R C ln(1 / (1 - k)) (derivation: V (1 - e^(-t/RC)) = k V), monotone
// increasing in R, C and k, so the extremes sit at the matching ends.
struct delay_bounds {
    double lo, hi;
};
delay_bounds rc_delay_reference(double r, tolerance tr, double c, tolerance tc, double k_lo, double k_hi) {
    return {r * (1 - tr.minus) * c * (1 - tc.minus) * std::log(1.0 / (1.0 - k_lo)),
            r * (1 + tr.plus) * c * (1 + tc.plus) * std::log(1.0 / (1.0 - k_hi))};
}

template <class N>
void check_same_designs(const synthesis_result<N>& fast, const synthesis_result<N>& full) {
    REQUIRE(fast.designs.size() == full.designs.size());
    for (std::size_t i = 0; i < fast.designs.size(); ++i) {
        for (std::size_t s = 0; s < N::design_slots.size(); ++s) {
            CHECK(fast.designs[i].parts[s].value == full.designs[i].parts[s].value);
            CHECK(fast.designs[i].parts[s].tol == full.designs[i].parts[s].tol);
        }
        CHECK(fast.designs[i].margin == full.designs[i].margin);
    }
    CHECK(fast.why == full.why);
}

}  // namespace

TEST_CASE("synthesis: 1 ms delay from E24 resistors and E12 capacitors, worked by hand") {
    // Delay = RC ln 3 (threshold 2/3 of the supply; common practice). Window
    // 1 ms +/- 20 % = [0.8, 1.2] ms. With R +/-5 % and C +/-10 % the product
    // spans RC x [0.95 x 0.90, 1.05 x 1.10] = RC x [0.855, 1.155], so a design
    // holds when 0.855 RC ln 3 >= 0.8 ms and 1.155 RC ln 3 <= 1.2 ms:
    //   RC in [0.85169, 0.94570] ms.
    // E24 x E12 mantissa products in that band (enumerated by hand, x 0.1 ms):
    //   8.58 (2.2 x 3.9, 3.9 x 2.2), 8.84 (1.3 x 6.8), 8.91 (2.7 x 3.3, 3.3 x 2.7),
    //   8.96 (1.6 x 5.6), 9.00 (7.5 x 1.2), 9.02 (1.1 x 8.2), 9.10 (9.1 x 1.0),
    //   9.18 (5.1 x 1.8), 9.30 (6.2 x 1.5), 9.36 (2.4 x 3.9), 9.40 (2.0 x 4.7).
    // Margin = min((0.855 RC ln 3 - 0.8 ms), (1.2 ms - 1.155 RC ln 3)) / 0.2 ms:
    //   9.02: min(0.2363, 0.2772) = 0.2363 (lower edge tight)  <- best
    //   9.00: min(0.2269, 0.2851) = 0.2269
    //   9.10: min(0.2749, 0.2265) = 0.2265 (upper edge tight)
    rc_delay net;
    timing_spec<rc_delay> spec;
    spec.around("delay", 1_ms, tolerance::symmetric(0.20));
    const auto r_set = value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm);
    const auto c_set = value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF);
    const auto result = synthesize(net, spec, {candidates(r_set), candidates(c_set)}, {.top_k = 1000});
    REQUIRE(result.feasible());
    const auto& best = result.designs.front();
    const double ln3 = std::log(3.0);
    CHECK_REL(best.parts[0].value * best.parts[1].value, 0.902e-3, 1e-12);
    CHECK_REL(best.margin, (0.855 * 0.902e-3 * ln3 - 0.8e-3) / 0.2e-3, 1e-9);
    CHECK_FALSE(best.tight_at_high);
    CHECK(best.parts[0].tol == tolerance::symmetric(0.05));  // E24 customary (common practice)
    CHECK(best.parts[1].tol == tolerance::symmetric(0.10));  // E12 customary (common practice)
    // 1.1k x 820n, 11k x 82n, 110k x 8.2n tie on margin, rank and nominal
    // error: the smaller resistor comes first. Then 9.00, then 9.10.
    CHECK_REL(result.designs[0].parts[0].value, 1.1e3, 1e-12);
    CHECK_REL(result.designs[1].parts[0].value, 11e3, 1e-12);
    CHECK_REL(result.designs[2].parts[0].value, 110e3, 1e-12);
    CHECK_REL(result.designs[3].parts[0].value * result.designs[3].parts[1].value, 0.9e-3, 1e-12);
    CHECK_REL(result.designs[3].margin, (0.855 * 0.9e-3 * ln3 - 0.8e-3) / 0.2e-3, 1e-9);
    const std::vector<double> band{8.58, 8.84, 8.91, 8.96, 9.00, 9.02, 9.10, 9.18, 9.30, 9.36, 9.40};
    std::vector<int> seen(band.size(), 0);
    for (std::size_t i = 0; i < result.designs.size(); ++i) {
        const auto& d = result.designs[i];
        // Every design holds by the independent formula ...
        const auto ref = rc_delay_reference(d.parts[0].value, d.parts[0].tol, d.parts[1].value, d.parts[1].tol,
                                            2.0 / 3.0, 2.0 / 3.0);
        CHECK(ref.lo >= 0.8e-3);
        CHECK(ref.hi <= 1.2e-3);
        CHECK_REL(d.worst_min[0], ref.lo, 1e-12);
        CHECK_REL(d.worst_max[0], ref.hi, 1e-12);
        if (i) CHECK(result.designs[i - 1].margin >= d.margin - 1e-9);  // ranked in 1e-9 steps
        // ... and has one of the hand-enumerated products.
        double p = d.parts[0].value * d.parts[1].value * 1e4;
        bool found = false;
        for (std::size_t j = 0; j < band.size(); ++j)
            if (std::abs(p / band[j] - 1) < 1e-9) found = ++seen[j] > 0;
        CHECK(found);
    }
    // ... and every hand-enumerated product is among the designs.
    for (std::size_t j = 0; j < band.size(); ++j) CHECK(seen[j] > 0);
}

TEST_CASE("synthesis: the description names the parts, the worst-case range and the tight edge") {
    rc_delay net;
    timing_spec<rc_delay> spec;
    spec.around("delay", 1_ms, tolerance::symmetric(0.20));
    const auto r = synthesize(net, spec,
                              {candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm)),
                               candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF))},
                              {.top_k = 1});
    REQUIRE(r.feasible());
    CHECK(describe(r.designs[0], spec) ==
          "R = 1.1 k\u03A9, C = 820 nF: delay 847 \u00B5s .. 1.14 ms; margin 23.6 % (delay min)");
}

TEST_CASE("synthesis: fast path returns exactly the exhaustive top-k on 200 random RC delay specs") {
    std::mt19937_64 g(20261201);
    const auto r24 = candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 100_kohm));
    const auto c12 = candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF));
    // A stock list with mixed tolerances breaks the per-line uniform band.
    auto mixed = c12;
    for (std::size_t i = 0; i < mixed.size(); i += 3) mixed[i].tol = tolerance::symmetric(0.02);
    for (int n = 0; n < 200; ++n) {
        rc_delay net;
        net.threshold = ranged<double>::plus_minus(0.5 + 0.3 * unit(g), 0.02 * unit(g));
        timing_spec<rc_delay> spec;
        // Centre log-uniform over the reachable 1 us .. 100 ms, +/- 8..40 %.
        const double centre = 1e-6 * std::pow(10.0, 5.0 * unit(g));
        const double half = 0.08 + 0.32 * unit(g);
        if (n % 5 == 4)
            spec.at_most("delay", duration::from_value(centre));
        else
            spec.around("delay", duration::from_value(centre), tolerance::symmetric(half));
        const std::size_t k = 1 + static_cast<std::size_t>(unit(g) * 12);
        const auto& cset = n % 2 ? mixed : c12;
        const auto fast = synthesize(net, spec, {r24, cset}, {.top_k = k, .method = search_method::fast});
        const auto full = synthesize(net, spec, {r24, cset}, {.top_k = k, .method = search_method::exhaustive});
        INFO("spec " << n << " centre " << centre << " half " << half << " k " << k);
        check_same_designs(fast, full);
        CHECK(fast.evaluated < full.evaluated);
    }
}

TEST_CASE("synthesis: fast path returns exactly the exhaustive top-k on 200 random oscillator specs") {
    // Three parts: Ra, Rb, C; a frequency window and a duty window together.
    // E6 (20 %) parts cannot hold these windows: those specs check the reasons.
    // E12 (10 %) parts can for many of them.
    std::mt19937_64 g(7);
    const auto r6 = candidates(value_set<resistance>::from_series(e_series::e6, 1_kohm, 100_kohm));
    const auto c6 = candidates(value_set<capacitance>::from_series(e_series::e6, 1_nF, 100_nF));
    const auto r12 = candidates(value_set<resistance>::from_series(e_series::e12, 1_kohm, 100_kohm));
    const auto c12 = candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 100_nF));
    // The walk without pruning scores at least one design for each choice of Rb
    // and C (Ra is solved): fewer on average shows the pruning at work.
    std::uint64_t evaluated = 0, lines = 0;
    int feasible = 0;
    for (int n = 0; n < 200; ++n) {
        const auto& rs = n % 2 ? r12 : r6;
        const auto& cs = n % 2 ? c12 : c6;
        timer_astable net;
        timing_spec<timer_astable> spec;
        // f = 1.44 / ((Ra + 2 Rb) C) spans about 50 Hz .. 480 kHz here.
        const double f = 200.0 * std::pow(10.0, 3.0 * unit(g));
        spec.around("frequency", frequency::from_value(f), tolerance::symmetric(0.10 + 0.25 * unit(g)));
        const double duty = 0.52 + 0.4 * unit(g);
        spec.between("duty", duty - 0.05, duty + 0.05);
        const std::size_t k = 1 + static_cast<std::size_t>(unit(g) * 10);
        const auto fast = synthesize(net, spec, {rs, rs, cs}, {.top_k = k, .method = search_method::fast});
        const auto full = synthesize(net, spec, {rs, rs, cs}, {.top_k = k, .method = search_method::exhaustive});
        INFO("spec " << n << " f " << f << " duty " << duty << " k " << k);
        check_same_designs(fast, full);
        if (full.feasible()) ++feasible, evaluated += fast.evaluated, lines += rs.size() * cs.size();
    }
    CHECK(feasible >= 20);
    CHECK(evaluated < lines);
}

TEST_CASE("synthesis: oscillator design holds frequency and duty by the textbook relations") {
    // Common practice (textbook timer relations): t_high = ln 2 (Ra + Rb) C,
    // t_low = ln 2 Rb C with thresholds at 1/3 and 2/3 of the supply.
    timer_astable net;
    timing_spec<timer_astable> spec;
    spec.around("frequency", 2.4_kHz, tolerance::symmetric(0.15)).between("duty", 0.55, 0.65);
    const auto r96 = candidates(value_set<resistance>::from_series(e_series::e96, 1_kohm, 1_Mohm));
    const auto c12 = candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF));
    const auto res = synthesize(net, spec, {r96, r96, c12}, {.top_k = 5});
    REQUIRE(res.feasible());
    for (const auto& d : res.designs) {
        const double ra = d.parts[0].value, rb = d.parts[1].value, c = d.parts[2].value;
        const double tr = 0.01, tc = 0.10;
        // Frequency is decreasing in every part; duty (Ra + Rb) / (Ra + 2 Rb)
        // rises with Ra and falls with Rb.
        const double f_min = 1.0 / (std::log(2.0) * (ra + 2 * rb) * (1 + tr) * c * (1 + tc));
        const double f_max = 1.0 / (std::log(2.0) * (ra + 2 * rb) * (1 - tr) * c * (1 - tc));
        const double d_min = (ra * (1 - tr) + rb * (1 + tr)) / (ra * (1 - tr) + 2 * rb * (1 + tr));
        const double d_max = (ra * (1 + tr) + rb * (1 - tr)) / (ra * (1 + tr) + 2 * rb * (1 - tr));
        CHECK(f_min >= 2.4e3 * 0.85 * (1 - 1e-12));
        CHECK(f_max <= 2.4e3 * 1.15 * (1 + 1e-12));
        CHECK(d_min >= 0.55 - 1e-12);
        CHECK(d_max <= 0.65 + 1e-12);
        CHECK_REL(d.worst_min[timer_astable::frequency], f_min, 1e-12);
        CHECK_REL(d.worst_max[timer_astable::duty], d_max, 1e-12);
    }
}

TEST_CASE("synthesis: a window narrower than the parts' spread is infeasible, and says so") {
    // R +/-5 % and C +/-10 % spread the delay by -14.5 %/+15.5 % alone: a
    // +/-10 % window cannot hold at worst case, whatever the values.
    rc_delay net;
    timing_spec<rc_delay> spec;
    spec.around("delay", 1_ms, tolerance::symmetric(0.10));
    const auto r = synthesize(net, spec,
                              {candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm)),
                               candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF))});
    CHECK_FALSE(r.feasible());
    CHECK(r.why == infeasibility::tolerance_too_wide);
    CHECK(r.reason.rfind("no design holds delay within [900 \u00B5s, 1.1 ms]: the parts' tolerances and operating "
                         "ranges alone spread it wider than the window",
                         0) == 0);
}

TEST_CASE("synthesis: a delay the value sets cannot reach is infeasible, and says so") {
    // R <= 1 Mohm and C <= 1 uF give at most 1 s x ln 3 = 1.1 s.
    rc_delay net;
    timing_spec<rc_delay> spec;
    spec.around("delay", 10_s, tolerance::symmetric(0.5));
    const auto r = synthesize(net, spec,
                              {candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm)),
                               candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF))});
    CHECK_FALSE(r.feasible());
    CHECK(r.why == infeasibility::out_of_reach);
    CHECK(r.reason ==
          "no design holds delay within [5 s, 15 s]: the value sets do not reach it (the closest candidate, "
          "R = 1 M\u03A9, C = 1 \u00B5F, spans 939 ms to 1.27 s, below the minimum)");
}

TEST_CASE("synthesis: invalid specs and options are rejected with their reason") {
    timing_spec<rc_delay> spec;
    CHECK_THROWS_WITH_AS(spec.around("width", 1_ms, tolerance::symmetric(0.1)),
                         "timing_spec: metric = \"width\" is invalid; expected one of \"delay\"", invalid_argument);
    CHECK_THROWS_WITH_AS(spec.around("delay", 1_kohm, tolerance::symmetric(0.1)),
                         "timing_spec: metric \"delay\" is in s; a value in \u03A9 was given", invalid_argument);
    CHECK_THROWS_WITH_AS(spec.between("delay", 2_ms, 1_ms),
                         "timing_spec: delay window [0.002, 0.001] s is invalid; expected low < high",
                         invalid_argument);
    rc_delay net;
    const auto rs = candidates(value_set<resistance>::from_series(e_series::e12, 1_kohm, 10_kohm));
    const auto cs = candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 10_nF));
    CHECK_THROWS_WITH_AS(synthesize(net, spec, {rs, cs}),
                         "synthesize: spec = empty is invalid; expected at least one window", invalid_argument);
    spec.around("delay", 10_us, tolerance::symmetric(0.3));
    CHECK_THROWS_WITH_AS(synthesize(net, spec, {rs, cs}, {.top_k = 0}),
                         "synthesize: top_k = 0 is invalid; expected 1 to 1000", invalid_argument);
    CHECK_THROWS_WITH_AS(synthesize(net, spec, {rs, std::vector<candidate_value>{}}),
                         "synthesize: candidates for slot 1 = empty is invalid; expected at least one value",
                         invalid_argument);
}

TEST_CASE("synthesis: at_least plus at_most on one metric is one window for the reason") {
    // The same +/-10 % window as above, given as two one-sided requirements:
    // still the parts' spread, not the value sets, rules it out.
    rc_delay net;
    timing_spec<rc_delay> spec;
    spec.at_least("delay", 0.9_ms).at_most("delay", 1.1_ms);
    const auto r = synthesize(net, spec,
                              {candidates(value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm)),
                               candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF))});
    CHECK_FALSE(r.feasible());
    CHECK(r.why == infeasibility::tolerance_too_wide);
    CHECK(r.reason.rfind("no design holds delay within [900 \u00B5s, 1.1 ms]: the parts' tolerances", 0) == 0);
}

TEST_CASE("synthesis: candidates the network cannot evaluate fail without ending the search") {
    // A 1 uA leak from the node: with R above (5 V - 3.33 V) / 1 uA = 1.67 Mohm
    // the node never reaches 2/3 of the supply (derivation: the node settles at
    // V - I R). Those candidates fail; the others are still designed.
    rc_delay net;
    net.leakage = ranged<current>::between(0_uA, 1_uA);
    timing_spec<rc_delay> spec;
    spec.around("delay", 100_ms, tolerance::symmetric(0.3));
    const auto rs = candidates(value_set<resistance>::from_series(e_series::e12, 100_kohm, 10_Mohm));
    const auto cs = candidates(value_set<capacitance>::from_series(e_series::e12, 10_nF, 1_uF));
    const auto r = synthesize(net, spec, {rs, cs});
    REQUIRE(r.feasible());
    for (const auto& d : r.designs) CHECK(d.parts[0].value < 1.67e6);
    // Only candidates that cannot work: the reason carries the network's own message.
    const auto big = candidates(value_set<resistance>::from_series(e_series::e12, 2.2_Mohm, 10_Mohm));
    const auto none = synthesize(net, spec, {big, cs});
    CHECK_FALSE(none.feasible());
    CHECK(none.reason.rfind("no design could be evaluated: the closest candidate, R = ", 0) == 0);
}

TEST_CASE("synthesis: the pruned fast path equals exhaustive with spread supply, thresholds and mixed stock lists") {
    // Beyond the parts, the supply (+/- up to 5 %) and both thresholds (+/- up to
    // 0.5 % of the supply) are free corners; C0G capacitors over -20 .. 70 degC add
    // a temperature band. Odd specs use stock lists whose tolerance and series vary
    // along each slot, so a box's ends no longer bound its candidates' intervals.
    std::mt19937_64 g(11);
    const auto r6 = candidates(value_set<resistance>::from_series(e_series::e6, 1_kohm, 100_kohm));
    const auto c12 = candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF));
    auto r_mixed = r6;
    for (std::size_t i = 1; i < r_mixed.size(); i += 3) {
        r_mixed[i].tol = tolerance::symmetric(0.01);
        r_mixed[i].rank = stock_rank;
    }
    auto c_mixed = c12;
    for (std::size_t i = 0; i < c_mixed.size(); i += 4) c_mixed[i].tol = tolerance{0.02, 0.05};
    std::uint64_t evaluated = 0, lines = 0;
    int feasible = 0;
    for (int n = 0; n < 30; ++n) {
        timer_astable net;
        net.supply = ranged<voltage>::around(5_V, tolerance::symmetric(0.05 * unit(g)));
        net.lower_threshold = ranged<double>::plus_minus(1.0 / 3.0, 0.005 * unit(g));
        net.upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, 0.005 * unit(g));
        net.c.tempco = c0g;
        net.conditions = {.t_min = celsius{-20.0}, .t_max = celsius{70.0}};
        timing_spec<timer_astable> spec;
        // f = 1.44 / ((Ra + 2 Rb) C) spans about 5 Hz .. 480 kHz here.
        const double f = 20.0 * std::pow(10.0, 4.0 * unit(g));
        spec.around("frequency", frequency::from_value(f), tolerance::symmetric(0.25 + 0.25 * unit(g)));
        const double duty = 0.55 + 0.35 * unit(g);
        spec.between("duty", duty - 0.06, duty + 0.06);
        const std::size_t k = 1 + static_cast<std::size_t>(unit(g) * 12);
        const auto& rs = n % 2 ? r_mixed : r6;
        const auto& cs = n % 2 ? c_mixed : c12;
        const auto fast = synthesize(net, spec, {rs, rs, cs}, {.top_k = k, .method = search_method::fast});
        const auto full = synthesize(net, spec, {rs, rs, cs}, {.top_k = k, .method = search_method::exhaustive});
        INFO("spec " << n << " f " << f << " duty " << duty << " k " << k);
        check_same_designs(fast, full);
        if (full.feasible()) ++feasible, evaluated += fast.evaluated, lines += rs.size() * cs.size();
    }
    CHECK(feasible >= 10);     // the specs exercise the search, not only the infeasible case
    CHECK(evaluated < lines);  // fewer designs than one per choice of Rb and C: pruned
}

TEST_CASE("synthesis: pruning keeps a design that holds when it sits at the edge of a box") {
    // Stock lists of 13 values at 20 % (E12 1k .. 10k, 1 nF .. 10 nF) with one part
    // at 1 %. A +/-10 % frequency and +/-0.05 duty window around the 1 % parts'
    // nominal holds for them (about 2 % of spread) and for few others: a 20 % C
    // or Rb alone spreads the frequency by more than 10 %. The search
    // halves each list at its middle (indices 6 | 7 of 0 .. 12): place the 1 %
    // parts at either end and on either side of that cut.
    const auto stock = [](auto set, std::size_t tight) {
        auto c = candidates(set);
        for (auto& v : c) v.tol = tolerance::symmetric(0.20), v.rank = stock_rank;
        c[tight].tol = tolerance::symmetric(0.01);
        return c;
    };
    const std::size_t edges[] = {0, 6, 7, 12};
    int checked = 0;
    for (std::size_t i : edges)
        for (std::size_t j : edges)
            for (std::size_t k : edges) {
                const auto ra = stock(value_set<resistance>::from_series(e_series::e12, 1_kohm, 10_kohm), i);
                const auto rb = stock(value_set<resistance>::from_series(e_series::e12, 1_kohm, 10_kohm), j);
                const auto c = stock(value_set<capacitance>::from_series(e_series::e12, 1_nF, 10_nF), k);
                REQUIRE(ra.size() == 13);
                REQUIRE(c.size() == 13);
                // Common practice (textbook timer relations, thresholds 1/3 and 2/3):
                // f = 1 / (ln 2 (Ra + 2 Rb) C), duty = (Ra + Rb) / (Ra + 2 Rb).
                const double a = ra[i].value, b = rb[j].value, cv = c[k].value;
                const double f = 1.0 / (std::log(2.0) * (a + 2 * b) * cv), duty = (a + b) / (a + 2 * b);
                timing_spec<timer_astable> spec;
                spec.around("frequency", frequency::from_value(f), tolerance::symmetric(0.10))
                    .between("duty", duty - 0.05, duty + 0.05);
                const auto fast =
                    synthesize(timer_astable{}, spec, {ra, rb, c}, {.top_k = 3, .method = search_method::fast});
                const auto full =
                    synthesize(timer_astable{}, spec, {ra, rb, c}, {.top_k = 3, .method = search_method::exhaustive});
                INFO("1 % parts at " << i << ", " << j << ", " << k);
                check_same_designs(fast, full);
                bool kept = false;
                for (const auto& d : fast.designs)
                    kept = kept || (d.parts[0].value == a && d.parts[1].value == b && d.parts[2].value == cv);
                CHECK(kept);
                CHECK(fast.evaluated < full.evaluated);
                ++checked;
            }
    CHECK(checked == 64);
}

TEST_CASE("synthesis: pruning ranks ties on margin by the later keys exactly as exhaustive search") {
    // E96 x E96 x E24 over two, two and three decades: many designs share one
    // (Ra + 2 Rb) C and with it the margin (1.05k, 2.49k, 100 nF; its decade copy
    // 10.5k, 24.9k, 10 nF; 7.5k, 13k, 18 nF with the same product); the nominal
    // error and then the values decide between them.
    const auto r = candidates(value_set<resistance>::from_series(e_series::e96, 1_kohm, 100_kohm));
    const auto c = candidates(value_set<capacitance>::from_series(e_series::e24, 100_pF, 100_nF));
    timing_spec<timer_astable> spec;
    spec.around("frequency", 2.4_kHz, tolerance::symmetric(0.15)).between("duty", 0.55, 0.65);
    const auto fast = synthesize(timer_astable{}, spec, {r, r, c}, {.top_k = 12, .method = search_method::fast});
    const auto full = synthesize(timer_astable{}, spec, {r, r, c}, {.top_k = 12, .method = search_method::exhaustive});
    check_same_designs(fast, full);
    REQUIRE(full.designs.size() == 12);
    int ties = 0;
    for (std::size_t i = 1; i < full.designs.size(); ++i) ties += full.designs[i].margin == full.designs[0].margin;
    CHECK(ties >= 2);  // the case the later keys decide is really there
    CHECK(fast.evaluated * 100 < full.evaluated);
}

TEST_CASE("a slot offered as film and as X7R parts: the tight window goes to film, and the notes say why") {
    // One-shot, 1 ms +/- 10 % from -20 to +70 °C. X7R at +/-10 % with its +/-15 % temperature
    // envelope (EIA-198 (from memory)) spreads the width by more than the window on its own:
    // 0.99 x 0.9 x 0.85 .. 1.01 x 1.1 x 1.15 of nominal, about -24/+28 %. PP film at 5 %
    // (-300..-100 ppm/K over 45 K either side of 25 °C: at most 1.35 %) can hold it.
    timer_monostable m;
    m.r = {.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)};
    m.conditions = {.t_min = celsius{-20.0}, .t_max = 70_degC};
    timing_spec<timer_monostable> spec;
    spec.around("pulse width", 1_ms, tolerance::symmetric(0.10));
    const auto r = candidates(value_set<resistance>::from_series(e_series::e96, 10_kohm, 1_Mohm));
    const auto e12 = value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF);
    capacitor x7r_part = make_capacitor(x7r_ceramic, 1_nF);
    x7r_part.rated_voltage = 16_V;
    x7r_part.dc_bias = dc_bias_curve::class2_estimate(16_V, ceramic_case::c0603);
    const auto film = candidates(value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF, tolerance::symmetric(0.05)),
                                 {"PP film", make_capacitor(pp_film, 1_nF)});
    const auto both = merge_candidates(film, candidates(e12, {"X7R ceramic", x7r_part}));

    const auto mixed = synthesize(m, spec, {r, both}, {.top_k = 5});
    REQUIRE(mixed.feasible());
    for (const auto& d : mixed.designs) {
        REQUIRE(d.parts[1].model);
        CHECK(d.parts[1].model->name == "PP film");
        CHECK(std::get<ppm_band>(d.network.c.tempco) == pp_film_tc);  // the design's part is the model's
    }
    REQUIRE(mixed.notes.size() == 2);
    CHECK(mixed.notes[0].rfind("C as PP film: best R = ", 0) == 0);
    CHECK(mixed.notes[1].rfind("C as X7R ceramic: no design holds pulse width within [900 \u00B5s, 1.1 ms]: the "
                               "parts' tolerances and operating ranges alone spread it wider than the window",
                               0) == 0);

    // The same designs as a search over the film parts alone (each kind is searched on its own).
    const auto alone = synthesize(m, spec, {r, film}, {.top_k = 5});
    REQUIRE(alone.designs.size() == mixed.designs.size());
    for (std::size_t i = 0; i < alone.designs.size(); ++i) {
        CHECK(alone.designs[i].parts[0].value == mixed.designs[i].parts[0].value);
        CHECK(alone.designs[i].parts[1].value == mixed.designs[i].parts[1].value);
        CHECK(alone.designs[i].margin == mixed.designs[i].margin);
    }
    CHECK(alone.notes.empty());

    // A capacitor model in a resistor slot is refused.
    CHECK_THROWS_WITH_AS(synthesize(m, spec, {film, both}),
                         "synthesize: candidate model \"PP film\" of slot 0 is invalid; expected a resistor model "
                         "for this slot",
                         tauforge::invalid_argument);
}
