#include "requests.hpp"

#include <tauforge/capacitor_kinds.hpp>
#include <tauforge/error.hpp>
#include <tauforge/notation.hpp>
#include <tauforge/parts.hpp>
#include <tauforge/series.hpp>

#include <nlohmann/json.hpp>

#include <algorithm>
#include <array>
#include <cctype>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <iostream>
#include <iterator>
#include <sstream>

namespace tfcli {

using tauforge::charset;
using json = nlohmann::json;

// ---- formatting shared by every writer ------------------------------------------

std::string format_si(double v, std::string_view unit, charset cs, int digits) {
    using namespace tauforge;
    const format_options o{.digits = digits, .chars = cs};
    if (unit == "\u03A9") return format(resistance::from_value(v), o);
    if (unit == "F") return format(capacitance::from_value(v), o);
    if (unit == "s") return format(duration::from_value(v), o);
    if (unit == "V") return format(voltage::from_value(v), o);
    if (unit == "A") return format(current::from_value(v), o);
    if (unit == "Hz") return format(frequency::from_value(v), o);
    if (unit == "S") return format(conductance::from_value(v), o);
    if (std::isnan(v)) return "nan";
    char buf[48];
    if (unit == "V/V") {
        std::snprintf(buf, sizeof buf, "%.*g", digits, v);
        return buf;
    }
    std::snprintf(buf, sizeof buf, "%.*g %%", digits, v * 100.0);
    return buf;
}

std::string format_band(const tolerance& t, charset cs) {
    return tauforge::format_tolerance(t, {.digits = 3, .chars = cs});
}

std::string format_window(const spec_window& w, std::string_view unit, charset cs) {
    if (w.low && w.high) return "[" + format_si(*w.low, unit, cs, 4) + ", " + format_si(*w.high, unit, cs, 4) + "]";
    if (w.low) return "at least " + format_si(*w.low, unit, cs, 4);
    if (w.high) return "at most " + format_si(*w.high, unit, cs, 4);
    return "any value";
}

std::string normalized_name(std::string_view s) {
    std::string out;
    for (char c : trim(s)) {
        if (c == '-' || c == '_') c = ' ';
        out += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    }
    return out;
}

std::string shell_quote(std::string_view w) {
    const bool plain = !w.empty() && std::all_of(w.begin(), w.end(), [](char c) {
        return std::isalnum(static_cast<unsigned char>(c)) || std::string_view("-_=.,/:+%@").find(c) != std::string_view::npos;
    });
    if (plain) return std::string(w);
    std::string out = "'";
    for (const char c : w) out += c == '\'' ? std::string("'\\''") : std::string(1, c);
    return out + "'";
}

std::string_view trim(std::string_view s) {
    while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
    while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r' || s.back() == '\n')) s.remove_suffix(1);
    return s;
}

namespace {

std::string hyphenated(std::string_view name) {
    std::string s(name);
    std::replace(s.begin(), s.end(), ' ', '-');
    return s;
}

[[noreturn]] void fail(std::string_view what, const std::string& message) {
    throw usage_error(std::string(what) + ": " + message);
}

/// Runs f, turning the library's parse errors into a usage_error that names `what`.
template <class F>
auto named(std::string_view what, F&& f) -> decltype(f()) {
    try {
        return f();
    } catch (const tauforge::invalid_argument& e) {
        fail(what, e.what());
    }
}

std::string lower(std::string_view s) {
    std::string out(s);
    for (char& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    return out;
}

std::string upper(std::string_view s) {
    std::string out(s);
    for (char& c : out) c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
    return out;
}

std::vector<std::string_view> split(std::string_view s, char sep) {
    std::vector<std::string_view> out;
    for (;;) {
        const auto p = s.find(sep);
        out.push_back(trim(s.substr(0, p)));
        if (p == s.npos) return out;
        s.remove_prefix(p + 1);
    }
}

bool is_tolerance_letter(std::string_view s) {
    return s.size() == 1 && std::string_view("BCDFGJKMZbcdfgjkmz").find(s[0]) != std::string_view::npos;
}

/// The position and length of a "+-" or "±" that separates a nominal from a delta.
std::pair<std::size_t, std::size_t> plus_minus_at(std::string_view s) {
    for (std::size_t i = 1; i < s.size(); ++i) {
        if (s.compare(i, 2, "+-") == 0) return {i, 2};
        if (s.compare(i, 2, "\u00B1") == 0) return {i, 2};
    }
    return {std::string_view::npos, 0};
}

}  // namespace

// ---- grammars -------------------------------------------------------------------

tolerance parse_band(std::string_view text, std::string_view what) {
    return named(what, [&] { return tauforge::parse_tolerance(trim(text)); });
}

double parse_ratio_text(std::string_view text, std::string_view what) {
    const std::string_view t = trim(text);
    const auto slash = t.find('/');
    if (slash != t.npos && t.find('%') == t.npos) {
        const double a = named(what, [&] { return tauforge::parse_ratio(t.substr(0, slash)); });
        const double b = named(what, [&] { return tauforge::parse_ratio(t.substr(slash + 1)); });
        if (!(b != 0.0)) fail(what, "\"" + std::string(t) + "\" divides by zero; expected a ratio such as 2/3");
        return a / b;
    }
    return named(what, [&] { return tauforge::parse_ratio(t); });
}

double parse_by_unit(std::string_view text, std::string_view unit, std::string_view what) {
    using namespace tauforge;
    const std::string_view t = trim(text);
    if (unit == "s") return named(what, [&] { return parse<duration>(t).value(); });
    if (unit == "Hz") return named(what, [&] { return parse<frequency>(t).value(); });
    if (unit == "V") return named(what, [&] { return parse<voltage>(t).value(); });
    if (unit == "A") return named(what, [&] { return parse<current>(t).value(); });
    if (unit == "\u03A9") return named(what, [&] { return parse<resistance>(t).value(); });
    if (unit == "F") return named(what, [&] { return parse<capacitance>(t).value(); });
    if (unit == "V/V" || unit.empty()) return parse_ratio_text(t, what);
    fail(what, "values in " + std::string(unit) + " cannot be given on the command line");
}

interval parse_ranged_by_unit(std::string_view text, std::string_view unit, std::string_view what) {
    const std::string_view t = trim(text);
    if (t.empty()) fail(what, "the value is empty; expected X, A..B, X,TOL or X+-D");
    const auto dots = t.find("..");
    if (dots != t.npos) {
        const double a = parse_by_unit(t.substr(0, dots), unit, what);
        const double b = parse_by_unit(t.substr(dots + 2), unit, what);
        if (!(a <= b))
            fail(what, "\"" + std::string(t) + "\" has its low end above its high end; expected A..B with A <= B");
        return {a + (b - a) / 2.0, a, b};
    }
    const auto comma = t.find(',');
    if (comma != t.npos) {
        const double x = parse_by_unit(t.substr(0, comma), unit, what);
        const tolerance tol = parse_band(t.substr(comma + 1), what);
        const double a = x * (1.0 - tol.minus), b = x * (1.0 + tol.plus);
        return x < 0.0 ? interval{x, b, a} : interval{x, a, b};
    }
    const auto [pm, len] = plus_minus_at(t);
    if (pm != t.npos) {
        const double x = parse_by_unit(t.substr(0, pm), unit, what);
        const double d = parse_by_unit(t.substr(pm + len), unit, what);
        if (!(d >= 0.0)) fail(what, "\"" + std::string(t) + "\" has a negative spread; expected X+-D with D >= 0");
        return {x, x - d, x + d};
    }
    const double x = parse_by_unit(t, unit, what);
    return interval::exactly(x);
}

namespace {

double parse_celsius(std::string_view text, std::string_view what) {
    std::string_view t = trim(text);
    for (std::string_view suffix : {"\u00B0C", "degC", "C"})
        if (t.size() > suffix.size() && t.substr(t.size() - suffix.size()) == suffix) {
            t = trim(t.substr(0, t.size() - suffix.size()));
            break;
        }
    std::string_view digits = t;
    if (!digits.empty() && digits.front() == '+') digits.remove_prefix(1);
    double v = 0.0;
    const auto [ptr, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), v);
    if (digits.empty() || ec != std::errc{} || ptr != digits.data() + digits.size() || !std::isfinite(v))
        fail(what, "\"" + std::string(text) + "\" is not a temperature; expected degrees Celsius such as -20, 70 or 25 C");
    return v;
}

}  // namespace

tauforge::operating_conditions parse_temperature(std::string_view range, std::string_view ref,
                                                 std::string_view service_life) {
    tauforge::operating_conditions c{};
    const std::string_view r = trim(range);
    if (!r.empty()) {
        const auto dots = r.find("..");
        const double lo = parse_celsius(dots == r.npos ? r : r.substr(0, dots), "temperature");
        const double hi = dots == r.npos ? lo : parse_celsius(r.substr(dots + 2), "temperature");
        if (!(lo <= hi))
            fail("temperature", "\"" + std::string(r) + "\" has its low end above its high end; expected A..B with A <= B");
        c.t_min = tauforge::celsius{lo};
        c.t_max = tauforge::celsius{hi};
    }
    if (!trim(ref).empty()) c.t_ref = tauforge::celsius{parse_celsius(ref, "temperature reference")};
    if (const std::string_view life = trim(service_life); !life.empty()) {
        // Hours, or years of 8766 h (365.25 days, common practice).
        const std::string lw = lower(life);
        const double per = lw.back() == 'y' ? 8766.0 : 1.0;
        std::string_view number = lw.back() == 'y' || lw.back() == 'h' ? life.substr(0, life.size() - 1) : life;
        number = trim(number);
        double v = 0.0;
        const auto [ptr, ec] = std::from_chars(number.data(), number.data() + number.size(), v);
        if (number.empty() || ec != std::errc{} || ptr != number.data() + number.size() || !std::isfinite(v) || v < 0.0)
            fail("service life", "\"" + std::string(life) + "\" is not a service life; expected hours or years such as 5000h or 10y");
        c.service_hours = v * per;
    }
    return c;
}

part_text parse_part(std::string_view text, tauforge::part_kind kind, std::string_view what) {
    using namespace tauforge;
    part_text p;
    static constexpr std::array<const dielectric_class*, 8> classes{&x5r, &x6s, &x7r, &x7s, &x7t, &x8r, &y5v, &z5u};
    for (std::string_view field : split(text, ',')) {
        if (field.empty()) continue;
        const std::string up = upper(field);
        auto once = [&](bool already, std::string_view name) {
            if (already)
                fail(what, "\"" + std::string(text) + "\" gives the " + std::string(name) + " twice; expected one each of value, tolerance and temperature behaviour");
        };
        if (up == "C0G" || up == "NP0" || up == "NPO") {
            once(p.tcr || p.dielectric || p.technology, "temperature behaviour");
            if (kind == part_kind::resistor) fail(what, "\"" + std::string(field) + "\" is a capacitor dielectric; expected a TCR such as 100ppm for a resistor");
            p.tcr = c0g;
            continue;
        }
        const auto cls = std::find_if(classes.begin(), classes.end(), [&](const dielectric_class* d) { return d->name == up; });
        if (cls != classes.end()) {
            once(p.tcr || p.dielectric || p.technology, "temperature behaviour");
            if (kind == part_kind::resistor) fail(what, "\"" + std::string(field) + "\" is a capacitor dielectric; expected a TCR such as 100ppm for a resistor");
            p.dielectric = **cls;
            continue;
        }
        const std::string lw = lower(field);
        static constexpr std::array<std::pair<std::string_view, const capacitor_kind*>, 4> technologies{
            {{"pet", &pet_film}, {"pp", &pp_film}, {"al", &al_electrolytic}, {"ta", &tantalum_mno2}}};
        const auto tech = std::find_if(technologies.begin(), technologies.end(), [&](const auto& t) { return t.first == lw; });
        if (tech != technologies.end()) {
            once(p.tcr || p.dielectric || p.technology, "temperature behaviour");
            if (kind == part_kind::resistor) fail(what, "\"" + std::string(field) + "\" is a capacitor technology; expected a TCR such as 100ppm for a resistor");
            p.technology = tech->second;
            continue;
        }
        const auto ppm = lw.find("ppm");
        if (ppm != std::string::npos && (lw.substr(ppm) == "ppm" || lw.substr(ppm) == "ppm/k")) {
            once(p.tcr || p.dielectric || p.technology, "temperature behaviour");
            std::string_view number = trim(field.substr(0, ppm));
            if (number.starts_with("+-")) number.remove_prefix(2);
            else if (number.starts_with("\u00B1")) number.remove_prefix(2);
            const double v = named(what, [&] { return tauforge::parse_ratio(number); });
            if (!(v >= 0.0)) fail(what, "\"" + std::string(field) + "\" is not a TCR band; expected a magnitude such as 100ppm (±100 ppm/K)");
            p.tcr = ppm_band::symmetric(v);
            continue;
        }
        static constexpr std::array<std::pair<std::string_view, ceramic_case>, 5> cases{
            {{"0402", ceramic_case::c0402}, {"0603", ceramic_case::c0603}, {"0805", ceramic_case::c0805},
             {"1206", ceramic_case::c1206}, {"1210", ceramic_case::c1210}}};
        const auto size = std::find_if(cases.begin(), cases.end(), [&](const auto& c) { return c.first == field; });
        if (size != cases.end()) {
            once(p.size.has_value(), "case size");
            if (kind == part_kind::resistor) fail(what, "\"" + std::string(field) + "\" is a capacitor case size; expected no case size for a resistor");
            p.size = size->second;
            continue;
        }
        if (!lw.empty() && lw.back() == 'v') {
            once(p.rated_voltage.has_value(), "rated voltage");
            if (kind == part_kind::resistor) fail(what, "\"" + std::string(field) + "\" is a voltage rating; expected none for a resistor");
            p.rated_voltage = named(what, [&] { return parse<voltage>(field).value(); });
            if (!(*p.rated_voltage > 0.0)) fail(what, "rated voltage = " + std::string(field) + " is invalid; expected a positive voltage");
            continue;
        }
        if (field.find('%') != field.npos || is_tolerance_letter(field)) {
            once(p.tol.has_value(), "tolerance");
            p.tol = parse_band(field, what);
            continue;
        }
        once(p.value.has_value(), "value");
        p.value = kind == part_kind::resistor ? named(what, [&] { return parse<resistance>(field).value(); })
                                              : named(what, [&] { return parse<capacitance>(field).value(); });
        if (!(*p.value > 0.0)) fail(what, "value = " + std::string(field) + " is invalid; expected a positive value");
    }
    if (p.size && !(p.dielectric && p.rated_voltage))
        fail(what, "\"" + std::string(text) + "\" gives a case size without " +
                       (p.dielectric ? "a rated voltage" : "a class 2 dielectric") +
                       "; expected a class 2 part such as C=X7R,16V,0603 (the case size and rating select a generic DC-bias estimate)");
    return p;
}

std::size_t find_name(std::string_view name, std::span<const tauforge::quantity_info> table, std::string_view what) {
    const std::string n = normalized_name(name);
    for (std::size_t i = 0; i < table.size(); ++i)
        if (normalized_name(table[i].name) == n) return i;
    std::string valid;
    for (const auto& q : table) valid += (valid.empty() ? "" : ", ") + hyphenated(q.name);
    throw usage_error(std::string(what) + " \"" + std::string(trim(name)) + "\" is unknown; expected one of " + valid);
}

requirement_row parse_requirement(std::string_view text, std::span<const tauforge::quantity_info> metrics) {
    const std::string what = "spec \"" + std::string(trim(text)) + "\"";
    const std::string_view t = trim(text);
    const auto eq = t.find('=');
    if (eq == t.npos || eq == 0)
        fail(what, "expected METRIC=A..B, METRIC=X,TOL, METRIC=X+-D, METRIC>=A or METRIC<=B");
    const char op = eq > 0 && (t[eq - 1] == '>' || t[eq - 1] == '<') ? t[eq - 1] : '=';
    const std::string_view name = trim(t.substr(0, op == '=' ? eq : eq - 1));
    const std::string_view rest = trim(t.substr(eq + 1));
    requirement_row r;
    r.metric = find_name(name, metrics, "metric");
    r.name = std::string(metrics[r.metric].name);
    r.unit = std::string(metrics[r.metric].unit);
    r.text = hyphenated(r.name) + (op == '=' ? "=" : op == '>' ? ">=" : "<=") + std::string(rest);
    if (op == '>') {
        r.window.low = parse_by_unit(rest, r.unit, what);
    } else if (op == '<') {
        r.window.high = parse_by_unit(rest, r.unit, what);
    } else {
        if (rest.find("..") == rest.npos && rest.find(',') == rest.npos && plus_minus_at(rest).first == rest.npos)
            fail(what, "a single value is not a window; expected A..B, X,TOL or X+-D after '='");
        const interval i = parse_ranged_by_unit(rest, r.unit, what);
        r.window.low = i.low;
        r.window.high = i.high;
    }
    if (r.window.low && !std::isfinite(*r.window.low)) fail(what, "expected finite limits");
    if (r.window.high && !std::isfinite(*r.window.high)) fail(what, "expected finite limits");
    if (r.window.low && r.window.high && !(*r.window.low < *r.window.high))
        fail(what, "the window is empty; expected its low end below its high end");
    return r;
}

value_set_spec parse_value_set(std::string_view text, std::string_view what) {
    value_set_spec s;
    s.text = std::string(trim(text));
    const auto fields = split(s.text, ',');
    if (fields.empty() || fields[0].empty())
        fail(what, "the value set is empty; expected E24, E24,1k..1M, E96,1k..1M,1% or @FILE");
    std::size_t next = 1;
    if (fields[0].front() == '@') {
        s.stock = true;
        s.path = std::string(trim(fields[0].substr(1)));
        if (s.path.empty()) fail(what, "\"@\" names no file; expected @FILE");
    } else {
        const std::string name = upper(fields[0]);
        bool found = false;
        for (auto e : tauforge::all_e_series)
            if (tauforge::series_name(e) == name) s.series = e, found = true;
        if (!found)
            fail(what, "\"" + std::string(fields[0]) + "\" is not a value set; expected E3, E6, E12, E24, E48, E96, E192 or @FILE");
        if (next < fields.size() && fields[next].find("..") != std::string_view::npos) {
            const auto f = fields[next++];
            const auto dots = f.find("..");
            s.min = std::string(trim(f.substr(0, dots)));
            s.max = std::string(trim(f.substr(dots + 2)));
        }
    }
    if (next < fields.size()) s.tol = parse_band(fields[next++], what);
    if (next < fields.size())
        fail(what, "\"" + s.text + "\" has too many fields; expected SERIES[,MIN..MAX][,TOL] or @FILE[,TOL]");
    return s;
}

namespace {

template <class Q>
tauforge::value_set<Q> build_set(const value_set_spec& s, double dmin, double dmax) {
    const std::string what = "value set \"" + s.text + "\"";
    return named(what, [&] {
        if (s.stock) return tauforge::value_set<Q>::read_stock_file(s.path, s.tol);
        const Q lo = s.min.empty() ? Q::from_value(dmin) : tauforge::parse<Q>(s.min);
        const Q hi = s.max.empty() ? Q::from_value(dmax) : tauforge::parse<Q>(s.max);
        return s.tol ? tauforge::value_set<Q>::from_series(s.series, lo, hi, *s.tol)
                     : tauforge::value_set<Q>::from_series(s.series, lo, hi);
    });
}

}  // namespace

tauforge::value_set<tauforge::resistance> build_resistors(const value_set_spec& s, double dmin, double dmax) {
    return build_set<tauforge::resistance>(s, dmin, dmax);
}

tauforge::value_set<tauforge::capacitance> build_capacitors(const value_set_spec& s, double dmin, double dmax) {
    return build_set<tauforge::capacitance>(s, dmin, dmax);
}

std::string describe_value_set(const value_set_spec& s, double min, double max, std::string_view unit) {
    if (s.stock) return "stock list " + s.path + (s.tol ? " (default " + format_band(*s.tol) + ")" : "");
    const tolerance t = s.tol ? *s.tol : tauforge::customary_tolerance(s.series);
    return std::string(tauforge::series_name(s.series)) + " " + format_si(min, unit) + " .. " + format_si(max, unit) +
           " at " + format_band(t);
}

std::pair<std::string, std::string> split_assignment(std::string_view text, std::string_view what) {
    const auto eq = text.find('=');
    if (eq == text.npos || trim(text.substr(0, eq)).empty())
        fail(what, "\"" + std::string(text) + "\" is not NAME=VALUE");
    return {std::string(trim(text.substr(0, eq))), std::string(trim(text.substr(eq + 1)))};
}

bool parse_switch(std::string_view text, std::string_view what) {
    const std::string t = lower(trim(text));
    if (t == "on" || t == "true" || t == "yes" || t == "1") return true;
    if (t == "off" || t == "false" || t == "no" || t == "0") return false;
    fail(what, "\"" + std::string(text) + "\" is not a switch; expected on or off");
}

// ---- JSON requests ----------------------------------------------------------------

std::string read_request_text(const std::string& path) {
    if (path == "-") {
        std::ostringstream s;
        s << std::cin.rdbuf();
        if (std::cin.bad()) throw usage_error("request: cannot read stdin");
        return s.str();
    }
    std::ifstream in(path, std::ios::binary);
    if (!in) throw usage_error("request \"" + path + "\": cannot open the file");
    std::ostringstream s;
    s << in.rdbuf();
    if (in.bad()) throw usage_error("request \"" + path + "\": cannot read the file");
    return s.str();
}

namespace {

std::string number_text(double v) {
    char buf[40];
    std::snprintf(buf, sizeof buf, "%.17g", v);
    return buf;
}

struct json_reader {
    std::string where;

    [[noreturn]] void bad(const std::string& key, const json& v, std::string_view expected) const {
        std::string shown = v.dump();
        if (shown.size() > 60) shown = shown.substr(0, 57) + "...";
        throw usage_error("request " + where + ": " + key + " = " + shown + " is invalid; expected " + std::string(expected));
    }

    void check_keys(const json& obj, const std::string& key, std::initializer_list<std::string_view> valid) const {
        for (const auto& [k, v] : obj.items()) {
            if (std::find(valid.begin(), valid.end(), k) != valid.end()) continue;
            std::string list;
            for (auto s : valid) list += (list.empty() ? "" : ", ") + std::string(s);
            throw usage_error("request " + where + ": " + (key.empty() ? "" : key + ".") + k +
                              " is an unknown key; expected one of " + list);
        }
    }

    std::string text(const json& v, const std::string& key) const {
        if (v.is_string()) return v.get<std::string>();
        if (v.is_number()) return number_text(v.get<double>());
        bad(key, v, "a string such as \"4k7\" or a number in SI base units");
    }

    std::string string(const json& v, const std::string& key) const {
        if (!v.is_string()) bad(key, v, "a string");
        return v.get<std::string>();
    }

    std::uint64_t whole(const json& v, const std::string& key) const {
        if (v.is_number_unsigned()) return v.get<std::uint64_t>();
        if (v.is_number_integer() && v.get<std::int64_t>() >= 0) return static_cast<std::uint64_t>(v.get<std::int64_t>());
        bad(key, v, "a non-negative whole number");
    }

    double number(const json& v, const std::string& key) const {
        if (!v.is_number()) bad(key, v, "a number");
        return v.get<double>();
    }

    bool boolean(const json& v, const std::string& key) const {
        if (!v.is_boolean()) bad(key, v, "true or false");
        return v.get<bool>();
    }

    const json& object(const json& v, const std::string& key) const {
        if (!v.is_object()) bad(key, v, "an object");
        return v;
    }

    /// A ranged value: text, number, or {nominal, low, high} / {value, tolerance}.
    std::string ranged(const json& v, const std::string& key) const {
        if (v.is_boolean()) return v.get<bool>() ? "on" : "off";
        if (!v.is_object()) return text(v, key);
        check_keys(v, key, {"nominal", "low", "high", "value", "tolerance", "plus_minus"});
        if (v.contains("low") || v.contains("high")) {
            if (!v.contains("low") || !v.contains("high")) bad(key, v, "both low and high");
            return text(v["low"], key + ".low") + ".." + text(v["high"], key + ".high");
        }
        const auto nominal = v.contains("value") ? v["value"] : v.contains("nominal") ? v["nominal"] : json();
        if (nominal.is_null()) bad(key, v, "{\"low\": A, \"high\": B} or {\"value\": X, \"tolerance\": \"5%\"}");
        if (v.contains("tolerance")) return text(nominal, key + ".value") + "," + string(v["tolerance"], key + ".tolerance");
        if (v.contains("plus_minus")) return text(nominal, key + ".value") + "+-" + text(v["plus_minus"], key + ".plus_minus");
        return text(nominal, key + ".value");
    }

    std::string part(const json& v, const std::string& key) const {
        if (v.is_string()) return v.get<std::string>();
        if (!v.is_object()) bad(key, v, "a part text such as \"4k7,1%\" or {\"value\": ..., \"tolerance\": ...}");
        check_keys(v, key, {"value", "tolerance", "tempco"});
        std::string s;
        if (v.contains("value")) s += text(v["value"], key + ".value");
        if (v.contains("tolerance")) s += (s.empty() ? "" : ",") + string(v["tolerance"], key + ".tolerance");
        if (v.contains("tempco")) s += (s.empty() ? "" : ",") + string(v["tempco"], key + ".tempco");
        return s;
    }

    std::string value_set(const json& v, const std::string& key) const {
        if (v.is_string()) return v.get<std::string>();
        if (!v.is_object()) bad(key, v, "a value set such as \"E24,1k..1M\" or {\"series\": \"E24\", ...}");
        check_keys(v, key, {"series", "min", "max", "tolerance", "stock"});
        std::string s;
        if (v.contains("stock")) {
            if (v.contains("series") || v.contains("min") || v.contains("max")) bad(key, v, "either stock or series");
            s = "@" + string(v["stock"], key + ".stock");
        } else {
            if (!v.contains("series")) bad(key, v, "a series (\"E24\") or a stock file");
            s = string(v["series"], key + ".series");
            if (v.contains("min") || v.contains("max")) {
                if (!v.contains("min") || !v.contains("max")) bad(key, v, "both min and max");
                s += "," + text(v["min"], key + ".min") + ".." + text(v["max"], key + ".max");
            }
        }
        if (v.contains("tolerance")) s += "," + string(v["tolerance"], key + ".tolerance");
        return s;
    }

    std::string window(const std::string& metric, const json& v, const std::string& key) const {
        if (v.is_string()) return metric + "=" + v.get<std::string>();
        if (!v.is_object()) bad(key, v, "a window such as \"225ms..275ms\" or {\"low\": ..., \"high\": ...}");
        check_keys(v, key, {"low", "high", "value", "nominal", "tolerance", "plus_minus"});
        if ((v.contains("low") || v.contains("high")) && !(v.contains("low") && v.contains("high")))
            return metric + (v.contains("low") ? ">=" + text(v["low"], key + ".low") : "<=" + text(v["high"], key + ".high"));
        return metric + "=" + ranged(v, key);
    }
};

}  // namespace

request request_from_json(std::string_view text, std::string_view where) {
    json doc;
    try {
        doc = json::parse(text.begin(), text.end());
    } catch (const json::parse_error& e) {
        std::string msg = e.what();
        if (const auto p = msg.find("parse error"); p != std::string::npos) msg = msg.substr(p);
        throw usage_error("request " + std::string(where) + ": malformed JSON: " + msg);
    }
    json_reader rd{std::string(where)};
    if (!doc.is_object()) rd.bad("(top level)", doc, "an object with a \"command\"");
    rd.check_keys(doc, "", {"command", "network", "parts", "settings", "temperature", "spec", "resistors", "capacitors",
                            "slots", "top", "samples", "seed", "threads", "distribution", "sigmas", "metric",
                            "uncertainty", "coverage", "measured", "solve", "target", "from", "pairs", "kind",
                            "example", "outputs"});
    request r;
    if (!doc.contains("command")) throw usage_error("request " + std::string(where) + ": command is missing; expected one of pick, design, check, limits, readback, demo, networks");
    r.command = rd.string(doc["command"], "command");
    if (doc.contains("network")) r.network = rd.string(doc["network"], "network");
    if (doc.contains("parts"))
        for (const auto& [k, v] : rd.object(doc["parts"], "parts").items()) r.parts.emplace_back(k, rd.part(v, "parts." + k));
    if (doc.contains("settings"))
        for (const auto& [k, v] : rd.object(doc["settings"], "settings").items())
            r.settings.emplace_back(k, rd.ranged(v, "settings." + k));
    if (doc.contains("temperature")) {
        const json& t = doc["temperature"];
        if (t.is_object()) {
            rd.check_keys(t, "temperature", {"min", "max", "ref", "service life"});
            if (t.contains("service life")) r.service_life = rd.text(t["service life"], "temperature.service life");
            if (t.contains("min") != t.contains("max")) rd.bad("temperature", t, "both min and max");
            if (t.contains("min")) r.temperature = rd.text(t["min"], "temperature.min") + ".." + rd.text(t["max"], "temperature.max");
            if (t.contains("ref")) r.temperature_ref = rd.text(t["ref"], "temperature.ref");
        } else {
            r.temperature = rd.text(t, "temperature");
        }
    }
    if (doc.contains("spec")) {
        const json& s = doc["spec"];
        if (s.is_array()) {
            for (std::size_t i = 0; i < s.size(); ++i) r.spec.push_back(rd.string(s[i], "spec[" + std::to_string(i) + "]"));
        } else if (s.is_object()) {
            for (const auto& [k, v] : s.items()) r.spec.push_back(rd.window(k, v, "spec." + k));
        } else {
            rd.bad("spec", s, "an array of windows or an object of metric: window");
        }
    }
    if (doc.contains("resistors")) r.resistors = rd.value_set(doc["resistors"], "resistors");
    if (doc.contains("capacitors")) r.capacitors = rd.value_set(doc["capacitors"], "capacitors");
    if (doc.contains("slots"))
        for (const auto& [k, v] : rd.object(doc["slots"], "slots").items()) r.slots.emplace_back(k, rd.value_set(v, "slots." + k));
    if (doc.contains("top")) r.top = static_cast<std::size_t>(rd.whole(doc["top"], "top"));
    if (r.command == "demo") r.mc.samples = 20'000;
    if (doc.contains("samples")) r.mc.samples = static_cast<std::size_t>(rd.whole(doc["samples"], "samples"));
    if (doc.contains("seed")) r.mc.seed = rd.whole(doc["seed"], "seed");
    if (doc.contains("threads")) {
        const auto t = rd.whole(doc["threads"], "threads");
        if (t > 256) rd.bad("threads", doc["threads"], "0 (one per hardware thread) to 256");
        r.mc.threads = static_cast<unsigned>(t);
    }
    if (doc.contains("distribution")) r.mc.distribution = rd.string(doc["distribution"], "distribution");
    if (doc.contains("sigmas")) r.mc.sigmas = rd.number(doc["sigmas"], "sigmas");
    if (doc.contains("metric")) r.metric = rd.string(doc["metric"], "metric");
    if (doc.contains("uncertainty")) r.uncertainty = rd.text(doc["uncertainty"], "uncertainty");
    if (doc.contains("coverage")) r.coverage = rd.number(doc["coverage"], "coverage");
    if (doc.contains("measured")) {
        const json& m = doc["measured"];
        if (m.is_object()) {
            rd.check_keys(m, "measured", {"metric", "value"});
            if (!m.contains("metric") || !m.contains("value")) rd.bad("measured", m, "{\"metric\": ..., \"value\": ...}");
            r.measured = rd.string(m["metric"], "measured.metric") + "=" + rd.text(m["value"], "measured.value");
        } else {
            r.measured = rd.string(m, "measured");
        }
    }
    if (doc.contains("solve")) r.solve = rd.string(doc["solve"], "solve");
    if (doc.contains("target")) r.target = rd.text(doc["target"], "target");
    if (doc.contains("from")) r.from = rd.value_set(doc["from"], "from");
    if (doc.contains("pairs")) r.pairs = static_cast<std::size_t>(rd.whole(doc["pairs"], "pairs"));
    if (doc.contains("kind")) r.kind = rd.string(doc["kind"], "kind");
    if (doc.contains("example")) r.example = rd.boolean(doc["example"], "example");
    if (doc.contains("outputs")) {
        const json& o = rd.object(doc["outputs"], "outputs");
        rd.check_keys(o, "outputs", {"json_file", "svg", "c_header", "c_prefix", "ascii"});
        if (o.contains("json_file")) r.out.json_file = rd.string(o["json_file"], "outputs.json_file");
        if (o.contains("svg")) r.out.svg_file = rd.string(o["svg"], "outputs.svg");
        if (o.contains("c_header")) r.out.c_header_file = rd.string(o["c_header"], "outputs.c_header");
        if (o.contains("c_prefix")) r.out.c_prefix = rd.string(o["c_prefix"], "outputs.c_prefix");
        if (o.contains("ascii")) r.out.ascii = rd.boolean(o["ascii"], "outputs.ascii");
    }
    return r;
}

}  // namespace tfcli
