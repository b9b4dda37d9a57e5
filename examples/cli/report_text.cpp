#include "report_text.hpp"

#include "requests.hpp"
#include "table.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace tfcli {

using tauforge::charset;

namespace {

std::string pct(double fraction, int digits = 3) { return format_si(fraction, "", charset::unicode, digits); }

std::string signed_pct(double fraction) {
    char buf[32];
    std::snprintf(buf, sizeof buf, "%+.3g %%", fraction * 100.0);
    return buf;
}

std::string temperature_text(const tauforge::operating_conditions& c, charset cs) {
    const tauforge::format_options o{.digits = 4, .chars = cs};
    std::string s = c.t_min == c.t_max ? tauforge::format(c.t_min, o)
                                       : tauforge::format(c.t_min, o) + " .. " + tauforge::format(c.t_max, o);
    if (c.t_ref.value != 25.0) s += " (reference " + tauforge::format(c.t_ref, o) + ")";
    if (c.service_hours > 0.0) {
        char buf[64];
        std::snprintf(buf, sizeof buf, "; parts aged %.6g h", c.service_hours);
        s += buf;
    }
    return s;
}

std::string range_text(double lo, double hi, std::string_view unit, charset cs) {
    if (lo == hi) return format_si(lo, unit, cs);
    return format_si(lo, unit, cs) + " .. " + format_si(hi, unit, cs);
}

std::string corner_text(const std::vector<corner_entry>& c, charset cs) {
    std::string s;
    for (const auto& e : c) {
        if (e.position == "nominal" || !e.decides) continue;
        s += (s.empty() ? "" : ", ") + e.parameter + " " + e.position;
        if (e.position == "interior") s += " " + format_si(e.value, e.unit, cs);
    }
    return s.empty() ? "(no spread)" : s;
}

/// Words wrapped to `width` columns, continuation lines indented.
std::string wrapped(const std::string& lead, const std::vector<std::string>& items, std::size_t width = 100) {
    std::string out = lead, line_so_far = lead;
    for (std::size_t i = 0; i < items.size(); ++i) {
        const std::string piece = items[i] + (i + 1 < items.size() ? ";" : "");
        if (display_width(line_so_far) + 1 + display_width(piece) > width && display_width(line_so_far) > display_width(lead)) {
            out += "\n" + std::string(display_width(lead), ' ');
            line_so_far = std::string(display_width(lead), ' ');
        } else if (i) {
            out += " ";
            line_so_far += " ";
        }
        out += piece;
        line_so_far += piece;
    }
    return out + "\n";
}

}  // namespace

std::string yield_percent(double p) {
    if (p == 1.0) return "100 %";
    char buf[32];
    std::snprintf(buf, sizeof buf, p > 0.99 ? "%.3f" : "%.2f", p * 100.0);
    return std::string(buf) == "100.000" ? "100 %" : std::string(buf) + " %";
}

namespace {

std::string yield_pct(double p) { return yield_percent(p); }

std::string yield_text(const tauforge::proportion_interval& y) {
    return yield_pct(y.estimate) + " (" + yield_pct(y.low) + " .. " + yield_pct(y.high) + ")";
}

std::string parts_table(const std::vector<part_row>& parts, charset cs, bool origin) {
    text_table t(origin ? std::vector<std::string>{"part", "value", "RKM", "tolerance", "temperature", "from", "range at the conditions"}
                        : std::vector<std::string>{"part", "value", "RKM", "tolerance", "temperature", "range at the conditions"},
                 "lrllll");
    for (const auto& p : parts) {
        const std::string unit = p.kind == "resistor" ? "\u03A9" : "F";
        const std::string rkm = p.kind == "resistor" ? tauforge::format_rkm(tauforge::resistance::from_value(p.value))
                                                     : tauforge::format_rkm(tauforge::capacitance::from_value(p.value));
        std::vector<std::string> row{p.name, format_si(p.value, unit, cs), rkm, format_band(p.tol, cs),
                                     p.tempco.empty() ? "-" : p.tempco};
        if (origin) row.push_back(p.origin);
        row.push_back(range_text(p.range.low, p.range.high, unit, cs));
        t.add(row);
    }
    return t.render();
}

std::string analysis_tables(const check_result& c, charset cs) {
    std::string out;
    std::vector<std::size_t> free;
    for (std::size_t j = 0; j < c.parameters.size(); ++j)
        if (c.parameters[j].free) free.push_back(j);

    out += "\nParameter ranges at the conditions (" + std::to_string(free.size()) + " of " +
           std::to_string(c.parameters.size()) + " vary)\n";
    {
        text_table t({"parameter", "low", "nominal", "high"}, "lrrr");
        for (const std::size_t j : free) {
            const auto& p = c.parameters[j];
            t.add({p.name, format_si(p.range.low, p.unit, cs), format_si(p.range.nominal, p.unit, cs),
                   format_si(p.range.high, p.unit, cs)});
        }
        out += t.render();
    }

    out += "\nWorst case: extremes over the parameter ranges, and the corner that decides each\n";
    {
        text_table t({"metric", "minimum", "nominal", "maximum", "minimum at", "maximum at"}, "lrrrll");
        for (const auto& m : c.metrics)
            t.add({m.name, format_si(m.min, m.unit, cs), format_si(m.nominal, m.unit, cs), format_si(m.max, m.unit, cs),
                   m.min == m.max ? "-" : corner_text(m.min_corner, cs), m.min == m.max ? "-" : corner_text(m.max_corner, cs)});
        out += t.render();
    }

    if (!free.empty()) {
        out += "\nSensitivity: change of each metric in % per +1 % of a parameter, at nominal (" + c.sensitivity_method + ")\n";
        std::vector<std::string> head{"metric"};
        std::string align = "l";
        for (const std::size_t j : free) head.push_back(c.parameters[j].name), align += 'r';
        text_table t(head, align);
        for (const auto& m : c.metrics) {
            std::vector<std::string> row{m.name};
            for (const std::size_t j : free) {
                char buf[32];
                if (std::isnan(m.sensitivity[j])) std::snprintf(buf, sizeof buf, "-");
                else std::snprintf(buf, sizeof buf, "%+.3f", m.sensitivity[j] == 0.0 ? 0.0 : m.sensitivity[j]);
                row.emplace_back(buf);
            }
            t.add(row);
        }
        out += t.render();
    }

    char sig[32];
    std::snprintf(sig, sizeof sig, "%g", c.mc.sigmas);
    out += "\nRSS: each range read as \u00B1" + std::string(sig) + " sigma, propagated to first order\n";
    {
        text_table t({"metric", "sigma", "band (\u00B1" + std::string(sig) + " sigma)", "of nominal"}, "lrrr");
        for (const auto& m : c.metrics)
            t.add({m.name, format_si(m.rss_sigma, m.unit, cs), range_text(m.rss_low, m.rss_high, m.unit, cs),
                   std::isfinite(m.rss_relative_half_band) ? "\u00B1" + pct(m.rss_relative_half_band) : "-"});
        out += t.render();
    }

    if (c.has_mc) {
        out += "\nMonte Carlo: " + std::to_string(c.mc.samples) + " samples, seed " + std::to_string(c.mc.seed) + ", " +
               (c.mc.distribution == "uniform" ? std::string("uniform over each range")
                                               : "normal, each range = \u00B1" + std::string(sig) + " sigma, truncated") +
               "\n";
        std::vector<std::string> head{"metric", "mean", "sigma"};
        std::string align = "lrr";
        if (!c.metrics.empty())
            for (const auto& [p, v] : c.metrics.front().percentiles) head.push_back(pct(p, 5)), align += 'r';
        head.push_back("sampled range");
        align += 'r';
        text_table t(head, align);
        for (const auto& m : c.metrics) {
            std::vector<std::string> row{m.name, format_si(m.mc_mean, m.unit, cs), format_si(m.mc_stddev, m.unit, cs)};
            for (const auto& [p, v] : m.percentiles) row.push_back(format_si(v, m.unit, cs));
            row.push_back(range_text(m.mc_min, m.mc_max, m.unit, cs));
            t.add(row);
        }
        out += t.render();
    }

    if (c.has_spec) {
        out += "\nSpec\n";
        text_table t({"metric", "window", "worst case", "at worst case", c.has_mc ? "Monte Carlo yield (95 %)" : ""}, "lllll");
        for (const auto& m : c.metrics) {
            if (!m.requirement) continue;
            const std::string verdict = m.holds ? "holds, margin " + pct(m.margin) : "FAILS, margin " + pct(m.margin);
            t.add({m.name, format_window(m.requirement->window, m.unit, cs), range_text(m.min, m.max, m.unit, cs), verdict,
                   m.has_mc ? yield_text(m.yield) : ""});
        }
        out += t.render();
        if (c.has_mc) out += "  every window at once: " + yield_text(c.joint_yield) + " of the samples\n";
        out += c.holds ? "Verdict: every window holds at worst case.\n"
                       : "Verdict: the parts do NOT hold every window at worst case.\n";
    }
    return out;
}

}  // namespace

std::string parts_line(const std::vector<part_row>& parts, charset cs) {
    std::string s;
    for (const auto& p : parts) {
        s += (s.empty() ? "" : ", ") + p.name + " " + format_si(p.value, p.kind == "resistor" ? "\u03A9" : "F", cs) + " " +
             format_band(p.tol, cs);
        if (!p.tempco.empty()) s += " " + p.tempco;
    }
    return s;
}

std::string text_check(const check_result& c, charset cs) {
    std::string out = "Check of " + c.network + " (" + c.title + ")\n\nParts\n" + parts_table(c.parts, cs, false);
    std::vector<std::string> items{"temperature " + temperature_text(c.conditions, cs)};
    for (const auto& [k, v] : c.settings) items.push_back(k + " " + v);
    out += "\n" + wrapped("Conditions: ", items);
    return out + analysis_tables(c, cs);
}

std::string text_limits(const check_result& c, charset cs) {
    std::string out = text_check(c, cs);
    out += "\nProduction test limits: accept a unit when its measurement lies inside the window shrunk by U = k u\n";
    text_table t({"metric", "window", "from", "u", "k", "accept when measured in", "false rejects", "false accepts",
                  "expected rejects"},
                 "lllrrlrrr");
    for (const auto& l : c.limits) {
        char k[16];
        std::snprintf(k, sizeof k, "%g", l.coverage);
        t.add({l.metric, format_window(l.window, l.unit, cs), l.window_source, format_si(l.standard_uncertainty, l.unit, cs), k,
               format_window(l.acceptance, l.unit, cs), pct(l.rates.false_reject_rate, 3), pct(l.rates.false_accept_rate, 3),
               pct(l.rates.reject_fraction, 3)});
    }
    out += t.render();
    out += "  rates over the Monte Carlo population: false rejects = good units rejected, false accepts = bad units "
           "accepted, for a normal measurement error of standard deviation u\n";
    return out;
}

std::string text_design(const design_result& d, charset cs) {
    std::string out = "Design of " + d.network + " (" + d.title + ")\n";
    std::vector<std::string> req;
    for (const auto& q : d.requirements) req.push_back(q.name + " " + format_window(q.window, q.unit, cs));
    out += wrapped("  spec at worst case: ", req);
    std::vector<std::string> src;
    for (const auto& s : d.sources) src.push_back(s.slot + " from " + s.description + " (" + std::to_string(s.count) + " values)");
    out += wrapped("  values: ", src);
    out += "  " + std::to_string(d.evaluated) + " candidate designs evaluated\n\n";
    if (!d.feasible) {
        out += "No design holds the spec (" + d.why + "): " + d.reason + "\n";
        return out;
    }
    std::vector<std::string> head{"#"};
    std::string align = "r";
    for (const auto& p : d.designs.front().parts) head.push_back(p.name), align += 'r';
    std::vector<std::size_t> shown;
    for (const auto& q : d.requirements)
        if (std::find(shown.begin(), shown.end(), q.metric) == shown.end()) shown.push_back(q.metric);
    for (const std::size_t m : shown) head.push_back(d.metric_units[m].first + " at worst case"), align += 'r';
    head.push_back("margin");
    head.push_back("tightest");
    align += "rl";
    text_table t(head, align);
    for (std::size_t i = 0; i < d.designs.size(); ++i) {
        const auto& x = d.designs[i];
        std::vector<std::string> row{std::to_string(i + 1)};
        for (const auto& p : x.parts)
            row.push_back(format_si(p.value, p.kind == "resistor" ? "\u03A9" : "F", cs) + " " + format_band(p.tol, cs));
        for (const std::size_t m : shown) row.push_back(range_text(x.worst_min[m], x.worst_max[m], d.metric_units[m].second, cs));
        row.push_back(pct(x.margin));
        row.push_back(x.tight_metric + (x.tight_at_high ? " max" : " min"));
        t.add(row);
    }
    out += t.render();
    out += "  margin: distance of the worst case inside the window, as a fraction of the half-window\n";
    if (d.best) {
        out += "\nDesign 1 in detail\n\nParts\n" + parts_table(d.best->parts, cs, true);
        std::vector<std::string> items{"temperature " + temperature_text(d.best->conditions, cs)};
        for (const auto& [k, v] : d.best->settings) items.push_back(k + " " + v);
        out += "\n" + wrapped("Conditions: ", items);
        out += analysis_tables(*d.best, cs);
    }
    return out;
}

std::string text_readback(const readback_result& r, charset cs) {
    std::string out = "Read-back of " + r.parameter + " in " + r.marked.network + " (" + r.marked.title + ")\n";
    out += "  parts as marked: " + parts_line(r.marked.parts, cs) + "\n";
    char k[16];
    std::snprintf(k, sizeof k, "%g", r.coverage);
    out += "  measured " + r.metric + " = " + format_si(r.measured, r.metric_unit, cs, 4) + ", standard uncertainty u = " +
           format_si(r.standard_uncertainty, r.metric_unit, cs) + ", k = " + k + "\n\n";
    text_table t({"", r.parameter}, "lr");
    t.add({"with every other parameter at nominal", format_si(r.estimate.nominal, r.parameter_unit, cs, 4)});
    t.add({"lowest consistent value", format_si(r.estimate.low, r.parameter_unit, cs, 4)});
    t.add({"highest consistent value", format_si(r.estimate.high, r.parameter_unit, cs, 4)});
    t.add({"marked range at the conditions", range_text(r.marked_range.low, r.marked_range.high, r.parameter_unit, cs)});
    out += t.render();
    out += "  consistent: over every corner of the other parameters' ranges and the measurement \u00B1 U (U = k u)\n";
    out += r.within_marked ? "Verdict: the read-back value lies inside the part's marked range.\n"
                           : "Verdict: the read-back value lies OUTSIDE the part's marked range.\n";
    return out;
}

std::string text_pick(const pick_result& p, charset cs) {
    std::string out = "Pick for " + format_si(p.target, p.unit, cs, 4) + " (" + p.kind + ") from " + p.source + ", " +
                      std::to_string(p.count) + " values\n\n";
    text_table t({"", "value", "error", "tolerance", "from"}, "lrrll");
    t.add({"nearest single value", format_si(p.nearest, p.unit, cs, 4), signed_pct(p.nearest / p.target - 1.0),
           format_band(p.nearest_tol, cs), p.nearest_origin});
    if (p.below) t.add({"at or below", format_si(*p.below, p.unit, cs, 4), signed_pct(*p.below / p.target - 1.0), "", ""});
    if (p.above) t.add({"at or above", format_si(*p.above, p.unit, cs, 4), signed_pct(*p.above / p.target - 1.0), "", ""});
    out += t.render();
    const std::string par = cs == charset::unicode ? " \u2225 " : " || ";
    for (const auto* list : {&p.series, &p.parallel}) {
        const bool series = list == &p.series;
        out += std::string("\nTwo in ") + (series ? "series" : "parallel") + "\n";
        text_table u({"#", "parts", "value", "error", "tolerance"}, "rlrrl");
        for (std::size_t i = 0; i < list->size(); ++i) {
            const auto& x = (*list)[i];
            u.add({std::to_string(i + 1), format_si(x.first, p.unit, cs, 4) + (series ? " + " : par) + format_si(x.second, p.unit, cs, 4),
                   format_si(x.value, p.unit, cs, 5), signed_pct(x.error), format_band(x.tol, cs)});
        }
        out += u.render();
    }
    out += "  tolerance of a pair: its worst-case band from the two parts' bands\n";
    return out;
}

std::string text_networks(const std::vector<network_entry>& all) {
    std::string out = "Networks (tauforge networks NAME shows one)\n";
    text_table t({"name", "also", "what", "parts", "metrics"}, "lllll");
    for (const auto& e : all) {
        std::string also, parts, metrics;
        for (const auto& a : e.aliases) also += (also.empty() ? "" : ", ") + a;
        for (const auto& [n, k] : e.parts) parts += (parts.empty() ? "" : " ") + n;
        for (const auto& m : e.metrics) {
            std::string n(m.name);
            std::replace(n.begin(), n.end(), ' ', '-');
            metrics += (metrics.empty() ? "" : ", ") + n;
        }
        t.add({e.name, also, e.title, parts, metrics});
    }
    return out + t.render();
}

std::string text_network(const network_entry& e) {
    std::string out = e.name + ": " + e.title + "\n  " + e.summary + "\n";
    if (!e.aliases.empty()) {
        std::string also;
        for (const auto& a : e.aliases) also += (also.empty() ? "" : ", ") + a;
        out += "  also called: " + also + "\n";
    }
    out += "\nParts (--part NAME=VALUE,TOLERANCE[,TEMPCO])\n";
    for (const auto& [n, k] : e.parts) out += "  " + n + "  " + k + "\n";
    out += "\nSettings (--set NAME=VALUE)\n";
    text_table s({"name", "meaning and form"}, "ll");
    for (const auto& [n, h] : e.settings) s.add({n, h});
    out += s.render();
    out += "\nMetrics (--spec METRIC=...)\n";
    for (const auto& m : e.metrics) {
        std::string n(m.name);
        std::replace(n.begin(), n.end(), ' ', '-');
        out += "  " + n + (m.unit.empty() ? "  (fraction)" : "  (" + std::string(m.unit) + ")") + "\n";
    }
    std::string example = "tauforge check " + e.name;
    for (const auto& p : e.example_parts) example += " --part " + shell_quote(p);
    for (const auto& s2 : e.example_settings) example += " --set " + shell_quote(s2);
    for (const auto& s2 : e.example_spec) example += " --spec " + shell_quote(s2);
    out += "\nExample (also: tauforge check " + e.name + " --example)\n  " + example + "\n";
    if (!e.example_resistors.empty() || !e.example_capacitors.empty())
        out += "design --example searches " + (e.example_resistors.empty() ? std::string(default_resistor_series) : e.example_resistors) +
               " (resistors) and " + (e.example_capacitors.empty() ? std::string(default_capacitor_series) : e.example_capacitors) +
               " (capacitors)\n";
    return out;
}

}  // namespace tfcli
