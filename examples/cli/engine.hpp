#pragma once
/// The generic part of the front end: how one network of the catalogue is described
/// (`network_def<N>`: its parts, its settings, an example, a waveform tracer) and the
/// operations every network gets from that description (check, limits, design,
/// readback), written once over the library's analysis and synthesis API.
///
/// A network is one table entry: a `net_<name>.cpp` fills a network_def and calls
/// make_entry; catalogue.cpp lists the entries. Nothing here names a network.

#include "catalogue.hpp"
#include "common.hpp"
#include "progress.hpp"
#include "requests.hpp"

#include <tauforge/analysis/monte_carlo.hpp>
#include <tauforge/analysis/rss.hpp>
#include <tauforge/analysis/sensitivity.hpp>
#include <tauforge/analysis/test_limits.hpp>
#include <tauforge/analysis/worst_case.hpp>
#include <tauforge/capacitor_kinds.hpp>
#include <tauforge/parts.hpp>
#include <tauforge/series.hpp>
#include <tauforge/synthesis.hpp>

#include <algorithm>
#include <array>
#include <atomic>
#include <charconv>
#include <cmath>
#include <functional>
#include <limits>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <type_traits>
#include <utility>
#include <variant>
#include <vector>

namespace tfcli {

template <class N>
using point = std::array<double, tauforge::parameter_count_v<N>>;

/// A design slot and the member that holds its part.
template <class N>
struct part_binding {
    std::string_view name;  ///< as in N::design_slots
    std::variant<tauforge::resistor N::*, tauforge::capacitor N::*, std::optional<tauforge::capacitor> N::*> member;
    std::size_t parameter;  ///< its index in N::parameters
    /// True when the network does not use this part as configured (it then needs no value).
    std::function<bool(const N&)> unused = {};
};

/// A knob of the network other than its parts: supply, thresholds, delays ...
template <class N>
struct setting {
    std::string_view name;  ///< hyphenated: "supply", "upper-threshold"
    std::string_view help;  ///< what it is and how to write it
    std::function<void(N&, std::string_view)> apply;
    std::function<std::string(const N&)> show;
};

/// Everything the front end needs to know about one network type.
template <class N>
struct network_def {
    std::string_view name;     ///< the catalogue name: the library type's name
    std::string_view title;    ///< a few words in the terms of the trade
    std::string_view summary;  ///< one or two sentences: what it is, what its metrics mean
    std::vector<std::string_view> aliases;
    std::vector<part_binding<N>> parts;  ///< in N::design_slots order
    std::vector<setting<N>> settings;
    std::size_t default_metric = 0;  ///< the metric plotted when no spec names one
    std::vector<std::string_view> example_parts, example_settings, example_spec;
    /// Value sets `design --example` takes where none are given ("": the defaults);
    /// a network of four parts keeps its example search to seconds with them.
    std::string_view example_resistors, example_capacitors;
    /// The node voltage over one pulse or period at parameter values x, for `metric`;
    /// t_end <= 0: the network's own natural length, else up to t_end.
    waveform (*trace)(const N&, const point<N>&, std::size_t metric, double t_end) = nullptr;
};

// ---- settings from member pointers ------------------------------------------------

template <class Q>
inline constexpr std::string_view unit_of = [] {
    if constexpr (std::is_same_v<Q, tauforge::voltage>) return std::string_view("V");
    else if constexpr (std::is_same_v<Q, tauforge::duration>) return std::string_view("s");
    else if constexpr (std::is_same_v<Q, tauforge::current>) return std::string_view("A");
    else if constexpr (std::is_same_v<Q, tauforge::resistance>) return std::string_view("\u03A9");
    else if constexpr (std::is_same_v<Q, tauforge::capacitance>) return std::string_view("F");
    else return std::string_view("V/V");
}();

template <class Q>
constexpr Q quantity_of(double v) {
    if constexpr (std::is_arithmetic_v<Q>) return v;
    else return Q::from_value(v);
}

template <class Q>
constexpr double si_of(Q q) {
    if constexpr (std::is_arithmetic_v<Q>) return q;
    else return q.value();
}

template <class Q>
tauforge::ranged<Q> to_ranged(const interval& i) {
    return {quantity_of<Q>(i.nominal), quantity_of<Q>(i.low), quantity_of<Q>(i.high)};
}

template <class Q>
std::string ranged_text(const tauforge::ranged<Q>& r) {
    const auto u = unit_of<Q>;
    const double n = si_of(r.nominal), lo = si_of(r.low), hi = si_of(r.high);
    if (lo == hi) return format_si(n, u);
    std::string s = format_si(lo, u) + " .. " + format_si(hi, u);
    if (std::abs(n - (lo + (hi - lo) / 2.0)) > 1e-12 * std::max(std::abs(lo), std::abs(hi)))
        s += " (nominal " + format_si(n, u) + ")";
    return s;
}

inline std::string setting_what(std::string_view name) { return "setting " + std::string(name); }

/// A ranged<Q> member: X, A..B, X,TOL or X+-D.
template <class N, class Q>
setting<N> ranged_setting(std::string_view name, std::string_view help, tauforge::ranged<Q> N::*m) {
    return {name, help,
            [m, name](N& n, std::string_view t) { n.*m = to_ranged<Q>(parse_ranged_by_unit(t, unit_of<Q>, setting_what(name))); },
            [m](const N& n) { return ranged_text(n.*m); }};
}

/// An optional ranged<Q> member; "off" clears it.
template <class N, class Q>
setting<N> optional_setting(std::string_view name, std::string_view help, std::optional<tauforge::ranged<Q>> N::*m) {
    return {name, help,
            [m, name](N& n, std::string_view t) {
                if (normalized_name(t) == "off" || normalized_name(t) == "none") n.*m = std::nullopt;
                else n.*m = to_ranged<Q>(parse_ranged_by_unit(t, unit_of<Q>, setting_what(name)));
            },
            [m](const N& n) { return (n.*m) ? ranged_text(*(n.*m)) : std::string("off"); }};
}

/// A threshold given either as a ratio of the supply or as a voltage (a value with V).
template <class N, class L>
setting<N> level_setting(std::string_view name, std::string_view help, L N::*m) {
    return {name, help,
            [m, name](N& n, std::string_view t) {
                if (t.find('V') != t.npos || t.find('v') != t.npos)
                    n.*m = to_ranged<tauforge::voltage>(parse_ranged_by_unit(t, "V", setting_what(name)));
                else
                    n.*m = to_ranged<double>(parse_ranged_by_unit(t, "V/V", setting_what(name)));
            },
            [m](const N& n) {
                return std::visit([](const auto& r) { return ranged_text(r); }, n.*m);
            }};
}

/// A ranged<Q> reached through `get` (a generic lambda returning a reference), for
/// members of members: ranged_at<N, tauforge::voltage>("high", ..., [](auto& n) -> auto& { return n.input.high; }).
template <class N, class Q, class Get>
setting<N> ranged_at(std::string_view name, std::string_view help, Get get) {
    return {name, help,
            [get, name](N& n, std::string_view t) { get(n) = to_ranged<Q>(parse_ranged_by_unit(t, unit_of<Q>, setting_what(name))); },
            [get](const N& n) { return ranged_text(get(n)); }};
}

/// A variant of a ranged ratio and a ranged time (a duty or a width): a value with
/// a time unit or prefix ending in s is the time.
template <class N, class Get>
setting<N> ratio_or_time_at(std::string_view name, std::string_view help, Get get) {
    return {name, help,
            [get, name](N& n, std::string_view t) {
                if (t.find('s') != t.npos)
                    get(n) = to_ranged<tauforge::duration>(parse_ranged_by_unit(t, "s", setting_what(name)));
                else
                    get(n) = to_ranged<double>(parse_ranged_by_unit(t, "V/V", setting_what(name)));
            },
            [get](const N& n) { return std::visit([](const auto& r) { return ranged_text(r); }, get(n)); }};
}

/// A whole number in [lo, hi].
template <class N>
setting<N> count_setting(std::string_view name, std::string_view help, int N::*m, int lo, int hi) {
    return {name, help,
            [m, name, lo, hi](N& n, std::string_view t) {
                const std::string s(trim(t));
                int v = 0;
                const auto [p, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
                if (s.empty() || ec != std::errc{} || p != s.data() + s.size() || v < lo || v > hi)
                    throw usage_error(setting_what(name) + ": \"" + s + "\" is invalid; expected a whole number from " +
                                      std::to_string(lo) + " to " + std::to_string(hi));
                n.*m = v;
            },
            [m](const N& n) { return std::to_string(n.*m); }};
}

/// A plain number through `get`.
template <class N, class Get>
setting<N> number_at(std::string_view name, std::string_view help, Get get) {
    return {name, help, [get, name](N& n, std::string_view t) { get(n) = parse_ratio_text(t, setting_what(name)); },
            [get](const N& n) { return format_si(get(n), "V/V"); }};
}

/// A switch (on / off).
template <class N>
setting<N> switch_setting(std::string_view name, std::string_view help, bool N::*m) {
    return {name, help, [m, name](N& n, std::string_view t) { n.*m = parse_switch(t, setting_what(name)); },
            [m](const N& n) { return std::string(n.*m ? "on" : "off"); }};
}

/// A plain quantity member (one value, no spread), or a ratio for a double.
template <class N, class Q>
setting<N> value_setting(std::string_view name, std::string_view help, Q N::*m) {
    return {name, help,
            [m, name](N& n, std::string_view t) { n.*m = quantity_of<Q>(parse_by_unit(t, unit_of<Q>, setting_what(name))); },
            [m](const N& n) { return format_si(si_of(n.*m), unit_of<Q>); }};
}

// ---- building a network from a request ---------------------------------------------

/// The part a member holds; an optional part is fitted (created) when `fit`, else nullptr.
template <class N, class P>
P* part_at(N& n, P N::*m, bool) { return &(n.*m); }
template <class N>
tauforge::capacitor* part_at(N& n, std::optional<tauforge::capacitor> N::*m, bool fit) {
    if (!(n.*m) && fit) (n.*m).emplace();
    return (n.*m) ? &*(n.*m) : nullptr;
}
template <class N, class P>
const P* part_at(const N& n, P N::*m) { return &(n.*m); }
template <class N>
const tauforge::capacitor* part_at(const N& n, std::optional<tauforge::capacitor> N::*m) {
    return (n.*m) ? &*(n.*m) : nullptr;
}

template <class N>
bool is_resistor(const part_binding<N>& b) { return std::holds_alternative<tauforge::resistor N::*>(b.member); }

inline std::string tempco_text(const tauforge::ppm_band& b) {
    if (!b.name.empty()) return std::string(b.name);
    if (b.low == 0.0 && b.high == 0.0) return "";
    char buf[64];
    if (b.low == -b.high) std::snprintf(buf, sizeof buf, "\u00B1%g ppm/K", b.high);
    else std::snprintf(buf, sizeof buf, "%g..%g ppm/K", b.low, b.high);
    return buf;
}

inline std::string tempco_text(const std::variant<tauforge::ppm_band, tauforge::dielectric_class>& t) {
    if (std::holds_alternative<tauforge::dielectric_class>(t)) return std::string(std::get<tauforge::dielectric_class>(t).name);
    return tempco_text(std::get<tauforge::ppm_band>(t));
}

/// What a command requires of the parts.
enum class part_use { marked, chosen, any };

template <class N>
const part_binding<N>& find_part(const network_def<N>& def, std::string_view name) {
    const std::string n = normalized_name(name);
    for (const auto& p : def.parts)
        if (normalized_name(p.name) == n) return p;
    std::string valid;
    for (const auto& p : def.parts) valid += (valid.empty() ? "" : ", ") + std::string(p.name);
    throw usage_error("part \"" + std::string(name) + "\" is not a part of " + std::string(def.name) +
                      "; expected one of " + valid);
}

template <class N>
const setting<N>& find_setting(const network_def<N>& def, std::string_view name) {
    const std::string n = normalized_name(name);
    for (const auto& s : def.settings)
        if (normalized_name(s.name) == n) return s;
    std::string valid;
    for (const auto& s : def.settings) valid += (valid.empty() ? "" : ", ") + std::string(s.name);
    throw usage_error("setting \"" + std::string(name) + "\" is not a setting of " + std::string(def.name) +
                      "; expected one of " + valid);
}

/// Sets the part `b` of n from a part text (value, tolerance, temperature behaviour,
/// fields in any order). `use`: marked parts need a value and a tolerance; chosen
/// parts (design) may only carry their temperature behaviour; any: whatever is given.
template <class N>
void apply_part(N& n, const part_binding<N>& b, std::string_view text, part_use use) {
    const std::string what = "part " + std::string(b.name) + " \"" + std::string(text) + "\"";
    std::visit(
        [&](auto member) {
            auto& part = *part_at(n, member, true);
            constexpr bool is_resistor = std::is_same_v<std::remove_cvref_t<decltype(part)>, tauforge::resistor>;
            const auto p = parse_part(text, is_resistor ? tauforge::part_kind::resistor : tauforge::part_kind::capacitor, what);
            if (use == part_use::chosen && (p.value || p.tol))
                throw usage_error(what + ": design chooses the value and tolerance of " + std::string(b.name) +
                                  "; give only its temperature behaviour here (e.g. 100ppm, X7R) and its values with --" +
                                  (is_resistor ? "resistors" : "capacitors") + " or --slot " + std::string(b.name) + "=E96");
            if (p.value) part.nominal = quantity_of<decltype(part.nominal)>(*p.value);
            if (p.tol) part.tol = *p.tol;
            if constexpr (is_resistor) {
                if (p.tcr) part.tcr = *p.tcr;
            } else {
                // A technology brings its usual tolerance unless one is given.
                if (p.technology) part = tauforge::make_capacitor(*p.technology, part.nominal, p.tol);
                if (p.tcr) part.tempco = *p.tcr;
                if (p.dielectric) {
                    part.tempco = *p.dielectric;
                    part.aging_per_decade = tauforge::typical_aging_per_decade(*p.dielectric);
                }
                if (p.rated_voltage) part.rated_voltage = tauforge::voltage::from_value(*p.rated_voltage);
                if (p.size) part.dc_bias = tauforge::dc_bias_curve::class2_estimate(*part.rated_voltage, *p.size);
            }
            if (use == part_use::marked && (!p.value || (!p.tol && !p.technology)))
                throw usage_error(what + ": " + (p.value ? "no tolerance" : "no value") + "; expected e.g. --part " +
                                  std::string(b.name) + "=" + (is_resistor ? "100k,1%" : "10n,10%") +
                                  " (a tolerance of 0% for an exact part)");
        },
        b.member);
}

/// The network as the request describes it. `use`: marked parts need a value and a
/// tolerance; chosen parts (design) may only carry their temperature behaviour.
template <class N>
N build_network(const network_def<N>& def, const request& rq, part_use use) {
    N n{};
    auto parts = rq.parts;
    auto settings = rq.settings;
    if (rq.example) {
        for (std::string_view e : def.example_parts) {
            auto [k, v] = split_assignment(e, "example");
            const bool given = std::any_of(parts.begin(), parts.end(), [&](const auto& p) { return normalized_name(p.first) == normalized_name(k); });
            if (!given) parts.emplace_back(k, use == part_use::marked ? v : std::string());
        }
        for (std::string_view e : def.example_settings) {
            auto [k, v] = split_assignment(e, "example");
            const bool given = std::any_of(settings.begin(), settings.end(), [&](const auto& p) { return normalized_name(p.first) == normalized_name(k); });
            if (!given) settings.emplace_back(k, v);
        }
    }
    for (const auto& [k, v] : settings) find_setting(def, k).apply(n, v);
    n.conditions = parse_temperature(rq.temperature, rq.temperature_ref, rq.service_life);
    std::vector<bool> seen(def.parts.size(), false);
    for (const auto& [k, v] : parts) {
        const auto& b = find_part(def, k);
        const std::size_t index = static_cast<std::size_t>(&b - def.parts.data());
        if (seen[index]) throw usage_error("part " + std::string(b.name) + " is given twice; expected one --part per part");
        seen[index] = true;
        apply_part(n, b, v, use);
    }
    if (use == part_use::marked)
        for (std::size_t i = 0; i < def.parts.size(); ++i)
            if (!seen[i] && !(def.parts[i].unused && def.parts[i].unused(n)))
                throw usage_error("part " + std::string(def.parts[i].name) + " is missing; expected --part " +
                                  std::string(def.parts[i].name) + "=VALUE,TOLERANCE (or --example for the catalogue's example)");
    return n;
}

template <class N>
std::vector<std::pair<std::string, std::string>> settings_text(const network_def<N>& def, const N& n) {
    std::vector<std::pair<std::string, std::string>> out;
    for (const auto& s : def.settings) out.emplace_back(std::string(s.name), s.show(n));
    return out;
}

template <class N>
std::vector<part_row> part_rows(const network_def<N>& def, const N& n, const std::array<interval, tauforge::parameter_count_v<N>>& r,
                                const std::vector<std::string>& origins) {
    std::vector<part_row> out;
    for (std::size_t i = 0; i < def.parts.size(); ++i) {
        const auto& b = def.parts[i];
        if (b.unused && b.unused(n)) continue;
        part_row row;
        row.name = std::string(b.name);
        row.origin = i < origins.size() ? origins[i] : "given";
        row.range = r[b.parameter];
        bool fitted = true;
        std::visit(
            [&](auto member) {
                const auto* fitted_part = part_at(n, member);
                if (!fitted_part) {
                    fitted = false;
                    return;
                }
                const auto& part = *fitted_part;
                row.kind = std::is_same_v<std::remove_cvref_t<decltype(part)>, tauforge::resistor> ? "resistor" : "capacitor";
                row.value = part.nominal.value();
                row.tol = part.tol;
                if constexpr (std::is_same_v<std::remove_cvref_t<decltype(part)>, tauforge::resistor>) row.tempco = tempco_text(part.tcr);
                else {
                    row.tempco = tempco_text(part.tempco);
                    if (part.rated_voltage) row.tempco += " " + tauforge::format(*part.rated_voltage);
                    if (part.dc_bias) row.tempco += part.dc_bias->estimate ? " DC bias (estimate)" : " DC bias";
                }
            },
            b.member);
        if (fitted) out.push_back(std::move(row));
    }
    return out;
}

// ---- check --------------------------------------------------------------------------

/// Evaluations counted for the progress line; otherwise the network itself.
template <class N>
struct counted_network {
    static constexpr auto parameters = N::parameters;
    static constexpr auto metrics = N::metrics;
    const N* net;
    std::atomic<std::size_t>* count;
    auto ranges() const { return net->ranges(); }
    auto evaluate(const point<N>& x) const {
        count->fetch_add(1, std::memory_order_relaxed);
        return net->evaluate(x);
    }
};

/// The network with its fixed parameters (low == high) held at their value.
/// Sensitivities are taken on this: the library steps a parameter that sits at 0
/// by an absolute 1e-4 of its SI unit (100 µA for a current), which can leave a
/// network's valid range although that parameter has no spread at all.
template <class N>
struct pinned_network {
    static constexpr auto parameters = N::parameters;
    static constexpr auto metrics = N::metrics;
    const N* net;
    std::array<interval, tauforge::parameter_count_v<N>> r;
    auto ranges() const { return r; }
    auto evaluate(point<N> x) const {
        for (std::size_t j = 0; j < x.size(); ++j)
            if (r[j].is_fixed()) x[j] = r[j].nominal;
        return net->evaluate(x);
    }
};

/// What a check runs.
struct check_options {
    std::vector<requirement_row> requirements;
    mc_settings mc;
    std::optional<std::size_t> primary;  ///< metric to plot; default: first requirement, else the network's
    bool traces = true;
    std::vector<std::string> origins;  ///< per part: "given", "E24", "stock"
    bool limits = false;               ///< compute production test limits
    std::string uncertainty;           ///< tester's standard uncertainty: absolute or "1%" of nominal
    double coverage = 2.0;
    std::optional<std::size_t> limit_metric;  ///< without a spec: guard this metric's worst-case spread
};

inline constexpr std::size_t max_samples = 10'000'000;

inline void check_mc_settings(const mc_settings& m) {
    if (m.samples > max_samples)
        throw usage_error("samples = " + std::to_string(m.samples) + " is invalid; expected 0 (no Monte Carlo) or 2 to " +
                          std::to_string(max_samples));
    if (m.distribution != "normal" && m.distribution != "uniform")
        throw usage_error("distribution = \"" + m.distribution + "\" is invalid; expected normal or uniform");
}

/// The standard uncertainty from "0.5ms" (absolute) or "1%" (of `reference`).
inline double parse_uncertainty(std::string_view text, std::string_view unit, double reference) {
    const std::string_view t = trim(text);
    if (t.empty()) return 0.0;
    if (t.back() == '%') return parse_ratio_text(t, "uncertainty") * std::abs(reference);
    return parse_by_unit(t, unit, "uncertainty");
}

inline histogram make_histogram(const std::vector<double>& sorted, double lo, double hi, std::size_t bins = 40) {
    histogram h;
    h.low = lo;
    h.high = hi;
    if (!(hi > lo)) {
        h.counts.assign(1, sorted.size());
        return h;
    }
    h.counts.assign(bins, 0);
    for (const double v : sorted) {
        const double f = (v - lo) / (hi - lo) * static_cast<double>(bins);
        const std::size_t b = f < 0.0 ? 0 : std::min(bins - 1, static_cast<std::size_t>(f));
        ++h.counts[b];
    }
    return h;
}

/// The worst-case margin of [lo, hi] inside w, as a fraction of the half-window
/// (one-sided: of the edge's magnitude): 1 = no spread at the centre, 0 = touching, < 0 outside.
inline double window_margin(const spec_window& w, double lo, double hi) {
    const double scale = w.low && w.high ? (*w.high - *w.low) / 2.0 : std::abs(w.low ? *w.low : *w.high);
    const double s = scale > 0.0 ? scale : 1.0;
    double m = std::numeric_limits<double>::infinity();
    if (w.low) m = std::min(m, (lo - *w.low) / s);
    if (w.high) m = std::min(m, (*w.high - hi) / s);
    return m;
}

inline const char* position_name(tauforge::corner_position p) {
    switch (p) {
        case tauforge::corner_position::fixed: return "fixed";
        case tauforge::corner_position::low: return "low";
        case tauforge::corner_position::high: return "high";
        case tauforge::corner_position::nominal: return "nominal";
        case tauforge::corner_position::interior: return "interior";
    }
    return "?";
}

template <class N>
check_result run_check(const network_def<N>& def, const N& net, const check_options& o) {
    constexpr std::size_t P = tauforge::parameter_count_v<N>, M = tauforge::metric_count_v<N>;
    check_mc_settings(o.mc);
    check_result c;
    c.network = std::string(def.name);
    c.title = std::string(def.title);
    c.conditions = net.conditions;
    c.settings = settings_text(def, net);
    c.mc = o.mc;
    const auto r = net.ranges();
    c.parts = part_rows(def, net, r, o.origins);
    for (std::size_t j = 0; j < P; ++j)
        c.parameters.push_back({std::string(N::parameters[j].name), std::string(N::parameters[j].unit), r[j], !r[j].is_fixed()});

    const auto wc = tauforge::worst_case(net);
    const pinned_network<N> pinned{&net, r};
    const auto sens = tauforge::sensitivity(pinned);
    tauforge::rss_options ro;
    ro.convention.sigmas_per_half_width = o.mc.sigmas;
    const auto rs = tauforge::rss(pinned, ro);
    c.sensitivity_method = sens.method == tauforge::derivative_method::analytic ? "analytic" : "central difference";

    // A parameter decides an extreme when moving it to its other end changes the metric there.
    auto corner_list = [&](const tauforge::corner<P>& k, std::size_t m) {
        std::vector<corner_entry> out;
        for (std::size_t j = 0; j < P; ++j) {
            const auto pos = k.positions[j];
            if (pos == tauforge::corner_position::fixed) continue;
            bool decides = true;
            if (pos == tauforge::corner_position::low || pos == tauforge::corner_position::high) {
                auto y = k.parameters;
                y[j] = pos == tauforge::corner_position::low ? r[j].high : r[j].low;
                try {
                    const double moved = net.evaluate(y)[m];
                    decides = std::abs(moved - k.value) > 1e-12 * std::abs(k.value);
                } catch (const std::exception&) {
                    decides = true;
                }
            }
            out.push_back({std::string(N::parameters[j].name), std::string(N::parameters[j].unit), k.parameters[j],
                           position_name(pos), decides});
        }
        return out;
    };
    for (std::size_t m = 0; m < M; ++m) {
        metric_row row;
        row.name = std::string(N::metrics[m].name);
        row.unit = std::string(N::metrics[m].unit);
        row.nominal = wc[m].nominal;
        row.min = wc[m].min.value;
        row.max = wc[m].max.value;
        row.min_corner = corner_list(wc[m].min, m);
        row.max_corner = corner_list(wc[m].max, m);
        row.sensitivity.assign(sens.normalized[m].begin(), sens.normalized[m].end());
        row.rss_sigma = rs[m].sigma;
        row.rss_center = rs[m].center;
        row.rss_low = rs[m].low;
        row.rss_high = rs[m].high;
        row.rss_relative_half_band = rs[m].relative_half_band;
        c.metrics.push_back(std::move(row));
    }
    // Requirements on one metric are intersected.
    for (const auto& q : o.requirements) {
        auto& row = c.metrics.at(q.metric);
        if (!row.requirement) {
            row.requirement = q;
        } else {
            auto& w = row.requirement->window;
            if (q.window.low) w.low = w.low ? std::max(*w.low, *q.window.low) : *q.window.low;
            if (q.window.high) w.high = w.high ? std::min(*w.high, *q.window.high) : *q.window.high;
            row.requirement->text += " and " + q.text;
            if (w.low && w.high && !(*w.low < *w.high))
                throw usage_error("spec: " + row.requirement->text + " leaves no value of " + row.name + "; expected overlapping windows");
        }
    }
    for (auto& row : c.metrics)
        if (row.requirement) {
            c.has_spec = true;
            row.margin = window_margin(row.requirement->window, row.min, row.max);
            row.holds = row.margin >= 0.0;
            c.holds = c.holds && row.holds;
        }
    c.primary = o.primary ? *o.primary : !o.requirements.empty() ? o.requirements.front().metric : def.default_metric;

    tauforge::monte_carlo_result<P, M> mc{};
    if (o.mc.samples > 0) {
        tauforge::monte_carlo_options<N> mo;
        mo.seed = o.mc.seed;
        mo.samples = o.mc.samples;
        mo.threads = o.mc.threads;
        mo.convention.sigmas_per_half_width = o.mc.sigmas;
        mo.worst_samples = 0;
        mo.keep_distribution = true;
        if (o.mc.distribution == "uniform") mo.distributions.fill(tauforge::parameter_distribution::uniform());
        for (std::size_t m = 0; m < M; ++m)
            if (c.metrics[m].requirement) mo.spec[m] = c.metrics[m].requirement->window;
        std::atomic<std::size_t> done{0};
        const counted_network<N> counted{&net, &done};
        {
            progress_line line(done, o.mc.samples, "Monte Carlo");
            mc = tauforge::monte_carlo(counted, mo);
        }
        c.has_mc = true;
        c.passing = mc.passing;
        c.joint_yield = mc.yield;
        for (std::size_t m = 0; m < M; ++m) {
            auto& row = c.metrics[m];
            const auto& st = mc[m];
            row.has_mc = true;
            row.mc_mean = st.mean;
            row.mc_stddev = st.stddev;
            row.mc_min = st.min;
            row.mc_max = st.max;
            for (const auto& p : st.percentiles) row.percentiles.emplace_back(p.probability, p.value);
            row.inside = st.inside;
            row.yield = st.yield;
            double lo = std::min(st.min, row.min), hi = std::max(st.max, row.max);
            const double span = hi - lo;
            if (row.requirement && span > 0.0) {
                const auto& w = row.requirement->window;
                if (w.low && *w.low > lo - span && *w.low < lo) lo = *w.low;
                if (w.high && *w.high < hi + span && *w.high > hi) hi = *w.high;
            }
            if (hi > lo) {
                const double pad = 0.04 * (hi - lo);
                lo -= pad;
                hi += pad;
            }
            row.hist = make_histogram(st.distribution, lo, hi);
        }
    }

    if (o.limits) {
        if (!c.has_mc) throw usage_error("limits need a Monte Carlo population; expected --samples of at least 2");
        std::vector<std::size_t> which;
        for (std::size_t m = 0; m < M; ++m)
            if (c.metrics[m].requirement) which.push_back(m);
        if (o.limit_metric && std::find(which.begin(), which.end(), *o.limit_metric) == which.end())
            which.push_back(*o.limit_metric);
        if (which.empty())
            throw usage_error("limits need a window to guard; expected --spec METRIC=A..B, or --metric NAME to guard the worst-case spread");
        for (const std::size_t m : which) {
            const auto& row = c.metrics[m];
            limit_row l;
            l.metric = row.name;
            l.unit = row.unit;
            l.window_source = row.requirement ? "spec" : "worst case";
            l.window = row.requirement ? row.requirement->window : spec_window::between(row.min, row.max);
            l.standard_uncertainty = parse_uncertainty(o.uncertainty, row.unit, row.nominal);
            l.coverage = o.coverage;
            const auto t = tauforge::production_test_limits(mc[m], l.window, {l.standard_uncertainty, o.coverage});
            l.acceptance = t.acceptance;
            l.guard = t.guard;
            l.rates = t.rates;
            c.limits.push_back(l);
        }
    }

    if (o.traces && def.trace) {
        const auto x_nom = tauforge::detail::nominal_point(r);
        const std::array<point<N>, 3> xs{x_nom, wc[c.primary].min.parameters, wc[c.primary].max.parameters};
        double t_end = 0.0;
        for (const auto& x : xs) {
            const waveform w = def.trace(net, x, c.primary, 0.0);
            if (!w.points.empty()) t_end = std::max(t_end, w.points.back().first);
        }
        for (const auto& x : xs) c.traces.push_back(def.trace(net, x, c.primary, t_end));
    }
    return c;
}

template <class N>
std::vector<requirement_row> parse_requirements(const std::vector<std::string>& spec) {
    std::vector<requirement_row> out;
    for (const auto& s : spec) out.push_back(parse_requirement(s, N::metrics));
    return out;
}

template <class N>
check_options check_options_from(const network_def<N>& def, const request& rq) {
    check_options o;
    o.requirements = parse_requirements<N>(rq.spec);
    if (rq.example && o.requirements.empty() && rq.command != "design")
        o.requirements = parse_requirements<N>(std::vector<std::string>(def.example_spec.begin(), def.example_spec.end()));
    o.mc = rq.mc;
    if (!rq.metric.empty()) o.primary = find_name(rq.metric, N::metrics, "metric");
    o.uncertainty = rq.uncertainty;
    o.coverage = rq.coverage;
    return o;
}

// ---- design -------------------------------------------------------------------------

template <class N>
void add_window(tauforge::timing_spec<N>& spec, const requirement_row& q) {
    auto add = [&](auto make) {
        const auto& w = q.window;
        if (w.low && w.high) spec.between(q.name, make(*w.low), make(*w.high));
        else if (w.low) spec.at_least(q.name, make(*w.low));
        else spec.at_most(q.name, make(*w.high));
    };
    if (q.unit == "s") add([](double v) { return tauforge::duration::from_value(v); });
    else if (q.unit == "Hz") add([](double v) { return tauforge::frequency::from_value(v); });
    else if (q.unit == "V") add([](double v) { return tauforge::voltage::from_value(v); });
    else add([](double v) { return v; });
}

/// Throws the network's own message when its settings are invalid whatever the parts
/// (synthesis would skip every candidate and report no design instead).
template <class N, std::size_t S>
void require_valid_settings(const N& base, const std::array<std::vector<tauforge::candidate_value>, S>& cands) {
    std::array<tauforge::part_choice, S> first{};
    for (std::size_t s = 0; s < S; ++s) first[s] = {cands[s].front().value, cands[s].front().tol};
    (void)base.with_parts(first).ranges();
}

template <class N>
design_result run_design(const network_def<N>& def, const request& rq) {
    constexpr std::size_t S = N::design_slots.size(), M = tauforge::metric_count_v<N>;
    const N base = build_network(def, rq, part_use::chosen);
    design_result d;
    d.network = std::string(def.name);
    d.title = std::string(def.title);
    for (const auto& m : N::metrics) d.metric_units.emplace_back(std::string(m.name), std::string(m.unit));
    std::vector<std::string> spec_text = rq.spec;
    if (spec_text.empty() && rq.example) spec_text.assign(def.example_spec.begin(), def.example_spec.end());
    if (spec_text.empty())
        throw usage_error("design needs a spec; expected --spec METRIC=A..B (metrics of " + std::string(def.name) + ": " + [] {
            std::string s;
            for (const auto& m : N::metrics) {
                std::string n(m.name);
                std::replace(n.begin(), n.end(), ' ', '-');
                s += (s.empty() ? "" : ", ") + n;
            }
            return s;
        }() + ")");
    d.requirements = parse_requirements<N>(spec_text);
    tauforge::timing_spec<N> spec;
    for (const auto& q : d.requirements) add_window(spec, q);

    for (const auto& [k, v] : rq.slots) (void)find_part(def, k);
    std::array<std::vector<tauforge::candidate_value>, S> cands;
    for (std::size_t s = 0; s < S; ++s) {
        const bool is_resistor = N::design_slots[s].kind == tauforge::part_kind::resistor;
        std::string text = is_resistor ? rq.resistors : rq.capacitors;
        for (const auto& [k, v] : rq.slots)
            if (normalized_name(k) == normalized_name(N::design_slots[s].name)) text = v;
        if (text.empty() && rq.example) text = is_resistor ? def.example_resistors : def.example_capacitors;
        if (text.empty()) text = is_resistor ? default_resistor_series : default_capacitor_series;
        const std::string what = std::string(is_resistor ? "resistors" : "capacitors") + " for " + std::string(N::design_slots[s].name);
        const auto spec_s = parse_value_set(text, what);
        slot_source src{std::string(N::design_slots[s].name), "", 0};
        if (is_resistor) {
            const auto set = build_resistors(spec_s, 1e3, 1e6);
            cands[s] = tauforge::candidates(set);
            src.description = describe_value_set(spec_s, set.front().value.value(), set.back().value.value(), "\u03A9");
        } else {
            const auto set = build_capacitors(spec_s, 1e-9, 10e-6);
            cands[s] = tauforge::candidates(set);
            src.description = describe_value_set(spec_s, set.front().value.value(), set.back().value.value(), "F");
        }
        src.count = cands[s].size();
        d.sources.push_back(src);
    }
    require_valid_settings(base, cands);
    const auto res = tauforge::synthesize(base, spec, cands, {.top_k = rq.top});
    d.evaluated = res.evaluated;
    d.feasible = res.feasible();
    d.why = res.why == tauforge::infeasibility::tolerance_too_wide ? "tolerance too wide"
            : res.why == tauforge::infeasibility::out_of_reach    ? "out of reach"
                                                                   : "";
    d.reason = res.reason;
    for (const auto& x : res.designs) {
        design_row row;
        const auto r = x.network.ranges();
        std::vector<std::string> origins;
        for (const auto& p : x.parts) origins.emplace_back(p.origin);
        row.parts = part_rows(def, x.network, r, origins);
        row.nominal.assign(x.nominal.begin(), x.nominal.end());
        row.worst_min.assign(x.worst_min.begin(), x.worst_min.end());
        row.worst_max.assign(x.worst_max.begin(), x.worst_max.end());
        row.margin = x.margin;
        row.tight_metric = d.requirements.at(x.tight_requirement).name;
        row.tight_at_high = x.tight_at_high;
        row.nominal_error = x.nominal_error;
        d.designs.push_back(std::move(row));
    }
    (void)M;
    if (d.feasible) {
        check_options o = check_options_from(def, rq);
        o.requirements = d.requirements;
        for (const auto& p : res.designs.front().parts) o.origins.emplace_back(p.origin);
        d.best = run_check(def, res.designs.front().network, o);
    }
    return d;
}

// ---- readback -----------------------------------------------------------------------

template <class N>
readback_result run_readback(const network_def<N>& def, const request& rq) {
    const N net = build_network(def, rq, part_use::marked);
    if (rq.measured.empty()) throw usage_error("readback needs a measurement; expected --measured METRIC=VALUE");
    if (rq.solve.empty()) throw usage_error("readback needs the part to read back; expected --solve NAME (e.g. --solve C)");
    readback_result b;
    check_options o = check_options_from(def, rq);
    o.mc.samples = 0;
    o.traces = false;
    b.marked = run_check(def, net, o);
    const auto [metric_name, value_text] = split_assignment(rq.measured, "measured");
    const std::size_t m = find_name(metric_name, N::metrics, "metric");
    const std::size_t p = find_name(rq.solve, N::parameters, "parameter");
    b.metric = std::string(N::metrics[m].name);
    b.metric_unit = std::string(N::metrics[m].unit);
    b.parameter = std::string(N::parameters[p].name);
    b.parameter_unit = std::string(N::parameters[p].unit);
    b.measured = parse_by_unit(value_text, b.metric_unit, "measured " + b.metric);
    b.standard_uncertainty = parse_uncertainty(rq.uncertainty, b.metric_unit, b.measured);
    b.coverage = rq.coverage;
    b.estimate = tauforge::estimate_parameter(net, p, m, b.measured, {b.standard_uncertainty, b.coverage});
    b.marked_range = net.ranges()[p];
    b.within_marked = b.estimate.nominal >= b.marked_range.low && b.estimate.nominal <= b.marked_range.high;
    return b;
}

// ---- the type-erased catalogue entry ------------------------------------------------

template <class N>
network_entry make_entry(network_def<N> def_in) {
    const auto def = std::make_shared<const network_def<N>>(std::move(def_in));
    if constexpr (tauforge::DesignableNetwork<N>) {
        for (std::size_t i = 0; i < def->parts.size() && i < N::design_slots.size(); ++i)
            if (def->parts[i].name != N::design_slots[i].name || def->parts[i].parameter != N::design_slots[i].parameter)
                throw std::logic_error("catalogue: parts of " + std::string(def->name) + " do not follow its design slots");
    }
    network_entry e;
    e.name = std::string(def->name);
    e.title = std::string(def->title);
    e.summary = std::string(def->summary);
    for (auto a : def->aliases) e.aliases.emplace_back(a);
    e.parameters.assign(N::parameters.begin(), N::parameters.end());
    e.metrics.assign(N::metrics.begin(), N::metrics.end());
    for (const auto& p : def->parts)
        e.parts.emplace_back(std::string(p.name), is_resistor(p) ? "resistor" : "capacitor");
    for (const auto& s : def->settings) e.settings.emplace_back(std::string(s.name), std::string(s.help));
    for (auto s : def->example_parts) e.example_parts.emplace_back(s);
    for (auto s : def->example_settings) e.example_settings.emplace_back(s);
    for (auto s : def->example_spec) e.example_spec.emplace_back(s);
    e.example_resistors = std::string(def->example_resistors);
    e.example_capacitors = std::string(def->example_capacitors);
    e.check = [def](const request& rq) {
        const N net = build_network(*def, rq, part_use::marked);
        check_options o = check_options_from(*def, rq);
        o.limits = rq.command == "limits";
        if (o.limits && !rq.metric.empty()) o.limit_metric = o.primary;
        return run_check(*def, net, o);
    };
    e.designable = tauforge::DesignableNetwork<N>;
    e.design = [def](const request& rq) -> design_result {
        if constexpr (tauforge::DesignableNetwork<N>) {
            return run_design(*def, rq);
        } else {
            (void)rq;
            throw usage_error(std::string(def->name) + " has no parts for design to choose; expected check, limits or readback");
        }
    };
    e.readback = [def](const request& rq) { return run_readback(*def, rq); };
    return e;
}

}  // namespace tfcli
