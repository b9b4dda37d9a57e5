#pragma once
/// The SVG plot of a checked design: the node waveform over one pulse or period
/// (nominal, and the corners that give the plotted metric's minimum and maximum,
/// with the envelope between them shaded and the thresholds marked), and the
/// Monte Carlo histogram of that metric with the spec window shaded and the
/// worst-case bounds marked.
///
/// Elements carry classes a test can find: "nominal", "corner-min", "corner-max",
/// "envelope", "threshold", "bar", "spec-window", "worst-case", "acceptance".

#include "common.hpp"

#include <string>

namespace tfcli {

std::string svg_plot(const check_result& c, const std::string& heading);

}  // namespace tfcli
