// Monte Carlo throughput for a one-shot (R, C and threshold ratio uncertain)
// against a raw-double loop that draws the same random numbers (the same
// splitmix64 stream and transforms) and evaluates the same rc.hpp kernel,
// keeping only the sum, the sum of squares and the pass count.
//
// Pairs (bench/run.sh prints baseline time / variant time):
//   mc_one_shot_normal/baseline     raw loop, truncated normal parameters, 10^6 samples
//   mc_one_shot_normal/moments      monte_carlo: moments and yield only
//   mc_one_shot_normal/full         monte_carlo: + 5 percentiles and 5 worst samples
//   mc_one_shot_uniform/...         the same with uniform parameters
//   mc_threads/baseline             monte_carlo, moments, 1 thread (wall clock)
//   mc_threads/two_threads          the same on 2 threads (identical result)
//   mc_threads_full/...             the same with percentiles and worst samples
//   mc_oscillator/baseline          a timer_astable (Ra, Rb, C, supply, thresholds
//                                   uncertain): raw loop of timer_astable::evaluate on the
//                                   same random numbers, frequency moments and pass count
//   mc_oscillator/moments           monte_carlo: moments and yield of all five metrics
//   mc_block_normal/baseline        raw loop over blocks: the same block draws as
//                                   monte_carlo (detail::random_sampler::draw_block),
//                                   rc.hpp's block kernel crossing_times, sums and pass count
//   mc_block_normal/moments         monte_carlo, moments and yield (as mc_one_shot_normal/moments)
//   mc_block_uniform/...            the same with uniform parameters
// Target: moments within 1.5x of the raw loop (ratio >= 0.67). Every run reports
// samples_per_s, samples per second of CPU time (per core; wall time for the
// thread pairs), goal >= 50 M/s for the one-shot.
// Before any timing, each raw loop and monte_carlo run once and must agree on
// the pass count exactly and on the mean within 1e-12; otherwise nothing is timed.
#include <tauforge/analysis/monte_carlo.hpp>
#include <tauforge/networks/timer_astable.hpp>
#include <tauforge/parts.hpp>
#include <tauforge/rc.hpp>

#include <benchmark/benchmark.h>

#include "bench_common.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <vector>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

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
    // The same on a block of samples (what monte_carlo uses when a network has it).
    void evaluate_block(std::size_t count, const std::array<const double*, 3>& x,
                        const std::array<double*, 1>& out) const {
        double* t = out[0];
        for (std::size_t k = 0; k < count; ++k) t[k] = x[0][k] * x[1][k];  // tau, then the crossing in place
        detail::rc::crossing_times(count, 0.0, 1.0, x[2], static_cast<const double*>(t), t);
    }
};

const one_shot net{{.nominal = 100_kohm, .tol = tolerance::symmetric(0.01)},
                   {.nominal = 10_nF, .tol = tolerance::symmetric(0.10)},
                   ranged<double>::plus_minus(2.0 / 3.0, 0.01)};

constexpr std::size_t samples = 1'000'000;

monte_carlo_options<one_shot> options(bool uniform, bool full, unsigned threads) {
    monte_carlo_options<one_shot> o;
    o.samples = samples;
    o.threads = threads;
    o.spec[0] = spec_window::between(1.0_ms, 1.2_ms);
    if (uniform) o.distributions.fill(parameter_distribution::uniform());
    if (!full) {
        o.percentiles.clear();
        o.worst_samples = 0;
    }
    return o;
}

struct raw_result {
    double mean;
    std::size_t pass;
};

raw_result raw_loop(const monte_carlo_options<one_shot>& o) {
    const auto r = net.ranges();
    const auto sampler = detail::make_sampler<one_shot>("bench", r, o);
    std::array<double, 3> x{r[0].nominal, r[1].nominal, r[2].nominal};
    double s1 = 0.0, s2 = 0.0;
    std::size_t pass = 0;
    for (std::size_t i = 0; i < o.samples; ++i) {
        sampler.draw(i, x);
        const double t = detail::rc::crossing_time(0.0, 1.0, x[2], x[0] * x[1]);
        s1 += t;
        s2 += t * t;
        pass += t >= 1e-3 && t <= 1.2e-3;
    }
    benchmark::DoNotOptimize(s2);
    return {s1 / static_cast<double>(o.samples), pass};
}

// The raw loop over chunks of samples, parameters as columns: what monte_carlo's
// block path does, without its bookkeeping.
raw_result raw_block_loop(const monte_carlo_options<one_shot>& o) {
    constexpr std::size_t C = detail::monte_carlo_chunk;
    const auto r = net.ranges();
    const auto sampler = detail::make_sampler<one_shot>("bench", r, o);
    std::vector<double> columns(3 * C);
    std::array<double*, 3> x{columns.data(), columns.data() + C, columns.data() + 2 * C};
    std::array<double, C> t;
    double s1 = 0.0, s2 = 0.0;
    std::size_t pass = 0;
    for (std::size_t i0 = 0; i0 < o.samples; i0 += C) {
        const std::size_t n = std::min(C, o.samples - i0);
        sampler.draw_block(i0, n, x);
        for (std::size_t k = 0; k < n; ++k) t[k] = x[0][k] * x[1][k];
        detail::rc::crossing_times(n, 0.0, 1.0, static_cast<const double*>(x[2]), static_cast<const double*>(t.data()),
                                   t.data());
        for (std::size_t k = 0; k < n; ++k) {
            s1 += t[k];
            s2 += t[k] * t[k];
            pass += t[k] >= 1e-3 && t[k] <= 1.2e-3;
        }
    }
    benchmark::DoNotOptimize(s2);
    return {s1 / static_cast<double>(o.samples), pass};
}

void count_samples(benchmark::State& state) {
    state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(samples));
    state.counters["samples_per_s"] =
        benchmark::Counter(static_cast<double>(state.iterations()) * samples, benchmark::Counter::kIsRate);
}

void check_agreement(bool uniform) {
    const auto o = options(uniform, false, 1);
    const raw_result block = raw_block_loop(o);
    const raw_result raw = raw_loop(o);
    if (block.pass != raw.pass || std::abs(block.mean - raw.mean) > 1e-12 * std::abs(raw.mean)) {
        std::fprintf(stderr, "monte_carlo_bench: raw loop and raw block loop disagree; nothing is timed\n");
        std::abort();
    }
    const auto mc = monte_carlo(net, o);
    if (raw.pass != mc.passing || std::abs(raw.mean - mc[0].mean) > 1e-12 * std::abs(raw.mean)) {
        std::fprintf(stderr, "monte_carlo_bench: raw loop and monte_carlo disagree; nothing is timed\n");
        std::abort();
    }
}

void raw(benchmark::State& state, bool uniform, bool block = false) {
    check_agreement(uniform);
    const auto o = options(uniform, false, 1);
    for (auto _ : state) benchmark::DoNotOptimize((block ? raw_block_loop(o) : raw_loop(o)).pass);
    count_samples(state);
}

void run(benchmark::State& state, bool uniform, bool full, unsigned threads) {
    const auto o = options(uniform, full, threads);
    for (auto _ : state) {
        auto r = monte_carlo(net, o);
        benchmark::DoNotOptimize(r.metrics[0].mean);
    }
    count_samples(state);
}

// ---- the oscillator: the library's timer_astable, 7 free parameters -----------------

const timer_astable oscillator = tauforge_bench::oscillator();

monte_carlo_options<timer_astable> oscillator_options() {
    monte_carlo_options<timer_astable> o;
    o.samples = samples;
    o.spec[timer_astable::frequency] = spec_window::between(2.16_kHz, 2.64_kHz);
    o.percentiles.clear();
    o.worst_samples = 0;
    return o;
}

raw_result raw_oscillator_loop(const monte_carlo_options<timer_astable>& o) {
    const auto r = oscillator.ranges();
    const auto sampler = detail::make_sampler<timer_astable>("bench", r, o);
    std::array<double, timer_astable::parameters.size()> x{};
    for (std::size_t j = 0; j < x.size(); ++j) x[j] = r[j].nominal;
    double s1 = 0.0, s2 = 0.0;
    std::size_t pass = 0;
    for (std::size_t i = 0; i < o.samples; ++i) {
        sampler.draw(i, x);
        const double f = oscillator.evaluate(x)[timer_astable::frequency];
        s1 += f;
        s2 += f * f;
        pass += f >= 2160.0 && f <= 2640.0;
    }
    benchmark::DoNotOptimize(s2);
    return {s1 / static_cast<double>(o.samples), pass};
}

void mc_oscillator(benchmark::State& state, int variant) {
    const auto o = oscillator_options();
    static const bool checked = [&] {
        const raw_result raw = raw_oscillator_loop(o);
        const auto mc = monte_carlo(oscillator, o);
        if (raw.pass != mc.passing ||
            std::abs(raw.mean - mc[timer_astable::frequency].mean) > 1e-12 * std::abs(raw.mean)) {
            std::fprintf(stderr, "monte_carlo_bench: raw oscillator loop and monte_carlo disagree; nothing is timed\n");
            std::abort();
        }
        return true;
    }();
    benchmark::DoNotOptimize(checked);
    for (auto _ : state) {
        if (variant == 0) {
            benchmark::DoNotOptimize(raw_oscillator_loop(o).pass);
        } else {
            auto r = monte_carlo(oscillator, o);
            benchmark::DoNotOptimize(r.metrics[0].mean);
        }
    }
    count_samples(state);
}

void mc_one_shot_normal(benchmark::State& s, int variant) {
    if (variant == 0) raw(s, false);
    else run(s, false, variant == 2, 1);
}
void mc_one_shot_uniform(benchmark::State& s, int variant) {
    if (variant == 0) raw(s, true);
    else run(s, true, variant == 2, 1);
}
void mc_block_normal(benchmark::State& s, int variant) {
    if (variant == 0) raw(s, false, true);
    else run(s, false, false, 1);
}
void mc_block_uniform(benchmark::State& s, int variant) {
    if (variant == 0) raw(s, true, true);
    else run(s, true, false, 1);
}
void mc_threads(benchmark::State& s, unsigned threads) { run(s, false, false, threads); }
void mc_threads_full(benchmark::State& s, unsigned threads) { run(s, false, true, threads); }

}  // namespace

BENCHMARK_CAPTURE(mc_one_shot_normal, baseline, 0)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_one_shot_normal, moments, 1)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_one_shot_normal, full, 2)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_one_shot_uniform, baseline, 0)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_one_shot_uniform, moments, 1)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_one_shot_uniform, full, 2)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_block_normal, baseline, 0)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_block_normal, moments, 1)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_block_uniform, baseline, 0)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_block_uniform, moments, 1)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_threads, baseline, 1u)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK_CAPTURE(mc_threads, two_threads, 2u)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK_CAPTURE(mc_threads_full, baseline, 1u)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK_CAPTURE(mc_threads_full, two_threads, 2u)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK_CAPTURE(mc_oscillator, baseline, 0)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(mc_oscillator, moments, 1)->Unit(benchmark::kMillisecond);
