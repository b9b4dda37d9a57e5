#pragma once
/// A progress line on stderr for long Monte Carlo runs: shown only when stderr is
/// a terminal and the run has lasted half a second; erased when it ends. Nothing
/// is written when stderr is a file or a pipe, so reports and logs stay clean.

#include <atomic>
#include <cstddef>
#include <memory>
#include <string>

namespace tfcli {

class progress_line {
public:
    /// Watches `done` (samples evaluated so far) against `total` until destroyed.
    progress_line(const std::atomic<std::size_t>& done, std::size_t total, std::string label);
    ~progress_line();
    progress_line(const progress_line&) = delete;
    progress_line& operator=(const progress_line&) = delete;

private:
    struct state;
    std::unique_ptr<state> s_;
};

}  // namespace tfcli
