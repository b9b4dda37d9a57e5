// Tests of analysis/worst_case.hpp: REFERENCES.md one-shot extremes ("computed"),
// interior extrema placed by construction, and a dense brute-force grid.
#include "approx.hpp"
#include "random_cases.hpp"

#include <tauforge/analysis/function_network.hpp>
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/timer_astable.hpp>
#include <tauforge/networks/timer_monostable.hpp>
#include <tauforge/parts.hpp>
#include <tauforge/rc.hpp>

#include <doctest/doctest.h>

#include <chrono>
#include <cmath>
#include <cstring>
#include <random>
#include <utility>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

// A one-shot: charging from 0 towards the supply (1, the threshold is a ratio of
// it) through R into C; width = R C ln(1 / (1 - ratio)), from rc.hpp.
struct one_shot {
    static constexpr std::array<quantity_info, 3> parameters{{{"R", "\u03A9"}, {"C", "F"}, {"ratio", ""}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"width", "s"}}};
    resistor r;
    capacitor c;
    ranged<double> ratio = ranged<double>::exactly(2.0 / 3.0);
    std::array<interval, 3> ranges() const { return {r.range(), c.range(), ratio.as_interval()}; }
    std::array<double, 1> evaluate(const std::array<double, 3>& x) const {
        return {detail::rc::crossing_time(0.0, 1.0, x[2], x[0] * x[1])};
    }
};
static_assert(TimingNetwork<one_shot>);

const one_shot reference_one_shot{{.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                                  {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)}};

struct xy_names {
    static constexpr std::array<quantity_info, 2> parameters{{{"x", ""}, {"y", ""}}};
    static constexpr std::array<quantity_info, 2> metrics{{{"f", ""}, {"g", ""}}};
};
struct x_names {
    static constexpr std::array<quantity_info, 1> parameters{{{"x", ""}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"f", ""}}};
};
struct xyz_names {
    static constexpr std::array<quantity_info, 3> parameters{{{"x", ""}, {"y", ""}, {"z", ""}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"f", ""}}};
};
template <std::size_t K>
struct sum_names {
    static constexpr std::array<quantity_info, K> parameters = [] {
        std::array<quantity_info, K> a{};
        for (auto& q : a) q = {"x", "V"};
        return a;
    }();
    static constexpr std::array<quantity_info, 1> metrics{{{"sum", "V"}}};
};

}  // namespace

TEST_CASE("one-shot 100 kOhm +/-1 %, 10 nF +/-10 %: extremes of REFERENCES.md") {
    // Computed (REFERENCES.md): nominal 1.09861 ms, extremes 0.97886-1.22056 ms,
    // i.e. ln 3 x 1 ms x (0.99 x 0.9) and x (1.01 x 1.1).
    const auto wc = worst_case(reference_one_shot);
    CHECK(wc.free_parameters == 2);
    CHECK_REL(wc[0].nominal, 1.09861e-3, 5e-6);
    CHECK_REL(wc[0].min.value, 0.97886e-3, 5e-6);
    CHECK_REL(wc[0].max.value, 1.22056e-3, 5e-6);
    CHECK_REL(wc[0].min.value, std::log(3.0) * 1e-3 * 0.99 * 0.9, 1e-14);
    CHECK_REL(wc[0].max.value, std::log(3.0) * 1e-3 * 1.01 * 1.1, 1e-14);
    CHECK(wc[0].min.positions[0] == corner_position::low);
    CHECK(wc[0].min.positions[1] == corner_position::low);
    CHECK(wc[0].min.positions[2] == corner_position::fixed);
    CHECK(wc[0].max.positions[0] == corner_position::high);
    CHECK(wc[0].max.positions[1] == corner_position::high);
    CHECK_REL(wc[0].max.parameters[0], 101e3, 1e-15);
    CHECK_REL(wc[0].max.parameters[1], 11e-9, 1e-15);
    CHECK(wc.monotone[0]);
    CHECK(wc.monotone[1]);
}

TEST_CASE("metric_bounds agrees with worst_case on a monotone network") {
    const auto b = metric_bounds(reference_one_shot);
    const auto wc = worst_case(reference_one_shot);
    CHECK(b[0].low == wc[0].min.value);
    CHECK(b[0].high == wc[0].max.value);
    CHECK(b[0].nominal == wc[0].nominal);
}

TEST_CASE("an interior maximum x (1 - x) is found at x = 1/2") {
    // Derivation: d/dx x(1 - x) = 1 - 2x = 0 at x = 1/2, value 1/4; the corners
    // x = 0 and x = 1 both give 0, so a corner-only analysis reports max 0.
    const auto net = make_function_network<x_names>({interval{0.3, 0.0, 1.0}}, [](const std::array<double, 1>& x) {
        return std::array<double, 1>{x[0] * (1.0 - x[0])};
    });
    const auto corners_only = metric_bounds(net);
    CHECK_REL(corners_only[0].high, 0.21, 1e-14);  // the nominal 0.3 x 0.7; the corners give 0
    const auto wc = worst_case(net);
    CHECK_FALSE(wc.monotone[0]);
    CHECK_REL(wc[0].max.value, 0.25, 1e-14);
    CHECK(std::abs(wc[0].max.parameters[0] - 0.5) < 1e-6);
    CHECK(wc[0].max.positions[0] == corner_position::interior);
    CHECK(wc[0].min.value == 0.0);
    CHECK(wc[0].min.positions[0] != corner_position::interior);
}

TEST_CASE("an interior minimum |x - c| + y sits at x = c with y at its low end") {
    // By construction: |x - 0.37| >= 0 with equality at 0.37, and y in [1, 2] adds
    // monotonically: min 1 at (0.37, 1); max 0.63 + 2 at (1, 2).
    // Second metric g = x + y is monotone: min 1 at (0, 1), max 3 at (1, 2).
    const auto net = make_function_network<xy_names>(
        {interval{0.5, 0.0, 1.0}, interval{1.5, 1.0, 2.0}}, [](const std::array<double, 2>& x) {
            return std::array<double, 2>{std::abs(x[0] - 0.37) + x[1], x[0] + x[1]};
        });
    const auto wc = worst_case(net);
    CHECK_FALSE(wc.monotone[0]);
    CHECK(wc.monotone[1]);
    CHECK(std::abs(wc[0].min.value - 1.0) < 1e-9);
    CHECK(std::abs(wc[0].min.parameters[0] - 0.37) < 1e-9);
    CHECK(wc[0].min.positions[0] == corner_position::interior);
    CHECK(wc[0].min.positions[1] == corner_position::low);
    CHECK_REL(wc[0].max.value, 2.63, 1e-14);
    CHECK(wc[0].max.positions[0] == corner_position::high);
    CHECK(wc[1].min.value == 1.0);
    CHECK(wc[1].max.value == 3.0);
    // Without the interior search the corners are all there is (documented option).
    const auto corners = worst_case(net, {.search_interior = false});
    // Corners (0, 1): 1.37, (1, 1): 1.63, (0, 2): 2.37, (1, 2): 2.63; nominal (0.5, 1.5): 1.63.
    CHECK_REL(corners[0].min.value, 1.37, 1e-14);
    CHECK_FALSE(corners.monotone[0]);
}

TEST_CASE("worst case against a dense brute-force grid (non-monotone in two parameters)") {
    // f = (x - 0.3)^2 y + sin(3 z) on [0, 1] x [1, 2] x [0, 1]:
    // max: x = 1 (0.49 > 0.09), y = 2, z = pi/6 (sin = 1) -> 0.98 + 1 = 1.98
    // min: x = 0.3, z = 0 (sin 0 = 0 < sin 3 = 0.141) -> 0.
    // A 101^3 grid contains x = 0.3 and misses pi/6 by < 0.005: its max is below
    // the true one by at most 9 x 0.005^2 / 2 = 1.1e-4 (second-order Taylor of sin 3z).
    const auto f = [](const std::array<double, 3>& x) {
        return std::array<double, 1>{(x[0] - 0.3) * (x[0] - 0.3) * x[1] + std::sin(3.0 * x[2])};
    };
    const auto net = make_function_network<xyz_names>(
        {interval{0.5, 0.0, 1.0}, interval{1.5, 1.0, 2.0}, interval{0.5, 0.0, 1.0}}, f);
    double g_lo = 1e300, g_hi = -1e300;
    for (int i = 0; i <= 100; ++i)
        for (int j = 0; j <= 100; ++j)
            for (int k = 0; k <= 100; ++k) {
                const double v = f({i / 100.0, 1.0 + j / 100.0, k / 100.0})[0];
                g_lo = std::min(g_lo, v);
                g_hi = std::max(g_hi, v);
            }
    const auto wc = worst_case(net);
    CHECK(wc[0].max.value >= g_hi);
    CHECK(wc[0].max.value - g_hi <= 1.2e-4);
    CHECK_REL(wc[0].max.value, 1.98, 1e-12);
    CHECK(std::abs(wc[0].max.parameters[2] - std::acos(-1.0) / 6.0) < 1e-6);
    CHECK(wc[0].min.value <= g_lo + 1e-15);
    CHECK(std::abs(wc[0].min.value) < 1e-15);
    CHECK(std::abs(wc[0].min.parameters[0] - 0.3) < 1e-6);
}

TEST_CASE("16 free parameters: 65,536 corners, exact sum bounds") {
    // sum of x_j in [j, j + 1] (nominal j + 0.5): bounds sum j = 120 and 136.
    constexpr std::size_t K = 16;
    std::array<interval, K> r{};
    for (std::size_t j = 0; j < K; ++j) r[j] = {j + 0.5, double(j), j + 1.0};
    const auto net = make_function_network<sum_names<K>>(r, [](const std::array<double, K>& x) {
        double s = 0;
        for (double v : x) s += v;
        return std::array<double, 1>{s};
    });
    const auto t0 = std::chrono::steady_clock::now();
    const auto wc = worst_case(net);
    const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    CHECK(wc.free_parameters == K);
    // 1 nominal + 2^16 corners + scans: (1 nominal + 2 extreme corners) x 16 parameters x 9 points.
    CHECK(wc.evaluations == 1 + 65536 + 3 * 16 * 9);
    CHECK(wc[0].min.value == 120.0);
    CHECK(wc[0].max.value == 136.0);
    for (std::size_t j = 0; j < K; ++j) CHECK(wc[0].max.positions[j] == corner_position::high);
    CHECK(seconds < 1.0);  // generous: about 1 ms at -O2 without sanitizers
    const auto b = metric_bounds(net);
    CHECK(b[0].low == 120.0);
    CHECK(b[0].high == 136.0);
}

TEST_CASE("fixed parameters are not enumerated") {
    one_shot n = reference_one_shot;
    n.c.tol = {};
    const auto wc = worst_case(n);
    CHECK(wc.free_parameters == 1);
    CHECK(wc[0].max.positions[1] == corner_position::fixed);
    CHECK(wc[0].max.positions[2] == corner_position::fixed);
    // All fixed: min = max = nominal.
    n.r.tol = {};
    const auto w0 = worst_case(n);
    CHECK(w0.free_parameters == 0);
    CHECK(w0[0].min.value == w0[0].nominal);
    CHECK(w0[0].max.value == w0[0].nominal);
}

TEST_CASE("more than 20 free parameters is an error") {
    constexpr std::size_t K = 21;
    std::array<interval, K> r{};
    for (auto& i : r) i = {0.5, 0.0, 1.0};
    const auto net = make_function_network<sum_names<K>>(
        r, [](const std::array<double, K>& x) { return std::array<double, 1>{x[0]}; });
    CHECK_THROWS_WITH_AS(worst_case(net),
                         "worst_case: free parameters = 21 is invalid; expected at most 20 (2^20 corners); fix some "
                         "parameters or use monte_carlo",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(metric_bounds(net),
                         "metric_bounds: free parameters = 21 is invalid; expected at most 20 (2^20 corners); fix some "
                         "parameters or use monte_carlo",
                         tauforge::invalid_argument);
}

TEST_CASE("bad ranges and non-finite metrics are errors naming the parameter or metric") {
    const auto bad = make_function_network<x_names>(
        {interval{2.0, 0.0, 1.0}}, [](const std::array<double, 1>& x) { return std::array<double, 1>{x[0]}; });
    CHECK_THROWS_WITH_AS(worst_case(bad),
                         "worst_case: x.nominal = 2 is invalid; expected a value from low = 0 to high = 1",
                         tauforge::invalid_argument);
    const auto nan_net = make_function_network<x_names>({interval{0.5, 0.0, 1.0}}, [](const std::array<double, 1>& x) {
        return std::array<double, 1>{x[0] > 0.9 ? std::nan("") : x[0]};
    });
    CHECK_THROWS_WITH_AS(worst_case(nan_net),
                         "worst_case: f = nan is invalid; expected a finite metric at every evaluated point",
                         tauforge::domain_error);
    CHECK_THROWS_WITH_AS(worst_case(reference_one_shot, {.grid_points = 40}),
                         "worst_case: grid_points = 40 is invalid; expected 3 to 32 points per parameter",
                         tauforge::invalid_argument);
}

namespace {

/// The whole of two worst_case results, bit for bit (evaluations aside).
template <std::size_t P, std::size_t M>
std::size_t differences(const worst_case_result<P, M>& a, const worst_case_result<P, M>& b) {
    auto bits = [](double x, double y) { return std::memcmp(&x, &y, sizeof x) != 0; };
    std::size_t d = a.free_parameters != b.free_parameters;
    for (std::size_t j = 0; j < P; ++j) d += a.monotone[j] != b.monotone[j];
    for (std::size_t m = 0; m < M; ++m) {
        d += bits(a[m].nominal, b[m].nominal);
        for (const auto& [x, y] : {std::pair{&a[m].min, &b[m].min}, std::pair{&a[m].max, &b[m].max}}) {
            d += bits(x->value, y->value);
            for (std::size_t j = 0; j < P; ++j)
                d += bits(x->parameters[j], y->parameters[j]) + (x->positions[j] != y->positions[j]);
        }
    }
    return d;
}

struct fgh_names {
    static constexpr std::array<quantity_info, 3> parameters{{{"x", ""}, {"y", ""}, {"z", ""}}};
    static constexpr std::array<quantity_info, 3> metrics{{{"f", ""}, {"g", ""}, {"h", ""}}};
};

}  // namespace

TEST_CASE("worst_case's shortcuts leave every bound and corner identical to the full search, on random cases") {
    // The shortcuts (coinciding lines of the monotonicity scan scanned once; no scan
    // for a network that declares itself monotone) may only save evaluations: the
    // full search (detail::worst_case_search with full = true) is the reference.
    using tauforge_test::between;
    std::mt19937_64 g(20261204);
    std::size_t saved = 0, differ = 0, cases = 0;
    for (int i = 0; i < 40; ++i) {
        // Oscillators: declared monotone (no scan) unless a steering diode meets V_sat > 0.
        timer_astable a;
        a.ra = {.nominal = resistance::from_value(between(g, 1e3, 1e5)), .tol = tolerance::symmetric(between(g, 0.001, 0.05)),
                .tcr = ppm_band::symmetric(between(g, 0.0, 200.0))};
        a.rb = {.nominal = resistance::from_value(between(g, 1e3, 1e5)), .tol = tolerance::symmetric(between(g, 0.001, 0.05))};
        a.c = {.nominal = capacitance::from_value(between(g, 1e-9, 1e-6)), .tol = tolerance::symmetric(between(g, 0.01, 0.2))};
        a.supply = ranged<voltage>::between(voltage::from_value(between(g, 3.0, 4.5)), voltage::from_value(between(g, 5.0, 15.0)));
        a.lower_threshold = ranged<double>::plus_minus(1.0 / 3.0, between(g, 0.0, 0.03));
        a.upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, between(g, 0.0, 0.03));
        a.discharge_saturation = ranged<voltage>::between(0_V, voltage::from_value(between(g, 0.0, 0.2)));
        a.steering_diode = i % 4 == 3;
        a.conditions = {.t_min = celsius{between(g, -40.0, 0.0)}, .t_max = celsius{between(g, 30.0, 85.0)}};
        const auto fa = detail::worst_case_search(a, {}, true), sa = worst_case(a);
        differ += differences(fa, sa);
        saved += fa.evaluations - sa.evaluations;
        // One-shots: not declared monotone, so scanned, with coinciding lines skipped.
        timer_monostable m;
        m.r = {.nominal = resistance::from_value(between(g, 1e3, 1e6)), .tol = tolerance::symmetric(between(g, 0.001, 0.05))};
        m.c = {.nominal = capacitance::from_value(between(g, 1e-9, 1e-5)), .tol = tolerance::symmetric(between(g, 0.01, 0.2))};
        m.supply = ranged<voltage>::between(voltage::from_value(between(g, 3.0, 4.5)), voltage::from_value(between(g, 5.0, 15.0)));
        m.upper_threshold = ranged<double>::plus_minus(between(g, 0.3, 0.8), between(g, 0.0, 0.05));
        m.discharge_resistance = ranged<resistance>::between(resistance::from_value(between(g, 0.0, 10.0)),
                                                             resistance::from_value(between(g, 10.0, 50.0)));
        m.propagation_delay = ranged<duration>::between(0_s, duration::from_value(between(g, 0.0, 1e-6)));
        const auto fm = detail::worst_case_search(m, {}, true), sm = worst_case(m);
        differ += differences(fm, sm);
        saved += fm.evaluations - sm.evaluations;
        // Function networks: a monotone metric, one turning inside x's interval and one
        // flat in z, so the scan finds both kinds and the interior search runs.
        const double c = between(g, 0.2, 0.8), w = between(g, 0.5, 2.0);
        const auto f = make_function_network<fgh_names>(
            {interval{0.5, 0.0, 1.0}, interval{1.5, 1.0, 2.0}, interval{between(g, 0.0, 1.0), 0.0, 1.0}},
            [c, w](const std::array<double, 3>& x) {
                return std::array<double, 3>{x[0] + w * x[1] + x[2], (x[0] - c) * (x[0] - c) + x[1], w * x[1]};
            });
        const auto ff = detail::worst_case_search(f, {}, true), sf = worst_case(f);
        differ += differences(ff, sf);
        saved += ff.evaluations - sf.evaluations;
        CHECK_FALSE(sf.monotone[0]);  // the scan still finds the turn of (x - c)^2
        cases += 3;
    }
    CHECK(cases == 120);
    CHECK(differ == 0);
    CHECK(saved > 0);  // the shortcuts do save evaluations
}
