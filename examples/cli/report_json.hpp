#pragma once
/// The JSON report. Every number is in SI base units and comes with its unit and its
/// formatted text: a quantity is {"value": 0.25, "unit": "s", "text": "250 ms"}
/// ("value" is null for a non-finite number). A ratio has unit "V/V"; a fraction
/// (a duty, a yield) unit "" with a percentage as its text.
///
/// Top level, every command:
///   {"tool": "tauforge", "version": "...", "command": "...", "status": "ok" |
///    "infeasible" | "spec not met", "exit_code": 0 | 3 | 4, ...command fields...}
/// check and limits: "check" (see json_check); limits add "limits".
/// design: "design" {"requirements", "search", "feasible", "why", "reason", "designs", "best"}.
/// readback: "check" (the parts as marked) and "readback"; pick: "pick"; demo: "board"; networks: "networks".

#include "catalogue.hpp"
#include "common.hpp"

#include <nlohmann/json.hpp>

#include <string>
#include <string_view>
#include <vector>

namespace tfcli {

/// {"value", "unit", "text"}.
nlohmann::ordered_json quantity_json(double v, std::string_view unit);
/// {"minus", "plus", "text"}.
nlohmann::ordered_json tolerance_json(const tolerance& t);
/// {"low": quantity|null, "high": quantity|null, "text"}.
nlohmann::ordered_json window_json(const spec_window& w, std::string_view unit);

/// The fields every report starts with.
nlohmann::ordered_json report_header(std::string_view command, int exit_code);

nlohmann::ordered_json json_check(const check_result& c);
nlohmann::ordered_json json_limits(const std::vector<limit_row>& limits);
nlohmann::ordered_json json_design(const design_result& d);
nlohmann::ordered_json json_readback(const readback_result& r);
nlohmann::ordered_json json_pick(const pick_result& p);
nlohmann::ordered_json json_networks(const std::vector<network_entry>& all);

/// The status word of an exit code.
std::string status_text(int exit_code);

}  // namespace tfcli
