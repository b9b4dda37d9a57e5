#pragma once
/// The typed description of every network of the catalogue (one per net_<name>.cpp):
/// the command line type-erases them with make_entry; the Python module binds them
/// with their types (python/tauforge_module.cpp), so both read parts and settings alike.

#include "engine.hpp"

#include <tauforge/networks/adc_settling.hpp>
#include <tauforge/networks/debounce.hpp>
#include <tauforge/networks/edge_detector.hpp>
#include <tauforge/networks/pulse_filter.hpp>
#include <tauforge/networks/rc_delay.hpp>
#include <tauforge/networks/schmitt_oscillator.hpp>
#include <tauforge/networks/timer_astable.hpp>
#include <tauforge/networks/timer_monostable.hpp>

namespace tfcli {

network_def<tauforge::rc_delay> rc_delay_def();
network_def<tauforge::timer_monostable> timer_monostable_def();
network_def<tauforge::timer_astable> timer_astable_def();
network_def<tauforge::schmitt_oscillator> schmitt_oscillator_def();
network_def<tauforge::edge_detector> edge_detector_def();
network_def<tauforge::debounce> debounce_def();
network_def<tauforge::pulse_filter> pulse_filter_def();
network_def<tauforge::two_stage_pulse_filter> two_stage_pulse_filter_def();
network_def<tauforge::adc_settling> adc_settling_def();

}  // namespace tfcli
