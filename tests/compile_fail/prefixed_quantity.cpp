// expect: satisfaction of [^ ]*Resistance<
// A prefixed Boost.Units quantity (kilo-ohm type, value() in kilo-ohms) never
// crosses the API: only base-SI quantities do.
#include <tauforge/rc.hpp>
#include <boost/units/systems/si/prefixes.hpp>

int main() {
    using namespace tauforge::literals;
    namespace bu = boost::units;
#ifdef TAUFORGE_CONTROL
    auto r = 4.7_kohm;
#else
    auto r = 4.7 * bu::si::kilo * bu::si::ohms;
#endif
    auto drive = tauforge::with_shunt(5_V, r, 100_nF, 1_Mohm);
    return drive.tau.value() > 0 ? 0 : 1;
}
