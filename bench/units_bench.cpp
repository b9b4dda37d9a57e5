// What the unit-typed API costs: each public, Boost.Units-typed computation
// against the same computation on plain doubles (SI base units) through the
// detail:: kernels, on the same input and output buffers in the same binary
// (separate buffers once made a 25 % difference that was memory placement,
// not code). Before any timing, each pair runs both variants once and aborts
// unless their results are bit-identical.
//
// Pairs (bench/run.sh prints baseline time / variant time):
//   crossing_time_1024/baseline    detail::rc::crossing_time on doubles
//   crossing_time_1024/typed       tauforge::crossing_time on voltage/duration
//   one_shot_bounds/baseline       a hand-written corner loop over the one-shot's
//                                  intervals, folded from raw doubles
//   one_shot_bounds/metric_bounds  tauforge::metric_bounds(timer_monostable)
//   one_shot_corners/baseline      the same corner loop, intervals given
//   one_shot_corners/metric_bounds metric_bounds(net, intervals): the generic
//                                  corner machinery alone, without ranges()
//   one_shot_ranges/baseline       the one-shot's intervals from raw doubles
//   one_shot_ranges/ranges         timer_monostable::ranges(): what metric_bounds(net)
//                                  spends before its first corner
//   one_shot_worst_case/baseline   the worst_case search without its shortcuts (every
//                                  line of the monotonicity scan)
//   one_shot_worst_case/worst_case worst_case(timer_monostable): coinciding scan lines
//                                  scanned once
// Target: variant time <= 1.05 x baseline at -O2 (run.sh ratio >= 0.95), except
// for the worst_case pair, which measures what its shortcuts save.
//
// The kernels are [[gnu::noinline]] so that each variant's loop can be read
// on its own: objdump -d --no-show-raw-insn -C units_bench | less, search for
// raw_crossings / typed_crossings.
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/timer_monostable.hpp>
#include <tauforge/rc.hpp>
#include <tauforge/units.hpp>

#include <benchmark/benchmark.h>

#include "bench_common.hpp"

#include <algorithm>
#include <array>
#include <bit>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <random>
#include <vector>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

static_assert(sizeof(voltage) == sizeof(double) && sizeof(duration) == sizeof(double),
              "a base-SI quantity must be a bare double");

[[noreturn]] void disagree(const char* pair, const char* what) {
    std::fprintf(stderr, "units_bench: %s: %s; nothing is timed\n", pair, what);
    std::abort();
}

// ---------------------------------------------------------------------------
// (a) crossing_time over an array of cases

struct crossing_case {
    double v_start, v_final, v_threshold, tau;  // V, V, V, s
};

constexpr std::size_t case_count = 1024;  // 32 KiB in, 8 KiB out: both variants stay in L1/L2 alike

// Charging and discharging cases, thresholds between start and final (1 in 64
// exactly at the start, t = 0), tau log-uniform over 1 us .. 1 s. mt19937_64's
// sequence is specified and the transform to [0, 1) is our own.
std::vector<crossing_case> make_cases() {
    std::mt19937_64 rng(20240601);
    auto unit = [&] { return static_cast<double>(rng() >> 11) * 0x1.0p-53; };
    std::vector<crossing_case> v(case_count);
    for (std::size_t i = 0; i < v.size(); ++i) {
        const double a = 5.0 * unit(), swing = 0.5 + 10.0 * unit();
        const bool charging = unit() < 0.5;
        const double vs = charging ? a : a + swing, vf = charging ? a + swing : a;
        const double k = i % 64 == 0 ? 0.0 : 0.001 + 0.998 * unit();
        v[i] = {vs, vf, vs + k * (vf - vs), std::pow(10.0, -6.0 + 6.0 * unit())};
    }
    return v;
}

// The one input and one output buffer both variants use.
std::vector<crossing_case> cases = make_cases();
std::vector<double> crossings(case_count);

[[gnu::noinline]] void raw_crossings(const std::vector<crossing_case>& in, std::vector<double>& out) {
    for (std::size_t i = 0; i < in.size(); ++i) {
        const crossing_case& c = in[i];
        out[i] = detail::rc::crossing_time(c.v_start, c.v_final, c.v_threshold, c.tau);
    }
}

[[gnu::noinline]] void typed_crossings(const std::vector<crossing_case>& in, std::vector<double>& out) {
    for (std::size_t i = 0; i < in.size(); ++i) {
        const crossing_case& c = in[i];
        const duration t = crossing_time(voltage::from_value(c.v_start), voltage::from_value(c.v_final),
                                         voltage::from_value(c.v_threshold), duration::from_value(c.tau));
        out[i] = t.value();
    }
}

void check_crossings() {
    static const bool done = [] {
        std::vector<double> a(case_count), b(case_count);
        raw_crossings(cases, a);
        typed_crossings(cases, b);
        if (std::memcmp(a.data(), b.data(), a.size() * sizeof(double)) != 0)
            disagree("crossing_time_1024", "raw and typed results differ");
        if (!std::all_of(a.begin(), a.end(), [](double t) { return std::isfinite(t) && t >= 0.0; }))
            disagree("crossing_time_1024", "a crossing time is not finite and non-negative");
        return true;
    }();
    (void)done;
}

template <void (*Kernel)(const std::vector<crossing_case>&, std::vector<double>&)>
void bm_crossings(benchmark::State& state) {
    check_crossings();
    for (auto _ : state) {
        Kernel(cases, crossings);
        benchmark::DoNotOptimize(crossings.data());
        benchmark::ClobberMemory();
    }
    state.SetItemsProcessed(static_cast<std::int64_t>(state.iterations()) * static_cast<std::int64_t>(case_count));
}

// ---------------------------------------------------------------------------
// (b) a one-shot's worst case: every metric's nominal, low and high over the
// corners of its free parameters.

// A one-shot as built: 1 % thick-film R with +/-100 ppm/K, 5 % C0G capacitor,
// 4.5 .. 5.5 V, threshold 2/3 +/- 0.02 of the supply, a 5 .. 15 ohm discharge
// switch (so recovery time is not 0), 100 .. 300 ns propagation delay,
// -20 .. +70 degC: six free parameters, 64 corners plus the nominal.
struct one_shot_inputs {
    double r = 100e3, r_tol = 0.01, r_tcr = 100.0;  // ohm, fraction, ppm/K (symmetric)
    double c = 10e-9, c_tol = 0.05, c_tcr = 30.0;   // F, fraction, ppm/K (symmetric, C0G)
    double t_min = -20.0, t_max = 70.0, t_ref = 25.0;  // degC
    double vcc_lo = 4.5, vcc_hi = 5.5;
    double ratio = 2.0 / 3.0, ratio_delta = 0.02;
    double ron_lo = 5.0, ron_hi = 15.0;
    double tpd_lo = 100e-9, tpd_hi = 300e-9;
    double recovery_fraction = 0.01;
};

const one_shot_inputs raw_inputs{};

timer_monostable make_one_shot() {
    const one_shot_inputs& in = raw_inputs;
    timer_monostable m;
    m.r = {.nominal = resistance::from_value(in.r), .tol = tolerance::symmetric(in.r_tol),
           .tcr = ppm_band::symmetric(in.r_tcr)};
    m.c = {.nominal = capacitance::from_value(in.c), .tol = tolerance::symmetric(in.c_tol), .tempco = c0g};
    m.supply = ranged<voltage>::between(voltage::from_value(in.vcc_lo), voltage::from_value(in.vcc_hi));
    m.upper_threshold = ranged<double>::plus_minus(in.ratio, in.ratio_delta);
    m.discharge_resistance = ranged<resistance>::between(resistance::from_value(in.ron_lo),
                                                         resistance::from_value(in.ron_hi));
    m.propagation_delay = ranged<duration>::between(duration::from_value(in.tpd_lo), duration::from_value(in.tpd_hi));
    m.recovery_fraction = in.recovery_fraction;
    m.conditions = {.t_min = celsius{in.t_min}, .t_max = celsius{in.t_max}, .t_ref = celsius{in.t_ref}};
    return m;
}

const timer_monostable one_shot = make_one_shot();

// The raw variant's parameter intervals: {nominal, low, high} per free parameter.
struct raw_range {
    double nominal, low, high;
};
struct one_shot_ranges {
    raw_range r, c, vcc, ratio, ron, tpd;
};

// A part's value range: nominal x tolerance x (1 + tcr (T - t_ref)), the same
// products in the same order as the library folds them (aging 0, a factor of 1).
raw_range raw_part(double nominal, double tol, double ppm, const one_shot_inputs& in) {
    const double d_min = in.t_min - in.t_ref, d_max = in.t_max - in.t_ref;
    const double lo = -ppm * 1e-6, hi = ppm * 1e-6;
    const double p[4] = {lo * d_min, lo * d_max, hi * d_min, hi * d_max};
    const double d_nom = std::clamp(0.0, d_min, d_max);
    const double f_nom = 1.0 + 0.5 * (lo + hi) * d_nom;
    const double f_lo = 1.0 + *std::min_element(p, p + 4), f_hi = 1.0 + *std::max_element(p, p + 4);
    return {nominal * f_nom, nominal * (1.0 - tol) * f_lo * (1.0 - 0.0), nominal * (1.0 + tol) * f_hi * (1.0 + 0.0)};
}

raw_range raw_between(double lo, double hi) { return {lo + (hi - lo) / 2.0, lo, hi}; }

one_shot_ranges raw_ranges(const one_shot_inputs& in) {
    return {raw_part(in.r, in.r_tol, in.r_tcr, in),
            raw_part(in.c, in.c_tol, in.c_tcr, in),
            raw_between(in.vcc_lo, in.vcc_hi),
            {in.ratio, in.ratio - in.ratio_delta, in.ratio + in.ratio_delta},
            raw_between(in.ron_lo, in.ron_hi),
            raw_between(in.tpd_lo, in.tpd_hi)};
}

// Pulse width, recovery time and retrigger rate at one point on plain doubles:
// timer_monostable::evaluate's arithmetic written out for V_sat = 0 and no
// threshold bias, the width through detail::rc::crossing_time, the recovery as
// rc.hpp's settling_time computes it (tau ln(1 / fraction)). If the network's
// formulas change, check_bounds() aborts until this mirror follows them.
struct raw_metrics {
    double width, recovery, rate;
};

inline raw_metrics raw_one_shot(double rr, double cc, double vcc, double ratio, double ron, double tpd,
                                double fraction) {
    const double vth = ratio * vcc;
    const double v_hold = 0.0 + ron * (vcc - 0.0 - 0.0 * rr) / (rr + ron);
    const double width = detail::rc::crossing_time(v_hold, vcc - 0.0 * rr, vth, rr * cc) + tpd;
    const double tau = cc * (rr * ron / (rr + ron));
    const double recovery = tau * -std::log(fraction);
    return {width, recovery, 1.0 / (width + recovery)};
}

using three_bounds = std::array<bounds, 3>;

[[gnu::noinline]] three_bounds raw_corner_bounds(const one_shot_ranges& g, double fraction) {
    const raw_metrics n = raw_one_shot(g.r.nominal, g.c.nominal, g.vcc.nominal, g.ratio.nominal, g.ron.nominal,
                                       g.tpd.nominal, fraction);
    three_bounds out{{{n.width, n.width, n.width}, {n.recovery, n.recovery, n.recovery}, {n.rate, n.rate, n.rate}}};
    for (unsigned mask = 0; mask < 64; ++mask) {
        const auto pick = [mask](const raw_range& x, unsigned bit) { return mask >> bit & 1u ? x.high : x.low; };
        const raw_metrics v = raw_one_shot(pick(g.r, 0), pick(g.c, 1), pick(g.vcc, 2), pick(g.ratio, 3),
                                           pick(g.ron, 4), pick(g.tpd, 5), fraction);
        const double m[3] = {v.width, v.recovery, v.rate};
        for (std::size_t k = 0; k < 3; ++k) {
            out[k].low = std::min(out[k].low, m[k]);
            out[k].high = std::max(out[k].high, m[k]);
        }
    }
    return out;
}

[[gnu::noinline]] three_bounds raw_bounds_from_inputs(const one_shot_inputs& in) {
    return raw_corner_bounds(raw_ranges(in), in.recovery_fraction);
}

[[gnu::noinline]] three_bounds typed_bounds(const timer_monostable& m) { return metric_bounds(m); }

[[gnu::noinline]] three_bounds typed_bounds_given(const timer_monostable& m, const std::array<interval, 9>& r) {
    return metric_bounds(m, r);
}

bool same_bits(const three_bounds& a, const three_bounds& b) {
    for (std::size_t k = 0; k < 3; ++k)
        for (auto [x, y] : {std::pair{a[k].nominal, b[k].nominal}, std::pair{a[k].low, b[k].low},
                            std::pair{a[k].high, b[k].high}})
            if (std::bit_cast<std::uint64_t>(x) != std::bit_cast<std::uint64_t>(y)) return false;
    return true;
}

void check_bounds() {
    static const bool done = [] {
        const auto r = one_shot.ranges();
        const auto g = raw_ranges(raw_inputs);
        using tm = timer_monostable;
        const std::pair<const raw_range*, std::size_t> map[] = {{&g.r, tm::p_r},         {&g.c, tm::p_c},
                                                                {&g.vcc, tm::p_supply},  {&g.ratio, tm::p_ratio},
                                                                {&g.ron, tm::p_ron},     {&g.tpd, tm::p_delay}};
        for (const auto& [raw, p] : map)
            if (raw->nominal != r[p].nominal || raw->low != r[p].low || raw->high != r[p].high)
                disagree("one_shot_bounds", "the raw intervals differ from timer_monostable::ranges()");
        if (detail::free_parameters(r).count != 6) disagree("one_shot_bounds", "expected six free parameters");
        const auto raw = raw_bounds_from_inputs(raw_inputs);
        if (!same_bits(raw, typed_bounds(one_shot)))
            disagree("one_shot_bounds", "raw corner loop and metric_bounds differ");
        if (!same_bits(raw_corner_bounds(g, raw_inputs.recovery_fraction), typed_bounds_given(one_shot, r)))
            disagree("one_shot_corners", "raw corner loop and metric_bounds(net, ranges) differ");
        // Sanity: width near R C ln 3 = 1.0986 ms, the bounds ordered.
        if (!(std::abs(raw[0].nominal / (100e3 * 10e-9 * std::log(3.0)) - 1.0) < 0.01) ||
            !(raw[0].low < raw[0].nominal && raw[0].nominal < raw[0].high) || !(raw[1].low > 0.0))
            disagree("one_shot_bounds", "implausible bounds");
        return true;
    }();
    (void)done;
}

void bm_bounds_raw(benchmark::State& state) {
    check_bounds();
    for (auto _ : state) {
        const one_shot_inputs* in = &raw_inputs;
        benchmark::DoNotOptimize(in);  // the inputs are not compile-time constants
        auto b = raw_bounds_from_inputs(*in);
        benchmark::DoNotOptimize(b);
    }
}

void bm_bounds_typed(benchmark::State& state) {
    check_bounds();
    for (auto _ : state) {
        const timer_monostable* m = &one_shot;
        benchmark::DoNotOptimize(m);
        auto b = typed_bounds(*m);
        benchmark::DoNotOptimize(b);
    }
}

void bm_corners_raw(benchmark::State& state) {
    check_bounds();
    const auto g = raw_ranges(raw_inputs);
    for (auto _ : state) {
        const one_shot_ranges* p = &g;
        const one_shot_inputs* in = &raw_inputs;
        benchmark::DoNotOptimize(p);
        benchmark::DoNotOptimize(in);  // else ln(1 / fraction) is folded at compile time
        auto b = raw_corner_bounds(*p, in->recovery_fraction);
        benchmark::DoNotOptimize(b);
    }
}

void bm_corners_typed(benchmark::State& state) {
    check_bounds();
    const auto r = one_shot.ranges();
    for (auto _ : state) {
        const std::array<interval, 9>* p = &r;
        benchmark::DoNotOptimize(p);
        auto b = typed_bounds_given(one_shot, *p);
        benchmark::DoNotOptimize(b);
    }
}

// The intervals alone: what metric_bounds(net) spends before its first corner.
void bm_ranges_raw(benchmark::State& state) {
    check_bounds();
    for (auto _ : state) {
        const one_shot_inputs* in = &raw_inputs;
        benchmark::DoNotOptimize(in);
        auto g = raw_ranges(*in);
        benchmark::DoNotOptimize(g);
    }
}

void bm_ranges_typed(benchmark::State& state) {
    check_bounds();
    for (auto _ : state) {
        const timer_monostable* m = &one_shot;
        benchmark::DoNotOptimize(m);
        auto r = m->ranges();
        benchmark::DoNotOptimize(r);
    }
}

void bm_worst_case(benchmark::State& state, bool full) {
    tauforge_bench::worst_case_or_full_search(state, one_shot, full);
}

}  // namespace

BENCHMARK_CAPTURE(bm_worst_case, full, true)->Name("one_shot_worst_case/baseline")->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(bm_worst_case, shortcuts, false)->Name("one_shot_worst_case/worst_case")->Unit(benchmark::kMicrosecond);
BENCHMARK(bm_crossings<raw_crossings>)->Name("crossing_time_1024/baseline")->Unit(benchmark::kMicrosecond);
BENCHMARK(bm_crossings<typed_crossings>)->Name("crossing_time_1024/typed")->Unit(benchmark::kMicrosecond);
BENCHMARK(bm_bounds_raw)->Name("one_shot_bounds/baseline")->Unit(benchmark::kMicrosecond);
BENCHMARK(bm_bounds_typed)->Name("one_shot_bounds/metric_bounds")->Unit(benchmark::kMicrosecond);
BENCHMARK(bm_corners_raw)->Name("one_shot_corners/baseline")->Unit(benchmark::kMicrosecond);
BENCHMARK(bm_corners_typed)->Name("one_shot_corners/metric_bounds")->Unit(benchmark::kMicrosecond);
BENCHMARK(bm_ranges_raw)->Name("one_shot_ranges/baseline");
BENCHMARK(bm_ranges_typed)->Name("one_shot_ranges/ranges");
