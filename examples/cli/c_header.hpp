#pragma once
/// Firmware hand-off: a checked design's timings as a C header of integer constants.
///
/// For every time metric M of the network (unit s), six macros:
///   PREFIX_M_MIN_NS, PREFIX_M_NOM_NS, PREFIX_M_MAX_NS   nanoseconds
///   PREFIX_M_MIN_US, PREFIX_M_NOM_US, PREFIX_M_MAX_US   microseconds
/// as unsigned long long literals. Rounding: minimum rounded down, maximum rounded
/// up, nominal rounded to the nearest (halves away from zero), so [MIN, MAX] always
/// contains the worst-case range. For every part: PREFIX_PART_<NAME> (value and
/// tolerance as ASCII text) and PREFIX_PART_<NAME>_RKM. Include guard PREFIX_TIMING_H.

#include "common.hpp"

#include <string>

namespace tfcli {

/// `prefix` must be a C identifier (letters, digits, '_', not starting with a digit).
std::string c_header(const check_result& c, const std::string& prefix, const std::string& origin);

/// The default prefix: the network's name in upper case.
std::string default_c_prefix(const std::string& network);

/// Ω, µ, ±, ° and the parallel sign spelled in ASCII.
std::string ascii_text(std::string s);

}  // namespace tfcli
