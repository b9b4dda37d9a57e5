// Best two-part combination from E96 over 1 ohm .. 10 Mohm (673 values): the library's
// O(n (log n + k)) search against brute force over all n (n + 1) / 2 pairs, same set,
// same targets. Named "<case>/baseline" and "<case>/search" for bench/run.sh's ratios.
#include <tauforge/series.hpp>

#include <benchmark/benchmark.h>

#include <array>
#include <cmath>
#include <cstdint>
#include <random>
#include <vector>

namespace {

using namespace tauforge;
using namespace tauforge::literals;

const value_set<resistance>& e96_set() {
    static const auto set = value_set<resistance>::from_series(e_series::e96, 1_ohm, 10_Mohm);
    return set;
}

// 64 log-uniform targets from 1 ohm to 20 Mohm; the transform to [0, 1) is our own,
// so the sequence is the same with every standard library.
const std::array<double, 64>& targets() {
    static const auto t = [] {
        std::array<double, 64> out{};
        std::mt19937_64 rng(42);
        for (double& x : out) x = std::pow(10.0, 7.3 * static_cast<double>(rng() >> 11) * 0x1.0p-53);
        return out;
    }();
    return t;
}

// Baseline: every pair, keeping the k best in a small sorted buffer (same ranking:
// |error|, then first index, then second index).
std::vector<pair_combination<resistance>> brute_force(const value_set<resistance>& set, double target,
                                                      connection how, std::size_t k) {
    struct hit {
        double abs_error, value, error;
        std::size_t i, j;
    };
    const auto v = set.si_values();
    const bool sum = how == connection::series;
    std::vector<hit> best;
    best.reserve(k + 1);
    for (std::size_t i = 0; i < v.size(); ++i)
        for (std::size_t j = i; j < v.size(); ++j) {
            const double c = sum ? v[i] + v[j] : 1.0 / (1.0 / v[i] + 1.0 / v[j]);
            const double e = c / target - 1.0;
            const hit h{std::abs(e), c, e, i, j};
            if (best.size() == k && !(h.abs_error < best.back().abs_error)) continue;  // later (i, j) lose ties
            auto at = best.end();
            while (at != best.begin() && h.abs_error < (at - 1)->abs_error) --at;
            best.insert(at, h);
            if (best.size() > k) best.pop_back();
        }
    std::vector<pair_combination<resistance>> out;
    for (const hit& h : best)
        out.push_back({set[h.i], set[h.j], how, resistance::from_value(h.value), h.error,
                       combined_tolerance(set[h.i], set[h.j], how)});
    return out;
}

// Checked once, before any timing: the baseline must find exactly what the library
// finds (parts and errors, k = 5, both connections, every target), or nothing is timed.
bool search_agrees_with_brute_force() {
    static const bool same = [] {
        const auto& set = e96_set();
        for (connection how : {connection::series, connection::parallel})
            for (double t : targets()) {
                const auto a = best_pairs(set, resistance::from_value(t), how, 5);
                const auto b = brute_force(set, t, how, 5);
                if (a.size() != b.size()) return false;
                for (std::size_t r = 0; r < a.size(); ++r)
                    if (!(a[r].first == b[r].first && a[r].second == b[r].second && a[r].error == b[r].error))
                        return false;
            }
        return true;
    }();
    return same;
}

void bm_best_pairs_search(benchmark::State& state, connection how, std::size_t k) {
    if (!search_agrees_with_brute_force()) return state.SkipWithError("search and brute force disagree");
    const auto& set = e96_set();
    std::size_t n = 0;
    for (auto _ : state) {
        auto r = best_pairs(set, resistance::from_value(targets()[n++ % 64]), how, k);
        benchmark::DoNotOptimize(r.data());
    }
    state.counters["values"] = static_cast<double>(set.size());
}

void bm_best_pairs_brute_force(benchmark::State& state, connection how, std::size_t k) {
    if (!search_agrees_with_brute_force()) return state.SkipWithError("search and brute force disagree");
    const auto& set = e96_set();
    std::size_t n = 0;
    for (auto _ : state) {
        auto r = brute_force(set, targets()[n++ % 64], how, k);
        benchmark::DoNotOptimize(r.data());
    }
    state.counters["values"] = static_cast<double>(set.size());
}

}  // namespace

#define TAUFORGE_COMBINE_CASE(how, k)                                                                   \
    BENCHMARK_CAPTURE(bm_best_pairs_brute_force, how##_k##k, connection::how, k)                          \
        ->Name("best_pairs_e96_" #how "_k" #k "/baseline")                                                \
        ->Unit(benchmark::kMicrosecond);                                                                  \
    BENCHMARK_CAPTURE(bm_best_pairs_search, how##_k##k, connection::how, k)                               \
        ->Name("best_pairs_e96_" #how "_k" #k "/search")                                                  \
        ->Unit(benchmark::kMicrosecond)

TAUFORGE_COMBINE_CASE(series, 1);
TAUFORGE_COMBINE_CASE(parallel, 1);
TAUFORGE_COMBINE_CASE(series, 5);
TAUFORGE_COMBINE_CASE(parallel, 5);
