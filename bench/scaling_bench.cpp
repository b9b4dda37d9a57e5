// How the solver's cost grows: the fast path (search_method::fast, top 10) for
// a 2-part network (rc_delay: R, C) and a 3-part one (timer_astable: Ra, Rb, C)
// with every slot drawn from E12, E24, E48, E96 or E192 over the same decades
// (R 1 kohm .. 1 Mohm, C 1 nF .. 1 uF). Every part is bought at the same
// tolerance whatever its series (R 1 %, C 5 %), so that only the number of
// values changes from one size to the next.
//
// Pairs (bench/run.sh prints baseline time / variant time, < 1: the variant is slower):
//   scaling_rc_delay/baseline (E12)       against /e24 /e48 /e96 /e192
//   scaling_timer_astable/baseline (E12)  against /e24 /e48 /e96 /e192
//   scaling_parts_<series>/baseline (rc_delay) against /timer_astable, same series
// Counters: designs_evaluated (designs the search scored), values_per_slot,
// and time_per_design (time / designs_evaluated).
//
// Before its first timing, each configuration checks its result: the fast path
// must return 10 designs that hold, exactly the exhaustive top 10 wherever the
// exhaustive search stays under half a million designs (every rc_delay size,
// timer_astable E12 and E24), and a best margin no worse than that of the
// series nested in it (E12 in E24; E48 in E96 in E192). The process aborts
// otherwise.
#include <tauforge/networks/rc_delay.hpp>
#include <tauforge/networks/timer_astable.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <benchmark/benchmark.h>

#include <array>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <optional>
#include <string>
#include <vector>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

constexpr std::array<e_series, 5> sizes{e_series::e12, e_series::e24, e_series::e48, e_series::e96, e_series::e192};
constexpr std::uint64_t exhaustive_limit = 500'000;  // designs; above it only the chain check runs
constexpr std::size_t top_k = 10;

const std::vector<candidate_value>& resistors(e_series s) {
    static const auto sets = [] {
        std::array<std::vector<candidate_value>, 7> v;
        for (e_series e : sizes)
            v[static_cast<std::size_t>(e)] =
                candidates(value_set<resistance>::from_series(e, 1_kohm, 1_Mohm, tolerance::symmetric(0.01)));
        return v;
    }();
    return sets[static_cast<std::size_t>(s)];
}

const std::vector<candidate_value>& capacitors(e_series s) {
    static const auto sets = [] {
        std::array<std::vector<candidate_value>, 7> v;
        for (e_series e : sizes)
            v[static_cast<std::size_t>(e)] =
                candidates(value_set<capacitance>::from_series(e, 1_nF, 1_uF, tolerance::symmetric(0.05)));
        return v;
    }();
    return sets[static_cast<std::size_t>(s)];
}

// A power-on delay of 4.7 ms +/- 15 % at worst case.
const rc_delay& delay_net() {
    static const rc_delay n{};
    return n;
}
const timing_spec<rc_delay>& delay_spec() {
    static const auto s = [] {
        timing_spec<rc_delay> t;
        t.around("delay", 4.7_ms, tolerance::symmetric(0.15));
        return t;
    }();
    return s;
}

// A 2.4 kHz +/- 15 % oscillator with a duty of 55 .. 65 %.
const timer_astable& oscillator_net() {
    static const timer_astable n{};
    return n;
}
const timing_spec<timer_astable>& oscillator_spec() {
    static const auto s = [] {
        timing_spec<timer_astable> t;
        t.around("frequency", 2.4_kHz, tolerance::symmetric(0.15)).between("duty", 0.55, 0.65);
        return t;
    }();
    return s;
}

template <class N>
using slot_sets = std::array<std::vector<candidate_value>, N::design_slots.size()>;

slot_sets<rc_delay> sets_for(const rc_delay&, e_series s) { return {resistors(s), capacitors(s)}; }
slot_sets<timer_astable> sets_for(const timer_astable&, e_series s) {
    return {resistors(s), resistors(s), capacitors(s)};
}

template <class N>
std::uint64_t combinations(const slot_sets<N>& sets) {
    std::uint64_t n = 1;
    for (const auto& v : sets) n *= v.size();
    return n;
}

[[noreturn]] void fail(const char* net, e_series s, const std::string& what) {
    std::fprintf(stderr, "scaling_bench: %s %s: %s; nothing is timed\n", net, series_name(s).data(), what.c_str());
    std::abort();
}

template <class N>
bool same_designs(const synthesis_result<N>& a, const synthesis_result<N>& b) {
    if (a.designs.size() != b.designs.size()) return false;
    for (std::size_t i = 0; i < a.designs.size(); ++i)
        for (std::size_t s = 0; s < N::design_slots.size(); ++s)
            if (a.designs[i].parts[s].value != b.designs[i].parts[s].value) return false;
    return true;
}

template <class N>
synthesis_result<N> fast(const N& net, const timing_spec<N>& spec, const slot_sets<N>& sets) {
    return synthesize(net, spec, sets, {.top_k = top_k, .method = search_method::fast});
}

// The best margin the fast path finds for each series, computed once.
template <class N>
double best_margin(const N& net, const timing_spec<N>& spec, e_series s) {
    static std::array<std::optional<double>, 7> cache;
    auto& m = cache[static_cast<std::size_t>(s)];
    if (!m) {
        const auto r = fast(net, spec, sets_for(net, s));
        if (r.designs.empty()) return -std::numeric_limits<double>::infinity();
        m = r.designs.front().margin;
    }
    return *m;
}

// The series whose values are all in s (E12 in E24; E48 in E96 in E192), if any.
std::optional<e_series> nested_in(e_series s) {
    switch (s) {
        case e_series::e24: return e_series::e12;
        case e_series::e96: return e_series::e48;
        case e_series::e192: return e_series::e96;
        default: return std::nullopt;
    }
}

// The checks described at the top, once per configuration before its first timing.
template <class N>
void check(const char* name, const N& net, const timing_spec<N>& spec, e_series s) {
    static std::array<bool, 7> done{};
    if (done[static_cast<std::size_t>(s)]) return;
    const auto sets = sets_for(net, s);
    const auto r = fast(net, spec, sets);
    if (r.designs.size() != top_k) fail(name, s, "expected " + std::to_string(top_k) + " designs that hold");
    if (combinations<N>(sets) <= exhaustive_limit &&
        !same_designs(r, synthesize(net, spec, sets, {.top_k = top_k, .method = search_method::exhaustive})))
        fail(name, s, "fast path and exhaustive search disagree");
    if (const auto inner = nested_in(s);
        inner && detail::rank_key(best_margin(net, spec, s)) < detail::rank_key(best_margin(net, spec, *inner)))
        fail(name, s, "its best design is worse than the best from " + std::string(series_name(*inner)) +
                          ", whose values it contains");
    done[static_cast<std::size_t>(s)] = true;
}

template <class N>
void run(benchmark::State& state, const char* name, const N& net, const timing_spec<N>& spec, e_series s) {
    check(name, net, spec, s);
    const auto sets = sets_for(net, s);
    std::uint64_t evaluated = 0;
    for (auto _ : state) {
        auto r = fast(net, spec, sets);
        evaluated = r.evaluated;
        benchmark::DoNotOptimize(r.designs.data());
        benchmark::ClobberMemory();
    }
    state.counters["designs_evaluated"] = static_cast<double>(evaluated);
    state.counters["values_per_slot"] = static_cast<double>(sets[0].size());
    state.counters["time_per_design"] = benchmark::Counter(
        static_cast<double>(evaluated), benchmark::Counter::kIsIterationInvariantRate | benchmark::Counter::kInvert);
}

void bm_delay(benchmark::State& st, e_series s) { run(st, "rc_delay", delay_net(), delay_spec(), s); }
void bm_oscillator(benchmark::State& st, e_series s) {
    run(st, "timer_astable", oscillator_net(), oscillator_spec(), s);
}

std::string variant(e_series s) {
    std::string n(series_name(s));
    for (char& c : n) c = static_cast<char>(c == 'E' ? 'e' : c);
    return n;
}

// Registered in code so that every name follows "<pair>/baseline", "<pair>/<variant>".
const bool registered = [] {
    for (const char* net : {"rc_delay", "timer_astable"}) {
        const bool two = std::string(net) == "rc_delay";
        for (e_series s : sizes) {
            const std::string name = std::string("scaling_") + net + "/" + (s == e_series::e12 ? "baseline" : variant(s));
            auto* b = two ? benchmark::RegisterBenchmark(name.c_str(), bm_delay, s)
                          : benchmark::RegisterBenchmark(name.c_str(), bm_oscillator, s);
            b->Unit(benchmark::kMillisecond);
        }
    }
    for (e_series s : sizes) {
        const std::string pair = "scaling_parts_" + variant(s);
        benchmark::RegisterBenchmark((pair + "/baseline").c_str(), bm_delay, s)->Unit(benchmark::kMillisecond);
        benchmark::RegisterBenchmark((pair + "/timer_astable").c_str(), bm_oscillator, s)
            ->Unit(benchmark::kMillisecond);
    }
    return true;
}();

}  // namespace
