#pragma once
/// tauforge demo: the demo board, a small bench instrument of our own with invented
/// data, designed block by block from E-series value sets and checked at worst case.

#include "common.hpp"
#include "requests.hpp"

#include <nlohmann/json.hpp>

#include <string>
#include <vector>

namespace tfcli {

struct demo_block {
    std::string name, purpose, network;
    std::string command;  ///< the tauforge command line that reproduces the block
    std::optional<design_result> design;  ///< designed blocks
    std::optional<check_result> check;    ///< checked-only blocks
};

struct demo_result {
    std::string title, note;
    std::vector<demo_block> blocks;
    std::vector<std::string> findings;  ///< cross-block checks (the trigger into the one-shot)
    bool feasible = true;
};

demo_result run_demo(const mc_settings& mc);
std::string text_demo(const demo_result& d, tauforge::charset cs);
nlohmann::ordered_json json_demo(const demo_result& d);

}  // namespace tfcli
