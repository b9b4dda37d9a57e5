#pragma once
/// pick: the preferred value nearest a target, its neighbours, and the best
/// two-part series and parallel combinations from a value set.

#include "common.hpp"
#include "requests.hpp"

namespace tfcli {

/// The target's kind comes from its text ("4k7" is a resistance, "100n" a
/// capacitance) or from rq.kind when the text could be either ("470").
pick_result run_pick(const request& rq);

}  // namespace tfcli
