#pragma once
/// Capacitor technologies with their usual tolerances, temperature behaviour,
/// ageing and leakage, as starting points for a `capacitor`:
///
///     using namespace tauforge::literals;
///     tauforge::capacitor c = tauforge::make_capacitor(tauforge::x7r_ceramic, 100_nF);
///     c.rated_voltage = 16_V;
///     c.dc_bias = tauforge::dc_bias_curve::class2_estimate(16_V, tauforge::ceramic_case::c0603);
///
/// Every figure is a typical one, to be replaced by the chosen part's datasheet:
/// class 1 and 2 ceramic temperature envelopes from EIA-198 (from memory), the
/// rest from memory or common practice as marked at each kind.

#include "tauforge/parts.hpp"

#include <array>
#include <optional>
#include <string_view>
#include <variant>

namespace tauforge {

/// The construction of a capacitor, which decides what else can move its value.
enum class capacitor_technology { ceramic_class1, ceramic_class2, film, aluminium_electrolytic, tantalum };

/// A capacitor technology's usual behaviour (see the header comment on the figures).
struct capacitor_kind {
    std::string_view name;                              ///< "X7R ceramic"
    capacitor_technology technology;                    ///< what else moves the value
    std::variant<ppm_band, dielectric_class> tempco;    ///< temperature behaviour
    tolerance usual_tolerance;                          ///< the tolerance it is usually bought at
    std::array<double, 3> tolerance_choices;            ///< symmetric tolerances usually on offer (0 = none)
    double aging_per_decade = 0.0;                      ///< class 2 ageing per decade of hours
    std::optional<wear_out> end_of_life{};              ///< electrolytic wear-out
    std::optional<leakage_rule> leakage_limit{};        ///< leakage of the form max(k C V, floor)
};

/// Typical ageing per decade of hours of a class 2 dielectric (common practice:
/// X7R/X5R about 1-4 %, Y5V 6-10 %): 7 % where the temperature envelope falls by
/// more than half (Y5V, Z5U), 2.5 % otherwise.
constexpr double typical_aging_per_decade(const dielectric_class& d) { return d.minus > 0.5 ? 0.07 : 0.025; }

/// Polyester (PET) film: about +200 to +600 ppm/K, rated -55 to +125 °C (from memory).
inline constexpr ppm_band pet_film_tc{200.0, 600.0, celsius{-55.0}, celsius{125.0}, "PET film"};
/// Polypropylene (PP) film: about -300 to -100 ppm/K, rated -55 to +105 °C (from memory).
inline constexpr ppm_band pp_film_tc{-300.0, -100.0, celsius{-55.0}, celsius{105.0}, "PP film"};
/// General-purpose aluminium electrolytic: within -30/+10 % of its 20-25 °C value over
/// -40 to +105 °C, losing most at the cold end (from memory).
inline constexpr dielectric_class al_electrolytic_tc{"Al electrolytic", celsius{-40.0}, celsius{105.0}, 0.30, 0.10};
/// Solid tantalum (MnO2): within -10/+12 % over -55 to +125 °C (from memory).
inline constexpr dielectric_class tantalum_tc{"tantalum", celsius{-55.0}, celsius{125.0}, 0.10, 0.12};

/// C0G (NP0) class 1 ceramic: 0 +/- 30 ppm/K (EIA-198 (from memory)), bought at
/// +/-5 % (also 1 %, 2 %); no ageing, no DC-bias loss (common practice).
inline const capacitor_kind c0g_ceramic{"C0G ceramic", capacitor_technology::ceramic_class1, c0g,
                                        tolerance::symmetric(0.05), {0.01, 0.02, 0.05}};
/// X7R class 2 ceramic: +/-15 % over -55 to +125 °C (EIA-198 (from memory)), bought
/// at +/-10 % (also 5 %, 20 %), ageing 2.5 % per decade of hours (common practice:
/// 1-4 %); loses capacitance under DC bias (set `dc_bias`).
inline const capacitor_kind x7r_ceramic{"X7R ceramic", capacitor_technology::ceramic_class2, x7r,
                                        tolerance::symmetric(0.10), {0.05, 0.10, 0.20}, typical_aging_per_decade(x7r)};
/// X5R class 2 ceramic: +/-15 % over -55 to +85 °C, otherwise as X7R.
inline const capacitor_kind x5r_ceramic{"X5R ceramic", capacitor_technology::ceramic_class2, x5r,
                                        tolerance::symmetric(0.10), {0.05, 0.10, 0.20}, typical_aging_per_decade(x5r)};
/// Y5V class 2 ceramic: +22/-82 % over -30 to +85 °C (EIA-198 (from memory)), bought
/// at +80/-20 % (Z), ageing 7 % per decade of hours (common practice: 6-10 %).
inline const capacitor_kind y5v_ceramic{"Y5V ceramic", capacitor_technology::ceramic_class2, y5v,
                                        tolerance{0.20, 0.80}, {0.20, 0.0, 0.0}, typical_aging_per_decade(y5v)};
/// Polyester (PET) film: bought at +/-10 % (also 5 %, 20 %) (common practice).
inline const capacitor_kind pet_film{"PET film", capacitor_technology::film, pet_film_tc,
                                     tolerance::symmetric(0.10), {0.05, 0.10, 0.20}};
/// Polypropylene (PP) film: bought at +/-5 % (also 1 %, 2 %) (common practice).
inline const capacitor_kind pp_film{"PP film", capacitor_technology::film, pp_film_tc,
                                    tolerance::symmetric(0.05), {0.01, 0.02, 0.05}};
/// General-purpose aluminium electrolytic: +/-20 % (M), also -20/+80 % (Z) (common
/// practice); wear-out 20 % loss at the end of a 2000 h / 105 °C life (an
/// end-of-life criterion and endurance rating typical of general-purpose series,
/// from memory); leakage max(0.01 C V, 3 µA) (common practice).
inline const capacitor_kind al_electrolytic{"Al electrolytic",
                                            capacitor_technology::aluminium_electrolytic,
                                            al_electrolytic_tc,
                                            tolerance::symmetric(0.20),
                                            {0.20, 0.0, 0.0},
                                            0.0,
                                            wear_out{},
                                            leakage_rule{0.01, current::from_value(3e-6)}};
/// Solid tantalum (MnO2): +/-10 % (K) or +/-20 % (M); leakage max(0.01 C V, 0.5 µA)
/// (from memory).
inline const capacitor_kind tantalum_mno2{"tantalum",
                                          capacitor_technology::tantalum,
                                          tantalum_tc,
                                          tolerance::symmetric(0.10),
                                          {0.10, 0.20, 0.0},
                                          0.0,
                                          std::nullopt,
                                          leakage_rule{0.01, current::from_value(0.5e-6)}};

/// A capacitor of `kind` marked `value`, at the kind's usual tolerance unless `tol`
/// is given, with its temperature behaviour, ageing, wear-out and leakage rule.
/// Rating and DC-bias curve are the part's own: set `rated_voltage` and `dc_bias`.
inline capacitor make_capacitor(const capacitor_kind& kind, capacitance value,
                                std::optional<tolerance> tol = std::nullopt) {
    capacitor c{.nominal = value, .tol = tol.value_or(kind.usual_tolerance), .tempco = kind.tempco};
    c.aging_per_decade = kind.aging_per_decade;
    c.end_of_life = kind.end_of_life;
    c.leakage_limit = kind.leakage_limit;
    return c;
}

}  // namespace tauforge
