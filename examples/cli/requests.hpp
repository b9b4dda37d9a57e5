#pragma once
/// What the user asked for, from flags or from a JSON request, and the small text
/// grammars both share (one parser, so a flag and a JSON field read alike):
///
///   value       engineering notation or RKM code, read by tauforge::parse: 4k7, 100n, 250ms
///   ranged      X            exactly X
///               A..B         anywhere from A to B (nominal in the middle)
///               X,TOL        X with a relative tolerance: 5V,10%  2/3,J
///               X+-D, X±D    X plus or minus an absolute D: 0.667+-0.02
///   ratio       0.667, 2/3, 66.7%
///   tolerance   5%, ±5 %, +80/-20%, or an IEC 60062 letter: J, K, F
///   part        NAME=FIELD,FIELD,...  fields in any order: a value, a tolerance, and a
///               temperature behaviour (C0G, NP0, X5R, X6S, X7R, X7S, X7T, X8R, Y5V, Z5U
///               or a TCR band 100ppm = ±100 ppm/K)
///   window      METRIC=A..B | METRIC=X,TOL | METRIC=X+-D | METRIC>=A | METRIC<=B
///               (metric names with '-' for spaces: pulse-width, high-time, duty)
///   value set   E24 | E24,1k..1M | E24,1k..1M,1% | @FILE | @FILE,5%   (FILE: a stock list)
///   temperature T | A..B  in °C (a trailing °C, degC or C is accepted)

#include "common.hpp"

#include <tauforge/capacitor_kinds.hpp>
#include <tauforge/series.hpp>

#include <nlohmann/json_fwd.hpp>

#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace tfcli {

/// The output files and forms a run writes.
struct output_options {
    bool json = false;                  ///< JSON report on stdout instead of the tables
    std::string json_file;              ///< JSON report to this file as well
    std::string svg_file;               ///< waveform and histogram plot
    std::string c_header_file;          ///< firmware constants
    std::string c_prefix;               ///< macro prefix; default from the network name
    bool ascii = false;                 ///< tables in ASCII (ohm, u, +/-) instead of UTF-8
};

/// One run of the tool, whichever way it was asked for.
struct request {
    std::string command;  ///< pick, design, check, limits, readback, demo, networks
    std::string network;
    std::vector<std::pair<std::string, std::string>> parts;     ///< slot -> part text
    std::vector<std::pair<std::string, std::string>> settings;  ///< setting -> text
    std::string temperature;                                    ///< "" = 25 °C
    std::string temperature_ref;                                ///< "" = 25 °C
    std::string service_life;                                   ///< "" = new parts; "10y", "5000h"
    std::vector<std::string> spec;                              ///< window texts
    std::string resistors, capacitors;                          ///< value sets for every R / C slot
    std::vector<std::pair<std::string, std::string>> slots;     ///< slot -> value set
    std::size_t top = 5;
    mc_settings mc;
    std::string metric;        ///< the metric to plot, or to guard (limits without a spec)
    std::string uncertainty;   ///< standard uncertainty of the tester: 0.5ms or 1% (of nominal)
    double coverage = 2.0;     ///< k in U = k u
    std::string measured;      ///< readback: METRIC=VALUE
    std::string solve;         ///< readback: the part (parameter) to read back
    std::string target;        ///< pick: the value wanted
    std::string from;          ///< pick: the value set
    std::size_t pairs = 3;     ///< pick: combinations per connection
    std::string kind;          ///< pick: "R" or "C" when the target does not say
    bool example = false;      ///< use the catalogue's example parts and settings where none are given
    output_options out;
};

/// Reads a JSON request (the keys mirror the flags; see the README of examples/cli).
/// `where` names the source in messages ("request.json", "stdin").
request request_from_json(std::string_view text, std::string_view where);

/// The JSON text of a file, or of stdin for "-".
std::string read_request_text(const std::string& path);

// ---- grammars -------------------------------------------------------------------

/// A tolerance band; throws usage_error naming `what`.
tolerance parse_band(std::string_view text, std::string_view what);

/// A ratio: 0.667, 2/3 or 66.7 %.
double parse_ratio_text(std::string_view text, std::string_view what);

/// A value in the SI unit named by `unit` (see format_si): "s", "Hz", "V", "A", "Ω",
/// "F", "S", "V/V" (a ratio) or "" (a fraction, "55%" or 0.55).
double parse_by_unit(std::string_view text, std::string_view unit, std::string_view what);

/// A ranged value in the SI unit `unit`: nominal, low, high.
interval parse_ranged_by_unit(std::string_view text, std::string_view unit, std::string_view what);

/// The operating temperature range, and the service life the parts age over.
tauforge::operating_conditions parse_temperature(std::string_view range, std::string_view ref,
                                                 std::string_view service_life = {});

/// A parsed part text.
struct part_text {
    std::optional<double> value;  ///< Ω or F
    std::optional<tolerance> tol;
    std::optional<tauforge::ppm_band> tcr;
    std::optional<tauforge::dielectric_class> dielectric;
    std::optional<double> rated_voltage;         ///< V, a field such as 16V (capacitors)
    std::optional<tauforge::ceramic_case> size;  ///< a case code such as 0603: a class 2 DC-bias estimate
    const tauforge::capacitor_kind* technology = nullptr;  ///< PET, PP, AL, TA: film, electrolytic, tantalum
};
part_text parse_part(std::string_view text, tauforge::part_kind kind, std::string_view what);

/// A window on one of `metrics`; throws naming the valid metric names.
requirement_row parse_requirement(std::string_view text, std::span<const tauforge::quantity_info> metrics);

/// The index of a metric or parameter by name (normalized); throws naming the valid ones.
std::size_t find_name(std::string_view name, std::span<const tauforge::quantity_info> table, std::string_view what);

/// A value set for one kind of part; defaults give the range when the text has none.
struct value_set_spec {
    bool stock = false;
    tauforge::e_series series = tauforge::e_series::e24;
    std::string min, max;  ///< "" = default
    std::optional<tolerance> tol;
    std::string path;
    std::string text;
};
value_set_spec parse_value_set(std::string_view text, std::string_view what);

/// The value set, built. `default_min`/`default_max` in the SI unit apply when the text has no range.
tauforge::value_set<tauforge::resistance> build_resistors(const value_set_spec& s, double default_min, double default_max);
tauforge::value_set<tauforge::capacitance> build_capacitors(const value_set_spec& s, double default_min,
                                                            double default_max);
/// "E24 1 kΩ .. 1 MΩ at ±5 %", "stock list parts.txt".
std::string describe_value_set(const value_set_spec& s, double min, double max, std::string_view unit);

/// Splits "NAME=REST" (also "NAME>=REST", "NAME<=REST" are left to parse_requirement).
std::pair<std::string, std::string> split_assignment(std::string_view text, std::string_view what);

/// "on"/"off", "true"/"false", "yes"/"no", "1"/"0".
bool parse_switch(std::string_view text, std::string_view what);

/// The value sets a part is taken from where the request names none (design, pick).
inline constexpr std::string_view default_resistor_series = "E24";
inline constexpr std::string_view default_capacitor_series = "E12";

/// A word as a POSIX shell reads it back: quoted when it holds anything but
/// letters, digits and -_=.,/:+%@ (a window such as pulse-width<=5ms).
std::string shell_quote(std::string_view word);

/// Trims ASCII blanks.
std::string_view trim(std::string_view s);

}  // namespace tfcli
