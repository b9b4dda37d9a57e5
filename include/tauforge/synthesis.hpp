#pragma once
/// Synthesis: choose parts from value sets so that a network's metrics stay
/// inside a timing window at worst case, and rank the designs that do.
///
///     rc_delay net;                                   // supply, threshold, TCR ... as built
///     timing_spec<rc_delay> spec;
///     spec.around("delay", 1_ms, tolerance::symmetric(0.15));
///     auto result = synthesize(net, spec, {candidates(e24_r), candidates(e12_c)});
///     for (const auto& d : result.designs) std::puts(describe(d).c_str());
///
/// Ranking (best first): holds the window at worst case; larger margin to the
/// window edges; fewer parts; coarser series; smaller nominal error; then the
/// part values themselves, so the order is total and reproducible.
///
/// Worst case here is the corner bound of `metric_bounds` (analysis/worst_case.hpp): exact for
/// metrics monotone in every parameter (all networks in networks/ are).
///
/// The fast path (networks that satisfy SolvableNetwork) solves one slot for the
/// window's centre and walks outwards through that slot's sorted values while a
/// value could still enter the top k, for each choice of the other slots. It
/// returns exactly the exhaustive top k when the margin is unimodal along that
/// slot (true when every metric is monotone in it); tests check the equality on
/// random specs. With three or more slots and corners that are bounds, the
/// choices of the other slots are pruned first: a best-first branch and bound
/// over boxes of contiguous candidates per slot bounds each ranking key over a
/// box (detail/box_bounds.hpp) and drops the box when none of its designs could
/// rank before the k-th kept one; the boxes left are walked. The bounds are
/// exact inequalities, so the result is still exactly the exhaustive top k.

#include "tauforge/analysis/common.hpp"
#include "tauforge/analysis/worst_case.hpp"
#include "tauforge/concepts.hpp"
#include "tauforge/detail/box_bounds.hpp"
#include "tauforge/detail/validate.hpp"
#include "tauforge/notation.hpp"
#include "tauforge/parts.hpp"
#include "tauforge/series.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace tauforge {

/// One requirement: metric number `metric` stays inside `window` at worst case.
struct requirement {
    std::size_t metric = 0;
    spec_window window{};
};

/// The timing windows a design must hold, by metric name.
template <TimingNetwork N>
class timing_spec {
public:
    /// metric in [low, high]: spec.between("delay", 0.9_ms, 1.1_ms).
    template <class Q>
    timing_spec& between(std::string_view metric, Q low, Q high) {
        return add(metric, value_of(metric, low), value_of(metric, high));
    }
    /// metric within nominal (1 - minus) .. nominal (1 + plus).
    template <class Q>
    timing_spec& around(std::string_view metric, Q nominal, tolerance t) {
        const double n = value_of(metric, nominal);
        if (!(t.minus >= 0.0 && t.minus < 1.0 && t.plus >= 0.0 && std::isfinite(t.plus)))
            throw invalid_argument("timing_spec::around: tolerance = " + format_percent(t.minus) + "/" +
                                   format_percent(t.plus) + " is invalid; expected 0 <= minus < 100 %, plus >= 0");
        return add(metric, n * (1.0 - t.minus), n * (1.0 + t.plus));
    }
    /// metric <= high.
    template <class Q>
    timing_spec& at_most(std::string_view metric, Q high) {
        return add(metric, -std::numeric_limits<double>::infinity(), value_of(metric, high));
    }
    /// metric >= low.
    template <class Q>
    timing_spec& at_least(std::string_view metric, Q low) {
        return add(metric, value_of(metric, low), std::numeric_limits<double>::infinity());
    }

    const std::vector<requirement>& requirements() const noexcept { return reqs_; }

    /// The index of a metric by name; throws naming the valid names.
    static std::size_t metric_index(std::string_view name) {
        for (std::size_t i = 0; i < N::metrics.size(); ++i)
            if (N::metrics[i].name == name) return i;
        throw invalid_argument("timing_spec: metric = \"" + std::string(name) + "\" is invalid; expected one of " +
                               detail::quoted_names(N::metrics));
    }

private:
    template <class Q>
    static double value_of(std::string_view metric, Q q) {
        const auto& info = N::metrics[metric_index(metric)];
        if constexpr (std::is_arithmetic_v<Q>) {
            if (!info.unit.empty())
                throw invalid_argument("timing_spec: metric \"" + std::string(metric) + "\" is in " +
                                       std::string(info.unit) + "; expected a quantity in " + std::string(info.unit) +
                                       ", not a plain number");
            return static_cast<double>(q);
        } else {
            if (unit_symbol<Q>::unicode != info.unit)
                throw invalid_argument("timing_spec: metric \"" + std::string(metric) + "\" is in " +
                                       std::string(info.unit) + "; a value in " +
                                       std::string(unit_symbol<Q>::unicode) + " was given");
            return q.value();
        }
    }

    timing_spec& add(std::string_view metric, double low, double high) {
        const std::size_t m = metric_index(metric);
        const std::string name = "timing_spec: " + std::string(metric);
        if (std::isnan(low) || std::isnan(high) || low == std::numeric_limits<double>::infinity() ||
            high == -std::numeric_limits<double>::infinity())
            throw invalid_argument(name + " window is invalid; expected finite edges (one side may be open)");
        if (!(low < high))
            throw invalid_argument(name + " window [" + detail::quoted_value(low) + ", " +
                                   detail::quoted_value(high) + "] " + std::string(N::metrics[m].unit) +
                                   " is invalid; expected low < high");
        spec_window w;
        if (std::isfinite(low)) w.low = low;
        if (std::isfinite(high)) w.high = high;
        reqs_.push_back({m, w});
        return *this;
    }

    std::vector<requirement> reqs_;
};

/// Series rank of a candidate value for the "coarser series" tie-break:
/// 0 = E3 ... 6 = E192, 7 = a stock list or unknown.
using series_rank = std::uint8_t;
inline constexpr series_rank stock_rank = 7;

/// One value a slot may take, with the tolerance it is bought at and, when the
/// slot is offered as several kinds of part, the kind.
struct candidate_value {
    double value = 0.0;  ///< SI base unit
    tolerance tol{};
    series_rank rank = stock_rank;
    std::string_view origin = "stock";          ///< "E24", "stock", ... (static storage)
    std::shared_ptr<const part_model> model{};  ///< the kind of part, or none: the network's own part
};

/// A value set as a slot's candidate list (sorted, with tolerance and series).
template <class Q>
std::vector<candidate_value> candidates(const value_set<Q>& set) {
    std::vector<candidate_value> out;
    out.reserve(set.size());
    for (const auto& p : set)
        out.push_back({p.value.value(), p.tol,
                       p.series ? static_cast<series_rank>(*p.series) : stock_rank,
                       p.series ? series_name(*p.series) : std::string_view("stock"), nullptr});
    return out;
}

/// A value set bought as one kind of part: each candidate takes `model`'s behaviour
/// (dielectric, DC bias, ageing, TCR ...) with its own value and tolerance. Merge the
/// lists of several kinds with `merge_candidates`; synthesis then searches each kind
/// on its own and says in `synthesis_result::notes` how each fared.
///
///     auto c = merge_candidates(candidates(e12_c, {"PP film", make_capacitor(pp_film, 1_nF)}),
///                               candidates(e12_c, {"X7R ceramic", x7r_part}));
template <class Q>
std::vector<candidate_value> candidates(const value_set<Q>& set, part_model model) {
    auto out = candidates(set);
    const auto shared = std::make_shared<const part_model>(std::move(model));
    for (auto& c : out) c.model = shared;
    return out;
}

/// Two candidate lists as one, sorted by value (stable: a's entries first among equal values).
inline std::vector<candidate_value> merge_candidates(const std::vector<candidate_value>& a,
                                                     const std::vector<candidate_value>& b) {
    std::vector<candidate_value> out;
    out.reserve(a.size() + b.size());
    std::merge(a.begin(), a.end(), b.begin(), b.end(), std::back_inserter(out),
               [](const candidate_value& x, const candidate_value& y) { return x.value < y.value; });
    return out;
}

/// How synthesis searches.
enum class search_method {
    automatic,   ///< fast path when the network is SolvableNetwork, else exhaustive
    exhaustive,  ///< every combination of candidate values
    fast,        ///< solve one slot, walk its neighbours (SolvableNetwork only)
};

struct synthesis_options {
    std::size_t top_k = 10;  ///< how many designs to return, 1 .. 1000
    search_method method = search_method::automatic;
};

/// Why no design holds the spec.
enum class infeasibility {
    none,               ///< designs were found
    tolerance_too_wide, ///< the parts' own spread is wider than the window
    out_of_reach,       ///< the value sets cannot reach the window
};

/// A ranked design: chosen parts, nominal metrics, worst-case bounds, margin.
template <DesignableNetwork N>
struct design {
    static constexpr std::size_t slot_count = N::design_slots.size();
    static constexpr std::size_t metric_count = N::metrics.size();
    std::array<candidate_value, slot_count> parts{};
    N network{};                                ///< the network with these parts
    std::array<double, metric_count> nominal{};  ///< metrics at nominal values
    std::array<double, metric_count> worst_min{};
    std::array<double, metric_count> worst_max{};
    /// Smallest distance of a worst-case bound inside its window edge, as a
    /// fraction of the window's half-width (one-sided window: of the edge
    /// value). 1 = no spread at the centre; 0 = touches an edge; < 0 = outside.
    double margin = 0.0;
    std::size_t tight_requirement = 0;  ///< index into spec.requirements()
    bool tight_at_high = false;         ///< whether the upper edge is the tight one
    double nominal_error = 0.0;         ///< largest |nominal - centre| / half-width
    std::string failure;                ///< why the network could not be evaluated with these parts, if so
    /// True when every requirement holds at worst case.
    bool holds() const noexcept { return margin >= 0.0; }
};

template <DesignableNetwork N>
struct synthesis_result {
    std::vector<design<N>> designs;  ///< best first; empty when infeasible
    infeasibility why = infeasibility::none;
    std::string reason;              ///< names the ruling constraint when empty
    /// When a slot's candidates come in several kinds of part (`candidates(set, model)`):
    /// one line per combination of kinds, with its best design or why none holds.
    std::vector<std::string> notes;
    std::uint64_t evaluated = 0;     ///< candidate designs analysed
    bool feasible() const noexcept { return !designs.empty(); }
};

namespace detail {

/// What margins in window w are fractions of: its half-width (one-sided: the
/// edge's magnitude, or 1 for an edge at 0).
inline double window_scale(const spec_window& w) {
    const double scale = w.low && w.high ? (*w.high - *w.low) / 2.0 : std::abs(w.low ? *w.low : *w.high);
    return scale > 0.0 ? scale : 1.0;
}

/// The margin of [lo, hi] inside window w, as a fraction of its half-width
/// (one-sided: of the edge's magnitude, or absolute for an edge at 0).
inline double window_margin(const spec_window& w, double lo, double hi, bool& at_high) {
    const double s = window_scale(w);
    const double m_low = w.low ? (lo - *w.low) / s : std::numeric_limits<double>::infinity();
    const double m_high = w.high ? (*w.high - hi) / s : std::numeric_limits<double>::infinity();
    at_high = m_high < m_low;
    return std::min(m_low, m_high);
}

/// |v - centre| / half-width for a two-sided window; 0 for a one-sided one.
inline double window_error(const spec_window& w, double v) {
    if (!(w.low && w.high)) return 0.0;
    return std::abs(v - (*w.low + *w.high) / 2.0) / ((*w.high - *w.low) / 2.0);
}

/// The value synthesis aims a solved slot at: the window's centre, or its one edge.
inline double window_target(const spec_window& w) {
    return w.low && w.high ? (*w.low + *w.high) / 2.0 : (w.low ? *w.low : *w.high);
}

/// Scores one choice of parts: worst-case bounds, margin, tight edge, nominal error.
template <DesignableNetwork N>
design<N> score_design(const N& base, const std::vector<requirement>& reqs,
                       const std::array<candidate_value, N::design_slots.size()>& parts) {
    constexpr std::size_t S = N::design_slots.size();
    std::array<part_choice, S> choice{};
    for (std::size_t s = 0; s < S; ++s) {
        const part_model* m = parts[s].model.get();
        choice[s] = {parts[s].value, parts[s].tol, m ? m->as_resistor() : nullptr, m ? m->as_capacitor() : nullptr};
    }
    design<N> d;
    d.parts = parts;
    d.network = base.with_parts(choice);
    try {
        if (corners_are_bounds(d.network)) {
            const auto b = metric_bounds(d.network);
            for (std::size_t m = 0; m < N::metrics.size(); ++m) {
                d.nominal[m] = b[m].nominal;
                d.worst_min[m] = b[m].low;
                d.worst_max[m] = b[m].high;
            }
        } else {
            const auto wc = worst_case(d.network);
            for (std::size_t m = 0; m < N::metrics.size(); ++m) {
                d.nominal[m] = wc[m].nominal;
                d.worst_min[m] = wc[m].min.value;
                d.worst_max[m] = wc[m].max.value;
            }
        }
    } catch (const domain_error& e) {
        // Valid parts that cannot work together (a threshold the node never
        // reaches at some corner): the candidate fails, it does not end the search.
        d.margin = -std::numeric_limits<double>::infinity();
        d.failure = e.what();
        return d;
    }
    d.margin = std::numeric_limits<double>::infinity();
    for (std::size_t i = 0; i < reqs.size(); ++i) {
        bool at_high = false;
        const double m =
            window_margin(reqs[i].window, d.worst_min[reqs[i].metric], d.worst_max[reqs[i].metric], at_high);
        if (m < d.margin) {
            d.margin = m;
            d.tight_requirement = i;
            d.tight_at_high = at_high;
        }
        d.nominal_error = std::max(d.nominal_error, window_error(reqs[i].window, d.nominal[reqs[i].metric]));
    }
    return d;
}

/// Margins and nominal errors compare in steps of 1e-9 (of the half-window), so
/// designs that differ only by rounding (1.1k x 820n against 11k x 82n) tie and
/// the later keys decide between them.
inline double rank_key(double v) { return std::round(v * 1e9); }

/// The ranking: true when a ranks before b.
template <DesignableNetwork N>
bool ranks_before(const design<N>& a, const design<N>& b) {
    if (rank_key(a.margin) != rank_key(b.margin)) return a.margin > b.margin;
    // Fewer parts: every slot holds one part until two-part slots exist.
    series_rank ra = 0, rb = 0;
    for (const auto& p : a.parts) ra = std::max(ra, p.rank);
    for (const auto& p : b.parts) rb = std::max(rb, p.rank);
    if (ra != rb) return ra < rb;
    if (rank_key(a.nominal_error) != rank_key(b.nominal_error)) return a.nominal_error < b.nominal_error;
    for (std::size_t s = 0; s < a.parts.size(); ++s)
        if (a.parts[s].value != b.parts[s].value) return a.parts[s].value < b.parts[s].value;
    for (std::size_t s = 0; s < a.parts.size(); ++s)
        if (a.parts[s].tol.widest() != b.parts[s].tol.widest()) return a.parts[s].tol.widest() < b.parts[s].tol.widest();
    for (std::size_t s = 0; s < a.parts.size(); ++s) {
        const std::string_view ma = a.parts[s].model ? std::string_view(a.parts[s].model->name) : std::string_view();
        const std::string_view mb = b.parts[s].model ? std::string_view(b.parts[s].model->name) : std::string_view();
        if (ma != mb) return ma < mb;
    }
    return false;
}

/// The best a set of designs can reach on each ranking key: none has a larger
/// margin, a coarser series, a smaller nominal error, or smaller values slot by
/// slot (each exactly, not up to rounding).
template <std::size_t S>
struct ranking_bound {
    double margin = std::numeric_limits<double>::infinity();
    series_rank rank = 0;
    double nominal_error = 0.0;
    std::array<double, S> values{};
};

/// The k best designs seen so far, plus the best non-holding one for the reason.
template <DesignableNetwork N>
class top_designs {
public:
    explicit top_designs(std::size_t k) : k_(k) { kept_.reserve(k + 1); }

    void offer(design<N>&& d) {
        ++evaluated_;
        if (!best_any_ || ranks_before(d, *best_any_)) best_any_ = d;
        if (!d.holds()) return;
        if (kept_.size() == k_ && !ranks_before(d, kept_.back())) return;
        auto at = std::upper_bound(kept_.begin(), kept_.end(), d,
                                   [](const design<N>& x, const design<N>& y) { return ranks_before(x, y); });
        kept_.insert(at, std::move(d));
        if (kept_.size() > k_) kept_.pop_back();
    }
    /// The margin a new design must reach to be kept: 0 (it must hold) until k are kept.
    double threshold() const noexcept {
        return kept_.size() == k_ ? kept_.back().margin : 0.0;
    }
    /// Whether some design no better than `b` on any ranking key could still be kept.
    bool could_keep(const ranking_bound<N::design_slots.size()>& b) const noexcept {
        if (kept_.size() < k_) return b.margin >= 0.0;
        const design<N>& last = kept_.back();
        if (rank_key(b.margin) != rank_key(last.margin)) return rank_key(b.margin) > rank_key(last.margin);
        // At best a tie on margin: the later keys decide, as in ranks_before.
        series_rank r = 0;
        for (const auto& p : last.parts) r = std::max(r, p.rank);
        if (b.rank != r) return b.rank < r;
        if (rank_key(b.nominal_error) != rank_key(last.nominal_error))
            return rank_key(b.nominal_error) < rank_key(last.nominal_error);
        for (std::size_t s = 0; s < b.values.size(); ++s)
            if (b.values[s] != last.parts[s].value) return b.values[s] < last.parts[s].value;
        return true;  // equal values: the tolerances could still decide
    }
    bool empty() const noexcept { return kept_.empty(); }
    std::vector<design<N>> take() && { return std::move(kept_); }
    const std::optional<design<N>>& best_any() const noexcept { return best_any_; }
    std::uint64_t evaluated() const noexcept { return evaluated_; }

private:
    std::size_t k_;
    std::vector<design<N>> kept_;
    std::optional<design<N>> best_any_;
    std::uint64_t evaluated_ = 0;
};

template <DesignableNetwork N>
std::string parts_text(const design<N>& d) {
    std::string s;
    for (std::size_t i = 0; i < d.parts.size(); ++i) {
        if (i) s += ", ";
        s += std::string(N::design_slots[i].name) + " = ";
        const double v = d.parts[i].value;
        s += N::design_slots[i].kind == part_kind::resistor ? format(resistance::from_value(v))
                                                            : format(capacitance::from_value(v));
        if (d.parts[i].model) s += " " + d.parts[i].model->name;
    }
    return s;
}

inline std::string metric_value_text(std::string_view unit, double v) { return format_si(v, unit); }

/// "margin 23.6 % (delay min)": a design's margin and the window edge that sets it.
template <DesignableNetwork N>
std::string margin_text(const design<N>& d, const std::vector<requirement>& reqs) {
    return "margin " + format_percent(d.margin) + " (" + std::string(N::metrics[reqs[d.tight_requirement].metric].name) +
           (d.tight_at_high ? " max)" : " min)");
}

template <DesignableNetwork N>
void explain_infeasible(synthesis_result<N>& r, const std::vector<requirement>& reqs,
                        const std::optional<design<N>>& best) {
    if (!best) return;
    if (!best->failure.empty()) {
        r.why = infeasibility::out_of_reach;
        r.reason = "no design could be evaluated: the closest candidate, " + parts_text(*best) + ", fails with: " +
                   best->failure;
        return;
    }
    const requirement& q = reqs[best->tight_requirement];
    const auto& info = N::metrics[q.metric];
    // Every requirement on the tight metric together (at_least + at_most is one window).
    spec_window w;
    for (const auto& other : reqs)
        if (other.metric == q.metric) {
            if (other.window.low) w.low = w.low ? std::max(*w.low, *other.window.low) : *other.window.low;
            if (other.window.high) w.high = w.high ? std::min(*w.high, *other.window.high) : *other.window.high;
        }
    const double lo = best->worst_min[q.metric], hi = best->worst_max[q.metric];
    const std::string name(info.name);
    const std::string window = "[" + (w.low ? metric_value_text(info.unit, *w.low) : "-inf") + ", " +
                               (w.high ? metric_value_text(info.unit, *w.high) : "inf") + "]";
    const std::string spread = metric_value_text(info.unit, lo) + " to " + metric_value_text(info.unit, hi);
    if (w.low && w.high && (hi - lo) > (*w.high - *w.low)) {
        r.why = infeasibility::tolerance_too_wide;
        r.reason = "no design holds " + name + " within " + window +
                   ": the parts' tolerances and operating ranges alone spread it wider than the window (the best " +
                   "candidate, " + parts_text(*best) + ", spans " + spread + ")";
    } else {
        r.why = infeasibility::out_of_reach;
        r.reason = "no design holds " + name + " within " + window + ": the value sets do not reach it (the " +
                   "closest candidate, " + parts_text(*best) + ", spans " + spread + ", " +
                   (best->tight_at_high ? "above the maximum" : "below the minimum") + ")";
    }
}

template <DesignableNetwork N>
void check_candidates(const std::array<std::vector<candidate_value>, N::design_slots.size()>& c) {
    for (std::size_t s = 0; s < c.size(); ++s) {
        const part_kind slot_kind = N::design_slots[s].kind;
        if (c[s].empty())
            throw invalid_argument("synthesize: candidates for slot " + std::to_string(s) +
                                   " = empty is invalid; expected at least one value");
        for (std::size_t i = 0; i < c[s].size(); ++i) {
            if (!(c[s][i].value > 0.0 && std::isfinite(c[s][i].value)))
                throw invalid_argument("synthesize: candidate value " + quoted_value(c[s][i].value) + " of slot " +
                                       std::to_string(s) + " is invalid; expected a positive, finite value");
            if (i && !(c[s][i - 1].value <= c[s][i].value))
                throw invalid_argument("synthesize: candidates for slot " + std::to_string(s) +
                                       " are invalid; expected them sorted by value");
            if (const part_model* m = c[s][i].model.get();
                m && (slot_kind == part_kind::resistor ? !m->as_resistor() : !m->as_capacitor()))
                throw invalid_argument("synthesize: candidate model \"" + m->name + "\" of slot " + std::to_string(s) +
                                       " is invalid; expected a " +
                                       (slot_kind == part_kind::resistor ? "resistor" : "capacitor") +
                                       " model for this slot");
        }
    }
}

template <DesignableNetwork N>
void exhaustive_search(const N& base, const std::vector<requirement>& reqs,
                       const std::array<std::vector<candidate_value>, N::design_slots.size()>& cands,
                       top_designs<N>& top) {
    constexpr std::size_t S = N::design_slots.size();
    std::array<std::size_t, S> idx{};
    for (;;) {
        std::array<candidate_value, S> parts;
        for (std::size_t s = 0; s < S; ++s) parts[s] = cands[s][idx[s]];
        top.offer(score_design(base, reqs, parts));
        std::size_t s = 0;
        while (s < S && ++idx[s] == cands[s].size()) idx[s++] = 0;
        if (s == S) return;
    }
}

/// Picks the slot to solve for and the requirement to aim at: the slot with the
/// most candidates among those the network can solve for that requirement.
template <SolvableNetwork N>
std::optional<std::pair<std::size_t, std::size_t>> choose_solved_slot(
    const N& base, const std::vector<requirement>& reqs,
    const std::array<std::vector<candidate_value>, N::design_slots.size()>& cands) {
    constexpr std::size_t S = N::design_slots.size();
    std::optional<std::pair<std::size_t, std::size_t>> best;
    std::array<double, S> mid{};
    for (std::size_t s = 0; s < S; ++s) mid[s] = cands[s][cands[s].size() / 2].value;
    for (std::size_t s = 0; s < S; ++s) {
        for (std::size_t q = 0; q < reqs.size(); ++q) {
            const double v = base.solve_slot(s, reqs[q].metric, window_target(reqs[q].window), mid);
            if (std::isnan(v)) continue;
            if (!best || cands[s].size() > cands[best->first].size()) best = std::pair{s, q};
            break;
        }
    }
    return best;
}

/// The margin of `parts` with the solved slot bought at tolerance `t`.
template <DesignableNetwork N>
double optimistic_margin(const N& base, const std::vector<requirement>& reqs,
                         std::array<candidate_value, N::design_slots.size()> parts, std::size_t solved, tolerance t) {
    parts[solved].tol = t;
    return score_design(base, reqs, parts).margin;
}

/// The slot the fast path solves for, the requirement it aims at, and whether
/// the slot's candidates share one tolerance (else the line's tightest).
struct solved_line {
    std::size_t slot = 0;
    std::size_t metric = 0;
    double target = 0.0;
    bool uniform = true;
    tolerance tightest{};
};

inline solved_line make_solved_line(const std::vector<requirement>& reqs, const std::vector<candidate_value>& line,
                                    std::size_t solved, std::size_t aim) {
    solved_line l{solved, reqs[aim].metric, window_target(reqs[aim].window), true, line.front().tol};
    for (const auto& c : line) {
        l.uniform = l.uniform && c.tol == line.front().tol;
        l.tightest.minus = std::min(l.tightest.minus, c.tol.minus);
        l.tightest.plus = std::min(l.tightest.plus, c.tol.plus);
    }
    return l;
}

/// Scores the solved slot's candidates first .. end - 1 with the other slots as
/// in `parts`: from the first value >= the solved ideal, outwards both ways
/// while a value could still be kept. The margin is unimodal along the line, so
/// once it falls below what could still be kept it only falls.
template <SolvableNetwork N>
void walk_solved(const N& base, const std::vector<requirement>& reqs,
                 const std::vector<candidate_value>& line, const solved_line& how,
                 std::array<candidate_value, N::design_slots.size()> parts, std::size_t first, std::size_t end,
                 top_designs<N>& top) {
    constexpr std::size_t S = N::design_slots.size();
    std::array<double, S> values{};
    for (std::size_t s = 0; s < S; ++s)
        if (s != how.slot) values[s] = parts[s].value;
    const double ideal = base.solve_slot(how.slot, how.metric, how.target, values);
    // Start at the first value >= ideal (or an end when the ideal is outside).
    const auto begin_at = line.begin() + static_cast<std::ptrdiff_t>(first);
    const auto end_at = line.begin() + static_cast<std::ptrdiff_t>(end);
    std::size_t start = first;
    if (std::isfinite(ideal))
        start = static_cast<std::size_t>(std::lower_bound(begin_at, end_at, ideal, [](const candidate_value& c,
                                                                                    double v) { return c.value < v; }) -
                                         line.begin());
    else if (ideal > 0.0)
        start = end;
    // Walk one way from `from`; `previous` is the margin of the value just before
    // it on this walk (NaN when none, so the first value never stops the walk).
    auto walk = [&](std::ptrdiff_t from, std::ptrdiff_t step, double previous) {
        double at_first = std::numeric_limits<double>::quiet_NaN();
        for (std::ptrdiff_t i = from; i >= static_cast<std::ptrdiff_t>(first) && i < static_cast<std::ptrdiff_t>(end);
             i += step) {
            parts[how.slot] = line[static_cast<std::size_t>(i)];
            auto d = score_design(base, reqs, parts);
            // With mixed tolerances on the line, decide on the optimistic margin
            // (the line's tightest tolerance), which is unimodal and never smaller.
            const double m = how.uniform ? d.margin : optimistic_margin(base, reqs, parts, how.slot, how.tightest);
            if (std::isnan(at_first)) at_first = m;
            top.offer(std::move(d));
            if (m < previous && rank_key(m) < rank_key(top.threshold())) break;
            previous = m;
        }
        return at_first;
    };
    const double at_start = walk(static_cast<std::ptrdiff_t>(start), 1, std::numeric_limits<double>::quiet_NaN());
    walk(static_cast<std::ptrdiff_t>(start) - 1, -1, at_start);
}

/// The fast path without pruning: every choice of the other slots, one walk each.
template <SolvableNetwork N>
void fast_search(const N& base, const std::vector<requirement>& reqs,
                 const std::array<std::vector<candidate_value>, N::design_slots.size()>& cands,
                 const solved_line& how, top_designs<N>& top) {
    constexpr std::size_t S = N::design_slots.size();
    std::array<std::size_t, S> idx{};
    for (;;) {
        std::array<candidate_value, S> parts;
        for (std::size_t s = 0; s < S; ++s)
            if (s != how.slot) parts[s] = cands[s][idx[s]];
        walk_solved(base, reqs, cands[how.slot], how, parts, 0, cands[how.slot].size(), top);
        std::size_t s = 0;
        while (s < S && (s == how.slot || ++idx[s] == cands[s].size())) {
            if (s != how.slot) idx[s] = 0;
            ++s;
        }
        if (s == S) return;
    }
}

/// The best margin and nominal error designs can reach whose metrics obey `b`:
/// each window_margin and window_error at the most favourable end.
template <std::size_t S, std::size_t M>
void bound_margin(ranking_bound<S>& out, const box_metric_bounds<M>& b, const std::vector<requirement>& reqs) {
    out.margin = std::numeric_limits<double>::infinity();
    out.nominal_error = 0.0;
    for (const auto& q : reqs) {
        bool at_high = false;
        out.margin =
            std::min(out.margin, window_margin(q.window, b.low_at_most[q.metric], b.high_at_least[q.metric], at_high));
        const double nearest = std::clamp(window_target(q.window), b.nominal_low[q.metric], b.nominal_high[q.metric]);
        out.nominal_error = std::max(out.nominal_error, window_error(q.window, nearest));
    }
}

/// The fast path with exact pruning (networks whose corners are bounds):
/// best-first branch and bound over boxes of contiguous candidates per slot,
/// highest margin bound first. A box whose bounds show that none of its designs
/// could rank before the k-th kept one is dropped; one with a few choices of
/// the other slots left is walked along the solved slot, within the box; any
/// other is halved.
template <SolvableNetwork N>
void pruned_search(const N& base, const std::vector<requirement>& reqs,
                   const std::array<std::vector<candidate_value>, N::design_slots.size()>& cands,
                   const solved_line& how, const box_bounder<N>& bounder, top_designs<N>& top) {
    constexpr std::size_t S = N::design_slots.size();
    struct box {
        std::array<std::size_t, S> first{}, last{};
        ranking_bound<S> bound{};
        std::size_t split = 0;  ///< the slot to halve next
    };
    // The coarsest series a design can have is at least each slot's finest
    // candidate (exact for lists of one series).
    series_rank finest = 0;
    for (std::size_t s = 0; s < S; ++s) {
        series_rank r = stock_rank;
        for (const auto& c : cands[s]) r = std::min(r, c.rank);
        finest = std::max(finest, r);
    }
    // Corner by corner until the box is ruled out; the nominal values last, for
    // the nominal error that decides ties on margin. The slot to split is the one
    // whose range moves some required metric most (in margin units), else the
    // one with the widest value ratio.
    auto bound_of = [&](box& b) {
        b.bound = {};
        b.bound.rank = finest;
        for (std::size_t s = 0; s < S; ++s) b.bound.values[s] = cands[s][b.first[s]].value;
        const auto view = bounder.make_box(b.first, b.last);
        box_metric_bounds<N::metrics.size()> metrics;
        for (std::size_t k = 0; k < bounder.corner_count(); ++k) {
            bounder.add_corner(view, k, metrics);
            bound_margin(b.bound, metrics, reqs);
            if (!top.could_keep(b.bound)) return;
        }
        std::array<std::array<double, N::metrics.size()>, S> swing{};
        bounder.add_nominal(view, metrics, swing);
        bound_margin(b.bound, metrics, reqs);
        double most = 0.0, widest = 0.0;
        b.split = S;
        for (std::size_t s = 0; s < S; ++s) {
            if (b.first[s] == b.last[s]) continue;
            double moves = 0.0;
            for (const auto& q : reqs) moves = std::max(moves, swing[s][q.metric] / window_scale(q.window));
            const double ratio = cands[s][b.last[s]].value / cands[s][b.first[s]].value;
            if (b.split == S || moves > most || (moves == most && ratio > widest))
                b.split = s, most = moves, widest = ratio;
        }
    };
    auto later = [](const box& a, const box& b) { return a.bound.margin < b.bound.margin; };
    std::vector<box> heap;
    box root;
    for (std::size_t s = 0; s < S; ++s) root.last[s] = cands[s].size() - 1;
    bound_of(root);
    heap.push_back(root);
    while (!heap.empty()) {
        std::pop_heap(heap.begin(), heap.end(), later);
        const box b = heap.back();
        heap.pop_back();
        // What could be kept only rises: a box that cannot enter now never will.
        if (!top.could_keep(b.bound)) continue;
        // A few lines left: walking each costs less than bounding the halves (a
        // bound takes about as many evaluations as scoring four designs).
        constexpr std::size_t few_lines = 4;
        std::size_t lines = 1;
        for (std::size_t s = 0; s < S; ++s)
            if (s != how.slot) lines = std::min(lines * (b.last[s] - b.first[s] + 1), few_lines + 1);
        if (lines <= few_lines) {
            std::array<std::size_t, S> idx = b.first;
            for (;;) {
                std::array<candidate_value, S> parts;
                for (std::size_t s = 0; s < S; ++s)
                    if (s != how.slot) parts[s] = cands[s][idx[s]];
                walk_solved(base, reqs, cands[how.slot], how, parts, b.first[how.slot], b.last[how.slot] + 1, top);
                std::size_t s = 0;
                while (s < S && (s == how.slot || idx[s]++ == b.last[s])) {
                    if (s != how.slot) idx[s] = b.first[s];
                    ++s;
                }
                if (s == S) break;
            }
            continue;
        }
        const std::size_t split = b.split;
        const std::size_t mid = b.first[split] + (b.last[split] - b.first[split]) / 2;
        box low = b, high = b;
        low.last[split] = mid;
        high.first[split] = mid + 1;
        for (box* h : {&low, &high}) {
            bound_of(*h);
            if (!top.could_keep(h->bound)) continue;
            heap.push_back(*h);
            std::push_heap(heap.begin(), heap.end(), later);
        }
    }
}

/// The fast path: branch and bound where it pays and the network's corners are
/// bounds, else every line walked. Bounds need each candidate's parameter
/// interval, at about the cost of scoring a design, and a walk costs a design or
/// two per line: pruning pays when the lines outnumber the candidates (three
/// or more slots, in practice).
template <SolvableNetwork N>
void solved_search(const N& base, const std::vector<requirement>& reqs,
                   const std::array<std::vector<candidate_value>, N::design_slots.size()>& cands,
                   const solved_line& how, top_designs<N>& top) {
    double lines = 1.0, candidates = 0.0;
    for (std::size_t s = 0; s < cands.size(); ++s) {
        candidates += static_cast<double>(cands[s].size());
        if (s != how.slot) lines *= static_cast<double>(cands[s].size());
    }
    bool pruned = false;
    if (lines > candidates) {
        std::array<bool, N::metrics.size()> wanted{};
        for (const auto& q : reqs) wanted[q.metric] = true;
        const box_bounder<N> bounder(base, cands, wanted);
        if (bounder.usable()) {
            pruned_search(base, reqs, cands, how, bounder, top);
            pruned = true;
        }
    }
    // When nothing holds, pruning has skipped the designs that explain why.
    if (!pruned || top.empty()) fast_search(base, reqs, cands, how, top);
}

/// One search over candidate lists whose slots each hold one kind of part (or none).
template <DesignableNetwork N>
void search_one_kind(const N& base, const std::vector<requirement>& reqs,
                     const std::array<std::vector<candidate_value>, N::design_slots.size()>& cands,
                     const synthesis_options& options, top_designs<N>& top) {
    if constexpr (SolvableNetwork<N>) {
        if (options.method != search_method::exhaustive) {
            if (auto pick = choose_solved_slot(base, reqs, cands)) {
                solved_search(base, reqs, cands, make_solved_line(reqs, cands[pick->first], pick->first, pick->second),
                              top);
                return;
            }
            if (options.method == search_method::fast)
                throw invalid_argument("synthesize: method = fast is invalid for this spec; expected a window on a "
                                       "metric the network can solve a slot for");
        }
    } else {
        if (options.method == search_method::fast)
            throw invalid_argument("synthesize: method = fast is invalid for this network; expected a "
                                   "SolvableNetwork (it has no solve_slot)");
    }
    exhaustive_search(base, reqs, cands, top);
}

/// The kinds of part offered in each slot, in order of first appearance (nullptr:
/// the network's own part).
template <std::size_t S>
std::array<std::vector<const part_model*>, S> kinds_per_slot(const std::array<std::vector<candidate_value>, S>& cands) {
    std::array<std::vector<const part_model*>, S> kinds;
    for (std::size_t s = 0; s < S; ++s)
        for (const auto& c : cands[s])
            if (std::find(kinds[s].begin(), kinds[s].end(), c.model.get()) == kinds[s].end())
                kinds[s].push_back(c.model.get());
    return kinds;
}

/// The candidate lists split by kind of part: one entry per combination of the
/// `kinds` offered in each slot, with a label such as "C as X7R ceramic" naming
/// the kinds of the slots that offer several.
template <DesignableNetwork N>
std::vector<std::pair<std::string, std::array<std::vector<candidate_value>, N::design_slots.size()>>> split_by_kind(
    const std::array<std::vector<candidate_value>, N::design_slots.size()>& cands,
    const std::array<std::vector<const part_model*>, N::design_slots.size()>& kinds) {
    constexpr std::size_t S = N::design_slots.size();
    std::vector<std::pair<std::string, std::array<std::vector<candidate_value>, S>>> out;
    std::array<std::size_t, S> idx{};
    for (;;) {
        std::string label;
        std::array<std::vector<candidate_value>, S> part;
        for (std::size_t s = 0; s < S; ++s) {
            const part_model* k = kinds[s][idx[s]];
            for (const auto& c : cands[s])
                if (c.model.get() == k) part[s].push_back(c);
            if (kinds[s].size() > 1)
                label += (label.empty() ? "" : ", ") + std::string(N::design_slots[s].name) + " as " +
                         (k ? k->name : std::string("the network's part"));
        }
        out.emplace_back(std::move(label), std::move(part));
        std::size_t s = 0;
        while (s < S && ++idx[s] == kinds[s].size()) idx[s++] = 0;
        if (s == S) return out;
    }
}

}  // namespace detail

/// Chooses parts for `base`'s design slots from `cands` (one sorted list per
/// slot) so that every requirement of `spec` holds at worst case, and returns
/// the best `options.top_k` designs. An infeasible spec is not an error: the
/// result is empty and `reason` names the ruling constraint. A slot whose
/// candidates come in several kinds of part (`candidates(set, model)`) is searched
/// kind by kind, the designs ranked together, and `notes` says how each kind fared.
template <DesignableNetwork N>
synthesis_result<N> synthesize(const N& base, const timing_spec<N>& spec,
                               const std::array<std::vector<candidate_value>, N::design_slots.size()>& cands,
                               synthesis_options options = {}) {
    if (options.top_k < 1 || options.top_k > 1000)
        throw invalid_argument("synthesize: top_k = " + std::to_string(options.top_k) +
                               " is invalid; expected 1 to 1000");
    const auto& reqs = spec.requirements();
    if (reqs.empty()) throw invalid_argument("synthesize: spec = empty is invalid; expected at least one window");
    detail::check_candidates<N>(cands);
    synthesis_result<N> r;
    const auto kinds = detail::kinds_per_slot(cands);
    detail::top_designs<N> top(options.top_k);
    if (std::all_of(kinds.begin(), kinds.end(), [](const auto& k) { return k.size() == 1; })) {
        detail::search_one_kind(base, reqs, cands, options, top);
        r.evaluated = top.evaluated();
    } else {
        // Each design belongs to one combination of kinds, so the top k of the
        // union is the top k of the groups' top k lists together.
        for (const auto& [label, group] : detail::split_by_kind<N>(cands, kinds)) {
            detail::top_designs<N> one(options.top_k);
            detail::search_one_kind(base, reqs, group, options, one);
            r.evaluated += one.evaluated();
            const auto best = one.best_any();
            auto kept = std::move(one).take();
            if (kept.empty()) {
                synthesis_result<N> why;
                detail::explain_infeasible(why, reqs, best);
                r.notes.push_back(label + ": " + why.reason);
                if (best) top.offer(design<N>(*best));
                continue;
            }
            r.notes.push_back(label + ": best " + detail::parts_text(kept.front()) + ", " +
                              detail::margin_text(kept.front(), reqs));
            for (auto& d : kept) top.offer(std::move(d));
        }
    }
    const auto best = top.best_any();
    r.designs = std::move(top).take();
    if (r.designs.empty()) detail::explain_infeasible(r, reqs, best);
    return r;
}

/// One line per design: parts, then each required metric's worst-case range and the margin.
template <DesignableNetwork N>
std::string describe(const design<N>& d, const timing_spec<N>& spec) {
    std::string s = detail::parts_text(d) + ":";
    std::array<bool, N::metrics.size()> shown{};
    for (const auto& q : spec.requirements()) {
        if (shown[q.metric]) continue;  // a metric with two one-sided windows is shown once
        shown[q.metric] = true;
        const auto& info = N::metrics[q.metric];
        s += " " + std::string(info.name) + " " + detail::metric_value_text(info.unit, d.worst_min[q.metric]) +
             " .. " + detail::metric_value_text(info.unit, d.worst_max[q.metric]) + ";";
    }
    s += " " + detail::margin_text(d, spec.requirements());
    return s;
}

}  // namespace tauforge
