#pragma once
// Random test cases with a specified sequence: std::mt19937_64 (its output is
// fixed by the standard) and our own transform to doubles, never
// std::*_distribution (implementation-defined).

#include <cmath>
#include <random>

namespace tauforge_test {

/// The top 53 bits as a double in [0, 1).
inline double unit(std::mt19937_64& g) { return static_cast<double>(g() >> 11) * 0x1.0p-53; }

/// Uniform in [lo, hi).
inline double between(std::mt19937_64& g, double lo, double hi) { return lo + (hi - lo) * unit(g); }

/// Uniform in log between lo and hi (both positive).
inline double log_uniform(std::mt19937_64& g, double lo, double hi) { return lo * std::exp(std::log(hi / lo) * unit(g)); }

}  // namespace tauforge_test
