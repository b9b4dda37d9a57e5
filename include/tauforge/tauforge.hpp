#pragma once
/// Umbrella header: includes every public header of tauforge, nothing else.

#include "tauforge/analysis/function_network.hpp"
#include "tauforge/analysis/monte_carlo.hpp"
#include "tauforge/analysis/rss.hpp"
#include "tauforge/analysis/sensitivity.hpp"
#include "tauforge/analysis/test_limits.hpp"
#include "tauforge/analysis/worst_case.hpp"
#include "tauforge/concepts.hpp"
#include "tauforge/error.hpp"
#include "tauforge/networks/rc_delay.hpp"
#include "tauforge/networks/timer_astable.hpp"
#include "tauforge/notation.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/rc.hpp"
#include "tauforge/series.hpp"
#include "tauforge/synthesis.hpp"
#include "tauforge/units.hpp"
