#include "pick.hpp"

#include <tauforge/error.hpp>
#include <tauforge/notation.hpp>
#include <tauforge/series.hpp>

#include <cmath>
#include <optional>
#include <type_traits>

namespace tfcli {

namespace {

template <class Q>
std::optional<double> try_parse(std::string_view t) {
    try {
        return tauforge::parse<Q>(t).value();
    } catch (const tauforge::invalid_argument&) {
        return std::nullopt;
    }
}

std::string origin_of(const std::optional<tauforge::e_series>& s) {
    return s ? std::string(tauforge::series_name(*s)) : std::string("stock");
}

template <class Q>
pick_result pick_from(const request& rq, double target, const char* kind, const char* unit) {
    if (rq.pairs < 1 || rq.pairs > 50)
        throw usage_error("pairs = " + std::to_string(rq.pairs) + " is invalid; expected 1 to 50 combinations per connection");
    const bool is_r = std::is_same_v<Q, tauforge::resistance>;
    const auto spec = parse_value_set(rq.from.empty() ? std::string(is_r ? default_resistor_series : default_capacitor_series) : rq.from, "from");
    // Without a range: two decades either side, enough for any pair that reaches the target.
    const auto set = [&] {
        if constexpr (std::is_same_v<Q, tauforge::resistance>) return build_resistors(spec, target / 100.0, target * 100.0);
        else return build_capacitors(spec, target / 100.0, target * 100.0);
    }();
    pick_result p;
    p.kind = kind;
    p.unit = unit;
    p.target = target;
    p.count = set.size();
    p.source = describe_value_set(spec, set.front().value.value(), set.back().value.value(), unit);
    const Q t = Q::from_value(target);
    const auto& best = tauforge::best_single(set, t);
    p.nearest = best.value.value();
    p.nearest_tol = best.tol;
    p.nearest_origin = origin_of(best.series);
    const auto br = set.bracket(t);
    if (br.below) p.below = br.below->value.value();
    if (br.above) p.above = br.above->value.value();
    for (const auto how : {tauforge::connection::series, tauforge::connection::parallel}) {
        auto& out = how == tauforge::connection::series ? p.series : p.parallel;
        for (const auto& c : tauforge::best_pairs(set, t, how, rq.pairs))
            out.push_back({c.first.value.value(), c.second.value.value(), c.value.value(), c.error, origin_of(c.first.series),
                           origin_of(c.second.series), c.tol});
    }
    return p;
}

}  // namespace

pick_result run_pick(const request& rq) {
    const std::string_view t = trim(rq.target);
    if (t.empty()) throw usage_error("pick needs a target value; expected e.g. tauforge pick 4k8 or tauforge pick 330n");
    const std::string kind = normalized_name(rq.kind);
    std::optional<double> r = try_parse<tauforge::resistance>(t), c = try_parse<tauforge::capacitance>(t);
    if (kind == "r" || kind == "resistor") {
        if (!r) r = parse_by_unit(t, "\u03A9", "target");
        c.reset();
    } else if (kind == "c" || kind == "capacitor") {
        if (!c) c = parse_by_unit(t, "F", "target");
        r.reset();
    } else if (!kind.empty()) {
        throw usage_error("kind = \"" + rq.kind + "\" is invalid; expected R or C");
    }
    if (r && c)
        throw usage_error("target \"" + std::string(t) + "\" reads as a resistance and as a capacitance; expected a unit (470R, 470 ohm, 470p) or --kind R|C");
    if (!r && !c)
        throw usage_error("target \"" + std::string(t) + "\" is not a resistance or a capacitance; expected e.g. 4k7, 4.7 kohm, 100n, 2u2");
    const double v = r ? *r : *c;
    if (!(v > 0.0 && std::isfinite(v)))
        throw usage_error("target \"" + std::string(t) + "\" is invalid; expected a positive value");
    return r ? pick_from<tauforge::resistance>(rq, v, "resistor", "\u03A9") : pick_from<tauforge::capacitance>(rq, v, "capacitor", "F");
}

}  // namespace tfcli
