// Worst case: growth with the number k of free parameters (2^k corners), the
// corner-only metric_bounds, and worst_case over 10 parameters against a
// dense-grid baseline.
//
// Pairs (bench/run.sh prints baseline time / variant time; below 1 = slower):
//   worst_case_growth/baseline     worst_case, k = 4
//   worst_case_growth/k8 .. k16    worst_case, k = 8, 12, 16 (expect ~2^(k-4) slower)
//   metric_bounds_growth/...       the same for metric_bounds
//   worst_case_10/baseline         a 4^10 grid (1,048,576 evaluations)
//   worst_case_10/grid3            a 3^10 grid (59,049 evaluations)
//   worst_case_10/worst_case       worst_case (1,024 corners + the monotonicity scan)
//   worst_case_10/metric_bounds    metric_bounds (1,024 corners)
//   oscillator_worst_case/baseline the worst_case search without its shortcuts (every
//                                  line of the monotonicity scan) on a timer_astable
//                                  with 7 free parameters (bench_common.hpp)
//   oscillator_worst_case/worst_case worst_case: the oscillator declares itself
//                                  monotone, so no scan at all
// (units_bench has the same pair for the one-shot.)
// Before timing, worst_case and the 4^10 grid must agree on the bounds (the
// grid contains the corners and the metric is monotone), and the search without
// shortcuts and worst_case must agree on every bound and corner bit for bit.
#include <tauforge/analysis/function_network.hpp>
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/timer_astable.hpp>

#include "bench_common.hpp"

#include <benchmark/benchmark.h>

#include <array>
#include <cmath>
#include <cstdio>
#include <cstdlib>

using namespace tauforge;

namespace {

template <std::size_t K>
struct names {
    static constexpr std::array<quantity_info, K> parameters = [] {
        std::array<quantity_info, K> a{};
        for (auto& q : a) q = {"x", ""};
        return a;
    }();
    static constexpr std::array<quantity_info, 1> metrics{{{"f", "s"}}};
};

// A monotone metric of K parameters: sum_j w_j x_j / (1 + x_j / 10), w_j = 1 + j / 16.
template <std::size_t K>
auto network() {
    std::array<interval, K> r{};
    for (std::size_t j = 0; j < K; ++j) r[j] = {1.0, 0.9, 1.1};
    return make_function_network<names<K>>(r, [](const std::array<double, K>& x) {
        double s = 0.0;
        for (std::size_t j = 0; j < K; ++j) s += x[j] * (1.0 + j / 16.0) / (1.0 + x[j] / 10.0);
        return std::array<double, 1>{s};
    });
}

template <std::size_t K>
void full(benchmark::State& state) {
    const auto n = network<K>();
    std::size_t evals = 0;
    for (auto _ : state) {
        const auto r = worst_case(n);
        evals = r.evaluations;
        benchmark::DoNotOptimize(r.metrics[0].max.value);
    }
    state.counters["evaluations"] = static_cast<double>(evals);
}

template <std::size_t K>
void corners(benchmark::State& state) {
    const auto n = network<K>();
    const auto r = n.ranges();
    for (auto _ : state) {
        const auto b = metric_bounds(n, r);
        benchmark::DoNotOptimize(b[0].high);
    }
    state.counters["evaluations"] = static_cast<double>((std::size_t{1} << K) + 1);
}

// A dense grid of G points per parameter over K parameters: G^K evaluations.
template <std::size_t K>
std::array<double, 2> grid(std::size_t G) {
    const auto n = network<K>();
    const auto r = n.ranges();
    std::size_t total = 1;
    for (std::size_t j = 0; j < K; ++j) total *= G;
    std::array<std::size_t, K> d{};
    std::array<double, K> x{};
    for (std::size_t j = 0; j < K; ++j) x[j] = r[j].low;
    double lo = 1e300, hi = -1e300;
    for (std::size_t i = 0; i < total; ++i) {
        const double v = n.evaluate(x)[0];
        lo = std::min(lo, v);
        hi = std::max(hi, v);
        for (std::size_t j = 0; j < K; ++j) {
            if (++d[j] < G) {
                x[j] = d[j] + 1 == G ? r[j].high : r[j].low + (r[j].high - r[j].low) * d[j] / (G - 1);
                break;
            }
            d[j] = 0;
            x[j] = r[j].low;
        }
    }
    return {lo, hi};
}

void worst_case_growth(benchmark::State& s, int k) {
    switch (k) {
        case 4: return full<4>(s);
        case 8: return full<8>(s);
        case 12: return full<12>(s);
        default: return full<16>(s);
    }
}
void metric_bounds_growth(benchmark::State& s, int k) {
    switch (k) {
        case 4: return corners<4>(s);
        case 8: return corners<8>(s);
        case 12: return corners<12>(s);
        default: return corners<16>(s);
    }
}
void worst_case_10(benchmark::State& s, int variant) {
    if (variant == 0 || variant == 1) {
        const std::size_t G = variant == 0 ? 4 : 3;
        if (variant == 0) {
            const auto g = grid<10>(4);
            const auto wc = worst_case(network<10>());
            if (g[0] != wc[0].min.value || g[1] != wc[0].max.value) {
                std::fprintf(stderr, "worst_case_bench: grid and worst_case disagree; nothing is timed\n");
                std::abort();
            }
        }
        for (auto _ : s) benchmark::DoNotOptimize(grid<10>(G));
        s.counters["evaluations"] = std::pow(static_cast<double>(G), 10);
    } else if (variant == 2) {
        full<10>(s);
    } else {
        corners<10>(s);
    }
}

const timer_astable oscillator = tauforge_bench::oscillator();
void oscillator_worst_case(benchmark::State& s, bool full) { tauforge_bench::worst_case_or_full_search(s, oscillator, full); }

}  // namespace

BENCHMARK_CAPTURE(oscillator_worst_case, baseline, true)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(oscillator_worst_case, worst_case, false)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(worst_case_growth, baseline, 4);
BENCHMARK_CAPTURE(worst_case_growth, k8, 8);
BENCHMARK_CAPTURE(worst_case_growth, k12, 12);
BENCHMARK_CAPTURE(worst_case_growth, k16, 16)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(metric_bounds_growth, baseline, 4);
BENCHMARK_CAPTURE(metric_bounds_growth, k8, 8);
BENCHMARK_CAPTURE(metric_bounds_growth, k12, 12);
BENCHMARK_CAPTURE(metric_bounds_growth, k16, 16)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(worst_case_10, baseline, 0)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(worst_case_10, grid3, 1)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(worst_case_10, worst_case, 2)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(worst_case_10, metric_bounds, 3)->Unit(benchmark::kMillisecond);
