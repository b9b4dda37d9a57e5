#pragma once
// What several benchmarks share: the oscillator they measure, and the pair that
// times worst_case against its search without shortcuts.
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/networks/timer_astable.hpp>
#include <tauforge/parts.hpp>

#include <benchmark/benchmark.h>

#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <utility>

namespace tauforge_bench {

/// A timer_astable near 2.4 kHz with Ra, Rb, C, supply, both thresholds and
/// the discharge saturation uncertain (7 free parameters), -20 .. +70 degC.
inline tauforge::timer_astable oscillator() {
    using namespace tauforge;
    using namespace tauforge::literals;
    timer_astable n;
    n.ra = {.nominal = 12.4_kohm, .tol = tolerance::symmetric(0.01), .tcr = ppm_band::symmetric(100)};
    n.rb = {.nominal = 18.7_kohm, .tol = tolerance::symmetric(0.01), .tcr = ppm_band::symmetric(100)};
    n.c = {.nominal = 12_nF, .tol = tolerance::symmetric(0.02), .tempco = c0g};
    n.supply = ranged<voltage>::between(4.5_V, 5.5_V);
    n.lower_threshold = ranged<double>::plus_minus(1.0 / 3.0, 0.005);
    n.upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, 0.005);
    n.discharge_saturation = ranged<voltage>::between(0_V, 0.1_V);
    n.conditions = {.t_min = celsius{-20.0}, .t_max = celsius{70.0}};
    return n;
}

/// worst_case(n) (full = false) or the search without its shortcuts
/// (detail::worst_case_search, full = true); before timing, the two must agree
/// on every bound and corner bit for bit. Reports the evaluations.
template <class N>
void worst_case_or_full_search(benchmark::State& state, const N& n, bool full) {
    static const bool checked = [&] {
        const auto a = tauforge::detail::worst_case_search(n, {}, true);
        const auto b = tauforge::worst_case(n);
        for (std::size_t m = 0; m < a.metrics.size(); ++m)
            for (const auto& [x, y] : {std::pair{a[m].min, b[m].min}, std::pair{a[m].max, b[m].max}})
                if (std::memcmp(&x.value, &y.value, sizeof x.value) != 0 || x.parameters != y.parameters ||
                    x.positions != y.positions) {
                    std::fprintf(stderr, "bench: full search and worst_case disagree; nothing is timed\n");
                    std::abort();
                }
        return true;
    }();
    benchmark::DoNotOptimize(checked);
    std::size_t evals = 0;
    for (auto _ : state) {
        const auto r = full ? tauforge::detail::worst_case_search(n, {}, true) : tauforge::worst_case(n);
        evals = r.evaluations;
        benchmark::DoNotOptimize(r.metrics[0].max.value);
    }
    state.counters["evaluations"] = static_cast<double>(evals);
}

}  // namespace tauforge_bench
