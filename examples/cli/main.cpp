// tauforge: the command-line front end of the tauforge library.
//
//   tauforge pick TARGET [--from SET] [--pairs K] [--kind R|C]
//   tauforge design NETWORK --spec WINDOW... [network options] [--resistors SET] [--capacitors SET] [--slot NAME=SET]
//   tauforge check NETWORK --part NAME=PART... [network options] [--spec WINDOW...]
//   tauforge limits NETWORK --part ... --spec WINDOW... --uncertainty U [--coverage K]
//   tauforge readback NETWORK --part ... --measured METRIC=VALUE --solve NAME [--uncertainty U]
//   tauforge demo
//   tauforge networks [NAME]
//   tauforge run REQUEST.json | -
//
// Every report is built in memory first and written only when complete: an error
// leaves stdout empty and says on one stderr line what was wrong.
#include "c_header.hpp"
#include "catalogue.hpp"
#include "common.hpp"
#include "demo.hpp"
#include "pick.hpp"
#include "report_json.hpp"
#include "report_text.hpp"
#include "requests.hpp"
#include "svg.hpp"

#include <tauforge/error.hpp>

#include <CLI/CLI.hpp>
#include <nlohmann/json.hpp>

#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <iostream>
#include <new>
#include <optional>
#include <string>
#include <vector>

#ifndef TAUFORGE_CLI_VERSION
#define TAUFORGE_CLI_VERSION "unknown"
#endif

namespace tfcli {
namespace {

/// Flags as typed, before they are split into name/value pairs.
struct raw_flags {
    std::vector<std::string> parts, settings, slots;
    std::string request_file;
};

/// What a run produced, all in memory.
struct outcome {
    int status = exit_ok;
    std::string text;                  ///< the human report
    nlohmann::ordered_json json;               ///< the JSON report
    std::optional<check_result> plot;  ///< the design the SVG and C header describe
    std::string heading;               ///< plot and header title
    std::string message;               ///< one stderr line for statuses 3 and 4
};

void add_output_options(CLI::App* sub, request& rq, bool plots) {
    sub->add_flag("--json", rq.out.json, "write the JSON report to stdout instead of the tables");
    sub->add_option("--json-file", rq.out.json_file, "also write the JSON report to FILE")->type_name("FILE");
    sub->add_flag("--ascii", rq.out.ascii, "tables in ASCII (ohm, u, +/-) instead of UTF-8");
    if (!plots) return;
    sub->add_option("--svg", rq.out.svg_file, "write the waveform and Monte Carlo histogram as SVG")->type_name("FILE");
    sub->add_option("--c-header", rq.out.c_header_file, "write the timings as a C header of constants")->type_name("FILE");
    sub->add_option("--c-prefix", rq.out.c_prefix, "macro prefix of the C header (default: the network's name)")->type_name("NAME");
}

void add_network_options(CLI::App* sub, request& rq, raw_flags& raw) {
    sub->add_option("network", rq.network, "the network: tauforge networks lists them")->required();
    sub->add_option("--part", raw.parts, "a part: NAME=VALUE,TOLERANCE[,TEMPCO], e.g. R=100k,1% or C=2u2,10%,X7R")
        ->type_name("NAME=PART")
        ->allow_extra_args(false);
    sub->add_option("--set", raw.settings, "a setting: NAME=VALUE, e.g. supply=4.5V..5.5V or threshold=2/3+-0.02")
        ->type_name("NAME=VALUE")
        ->allow_extra_args(false);
    sub->add_option("--temp", rq.temperature, "operating temperature range in degrees C, e.g. --temp=-20..70 (default 25)")
        ->type_name("A..B");
    sub->add_option("--temp-ref", rq.temperature_ref, "reference temperature of the marked values (default 25)")->type_name("T");
    sub->add_option("--service-life", rq.service_life,
                    "how long the parts age in service, in hours or years (5000h, 10y; default new parts)")
        ->type_name("T");
    sub->add_flag("--example", rq.example, "fill in the catalogue's example parts, settings and spec where none are given");
}

void add_spec_option(CLI::App* sub, request& rq, const char* help) {
    sub->add_option("--spec", rq.spec, help)->type_name("WINDOW")->allow_extra_args(false);
}

void add_mc_options(CLI::App* sub, request& rq) {
    sub->add_option("--samples", rq.mc.samples, "Monte Carlo samples (0: none; default 100000)")->type_name("N");
    sub->add_option("--seed", rq.mc.seed, "Monte Carlo seed: the same seed gives the same result (default 1)")->type_name("S");
    sub->add_option("--threads", rq.mc.threads, "Monte Carlo threads, 0 for one per core; the result does not depend on it")
        ->type_name("T")
        ->check(CLI::Range(0u, 256u));
    sub->add_option("--distribution", rq.mc.distribution, "each range as a truncated normal (default) or uniform")
        ->type_name("normal|uniform");
    sub->add_option("--sigmas", rq.mc.sigmas, "a range's half-width in standard deviations (default 3)")->type_name("K");
}

std::string shell_words(int argc, char** argv) {
    std::string s = "tauforge";
    for (int i = 1; i < argc; ++i) s += " " + shell_quote(argv[i]);
    return s;
}

outcome execute(const request& rq, tauforge::charset cs) {
    outcome o;
    const std::string& cmd = rq.command;
    if (cmd == "networks") {
        if (rq.network.empty()) {
            o.text = text_networks(catalogue());
            o.json = report_header(cmd, exit_ok);
            o.json["networks"] = json_networks(catalogue());
        } else {
            const auto& e = find_network(rq.network);
            o.text = text_network(e);
            o.json = report_header(cmd, exit_ok);
            o.json["networks"] = json_networks({e});
        }
        return o;
    }
    if (cmd == "pick") {
        const auto p = run_pick(rq);
        o.text = text_pick(p, cs);
        o.json = report_header(cmd, exit_ok);
        o.json["pick"] = json_pick(p);
        return o;
    }
    if (cmd == "demo") {
        const auto d = run_demo(rq.mc);
        o.status = d.feasible ? exit_ok : exit_infeasible;
        o.text = text_demo(d, cs);
        o.json = report_header(cmd, o.status);
        o.json["board"] = json_demo(d);
        if (!d.feasible) o.message = "a block of the demo board has no design that holds its spec";
        return o;
    }
    if (cmd == "design" || cmd == "check" || cmd == "limits" || cmd == "readback") {
        if (rq.network.empty()) throw usage_error(cmd + " needs a network; expected e.g. tauforge " + cmd + " timer_monostable");
        const auto& e = find_network(rq.network);
        if (cmd == "design") {
            const auto d = e.design(rq);
            o.status = d.feasible ? exit_ok : exit_infeasible;
            o.text = text_design(d, cs);
            o.json = report_header(cmd, o.status);
            o.json["design"] = json_design(d);
            if (d.best) o.plot = *d.best;
            o.heading = "tauforge design: " + d.network + ", design 1 \u2014 " + d.title;
            if (!d.feasible) o.message = "infeasible: " + d.reason;
        } else if (cmd == "readback") {
            const auto b = e.readback(rq);
            o.text = text_readback(b, cs);
            o.json = report_header(cmd, exit_ok);
            o.json["check"] = json_check(b.marked);
            o.json["readback"] = json_readback(b);
        } else {
            const auto c = e.check(rq);
            o.status = cmd == "check" && c.has_spec && !c.holds ? exit_spec_not_met : exit_ok;
            o.text = cmd == "check" ? text_check(c, cs) : text_limits(c, cs);
            o.json = report_header(cmd, o.status);
            o.json["check"] = json_check(c);
            if (cmd == "limits") o.json["limits"] = json_limits(c.limits);
            o.plot = c;
            o.heading = "tauforge " + cmd + ": " + c.network + " \u2014 " + c.title;
            if (o.status == exit_spec_not_met) {
                std::string which;
                for (const auto& m : c.metrics)
                    if (m.requirement && !m.holds) which += (which.empty() ? "" : ", ") + m.name + " " + format_window(m.requirement->window, m.unit);
                o.message = "spec not met at worst case: " + which;
            }
        }
        return o;
    }
    throw usage_error("command \"" + cmd + "\" is unknown; expected pick, design, check, limits, readback, demo or networks");
}

void write_file(const std::string& path, const std::string& content, const char* what) {
    std::ofstream f(path, std::ios::binary | std::ios::trunc);
    if (!f) throw usage_error(std::string(what) + " \"" + path + "\": cannot open the file for writing");
    f << content;
    f.close();
    if (!f) throw usage_error(std::string(what) + " \"" + path + "\": cannot write the file");
}

/// Test hook: TAUFORGE_CLI_FAULT=internal makes a run fail as a bug would, so the
/// mapping of unexpected failures to exit status 1 is tested.
void fault_hook() {
    if (const char* f = std::getenv("TAUFORGE_CLI_FAULT"); f && std::string(f) == "internal")
        throw std::logic_error("fault injected by TAUFORGE_CLI_FAULT=internal");
}

int run(int argc, char** argv) {
    request rq;
    raw_flags raw;
    CLI::App app{"tauforge: RC timing networks from a requirement to purchasable parts, checked at worst case.\n"
                 "Results are design estimates: verify on hardware.",
                 "tauforge"};
    app.set_version_flag("--version", "tauforge " TAUFORGE_CLI_VERSION);
    app.require_subcommand(1);
    app.footer(
        "Values: 4k7, 100n, 2u2, 250ms, 2.4kHz, 5V.  Tolerances: 5%, +80/-20%, or IEC 60062 letters (J = 5 %).\n"
        "Ranges: X, A..B, X,TOL, X+-D.  Windows: METRIC=A..B, METRIC=X,TOL, METRIC>=A, METRIC<=B.\n"
        "Value sets: E24, E24,1k..1M, E96,1k..1M,1%, @stock.txt (a file of values, one per line).\n"
        "Exit status: 0 done, 2 bad input, 3 no design holds the spec, 4 the parts do not hold the spec, 1 internal error.");

    auto* networks = app.add_subcommand("networks", "list the catalogue of networks, or describe one");
    networks->add_option("network", rq.network, "a network to describe");
    add_output_options(networks, rq, false);

    auto* pick = app.add_subcommand("pick", "preferred values and two-part series/parallel combinations for a target");
    pick->add_option("target", rq.target, "the value wanted: 4k8, 330n, 15.8 kohm")->required();
    pick->add_option("--from", rq.from, "value set (default E24 for R, E12 for C, two decades around the target)")->type_name("SET");
    pick->add_option("--pairs", rq.pairs, "combinations per connection (default 3)")->type_name("K");
    pick->add_option("--kind", rq.kind, "R or C when the target could be either (\"470\")")->type_name("R|C");
    add_output_options(pick, rq, false);

    auto* design = app.add_subcommand("design", "choose parts from value sets so the spec holds at worst case; rank the designs");
    add_network_options(design, rq, raw);
    add_spec_option(design, rq, "a window the design must hold at worst case, e.g. pulse-width=250ms,20% (repeatable)");
    design->add_option("--resistors", rq.resistors, "value set of every resistor (default E24, 1 kohm .. 1 Mohm)")->type_name("SET");
    design->add_option("--capacitors", rq.capacitors, "value set of every capacitor (default E12, 1 nF .. 10 uF)")->type_name("SET");
    design->add_option("--slot", raw.slots, "value set of one part: NAME=SET, e.g. Ra=E96,1k..100k")
        ->type_name("NAME=SET")
        ->allow_extra_args(false);
    design->add_option("--top", rq.top, "designs to rank (default 5)")->type_name("K");
    add_mc_options(design, rq);
    add_output_options(design, rq, true);

    auto* check = app.add_subcommand("check", "worst case, sensitivities, RSS and Monte Carlo yield of given parts");
    add_network_options(check, rq, raw);
    add_spec_option(check, rq, "a window to check, e.g. pulse-width=225ms..275ms (repeatable)");
    check->add_option("--metric", rq.metric, "the metric to plot (default: the first spec's)")->type_name("METRIC");
    add_mc_options(check, rq);
    add_output_options(check, rq, true);

    auto* limits = app.add_subcommand("limits", "production test limits: guard-banded acceptance window and false-reject rate");
    add_network_options(limits, rq, raw);
    add_spec_option(limits, rq, "a window a good unit meets (repeatable)");
    limits->add_option("--metric", rq.metric, "without a spec: guard this metric's worst-case spread")->type_name("METRIC");
    limits->add_option("--uncertainty", rq.uncertainty, "the tester's standard uncertainty u: 0.5ms, or 1% of nominal")
        ->type_name("U")
        ->required();
    limits->add_option("--coverage", rq.coverage, "coverage factor k, guard band U = k u (default 2)")->type_name("K");
    add_mc_options(limits, rq);
    add_output_options(limits, rq, true);

    auto* readback = app.add_subcommand("readback", "read a part's value back from a measured timing");
    add_network_options(readback, rq, raw);
    readback->add_option("--measured", rq.measured, "the measurement: METRIC=VALUE, e.g. pulse-width=1.15ms")
        ->type_name("METRIC=VALUE")
        ->required();
    readback->add_option("--solve", rq.solve, "the part (or parameter) to read back, e.g. C")->type_name("NAME")->required();
    readback->add_option("--uncertainty", rq.uncertainty, "standard uncertainty of the measurement: 5us or 0.5%")->type_name("U");
    readback->add_option("--coverage", rq.coverage, "coverage factor k (default 2)")->type_name("K");
    add_output_options(readback, rq, false);

    auto* demo = app.add_subcommand("demo", "design the demo board: a bench instrument of our own with invented data");
    demo->add_option("--samples", rq.mc.samples, "Monte Carlo samples per block (default 20000)")->type_name("N");
    demo->add_option("--seed", rq.mc.seed, "Monte Carlo seed (default 1)")->type_name("S");
    add_output_options(demo, rq, false);

    auto* runreq = app.add_subcommand("run", "run a JSON request (a file, or - for stdin); its keys mirror the flags");
    runreq->add_option("request", raw.request_file, "the request file, or - for stdin")->required();
    add_output_options(runreq, rq, true);

    rq.mc.samples = 0;  // marks "not given" until after parsing
    try {
        app.parse(argc, argv);
    } catch (const CLI::CallForHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForAllHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForVersion& e) {
        return app.exit(e);
    } catch (const CLI::ParseError& e) {
        throw usage_error(std::string(e.what()) + " (tauforge --help shows the usage)");
    }
    fault_hook();

    const CLI::App* sub = app.get_subcommands().front();
    const bool samples_given = sub->get_option_no_throw("--samples") && sub->get_option_no_throw("--samples")->count() > 0;
    if (sub->get_name() == "run") {
        const output_options cli_out = rq.out;
        rq = request_from_json(read_request_text(raw.request_file), raw.request_file == "-" ? "stdin" : raw.request_file);
        if (cli_out.json) rq.out.json = true;
        if (cli_out.ascii) rq.out.ascii = true;
        if (!cli_out.json_file.empty()) rq.out.json_file = cli_out.json_file;
        if (!cli_out.svg_file.empty()) rq.out.svg_file = cli_out.svg_file;
        if (!cli_out.c_header_file.empty()) rq.out.c_header_file = cli_out.c_header_file;
        if (!cli_out.c_prefix.empty()) rq.out.c_prefix = cli_out.c_prefix;
        if (rq.command == "run") throw usage_error("request: command = \"run\" is invalid; expected the command to run");
    } else {
        rq.command = sub->get_name();
        for (const auto& p : raw.parts) rq.parts.push_back(split_assignment(p, "--part"));
        for (const auto& s : raw.settings) rq.settings.push_back(split_assignment(s, "--set"));
        for (const auto& s : raw.slots) rq.slots.push_back(split_assignment(s, "--slot"));
        if (!samples_given) rq.mc.samples = rq.command == "demo" ? 20'000 : 100'000;
    }

    const tauforge::charset cs = rq.out.ascii ? tauforge::charset::ascii : tauforge::charset::unicode;
    outcome o = execute(rq, cs);
    if (cs == tauforge::charset::ascii) o.text = ascii_text(o.text);

    // Everything in memory before anything is written.
    const std::string json_text = o.json.dump(2) + "\n";
    std::string svg_text, header_text;
    const bool wants_plot = !rq.out.svg_file.empty() || !rq.out.c_header_file.empty();
    if (wants_plot && !o.plot && o.status == exit_ok)
        throw usage_error("--svg and --c-header apply to design, check and limits");
    if (o.plot) {
        if (!rq.out.svg_file.empty()) svg_text = svg_plot(*o.plot, o.heading);
        if (!rq.out.c_header_file.empty())
            header_text = c_header(*o.plot, rq.out.c_prefix.empty() ? default_c_prefix(o.plot->network) : rq.out.c_prefix,
                                   sub->get_name() == "run" ? "request " + raw.request_file : shell_words(argc, argv));
    }
    if (!svg_text.empty()) write_file(rq.out.svg_file, svg_text, "svg");
    if (!header_text.empty()) write_file(rq.out.c_header_file, header_text, "c-header");
    if (!rq.out.json_file.empty()) write_file(rq.out.json_file, json_text, "json-file");
    const std::string& shown = rq.out.json ? json_text : o.text;
    std::fwrite(shown.data(), 1, shown.size(), stdout);
    if (std::fflush(stdout) != 0 || std::ferror(stdout)) throw std::runtime_error("cannot write the report to stdout");
    if (!o.message.empty()) std::fprintf(stderr, "tauforge: %s\n", o.message.c_str());
    return o.status;
}

/// One line: newlines of multi-line library messages (a stock file's bad lines) become "; ".
std::string one_line(std::string s) {
    for (std::size_t p = s.find('\n'); p != std::string::npos; p = s.find('\n', p)) s.replace(p, 1, "; ");
    return s;
}

}  // namespace
}  // namespace tfcli

int main(int argc, char** argv) {
    using namespace tfcli;
    try {
        return run(argc, argv);
    } catch (const usage_error& e) {
        std::fprintf(stderr, "tauforge: error: %s\n", one_line(e.what()).c_str());
        return exit_usage;
    } catch (const tauforge::invalid_argument& e) {
        std::fprintf(stderr, "tauforge: error: %s\n", one_line(e.what()).c_str());
        return exit_usage;
    } catch (const tauforge::domain_error& e) {
        std::fprintf(stderr, "tauforge: error: %s\n", one_line(e.what()).c_str());
        return exit_usage;
    } catch (const std::bad_alloc&) {
        std::fprintf(stderr, "tauforge: internal error: out of memory\n");
        return exit_internal;
    } catch (const std::exception& e) {
        std::fprintf(stderr, "tauforge: internal error: %s\n", one_line(e.what()).c_str());
        return exit_internal;
    } catch (...) {
        std::fprintf(stderr, "tauforge: internal error: unknown exception\n");
        return exit_internal;
    }
}
