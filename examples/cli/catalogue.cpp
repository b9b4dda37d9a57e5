#include "catalogue.hpp"

#include "requests.hpp"

namespace tfcli {

const std::vector<network_entry>& catalogue() {
    static const std::vector<network_entry> all = [] {
        std::vector<network_entry> v;
        v.push_back(rc_delay_entry());
        v.push_back(timer_monostable_entry());
        v.push_back(timer_astable_entry());
        v.push_back(schmitt_oscillator_entry());
        v.push_back(edge_detector_entry());
        v.push_back(debounce_entry());
        v.push_back(pulse_filter_entry());
        v.push_back(two_stage_pulse_filter_entry());
        v.push_back(adc_settling_entry());
        return v;
    }();
    return all;
}

const network_entry& find_network(std::string_view name) {
    const std::string n = normalized_name(name);
    for (const auto& e : catalogue()) {
        if (normalized_name(e.name) == n) return e;
        for (const auto& a : e.aliases)
            if (normalized_name(a) == n) return e;
    }
    std::string valid;
    for (const auto& e : catalogue()) valid += (valid.empty() ? "" : ", ") + e.name;
    throw usage_error("network \"" + std::string(name) + "\" is unknown; expected one of " + valid +
                      " (tauforge networks lists them)");
}

}  // namespace tfcli
