#pragma once
/// The settings both pulse-train filters (tauforge::pulse_filter and
/// tauforge::two_stage_pulse_filter) share: the drive (`input`) and the
/// settling criterion (`settling_fraction`), with one example of them.

#include "engine.hpp"

#include <string_view>
#include <vector>

namespace tfcli {

/// high, width (duty or high time), period and settling-fraction of a filter N.
template <class N>
std::vector<setting<N>> pulse_train_settings() {
    return {
        ranged_at<N, tauforge::voltage>("high", "high level of the pulse train: 3.3V or 3.2V..3.4V",
                                        [](auto& n) -> auto& { return n.input.high; }),
        ratio_or_time_at<N>("width", "duty cycle (high fraction: 0.5, 20%..40%) or high time (10us..20us)",
                            [](auto& n) -> auto& { return n.input.width; }),
        ranged_at<N, tauforge::duration>("period", "period of the pulse train: 50us or 49us..51us",
                                         [](auto& n) -> auto& { return n.input.period; }),
        number_at<N>("settling-fraction", "settled within this fraction of the step: 1% or 0.001",
                     [](auto& n) -> auto& { return n.settling_fraction; }),
    };
}

/// The example drive of both filters: a 20 kHz train at 3.3 V, duty 20 % .. 40 %.
inline const std::vector<std::string_view> pulse_train_example_settings{"high=3.3V", "width=20%..40%", "period=50us"};

}  // namespace tfcli
