#pragma once
/// What analysis and synthesis need from a timing network, as concepts.
///
/// A network is plain data plus pure functions. It names its uncertain
/// parameters and its metrics (static tables), gives each parameter's interval
/// at its operating conditions, and evaluates all metrics from one set of
/// parameter values in SI base units. Analysis (corners, sensitivities,
/// Monte Carlo) and synthesis work on any type that satisfies these concepts,
/// so adding a network never touches them.
///
///     static_assert(tauforge::TimingNetwork<tauforge::rc_delay>);

#include "tauforge/units.hpp"

#include <array>
#include <concepts>
#include <cstddef>
#include <string_view>

namespace tauforge {

/// The range one uncertain parameter can take at the operating conditions,
/// in the SI base unit of that parameter.
struct interval {
    double nominal = 0.0;
    double low = 0.0;
    double high = 0.0;
    /// A fixed value: low == nominal == high.
    static constexpr interval exactly(double v) { return {v, v, v}; }
    constexpr bool is_fixed() const { return low == high; }
    friend constexpr bool operator==(const interval&, const interval&) = default;
};

/// Static description of a parameter or a metric: its name and SI unit symbol
/// ("Ω", "F", "s", "V", "Hz", "" for a ratio).
struct quantity_info {
    std::string_view name;
    std::string_view unit;
};

/// The kind of part a synthesis slot takes: the combining rule for two-part
/// (series/parallel) values depends on it.
enum class part_kind { resistor, capacitor };

/// A part that synthesis chooses: its name, kind and the index of the
/// parameter that holds its value.
struct design_slot {
    std::string_view name;
    part_kind kind;
    std::size_t parameter;
};

struct resistor;   // parts.hpp
struct capacitor;  // parts.hpp

/// A value chosen for a design slot with the tolerance it is bought at, and,
/// when the slot's candidates come in several kinds of part, the kind: the
/// part's behaviour apart from value and tolerance (TCR, dielectric, DC bias,
/// ageing, leakage) then comes from that model instead of the network's part.
struct part_choice {
    double value = 0.0;  ///< SI base unit (Ω or F)
    tolerance tol{};
    const resistor* resistor_model = nullptr;    ///< for a resistor slot, or none
    const capacitor* capacitor_model = nullptr;  ///< for a capacitor slot, or none
};

/// `TimingNetwork<N>`: N names its parameters and metrics in static tables,
/// reports each parameter's interval, and evaluates every metric at once from
/// plain doubles in SI base units.
template <class N>
concept TimingNetwork = requires(const N& n, const std::array<double, N::parameters.size()>& x) {
    { N::parameters } -> std::convertible_to<std::array<quantity_info, N::parameters.size()>>;
    { N::metrics } -> std::convertible_to<std::array<quantity_info, N::metrics.size()>>;
    { n.ranges() } -> std::same_as<std::array<interval, N::parameters.size()>>;
    { n.evaluate(x) } -> std::same_as<std::array<double, N::metrics.size()>>;
};

namespace detail {
/// n's own answer to "do the corners bound the metrics?", or `absent` when it has no
/// member `corners_are_bounds()`.
template <class N>
constexpr bool own_corners_are_bounds(const N& n, bool absent) {
    if constexpr (requires { { n.corners_are_bounds() } -> std::convertible_to<bool>; })
        return n.corners_are_bounds();
    else
        return absent;
}
}  // namespace detail

/// Whether the corners of n's parameter box bound its metrics: true unless n
/// has a member `corners_are_bounds()` that says otherwise because some metric
/// can turn inside a parameter's interval (a pulse filter's ripple peaks at 50 %
/// duty). Synthesis then scores designs with the full `worst_case` search.
template <class N>
constexpr bool corners_are_bounds(const N& n) {
    return detail::own_corners_are_bounds(n, true);
}

/// Whether n itself declares, through a member `corners_are_bounds()` that returns
/// true, that every metric is monotone in every parameter (DEVELOPERS.md, "Adding a
/// network"); false for a network without the member. `worst_case` then trusts the
/// corners and skips its monotonicity scan.
template <class N>
constexpr bool declares_corners_are_bounds(const N& n) {
    return detail::own_corners_are_bounds(n, false);
}

template <TimingNetwork N>
inline constexpr std::size_t parameter_count_v = N::parameters.size();
template <TimingNetwork N>
inline constexpr std::size_t metric_count_v = N::metrics.size();

/// `BlockEvaluableNetwork<N>`: a TimingNetwork that can also evaluate a block of
/// points at once, parameters as columns: `n.evaluate_block(count, x, out)` with
/// x[j] pointing to `count` values of parameter j and out[m] to `count` slots
/// for metric m. It must give bit-for-bit what `evaluate` gives at every point
/// and throw what `evaluate` throws at the first point where it would. Optional:
/// Monte Carlo uses it when present and `evaluate` point by point otherwise.
template <class N>
concept BlockEvaluableNetwork =
    TimingNetwork<N> && requires(const N& n, std::size_t count,
                                 const std::array<const double*, N::parameters.size()>& x,
                                 const std::array<double*, N::metrics.size()>& out) {
        { n.evaluate_block(count, x, out) } -> std::same_as<void>;
    };

/// `DesignableNetwork<N>`: a TimingNetwork some of whose parts synthesis can
/// choose. `with_parts` returns a copy with those parts' nominal values and
/// tolerances replaced; everything else (temperature behaviour, supply,
/// thresholds) stays as the user described it.
template <class N>
concept DesignableNetwork =
    TimingNetwork<N> && requires(const N& n, const std::array<part_choice, N::design_slots.size()>& parts) {
        { N::design_slots } -> std::convertible_to<std::array<design_slot, N::design_slots.size()>>;
        { n.with_parts(parts) } -> std::same_as<N>;
    };

/// `SolvableNetwork<N>`: a DesignableNetwork that can be solved for one part:
/// given nominal values for every slot (the solved slot's entry is ignored),
/// `solve_slot(slot, metric, target, values)` returns the nominal value of
/// `slot` that puts `metric` at `target`, or a non-positive value when no
/// value of that part reaches the target. Synthesis uses it as its fast path.
template <class N>
concept SolvableNetwork =
    DesignableNetwork<N> &&
    requires(const N& n, std::size_t slot, std::size_t metric, double target,
             const std::array<double, N::design_slots.size()>& values) {
        { n.solve_slot(slot, metric, target, values) } -> std::same_as<double>;
    };

}  // namespace tauforge
