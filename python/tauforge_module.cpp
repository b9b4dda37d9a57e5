// The Python module `tauforge`: the library's functions with Pythonic names, built on
// the same headers. Quantities cross as floats in SI base units or as value strings
// ("4k7", "10 nF"); networks are the command line's catalogue (examples/cli), bound
// with their types by one template (bind_network), so parts, settings and windows
// read with the same grammar as on the command line. No formula lives here: every
// number comes from the library.
#include "network_defs.hpp"

#include <tauforge/tauforge.hpp>

#include <pybind11/functional.h>
#include <pybind11/operators.h>
#include <pybind11/pybind11.h>
#include <pybind11/stl.h>

#include <atomic>
#include <chrono>
#include <exception>
#include <memory>
#include <optional>
#include <sstream>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace py = pybind11;
using namespace tauforge;

namespace {

// ---- arguments: floats in SI base units or value strings --------------------------

/// A float from a Python number; anything else is a TypeError naming what was given.
double number_arg(py::handle h) {
    if (!PyNumber_Check(h.ptr()) || py::isinstance<py::str>(h))
        throw py::type_error("expected a number in SI base units or a value string, not " +
                             py::str(h.get_type().attr("__name__")).cast<std::string>());
    return py::float_(py::reinterpret_borrow<py::object>(h)).cast<double>();
}

/// A quantity from a float (SI base unit) or a value string read by tauforge::parse.
template <class Q>
Q quantity_arg(py::handle h) {
    if (py::isinstance<py::str>(h)) return parse<Q>(h.cast<std::string>());
    return Q::from_value(number_arg(h));
}

/// A plain number or a ratio text ("0.5", "50 %").
double ratio_arg(py::handle h) {
    if (py::isinstance<py::str>(h)) return parse_ratio(h.cast<std::string>());
    return number_arg(h);
}

/// A tolerance: a Tolerance, a text ("5%", "J", "+80/-20%"), a fraction (0.05 is ±5 %)
/// or a pair (minus, plus).
tolerance tolerance_arg(py::handle h) {
    if (py::isinstance<tolerance>(h)) return h.cast<tolerance>();
    if (py::isinstance<py::str>(h)) return parse_tolerance(h.cast<std::string>());
    if (py::isinstance<py::tuple>(h) || py::isinstance<py::list>(h)) {
        const auto t = h.cast<std::pair<double, double>>();
        return {t.first, t.second};
    }
    return tolerance::symmetric(h.cast<double>());
}

std::optional<tolerance> optional_tolerance(py::handle h) {
    if (h.is_none()) return std::nullopt;
    return tolerance_arg(h);
}

/// An E-series: an ESeries value or its name ("E24", "e96").
e_series series_arg(py::handle h) {
    if (py::isinstance<e_series>(h)) return h.cast<e_series>();
    const auto name = tfcli::normalized_name(h.cast<std::string>());
    for (e_series s : all_e_series)
        if (tfcli::normalized_name(series_name(s)) == name) return s;
    throw tauforge::invalid_argument("series = \"" + h.cast<std::string>() +
                                     "\" is invalid; expected one of E3, E6, E12, E24, E48, E96, E192");
}

/// Text of a Python value for the command line's grammars (settings, parts, windows).
std::string text_arg(py::handle h) {
    if (py::isinstance<py::str>(h)) return h.cast<std::string>();
    if (py::isinstance<py::bool_>(h)) return h.cast<bool>() ? "on" : "off";
    return py::str(py::float_(h.cast<double>())).cast<std::string>();
}

py::object optional_series(const std::optional<e_series>& s) {
    return s ? py::object(py::str(std::string(series_name(*s)))) : py::object(py::none());
}

template <class Q>
py::dict part_value_dict(const part_value<Q>& p) {
    py::dict d;
    d["value"] = p.value.value();
    d["tolerance"] = p.tol;
    d["series"] = optional_series(p.series);
    return d;
}

py::tuple interval_tuple(const interval& i) { return py::make_tuple(i.nominal, i.low, i.high); }

py::object window_object(const spec_window& w) {
    return py::make_tuple(w.low ? py::object(py::float_(*w.low)) : py::object(py::none()),
                          w.high ? py::object(py::float_(*w.high)) : py::object(py::none()));
}

py::dict proportion_dict(const proportion_interval& p) {
    py::dict d;
    d["estimate"] = p.estimate;
    d["low"] = p.low;
    d["high"] = p.high;
    return d;
}

const char* position_name(corner_position p) { return tfcli::position_name(p); }

// ---- value sets ---------------------------------------------------------------------

template <class Q>
std::vector<part_value<Q>> part_list(py::iterable items) {
    std::vector<part_value<Q>> out;
    for (py::handle item : items) {
        if (py::isinstance<py::tuple>(item) || py::isinstance<py::list>(item)) {
            const auto seq = item.cast<py::sequence>();
            if (seq.size() != 2)
                throw tauforge::invalid_argument("value_set::from_list: an entry has " + std::to_string(seq.size()) +
                                                 " fields; expected (value, tolerance)");
            out.push_back({quantity_arg<Q>(seq[0]), tolerance_arg(seq[1]), std::nullopt});
        } else if (py::isinstance<py::dict>(item)) {
            const auto d = item.cast<py::dict>();
            out.push_back({quantity_arg<Q>(d["value"]), tolerance_arg(d["tolerance"]), std::nullopt});
        } else {
            throw tauforge::invalid_argument("value_set::from_list: an entry is " +
                                             py::str(item.get_type().attr("__name__")).cast<std::string>() +
                                             "; expected (value, tolerance)");
        }
    }
    return out;
}

connection connection_arg(const std::string& how) {
    const auto n = tfcli::normalized_name(how);
    if (n == "series") return connection::series;
    if (n == "parallel") return connection::parallel;
    throw tauforge::invalid_argument("best_pairs: connection = \"" + how + "\" is invalid; expected series or parallel");
}

template <class Q>
void bind_value_set(py::module_& m, const char* name, const char* what) {
    using set = value_set<Q>;
    py::class_<set>(m, name, (std::string("A sorted, duplicate-free, never empty set of ") + what +
                              " values with the tolerance each is bought at (series.hpp value_set).")
                                 .c_str())
        .def_static(
            "from_series",
            [](py::handle series, py::handle min, py::handle max, py::handle tol) {
                const auto t = optional_tolerance(tol);
                return t ? set::from_series(series_arg(series), quantity_arg<Q>(min), quantity_arg<Q>(max), *t)
                         : set::from_series(series_arg(series), quantity_arg<Q>(min), quantity_arg<Q>(max));
            },
            py::arg("series"), py::arg("min"), py::arg("max"), py::arg("tolerance") = py::none(),
            "Every value of an IEC 60063 series in [min, max], at the series' customary tolerance unless given.")
        .def_static(
            "from_list", [](py::iterable items) { return set::from_list(part_list<Q>(items)); }, py::arg("parts"),
            "A stock list from (value, tolerance) pairs; values as floats (SI) or text, tolerances as text or fractions.")
        .def_static(
            "read_stock",
            [](const std::string& text, py::handle default_tol, const std::string& source) {
                std::istringstream in(text);
                return set::read_stock(in, optional_tolerance(default_tol), source);
            },
            py::arg("text"), py::arg("default_tolerance") = py::none(), py::arg("source") = "stock list",
            "Reads a stock list from text: one value per line, optionally ', tolerance'; '#' starts a comment.")
        .def_static(
            "read_stock_file",
            [](const std::string& path, py::handle default_tol) {
                return set::read_stock_file(path, optional_tolerance(default_tol));
            },
            py::arg("path"), py::arg("default_tolerance") = py::none(), "Reads a stock list from a file (see read_stock).")
        .def("__len__", &set::size)
        .def("__getitem__",
             [](const set& s, std::ptrdiff_t i) {
                 const auto n = static_cast<std::ptrdiff_t>(s.size());
                 if (i < 0) i += n;
                 if (i < 0 || i >= n) throw py::index_error("value set index out of range");
                 return part_value_dict(s[static_cast<std::size_t>(i)]);
             })
        .def("__iter__",
             [](const set& s) {
                 py::list out;
                 for (const auto& p : s) out.append(part_value_dict(p));
                 return py::iter(out);
             })
        .def_property_readonly(
            "values",
            [](const set& s) { return std::vector<double>(s.si_values().begin(), s.si_values().end()); },
            "The values in SI base units, ascending.")
        .def("nearest", [](const set& s, py::handle x) { return part_value_dict(s.nearest(quantity_arg<Q>(x))); },
             py::arg("x"), "The value nearest to x (relative distance).")
        .def(
            "bracket",
            [](const set& s, py::handle x) {
                const auto b = s.bracket(quantity_arg<Q>(x));
                return py::make_tuple(b.below ? py::object(part_value_dict(*b.below)) : py::object(py::none()),
                                      b.above ? py::object(part_value_dict(*b.above)) : py::object(py::none()));
            },
            py::arg("x"), "(largest value <= x, smallest value >= x); None where there is none.")
        .def(
            "round_down",
            [](const set& s, py::handle x) -> py::object {
                const auto v = s.round_down(quantity_arg<Q>(x));
                return v ? py::object(part_value_dict(*v)) : py::object(py::none());
            },
            py::arg("x"), "The largest value <= x, or None.")
        .def(
            "round_up",
            [](const set& s, py::handle x) -> py::object {
                const auto v = s.round_up(quantity_arg<Q>(x));
                return v ? py::object(part_value_dict(*v)) : py::object(py::none());
            },
            py::arg("x"), "The smallest value >= x, or None.")
        .def(
            "find",
            [](const set& s, py::handle x, double rel) -> py::object {
                const auto v = s.find(quantity_arg<Q>(x), rel);
                return v ? py::object(part_value_dict(*v)) : py::object(py::none());
            },
            py::arg("x"), py::arg("rel_tol") = default_match_tolerance, "The value within rel_tol of x, or None.")
        .def(
            "__contains__", [](const set& s, py::handle x) { return s.contains(quantity_arg<Q>(x)); }, py::arg("x"))
        .def(
            "best_single", [](const set& s, py::handle target) { return part_value_dict(best_single(s, quantity_arg<Q>(target))); },
            py::arg("target"), "The single value with the smallest relative error to target.")
        .def(
            "best_pairs",
            [](const set& s, py::handle target, const std::string& how, std::size_t k) {
                py::list out;
                for (const auto& p : best_pairs(s, quantity_arg<Q>(target), connection_arg(how), k)) {
                    py::dict d;
                    d["first"] = part_value_dict(p.first);
                    d["second"] = part_value_dict(p.second);
                    d["connection"] = std::string(connection_name(p.how));
                    d["value"] = p.value.value();
                    d["error"] = p.error;
                    d["tolerance"] = p.tol;
                    out.append(d);
                }
                return out;
            },
            py::arg("target"), py::arg("connection") = "series", py::arg("k") = 1,
            "The k best two-part combinations (series or parallel) for target, best first.")
        .def("__repr__", [name](const set& s) {
            return std::string(name) + "(" + std::to_string(s.size()) + " values, " +
                   format_si(s.front().value.value(), unit_symbol<Q>::unicode) + " .. " +
                   format_si(s.back().value.value(), unit_symbol<Q>::unicode) + ")";
        });
}

// ---- networks -----------------------------------------------------------------------

/// Raised through the library (it is no std::exception, so no catch clause of the
/// search swallows it) when the progress callback raised; the Python error is kept.
struct search_cancelled {};

struct progress_state {
    py::function callback;
    double interval_s = 0.1;
    std::size_t count = 0;
    std::chrono::steady_clock::time_point next{};
    std::exception_ptr error;

    void tick() {
        if ((++count & 1023u) != 0) return;
        const auto now = std::chrono::steady_clock::now();
        if (now < next) return;
        next = now + std::chrono::duration_cast<std::chrono::steady_clock::duration>(std::chrono::duration<double>(interval_s));
        py::gil_scoped_acquire gil;
        try {
            callback(count);
        } catch (py::error_already_set&) {
            error = std::current_exception();
            throw search_cancelled{};
        }
    }
};

/// A network whose evaluations are counted for the progress callback; otherwise N.
template <DesignableNetwork N>
struct reporting_network {
    static constexpr auto parameters = N::parameters;
    static constexpr auto metrics = N::metrics;
    static constexpr auto design_slots = N::design_slots;
    N inner{};
    progress_state* state = nullptr;

    auto ranges() const { return inner.ranges(); }
    auto evaluate(const std::array<double, parameter_count_v<N>>& x) const {
        state->tick();
        return inner.evaluate(x);
    }
    reporting_network with_parts(const std::array<part_choice, N::design_slots.size()>& p) const {
        return {inner.with_parts(p), state};
    }
    double solve_slot(std::size_t slot, std::size_t metric, double target,
                      const std::array<double, N::design_slots.size()>& values) const
        requires SolvableNetwork<N>
    {
        return inner.solve_slot(slot, metric, target, values);
    }
    bool corners_are_bounds() const { return tauforge::corners_are_bounds(inner); }
};

/// Monte Carlo settings from Python keywords.
struct mc_args {
    std::size_t samples = 100'000;
    std::uint64_t seed = 1;
    unsigned threads = 1;
    std::string distribution = "normal";
    double sigmas = 3.0;
    std::vector<double> percentiles{0.00135, 0.025, 0.5, 0.975, 0.99865};
    double confidence = 0.95;
};

/// What every bound network does, whatever its type.
struct network_base {
    virtual ~network_base() = default;
    virtual std::string catalogue_name() const = 0;
    virtual std::vector<quantity_info> parameters() const = 0;
    virtual std::vector<quantity_info> metrics() const = 0;
    virtual std::vector<std::string> part_names() const = 0;
    virtual std::vector<std::pair<std::string, std::string>> setting_help() const = 0;
    virtual void set(const std::string& key, py::handle value) = 0;
    virtual py::dict settings() const = 0;
    virtual py::list parts() const = 0;
    virtual py::dict ranges() const = 0;
    virtual std::string repr() const = 0;
    virtual py::dict evaluate(py::handle x) const = 0;
    virtual py::dict worst_case() const = 0;
    virtual py::dict sensitivity() const = 0;
    virtual py::dict rss(double sigmas, double band_sigmas) const = 0;
    virtual py::dict monte_carlo(const mc_args& a, py::handle spec) const = 0;
    virtual py::list test_limits(py::handle spec, py::handle metric, py::handle uncertainty, double coverage,
                                 const mc_args& a) const = 0;
    virtual py::dict read_back(const std::string& part, py::handle measured, py::handle uncertainty,
                               double coverage) const = 0;
    virtual py::dict synthesize(py::handle spec, py::handle resistors, py::handle capacitors, py::handle slots,
                                std::size_t top, const std::string& method, py::object progress,
                                double progress_interval) const = 0;
};

std::string metric_key(std::string_view name) {
    std::string s(name);
    for (char& c : s)
        if (c == ' ') c = '-';
    return s;
}

/// Windows from Python: "metric=A..B" texts, or a dict metric -> text | (low, high).
std::vector<tfcli::requirement_row> spec_rows(py::handle spec, std::span<const quantity_info> metrics) {
    std::vector<tfcli::requirement_row> rows;
    if (spec.is_none()) return rows;
    if (py::isinstance<py::str>(spec)) {
        rows.push_back(tfcli::parse_requirement(spec.cast<std::string>(), metrics));
        return rows;
    }
    if (py::isinstance<py::dict>(spec)) {
        for (auto [k, v] : spec.cast<py::dict>()) {
            const auto name = py::cast<std::string>(k);
            if (py::isinstance<py::str>(v)) {
                const auto text = py::cast<std::string>(v);
                const bool op = !text.empty() && (text.front() == '<' || text.front() == '>');
                rows.push_back(tfcli::parse_requirement(metric_key(name) + (op ? "" : "=") + text, metrics));
                continue;
            }
            const auto pair = py::cast<py::sequence>(v);
            if (pair.size() != 2)
                throw tauforge::invalid_argument("spec: " + name + " has " + std::to_string(pair.size()) +
                                                 " edges; expected (low, high) with None for an open side");
            tfcli::requirement_row q;
            q.metric = tfcli::find_name(name, metrics, "metric");
            q.name = std::string(metrics[q.metric].name);
            q.unit = std::string(metrics[q.metric].unit);
            const auto edge = [&](py::handle e, const char* side) -> std::optional<double> {
                if (e.is_none()) return std::nullopt;
                if (py::isinstance<py::str>(e)) return tfcli::parse_by_unit(e.cast<std::string>(), q.unit, name + " " + side);
                return e.cast<double>();
            };
            q.window.low = edge(pair[0], "low");
            q.window.high = edge(pair[1], "high");
            if (q.window.is_open())
                throw tauforge::invalid_argument("spec: " + name + " = (None, None) is invalid; expected at least one edge");
            detail::check_window("spec", name, q.unit, q.window);
            q.text = name;
            rows.push_back(q);
        }
        return rows;
    }
    for (py::handle item : spec.cast<py::iterable>()) rows.push_back(tfcli::parse_requirement(item.cast<std::string>(), metrics));
    return rows;
}

/// One window per metric: the intersection of the windows given on it.
template <std::size_t M>
std::array<spec_window, M> windows_of(const std::vector<tfcli::requirement_row>& rows) {
    std::array<spec_window, M> w{};
    for (const auto& q : rows) {
        auto& x = w.at(q.metric);
        if (q.window.low) x.low = x.low ? std::max(*x.low, *q.window.low) : *q.window.low;
        if (q.window.high) x.high = x.high ? std::min(*x.high, *q.window.high) : *q.window.high;
        if (x.low && x.high && !(*x.low <= *x.high))
            throw tauforge::invalid_argument("spec: the windows on " + q.name + " leave no value; expected overlapping windows");
    }
    return w;
}

std::string setting_key(const std::string& key) { return tfcli::normalized_name(key); }

template <class N, tfcli::network_def<N> (*Make)()>
struct network_impl final : network_base {
    static constexpr std::size_t P = parameter_count_v<N>, M = metric_count_v<N>;

    static const tfcli::network_def<N>& def() {
        static const tfcli::network_def<N> d = Make();
        return d;
    }

    N net{};
    std::string temperature, temperature_ref, service_life;

    network_impl() = default;
    explicit network_impl(N n) : net(std::move(n)) {}

    std::string catalogue_name() const override { return std::string(def().name); }
    std::vector<quantity_info> parameters() const override { return {N::parameters.begin(), N::parameters.end()}; }
    std::vector<quantity_info> metrics() const override { return {N::metrics.begin(), N::metrics.end()}; }
    std::vector<std::string> part_names() const override {
        std::vector<std::string> out;
        for (const auto& p : def().parts) out.emplace_back(p.name);
        return out;
    }
    std::vector<std::pair<std::string, std::string>> setting_help() const override {
        std::vector<std::pair<std::string, std::string>> out;
        for (const auto& s : def().settings) out.emplace_back(std::string(s.name), std::string(s.help));
        return out;
    }

    void set(const std::string& key, py::handle value) override {
        const std::string text = text_arg(value);
        const std::string k = setting_key(key);
        if (k == "temperature" || k == "temperature ref" || k == "service life") {
            (k == "temperature" ? temperature : k == "service life" ? service_life : temperature_ref) = text;
            net.conditions = tfcli::parse_temperature(temperature, temperature_ref, service_life);
            return;
        }
        for (const auto& b : def().parts)
            if (tfcli::normalized_name(b.name) == k) return tfcli::apply_part(net, b, text, tfcli::part_use::any);
        tfcli::find_setting(def(), key).apply(net, text);
    }

    py::dict settings() const override {
        py::dict d;
        for (const auto& [k, v] : tfcli::settings_text(def(), net)) d[py::str(k)] = v;
        d["temperature"] = temperature.empty() ? std::string("25") : temperature;
        if (!service_life.empty()) d["service life"] = service_life;
        return d;
    }

    /// The parts' rows; their ranges when the network's parameters are valid, else None.
    py::list parts() const override {
        std::optional<std::array<interval, P>> r;
        try {
            r = net.ranges();
        } catch (const tauforge::invalid_argument&) {
        } catch (const tauforge::domain_error&) {
        }
        py::list out;
        for (const auto& row : tfcli::part_rows(def(), net, r.value_or(std::array<interval, P>{}), {})) {
            py::dict d;
            d["name"] = row.name;
            d["kind"] = row.kind;
            d["value"] = row.value;
            d["tolerance"] = row.tol;
            d["tempco"] = row.tempco;
            d["range"] = r ? py::object(interval_tuple(row.range)) : py::object(py::none());
            out.append(d);
        }
        return out;
    }

    /// The Python class name (set by bind_network).
    static inline std::string python_name;

    /// Class(part="value,tolerance[,tempco]", ...): reads back as a network with these parts.
    std::string repr() const override {
        std::string s = python_name + "(";
        bool first = true;
        for (const auto& row : tfcli::part_rows(def(), net, std::array<interval, P>{}, {})) {
            if (row.value == 0.0) continue;
            s += (first ? "" : ", ") + row.name + "=\"" +
                 format_si(row.value, row.kind == "resistor" ? "\u03A9" : "F", {.digits = 6}) + "," +
                 format_tolerance(row.tol, {.digits = 6}) + (row.tempco.empty() ? "" : "," + row.tempco) + "\"";
            first = false;
        }
        return s + ")";
    }

    py::dict ranges() const override {
        const auto r = net.ranges();
        py::dict d;
        for (std::size_t j = 0; j < P; ++j) d[py::str(std::string(N::parameters[j].name))] = interval_tuple(r[j]);
        return d;
    }

    std::array<double, P> point_arg(py::handle x) const {
        const auto r = net.ranges();
        auto p = detail::nominal_point(r);
        if (x.is_none()) return p;
        if (py::isinstance<py::dict>(x)) {
            for (auto [k, v] : x.cast<py::dict>()) {
                const auto name = py::cast<std::string>(k);
                const std::size_t j = tfcli::find_name(name, N::parameters, "parameter");
                p[j] = py::isinstance<py::str>(v) ? tfcli::parse_by_unit(py::cast<std::string>(v), N::parameters[j].unit, name)
                                                  : number_arg(v);
            }
            return p;
        }
        const auto v = x.cast<std::vector<double>>();
        if (v.size() != P)
            throw tauforge::invalid_argument("evaluate: x has " + std::to_string(v.size()) + " values; expected " +
                                             std::to_string(P) + " (one per parameter)");
        std::copy(v.begin(), v.end(), p.begin());
        return p;
    }

    py::dict metric_dict(const std::array<double, M>& v) const {
        py::dict d;
        for (std::size_t m = 0; m < M; ++m) d[py::str(std::string(N::metrics[m].name))] = v[m];
        return d;
    }

    py::dict evaluate(py::handle x) const override { return metric_dict(net.evaluate(point_arg(x))); }

    py::dict corner_dict(const corner<P>& c) const {
        py::dict d;
        for (std::size_t j = 0; j < P; ++j) {
            if (c.positions[j] == corner_position::fixed) continue;
            d[py::str(std::string(N::parameters[j].name))] = py::make_tuple(c.parameters[j], position_name(c.positions[j]));
        }
        return d;
    }

    py::dict worst_case() const override {
        const auto wc = tauforge::worst_case(net);
        py::dict out;
        for (std::size_t m = 0; m < M; ++m) {
            py::dict d;
            d["nominal"] = wc[m].nominal;
            d["min"] = wc[m].min.value;
            d["max"] = wc[m].max.value;
            d["min_corner"] = corner_dict(wc[m].min);
            d["max_corner"] = corner_dict(wc[m].max);
            out[py::str(std::string(N::metrics[m].name))] = d;
        }
        return out;
    }

    /// Sensitivities and RSS are taken with the fixed parameters held (as the command line does).
    tfcli::pinned_network<N> pinned() const { return {&net, net.ranges()}; }

    py::dict sensitivity() const override {
        const auto s = tauforge::sensitivity(pinned());
        py::dict out;
        for (std::size_t m = 0; m < M; ++m) {
            py::dict row;
            for (std::size_t j = 0; j < P; ++j) row[py::str(std::string(N::parameters[j].name))] = s.normalized[m][j];
            out[py::str(std::string(N::metrics[m].name))] = row;
        }
        return out;
    }

    py::dict rss(double sigmas, double band_sigmas) const override {
        rss_options o;
        o.convention.sigmas_per_half_width = sigmas;
        o.band_sigmas = band_sigmas;
        const auto r = tauforge::rss(pinned(), o);
        py::dict out;
        for (std::size_t m = 0; m < M; ++m) {
            py::dict d;
            d["nominal"] = r[m].nominal;
            d["center"] = r[m].center;
            d["sigma"] = r[m].sigma;
            d["low"] = r[m].low;
            d["high"] = r[m].high;
            d["relative_sigma"] = r[m].relative_sigma;
            d["relative_half_band"] = r[m].relative_half_band;
            out[py::str(std::string(N::metrics[m].name))] = d;
        }
        return out;
    }

    monte_carlo_result<P, M> run_monte_carlo(const mc_args& a, const std::array<spec_window, M>& windows,
                                             bool keep) const {
        monte_carlo_options<N> mo;
        mo.seed = a.seed;
        mo.samples = a.samples;
        mo.threads = a.threads;
        mo.convention.sigmas_per_half_width = a.sigmas;
        mo.percentiles = a.percentiles;
        mo.confidence = a.confidence;
        mo.worst_samples = 0;
        mo.keep_distribution = keep;
        mo.spec = windows;
        if (a.distribution == "uniform") mo.distributions.fill(parameter_distribution::uniform());
        else if (a.distribution != "normal")
            throw tauforge::invalid_argument("monte_carlo: distribution = \"" + a.distribution +
                                             "\" is invalid; expected normal or uniform");
        const N local = net;  // another Python thread may change this network meanwhile
        py::gil_scoped_release release;
        return tauforge::monte_carlo(local, mo);
    }

    py::dict monte_carlo(const mc_args& a, py::handle spec) const override {
        const auto windows = windows_of<M>(spec_rows(spec, N::metrics));
        const auto mc = run_monte_carlo(a, windows, false);
        py::dict out, metrics;
        out["seed"] = mc.seed;
        out["samples"] = mc.samples;
        out["confidence"] = mc.confidence;
        out["passing"] = mc.passing;
        out["yield"] = proportion_dict(mc.yield);
        out["yield_exact"] = proportion_dict(mc.yield_exact);
        for (std::size_t m = 0; m < M; ++m) {
            const auto& s = mc[m];
            py::dict d;
            d["nominal"] = s.nominal;
            d["mean"] = s.mean;
            d["stddev"] = s.stddev;
            d["min"] = s.min;
            d["max"] = s.max;
            py::dict pct;
            for (const auto& p : s.percentiles) pct[py::float_(p.probability)] = p.value;
            d["percentiles"] = pct;
            d["window"] = window_object(windows[m]);
            d["inside"] = s.inside;
            d["yield"] = proportion_dict(s.yield);
            d["yield_exact"] = proportion_dict(s.yield_exact);
            metrics[py::str(std::string(N::metrics[m].name))] = d;
        }
        out["metrics"] = metrics;
        return out;
    }

    double uncertainty_of(py::handle u, std::string_view unit, double reference) const {
        if (u.is_none()) return 0.0;
        if (py::isinstance<py::str>(u)) return tfcli::parse_uncertainty(u.cast<std::string>(), unit, reference);
        return u.cast<double>();
    }

    py::list test_limits(py::handle spec, py::handle metric, py::handle uncertainty, double coverage,
                         const mc_args& a) const override {
        const auto rows = spec_rows(spec, N::metrics);
        const auto windows = windows_of<M>(rows);
        std::vector<std::size_t> which;
        for (std::size_t m = 0; m < M; ++m)
            if (!windows[m].is_open()) which.push_back(m);
        std::optional<std::size_t> guard_metric;
        if (!metric.is_none()) {
            guard_metric = tfcli::find_name(metric.cast<std::string>(), N::metrics, "metric");
            if (std::find(which.begin(), which.end(), *guard_metric) == which.end()) which.push_back(*guard_metric);
        }
        if (which.empty())
            throw tauforge::invalid_argument(
                "test_limits: spec = None is invalid; expected a window to guard, or metric= to guard the worst-case spread");
        const auto wc = tauforge::worst_case(net);
        const auto mc = run_monte_carlo(a, windows, true);
        py::list out;
        for (const std::size_t m : which) {
            const bool from_spec = !windows[m].is_open();
            const spec_window w = from_spec ? windows[m] : window_from(wc[m]);
            const double u = uncertainty_of(uncertainty, N::metrics[m].unit, wc[m].nominal);
            const auto t = production_test_limits(mc[m], w, {u, coverage});
            py::dict d;
            d["metric"] = std::string(N::metrics[m].name);
            d["unit"] = std::string(N::metrics[m].unit);
            d["window_source"] = from_spec ? "spec" : "worst case";
            d["window"] = window_object(t.window);
            d["acceptance"] = window_object(t.acceptance);
            d["standard_uncertainty"] = u;
            d["coverage"] = coverage;
            d["guard"] = t.guard;
            py::dict rates;
            rates["samples"] = t.rates.samples;
            rates["good_fraction"] = t.rates.good_fraction;
            rates["reject_fraction"] = t.rates.reject_fraction;
            rates["false_reject_rate"] = t.rates.false_reject_rate;
            rates["false_accept_rate"] = t.rates.false_accept_rate;
            d["rates"] = rates;
            out.append(d);
        }
        return out;
    }

    py::dict read_back(const std::string& part, py::handle measured, py::handle uncertainty,
                       double coverage) const override {
        std::string metric_name;
        py::object value;
        if (py::isinstance<py::str>(measured)) {
            const auto [k, v] = tfcli::split_assignment(measured.cast<std::string>(), "measured");
            metric_name = k;
            value = py::str(v);
        } else {
            const auto seq = measured.cast<py::sequence>();
            if (seq.size() != 2)
                throw tauforge::invalid_argument("read_back: measured has " + std::to_string(seq.size()) +
                                                 " fields; expected (metric, value) or \"metric=value\"");
            metric_name = seq[0].cast<std::string>();
            value = seq[1];
        }
        const std::size_t m = tfcli::find_name(metric_name, N::metrics, "metric");
        const std::size_t p = tfcli::find_name(part, N::parameters, "parameter");
        const std::string unit(N::metrics[m].unit);
        const double x = py::isinstance<py::str>(value)
                             ? tfcli::parse_by_unit(value.cast<std::string>(), unit, "measured " + metric_name)
                             : value.cast<double>();
        const double u = uncertainty_of(uncertainty, unit, x);
        const auto est = estimate_parameter(net, p, m, x, {u, coverage});
        const auto marked = net.ranges()[p];
        py::dict d;
        d["parameter"] = std::string(N::parameters[p].name);
        d["unit"] = std::string(N::parameters[p].unit);
        d["metric"] = std::string(N::metrics[m].name);
        d["measured"] = x;
        d["standard_uncertainty"] = u;
        d["coverage"] = coverage;
        d["estimate"] = interval_tuple(est);
        d["marked"] = interval_tuple(marked);
        d["within_marked"] = est.nominal >= marked.low && est.nominal <= marked.high;
        return d;
    }

    /// A slot's candidates: a value set object, a value-set text ("E96,1k..1M,1%", "@stock.txt")
    /// or a list of (value, tolerance).
    static std::vector<candidate_value> candidates_for(py::handle h, part_kind kind, const std::string& slot) {
        const bool r = kind == part_kind::resistor;
        if (r && py::isinstance<value_set<resistance>>(h)) return candidates(h.cast<const value_set<resistance>&>());
        if (!r && py::isinstance<value_set<capacitance>>(h)) return candidates(h.cast<const value_set<capacitance>&>());
        if (py::isinstance<value_set<resistance>>(h) || py::isinstance<value_set<capacitance>>(h))
            throw tauforge::invalid_argument("synthesize: slot " + slot + " takes " + (r ? "resistors" : "capacitors") +
                                             "; a set of " + (r ? "capacitors" : "resistors") + " was given");
        if (py::isinstance<py::str>(h)) {
            const auto s = tfcli::parse_value_set(h.cast<std::string>(), std::string(r ? "resistors" : "capacitors") + " for " + slot);
            return r ? candidates(tfcli::build_resistors(s, 1e3, 1e6)) : candidates(tfcli::build_capacitors(s, 1e-9, 10e-6));
        }
        return r ? candidates(value_set<resistance>::from_list(part_list<resistance>(h.cast<py::iterable>())))
                 : candidates(value_set<capacitance>::from_list(part_list<capacitance>(h.cast<py::iterable>())));
    }

    template <class D>
    py::dict design_dict(const D& x, const N& network, const timing_spec<N>& spec,
                         const std::vector<tfcli::requirement_row>& rows) const {
        py::dict d;
        py::dict parts;
        for (std::size_t s = 0; s < N::design_slots.size(); ++s) {
            py::dict p;
            p["value"] = x.parts[s].value;
            p["tolerance"] = x.parts[s].tol;
            p["origin"] = std::string(x.parts[s].origin);
            parts[py::str(std::string(N::design_slots[s].name))] = p;
        }
        d["parts"] = parts;
        d["nominal"] = metric_dict(x.nominal);
        d["worst_min"] = metric_dict(x.worst_min);
        d["worst_max"] = metric_dict(x.worst_max);
        d["margin"] = x.margin;
        d["tight_metric"] = rows.at(x.tight_requirement).name;
        d["tight_at_high"] = x.tight_at_high;
        d["nominal_error"] = x.nominal_error;
        d["holds"] = x.holds();
        design<N> plain;
        plain.parts = x.parts;
        plain.network = network;
        plain.nominal = x.nominal;
        plain.worst_min = x.worst_min;
        plain.worst_max = x.worst_max;
        plain.margin = x.margin;
        plain.tight_requirement = x.tight_requirement;
        plain.tight_at_high = x.tight_at_high;
        plain.nominal_error = x.nominal_error;
        d["description"] = describe(plain, spec);
        auto copy = std::make_unique<network_impl>(network);
        copy->temperature = temperature;
        copy->temperature_ref = temperature_ref;
        copy->service_life = service_life;
        d["network"] = py::cast(std::move(copy));
        return d;
    }

    py::dict synthesize(py::handle spec_in, py::handle resistors, py::handle capacitors, py::handle slots, std::size_t top,
                        const std::string& method, py::object progress, double progress_interval) const override {
        if constexpr (!DesignableNetwork<N>) {
            throw tauforge::invalid_argument("synthesize: network = " + std::string(def().name) +
                                             " is invalid; it has no parts for synthesis to choose");
        } else {
            constexpr std::size_t S = N::design_slots.size();
            const auto rows = spec_rows(spec_in, N::metrics);
            timing_spec<N> spec;
            for (const auto& q : rows) tfcli::add_window(spec, q);
            py::dict slot_map = slots.is_none() ? py::dict() : slots.cast<py::dict>();
            for (auto [k, v] : slot_map) (void)tfcli::find_part(def(), py::cast<std::string>(k));
            std::array<std::vector<candidate_value>, S> cands;
            for (std::size_t s = 0; s < S; ++s) {
                const auto& slot = N::design_slots[s];
                const bool r = slot.kind == part_kind::resistor;
                py::object source = py::reinterpret_borrow<py::object>(r ? resistors : capacitors);
                for (auto [k, v] : slot_map)
                    if (tfcli::normalized_name(py::cast<std::string>(k)) == tfcli::normalized_name(slot.name))
                        source = py::reinterpret_borrow<py::object>(v);
                if (source.is_none())
                    source = py::str(std::string(r ? tfcli::default_resistor_series : tfcli::default_capacitor_series));
                cands[s] = candidates_for(source, slot.kind, std::string(slot.name));
            }
            search_method how = search_method::automatic;
            if (method == "exhaustive") how = search_method::exhaustive;
            else if (method == "fast") how = search_method::fast;
            else if (method != "automatic")
                throw tauforge::invalid_argument("synthesize: method = \"" + method +
                                                 "\" is invalid; expected automatic, exhaustive or fast");
            const synthesis_options opt{.top_k = top, .method = how};
            py::dict out;
            py::list designs;
            auto finish = [&](const auto& res, auto network_of) {
                out["feasible"] = res.feasible();
                out["why"] = res.why == infeasibility::tolerance_too_wide ? "tolerance too wide"
                             : res.why == infeasibility::out_of_reach     ? "out of reach"
                                                                          : "";
                out["reason"] = res.reason;
                out["evaluated"] = res.evaluated;
                for (const auto& x : res.designs) designs.append(design_dict(x, network_of(x), spec, rows));
                out["designs"] = designs;
            };
            const N base = net;  // another Python thread may change this network meanwhile
            tfcli::require_valid_settings(base, cands);
            if (progress.is_none()) {
                synthesis_result<N> res;
                {
                    py::gil_scoped_release release;
                    res = tauforge::synthesize(base, spec, cands, opt);
                }
                finish(res, [](const design<N>& x) { return x.network; });
            } else {
                using W = reporting_network<N>;
                progress_state state;
                state.callback = progress.cast<py::function>();
                state.interval_s = progress_interval;
                timing_spec<W> wspec;
                for (const auto& q : rows) tfcli::add_window(wspec, q);
                synthesis_result<W> res;
                try {
                    py::gil_scoped_release release;
                    res = tauforge::synthesize(W{base, &state}, wspec, cands, opt);
                } catch (const search_cancelled&) {
                    std::rethrow_exception(state.error);
                }
                state.callback(state.count);
                finish(res, [](const design<W>& x) { return x.network.inner; });
            }
            return out;
        }
    }
};

template <class N, tfcli::network_def<N> (*Make)()>
void bind_network(py::module_& m, py::dict& registry, const char* class_name) {
    using impl = network_impl<N, Make>;
    impl::python_name = class_name;
    const auto& def = impl::def();
    std::string doc = std::string(def.title) + ".\n\n" + std::string(def.summary) + "\n\nParts: ";
    for (std::size_t i = 0; i < def.parts.size(); ++i) doc += (i ? ", " : "") + std::string(def.parts[i].name);
    doc += "\nSettings:\n";
    for (const auto& s : def.settings) doc += "  " + std::string(s.name) + ": " + std::string(s.help) + "\n";
    doc += "  temperature: operating range in degC, e.g. \"-20..70\" (default 25)\n";
    doc += "  service_life: hours or years the parts age over, e.g. \"10y\" (default new parts)\n";
    auto cls = py::class_<impl, network_base>(m, class_name, doc.c_str())
                   .def(py::init([](py::kwargs kw) {
                            auto n = std::make_unique<impl>();
                            for (auto [k, v] : kw) n->set(py::cast<std::string>(k), v);
                            return n;
                        }),
                        "Parts and settings as keywords: R=\"100k,1%\", C=\"10n,10%,X7R\", supply=\"4.5V..5.5V\".")
                   .def_static(
                       "example",
                       []() {
                           auto n = std::make_unique<impl>();
                           for (std::string_view e : impl::def().example_settings) {
                               auto [k, v] = tfcli::split_assignment(e, "example");
                               n->set(k, py::str(v));
                           }
                           for (std::string_view e : impl::def().example_parts) {
                               auto [k, v] = tfcli::split_assignment(e, "example");
                               n->set(k, py::str(v));
                           }
                           return n;
                       },
                       "The catalogue's example: its parts and settings.")
                   .def("copy", [](const impl& n) { return std::make_unique<impl>(n); }, "An independent copy.");
    cls.attr("catalogue_name") = std::string(def.name);
    cls.attr("title") = std::string(def.title);
    py::list aliases;
    for (auto a : def.aliases) aliases.append(std::string(a));
    cls.attr("aliases") = aliases;
    py::list spec;
    for (auto s : def.example_spec) spec.append(std::string(s));
    cls.attr("example_spec") = spec;
    registry[py::str(std::string(def.name))] = cls;
}

}  // namespace

PYBIND11_MODULE(tauforge, m) {
    m.doc() =
        "tauforge: RC timing networks from requirement to purchasable parts, proven at worst case.\n\n"
        "Quantities are floats in SI base units (ohm, F, s, V, A, Hz) or value strings (\"4k7\", \"10 nF\").\n"
        "Results are design estimates: verify every timing on real hardware.";
    m.attr("__version__") = TAUFORGE_CLI_VERSION;

    // Errors: one Python class per library error kind, all ValueError, carrying the library's message.
    static py::exception<tauforge::invalid_argument> invalid(m, "InvalidArgument", PyExc_ValueError);
    static py::exception<tauforge::domain_error> domain(m, "DomainError", PyExc_ValueError);
    static py::exception<tauforge::parse_error> parse_exc(m, "ParseError", invalid.ptr());
    py::register_exception_translator([](std::exception_ptr p) {
        try {
            if (p) std::rethrow_exception(p);
        } catch (const tauforge::parse_error& e) {
            parse_exc(e.what());
        } catch (const tauforge::invalid_argument& e) {
            invalid(e.what());
        } catch (const tfcli::usage_error& e) {
            invalid(e.what());
        } catch (const tauforge::domain_error& e) {
            domain(e.what());
        } catch (const py::cast_error& e) {
            // A value of the wrong Python type (pybind11 reports it as RuntimeError).
            PyErr_SetString(PyExc_TypeError, e.what());
        }
    });
    m.attr("InvalidArgument").attr("__doc__") =
        "A value no computation accepts: NaN, a negative R or C, an empty value set, text in the wrong grammar.";
    m.attr("ParseError").attr("__doc__") = "Text that does not read as a value of the expected quantity.";
    m.attr("DomainError").attr("__doc__") =
        "Valid values that together ask for the impossible, e.g. a threshold the RC network never reaches.";

    // ---- notation ----
    py::class_<tolerance>(m, "Tolerance", "A relative tolerance band: a part marked x lies in [x (1 - minus), x (1 + plus)].")
        .def(py::init([](double minus, std::optional<double> plus) { return tolerance{minus, plus.value_or(minus)}; }),
             py::arg("minus"), py::arg("plus") = py::none(), "Tolerance(0.05) is ±5 %; Tolerance(0.2, 0.8) is -20/+80 %.")
        .def_readwrite("minus", &tolerance::minus, "fraction below nominal")
        .def_readwrite("plus", &tolerance::plus, "fraction above nominal")
        .def_property_readonly("widest", &tolerance::widest)
        .def_property_readonly("letter",
                               [](const tolerance& t) -> std::optional<std::string> {
                                   const auto c = tolerance_letter(t);
                                   return c ? std::optional<std::string>(std::string(1, *c)) : std::nullopt;
                               },
                               "The IEC 60062 letter of a standard band (J for ±5 %), else None.")
        .def(py::self == py::self)
        .def("__str__", [](const tolerance& t) { return format_tolerance(t); })
        .def("__repr__", [](const tolerance& t) { return "Tolerance(\"" + format_tolerance(t, {.digits = 6}) + "\")"; });

    m.def("parse_resistance", [](const std::string& t) { return parse<resistance>(t).value(); }, py::arg("text"),
          "Ohms from \"4k7\", \"4.7 kΩ\", \"470R\".");
    m.def("parse_capacitance", [](const std::string& t) { return parse<capacitance>(t).value(); }, py::arg("text"),
          "Farads from \"100n\", \"2n2\", \"10 µF\".");
    m.def("parse_duration", [](const std::string& t) { return parse<duration>(t).value(); }, py::arg("text"),
          "Seconds from \"250ms\", \"10 µs\".");
    m.def("parse_voltage", [](const std::string& t) { return parse<voltage>(t).value(); }, py::arg("text"),
          "Volts from \"3.3V\", \"-12 V\".");
    m.def("parse_current", [](const std::string& t) { return parse<current>(t).value(); }, py::arg("text"),
          "Amperes from \"1uA\", \"250 nA\".");
    m.def("parse_frequency", [](const std::string& t) { return parse<frequency>(t).value(); }, py::arg("text"),
          "Hertz from \"2.4kHz\".");
    m.def("parse_ratio", [](const std::string& t) { return parse_ratio(t); }, py::arg("text"),
          "A plain number or a percentage (\"50 %\" is 0.5).");
    m.def("parse_tolerance", [](const std::string& t) { return parse_tolerance(t); }, py::arg("text"),
          "A Tolerance from \"5%\", \"±1 %\", \"+80/-20%\" or an IEC 60062 letter (\"J\").");
    m.def(
        "format",
        [](double v, const std::string& unit, int digits, bool ascii, bool trailing_zeros) {
            return tauforge::format_si(v, unit, {.digits = digits, .chars = ascii ? charset::ascii : charset::unicode,
                                                 .trailing_zeros = trailing_zeros});
        },
        py::arg("value"), py::arg("unit") = "", py::arg("digits") = 3, py::arg("ascii") = false,
        py::arg("trailing_zeros") = false,
        "A value in engineering notation: format(4700, \"Ω\") is \"4.7 kΩ\"; ascii=True writes ohm and u.");
    m.def("format_rkm_resistance", [](py::handle r, int digits) { return format_rkm(quantity_arg<resistance>(r), digits); },
          py::arg("value"), py::arg("digits") = 3, "RKM code of a resistance (IEC 60062): 4700 -> \"4K7\".");
    m.def(
        "format_rkm_capacitance",
        [](py::handle c, int digits, bool upper) {
            return format_rkm(quantity_arg<capacitance>(c), digits, upper ? rkm_case::upper : rkm_case::lower);
        },
        py::arg("value"), py::arg("digits") = 3, py::arg("upper") = false,
        "RKM code of a capacitance: 2.2e-9 -> \"2n2\".");
    m.def(
        "format_tolerance",
        [](py::handle t, int digits, bool ascii) {
            return format_tolerance(tolerance_arg(t), {.digits = digits, .chars = ascii ? charset::ascii : charset::unicode});
        },
        py::arg("tolerance"), py::arg("digits") = 3, py::arg("ascii") = false, "\"±5 %\", \"+80/-20 %\".");
    m.def("format_percent", &format_percent, py::arg("fraction"), py::arg("digits") = 3, "0.05 -> \"5 %\".");

    // ---- series ----
    py::enum_<e_series>(m, "ESeries", "The IEC 60063 preferred-number series.")
        .value("E3", e_series::e3)
        .value("E6", e_series::e6)
        .value("E12", e_series::e12)
        .value("E24", e_series::e24)
        .value("E48", e_series::e48)
        .value("E96", e_series::e96)
        .value("E192", e_series::e192);
    m.def(
        "series_mantissas",
        [](py::handle s) {
            const auto v = series_mantissas(series_arg(s));
            return std::vector<int>(v.begin(), v.end());
        },
        py::arg("series"), "One decade's integer mantissas, ascending: 10..91 for E24, 100..988 for E192.");
    m.def("series_size", [](py::handle s) { return series_size(series_arg(s)); }, py::arg("series"));
    m.def("customary_tolerance", [](py::handle s) { return customary_tolerance(series_arg(s)); }, py::arg("series"),
          "The tolerance parts of a series are customarily sold at (common practice).");
    m.def("preferred_number", [](py::handle s, std::size_t i, int decade) { return preferred_number(series_arg(s), i, decade); },
          py::arg("series"), py::arg("index"), py::arg("decade"),
          "The index-th value of the decade 10^decade: preferred_number(\"E24\", 16, 3) == 4700.");
    m.def(
        "in_series", [](py::handle s, double x, double rel) { return in_series(series_arg(s), resistance::from_value(x), rel); },
        py::arg("series"), py::arg("x"), py::arg("rel_tol") = default_match_tolerance,
        "Whether some value of the series (any decade) lies within rel_tol of x.");
    m.def(
        "coarsest_series",
        [](double x, double rel) -> py::object { return optional_series(coarsest_series(resistance::from_value(x), rel)); },
        py::arg("x"), py::arg("rel_tol") = default_match_tolerance,
        "The coarsest series that has x (4700 -> \"E3\"), or None.");
    bind_value_set<resistance>(m, "ResistorValues", "resistor");
    bind_value_set<capacitance>(m, "CapacitorValues", "capacitor");

    // ---- rc.hpp ----
    m.def(
        "crossing_time",
        [](py::handle vs, py::handle vf, py::handle vth, py::handle tau) {
            return tauforge::crossing_time(quantity_arg<voltage>(vs), quantity_arg<voltage>(vf), quantity_arg<voltage>(vth),
                                           quantity_arg<duration>(tau))
                .value();
        },
        py::arg("v_start"), py::arg("v_final"), py::arg("v_threshold"), py::arg("tau"),
        "Seconds for the capacitor to go from v_start to v_threshold while approaching v_final: tau ln((vs - vf)/(vth - vf)).");
    m.def(
        "voltage_at",
        [](py::handle vs, py::handle vf, py::handle tau, py::handle t) {
            return tauforge::voltage_at(quantity_arg<voltage>(vs), quantity_arg<voltage>(vf), quantity_arg<duration>(tau),
                                        quantity_arg<duration>(t))
                .value();
        },
        py::arg("v_start"), py::arg("v_final"), py::arg("tau"), py::arg("t"),
        "Capacitor voltage t after a step: v_final + (v_start - v_final) e^(-t/tau).");
    m.def(
        "time_constant_for",
        [](py::handle vs, py::handle vf, py::handle vth, py::handle t) {
            return tauforge::time_constant_for(quantity_arg<voltage>(vs), quantity_arg<voltage>(vf),
                                               quantity_arg<voltage>(vth), quantity_arg<duration>(t))
                .value();
        },
        py::arg("v_start"), py::arg("v_final"), py::arg("v_threshold"), py::arg("t"),
        "The time constant for which the crossing from v_start to v_threshold takes t.");
    m.def(
        "settling_time",
        [](py::handle fraction, py::handle tau) {
            return tauforge::settling_time(ratio_arg(fraction), quantity_arg<duration>(tau)).value();
        },
        py::arg("fraction"), py::arg("tau"), "Time to settle within fraction of the step: tau ln(1/fraction).");
    m.def("half_lsb_time_constants", &half_lsb_time_constants, py::arg("bits"),
          "Time constants to settle within half an LSB of an N-bit converter: (N + 1) ln 2.");
    m.def(
        "with_shunt",
        [](py::handle v_source, py::handle r_source, py::handle c, py::handle r_shunt, py::handle v_shunt) {
            const auto d = tauforge::with_shunt(quantity_arg<voltage>(v_source), quantity_arg<resistance>(r_source),
                                                quantity_arg<capacitance>(c), quantity_arg<resistance>(r_shunt),
                                                quantity_arg<voltage>(v_shunt));
            return py::make_tuple(d.v_final.value(), d.tau.value());
        },
        py::arg("v_source"), py::arg("r_source"), py::arg("c"), py::arg("r_shunt"), py::arg("v_shunt") = 0.0,
        "Thevenin reduction with a shunt resistor from the capacitor: (v_final, tau).");
    m.def(
        "with_leakage_current",
        [](py::handle v_source, py::handle r_source, py::handle c, py::handle i_leak) {
            const auto d = tauforge::with_leakage_current(quantity_arg<voltage>(v_source), quantity_arg<resistance>(r_source),
                                                          quantity_arg<capacitance>(c), quantity_arg<current>(i_leak));
            return py::make_tuple(d.v_final.value(), d.tau.value());
        },
        py::arg("v_source"), py::arg("r_source"), py::arg("c"), py::arg("i_leak"),
        "Thevenin reduction with a leakage current drawn from the node: (v_final, tau).");
    m.def(
        "ramp_crossing_time",
        [](py::handle vb, py::handle ve, py::handle rise, py::handle v0, py::handle vth, py::handle tau) {
            const ramp_input in{quantity_arg<voltage>(vb), quantity_arg<voltage>(ve), quantity_arg<duration>(rise)};
            return tauforge::crossing_time(in, quantity_arg<voltage>(v0), quantity_arg<voltage>(vth), quantity_arg<duration>(tau))
                .value();
        },
        py::arg("v_begin"), py::arg("v_end"), py::arg("rise_time"), py::arg("v_cap_start"), py::arg("v_threshold"),
        py::arg("tau"), "First crossing of v_threshold when the source ramps from v_begin to v_end over rise_time.");
    m.def(
        "ramp_voltage_at",
        [](py::handle vb, py::handle ve, py::handle rise, py::handle v0, py::handle tau, py::handle t) {
            const ramp_input in{quantity_arg<voltage>(vb), quantity_arg<voltage>(ve), quantity_arg<duration>(rise)};
            return tauforge::voltage_at(in, quantity_arg<voltage>(v0), quantity_arg<duration>(tau), quantity_arg<duration>(t))
                .value();
        },
        py::arg("v_begin"), py::arg("v_end"), py::arg("rise_time"), py::arg("v_cap_start"), py::arg("tau"), py::arg("t"),
        "Capacitor voltage at t for a ramping source.");

    // ---- networks ----
    py::class_<network_base>(m, "Network", "A timing network of the catalogue: parts, settings, parameters and metrics.")
        .def_property_readonly("name", &network_base::catalogue_name, "The catalogue name (\"timer_monostable\").")
        .def_property_readonly(
            "parameters",
            [](const network_base& n) {
                py::list out;
                for (const auto& q : n.parameters()) out.append(py::make_tuple(std::string(q.name), std::string(q.unit)));
                return out;
            },
            "The uncertain parameters as (name, SI unit).")
        .def_property_readonly(
            "metrics",
            [](const network_base& n) {
                py::list out;
                for (const auto& q : n.metrics()) out.append(py::make_tuple(std::string(q.name), std::string(q.unit)));
                return out;
            },
            "The metrics as (name, SI unit).")
        .def_property_readonly("part_names", &network_base::part_names)
        .def_property_readonly(
            "setting_help",
            [](const network_base& n) {
                py::dict d;
                for (const auto& [k, v] : n.setting_help()) d[py::str(k)] = v;
                return d;
            },
            "Each setting with how to write it.")
        .def("set", &network_base::set, py::arg("name"), py::arg("value"),
             "Sets a part (\"R\", \"100k,1%\"), a setting (\"supply\", \"4.5V..5.5V\") or the temperature range.")
        .def_property_readonly("settings", &network_base::settings, "Every setting as text.")
        .def_property_readonly("parts", &network_base::parts, "The fitted parts with their range at temperature.")
        .def("__repr__", &network_base::repr)
        .def("ranges", &network_base::ranges, "Each parameter's (nominal, low, high) in SI units.")
        .def("evaluate", &network_base::evaluate, py::arg("x") = py::none(),
             "Every metric at the nominal point, or at x (dict parameter -> value, or one value per parameter).");

    py::dict registry;
    bind_network<rc_delay, &tfcli::rc_delay_def>(m, registry, "RcDelay");
    bind_network<timer_monostable, &tfcli::timer_monostable_def>(m, registry, "TimerMonostable");
    bind_network<timer_astable, &tfcli::timer_astable_def>(m, registry, "TimerAstable");
    bind_network<schmitt_oscillator, &tfcli::schmitt_oscillator_def>(m, registry, "SchmittOscillator");
    bind_network<edge_detector, &tfcli::edge_detector_def>(m, registry, "EdgeDetector");
    bind_network<debounce, &tfcli::debounce_def>(m, registry, "Debounce");
    bind_network<pulse_filter, &tfcli::pulse_filter_def>(m, registry, "PulseFilter");
    bind_network<two_stage_pulse_filter, &tfcli::two_stage_pulse_filter_def>(m, registry, "TwoStagePulseFilter");
    bind_network<adc_settling, &tfcli::adc_settling_def>(m, registry, "AdcSettling");
    m.attr("NETWORKS") = registry;
    m.def(
        "network",
        [registry](const std::string& name, py::kwargs kw) {
            const auto& e = tfcli::find_network(name);
            return registry[py::str(e.name)](**kw);
        },
        py::arg("name"), "A network by catalogue name or alias (\"one-shot\"), parts and settings as keywords.");

    // ---- analysis ----
    auto mc_from = [](std::size_t samples, std::uint64_t seed, unsigned threads, const std::string& distribution,
                      double sigmas, std::optional<std::vector<double>> percentiles, double confidence) {
        mc_args a;
        a.samples = samples;
        a.seed = seed;
        a.threads = threads;
        a.distribution = distribution;
        a.sigmas = sigmas;
        if (percentiles) a.percentiles = *percentiles;
        a.confidence = confidence;
        return a;
    };
    m.def("worst_case", [](const network_base& n) { return n.worst_case(); }, py::arg("network"),
          "Each metric's nominal, min and max over the parameter intervals, with the corner of each extreme\n"
          "(parameter -> (value, \"low\" | \"high\" | \"nominal\" | \"interior\")).");
    m.def("sensitivity", [](const network_base& n) { return n.sensitivity(); }, py::arg("network"),
          "Normalized sensitivities d ln(metric) / d ln(parameter) at the nominal point.");
    m.def("rss", [](const network_base& n, double sigmas, double band) { return n.rss(sigmas, band); }, py::arg("network"),
          py::arg("sigmas") = 3.0, py::arg("band_sigmas") = 3.0,
          "Root-sum-square spread of every metric (an interval's half-width is `sigmas` standard deviations).");
    m.def(
        "monte_carlo",
        [mc_from](const network_base& n, py::handle spec, std::size_t samples, std::uint64_t seed, unsigned threads,
                  const std::string& distribution, double sigmas, std::optional<std::vector<double>> percentiles,
                  double confidence) {
            return n.monte_carlo(mc_from(samples, seed, threads, distribution, sigmas, percentiles, confidence), spec);
        },
        py::arg("network"), py::arg("spec") = py::none(), py::arg("samples") = 100'000, py::arg("seed") = 1,
        py::arg("threads") = 1, py::arg("distribution") = "normal", py::arg("sigmas") = 3.0,
        py::arg("percentiles") = py::none(), py::arg("confidence") = 0.95,
        "Monte Carlo yield, reproducible from the seed (the same numbers as the C++ API), with Wilson and\n"
        "Clopper-Pearson intervals. Runs without the GIL.");
    m.def(
        "test_limits",
        [mc_from](const network_base& n, py::handle spec, py::handle metric, py::handle uncertainty, double coverage,
                  std::size_t samples, std::uint64_t seed, unsigned threads, const std::string& distribution, double sigmas) {
            return n.test_limits(spec, metric, uncertainty, coverage,
                                 mc_from(samples, seed, threads, distribution, sigmas, std::nullopt, 0.95));
        },
        py::arg("network"), py::arg("spec") = py::none(), py::arg("metric") = py::none(),
        py::arg("uncertainty") = py::none(), py::arg("coverage") = 2.0, py::arg("samples") = 100'000, py::arg("seed") = 1,
        py::arg("threads") = 1, py::arg("distribution") = "normal", py::arg("sigmas") = 3.0,
        "Guard-banded production test limits for each window (acceptance = window shrunk by k u), with the\n"
        "expected false-reject and false-accept rates over the Monte Carlo population.");
    m.def(
        "read_back",
        [](const network_base& n, const std::string& part, py::handle measured, py::handle uncertainty, double coverage) {
            return n.read_back(part, measured, uncertainty, coverage);
        },
        py::arg("network"), py::arg("part"), py::arg("measured"), py::arg("uncertainty") = py::none(),
        py::arg("coverage") = 2.0,
        "A part's value read back from a measured metric (\"pulse width=1.05ms\"), bounded over the other parts.");
    m.def(
        "synthesize",
        [](const network_base& n, py::handle spec, py::handle resistors, py::handle capacitors, py::handle slots,
           std::size_t top, const std::string& method, py::object progress, double interval) {
            return n.synthesize(spec, resistors, capacitors, slots, top, method, std::move(progress), interval);
        },
        py::arg("network"), py::arg("spec"), py::arg("resistors") = py::none(), py::arg("capacitors") = py::none(),
        py::arg("slots") = py::none(), py::arg("top") = 10, py::arg("method") = "automatic",
        py::arg("progress") = py::none(), py::arg("progress_interval") = 0.1,
        "Ranked designs from value sets that hold the spec at worst case, best first; when none does, 'reason'\n"
        "names the ruling constraint. Runs without the GIL; progress(evaluations) is called about every\n"
        "progress_interval seconds, and an exception raised in it cancels the search and propagates.");
}
