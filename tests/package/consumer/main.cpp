// Smallest real use: a one-shot's width from the umbrella header.
#include <tauforge/tauforge.hpp>

#include <cmath>
#include <cstdio>

int main() {
    using namespace tauforge::literals;
    const auto width = tauforge::crossing_time(0_V, 5_V, 5.0_V * 2.0 / 3.0, 100_kohm * 10_nF);
    // RC ln 3 (common practice): 1.0986 ms
    const bool ok = std::abs(width.value() - 1e-3 * std::log(3.0)) < 1e-12;
    std::printf("%s %s\n", tauforge::format(width).c_str(), ok ? "ok" : "WRONG");
    return ok ? 0 : 1;
}
