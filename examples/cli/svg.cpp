#include "svg.hpp"

#include "report_text.hpp"

#include <algorithm>
#include <cmath>
#include <vector>
#include <cstdio>
#include <limits>

namespace tfcli {

namespace {

std::string esc(std::string_view s) {
    std::string out;
    for (const char c : s) {
        switch (c) {
            case '&': out += "&amp;"; break;
            case '<': out += "&lt;"; break;
            case '>': out += "&gt;"; break;
            case '"': out += "&quot;"; break;
            default: out += c;
        }
    }
    return out;
}

std::string num(double v) {
    char buf[32];
    std::snprintf(buf, sizeof buf, "%.2f", v);
    return buf;
}

/// Ticks at 1, 2 or 5 times a power of ten, about `target` of them over [lo, hi].
std::vector<double> ticks(double lo, double hi, int target = 6) {
    std::vector<double> out;
    if (!(hi > lo)) return {lo};
    const double raw = (hi - lo) / target;
    const double p = std::pow(10.0, std::floor(std::log10(raw)));
    double step = p;
    for (const double m : {1.0, 2.0, 5.0, 10.0})
        if (m * p >= raw) {
            step = m * p;
            break;
        }
    for (double t = std::ceil(lo / step) * step; t <= hi + step * 1e-9; t += step) out.push_back(std::abs(t) < step * 1e-9 ? 0.0 : t);
    return out;
}

/// A plot area mapping data to pixels.
struct frame {
    double x0, y0, w, h;  // pixels: left, top, width, height
    double xmin, xmax, ymin, ymax;
    bool log_y = false;   // y on a logarithmic scale (ymin > 0)
    double px(double x) const { return x0 + (x - xmin) / (xmax - xmin) * w; }
    double py(double y) const {
        if (log_y) {
            const double l = std::log10(std::max(y, ymin));
            return y0 + h - (l - std::log10(ymin)) / (std::log10(ymax) - std::log10(ymin)) * h;
        }
        return y0 + h - (y - ymin) / (ymax - ymin) * h;
    }
};

/// A decade as text: 1, 0.1, 0.01, then 10⁻³, 10⁻⁴ ...
std::string decade_label(double v) {
    const int k = static_cast<int>(std::lround(std::log10(v)));
    if (k >= -2 && k <= 2) {
        char buf[16];
        std::snprintf(buf, sizeof buf, "%g", std::pow(10.0, k));
        return buf;
    }
    static const char* digits[10] = {"\u2070", "\u00B9", "\u00B2", "\u00B3", "\u2074", "\u2075", "\u2076", "\u2077", "\u2078", "\u2079"};
    std::string out = k < 0 ? "10\u207B" : "10";
    for (const char c : std::to_string(std::abs(k))) out += digits[c - '0'];
    return out;
}

/// Decades within [lo, hi] for a logarithmic axis.
std::vector<double> decades(double lo, double hi) {
    std::vector<double> out;
    for (double d = std::pow(10.0, std::ceil(std::log10(lo))); d <= hi * (1.0 + 1e-9); d *= 10.0) out.push_back(d);
    return out;
}

void axes(std::string& s, const frame& f, std::string_view xunit, std::string_view yunit, const std::string& xlabel,
          const std::string& ylabel) {
    s += "<rect class=\"plot-area\" x=\"" + num(f.x0) + "\" y=\"" + num(f.y0) + "\" width=\"" + num(f.w) + "\" height=\"" +
         num(f.h) + "\" fill=\"#fbfbfb\" stroke=\"#999\"/>\n";
    for (const double t : ticks(f.xmin, f.xmax)) {
        const double x = f.px(t);
        s += "<line class=\"grid\" x1=\"" + num(x) + "\" y1=\"" + num(f.y0) + "\" x2=\"" + num(x) + "\" y2=\"" + num(f.y0 + f.h) +
             "\" stroke=\"#e4e4e4\"/>\n";
        s += "<text x=\"" + num(x) + "\" y=\"" + num(f.y0 + f.h + 16) + "\" text-anchor=\"middle\">" +
             esc(format_si(t, xunit)) + "</text>\n";
    }
    if (!yunit.empty() || ylabel.size()) {
        for (const double t : f.log_y ? decades(f.ymin, f.ymax) : ticks(f.ymin, f.ymax, 5)) {
            const double y = f.py(t);
            s += "<line class=\"grid\" x1=\"" + num(f.x0) + "\" y1=\"" + num(y) + "\" x2=\"" + num(f.x0 + f.w) + "\" y2=\"" + num(y) +
                 "\" stroke=\"#e4e4e4\"/>\n";
            s += "<text x=\"" + num(f.x0 - 6) + "\" y=\"" + num(y + 4) + "\" text-anchor=\"end\">" +
                 esc(f.log_y ? decade_label(t) : yunit == "count" ? std::to_string(static_cast<long long>(t)) : format_si(t, yunit)) +
                 "</text>\n";
        }
    }
    s += "<text x=\"" + num(f.x0 + f.w / 2) + "\" y=\"" + num(f.y0 + f.h + 34) + "\" text-anchor=\"middle\">" + esc(xlabel) +
         "</text>\n";
    s += "<text x=\"" + num(f.x0 - 56) + "\" y=\"" + num(f.y0 + f.h / 2) + "\" text-anchor=\"middle\" transform=\"rotate(-90 " +
         num(f.x0 - 56) + " " + num(f.y0 + f.h / 2) + ")\">" + esc(ylabel) + "</text>\n";
}

std::string polyline(const frame& f, const std::vector<std::pair<double, double>>& pts) {
    std::string p;
    for (const auto& [t, v] : pts) p += num(f.px(t)) + "," + num(f.py(v)) + " ";
    if (!p.empty()) p.pop_back();
    return p;
}

/// A white outline behind label text, so it stays legible over curves and bars.
const std::string halo = " paint-order=\"stroke\" stroke=\"white\" stroke-width=\"3\" stroke-linejoin=\"round\"";

const char* trace_class[3] = {"nominal", "corner-min", "corner-max"};
const char* trace_colour[3] = {"#1f4e9c", "#d9822b", "#c0392b"};
const char* trace_dash[3] = {"", " stroke-dasharray=\"7 4\"", " stroke-dasharray=\"2 3\""};

void waveform_panel(std::string& s, const check_result& c, double top) {
    const auto& m = c.metrics[c.primary];
    const waveform& first = c.traces.front();
    const bool log_y = first.log_y;
    double tmax = 0.0, vmin = log_y ? HUGE_VAL : 0.0, vmax = log_y ? 0.0 : 0.0;
    for (const auto& w : c.traces) {
        for (const auto& [t, v] : w.points) {
            tmax = std::max(tmax, t);
            if (!log_y || v > 0.0) vmin = std::min(vmin, v);
            vmax = std::max(vmax, v);
        }
        for (const auto& [l, v] : w.thresholds) vmax = std::max(vmax, v), vmin = std::min(vmin, v);
    }
    if (!(tmax > 0.0)) tmax = 1.0;
    frame f{90, top, 720, 230, 0.0, tmax, 0.0, 1.0, log_y};
    if (log_y) {
        // Down to the lowest threshold's thousandth at most: the tail beyond says nothing more.
        double floor_v = vmax;
        for (const auto& [l, v] : first.thresholds) floor_v = std::min(floor_v, v / 1000.0);
        vmin = std::max(vmin, floor_v);
        f.ymin = std::pow(10.0, std::floor(std::log10(vmin > 0.0 && std::isfinite(vmin) ? vmin : 1e-6)));
        f.ymax = std::pow(10.0, std::ceil(std::log10(vmax > f.ymin ? vmax : f.ymin * 10.0)));
    } else {
        if (!(vmax > vmin)) vmax = vmin + 1.0;
        const double pad = 0.06 * (vmax - vmin);
        f.ymin = vmin - (vmin < 0.0 ? pad : 0.0);
        f.ymax = vmax + pad;
    }
    s += "<g id=\"waveform\">\n";
    s += "<text class=\"panel-title\" x=\"90\" y=\"" + num(top - 10) + "\" font-weight=\"bold\">" +
         esc(first.node + ": nominal and the corners of " + m.name) + "</text>\n";
    axes(s, f, "s", first.y_unit, "time", first.y_label + (log_y ? " (log scale)" : ""));
    // The envelope between the two corner curves.
    if (c.traces.size() == 3 && !c.traces[1].points.empty() && !c.traces[2].points.empty()) {
        std::string p = polyline(f, c.traces[1].points);
        auto back = c.traces[2].points;
        std::reverse(back.begin(), back.end());
        p += " " + polyline(f, back);
        s += "<polygon class=\"envelope\" points=\"" + p + "\" fill=\"#d9822b\" fill-opacity=\"0.12\" stroke=\"none\"/>\n";
    }
    // Thresholds: a band where the corners put them apart, a line at nominal.
    const auto& nominal = c.traces.front();
    std::string labels_after;  // drawn over the curves
    for (std::size_t i = 0; i < nominal.thresholds.size(); ++i) {
        double lo = nominal.thresholds[i].second, hi = lo;
        for (const auto& w : c.traces)
            if (i < w.thresholds.size()) lo = std::min(lo, w.thresholds[i].second), hi = std::max(hi, w.thresholds[i].second);
        if (hi > lo)
            s += "<rect class=\"threshold-band\" x=\"" + num(f.x0) + "\" y=\"" + num(f.py(hi)) + "\" width=\"" + num(f.w) +
                 "\" height=\"" + num(f.py(lo) - f.py(hi)) + "\" fill=\"#777\" fill-opacity=\"0.12\"/>\n";
        const double y = f.py(nominal.thresholds[i].second);
        s += "<line class=\"threshold\" x1=\"" + num(f.x0) + "\" y1=\"" + num(y) + "\" x2=\"" + num(f.x0 + f.w) + "\" y2=\"" + num(y) +
             "\" stroke=\"#555\" stroke-dasharray=\"5 4\"/>\n";
        labels_after += "<text class=\"threshold-label\" x=\"" + num(f.x0 + f.w - 4) + "\" y=\"" + num(y - 4) +
                        "\" text-anchor=\"end\" fill=\"#555\"" + halo + ">" +
                        esc(nominal.thresholds[i].first + " " + format_si(nominal.thresholds[i].second, first.y_unit)) + "</text>\n";
    }
    for (std::size_t k = 0; k < c.traces.size() && k < 3; ++k) {
        const auto& w = c.traces[k];
        s += "<polyline class=\"" + std::string(trace_class[k]) + "\" points=\"" + polyline(f, w.points) +
             "\" fill=\"none\" stroke=\"" + trace_colour[k] + "\" stroke-width=\"" + (k == 0 ? "2.2" : "1.6") + "\"" +
             trace_dash[k] + "/>\n";
        if (!w.events.empty()) {
            const double x = f.px(w.events.back().second);
            s += "<line class=\"event " + std::string(trace_class[k]) + "-event\" x1=\"" + num(x) + "\" y1=\"" + num(f.y0) +
                 "\" x2=\"" + num(x) + "\" y2=\"" + num(f.y0 + f.h) + "\" stroke=\"" + trace_colour[k] +
                 "\" stroke-opacity=\"0.6\" stroke-dasharray=\"1 3\"/>\n";
        }
    }
    s += labels_after;
    // Legend: two rows of two under the time axis.
    const std::string ends = nominal.events.empty() ? "" : nominal.events.back().first;
    const std::string labels[4] = {"nominal: " + m.name + " " + format_si(m.nominal, m.unit, tauforge::charset::unicode, 4),
                                   "corner of minimum " + m.name + ": " + format_si(m.min, m.unit, tauforge::charset::unicode, 4),
                                   "corner of maximum " + m.name + ": " + format_si(m.max, m.unit, tauforge::charset::unicode, 4),
                                   "worst-case envelope" + (ends.empty() ? std::string() : "; dotted lines: " + ends)};
    for (int k = 0; k < 4; ++k) {
        const double lx = f.x0 + (k % 2) * 370.0, ly = f.y0 + f.h + 58 + (k / 2) * 18.0;
        if (k < 3)
            s += "<line x1=\"" + num(lx) + "\" y1=\"" + num(ly - 4) + "\" x2=\"" + num(lx + 24) + "\" y2=\"" + num(ly - 4) +
                 "\" stroke=\"" + trace_colour[k] + "\" stroke-width=\"2\"" + trace_dash[k] + "/>\n";
        else
            s += "<rect x=\"" + num(lx) + "\" y=\"" + num(ly - 10) + "\" width=\"24\" height=\"9\" fill=\"#d9822b\" fill-opacity=\"0.25\"/>\n";
        s += "<text class=\"legend\" x=\"" + num(lx + 30) + "\" y=\"" + num(ly) + "\">" + esc(labels[k]) + "</text>\n";
    }
    s += "</g>\n";
}

void histogram_panel(std::string& s, const check_result& c, double top) {
    const auto& m = c.metrics[c.primary];
    s += "<g id=\"histogram\">\n";
    if (!m.has_mc) {
        s += "<text x=\"90\" y=\"" + num(top + 20) + "\">no Monte Carlo run (--samples 0)</text>\n</g>\n";
        return;
    }
    const auto& hist = m.hist;
    const std::size_t peak = hist.counts.empty() ? 1 : std::max<std::size_t>(1, *std::max_element(hist.counts.begin(), hist.counts.end()));
    double lo = hist.low, hi = hist.high;
    if (!(hi > lo)) {
        const double d = std::max(std::abs(lo) * 0.01, 1e-15);
        lo -= d;
        hi += d;
    }
    const frame f{90, top, 720, 210, lo, hi, 0.0, static_cast<double>(peak) * 1.1};
    std::string title = "Monte Carlo: " + m.name + ", " + std::to_string(c.mc.samples) + " samples, seed " + std::to_string(c.mc.seed);
    if (m.requirement) title += "; yield " + format_si(m.yield.estimate, "", tauforge::charset::unicode, 4);
    s += "<text class=\"panel-title\" x=\"90\" y=\"" + num(top - 10) + "\" font-weight=\"bold\">" + esc(title) + "</text>\n";
    axes(s, f, m.unit, "count", m.name, "samples per bin");
    if (m.requirement) {
        const auto& w = m.requirement->window;
        const double a = std::max(lo, w.low ? *w.low : lo), b = std::min(hi, w.high ? *w.high : hi);
        if (b > a)
            s += "<rect class=\"spec-window\" x=\"" + num(f.px(a)) + "\" y=\"" + num(f.y0) + "\" width=\"" + num(f.px(b) - f.px(a)) +
                 "\" height=\"" + num(f.h) + "\" fill=\"#2e8b57\" fill-opacity=\"0.14\"/>\n";
        s += "<text x=\"" + num(f.x0 + f.w) + "\" y=\"" + num(top - 10) + "\" text-anchor=\"end\" fill=\"#2e8b57\">" +
             esc("shaded: spec window " + format_window(w, m.unit)) + "</text>\n";
    }
    if (!hist.counts.empty()) {
        const double bw = (hi - lo) / static_cast<double>(hist.counts.size());
        for (std::size_t i = 0; i < hist.counts.size(); ++i) {
            const double x = f.px(lo + bw * static_cast<double>(i)), x1 = f.px(lo + bw * static_cast<double>(i + 1));
            const double y = f.py(static_cast<double>(hist.counts[i]));
            s += "<rect class=\"bar\" x=\"" + num(x) + "\" y=\"" + num(y) + "\" width=\"" + num(std::max(0.5, x1 - x - 1.0)) +
                 "\" height=\"" + num(f.y0 + f.h - y) + "\" fill=\"#1f4e9c\" fill-opacity=\"0.75\"/>\n";
        }
    }
    auto vline = [&](double v, const char* cls, const char* colour, const char* dash, const std::string& label, double dy) {
        if (v < lo || v > hi) return;
        const double x = f.px(v);
        s += "<line class=\"" + std::string(cls) + "\" x1=\"" + num(x) + "\" y1=\"" + num(f.y0) + "\" x2=\"" + num(x) + "\" y2=\"" +
             num(f.y0 + f.h) + "\" stroke=\"" + colour + "\" stroke-width=\"1.5\"" + dash + "/>\n";
        const bool right = x > f.x0 + f.w - 110;
        s += "<text x=\"" + num(right ? x - 3 : x + 3) + "\" y=\"" + num(f.y0 + dy) + "\"" + (right ? " text-anchor=\"end\"" : "") +
             " fill=\"" + colour + "\"" + halo + ">" + esc(label) + "</text>\n";
    };
    vline(m.min, "worst-case", "#c0392b", " stroke-dasharray=\"6 3\"", "worst-case min", 32);
    vline(m.max, "worst-case", "#c0392b", " stroke-dasharray=\"6 3\"", "worst-case max", 32);
    vline(m.nominal, "nominal-value", "#333", "", "nominal", 16);
    for (const auto& l : c.limits)
        if (l.metric == m.name) {
            if (l.acceptance.low) vline(*l.acceptance.low, "acceptance", "#7b3fa0", " stroke-dasharray=\"3 2\"", "accept from", 66);
            if (l.acceptance.high) vline(*l.acceptance.high, "acceptance", "#7b3fa0", " stroke-dasharray=\"3 2\"", "accept to", 66);
        }
    s += "</g>\n";
}

}  // namespace

std::string svg_plot(const check_result& c, const std::string& heading) {
    std::string s;
    s += "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
    s += "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"860\" height=\"740\" viewBox=\"0 0 860 740\" "
         "font-family=\"DejaVu Sans, Arial, sans-serif\" font-size=\"12\">\n";
    s += "<title>" + esc(heading) + "</title>\n";
    s += "<rect width=\"860\" height=\"740\" fill=\"white\"/>\n";
    s += "<text x=\"20\" y=\"26\" font-size=\"16\" font-weight=\"bold\">" + esc(heading) + "</text>\n";
    s += "<text x=\"20\" y=\"46\">" + esc(parts_line(c.parts, tauforge::charset::unicode)) + "</text>\n";
    if (!c.metrics.empty() && !c.traces.empty()) waveform_panel(s, c, 90);
    if (!c.metrics.empty()) histogram_panel(s, c, 440);
    s += "<text x=\"20\" y=\"728\" fill=\"#777\" font-size=\"10\">tauforge: design estimates from the part models and ranges "
         "given; verify on hardware.</text>\n";
    s += "</svg>\n";
    return s;
}

}  // namespace tfcli
