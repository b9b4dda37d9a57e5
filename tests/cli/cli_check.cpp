// Checks of the tauforge command line's JSON reports, driven by ctest (cli_case.cmake):
//
//   cli_check golden ACTUAL.json GOLDEN.json   structure and values equal to the golden report
//                                              (numbers to 1e-9 relative; "version" ignored;
//                                              TAUFORGE_UPDATE_GOLDEN=1 rewrites the golden file)
//   cli_check valid FILE.json [STATUS]         a complete report (tool, command, status, exit code)
//   cli_check same A.json B.json               two reports equal (a JSON request against flags)
//   cli_check crosscheck CASE FILE.json        the numbers against the library's own API and
//                                              against references outside the code under test
//   cli_check catalogue TAUFORGE               every network of the catalogue runs check and design
//
// Exits 0 when every check holds; otherwise prints each failure and exits 1.
#include <tauforge/tauforge.hpp>
#include <tauforge/networks/timer_monostable.hpp>

#include <nlohmann/json.hpp>

#include <sys/wait.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <iostream>
#include <numbers>
#include <sstream>
#include <string>
#include <vector>

using json = nlohmann::ordered_json;
using namespace tauforge::literals;

namespace {

int failures = 0;

void fail(const std::string& what) {
    std::cerr << "FAIL: " << what << "\n";
    ++failures;
}

json load(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) {
        std::cerr << "FAIL: cannot open " << path << "\n";
        std::exit(1);
    }
    try {
        return json::parse(in);
    } catch (const std::exception& e) {
        std::cerr << "FAIL: " << path << " is not valid JSON: " << e.what() << "\n";
        std::exit(1);
    }
}

bool close(double a, double b, double rel, double abs_tol = 0.0) {
    return std::abs(a - b) <= std::max(rel * std::max(std::abs(a), std::abs(b)), abs_tol);
}

/// value == expected within rel (and abs_tol), named in the message.
void expect_near(const std::string& what, double value, double expected, double rel, double abs_tol = 0.0) {
    if (!close(value, expected, rel, abs_tol)) {
        char buf[160];
        std::snprintf(buf, sizeof buf, " = %.17g, expected %.17g (rel %.1e, abs %.1e)", value, expected, rel, abs_tol);
        fail(what + buf);
    }
}

void expect(bool ok, const std::string& what) {
    if (!ok) fail(what);
}

double si(const json& q) { return q.at("value").get<double>(); }

// ---- golden comparison -----------------------------------------------------------

void compare(const json& a, const json& g, const std::string& path) {
    if (path == "/version") return;
    if (a.type() != g.type() && !(a.is_number() && g.is_number())) {
        fail(path + ": type " + std::string(a.type_name()) + ", golden " + g.type_name());
        return;
    }
    if (a.is_object()) {
        for (const auto& [k, v] : g.items())
            if (!a.contains(k)) fail(path + "/" + k + ": missing");
        for (const auto& [k, v] : a.items()) {
            if (!g.contains(k)) fail(path + "/" + k + ": not in the golden report");
            else compare(v, g[k], path + "/" + k);
        }
    } else if (a.is_array()) {
        if (a.size() != g.size()) {
            fail(path + ": " + std::to_string(a.size()) + " elements, golden " + std::to_string(g.size()));
            return;
        }
        for (std::size_t i = 0; i < a.size(); ++i) compare(a[i], g[i], path + "/" + std::to_string(i));
    } else if (a.is_number()) {
        const double x = a.get<double>(), y = g.get<double>();
        if (!close(x, y, 1e-9, 1e-300)) {
            char buf[96];
            std::snprintf(buf, sizeof buf, ": %.17g, golden %.17g", x, y);
            fail(path + buf);
        }
    } else if (a != g) {
        fail(path + ": " + a.dump() + ", golden " + g.dump());
    }
}

// ---- cross-checks against the library and against outside references --------------

/// R 100 kΩ ±1 %, C 10 nF ±10 %: the REFERENCES.md one-shot.
tauforge::timer_monostable reference_one_shot() {
    tauforge::timer_monostable m;
    m.r = {.nominal = 100_kohm, .tol = tauforge::tolerance::symmetric(0.01)};
    m.c = {.nominal = 10_nF, .tol = tauforge::tolerance::symmetric(0.10)};
    return m;
}

template <class N>
tauforge::monte_carlo_result<tauforge::parameter_count_v<N>, tauforge::metric_count_v<N>> library_mc(
    const N& n, const json& check, std::size_t metric, std::optional<tauforge::spec_window> w) {
    tauforge::monte_carlo_options<N> o;
    o.seed = check.at("monte_carlo").at("seed").get<std::uint64_t>();
    o.samples = check.at("monte_carlo").at("samples").get<std::size_t>();
    o.worst_samples = 0;
    o.keep_distribution = true;
    if (w) o.spec[metric] = *w;
    return tauforge::monte_carlo(n, o);
}

/// The Monte Carlo block of a metric against the library's run with the same seed.
template <class Stats>
void compare_mc(const std::string& what, const json& m, const Stats& st) {
    const json& mc = m.at("monte_carlo");
    expect_near(what + " mean", si(mc.at("mean")), st.mean, 1e-12);
    expect_near(what + " stddev", si(mc.at("stddev")), st.stddev, 1e-12);
    expect_near(what + " min", si(mc.at("min")), st.min, 1e-12);
    expect_near(what + " max", si(mc.at("max")), st.max, 1e-12);
    expect(mc.at("percentiles").size() == st.percentiles.size(), what + " percentile count");
    for (std::size_t i = 0; i < st.percentiles.size() && i < mc.at("percentiles").size(); ++i)
        expect_near(what + " percentile " + std::to_string(i), si(mc.at("percentiles")[i].at("value")), st.percentiles[i].value, 1e-12);
    std::size_t total = 0;
    for (const auto& c : mc.at("histogram").at("counts")) total += c.get<std::size_t>();
    expect(total == st.distribution.size(), what + " histogram holds every sample");
}

void crosscheck_monostable(const json& r) {
    // tauforge check timer_monostable --part R=100k,1% --part C=10n,10% --spec pulse-width=0.9ms..1.3ms --seed 7 --samples 20000
    const json& c = r.at("check");
    const json& m = c.at("metrics")[0];
    expect(m.at("name") == "pulse width", "metric 0 is the pulse width");
    // REFERENCES.md, "one-shot, 100 kΩ ±1 %, 10 nF ±10 %, ln 3" (computed): nominal 1.09861 ms;
    // extremes 0.97886 .. 1.22056 ms; RSS ±10.05 %. Rounded values: half a unit of the last digit.
    expect_near("nominal vs REFERENCES", si(m.at("nominal")), 1.09861e-3, 0.0, 0.5e-8);
    expect_near("minimum vs REFERENCES", si(m.at("worst_case").at("min")), 0.97886e-3, 0.0, 0.5e-8);
    expect_near("maximum vs REFERENCES", si(m.at("worst_case").at("max")), 1.22056e-3, 0.0, 0.5e-8);
    expect_near("RSS band vs REFERENCES", m.at("rss").at("relative_half_band").get<double>(), 0.1005, 0.0, 0.5e-4);
    // Derivation: t = R C ln 3, so the extremes are at R (1 -/+ 1 %) C (1 -/+ 10 %).
    expect_near("minimum = 0.99 R x 0.9 C ln 3", si(m.at("worst_case").at("min")), 0.99 * 100e3 * 0.9 * 10e-9 * std::log(3.0), 1e-12);
    expect_near("maximum = 1.01 R x 1.1 C ln 3", si(m.at("worst_case").at("max")), 1.01 * 100e3 * 1.1 * 10e-9 * std::log(3.0), 1e-12);
    expect(m.at("worst_case").at("min").at("corner")[0].at("position") == "low", "minimum at R low");
    expect(m.at("worst_case").at("min").at("corner")[1].at("position") == "low", "minimum at C low");
    expect(m.at("worst_case").at("max").at("corner")[1].at("position") == "high", "maximum at C high");
    // t is proportional to R and to C: normalized sensitivities 1 (derivation).
    expect_near("sensitivity to R", m.at("sensitivity")[0].at("normalized").get<double>(), 1.0, 1e-6);
    expect_near("sensitivity to C", m.at("sensitivity")[1].at("normalized").get<double>(), 1.0, 1e-6);
    // The library's API on the same network.
    const auto net = reference_one_shot();
    const auto wc = tauforge::worst_case(net);
    expect_near("minimum vs worst_case()", si(m.at("worst_case").at("min")), wc[0].min.value, 1e-15);
    expect_near("maximum vs worst_case()", si(m.at("worst_case").at("max")), wc[0].max.value, 1e-15);
    // RSS (derivation): t is proportional to R C, so sigma_t / t = sqrt((0.01/3)^2 + (0.10/3)^2) with each
    // tolerance read as 3 sigma (common practice).
    expect_near("RSS sigma", si(m.at("rss").at("sigma")), wc[0].nominal * std::hypot(0.01 / 3.0, 0.10 / 3.0), 1e-6);
    const tauforge::spec_window w = tauforge::spec_window::between(0.9e-3, 1.3e-3);
    const auto mc = library_mc(net, c, 0, w);
    compare_mc("pulse width", m, mc[0]);
    expect(m.at("spec").at("inside").get<std::size_t>() == mc[0].inside, "samples inside the window vs monte_carlo()");
    expect_near("yield vs monte_carlo()", m.at("spec").at("yield").at("estimate").get<double>(), mc[0].yield.estimate, 1e-15);
    expect_near("yield interval low vs monte_carlo()", m.at("spec").at("yield").at("low").get<double>(), mc[0].yield.low, 1e-12);
    // Margin: distance of the worst case inside the window over the half-window (derivation).
    const double lo = wc[0].min.value, hi = wc[0].max.value;
    expect_near("margin", m.at("spec").at("margin").get<double>(), std::min(lo - 0.9e-3, 1.3e-3 - hi) / 0.2e-3, 1e-12);
    expect(m.at("spec").at("worst_case_holds") == true, "the window holds");
    expect(r.at("status") == "ok" && r.at("exit_code") == 0, "status ok");
}

void crosscheck_design(const json& r) {
    // tauforge design rc_delay --spec delay=1ms,20% --resistors E24,1k..1M --capacitors E12,1n..1u --top 3 --samples 0
    const json& d = r.at("design");
    expect(d.at("feasible") == true, "feasible");
    expect(d.at("designs").size() == 3, "three designs");
    // README.md's first example prints these three designs (its output is compared in CI).
    const double readme[3][2] = {{1.1e3, 820e-9}, {11e3, 82e-9}, {110e3, 8.2e-9}};
    tauforge::rc_delay net;
    tauforge::timing_spec<tauforge::rc_delay> spec;
    spec.around("delay", 1_ms, tauforge::tolerance::symmetric(0.20));
    const auto rs = tauforge::value_set<tauforge::resistance>::from_series(tauforge::e_series::e24, 1_kohm, 1_Mohm);
    const auto cs = tauforge::value_set<tauforge::capacitance>::from_series(tauforge::e_series::e12, 1_nF, 1_uF);
    const auto lib = tauforge::synthesize(net, spec, {tauforge::candidates(rs), tauforge::candidates(cs)}, {.top_k = 3});
    expect(lib.designs.size() == 3, "library: three designs");
    for (std::size_t i = 0; i < 3 && i < lib.designs.size(); ++i) {
        const json& x = d.at("designs")[i];
        const std::string n = "design " + std::to_string(i + 1);
        expect_near(n + " R vs README", si(x.at("parts")[0].at("value")), readme[i][0], 1e-12);
        expect_near(n + " C vs README", si(x.at("parts")[1].at("value")), readme[i][1], 1e-12);
        expect_near(n + " R vs synthesize()", si(x.at("parts")[0].at("value")), lib.designs[i].parts[0].value, 0.0);
        expect_near(n + " C vs synthesize()", si(x.at("parts")[1].at("value")), lib.designs[i].parts[1].value, 0.0);
        expect_near(n + " margin vs synthesize()", x.at("margin").get<double>(), lib.designs[i].margin, 1e-15);
        expect_near(n + " worst min vs synthesize()", si(x.at("metrics")[0].at("min")), lib.designs[i].worst_min[0], 1e-15);
        expect_near(n + " worst max vs synthesize()", si(x.at("metrics")[0].at("max")), lib.designs[i].worst_max[0], 1e-15);
        // Derivation: delay = R C ln 3 with R at ±5 % and C at ±10 %.
        expect_near(n + " worst min = 0.95 R x 0.9 C ln 3", si(x.at("metrics")[0].at("min")),
                    0.95 * readme[i][0] * 0.9 * readme[i][1] * std::log(3.0), 1e-12);
    }
    expect(d.at("search").at("slots")[0].at("count") == rs.size(), "R candidates counted");
    expect(d.at("search").at("slots")[1].at("count") == cs.size(), "C candidates counted");
    expect(d.at("best").at("monte_carlo").is_null(), "no Monte Carlo with --samples 0");
}

void crosscheck_pick(const json& r) {
    // tauforge pick 4k8 --from E24
    const json& p = r.at("pick");
    const auto set = tauforge::value_set<tauforge::resistance>::from_series(tauforge::e_series::e24, 48_ohm, 480_kohm);
    expect(p.at("count") == set.size(), "value count of E24 48 Ω .. 480 kΩ");
    // IEC 60063 E24 (from memory) has 4.7 and 5.1 around 4.8: 4.8/4.7 = 1.021 < 5.1/4.8 = 1.0625.
    expect_near("nearest", si(p.at("nearest").at("value")), 4700.0, 0.0);
    expect_near("below", si(p.at("below")), 4700.0, 0.0);
    expect_near("above", si(p.at("above")), 5100.0, 0.0);
    // 1.2 kΩ + 3.6 kΩ = 4.8 kΩ exactly (both in E24).
    const json& s0 = p.at("series")[0];
    expect_near("best series pair error", s0.at("error").get<double>(), 0.0, 0.0, 1e-15);
    expect_near("best series pair sums to the target", si(s0.at("first")) + si(s0.at("second")), 4800.0, 1e-15);
    for (const auto how : {tauforge::connection::series, tauforge::connection::parallel}) {
        const auto lib = tauforge::best_pairs(set, 4.8_kohm, how, 3);
        const json& a = p.at(how == tauforge::connection::series ? "series" : "parallel");
        const std::string n(tauforge::connection_name(how));
        expect(a.size() == lib.size(), n + ": three pairs");
        for (std::size_t i = 0; i < lib.size() && i < a.size(); ++i) {
            expect_near(n + " pair first vs best_pairs()", si(a[i].at("first")), lib[i].first.value.value(), 0.0);
            expect_near(n + " pair second vs best_pairs()", si(a[i].at("second")), lib[i].second.value.value(), 0.0);
            expect_near(n + " pair error vs best_pairs()", a[i].at("error").get<double>(), lib[i].error, 0.0, 1e-300);
            // Derivation: series adds, parallel is the reciprocal of the summed reciprocals.
            const double x = si(a[i].at("first")), y = si(a[i].at("second"));
            expect_near(n + " pair value", si(a[i].at("value")), how == tauforge::connection::series ? x + y : 1.0 / (1.0 / x + 1.0 / y), 1e-15);
        }
    }
}

void crosscheck_limits(const json& r) {
    // tauforge limits timer_monostable --part R=100k,1% --part C=10n,10% --spec pulse-width=0.9ms..1.3ms
    //          --uncertainty 5us --samples 20000 --seed 7
    const json& l = r.at("limits")[0];
    // Guard band U = k u = 2 x 5 µs on each side (the rule in test_limits.hpp).
    expect_near("acceptance low", si(l.at("acceptance").at("low")), 0.9e-3 + 10e-6, 1e-12);
    expect_near("acceptance high", si(l.at("acceptance").at("high")), 1.3e-3 - 10e-6, 1e-12);
    expect_near("guard", si(l.at("uncertainty").at("expanded")), 10e-6, 1e-12);
    const auto net = reference_one_shot();
    const auto mc = library_mc(net, r.at("check"), 0, tauforge::spec_window::between(0.9e-3, 1.3e-3));
    const auto t = tauforge::production_test_limits(mc[0], tauforge::spec_window::between(0.9e-3, 1.3e-3), {5e-6, 2.0});
    const json& rates = l.at("rates");
    expect_near("false reject rate vs production_test_limits()", rates.at("false_reject_rate").get<double>(), t.rates.false_reject_rate, 1e-12, 1e-300);
    expect_near("reject fraction vs production_test_limits()", rates.at("reject_fraction").get<double>(), t.rates.reject_fraction, 1e-12, 1e-300);
    expect_near("good fraction vs production_test_limits()", rates.at("good_fraction").get<double>(), t.rates.good_fraction, 1e-15);
    // Independent: every sample lies 70 µs or more inside the acceptance window here, so a
    // 5 µs measurement error rejects a good unit with probability below Phi(-14): about 0.
    expect(rates.at("false_reject_rate").get<double>() < 1e-30, "false rejects negligible 14 sigma inside the limits");
}

void crosscheck_readback(const json& r) {
    // tauforge readback timer_monostable --part R=100k,1% --part C=10n,10% --measured pulse-width=1.15ms --solve C --uncertainty 5us
    const json& b = r.at("readback");
    const double ln3 = std::log(3.0);
    // Derivation: t = R C ln 3, so C = t / (R ln 3); the other part over its range and t +/- U.
    expect_near("C at nominal R", si(b.at("estimate").at("nominal")), 1.15e-3 / (100e3 * ln3), 1e-9);
    expect_near("C lowest", si(b.at("estimate").at("low")), (1.15e-3 - 10e-6) / (101e3 * ln3), 1e-9);
    expect_near("C highest", si(b.at("estimate").at("high")), (1.15e-3 + 10e-6) / (99e3 * ln3), 1e-9);
    const auto lib = tauforge::estimate_parameter(reference_one_shot(), tauforge::timer_monostable::p_c, 0, 1.15_ms, {5e-6, 2.0});
    expect_near("C vs estimate_parameter()", si(b.at("estimate").at("nominal")), lib.nominal, 1e-15);
    expect_near("C low vs estimate_parameter()", si(b.at("estimate").at("low")), lib.low, 1e-15);
    expect_near("C high vs estimate_parameter()", si(b.at("estimate").at("high")), lib.high, 1e-15);
    expect(b.at("within_marked_range") == true, "10.47 nF lies within 9 nF .. 11 nF");
}

void crosscheck_astable(const json& r) {
    // tauforge check timer_astable --example (Ra 1.78 kΩ, Rb 4.12 kΩ, C 10 nF)
    const json& m = r.at("check").at("metrics");
    // REFERENCES.md oscillator check vector (computed from the textbook timer relations):
    // t_high 40.90 µs, t_low 28.56 µs, f 14.398 kHz, high fraction 58.9 %.
    expect_near("high time", si(m[0].at("nominal")), 40.90e-6, 0.0, 0.005e-6);
    expect_near("low time", si(m[1].at("nominal")), 28.56e-6, 0.0, 0.005e-6);
    expect_near("frequency", si(m[3].at("nominal")), 14.398e3, 0.0, 0.5);
    expect_near("duty", si(m[4].at("nominal")), 0.589, 0.0, 0.0005);
    // Derivation: t_high = ln 2 (Ra + Rb) C, t_low = ln 2 Rb C.
    expect_near("high time = ln 2 (Ra + Rb) C", si(m[0].at("nominal")), std::log(2.0) * (1.78e3 + 4.12e3) * 10e-9, 1e-12);
    expect_near("low time = ln 2 Rb C", si(m[1].at("nominal")), std::log(2.0) * 4.12e3 * 10e-9, 1e-12);
}

void crosscheck(const std::string& which, const json& r) {
    if (which == "monostable") crosscheck_monostable(r);
    else if (which == "design") crosscheck_design(r);
    else if (which == "pick") crosscheck_pick(r);
    else if (which == "limits") crosscheck_limits(r);
    else if (which == "readback") crosscheck_readback(r);
    else if (which == "astable") crosscheck_astable(r);
    else fail("unknown cross-check " + which);
}

// ---- the catalogue -----------------------------------------------------------------

struct run_result {
    int status = -1;
    std::string out;
};

run_result run(const std::string& command) {
    run_result r;
    FILE* p = popen((command + " 2>/dev/null").c_str(), "r");
    if (!p) return r;
    char buf[4096];
    std::size_t n;
    while ((n = std::fread(buf, 1, sizeof buf, p)) > 0) r.out.append(buf, n);
    const int s = pclose(p);
    r.status = WIFEXITED(s) ? WEXITSTATUS(s) : -1;
    return r;
}

void catalogue(const std::string& exe) {
    const auto list = run("'" + exe + "' networks --json");
    expect(list.status == 0, "networks exits 0");
    const json all = json::parse(list.out).at("networks");
    expect(all.size() >= 9, "at least the nine networks of the library");
    for (const auto& n : all) {
        const std::string name = n.at("name").get<std::string>();
        const auto c = run("'" + exe + "' check " + name + " --example --samples 2000 --json");
        expect(c.status == 0, name + ": check --example exits 0 (got " + std::to_string(c.status) + ")");
        if (c.status == 0) {
            const json j = json::parse(c.out);
            expect(j.at("check").at("network").at("name") == name, name + ": check reports the network");
            expect(j.at("check").at("metrics").size() == n.at("metrics").size(), name + ": every metric reported");
            expect(j.at("check").at("spec_holds") == true, name + ": the example parts hold the example spec");
        }
        const auto d = run("'" + exe + "' design " + name + " --example --samples 0 --top 2 --json");
        if (!n.at("designable").get<bool>()) {
            expect(d.status == 2 && d.out.empty(), name + ": design of a network without parts to choose exits 2, no report");
            continue;
        }
        expect(d.status == 0 || d.status == 3, name + ": design --example exits 0 or 3 (got " + std::to_string(d.status) + ")");
        if (d.status == 0 || d.status == 3) {
            const json j = json::parse(d.out);
            expect(j.at("design").at("feasible") == (d.status == 0), name + ": feasible matches the exit status");
            expect(d.status == 0 || !j.at("design").at("reason").get<std::string>().empty(), name + ": an infeasible design says why");
        }
    }
}

}  // namespace

int main(int argc, char** argv) {
    const std::vector<std::string> a(argv + 1, argv + argc);
    if (a.empty()) {
        std::cerr << "usage: cli_check golden|valid|same|crosscheck|catalogue ...\n";
        return 2;
    }
    try {
        if (a[0] == "golden" && a.size() == 3) {
            const json actual = load(a[1]);
            if (const char* u = std::getenv("TAUFORGE_UPDATE_GOLDEN"); u && std::string(u) == "1") {
                std::ofstream(a[2], std::ios::binary) << actual.dump(2) << "\n";
                std::cerr << "updated " << a[2] << "\n";
                return 0;
            }
            compare(actual, load(a[2]), "");
        } else if (a[0] == "valid" && (a.size() == 2 || a.size() == 3)) {
            const json r = load(a[1]);
            expect(r.is_object() && r.value("tool", "") == "tauforge", "a tauforge report");
            expect(r.contains("command") && r.contains("status") && r.contains("exit_code"), "command, status and exit code");
            if (a.size() == 3) expect(r.value("status", "") == a[2], "status \"" + a[2] + "\", got " + r.value("status", ""));
        } else if (a[0] == "same" && a.size() == 3) {
            compare(load(a[1]), load(a[2]), "");
        } else if (a[0] == "crosscheck" && a.size() == 3) {
            crosscheck(a[1], load(a[2]));
        } else if (a[0] == "catalogue" && a.size() == 2) {
            catalogue(a[1]);
        } else {
            std::cerr << "cli_check: unknown mode or wrong arguments\n";
            return 2;
        }
    } catch (const std::exception& e) {
        fail(std::string("exception: ") + e.what());
    }
    if (failures) std::cerr << failures << " check(s) failed\n";
    return failures ? 1 : 0;
}
