#pragma once
/// The light include: quantities and literals, the error types, value notation
/// and the RC step and ramp formulas, for code that computes with time constants
/// but needs no networks, analysis or synthesis. About half the compile time of
/// the umbrella <tauforge/tauforge.hpp> (bench/RESULTS.md). Like the umbrella, it
/// only includes.
///
///     #include <tauforge/core.hpp>
///     using namespace tauforge::literals;
///     auto t = tauforge::crossing_time(0_V, 5_V, 3.3_V, 100_kohm * 10_nF);
///     auto text = tauforge::format(t);

#include "tauforge/error.hpp"
#include "tauforge/notation.hpp"
#include "tauforge/rc.hpp"
#include "tauforge/units.hpp"
