#pragma once
/// Shared vocabulary of the `tauforge` command-line front end: exit codes, the
/// error type for bad input, network-agnostic result records (what every report
/// writer reads), and formatting of SI values by their unit symbol.
///
/// The analysis itself lives in the library; the engine (engine.hpp) turns a
/// network's typed results into these plain records, so the text, JSON, SVG and
/// C-header writers never see a template.

#include <tauforge/analysis/common.hpp>
#include <tauforge/analysis/monte_carlo.hpp>
#include <tauforge/analysis/test_limits.hpp>
#include <tauforge/concepts.hpp>
#include <tauforge/notation.hpp>
#include <tauforge/parts.hpp>

#include <cstddef>
#include <cstdint>
#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace tfcli {

using tauforge::interval;
using tauforge::spec_window;
using tauforge::tolerance;

/// Exit statuses of the executable.
enum exit_status : int {
    exit_ok = 0,            ///< done; the report is complete
    exit_internal = 1,      ///< a bug or an unexpected failure (out of memory, ...)
    exit_usage = 2,         ///< bad command line, value, file or request; nothing is reported
    exit_infeasible = 3,    ///< design: no combination of the value sets holds the spec (report says why)
    exit_spec_not_met = 4,  ///< check: the given parts do not hold the spec at worst case (report says where)
};

/// Bad input from the user: a flag, a value, a name, a file, a request. Exit 2.
class usage_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

/// Text of a value in its SI unit ("Ω", "F", "s", "V", "A", "Hz", "S"); "V/V" is a
/// plain ratio ("0.667"), "" a fraction shown as a percentage ("60 %").
std::string format_si(double v, std::string_view unit, tauforge::charset cs = tauforge::charset::unicode,
                      int digits = 3);

/// A tolerance band as text ("±5 %", "+80/-20 %").
std::string format_band(const tolerance& t, tauforge::charset cs = tauforge::charset::unicode);

/// A window as text: "[900 µs, 1.3 ms]", "at least 20 ms", "at most 5 ms".
std::string format_window(const spec_window& w, std::string_view unit,
                          tauforge::charset cs = tauforge::charset::unicode);

/// Lower case, '-' and '_' as spaces: "Pulse-Width" and "pulse_width" name "pulse width".
std::string normalized_name(std::string_view s);

/// One chosen or given part.
struct part_row {
    std::string name;      ///< slot name: "R", "Ra", "C"
    std::string kind;      ///< "resistor" or "capacitor"
    double value = 0.0;    ///< marked value, Ω or F
    tolerance tol{};       ///< purchase tolerance
    std::string tempco;    ///< "X7R", "C0G", "±100 ppm/K", "" for none
    std::string origin;    ///< "E24", "stock" (design) or "given" (check)
    interval range{};      ///< the value's interval at the operating conditions
};

/// One uncertain parameter of the network.
struct parameter_row {
    std::string name, unit;
    interval range{};
    bool free = false;  ///< low < high
};

/// Where one parameter sits at an extreme.
struct corner_entry {
    std::string parameter, unit;
    double value = 0.0;
    std::string position;  ///< "low", "high", "nominal", "interior"
    bool decides = true;   ///< moving it to its other end changes the metric at this extreme
};

/// A histogram of Monte Carlo samples over [low, high] in equal bins.
struct histogram {
    double low = 0.0, high = 0.0;
    std::vector<std::size_t> counts;
};

/// One requirement: metric index, window and the text it was given as.
struct requirement_row {
    std::size_t metric = 0;
    std::string name, unit;
    spec_window window{};
    std::string text;  ///< as the user wrote it, e.g. "pulse-width=250ms,20%"
};

/// Production test limits for one metric.
struct limit_row {
    std::string metric, unit;
    std::string window_source;  ///< "spec" or "worst case"
    spec_window window{}, acceptance{};
    double standard_uncertainty = 0.0, coverage = 2.0, guard = 0.0;
    tauforge::screening_rates rates{};
};

/// Every analysis of one metric.
struct metric_row {
    std::string name, unit;
    double nominal = 0.0;
    double min = 0.0, max = 0.0;                       ///< worst case (extreme value analysis)
    std::vector<corner_entry> min_corner, max_corner;  ///< free parameters at each extreme
    std::vector<double> sensitivity;                   ///< normalized, one per parameter (NaN where undefined)
    double rss_sigma = 0.0, rss_center = 0.0, rss_low = 0.0, rss_high = 0.0, rss_relative_half_band = 0.0;
    bool has_mc = false;
    double mc_mean = 0.0, mc_stddev = 0.0, mc_min = 0.0, mc_max = 0.0;
    std::vector<std::pair<double, double>> percentiles;  ///< (probability, value)
    histogram hist;
    std::optional<requirement_row> requirement;  ///< the spec on this metric, if any
    std::size_t inside = 0;                      ///< Monte Carlo samples inside the window
    tauforge::proportion_interval yield{};       ///< inside / samples (Wilson score interval)
    bool holds = true;                           ///< worst case inside the window
    double margin = 0.0;                         ///< worst-case margin, fraction of the half-window
};

/// A node waveform for the plot: points (t in s, value in y_unit).
struct waveform {
    std::string node;  ///< what is plotted, e.g. "timing capacitor voltage"
    std::string y_label = "voltage", y_unit = "V";  ///< the vertical axis (y_unit as in format_si)
    bool log_y = false;                             ///< a logarithmic vertical axis (an error decaying to a limit)
    std::vector<std::pair<double, double>> points;
    std::vector<std::pair<std::string, double>> thresholds;  ///< label, volts
    std::vector<std::pair<std::string, double>> events;      ///< label, seconds (crossings)
};

/// Monte Carlo settings as run.
struct mc_settings {
    std::size_t samples = 100'000;
    std::uint64_t seed = 1;
    unsigned threads = 1;
    std::string distribution = "normal";  ///< "normal" (truncated at the interval) or "uniform"
    double sigmas = 3.0;                  ///< half-width of an interval = sigmas standard deviations
};

/// Everything a check of one set of parts found.
struct check_result {
    std::string network, title;
    std::vector<part_row> parts;
    std::vector<std::pair<std::string, std::string>> settings;  ///< name, text as set
    tauforge::operating_conditions conditions{};
    std::vector<parameter_row> parameters;
    std::vector<metric_row> metrics;
    std::string sensitivity_method;  ///< "analytic" or "central difference"
    mc_settings mc;
    bool has_mc = false;
    std::size_t passing = 0;                 ///< samples inside every window
    tauforge::proportion_interval joint_yield{};
    bool has_spec = false;
    bool holds = true;                       ///< every window holds at worst case
    std::size_t primary = 0;                 ///< the metric plotted
    std::vector<waveform> traces;            ///< nominal, minimum corner, maximum corner
    std::vector<limit_row> limits;           ///< production test limits (limits command)
};

/// One ranked design.
struct design_row {
    std::vector<part_row> parts;
    std::vector<double> nominal, worst_min, worst_max;  ///< per metric of the network
    double margin = 0.0;
    std::string tight_metric;  ///< the requirement closest to its edge
    bool tight_at_high = false;
    double nominal_error = 0.0;
};

/// Where a slot's candidate values came from.
struct slot_source {
    std::string slot, description;
    std::size_t count = 0;
};

/// A synthesis run.
struct design_result {
    std::string network, title;
    std::vector<std::pair<std::string, std::string>> metric_units;  ///< every metric: name, unit
    std::vector<requirement_row> requirements;
    std::vector<slot_source> sources;
    std::vector<design_row> designs;
    bool feasible = false;
    std::string why, reason;
    std::uint64_t evaluated = 0;
    std::optional<check_result> best;  ///< a full check of design 1
};

/// A read-back of a part value from a measurement.
struct readback_result {
    check_result marked;  ///< the design as marked (parts, conditions, worst case)
    std::string parameter, parameter_unit;
    std::string metric, metric_unit;
    double measured = 0.0, standard_uncertainty = 0.0, coverage = 2.0;
    interval estimate{};
    interval marked_range{};
    bool within_marked = false;
};

/// One two-part combination found by pick.
struct pair_row {
    double first = 0.0, second = 0.0, value = 0.0, error = 0.0;
    std::string first_origin, second_origin;
    tolerance tol{};
};

/// A pick: preferred values and two-part combinations for a target.
struct pick_result {
    std::string kind;  ///< "resistor" or "capacitor"
    std::string unit;  ///< "Ω" or "F"
    double target = 0.0;
    std::string source;  ///< description of the value set
    std::size_t count = 0;
    double nearest = 0.0;
    tolerance nearest_tol{};
    std::string nearest_origin;
    std::optional<double> below, above;
    std::vector<pair_row> series, parallel;
};

}  // namespace tfcli
