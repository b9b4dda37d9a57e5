#pragma once
/// Extreme value analysis over any TimingNetwork: each metric's nominal value,
/// its minimum and maximum over the parameters' intervals, and the corner
/// (parameter values) that produces each extreme.
///
///     auto wc = tauforge::worst_case(net);
///     double t_max = wc[0].max.value;               // metric 0, SI unit
///     auto where = wc[0].max.positions;             // low / high / nominal / interior per parameter
///
/// Two calls:
/// - `metric_bounds(n)`: corners only, allocation-free, for a solver's hot loop.
///   It assumes every metric is monotone in every parameter (true for RC
///   delays in R, C and a threshold ratio) and then gives exact bounds.
/// - `worst_case(n)`: corners, then a check of monotonicity along every
///   parameter; a parameter along which some metric changes direction gets its
///   interior searched (a grid, then golden-section refinement, with the other
///   parameters at their corners), so an interior extremum such as x (1 - x)
///   at x = 1/2 is found. Lines of the check that coincide are scanned once, and
///   a network that declares itself monotone (a member `corners_are_bounds()`
///   returning true) is not scanned: its corners are its bounds.
///
/// The corners grow as 2^k in the number k of free (low < high) parameters;
/// fixed parameters are not enumerated. k is limited to 20 (about a million
/// evaluations); k = 16 is 65,536 evaluations without heap allocation.

#include "tauforge/analysis/common.hpp"
#include "tauforge/concepts.hpp"
#include "tauforge/detail/analysis_common.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <string>
#include <tuple>
#include <utility>

namespace tauforge {

/// A metric's nominal value and its extremes (the same layout as a parameter interval).
using bounds = interval;

/// Where a parameter sits at an extreme.
enum class corner_position : unsigned char {
    fixed,     ///< the parameter has no spread (low == high)
    low,       ///< at its low end
    high,      ///< at its high end
    nominal,   ///< at its nominal value
    interior,  ///< strictly inside, not at the nominal: the metric turns there
};

/// One extreme of one metric and where it occurs.
template <std::size_t P>
struct corner {
    double value = 0.0;                          ///< the metric's extreme value (SI unit)
    std::array<double, P> parameters{};          ///< parameter values there (SI units)
    std::array<corner_position, P> positions{};  ///< where each parameter sits
};

/// Nominal value, minimum and maximum of one metric.
template <std::size_t P>
struct metric_extremes {
    double nominal = 0.0;  ///< at every parameter's nominal
    corner<P> min;         ///< the smallest value and its corner
    corner<P> max;         ///< the largest value and its corner
};

/// How thoroughly `worst_case` looks beyond the corners.
struct worst_case_options {
    unsigned scan_points = 9;     ///< points along each parameter for the monotonicity check (3..33)
    unsigned grid_points = 17;    ///< grid along a non-monotone parameter before refinement (3..32)
    double flatness = 1e-10;      ///< relative change below which a step counts as flat (noise)
    bool search_interior = true;  ///< search non-monotone parameters' interiors (else report corners only)
    std::size_t max_evaluations = std::size_t{1} << 22;  ///< limit of the interior grid search
};

/// Everything `worst_case` found.
template <std::size_t P, std::size_t M>
struct worst_case_result {
    std::array<metric_extremes<P>, M> metrics{};  ///< per metric, in the network's order
    std::array<bool, P> monotone{};               ///< false where some metric changes direction along the parameter
    std::size_t free_parameters = 0;              ///< k: parameters with low < high
    std::size_t evaluations = 0;                  ///< network evaluations used

    /// The extremes of metric m.
    const metric_extremes<P>& operator[](std::size_t m) const { return metrics[m]; }
};

/// Every metric's nominal, low and high over the corners of the free
/// parameters, given the ranges: corners only (exact when each metric is
/// monotone in each parameter), no heap allocation. The nominal value takes
/// part in the bounds. Throws above 20 free parameters.
template <TimingNetwork N>
std::array<bounds, metric_count_v<N>> metric_bounds(const N& n, const std::array<interval, parameter_count_v<N>>& r) {
    return detail::corner_bounds(n, r, "metric_bounds");
}

/// metric_bounds over the network's own (checked) ranges.
template <TimingNetwork N>
std::array<bounds, metric_count_v<N>> metric_bounds(const N& n) {
    return metric_bounds(n, detail::checked_ranges("metric_bounds", n));
}

namespace detail {

/// Golden-section search for the largest `sign * f` on [a, b]; returns (x, f(x)).
template <class F>
std::pair<double, double> analysis_golden(F&& f, double a, double b, double sign, double tol) {
    constexpr double inv_phi = 0.6180339887498949;  // (sqrt 5 - 1) / 2
    double c = b - inv_phi * (b - a), d = a + inv_phi * (b - a);
    double fc = f(c), fd = f(d);
    for (int it = 0; it < 200 && (b - a) > tol; ++it) {
        if (sign * fc > sign * fd) {
            b = d, d = c, fd = fc;
            c = b - inv_phi * (b - a);
            fc = f(c);
        } else {
            a = c, c = d, fc = fd;
            d = a + inv_phi * (b - a);
            fd = f(d);
        }
    }
    return sign * fc > sign * fd ? std::pair{c, fc} : std::pair{d, fd};
}

inline constexpr std::size_t analysis_max_grid = 33;  // 32 grid points + the nominal

}  // namespace detail

namespace detail {

/// worst_case; `full` true is the search without its shortcuts (every line of
/// the monotonicity scan, also where the network declares itself monotone), for
/// the test that the shortcuts change nothing.
template <TimingNetwork N>
worst_case_result<parameter_count_v<N>, metric_count_v<N>> worst_case_search(const N& n, const worst_case_options& opt,
                                                                             bool full) {
    constexpr std::string_view fn = "worst_case";
    constexpr std::size_t P = parameter_count_v<N>, M = metric_count_v<N>;
    if (opt.scan_points < 3 || opt.scan_points > detail::analysis_max_grid)
        detail::analysis_fail(fn, "scan_points", std::to_string(opt.scan_points), "3 to 33 points per parameter");
    if (opt.grid_points < 3 || opt.grid_points > 32)
        detail::analysis_fail(fn, "grid_points", std::to_string(opt.grid_points), "3 to 32 points per parameter");
    if (!(opt.flatness >= 0.0 && opt.flatness < 1.0))
        detail::analysis_fail(fn, "flatness", detail::quoted_value(opt.flatness), "a relative change from 0 to 1");

    const auto r = detail::checked_ranges(fn, n);
    const auto fs = detail::free_parameters(r);
    detail::check_corner_count(fn, fs.count);

    worst_case_result<P, M> res{};
    res.free_parameters = fs.count;
    res.monotone.fill(true);
    auto eval = [&](const std::array<double, P>& x) {
        ++res.evaluations;
        const auto v = n.evaluate(x);
        for (std::size_t m = 0; m < M; ++m) detail::check_metric<N>(fn, m, v[m]);
        return v;
    };

    // Phase 1: the corners, in Gray-code order.
    auto x = detail::nominal_point(r);
    const auto nominal = eval(x);
    std::array<double, M> lo_v, hi_v;
    std::array<std::uint32_t, M> lo_mask{}, hi_mask{};
    lo_v.fill(std::numeric_limits<double>::infinity());
    hi_v.fill(-std::numeric_limits<double>::infinity());
    detail::for_each_corner(r, fs, x, [&](std::uint32_t mask) {
        const auto v = eval(x);
        for (std::size_t m = 0; m < M; ++m) {
            if (v[m] < lo_v[m]) lo_v[m] = v[m], lo_mask[m] = mask;
            if (v[m] > hi_v[m]) hi_v[m] = v[m], hi_mask[m] = mask;
        }
    });
    std::array<std::array<double, P>, M> lo_x, hi_x;
    for (std::size_t m = 0; m < M; ++m) {
        lo_x[m] = detail::corner_point(r, fs, lo_mask[m]);
        hi_x[m] = detail::corner_point(r, fs, hi_mask[m]);
    }

    // Phase 2: is every metric monotone along every free parameter? Scan each
    // parameter at `scan_points` with the others at the nominal and at each
    // metric's extreme corners; a significant rise and a significant fall on
    // the same line means the metric turns inside the interval.
    // Lines that coincide are scanned once: two bases that differ at most in p give
    // the same line along p (y[p] is overwritten), so the same values and verdict;
    // extreme corners shared by several metrics, or differing only in p, are common.
    // A network that declares every metric monotone in every parameter needs no scan:
    // its corners are the bounds.
    const bool scan = full || !declares_corners_are_bounds(n);
    std::size_t non_monotone = 0;
    for (std::size_t b = 0; b < fs.count && scan; ++b) {
        const std::size_t p = fs.index[b];
        bool turns = false;
        std::array<std::array<double, P>, 1 + 2 * M> scanned;
        std::size_t lines = 0;
        for (std::size_t base = 0; base < 1 + 2 * M && !turns; ++base) {
            std::array<double, P> y =
                base == 0 ? detail::nominal_point(r) : (base % 2 ? lo_x[(base - 1) / 2] : hi_x[(base - 1) / 2]);
            y[p] = r[p].low;
            if (!full &&
                std::find(scanned.begin(), scanned.begin() + static_cast<std::ptrdiff_t>(lines), y) !=
                    scanned.begin() + static_cast<std::ptrdiff_t>(lines))
                continue;
            scanned[lines++] = y;
            std::array<double, M> scale{};
            std::array<bool, M> rise{}, fall{};
            std::array<std::array<double, detail::analysis_max_grid>, M> line{};
            const unsigned S = opt.scan_points;
            for (unsigned s = 0; s < S; ++s) {
                y[p] = s + 1 == S ? r[p].high : r[p].low + (r[p].high - r[p].low) * s / (S - 1);
                const auto v = eval(y);
                for (std::size_t m = 0; m < M; ++m) {
                    line[m][s] = v[m];
                    scale[m] = std::max(scale[m], std::abs(v[m]));
                }
            }
            for (std::size_t m = 0; m < M; ++m) {
                const double tol = opt.flatness * scale[m];
                for (unsigned s = 1; s < S; ++s) {
                    const double d = line[m][s] - line[m][s - 1];
                    if (d > tol) rise[m] = true;
                    if (d < -tol) fall[m] = true;
                }
                if (rise[m] && fall[m]) turns = true;
            }
        }
        if (turns) {
            res.monotone[p] = false;
            ++non_monotone;
        }
    }

    std::array<std::array<double, P>, M> best_lo = lo_x, best_hi = hi_x;
    if (non_monotone > 0 && opt.search_interior) {
        // Phase 3: a grid over the non-monotone parameters (equally spaced plus
        // the nominal) times the corners of the monotone ones, then
        // golden-section refinement of each extreme along each non-monotone parameter.
        std::array<std::array<double, detail::analysis_max_grid>, P> cand{};
        std::array<std::size_t, P> ncand{};
        std::size_t total = 1;
        for (std::size_t b = 0; b < fs.count; ++b) {
            const std::size_t p = fs.index[b];
            const interval& i = r[p];
            if (res.monotone[p]) {
                cand[b][0] = i.low, cand[b][1] = i.high, ncand[b] = 2;
            } else {
                std::size_t c = 0;
                bool nominal_done = false;
                for (unsigned g = 0; g < opt.grid_points; ++g) {
                    const double v =
                        g + 1 == opt.grid_points ? i.high : i.low + (i.high - i.low) * g / (opt.grid_points - 1);
                    if (!nominal_done && i.nominal <= v) {
                        if (i.nominal < v) cand[b][c++] = i.nominal;
                        nominal_done = true;
                    }
                    cand[b][c++] = v;
                }
                ncand[b] = c;
            }
            if (total > opt.max_evaluations / ncand[b])
                detail::analysis_fail_domain(fn, "interior search evaluations",
                                             "more than " + std::to_string(opt.max_evaluations),
                                             "at most max_evaluations = " + std::to_string(opt.max_evaluations) + " (" +
                                                 std::to_string(non_monotone) +
                                                 " non-monotone parameters); lower grid_points or fix parameters");
            total *= ncand[b];
        }
        std::array<unsigned char, P> digit{};
        std::array<std::array<unsigned char, P>, M> lo_d{}, hi_d{};
        auto y = detail::nominal_point(r);
        for (std::size_t b = 0; b < fs.count; ++b) y[fs.index[b]] = cand[b][0];
        lo_v.fill(std::numeric_limits<double>::infinity());
        hi_v.fill(-std::numeric_limits<double>::infinity());
        for (;;) {
            const auto v = eval(y);
            for (std::size_t m = 0; m < M; ++m) {
                if (v[m] < lo_v[m]) lo_v[m] = v[m], lo_d[m] = digit;
                if (v[m] > hi_v[m]) hi_v[m] = v[m], hi_d[m] = digit;
            }
            std::size_t b = 0;
            for (; b < fs.count; ++b) {
                const std::size_t p = fs.index[b];
                if (++digit[b] < ncand[b]) {
                    y[p] = cand[b][digit[b]];
                    break;
                }
                digit[b] = 0;
                y[p] = cand[b][0];
            }
            if (b == fs.count) break;
        }
        auto point_of = [&](const std::array<unsigned char, P>& d) {
            auto z = detail::nominal_point(r);
            for (std::size_t b = 0; b < fs.count; ++b) z[fs.index[b]] = cand[b][d[b]];
            return z;
        };
        auto refine = [&](std::size_t m, std::array<double, P> z, double value, double sign) {
            for (int pass = 0; pass < 4; ++pass) {
                bool improved = false;
                for (std::size_t b = 0; b < fs.count; ++b) {
                    const std::size_t p = fs.index[b];
                    if (res.monotone[p]) continue;
                    // Bracket: the grid neighbours around the current value.
                    const double t = z[p];
                    double a = r[p].low, c = r[p].high;
                    for (std::size_t g = 0; g < ncand[b]; ++g) {
                        if (cand[b][g] < t) a = cand[b][g];
                        if (cand[b][g] > t) {
                            c = cand[b][g];
                            break;
                        }
                    }
                    auto w = z;
                    auto f = [&](double s) {
                        w[p] = s;
                        return eval(w)[m];
                    };
                    const auto [s_best, v_best] =
                        detail::analysis_golden(f, a, c, sign, 1e-10 * (r[p].high - r[p].low));
                    if (sign * v_best > sign * value) {
                        const bool big = sign * (v_best - value) > 1e-14 * std::abs(value);
                        value = v_best;
                        z[p] = s_best;
                        improved = improved || big;
                    }
                }
                if (!improved) break;
            }
            return std::pair{z, value};
        };
        for (std::size_t m = 0; m < M; ++m) {
            std::tie(best_lo[m], lo_v[m]) = refine(m, point_of(lo_d[m]), lo_v[m], -1.0);
            std::tie(best_hi[m], hi_v[m]) = refine(m, point_of(hi_d[m]), hi_v[m], 1.0);
        }
    }

    auto make_corner = [&](double value, const std::array<double, P>& z) {
        corner<P> c{value, z, {}};
        for (std::size_t j = 0; j < P; ++j) {
            const interval& i = r[j];
            c.positions[j] = i.is_fixed()        ? corner_position::fixed
                             : z[j] == i.low     ? corner_position::low
                             : z[j] == i.high    ? corner_position::high
                             : z[j] == i.nominal ? corner_position::nominal
                                                 : corner_position::interior;
        }
        return c;
    };
    for (std::size_t m = 0; m < M; ++m) {
        // The nominal point is a candidate too (it matters when all parameters are fixed).
        if (nominal[m] < lo_v[m]) lo_v[m] = nominal[m], best_lo[m] = detail::nominal_point(r);
        if (nominal[m] > hi_v[m]) hi_v[m] = nominal[m], best_hi[m] = detail::nominal_point(r);
        res.metrics[m] = {nominal[m], make_corner(lo_v[m], best_lo[m]), make_corner(hi_v[m], best_hi[m])};
    }
    return res;
}

}  // namespace detail

/// The extremes of every metric over the parameters' intervals and the corners
/// that produce them; see the header comment for the method. The reported
/// extremes are true bounds when, along each parameter, a change of direction
/// shows up between `scan_points` equally spaced points (at the nominal or at an
/// extreme corner of the others) and each metric is unimodal between grid points.
template <TimingNetwork N>
worst_case_result<parameter_count_v<N>, metric_count_v<N>> worst_case(const N& n, const worst_case_options& opt = {}) {
    return detail::worst_case_search(n, opt, false);
}

}  // namespace tauforge
