#pragma once
// Random numbers with a specified sequence, for reproducible Monte Carlo on any
// compiler and standard library (the std::*_distribution classes are not).
//
// - splitmix64 (Steele, Lea and Flood, 2014): state += 0x9E3779B97F4A7C15, output
//   a fixed mix of the state. Its n-th output is a pure function of (seed, n), so
//   it is also a counter-based generator: any sample of any block can be drawn
//   directly, which makes results independent of how samples are split over threads.
// - uniform53: the top 53 bits as a double in [0, 1), exactly k 2^-53.
// - inverse_normal_cdf: Acklam's rational approximation (relative error below
//   1.15e-9 over (0, 1)); a rational function in the centre, sqrt(-2 ln p) in the tails.

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>

namespace tauforge::detail {

inline constexpr std::uint64_t splitmix_gamma = 0x9E3779B97F4A7C15ull;

/// The splitmix64 output function of one state value.
constexpr std::uint64_t splitmix_mix(std::uint64_t z) {
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
    return z ^ (z >> 31);
}

/// splitmix64 as a UniformRandomBitGenerator.
struct splitmix64 {
    using result_type = std::uint64_t;
    std::uint64_t state = 0;
    static constexpr result_type min() { return 0; }
    static constexpr result_type max() { return std::numeric_limits<result_type>::max(); }
    constexpr result_type operator()() { return splitmix_mix(state += splitmix_gamma); }
};

/// Output number n (from 0) of splitmix64 seeded with `seed`, without stepping through the others.
constexpr std::uint64_t splitmix_at(std::uint64_t seed, std::uint64_t n) {
    return splitmix_mix(seed + (n + 1) * splitmix_gamma);
}

/// The top 53 bits as a double in [0, 1): every value is k 2^-53, k < 2^53.
constexpr double uniform53(std::uint64_t bits) { return static_cast<double>(bits >> 11) * 0x1.0p-53; }

/// Acklam's split of (0, 1): the rational function in [p_low, 1 - p_low], the tails outside.
inline constexpr double inverse_normal_p_low = 0.02425;

/// Whether p lies in the central region of Acklam's approximation (a NaN does not).
constexpr bool inverse_normal_is_central(double p) {
    return p >= inverse_normal_p_low && p <= 1.0 - inverse_normal_p_low;
}

/// Acklam's central rational function, for p in the central region. Branch-free,
/// so a loop over a block of p vectorises.
inline double inverse_normal_central(double p) {
    constexpr double a1 = -3.969683028665376e+01, a2 = 2.209460984245205e+02, a3 = -2.759285104469687e+02,
                     a4 = 1.383577518672690e+02, a5 = -3.066479806614716e+01, a6 = 2.506628277459239e+00;
    constexpr double b1 = -5.447609879822406e+01, b2 = 1.615858368580409e+02, b3 = -1.556989798598866e+02,
                     b4 = 6.680131188771972e+01, b5 = -1.328068155288572e+01;
    const double q = p - 0.5, r = q * q;
    return (((((a1 * r + a2) * r + a3) * r + a4) * r + a5) * r + a6) * q /
           (((((b1 * r + b2) * r + b3) * r + b4) * r + b5) * r + 1.0);
}

/// Acklam's tail formulas, for p outside the central region.
inline double inverse_normal_tail(double p) {
    constexpr double c1 = -7.784894002430293e-03, c2 = -3.223964580411365e-01, c3 = -2.400758277161838e+00,
                     c4 = -2.549732539343734e+00, c5 = 4.374664141464968e+00, c6 = 2.938163982698783e+00;
    constexpr double d1 = 7.784695709041462e-03, d2 = 3.224671290700398e-01, d3 = 2.445134137142996e+00,
                     d4 = 3.754408661907416e+00;
    if (p < inverse_normal_p_low) {
        const double q = std::sqrt(-2.0 * std::log(p));
        return (((((c1 * q + c2) * q + c3) * q + c4) * q + c5) * q + c6) /
               ((((d1 * q + d2) * q + d3) * q + d4) * q + 1.0);
    }
    const double q = std::sqrt(-2.0 * std::log1p(-p));
    return -(((((c1 * q + c2) * q + c3) * q + c4) * q + c5) * q + c6) / ((((d1 * q + d2) * q + d3) * q + d4) * q + 1.0);
}

/// The standard normal quantile (inverse CDF) for p in (0, 1), Acklam's algorithm.
inline double inverse_normal_cdf(double p) {
    return inverse_normal_is_central(p) ? inverse_normal_central(p) : inverse_normal_tail(p);
}

/// z[i] = inverse_normal_cdf(p[i]) for i < n over a block of N values (n <= N;
/// N a compile-time constant so that the compiler vectorises without a
/// remainder loop; z[n .. N) is left unspecified): the central formula on all N
/// values, branch-free, then the tails (about 5 % of uniform p) one by one.
/// Each z[i], i < n, is bit-identical to inverse_normal_cdf(p[i]).
template <std::size_t N>
void inverse_normal_cdf_block(const double* __restrict p, double* __restrict z, std::size_t n) {
    for (std::size_t i = 0; i < N; ++i) z[i] = inverse_normal_central(p[i]);
    for (std::size_t i = 0; i < n; ++i)
        if (!inverse_normal_is_central(p[i])) z[i] = inverse_normal_tail(p[i]);
}

}  // namespace tauforge::detail
