#pragma once
/// Proof at worst case: does every metric stay inside its window over all
/// parameter intervals, and if not, which constraint fails at which corner.
/// Works on any TimingNetwork, a single stage or a chain of stages.
///
///     auto v = tauforge::verify(net, {{"pulse width", spec_window::between(0.9_ms, 1.3_ms)}});
///     if (!v.holds()) std::puts(v.failures().front().message.c_str());

#include "tauforge/analysis/common.hpp"
#include "tauforge/analysis/worst_case.hpp"
#include "tauforge/concepts.hpp"
#include "tauforge/detail/analysis_common.hpp"
#include "tauforge/error.hpp"
#include "tauforge/notation.hpp"

#include <cstddef>
#include <limits>
#include <string>
#include <string_view>
#include <vector>

namespace tauforge {

/// A window on one metric, by name, for `verify`.
struct metric_requirement {
    std::string_view metric;  ///< a name from the network's `metrics` table
    spec_window window;       ///< in the metric's SI unit
};

/// The outcome for one requirement.
struct requirement_verdict {
    std::size_t metric = 0;      ///< index into the network's metrics
    spec_window window{};
    bool holds = true;           ///< worst-case min and max both inside
    double worst_min = 0.0;      ///< the metric's worst-case minimum
    double worst_max = 0.0;      ///< the metric's worst-case maximum
    bool fails_high = false;     ///< the violated edge is the upper one (when !holds)
    std::string corner;          ///< where the violating (or, if it holds, the tighter) extreme occurs
    std::string message;         ///< one line, names the constraint, the value and the corner
};

/// Every requirement's verdict, in the order given.
struct verification {
    std::vector<requirement_verdict> verdicts;
    /// True when every requirement holds at worst case.
    bool holds() const {
        for (const auto& v : verdicts)
            if (!v.holds) return false;
        return true;
    }
    /// The verdicts that fail.
    std::vector<requirement_verdict> failures() const {
        std::vector<requirement_verdict> out;
        for (const auto& v : verdicts)
            if (!v.holds) out.push_back(v);
        return out;
    }
};

namespace detail {

/// "R high, C high, supply low" for the free parameters of a corner.
template <TimingNetwork N, std::size_t P>
std::string corner_text(const corner<P>& c) {
    std::string s;
    for (std::size_t j = 0; j < P; ++j) {
        const corner_position pos = c.positions[j];
        if (pos == corner_position::fixed || pos == corner_position::nominal) continue;
        if (!s.empty()) s += ", ";
        s += std::string(N::parameters[j].name) + " ";
        s += pos == corner_position::low    ? "low"
             : pos == corner_position::high ? "high"
                                            : "at " + info_value_text(c.parameters[j], N::parameters[j].unit);
    }
    return s.empty() ? "nominal" : s;
}

template <TimingNetwork N>
std::size_t metric_named(std::string_view fn, std::string_view name) {
    for (std::size_t m = 0; m < N::metrics.size(); ++m)
        if (N::metrics[m].name == name) return m;
    throw invalid_argument(std::string(fn) + ": metric = \"" + std::string(name) + "\" is invalid; expected one of " +
                           quoted_names(N::metrics));
}

}  // namespace detail

/// Checks each requirement against the full worst case (corners plus the
/// interior search of non-monotone parameters, see worst_case.hpp).
template <TimingNetwork N>
verification verify(const N& n, const std::vector<metric_requirement>& requirements,
                    const worst_case_options& opt = {}) {
    constexpr std::string_view fn = "verify";
    std::vector<std::size_t> index;
    for (const auto& r : requirements) {
        index.push_back(detail::metric_named<N>(fn, r.metric));
        detail::check_window(fn, r.metric, N::metrics[index.back()].unit, r.window);
    }
    const auto wc = worst_case(n, opt);
    verification out;
    for (std::size_t i = 0; i < requirements.size(); ++i) {
        const std::size_t m = index[i];
        const auto& w = requirements[i].window;
        const auto& e = wc[m];
        const auto& info = N::metrics[m];
        requirement_verdict v;
        v.metric = m;
        v.window = w;
        v.worst_min = e.min.value;
        v.worst_max = e.max.value;
        const bool low_ok = !w.low || e.min.value >= *w.low;
        const bool high_ok = !w.high || e.max.value <= *w.high;
        v.holds = low_ok && high_ok;
        // The side that fails, or else the side with less room.
        const double room_low = w.low ? e.min.value - *w.low : std::numeric_limits<double>::infinity();
        const double room_high = w.high ? *w.high - e.max.value : std::numeric_limits<double>::infinity();
        v.fails_high = v.holds ? room_high < room_low : !high_ok && (low_ok || room_high < room_low);
        const auto& c = v.fails_high ? e.max : e.min;
        v.corner = detail::corner_text<N>(c);
        const std::string name(info.name);
        const auto text = [&](double x) { return format_si(x, info.unit, {.digits = 4}); };
        const std::string value = text(c.value);
        if (v.holds) {
            v.message = name + " holds: worst case " + text(e.min.value) + " to " + text(e.max.value) +
                        "; tightest at " + v.corner;
        } else {
            const double edge = v.fails_high ? *w.high : *w.low;
            v.message = name + " fails: " + (v.fails_high ? "maximum " : "minimum ") + value + " is " +
                        (v.fails_high ? "above " : "below ") + text(edge) + " at " + v.corner;
        }
        out.verdicts.push_back(std::move(v));
    }
    return out;
}

}  // namespace tauforge
