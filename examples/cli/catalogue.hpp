#pragma once
/// The catalogue of networks the front end reaches: one entry per network of the
/// library, each made by make_entry (engine.hpp) in its own net_<name>.cpp.

#include "common.hpp"

#include <tauforge/concepts.hpp>

#include <functional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace tfcli {

struct request;

/// One network, type-erased.
struct network_entry {
    std::string name, title, summary;
    std::vector<std::string> aliases;
    std::vector<tauforge::quantity_info> parameters, metrics;
    std::vector<std::pair<std::string, std::string>> parts;     ///< name, kind
    std::vector<std::pair<std::string, std::string>> settings;  ///< name, help
    std::vector<std::string> example_parts, example_settings, example_spec;
    std::string example_resistors, example_capacitors;  ///< of design --example ("": the defaults)
    bool designable = true;  ///< design can choose its parts
    std::function<check_result(const request&)> check;  ///< check and limits
    std::function<design_result(const request&)> design;
    std::function<readback_result(const request&)> readback;
};

/// Every network, in catalogue order.
const std::vector<network_entry>& catalogue();

/// The entry named `name` (its name or an alias; '-' and '_' alike, any case);
/// throws usage_error listing the valid names.
const network_entry& find_network(std::string_view name);

// One function per network (net_<name>.cpp).
network_entry rc_delay_entry();
network_entry timer_monostable_entry();
network_entry timer_astable_entry();
network_entry schmitt_oscillator_entry();
network_entry edge_detector_entry();
network_entry debounce_entry();
network_entry pulse_filter_entry();
network_entry two_stage_pulse_filter_entry();
network_entry adc_settling_entry();

}  // namespace tfcli
