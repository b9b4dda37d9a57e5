#pragma once
/// The human report: aligned tables in engineering notation, the deciding corner
/// beside each extreme, a verdict line per window.

#include "catalogue.hpp"
#include "common.hpp"

#include <tauforge/notation.hpp>

#include <string>
#include <vector>

namespace tfcli {

std::string text_check(const check_result& c, tauforge::charset cs);
std::string text_limits(const check_result& c, tauforge::charset cs);
std::string text_design(const design_result& d, tauforge::charset cs);
std::string text_readback(const readback_result& r, tauforge::charset cs);
std::string text_pick(const pick_result& p, tauforge::charset cs);
std::string text_networks(const std::vector<network_entry>& all);
std::string text_network(const network_entry& e);

/// A yield as a percentage with enough decimals to tell 99.996 % from 100 %.
std::string yield_percent(double fraction);

/// "R 100 kΩ ±1 %, C 10 nF ±10 % X7R": the parts in one line.
std::string parts_line(const std::vector<part_row>& parts, tauforge::charset cs);

}  // namespace tfcli
