// Synthesis: the fast path (solve one slot, walk its neighbours; for three
// parts after pruning boxes of candidates) against exhaustive enumeration of
// every combination, on the same spec and value sets in the same binary:
//   synthesis_two_part    rc_delay,      E96 1k .. 1M x E12 100p .. 100u
//   synthesis_three_part  timer_astable, E96 1k .. 1M x E96 1k .. 1M x E24 100p .. 100u
// Each pair first checks that both return the same top-10 (parts and margins),
// then times them.
#include <tauforge/networks/rc_delay.hpp>
#include <tauforge/networks/timer_astable.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <benchmark/benchmark.h>

#include <cstdio>
#include <cstdlib>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

const auto& resistors() {  // E96, 1 kohm .. 1 Mohm
    static const auto v = candidates(value_set<resistance>::from_series(e_series::e96, 1_kohm, 1_Mohm));
    return v;
}
const auto& capacitors() {  // E12, 100 pF .. 100 uF
    static const auto v = candidates(value_set<capacitance>::from_series(e_series::e12, 100_pF, 100_uF));
    return v;
}
const auto& fine_capacitors() {  // E24, 100 pF .. 100 uF
    static const auto v = candidates(value_set<capacitance>::from_series(e_series::e24, 100_pF, 100_uF));
    return v;
}

template <class N>
void require_same(const synthesis_result<N>& a, const synthesis_result<N>& b, const char* what) {
    bool same = a.designs.size() == b.designs.size() && !a.designs.empty();
    for (std::size_t i = 0; same && i < a.designs.size(); ++i)
        for (std::size_t s = 0; s < N::design_slots.size(); ++s)
            same = same && a.designs[i].parts[s].value == b.designs[i].parts[s].value &&
                   a.designs[i].margin == b.designs[i].margin;
    if (!same) {
        std::fprintf(stderr, "%s: fast path and exhaustive search disagree\n", what);
        std::abort();
    }
}

timing_spec<rc_delay> delay_spec() {
    timing_spec<rc_delay> s;
    s.around("delay", 4.7_ms, tolerance::symmetric(0.15));
    return s;
}

timing_spec<timer_astable> oscillator_spec() {
    timing_spec<timer_astable> s;
    s.around("frequency", 2.4_kHz, tolerance::symmetric(0.15)).between("duty", 0.55, 0.65);
    return s;
}

template <class N>
void run(benchmark::State& state, const N& net, const timing_spec<N>& spec,
         const std::array<std::vector<candidate_value>, N::design_slots.size()>& sets, search_method method) {
    static bool checked = false;
    if (!checked) {
        require_same(synthesize(net, spec, sets, {.top_k = 10, .method = search_method::fast}),
                     synthesize(net, spec, sets, {.top_k = 10, .method = search_method::exhaustive}),
                     N::metrics[0].name.data());
        checked = true;
    }
    std::uint64_t evaluated = 0;
    for (auto _ : state) {
        auto r = synthesize(net, spec, sets, {.top_k = 10, .method = method});
        evaluated = r.evaluated;
        benchmark::DoNotOptimize(r.designs.data());
    }
    state.counters["designs_evaluated"] = static_cast<double>(evaluated);
}

void two_part_fast(benchmark::State& st) {
    run(st, rc_delay{}, delay_spec(), {resistors(), capacitors()}, search_method::fast);
}
void two_part_exhaustive(benchmark::State& st) {
    run(st, rc_delay{}, delay_spec(), {resistors(), capacitors()}, search_method::exhaustive);
}
void three_part_fast(benchmark::State& st) {
    run(st, timer_astable{}, oscillator_spec(), {resistors(), resistors(), fine_capacitors()}, search_method::fast);
}
void three_part_exhaustive(benchmark::State& st) {
    run(st, timer_astable{}, oscillator_spec(), {resistors(), resistors(), fine_capacitors()},
        search_method::exhaustive);
}

}  // namespace

BENCHMARK(two_part_exhaustive)->Name("synthesis_two_part/baseline")->Unit(benchmark::kMillisecond);
BENCHMARK(two_part_fast)->Name("synthesis_two_part/fast_path")->Unit(benchmark::kMillisecond);
BENCHMARK(three_part_exhaustive)->Name("synthesis_three_part/baseline")->Unit(benchmark::kMillisecond)->Iterations(1);
BENCHMARK(three_part_fast)->Name("synthesis_three_part/fast_path")->Unit(benchmark::kMillisecond);
