// The demo board: a small bench instrument, a scenario of our own with invented data.
// Each block is a request like the ones the command line builds, run through the
// same catalogue entries, so `tauforge design ...` reproduces any block on its own.
#include "demo.hpp"

#include "catalogue.hpp"
#include "engine.hpp"
#include "report_json.hpp"
#include "report_text.hpp"
#include "table.hpp"

#include <tauforge/networks/edge_detector.hpp>
#include <tauforge/networks/timer_monostable.hpp>

namespace tfcli {

namespace {

using tauforge::charset;

constexpr const char* board_temperature = "-20..70";

struct block_spec {
    const char* name;
    const char* purpose;
    const char* network;
    std::vector<std::string> settings, parts, spec;
    const char* resistors;
    const char* capacitors;
};

// The board's requirements (invented): the numbers a designer of this instrument was given.
const std::vector<block_spec>& blocks() {
    static const std::vector<block_spec> all{
        {"reset supervisor delay", "MCU reset held 20 ms .. 100 ms after the 3.3 V rail starts to rise (rise 0.5 ms .. 5 ms)",
         "rc_delay", {"supply=3.3V,5%", "threshold=0.55..0.75", "rise-time=0.5ms..5ms", "leakage=0..1uA"},
         {"R=100ppm", "C=X7R,16V,0805"}, {"delay=20ms..100ms"}, "E24,4.7k..220k", "E6,100n..10u,10%"},
        {"fault-LED pulse stretcher", "one-shot: the fault LED stays on 250 ms \u00B1 20 % on a 4.5 V .. 5.5 V rail",
         "timer_monostable",
         {"supply=4.5V..5.5V", "threshold=2/3+-0.02", "saturation=0V..0.1V", "propagation-delay=100ns..300ns",
          "threshold-bias=0..100nA"},
         {"R=50ppm", "C=300ppm"}, {"pulse-width=250ms,20%"}, "E96,10k..1M", "E6,100n..4.7u,5%"},
        {"fault edge trigger", "falling edge of the fault line into the one-shot's trigger: a pulse of 5 us .. 50 us",
         "edge_detector", {"supply=4.5V..5.5V", "step=4.5V..5.5V", "threshold=0.3..0.37"}, {"R=100ppm", "C=C0G"},
         {"pulse-width=5us..50us"}, "E24,1k..100k", "E12,100p..10n,5%"},
        {"buzzer oscillator", "alarm buzzer near 2.4 kHz \u00B1 10 %, duty 55 % .. 65 %", "timer_astable",
         {"supply=4.5V..5.5V", "lower-threshold=1/3+-0.005", "upper-threshold=2/3+-0.005", "saturation=0V..0.1V"},
         {"Ra=100ppm", "Rb=100ppm", "C=C0G"}, {"frequency=2.4kHz,10%", "duty=55%..65%"}, "E96,1k..220k",
         "E12,1n..100n,2%"},
        {"button debounce", "front-panel button: both delays 10 ms .. 50 ms (contact bounce up to 5 ms)", "debounce",
         {"supply=3.3V,5%", "upper-threshold=0.55..0.7", "lower-threshold=0.3..0.45"},
         {"R1=100ppm", "R2=100ppm", "C=X7R,16V,0603"}, {"press-delay=10ms..50ms", "release-delay=10ms..50ms"}, "E24,1k..470k",
         "E6,10n..10u,10%"},
    };
    return all;
}

request block_request(const block_spec& b, const mc_settings& mc) {
    request rq;
    rq.command = "design";
    rq.network = b.network;
    for (const auto& s : b.settings) rq.settings.push_back(split_assignment(s, "demo"));
    for (const auto& s : b.parts) rq.parts.push_back(split_assignment(s, "demo"));
    rq.spec = b.spec;
    rq.resistors = b.resistors;
    rq.capacitors = b.capacitors;
    rq.temperature = board_temperature;
    rq.top = 3;
    rq.mc = mc;
    return rq;
}

std::string command_line(const block_spec& b) {
    std::string s = std::string("tauforge design ") + b.network + " --temp=" + board_temperature;
    for (const auto& x : b.settings) s += " --set " + shell_quote(x);
    for (const auto& x : b.parts) s += " --part " + shell_quote(x);
    for (const auto& x : b.spec) s += " --spec " + shell_quote(x);
    return s + " --resistors " + shell_quote(b.resistors) + " --capacitors " + shell_quote(b.capacitors);
}

/// The board's ADC input (invented): a 12-bit converter samples a sensor of 100 Ω .. 470 Ω
/// through its switch; a 1 nF C0G at the pin shares its charge. The sampling window is
/// 71.5 cycles of a 14 MHz clock, 5.1 µs. Checked, not designed: the parts are given.
const block_spec& adc_block() {
    static const block_spec b{"ADC input settling", "12-bit ADC input settles to half an LSB within its 5.1 us sampling window",
                              "adc_settling",
                              {"source=100..470", "switch-resistance=500..1.5k", "sample-capacitance=5p..8p", "bits=12"},
                              {"Ce=1n,10%,C0G"}, {"acquisition-time<=5.1us"}, "", ""};
    return b;
}

const part_row* part_named(const design_result& d, const std::string& name) {
    for (const auto& p : d.best->parts)
        if (p.name == name) return &p;
    return nullptr;
}

/// The edge trigger checked against the one-shot it drives (edge_detector.hpp's check_trigger).
std::vector<std::string> trigger_findings(const design_result& edge, const design_result& one_shot) {
    using namespace tauforge;
    const operating_conditions env = parse_temperature(board_temperature, "");
    edge_detector e;
    e.r = {.nominal = resistance::from_value(part_named(edge, "R")->value), .tol = part_named(edge, "R")->tol, .tcr = ppm_band::symmetric(100)};
    e.c = {.nominal = capacitance::from_value(part_named(edge, "C")->value), .tol = part_named(edge, "C")->tol, .tempco = c0g};
    e.supply = ranged<voltage>::between(voltage::from_value(4.5), voltage::from_value(5.5));
    e.step = e.supply;
    e.threshold = ranged<double>::between(0.3, 0.37);
    e.conditions = env;
    timer_monostable m;
    m.r = {.nominal = resistance::from_value(part_named(one_shot, "R")->value), .tol = part_named(one_shot, "R")->tol,
           .tcr = ppm_band::symmetric(50)};
    m.c = {.nominal = capacitance::from_value(part_named(one_shot, "C")->value), .tol = part_named(one_shot, "C")->tol,
           .tempco = ppm_band::symmetric(300)};
    m.supply = ranged<voltage>::between(voltage::from_value(4.5), voltage::from_value(5.5));
    m.upper_threshold = ranged<double>::plus_minus(2.0 / 3.0, 0.02);
    m.discharge_saturation = ranged<voltage>::between(voltage::from_value(0.0), voltage::from_value(0.1));
    m.propagation_delay = ranged<duration>::between(duration::from_value(100e-9), duration::from_value(300e-9));
    m.threshold_bias = ranged<current>::between(current::from_value(0.0), current::from_value(100e-9));
    m.min_trigger_width = duration::from_value(1e-6);  // the timer part's shortest trigger (invented)
    m.conditions = env;
    std::vector<std::string> out;
    for (const auto& f : check_trigger(e, m))
        out.push_back(std::string(f.level == severity::violation ? "violation" : "warning") + " (" + std::string(f.rule) + "): " + f.message);
    for (const auto& f : check_design(m, ranged<duration>::between(duration::from_value(0.0), duration::from_value(0.0))))
        if (f.rule != "trigger_too_short")  // the trigger here is the edge detector's, checked above
            out.push_back(std::string(f.level == severity::violation ? "violation" : "warning") + " (" + std::string(f.rule) + "): " + f.message);
    return out;
}

std::string corner_summary(const std::vector<corner_entry>& c) {
    std::string s;
    for (const auto& e : c)
        if ((e.position == "low" || e.position == "high") && e.decides) s += (s.empty() ? "" : ", ") + e.parameter + " " + e.position;
    return s;
}

}  // namespace

demo_result run_demo(const mc_settings& mc) {
    demo_result d;
    d.title = "tauforge demo board: a small bench instrument";
    d.note = "a scenario of our own with invented data; every block designed from E-series value sets and checked at "
             "worst case over -20 \u00B0C .. 70 \u00B0C";
    for (const auto& b : blocks()) {
        demo_block blk{b.name, b.purpose, b.network, command_line(b), find_network(b.network).design(block_request(b, mc)), std::nullopt};
        d.feasible = d.feasible && blk.design->feasible;
        d.blocks.push_back(std::move(blk));
    }
    {
        const block_spec& b = adc_block();
        request rq = block_request(b, mc);
        rq.command = "check";
        std::string cmd = command_line(b);
        cmd = "tauforge check" + cmd.substr(std::string("tauforge design").size());
        cmd = cmd.substr(0, cmd.find(" --resistors"));
        d.blocks.push_back({b.name, b.purpose, b.network, cmd, std::nullopt, find_network(b.network).check(rq)});
        d.feasible = d.feasible && d.blocks.back().check->holds;
    }
    const auto& edge = *d.blocks[2].design;
    const auto& one_shot = *d.blocks[1].design;
    if (edge.feasible && one_shot.feasible) d.findings = trigger_findings(edge, one_shot);
    return d;
}

std::string text_demo(const demo_result& d, charset cs) {
    std::string out = d.title + "\n(" + d.note + ")\n";
    std::vector<std::vector<std::string>> bom;
    int rn = 0, cn = 0;
    for (std::size_t i = 0; i < d.blocks.size(); ++i) {
        const auto& b = d.blocks[i];
        out += "\n" + std::to_string(i + 1) + ". " + b.name + " (" + b.network + ")\n";
        out += "   requirement   " + b.purpose + "\n";
        const check_result* c = nullptr;
        if (b.design) {
            if (!b.design->feasible) {
                out += "   NO DESIGN     " + b.design->reason + "\n";
                continue;
            }
            c = &*b.design->best;
            out += "   searched      " + std::to_string(b.design->evaluated) + " candidate designs; design 1 of " +
                   std::to_string(b.design->designs.size()) + " ranked\n";
            out += "   reproduce     " + b.command + "\n";
        } else {
            c = &*b.check;
            out += "   reproduce     " + b.command + "\n";
        }
        std::string parts;
        for (const auto& p : c->parts) {
            parts += (parts.empty() ? "" : ", ") + p.name + " " + format_si(p.value, p.kind == "resistor" ? "\u03A9" : "F", cs) +
                     " " + format_band(p.tol, cs) + (p.tempco.empty() ? "" : " " + p.tempco) + " (" + p.origin + ")";
            const std::string ref = p.kind == "resistor" ? "R" + std::to_string(++rn) : "C" + std::to_string(++cn);
            bom.push_back({ref, format_si(p.value, p.kind == "resistor" ? "\u03A9" : "F", cs),
                           p.kind == "resistor" ? tauforge::format_rkm(tauforge::resistance::from_value(p.value))
                                                : tauforge::format_rkm(tauforge::capacitance::from_value(p.value)),
                           format_band(p.tol, cs), p.tempco.empty() ? "-" : p.tempco, p.origin, b.name + " " + p.name});
        }
        out += "   parts         " + parts + "\n";
        for (const auto& m : c->metrics) {
            if (!m.requirement) continue;
            out += "   " + m.name + "  " + format_si(m.min, m.unit, cs) + " .. " + format_si(m.max, m.unit, cs) + " at worst case, window " +
                   format_window(m.requirement->window, m.unit, cs) + ", margin " + format_si(m.margin, "", cs) +
                   (m.holds ? "" : "  FAILS") + "\n";
            out += "      minimum at " + corner_summary(m.min_corner) + "\n      maximum at " + corner_summary(m.max_corner) + "\n";
        }
        if (c->has_mc)
            out += "   Monte Carlo   every window held by " + yield_percent(c->joint_yield.estimate) + " of " +
                   std::to_string(c->mc.samples) + " samples (95 % interval " + yield_percent(c->joint_yield.low) + " .. " +
                   yield_percent(c->joint_yield.high) + ")\n";
    }
    out += "\nTrigger into the one-shot (edge_detector.hpp check_trigger, timer_monostable.hpp check_design)\n";
    if (d.findings.empty()) out += "  no violations or warnings: the trigger pulse is long enough and ends before the output pulse\n";
    for (const auto& f : d.findings) out += "  " + f + "\n";
    out += "\nBill of materials\n";
    text_table t({"ref", "value", "RKM", "tolerance", "temperature", "from", "block"}, "lrllll" "l");
    for (auto& row : bom) t.add(row);
    out += t.render();
    out += "\nResults are design estimates from component models and the ranges above, not measurements: verify every\n"
           "timing on real hardware over the real temperature and supply range, and follow the applicable standards\n"
           "for safety-relevant functions.\n";
    return out;
}

nlohmann::ordered_json json_demo(const demo_result& d) {
    using json = nlohmann::ordered_json;
    json blocks = json::array();
    for (const auto& b : d.blocks) {
        json j = {{"name", b.name}, {"purpose", b.purpose}, {"network", b.network}, {"command", b.command}};
        j["design"] = b.design ? json_design(*b.design) : json(nullptr);
        j["check"] = b.check ? json_check(*b.check) : json(nullptr);
        blocks.push_back(j);
    }
    return {{"title", d.title}, {"note", d.note}, {"feasible", d.feasible}, {"blocks", blocks}, {"findings", d.findings}};
}

}  // namespace tfcli
