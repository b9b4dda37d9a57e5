#include "report_json.hpp"

#include <cmath>

#ifndef TAUFORGE_CLI_VERSION
#define TAUFORGE_CLI_VERSION "unknown"
#endif

namespace tfcli {

using json = nlohmann::ordered_json;

namespace {

json number(double v) { return std::isfinite(v) ? json(v) : json(nullptr); }

json interval_json(const interval& i, std::string_view unit) {
    return {{"nominal", quantity_json(i.nominal, unit)}, {"low", quantity_json(i.low, unit)}, {"high", quantity_json(i.high, unit)}};
}

json proportion_json(const tauforge::proportion_interval& p, double confidence) {
    return {{"estimate", number(p.estimate)}, {"low", number(p.low)}, {"high", number(p.high)}, {"confidence", confidence},
            {"text", format_si(p.estimate, "", tauforge::charset::unicode, 4) + " (" + format_si(p.low, "", tauforge::charset::unicode, 4) +
                         " .. " + format_si(p.high, "", tauforge::charset::unicode, 4) + ")"}};
}

json part_json(const part_row& p) {
    return {{"name", p.name},
            {"kind", p.kind},
            {"value", quantity_json(p.value, p.kind == "resistor" ? "\u03A9" : "F")},
            {"rkm", p.kind == "resistor" ? tauforge::format_rkm(tauforge::resistance::from_value(p.value))
                                         : tauforge::format_rkm(tauforge::capacitance::from_value(p.value))},
            {"tolerance", tolerance_json(p.tol)},
            {"tempco", p.tempco},
            {"origin", p.origin},
            {"range", interval_json(p.range, p.kind == "resistor" ? "\u03A9" : "F")}};
}

json corner_json(const std::vector<corner_entry>& c) {
    json a = json::array();
    for (const auto& e : c)
        a.push_back({{"parameter", e.parameter}, {"position", e.position}, {"decides", e.decides},
                     {"value", quantity_json(e.value, e.unit)}});
    return a;
}

json requirement_json(const requirement_row& q) {
    return {{"metric", q.name}, {"text", q.text}, {"window", window_json(q.window, q.unit)}};
}

}  // namespace

json quantity_json(double v, std::string_view unit) {
    return {{"value", number(v)}, {"unit", unit}, {"text", format_si(v, unit, tauforge::charset::unicode, 4)}};
}

json tolerance_json(const tolerance& t) {
    return {{"minus", t.minus}, {"plus", t.plus}, {"text", format_band(t)}};
}

json window_json(const spec_window& w, std::string_view unit) {
    return {{"low", w.low ? quantity_json(*w.low, unit) : json(nullptr)},
            {"high", w.high ? quantity_json(*w.high, unit) : json(nullptr)},
            {"text", format_window(w, unit)}};
}

std::string status_text(int exit_code) {
    switch (exit_code) {
        case exit_ok: return "ok";
        case exit_infeasible: return "infeasible";
        case exit_spec_not_met: return "spec not met";
        default: return "error";
    }
}

json report_header(std::string_view command, int exit_code) {
    return {{"tool", "tauforge"}, {"version", TAUFORGE_CLI_VERSION}, {"command", command},
            {"status", status_text(exit_code)}, {"exit_code", exit_code}};
}

json json_check(const check_result& c) {
    json j;
    j["network"] = {{"name", c.network}, {"title", c.title}};
    json parts = json::array();
    for (const auto& p : c.parts) parts.push_back(part_json(p));
    j["parts"] = parts;
    json settings = json::array();
    for (const auto& [k, v] : c.settings) settings.push_back({{"name", k}, {"text", v}});
    j["conditions"] = {{"temperature",
                        {{"min", c.conditions.t_min.value}, {"max", c.conditions.t_max.value}, {"ref", c.conditions.t_ref.value},
                         {"unit", "\u00B0C"}}},
                       {"service hours", c.conditions.service_hours},
                       {"settings", settings}};
    json params = json::array();
    for (const auto& p : c.parameters)
        params.push_back({{"name", p.name}, {"unit", p.unit}, {"free", p.free}, {"range", interval_json(p.range, p.unit)}});
    j["parameters"] = params;
    json metrics = json::array();
    for (const auto& m : c.metrics) {
        json row;
        row["name"] = m.name;
        row["unit"] = m.unit;
        row["nominal"] = quantity_json(m.nominal, m.unit);
        json mn = quantity_json(m.min, m.unit), mx = quantity_json(m.max, m.unit);
        mn["corner"] = corner_json(m.min_corner);
        mx["corner"] = corner_json(m.max_corner);
        row["worst_case"] = {{"min", mn}, {"max", mx}};
        json sens = json::array();
        for (std::size_t j2 = 0; j2 < m.sensitivity.size(); ++j2)
            sens.push_back({{"parameter", c.parameters[j2].name}, {"normalized", number(m.sensitivity[j2])}});
        row["sensitivity"] = sens;
        row["rss"] = {{"sigma", quantity_json(m.rss_sigma, m.unit)},
                      {"center", quantity_json(m.rss_center, m.unit)},
                      {"low", quantity_json(m.rss_low, m.unit)},
                      {"high", quantity_json(m.rss_high, m.unit)},
                      {"relative_half_band", number(m.rss_relative_half_band)}};
        if (m.has_mc) {
            json pct = json::array();
            for (const auto& [p, v] : m.percentiles) pct.push_back({{"probability", p}, {"value", quantity_json(v, m.unit)}});
            row["monte_carlo"] = {{"mean", quantity_json(m.mc_mean, m.unit)},
                                  {"stddev", quantity_json(m.mc_stddev, m.unit)},
                                  {"min", quantity_json(m.mc_min, m.unit)},
                                  {"max", quantity_json(m.mc_max, m.unit)},
                                  {"percentiles", pct},
                                  {"histogram",
                                   {{"low", quantity_json(m.hist.low, m.unit)},
                                    {"high", quantity_json(m.hist.high, m.unit)},
                                    {"counts", m.hist.counts}}}};
        }
        if (m.requirement) {
            json spec = requirement_json(*m.requirement);
            spec["worst_case_holds"] = m.holds;
            spec["margin"] = number(m.margin);
            if (m.has_mc) {
                spec["inside"] = m.inside;
                spec["yield"] = proportion_json(m.yield, 0.95);
            }
            row["spec"] = spec;
        } else {
            row["spec"] = nullptr;
        }
        metrics.push_back(row);
    }
    j["metrics"] = metrics;
    j["sensitivity_method"] = c.sensitivity_method;
    if (c.has_mc) {
        json mc = {{"samples", c.mc.samples}, {"seed", c.mc.seed}, {"distribution", c.mc.distribution},
                   {"sigmas_per_half_width", c.mc.sigmas}, {"passing", c.passing}};
        mc["joint_yield"] = c.has_spec ? proportion_json(c.joint_yield, 0.95) : json(nullptr);
        j["monte_carlo"] = mc;
    } else {
        j["monte_carlo"] = nullptr;
    }
    j["spec_holds"] = c.has_spec ? json(c.holds) : json(nullptr);
    j["plotted_metric"] = c.metrics.empty() ? json(nullptr) : json(c.metrics[c.primary].name);
    return j;
}

json json_limits(const std::vector<limit_row>& limits) {
    json a = json::array();
    for (const auto& l : limits)
        a.push_back({{"metric", l.metric},
                     {"window_source", l.window_source},
                     {"window", window_json(l.window, l.unit)},
                     {"acceptance", window_json(l.acceptance, l.unit)},
                     {"uncertainty",
                      {{"standard", quantity_json(l.standard_uncertainty, l.unit)},
                       {"coverage", l.coverage},
                       {"expanded", quantity_json(l.guard, l.unit)}}},
                     {"rates",
                      {{"samples", l.rates.samples},
                       {"good_fraction", number(l.rates.good_fraction)},
                       {"reject_fraction", number(l.rates.reject_fraction)},
                       {"false_reject_rate", number(l.rates.false_reject_rate)},
                       {"false_accept_rate", number(l.rates.false_accept_rate)}}}});
    return a;
}

json json_design(const design_result& d) {
    json j;
    j["network"] = {{"name", d.network}, {"title", d.title}};
    json reqs = json::array();
    for (const auto& q : d.requirements) reqs.push_back(requirement_json(q));
    j["requirements"] = reqs;
    json src = json::array();
    for (const auto& s : d.sources) src.push_back({{"slot", s.slot}, {"values", s.description}, {"count", s.count}});
    j["search"] = {{"slots", src}, {"evaluated", d.evaluated}};
    j["feasible"] = d.feasible;
    j["why"] = d.why;
    j["reason"] = d.reason;
    json designs = json::array();
    for (std::size_t i = 0; i < d.designs.size(); ++i) {
        const auto& x = d.designs[i];
        json parts = json::array();
        for (const auto& p : x.parts) parts.push_back(part_json(p));
        json metrics = json::array();
        for (std::size_t m = 0; m < d.metric_units.size(); ++m) {
            const auto& [name, unit] = d.metric_units[m];
            metrics.push_back({{"name", name},
                               {"nominal", quantity_json(x.nominal[m], unit)},
                               {"min", quantity_json(x.worst_min[m], unit)},
                               {"max", quantity_json(x.worst_max[m], unit)}});
        }
        designs.push_back({{"rank", i + 1},
                           {"parts", parts},
                           {"metrics", metrics},
                           {"margin", number(x.margin)},
                           {"tightest", {{"metric", x.tight_metric}, {"edge", x.tight_at_high ? "max" : "min"}}},
                           {"nominal_error", number(x.nominal_error)}});
    }
    j["designs"] = designs;
    j["best"] = d.best ? json_check(*d.best) : json(nullptr);
    return j;
}

json json_readback(const readback_result& r) {
    return {{"parameter", r.parameter},
                     {"metric", r.metric},
                     {"measured", quantity_json(r.measured, r.metric_unit)},
                     {"uncertainty",
                      {{"standard", quantity_json(r.standard_uncertainty, r.metric_unit)},
                       {"coverage", r.coverage},
                       {"expanded", quantity_json(r.coverage * r.standard_uncertainty, r.metric_unit)}}},
                     {"estimate", interval_json(r.estimate, r.parameter_unit)},
                     {"marked_range", interval_json(r.marked_range, r.parameter_unit)},
                     {"within_marked_range", r.within_marked}};
}

json json_pick(const pick_result& p) {
    auto pairs = [&](const std::vector<pair_row>& v) {
        json a = json::array();
        for (std::size_t i = 0; i < v.size(); ++i)
            a.push_back({{"rank", i + 1},
                         {"first", quantity_json(v[i].first, p.unit)},
                         {"second", quantity_json(v[i].second, p.unit)},
                         {"value", quantity_json(v[i].value, p.unit)},
                         {"error", v[i].error},
                         {"tolerance", tolerance_json(v[i].tol)}});
        return a;
    };
    return {{"kind", p.kind},
            {"target", quantity_json(p.target, p.unit)},
            {"values", p.source},
            {"count", p.count},
            {"nearest",
             {{"value", quantity_json(p.nearest, p.unit)},
              {"error", p.nearest / p.target - 1.0},
              {"tolerance", tolerance_json(p.nearest_tol)},
              {"origin", p.nearest_origin}}},
            {"below", p.below ? quantity_json(*p.below, p.unit) : json(nullptr)},
            {"above", p.above ? quantity_json(*p.above, p.unit) : json(nullptr)},
            {"series", pairs(p.series)},
            {"parallel", pairs(p.parallel)}};
}

json json_networks(const std::vector<network_entry>& all) {
    json a = json::array();
    for (const auto& e : all) {
        json params = json::array(), metrics = json::array(), parts = json::array(), settings = json::array();
        for (const auto& q : e.parameters) params.push_back({{"name", q.name}, {"unit", q.unit}});
        for (const auto& q : e.metrics) metrics.push_back({{"name", q.name}, {"unit", q.unit}});
        for (const auto& [n, k] : e.parts) parts.push_back({{"name", n}, {"kind", k}});
        for (const auto& [n, h] : e.settings) settings.push_back({{"name", n}, {"help", h}});
        a.push_back({{"name", e.name},
                     {"title", e.title},
                     {"summary", e.summary},
                     {"aliases", e.aliases},
                     {"designable", e.designable},
                     {"parts", parts},
                     {"settings", settings},
                     {"parameters", params},
                     {"metrics", metrics},
                     {"example", {{"parts", e.example_parts},
                                  {"settings", e.example_settings},
                                  {"spec", e.example_spec},
                                  {"resistors", e.example_resistors},
                                  {"capacitors", e.example_capacitors}}}});
    }
    return a;
}

}  // namespace tfcli
