#pragma once
/// Ready-made links for chains of stages (networks/chain.hpp):
/// - `trigger_link`: an edge detector starting a one-shot; its pulse must end
///   before the one-shot's output pulse ("trigger / output" < 1).
/// - `input_period_link`: a pulse train clocking a one-shot; when the one-shot's
///   pulses are averaged into a voltage its width stays below about 90 % of
///   the shortest input period (common practice): "width / period" <= 0.9.
/// A window on the first stage's own metric (the edge detector's pulse
/// against the one-shot's minimum trigger width) goes in the same check.
///
///     chain<edge_detector, timer_monostable, trigger_link> c{edge, one_shot};
///     auto v = verify(c, {{"trigger / output", spec_window::at_most(1.0)},
///                         {"edge detector: pulse width", spec_window::at_least(2_us)}});

#include "tauforge/concepts.hpp"
#include "tauforge/networks/chain.hpp"
#include "tauforge/networks/edge_detector.hpp"
#include "tauforge/networks/timer_monostable.hpp"
#include "tauforge/parts.hpp"

#include <array>
#include <string_view>

namespace tauforge {

/// A rectangular pulse train's period as a network of one ranged parameter:
/// the source stage of a chain ("the shortest input period").
struct pulse_input {
    ranged<duration> period = ranged<duration>::exactly(duration::from_value(1e-3));

    static constexpr std::array<quantity_info, 1> parameters{{{"period", "s"}}};
    static constexpr std::array<quantity_info, 1> metrics{{{"period", "s"}}};

    /// The period's interval; it must be positive.
    std::array<interval, 1> ranges() const {
        const interval p = period.as_interval();
        if (!(p.low > 0.0)) detail::fail_invalid("pulse_input::ranges", "period.low", period.low, "a positive period");
        return {p};
    }
    std::array<double, 1> evaluate(const std::array<double, 1>& x) const { return {x[0]}; }

    // A source has no parts to choose; these let it head a designable chain.
    static constexpr std::array<design_slot, 0> design_slots{};
    pulse_input with_parts(const std::array<part_choice, 0>&) const { return *this; }
};

static_assert(DesignableNetwork<pulse_input>, "pulse_input must satisfy DesignableNetwork");

/// Edge detector -> one-shot: the trigger pulse relative to the output pulse.
struct trigger_link {
    static constexpr std::string_view first_name = "edge detector";
    static constexpr std::string_view second_name = "one-shot";
    static constexpr std::array<quantity_info, 1> metrics{{{"trigger / output", ""}}};
    static std::array<double, 1> evaluate(const std::array<double, edge_detector::metrics.size()>& edge,
                                          const std::array<double, timer_monostable::metrics.size()>& one_shot) {
        return {edge[edge_detector::pulse_width] / one_shot[timer_monostable::pulse_width]};
    }
};

/// Pulse train -> one-shot: the output pulse relative to the input period.
struct input_period_link {
    static constexpr std::string_view first_name = "input";
    static constexpr std::string_view second_name = "one-shot";
    static constexpr std::array<quantity_info, 1> metrics{{{"width / period", ""}}};
    static std::array<double, 1> evaluate(const std::array<double, 1>& input,
                                          const std::array<double, timer_monostable::metrics.size()>& one_shot) {
        return {one_shot[timer_monostable::pulse_width] / input[0]};
    }
};

/// The common-practice limit for a one-shot whose pulses are averaged: 90 % of
/// the shortest input period.
inline constexpr double averaging_width_fraction = 0.9;

}  // namespace tauforge
