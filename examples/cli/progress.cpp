#include "progress.hpp"

#include <unistd.h>

#include <chrono>
#include <condition_variable>
#include <cstdio>
#include <mutex>
#include <stop_token>
#include <string>
#include <algorithm>
#include <thread>

namespace tfcli {

struct progress_line::state {
    std::mutex m;
    std::condition_variable_any cv;
    std::jthread worker;
};

progress_line::progress_line(const std::atomic<std::size_t>& done, std::size_t total, std::string label) {
    if (total == 0 || !::isatty(STDERR_FILENO)) return;
    s_ = std::make_unique<state>();
    s_->worker = std::jthread([this, &done, total, label = std::move(label)](std::stop_token stop) {
        using namespace std::chrono;
        const auto start = steady_clock::now();
        std::size_t width = 0;  // of the line on screen, to erase it
        std::string last;
        std::unique_lock lock(s_->m);
        while (!stop.stop_requested()) {
            s_->cv.wait_for(lock, stop, milliseconds(100), [] { return false; });
            if (stop.stop_requested()) break;
            if (steady_clock::now() - start < milliseconds(500)) continue;
            const std::size_t n = std::min(done.load(std::memory_order_relaxed), total);
            char line[160];
            if (n < total)
                std::snprintf(line, sizeof line, "%s: %3zu %% (%zu of %zu samples)", label.c_str(), n * 100 / total, n, total);
            else
                std::snprintf(line, sizeof line, "%s: %zu samples drawn, sorting them for percentiles", label.c_str(), total);
            if (line == last) continue;
            last = line;
            std::fprintf(stderr, "\r%-*s", static_cast<int>(width), line);
            std::fflush(stderr);
            width = std::max(width, last.size());
        }
        if (width > 0) {
            std::fprintf(stderr, "\r%*s\r", static_cast<int>(width), "");
            std::fflush(stderr);
        }
    });
}

progress_line::~progress_line() {
    if (!s_) return;
    s_->worker.request_stop();
    s_->worker.join();
}

}  // namespace tfcli
