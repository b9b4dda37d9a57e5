#pragma once
/// Unit-typed quantities (Boost.Units SI, double) and the literals users write them with.
///
/// Only base-SI quantities cross tauforge's API: every literal applies its prefix
/// inside and returns the base unit, so `4.7_kohm` is a `resistance` whose
/// `.value()` is 4700.
///
///     using namespace tauforge::literals;
///     tauforge::duration tau = 4.7_kohm * 100_nF;   // 470 us

#include <boost/units/quantity.hpp>
#include <boost/units/systems/si/capacitance.hpp>
#include <boost/units/systems/si/conductance.hpp>
#include <boost/units/systems/si/current.hpp>
#include <boost/units/systems/si/dimensionless.hpp>
#include <boost/units/systems/si/electric_charge.hpp>
#include <boost/units/systems/si/electric_potential.hpp>
#include <boost/units/systems/si/frequency.hpp>
#include <boost/units/systems/si/power.hpp>
#include <boost/units/systems/si/resistance.hpp>
#include <boost/units/systems/si/time.hpp>

#include <compare>
#include <concepts>
#include <type_traits>

namespace tauforge {

namespace si = boost::units::si;

/// A Boost.Units quantity in an SI base unit with a double value.
template <class Unit>
using si_quantity = boost::units::quantity<Unit, double>;

using resistance = si_quantity<si::resistance>;
using capacitance = si_quantity<si::capacitance>;
using duration = si_quantity<si::time>;
using voltage = si_quantity<si::electric_potential>;
using current = si_quantity<si::current>;
using frequency = si_quantity<si::frequency>;
using conductance = si_quantity<si::conductance>;
using charge = si_quantity<si::electric_charge>;
using power = si_quantity<si::power>;
/// A ratio such as t / (R C); converts to double implicitly.
using ratio = si_quantity<si::dimensionless>;

/// Temperature in degrees Celsius. A small own type: Boost's absolute
/// Celsius type is awkward, and a bare double would let a kelvin slip in.
struct celsius {
    double value{};
    constexpr celsius() = default;
    constexpr explicit celsius(double degrees) : value(degrees) {}
    friend constexpr auto operator<=>(celsius, celsius) = default;
    /// So that -40_degC reads as written.
    friend constexpr celsius operator-(celsius t) { return celsius{-t.value}; }
};

/// Temperature difference in kelvin from two Celsius temperatures.
constexpr double kelvin_between(celsius from, celsius to) { return to.value - from.value; }

/// The SI base unit value of a quantity, for the plain-double kernels in detail/.
template <class Unit>
constexpr double si_value(si_quantity<Unit> q) {
    return q.value();
}

/// Build a base-SI quantity from its value in the base unit.
template <class Q>
constexpr Q from_si(double v) {
    return Q::from_value(v);
}

/// A relative tolerance band: a part marked nominal x lies in
/// [x (1 - minus), x (1 + plus)]. Symmetric (5 % = {0.05, 0.05}) or not
/// (an electrolytic's -20/+80 % = {0.20, 0.80}). Validated where it is used
/// (0 <= minus < 1, 0 <= plus, both finite), so that the message can name the part.
struct tolerance {
    double minus = 0.0;  ///< fraction below nominal, 0.05 for -5 %
    double plus = 0.0;   ///< fraction above nominal, 0.05 for +5 %

    /// +/- fraction: tolerance::symmetric(0.01) is +/-1 %.
    static constexpr tolerance symmetric(double fraction) { return {fraction, fraction}; }
    /// The larger side, for ranking and display.
    constexpr double widest() const { return minus > plus ? minus : plus; }
    friend constexpr bool operator==(const tolerance&, const tolerance&) = default;
};

namespace detail {
template <class T, class Unit>
inline constexpr bool is_si_quantity_of_v = std::is_same_v<std::remove_cvref_t<T>, si_quantity<Unit>>;
}  // namespace detail

/// `QuantityOf<T, Q>`: T is exactly the base-SI quantity Q (no prefixed units,
/// no other dimension). Public functions that take quantities constrain on
/// these so that a wrong argument fails with the concept's name in the message.
template <class T, class Q>
concept QuantityOf = std::is_same_v<std::remove_cvref_t<T>, Q>;

template <class T> concept Resistance = QuantityOf<T, resistance>;
template <class T> concept Capacitance = QuantityOf<T, capacitance>;
template <class T> concept Duration = QuantityOf<T, duration>;
template <class T> concept Voltage = QuantityOf<T, voltage>;
template <class T> concept Current = QuantityOf<T, current>;
template <class T> concept Frequency = QuantityOf<T, frequency>;

namespace literals {

// Each literal exists for floating (4.7_kohm) and integer (100_nF) spellings.
#define TAUFORGE_DEFINE_LITERAL(suffix, quantity_type, scale)                              \
    constexpr quantity_type operator""_##suffix(long double v) {                          \
        return quantity_type::from_value(static_cast<double>(v * (scale)));               \
    }                                                                                     \
    constexpr quantity_type operator""_##suffix(unsigned long long v) {                   \
        return quantity_type::from_value(static_cast<double>(static_cast<long double>(v) * (scale))); \
    }

TAUFORGE_DEFINE_LITERAL(mohm, resistance, 1e-3L)
TAUFORGE_DEFINE_LITERAL(ohm, resistance, 1.0L)
TAUFORGE_DEFINE_LITERAL(kohm, resistance, 1e3L)
TAUFORGE_DEFINE_LITERAL(Mohm, resistance, 1e6L)
TAUFORGE_DEFINE_LITERAL(Gohm, resistance, 1e9L)
TAUFORGE_DEFINE_LITERAL(pF, capacitance, 1e-12L)
TAUFORGE_DEFINE_LITERAL(nF, capacitance, 1e-9L)
TAUFORGE_DEFINE_LITERAL(uF, capacitance, 1e-6L)
TAUFORGE_DEFINE_LITERAL(mF, capacitance, 1e-3L)
TAUFORGE_DEFINE_LITERAL(F, capacitance, 1.0L)
TAUFORGE_DEFINE_LITERAL(s, duration, 1.0L)
TAUFORGE_DEFINE_LITERAL(ms, duration, 1e-3L)
TAUFORGE_DEFINE_LITERAL(us, duration, 1e-6L)
TAUFORGE_DEFINE_LITERAL(ns, duration, 1e-9L)
TAUFORGE_DEFINE_LITERAL(ps, duration, 1e-12L)
TAUFORGE_DEFINE_LITERAL(V, voltage, 1.0L)
TAUFORGE_DEFINE_LITERAL(mV, voltage, 1e-3L)
TAUFORGE_DEFINE_LITERAL(uV, voltage, 1e-6L)
TAUFORGE_DEFINE_LITERAL(A, current, 1.0L)
TAUFORGE_DEFINE_LITERAL(mA, current, 1e-3L)
TAUFORGE_DEFINE_LITERAL(uA, current, 1e-6L)
TAUFORGE_DEFINE_LITERAL(nA, current, 1e-9L)
TAUFORGE_DEFINE_LITERAL(pA, current, 1e-12L)
TAUFORGE_DEFINE_LITERAL(Hz, frequency, 1.0L)
TAUFORGE_DEFINE_LITERAL(kHz, frequency, 1e3L)
TAUFORGE_DEFINE_LITERAL(MHz, frequency, 1e6L)

#undef TAUFORGE_DEFINE_LITERAL

constexpr celsius operator""_degC(long double v) { return celsius{static_cast<double>(v)}; }
constexpr celsius operator""_degC(unsigned long long v) { return celsius{static_cast<double>(v)}; }

}  // namespace literals

}  // namespace tauforge
