#pragma once
/// A plain function of named parameters as a TimingNetwork, so every analysis
/// works on a formula the user writes down without defining a network type.
///
/// The names live in a small type with two static tables (the concept asks for
/// static tables), the intervals and the callable are data:
///
///     struct divider_names {
///         static constexpr std::array<tauforge::quantity_info, 2> parameters{{{"R1", "Ω"}, {"R2", "Ω"}}};
///         static constexpr std::array<tauforge::quantity_info, 1> metrics{{{"ratio", ""}}};
///     };
///     auto net = tauforge::make_function_network<divider_names>(
///         {tauforge::resistor{.nominal = 10_kohm, .tol = tauforge::tolerance::symmetric(0.01)}.range(),
///          tauforge::resistor{.nominal = 20_kohm, .tol = tauforge::tolerance::symmetric(0.01)}.range()},
///         [](const std::array<double, 2>& x) { return std::array<double, 1>{x[1] / (x[0] + x[1])}; });
///     auto wc = tauforge::worst_case(net);

#include "tauforge/concepts.hpp"

#include <array>
#include <concepts>
#include <cstddef>
#include <type_traits>
#include <utility>

namespace tauforge {

/// `NameTables<T>`: T has static `parameters` and `metrics` tables of quantity_info.
template <class T>
concept NameTables = requires {
    { T::parameters } -> std::convertible_to<std::array<quantity_info, T::parameters.size()>>;
    { T::metrics } -> std::convertible_to<std::array<quantity_info, T::metrics.size()>>;
};

/// `MetricFunction<F, P, M>`: F maps P parameter values to M metric values (SI base units).
template <class F, std::size_t P, std::size_t M>
concept MetricFunction = std::regular_invocable < const F&,
        const std::array<double, P>
& > &&std::same_as<std::invoke_result_t<const F&, const std::array<double, P>&>, std::array<double, M>>;

/// A TimingNetwork made of name tables, parameter intervals and a function.
template <NameTables Names, class F>
requires MetricFunction<F, Names::parameters.size(), Names::metrics.size()>
struct function_network {
    /// The parameter names and units, from Names.
    static constexpr std::array<quantity_info, Names::parameters.size()> parameters = Names::parameters;
    /// The metric names and units, from Names.
    static constexpr std::array<quantity_info, Names::metrics.size()> metrics = Names::metrics;

    std::array<interval, Names::parameters.size()> intervals{};  ///< each parameter's range, SI base units
    F function;                                                  ///< metrics from parameters

    /// The parameter intervals as given.
    std::array<interval, Names::parameters.size()> ranges() const { return intervals; }
    /// All metrics at one set of parameter values.
    std::array<double, Names::metrics.size()> evaluate(const std::array<double, Names::parameters.size()>& x) const {
        return function(x);
    }
};

/// Build a function_network, deducing the callable's type.
template <NameTables Names, class F>
requires MetricFunction<std::decay_t<F>, Names::parameters.size(), Names::metrics.size()>
    function_network<Names, std::decay_t<F>> make_function_network(
        const std::array<interval, Names::parameters.size()>& intervals, F&& function) {
    return {intervals, std::forward<F>(function)};
}

}  // namespace tauforge
