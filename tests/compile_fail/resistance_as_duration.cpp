// expect: satisfaction of [^ ]*Duration<
// A resistance passed where a time constant is expected is rejected, and the
// message names the concept it violates.
#include <tauforge/rc.hpp>

int main() {
    using namespace tauforge::literals;
#ifdef TAUFORGE_CONTROL
    auto t = tauforge::crossing_time(0_V, 5_V, 1_V, 4.7_kohm * 100_nF);
#else
    auto t = tauforge::crossing_time(0_V, 5_V, 1_V, 4.7_kohm);
#endif
    return t.value() > 0 ? 0 : 1;
}
