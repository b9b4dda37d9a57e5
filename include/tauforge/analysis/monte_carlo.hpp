#pragma once
/// Monte Carlo yield over any TimingNetwork, reproducible from a seed on any
/// compiler and standard library.
///
///     tauforge::monte_carlo_options<my_network> opt;
///     opt.samples = 1'000'000;
///     opt.spec[0] = tauforge::spec_window::between(0.9_ms, 1.3_ms);
///     auto mc = tauforge::monte_carlo(net, opt);
///     mc.yield.estimate, mc.yield.low, mc.yield.high;   // joint yield with its 95 % interval
///
/// The random numbers (see detail/random_streams.hpp): the uniform for sample i,
/// parameter j is uniform53(splitmix64 output number i P + j of the seed) — a
/// counter-based stream, so any sample can be drawn on its own. Samples are
/// processed in fixed blocks of `monte_carlo_block` samples; each block's
/// moments are merged in block order, so the result is bit-for-bit the same
/// for any thread count. Within a block, samples are drawn and evaluated in
/// chunks of `detail::monte_carlo_chunk`, parameters as columns (the transforms
/// run over whole columns, the inverse normal CDF vectorised); a network that
/// is a BlockEvaluableNetwork evaluates each chunk at once, any other one point
/// by point. Every sample is bit-identical to `monte_carlo_sample` followed by
/// `evaluate`. (Across platforms the sequence is fixed; the values
/// agree to the last bit where the math library's log and the network's own
/// functions round alike.)
///
/// Distributions per parameter, over its interval [low, high] with nominal:
/// - normal (default): half-widths are k sigma (the spread_convention, k = 3),
///   truncated at the interval. For an asymmetric interval the two sides get
///   their own sigma, (nominal - low) / k and (high - nominal) / k: a two-piece
///   normal with its mode at the nominal, continuous there, each side truncated at
///   k sigma; the mass on each side is proportional to its sigma. For a symmetric
///   interval this is exactly the truncated normal.
/// - uniform: low + u (high - low).
/// - custom: a callable mapping u in [0, 1) to a value (an inverse CDF); it must
///   be safe to call from several threads when threads > 1.
/// Fixed parameters (low == high) are not drawn.
///
/// Memory: with percentiles, worst samples or keep_distribution, the metric
/// values are kept, 8 bytes per sample per metric. Percentiles interpolate
/// linearly between order statistics at h = (n - 1) p; the order statistics
/// come from a bucket count and a selection within the buckets that hold them
/// (exact, O(n), no sort).

#include "tauforge/analysis/common.hpp"
#include "tauforge/concepts.hpp"
#include "tauforge/detail/analysis_common.hpp"
#include "tauforge/detail/probability.hpp"
#include "tauforge/detail/random_streams.hpp"

#include <algorithm>
#include <array>
#include <atomic>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <exception>
#include <functional>
#include <limits>
#include <numeric>
#include <string>
#include <thread>
#include <type_traits>
#include <utility>
#include <vector>

namespace tauforge {

/// The shape of one parameter's distribution over its interval.
enum class distribution_kind { normal, uniform, custom };

/// One parameter's distribution.
struct parameter_distribution {
    distribution_kind kind = distribution_kind::normal;  ///< normal (truncated, two-piece), uniform or custom
    std::function<double(double)> from_uniform{};        ///< custom only: u in [0, 1) -> value (SI unit)

    /// Truncated normal, sigma from the spread convention (the default).
    static parameter_distribution normal() { return {}; }
    /// Uniform over the interval.
    static parameter_distribution uniform() { return {distribution_kind::uniform, {}}; }
    /// A user-given inverse CDF.
    static parameter_distribution custom(std::function<double(double)> f) {
        return {distribution_kind::custom, std::move(f)};
    }
};

/// Samples per block: the unit of work for threads and of the moment merge.
inline constexpr std::size_t monte_carlo_block = 4096;

/// Settings of a Monte Carlo run over a network with P parameters and M metrics;
/// spelled `monte_carlo_options<Network>`.
template <std::size_t P, std::size_t M>
struct monte_carlo_settings {
    std::uint64_t seed = 1;                                 ///< the same seed and sample count give the same result
    std::size_t samples = 100'000;                          ///< number of samples (>= 2)
    unsigned threads = 1;                                   ///< worker threads; 0: one per hardware thread
    std::array<parameter_distribution, P> distributions{};  ///< per parameter (default normal)
    spread_convention convention{};                         ///< half-width = k sigma for normal parameters
    std::array<spec_window, M> spec{};                      ///< per metric; open windows do not limit the yield
    std::vector<double> percentiles{0.00135, 0.025, 0.5, 0.975, 0.99865};  ///< probabilities in [0, 1]
    std::size_t worst_samples = 5;   ///< per metric: samples closest to (or farthest outside) the window
    double confidence = 0.95;        ///< of the yield intervals
    bool keep_distribution = false;  ///< keep each metric's sorted sample values
};

/// The Monte Carlo settings for network type N (const or not).
template <class N>
requires TimingNetwork<std::remove_cvref_t<N>>
using monte_carlo_options =
    monte_carlo_settings<parameter_count_v<std::remove_cvref_t<N>>, metric_count_v<std::remove_cvref_t<N>>>;

/// A proportion with a confidence interval.
struct proportion_interval {
    double estimate = 0.0;  ///< successes / trials
    double low = 0.0;       ///< lower confidence limit
    double high = 0.0;      ///< upper confidence limit
};

/// Wilson score interval for `successes` out of `trials` at `confidence`:
/// (p + z^2/2n +/- z sqrt(p (1 - p)/n + z^2/4n^2)) / (1 + z^2/n), z the normal
/// quantile at 1 - (1 - confidence)/2.
inline proportion_interval wilson_interval(std::size_t successes, std::size_t trials, double confidence = 0.95) {
    constexpr std::string_view fn = "wilson_interval";
    if (trials == 0) detail::analysis_fail(fn, "trials", "0", "at least one trial");
    if (successes > trials)
        detail::analysis_fail(fn, "successes", std::to_string(successes), "at most trials = " + std::to_string(trials));
    if (!(confidence > 0.0 && confidence < 1.0))
        detail::analysis_fail(fn, "confidence", detail::quoted_value(confidence),
                              "a probability strictly between 0 and 1");
    const double n = static_cast<double>(trials), p = static_cast<double>(successes) / n;
    const double z = -detail::normal_quantile((1.0 - confidence) / 2.0);
    const double z2 = z * z, denom = 1.0 + z2 / n;
    const double center = (p + z2 / (2.0 * n)) / denom;
    const double half = z / denom * std::sqrt(p * (1.0 - p) / n + z2 / (4.0 * n * n));
    return {p, std::max(0.0, center - half), std::min(1.0, center + half)};
}

/// Clopper–Pearson ("exact") interval from beta quantiles:
/// low = B^-1(alpha/2; k, n - k + 1), high = B^-1(1 - alpha/2; k + 1, n - k).
inline proportion_interval clopper_pearson_interval(std::size_t successes, std::size_t trials,
                                                    double confidence = 0.95) {
    constexpr std::string_view fn = "clopper_pearson_interval";
    if (trials == 0) detail::analysis_fail(fn, "trials", "0", "at least one trial");
    if (successes > trials)
        detail::analysis_fail(fn, "successes", std::to_string(successes), "at most trials = " + std::to_string(trials));
    if (!(confidence > 0.0 && confidence < 1.0))
        detail::analysis_fail(fn, "confidence", detail::quoted_value(confidence),
                              "a probability strictly between 0 and 1");
    const double k = static_cast<double>(successes), n = static_cast<double>(trials), a = 1.0 - confidence;
    const double lo = successes == 0 ? 0.0 : detail::beta_quantile(k, n - k + 1.0, a / 2.0);
    const double hi = successes == trials ? 1.0 : detail::beta_quantile(k + 1.0, n - k, 1.0 - a / 2.0);
    return {k / n, lo, hi};
}

/// A percentile: probability and value.
struct percentile_value {
    double probability = 0.0;  ///< p in [0, 1]
    double value = 0.0;        ///< the metric's p-quantile (SI unit)
};

/// One sample singled out (a worst sample), with its parameters.
template <std::size_t P>
struct sample_record {
    std::size_t index = 0;               ///< sample number: monte_carlo_sample(n, opt, index) draws it again
    double value = 0.0;                  ///< the metric's value
    double margin = 0.0;                 ///< distance to the nearest window edge, negative outside
    std::array<double, P> parameters{};  ///< the parameter values (SI units)
};

/// Statistics of one metric.
template <std::size_t P>
struct metric_statistics {
    double nominal = 0.0;                       ///< at the nominal point
    double mean = 0.0;                          ///< sample mean
    double stddev = 0.0;                        ///< sample standard deviation (n - 1)
    double min = 0.0;                           ///< smallest sample
    double max = 0.0;                           ///< largest sample
    std::vector<percentile_value> percentiles;  ///< in the order asked for
    std::size_t inside = 0;                     ///< samples within this metric's window
    proportion_interval yield{};                ///< inside / samples, Wilson score interval
    proportion_interval yield_exact{};          ///< inside / samples, Clopper–Pearson interval
    /// Smallest margin first (farthest outside, then closest to an edge); with an
    /// open window, farthest from the nominal first (margin = -|value - nominal|).
    std::vector<sample_record<P>> worst;
    std::vector<double> distribution;  ///< sorted sample values (keep_distribution only)
};

/// Everything a Monte Carlo run found.
template <std::size_t P, std::size_t M>
struct monte_carlo_result {
    std::uint64_t seed = 0;                         ///< as given
    std::size_t samples = 0;                        ///< as given
    double confidence = 0.0;                        ///< of the intervals
    std::array<metric_statistics<P>, M> metrics{};  ///< per metric
    std::size_t passing = 0;                        ///< samples within every metric's window
    proportion_interval yield{};                    ///< joint yield, Wilson score interval
    proportion_interval yield_exact{};              ///< joint yield, Clopper–Pearson interval
    /// The statistics of metric m.
    const metric_statistics<P>& operator[](std::size_t m) const { return metrics[m]; }
};

namespace detail {

/// A parameter's transform from a uniform u in [0, 1), precomputed.
struct random_transform {
    distribution_kind kind = distribution_kind::normal;
    bool fixed = false;
    double nominal = 0.0, low = 0.0, high = 0.0, width = 0.0;
    double s_minus = 0.0, s_plus = 0.0;  // two-piece normal sigmas
    double p_left = 0.5;
    double body = 0.5;                    // 1/2 - Phi(-k)
    double piece_offset[2] = {0.0, 0.5};  // u at the start of each piece
    double piece_scale[2] = {2.0, 2.0};   // 1 / (mass of each piece)
    double piece_flip[2] = {1.0, 0.0};
    double piece_sign[2] = {-1.0, 1.0};
    double piece_sigma[2] = {0.0, 0.0};  // s-, -s+
    const std::function<double(double)>* custom = nullptr;

    // Left piece (side 0): v = u / p_left, p = Phi(-k) + v (1/2 - Phi(-k)) = 1/2 - (1 - v) body,
    // x = nominal + s- z. Right piece (side 1): v = (u - p_left) / (1 - p_left),
    // p = 1/2 - v body, x = nominal - s+ z. Both give p in [Phi(-k), 1/2]. The side is
    // a coin flip, so it indexes small tables instead of taking a branch.

    /// Normal: the probability p whose standard normal quantile z gives the value.
    double normal_probability(double u) const {
        const int side = u >= p_left;
        const double v = (u - piece_offset[side]) * piece_scale[side];
        const double w = piece_flip[side] + piece_sign[side] * v;
        return 0.5 - w * body;
    }

    /// Normal: the value from u and z = inverse_normal_cdf(normal_probability(u)).
    /// (One select rather than a table: a loop over a block then vectorises.)
    double normal_value(double u, double z) const {
        const double x = nominal + (u >= p_left ? piece_sigma[1] : piece_sigma[0]) * z;
        // The quantile approximation (relative error < 1.15e-9) could step a
        // hair past +/- k; the truncation is at the interval.
        return std::clamp(x, low, high);
    }

    double operator()(double u) const {
        switch (kind) {
            case distribution_kind::uniform:
                return low + u * width;
            case distribution_kind::custom:
                return (*custom)(u);
            case distribution_kind::normal:
                break;
        }
        return normal_value(u, inverse_normal_cdf(normal_probability(u)));
    }

    /// x[k] = (*this)(u[k]) for k < n <= N, bit-identical. N is a compile-time
    /// constant so that the loops vectorise without a remainder; except for a
    /// custom distribution, x[n .. N) gets values of no meaning (u must hold N values).
    template <std::size_t N>
    void apply_block(const double* __restrict u, double* __restrict x, std::size_t n) const {
        const random_transform t = *this;  // a local copy: the stores cannot alias it
        switch (kind) {
            case distribution_kind::uniform:
                for (std::size_t k = 0; k < N; ++k) x[k] = t.low + u[k] * t.width;
                return;
            case distribution_kind::custom:
                for (std::size_t k = 0; k < n; ++k) x[k] = (*custom)(u[k]);
                return;
            case distribution_kind::normal:
                break;
        }
        std::array<double, N> p;
        for (std::size_t k = 0; k < N; ++k) p[k] = t.normal_probability(u[k]);
        inverse_normal_cdf_block<N>(p.data(), x, n);
        for (std::size_t k = 0; k < N; ++k) x[k] = t.normal_value(u[k], x[k]);
    }
};

/// Samples per chunk of the block path: parameters and metrics of one chunk, as
/// columns, stay in the first-level cache.
inline constexpr std::size_t monte_carlo_chunk = 256;

template <std::size_t P>
struct random_sampler {
    std::uint64_t seed = 0;
    std::array<random_transform, P> t{};

    /// The stream's state for parameter j of sample i: output number i P + j of the seed.
    std::uint64_t state_at(std::size_t i, std::size_t j) const {
        return seed + (static_cast<std::uint64_t>(i) * P + 1 + j) * splitmix_gamma;
    }

    /// The parameters of sample i.
    void draw(std::size_t i, std::array<double, P>& x) const {
        std::uint64_t state = state_at(i, 0);
        for (std::size_t j = 0; j < P; ++j, state += splitmix_gamma) {
            if (t[j].fixed) continue;
            x[j] = t[j](uniform53(splitmix_mix(state)));
        }
    }

    /// The parameters of samples i0 .. i0 + n - 1 (n <= monte_carlo_chunk) as
    /// columns of monte_carlo_chunk values: x[j][k] is parameter j of sample
    /// i0 + k, bit-identical to draw(); x[j][n ..) gets values of no meaning.
    /// Fixed parameters' columns are left as they are.
    void draw_block(std::size_t i0, std::size_t n, const std::array<double*, P>& x) const {
        constexpr std::size_t C = monte_carlo_chunk;
        std::array<double, C> u;
        for (std::size_t j = 0; j < P; ++j) {
            if (t[j].fixed) continue;
            std::uint64_t state = state_at(i0, j);
            constexpr std::uint64_t step = P * splitmix_gamma;
            for (std::size_t k = 0; k < C; ++k, state += step) u[k] = uniform53(splitmix_mix(state));
            t[j].template apply_block<C>(u.data(), x[j], n);
        }
    }
};

template <TimingNetwork N>
random_sampler<parameter_count_v<N>> make_sampler(std::string_view fn,
                                                  const std::array<interval, parameter_count_v<N>>& r,
                                                  const monte_carlo_options<N>& opt) {
    constexpr std::size_t P = parameter_count_v<N>;
    check_convention(fn, opt.convention);
    const double k = opt.convention.sigmas_per_half_width;
    const double tail = detail::normal_cdf(-k);
    random_sampler<P> s;
    s.seed = opt.seed;
    for (std::size_t j = 0; j < P; ++j) {
        random_transform& t = s.t[j];
        const interval& i = r[j];
        const parameter_distribution& d = opt.distributions[j];
        t.kind = d.kind;
        t.fixed = i.is_fixed();
        t.nominal = i.nominal, t.low = i.low, t.high = i.high, t.width = i.high - i.low;
        t.s_minus = (i.nominal - i.low) / k, t.s_plus = (i.high - i.nominal) / k;
        const double total = t.s_minus + t.s_plus;
        t.p_left = total > 0.0 ? t.s_minus / total : 0.5;
        t.piece_offset[1] = t.p_left;
        t.piece_scale[0] = t.p_left > 0.0 ? 1.0 / t.p_left : 0.0;
        t.piece_scale[1] = t.p_left < 1.0 ? 1.0 / (1.0 - t.p_left) : 0.0;
        t.piece_sigma[0] = t.s_minus, t.piece_sigma[1] = -t.s_plus;
        t.body = 0.5 - tail;
        if (d.kind == distribution_kind::custom) {
            if (!d.from_uniform)
                analysis_fail(fn, "distributions[" + std::to_string(j) + "]", std::string(N::parameters[j].name),
                              "a callable for a custom distribution");
            t.custom = &d.from_uniform;
        }
    }
    return s;
}

struct block_moments {
    double mean = 0.0, m2 = 0.0, min = 0.0, max = 0.0;
    std::size_t inside = 0;
};

/// The order statistics v_(k) (0-based ranks) for the sorted ranks `ranks`,
/// without sorting v: one pass counts values into equal-width buckets over
/// [vmin, vmax] (the bucket index is monotone in the value, so ranks map to
/// buckets through the cumulative counts), a second pass copies out the values
/// of the buckets that hold a wanted rank, and nth_element finds the rank
/// within each copy. O(n); exact.
inline std::vector<double> order_statistics(const std::vector<double>& v, double vmin, double vmax,
                                            const std::vector<std::size_t>& ranks) {
    constexpr std::size_t buckets = 4096;
    const double width = vmax - vmin;
    const double scale = width > 0.0 ? static_cast<double>(buckets) / width : 0.0;
    auto bucket_of = [&](double x) {
        const double f = (x - vmin) * scale;
        return f >= static_cast<double>(buckets - 1) ? buckets - 1 : static_cast<std::size_t>(f);
    };
    std::vector<std::size_t> count(buckets + 1, 0);
    for (const double x : v) ++count[bucket_of(x) + 1];
    for (std::size_t b = 1; b <= buckets; ++b) count[b] += count[b - 1];  // count[b]: values in buckets < b
    // The bucket of each wanted rank, and a slot for each distinct bucket.
    std::vector<std::size_t> slot_of(buckets, buckets), bucket_for(ranks.size());
    std::vector<std::size_t> slot_bucket;
    for (std::size_t i = 0; i < ranks.size(); ++i) {
        const std::size_t b =
            static_cast<std::size_t>(std::upper_bound(count.begin(), count.end(), ranks[i]) - count.begin() - 1);
        bucket_for[i] = b;
        if (slot_of[b] == buckets) {
            slot_of[b] = slot_bucket.size();
            slot_bucket.push_back(b);
        }
    }
    std::vector<std::vector<double>> copies(slot_bucket.size());
    for (std::size_t s = 0; s < slot_bucket.size(); ++s)
        copies[s].reserve(count[slot_bucket[s] + 1] - count[slot_bucket[s]]);
    for (const double x : v) {
        const std::size_t s = slot_of[bucket_of(x)];
        if (s != buckets) copies[s].push_back(x);
    }
    std::vector<double> out(ranks.size());
    for (std::size_t i = 0; i < ranks.size(); ++i) {
        auto& c = copies[slot_of[bucket_for[i]]];
        const auto k = static_cast<std::ptrdiff_t>(ranks[i] - count[bucket_for[i]]);
        std::nth_element(c.begin(), c.begin() + k, c.end());
        out[i] = c[static_cast<std::size_t>(k)];
    }
    return out;
}

/// Type 7 quantiles (linear between the order statistics at h = (n - 1) p) of v,
/// whose smallest and largest values are vmin and vmax.
inline void select_percentiles(const std::vector<double>& v, double vmin, double vmax,
                               std::vector<percentile_value>& out) {
    const std::size_t n = v.size();
    std::vector<std::size_t> ranks;
    for (const auto& pv : out) {
        const std::size_t lo =
            std::min(static_cast<std::size_t>(std::floor(static_cast<double>(n - 1) * pv.probability)), n - 1);
        ranks.push_back(lo);
        ranks.push_back(std::min(lo + 1, n - 1));
    }
    std::sort(ranks.begin(), ranks.end());
    ranks.erase(std::unique(ranks.begin(), ranks.end()), ranks.end());
    const std::vector<double> stats = order_statistics(v, vmin, vmax, ranks);
    auto at = [&](std::size_t rank) {
        return stats[static_cast<std::size_t>(std::lower_bound(ranks.begin(), ranks.end(), rank) - ranks.begin())];
    };
    for (auto& pv : out) {
        const double h = static_cast<double>(n - 1) * pv.probability;
        const std::size_t lo = std::min(static_cast<std::size_t>(std::floor(h)), n - 1);
        const double a = at(lo), b = at(std::min(lo + 1, n - 1));
        pv.value = a + (h - static_cast<double>(lo)) * (b - a);
    }
}

inline double sorted_percentile(const std::vector<double>& v, double p) {
    const std::size_t n = v.size();
    const double h = static_cast<double>(n - 1) * p;
    const std::size_t lo = std::min(static_cast<std::size_t>(std::floor(h)), n - 1);
    const double a = v[lo], b = lo + 1 < n ? v[lo + 1] : a;
    return a + (h - static_cast<double>(lo)) * (b - a);
}

}  // namespace detail

/// The parameter values of sample `index` of a run with these options (SI units).
template <TimingNetwork N>
std::array<double, parameter_count_v<N>> monte_carlo_sample(const N& n, const monte_carlo_options<N>& opt,
                                                            std::size_t index) {
    const auto r = detail::checked_ranges("monte_carlo_sample", n);
    const auto s = detail::make_sampler<N>("monte_carlo_sample", r, opt);
    auto x = detail::nominal_point(r);
    s.draw(index, x);
    return x;
}

/// Monte Carlo statistics and yield of every metric; see the header comment.
template <TimingNetwork N>
monte_carlo_result<parameter_count_v<N>, metric_count_v<N>> monte_carlo(const N& n,
                                                                        const monte_carlo_options<N>& opt = {}) {
    constexpr std::string_view fn = "monte_carlo";
    constexpr std::size_t P = parameter_count_v<N>, M = metric_count_v<N>, B = monte_carlo_block;
    if (opt.samples < 2) detail::analysis_fail(fn, "samples", std::to_string(opt.samples), "at least 2 samples");
    if (opt.worst_samples > opt.samples)
        detail::analysis_fail(fn, "worst_samples", std::to_string(opt.worst_samples),
                              "at most samples = " + std::to_string(opt.samples));
    if (opt.threads > 256)
        detail::analysis_fail(fn, "threads", std::to_string(opt.threads), "0 (automatic) to 256 threads");
    if (!(opt.confidence > 0.0 && opt.confidence < 1.0))
        detail::analysis_fail(fn, "confidence", detail::quoted_value(opt.confidence),
                              "a probability strictly between 0 and 1");
    for (const double p : opt.percentiles)
        if (!(p >= 0.0 && p <= 1.0))
            detail::analysis_fail(fn, "percentile", detail::quoted_value(p), "a probability from 0 to 1");
    for (std::size_t m = 0; m < M; ++m)
        detail::check_window(fn, "spec." + std::string(N::metrics[m].name), N::metrics[m].unit, opt.spec[m]);

    const auto r = detail::checked_ranges(fn, n);
    const auto sampler = detail::make_sampler<N>(fn, r, opt);
    const auto x_nominal = detail::nominal_point(r);
    const auto nominal = n.evaluate(x_nominal);
    for (std::size_t m = 0; m < M; ++m) detail::check_metric<N>(fn, m, nominal[m]);

    constexpr double inf = std::numeric_limits<double>::infinity();
    std::array<double, M> spec_lo, spec_hi;
    for (std::size_t m = 0; m < M; ++m) {
        spec_lo[m] = opt.spec[m].low ? *opt.spec[m].low : -inf;
        spec_hi[m] = opt.spec[m].high ? *opt.spec[m].high : inf;
    }

    const std::size_t ns = opt.samples;
    const std::size_t blocks = (ns + B - 1) / B;
    const bool keep = !opt.percentiles.empty() || opt.worst_samples > 0 || opt.keep_distribution;
    std::array<std::vector<double>, M> store;
    if (keep)
        for (auto& s : store) s.resize(ns);
    std::vector<std::array<detail::block_moments, M>> moments(blocks);
    std::vector<std::size_t> block_pass(blocks, 0);
    std::vector<std::exception_ptr> errors(blocks);
    std::atomic<std::size_t> next{0};
    std::atomic<bool> failed{false};

    const auto fs = detail::free_parameters(r);
    auto worker = [&] {
        constexpr std::size_t C = detail::monte_carlo_chunk;
        std::array<std::vector<double>, M> local;
        if (!keep)
            for (auto& l : local) l.resize(B);
        // One chunk of samples as columns; fixed parameters' columns hold the nominal.
        std::vector<double> columns(P * C);
        std::array<double*, P> col;
        std::array<const double*, P> col_in;
        for (std::size_t j = 0; j < P; ++j) {
            col[j] = columns.data() + j * C;
            col_in[j] = col[j];
            std::fill(col[j], col[j] + C, x_nominal[j]);
        }
        auto x = x_nominal;
        for (;;) {
            if (failed.load(std::memory_order_relaxed)) return;
            const std::size_t b = next.fetch_add(1, std::memory_order_relaxed);
            if (b >= blocks) return;
            try {
                const std::size_t i0 = b * B, i1 = std::min(ns, i0 + B), nb = i1 - i0;
                std::array<double*, M> out;
                for (std::size_t m = 0; m < M; ++m) out[m] = keep ? store[m].data() + i0 : local[m].data();
                for (std::size_t c0 = i0; c0 < i1; c0 += C) {
                    const std::size_t nc = std::min(C, i1 - c0);
                    sampler.draw_block(c0, nc, col);
                    std::array<double*, M> chunk_out;
                    for (std::size_t m = 0; m < M; ++m) chunk_out[m] = out[m] + (c0 - i0);
                    if constexpr (BlockEvaluableNetwork<N>) {
                        n.evaluate_block(nc, col_in, chunk_out);
                    } else {
                        for (std::size_t k = 0; k < nc; ++k) {
                            for (std::size_t f = 0; f < fs.count; ++f) x[fs.index[f]] = col[fs.index[f]][k];
                            const auto v = n.evaluate(x);
                            for (std::size_t m = 0; m < M; ++m) chunk_out[m][k] = v[m];
                        }
                    }
                }
                std::size_t pass = 0;
                for (std::size_t i = 0; i < nb; ++i) {
                    bool ok = true;
                    for (std::size_t m = 0; m < M; ++m) ok = ok && out[m][i] >= spec_lo[m] && out[m][i] <= spec_hi[m];
                    pass += ok;
                }
                block_pass[b] = pass;
                // Two-pass moments of the block (from cache), checked for finiteness.
                for (std::size_t m = 0; m < M; ++m) {
                    const double* v = out[m];
                    double sum = 0.0, lo = v[0], hi = v[0];
                    std::size_t inside = 0;
                    bool finite = true;
                    for (std::size_t i = 0; i < nb; ++i) {
                        sum += v[i];
                        lo = std::min(lo, v[i]);
                        hi = std::max(hi, v[i]);
                        inside += v[i] >= spec_lo[m] && v[i] <= spec_hi[m];
                        finite = finite && std::isfinite(v[i]);
                    }
                    if (!finite)
                        for (std::size_t i = 0; i < nb; ++i) detail::check_metric<N>(fn, m, v[i]);
                    const double mean = sum / static_cast<double>(nb);
                    double m2 = 0.0;
                    for (std::size_t i = 0; i < nb; ++i) m2 += (v[i] - mean) * (v[i] - mean);
                    moments[b][m] = {mean, m2, lo, hi, inside};
                }
            } catch (...) {
                errors[b] = std::current_exception();
                failed.store(true, std::memory_order_relaxed);
                return;
            }
        }
    };
    unsigned threads = opt.threads == 0 ? std::max(1u, std::thread::hardware_concurrency()) : opt.threads;
    threads = static_cast<unsigned>(std::min<std::size_t>(threads, blocks));
    if (threads <= 1) {
        worker();
    } else {
        std::vector<std::jthread> pool;
        pool.reserve(threads);
        for (unsigned t = 0; t < threads; ++t) pool.emplace_back(worker);
    }  // joined here
    for (const auto& e : errors)
        if (e) std::rethrow_exception(e);

    monte_carlo_result<P, M> res{};
    res.seed = opt.seed, res.samples = ns, res.confidence = opt.confidence;
    for (const std::size_t p : block_pass) res.passing += p;
    res.yield = wilson_interval(res.passing, ns, opt.confidence);
    res.yield_exact = clopper_pearson_interval(res.passing, ns, opt.confidence);
    for (std::size_t m = 0; m < M; ++m) {
        metric_statistics<P>& st = res.metrics[m];
        st.nominal = nominal[m];
        // Chan et al.'s pairwise update, in block order.
        double count = 0.0, mean = 0.0, m2 = 0.0;
        st.min = inf, st.max = -inf;
        for (std::size_t b = 0; b < blocks; ++b) {
            const auto& bm = moments[b][m];
            const double nb = static_cast<double>(std::min(ns, (b + 1) * B) - b * B);
            const double total = count + nb, delta = bm.mean - mean;
            mean += delta * (nb / total);
            m2 += bm.m2 + delta * delta * (count * nb / total);
            count = total;
            st.min = std::min(st.min, bm.min);
            st.max = std::max(st.max, bm.max);
            st.inside += bm.inside;
        }
        st.mean = mean;
        st.stddev = std::sqrt(m2 / (count - 1.0));
        st.yield = wilson_interval(st.inside, ns, opt.confidence);
        st.yield_exact = clopper_pearson_interval(st.inside, ns, opt.confidence);
        if (!keep) continue;
        std::vector<double>& v = store[m];
        if (opt.worst_samples > 0) {
            // The k smallest (margin, index) pairs, with a bounded max-heap.
            const spec_window& w = opt.spec[m];
            const bool open = w.is_open();
            const double nom = nominal[m];
            std::vector<std::pair<double, std::size_t>> heap;
            heap.reserve(opt.worst_samples);
            for (std::size_t i = 0; i < ns; ++i) {
                const double margin = open ? -std::abs(v[i] - nom) : std::min(v[i] - spec_lo[m], spec_hi[m] - v[i]);
                const std::pair<double, std::size_t> e{margin, i};
                if (heap.size() < opt.worst_samples) {
                    heap.push_back(e);
                    std::push_heap(heap.begin(), heap.end());
                } else if (e < heap.front()) {
                    std::pop_heap(heap.begin(), heap.end());
                    heap.back() = e;
                    std::push_heap(heap.begin(), heap.end());
                }
            }
            std::sort_heap(heap.begin(), heap.end());
            for (const auto& [margin, i] : heap) {
                sample_record<P> rec{i, v[i], margin, x_nominal};
                sampler.draw(i, rec.parameters);
                st.worst.push_back(rec);
            }
        }
        st.percentiles.reserve(opt.percentiles.size());
        for (const double p : opt.percentiles) st.percentiles.push_back({p, 0.0});
        if (opt.keep_distribution) {
            std::sort(v.begin(), v.end());
            for (auto& pv : st.percentiles) pv.value = detail::sorted_percentile(v, pv.probability);
            st.distribution = std::move(v);
        } else if (!st.percentiles.empty()) {
            detail::select_percentiles(v, st.min, st.max, st.percentiles);
        }
    }
    return res;
}

}  // namespace tauforge
