// The C++ side of the Python call overhead (bench/python_overhead.py times the same
// call from Python with timeit): synthesize the README's 1 ms ±20 % delay from E24
// 1 kΩ .. 1 MΩ and E12 1 nF .. 1 µF, top 3, value sets built once outside the loop,
// candidates taken from them inside it (as the module does on every call).
#include <tauforge/networks/rc_delay.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <benchmark/benchmark.h>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

void synthesize_readme_delay(benchmark::State& state) {
    const rc_delay net;
    timing_spec<rc_delay> spec;
    spec.around("delay", 1_ms, tolerance::symmetric(0.20));
    const auto r = value_set<resistance>::from_series(e_series::e24, 1_kohm, 1_Mohm);
    const auto c = value_set<capacitance>::from_series(e_series::e12, 1_nF, 1_uF);
    for (auto _ : state) {
        auto res = synthesize(net, spec, {candidates(r), candidates(c)}, {.top_k = 3});
        benchmark::DoNotOptimize(res);
    }
}
BENCHMARK(synthesize_readme_delay);

}  // namespace
