#pragma once
/// Umbrella header: includes every public header of tauforge, nothing else.

#include "tauforge/concepts.hpp"
#include "tauforge/error.hpp"
#include "tauforge/notation.hpp"
#include "tauforge/rc.hpp"
#include "tauforge/units.hpp"
