#pragma once
/// The vocabulary of design checks: a network's `check_*` functions return a
/// list of findings, each a violation of a rule at worst case or a warning
/// that a part leaves its customary range.
///
///     for (const auto& f : check_design(one_shot, trigger)) std::puts(f.message.c_str());

#include <algorithm>
#include <string>
#include <string_view>
#include <vector>

namespace tauforge {

/// How serious a finding of a design check is.
enum class severity { warning, violation };

/// One result of a design check: a rule the design breaks at worst case
/// (violation) or a customary range it leaves (warning).
struct finding {
    severity level = severity::warning;  ///< violation or warning
    std::string_view rule;               ///< short stable identifier, e.g. "trigger_too_long"
    std::string message;                 ///< what was found, with values and units
};

/// True if any finding is a violation.
inline bool has_violation(const std::vector<finding>& findings) {
    return std::any_of(findings.begin(), findings.end(),
                       [](const finding& f) { return f.level == severity::violation; });
}

}  // namespace tauforge
