#pragma once
// Bounds on the worst-case metrics of every design in a box of candidates (a
// contiguous run of each slot's sorted candidate list), for the branch and
// bound of synthesis' fast path. Valid when the network's corners are bounds:
// every metric monotone in every parameter, so that its extremes over any box
// of parameter values sit at the box's vertices.
//
// A design d in the box has, for metric m, worst-case low min_c f(c(d)) and high
// max_c f(c(d)) over its corners c and its nominal point. For one corner c,
// f(c(d)) is monotone in each slot's value, so over the box it lies between the
// values of f at the vertices of the box that the slots' low ends (or high ends,
// or nominal values) span. Hence, for any set of corners C,
//     worst-case low  <= min over c in C of (max over vertices of f at c),
//     worst-case high >= max over c in C of (min over vertices of f at c),
// and the nominal metric lies between the smallest and largest nominal vertex.

#include "tauforge/concepts.hpp"
#include "tauforge/detail/analysis_common.hpp"
#include "tauforge/error.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <utility>
#include <vector>

namespace tauforge::detail {

/// For every design in a box and every wanted metric m: its worst-case low is
/// at most low_at_most[m], its worst-case high at least high_at_least[m], and
/// its nominal value within [nominal_low[m], nominal_high[m]]. Unbounded to start.
template <std::size_t M>
struct box_metric_bounds {
    static constexpr double inf = std::numeric_limits<double>::infinity();
    std::array<double, M> low_at_most = filled(inf);
    std::array<double, M> high_at_least = filled(-inf);
    std::array<double, M> nominal_low = filled(-inf);
    std::array<double, M> nominal_high = filled(inf);

private:
    static constexpr std::array<double, M> filled(double v) {
        std::array<double, M> a{};
        a.fill(v);
        return a;
    }
};

/// Each candidate's parameter interval per slot and the other parameters'
/// intervals, fixed once; then bounds over boxes of candidate indices.
template <DesignableNetwork N>
class box_bounder {
public:
    static constexpr std::size_t S = N::design_slots.size();
    static constexpr std::size_t P = N::parameters.size();
    static constexpr std::size_t M = N::metrics.size();
    using vertex_values = std::array<std::array<double, M>, std::size_t{1} << S>;

    /// `cands[s]` lists slot s's candidates (anything with `.value` and `.tol`);
    /// `wanted` marks the metrics to bound. Not usable unless the corners are
    /// bounds, every interval can be computed, and a slot's part changes its own
    /// parameter's interval only (the intervals are then the ones synthesis scores with).
    template <class List>
    box_bounder(const N& base, const std::array<List, S>& cands, const std::array<bool, M>& wanted) {
        for (std::size_t m = 0; m < M; ++m)
            if (wanted[m]) wanted_[wanted_count_++] = m;
        std::array<part_choice, S> ref{};
        for (std::size_t s = 0; s < S; ++s) ref[s] = {cands[s].front().value, cands[s].front().tol};
        try {
            net_ = base.with_parts(ref);
            if (!corners_are_bounds(net_)) return;
            others_ = checked_ranges("synthesize", net_);
            for (std::size_t s = 0; s < S; ++s) {
                const std::size_t p = N::design_slots[s].parameter;
                slot_[s].reserve(cands[s].size());
                for (const auto& c : cands[s]) {
                    auto choice = ref;
                    choice[s] = {c.value, c.tol};
                    const auto r = checked_ranges("synthesize", base.with_parts(choice));
                    for (std::size_t j = 0; j < P; ++j)
                        if (j != p && !(r[j] == others_[j])) return;
                    const interval& prev = slot_[s].empty() ? r[p] : slot_[s].back();
                    sorted_[s] = sorted_[s] && prev.nominal <= r[p].nominal && prev.low <= r[p].low &&
                                 prev.high <= r[p].high;
                    slot_[s].push_back(r[p]);
                }
            }
            for (std::size_t j = 0; j < P; ++j)
                if (!is_slot_parameter(j) && !others_[j].is_fixed()) free_[free_count_++] = j;
            // 2^(S + free) corners, counted in one 32-bit mask.
            if (S + free_count_ > corner_parameter_limit) return;
            choose_corners(cands);
        } catch (const invalid_argument&) {
            return;
        } catch (const domain_error&) {
            return;
        }
        usable_ = true;
    }

    bool usable() const noexcept { return usable_; }
    std::size_t corner_count() const noexcept { return corner_count_; }

    /// The ranges the box's candidates of one slot span: nominal values, low ends, high ends.
    struct span {
        double nominal_lo, nominal_hi, low_lo, low_hi, high_lo, high_hi;
    };

    /// A box first[s] .. last[s] (inclusive) of each slot's candidates: what each
    /// slot spans, and the w slots with more than one candidate (2^w vertices).
    struct box {
        std::array<span, S> spans{};
        std::array<std::size_t, S> wide{};
        std::size_t w = 0;
    };

    box make_box(const std::array<std::size_t, S>& first, const std::array<std::size_t, S>& last) const {
        box b;
        for (std::size_t s = 0; s < S; ++s) {
            const interval& a = slot_[s][first[s]];
            const interval& z = sorted_[s] ? slot_[s][last[s]] : a;
            span& o = b.spans[s];
            o = {a.nominal, z.nominal, a.low, z.low, a.high, z.high};
            for (std::size_t i = first[s] + 1; !sorted_[s] && i <= last[s]; ++i) {
                const interval& c = slot_[s][i];
                o.nominal_lo = std::min(o.nominal_lo, c.nominal), o.nominal_hi = std::max(o.nominal_hi, c.nominal);
                o.low_lo = std::min(o.low_lo, c.low), o.low_hi = std::max(o.low_hi, c.low);
                o.high_lo = std::min(o.high_lo, c.high), o.high_hi = std::max(o.high_hi, c.high);
            }
            if (first[s] != last[s]) b.wide[b.w++] = s;
        }
        return b;
    }

    /// Tightens `out` with corner k of the chosen ones (2^w evaluations): each
    /// slot at the low (or high) ends its candidates span. A point that cannot
    /// be evaluated leaves `out` as it was.
    void add_corner(const box& b, std::size_t k, box_metric_bounds<M>& out) const {
        const std::uint32_t c = corners_[k];
        auto x = nominal_point(others_);
        for (std::size_t f = 0; f < free_count_; ++f) {
            const interval& i = others_[free_[f]];
            x[free_[f]] = (c >> (S + f) & 1u) ? i.high : i.low;
        }
        vertex_values at;
        if (!evaluate_vertices(b, x, at, [&](std::size_t s) {
                const span& p = b.spans[s];
                return (c >> s & 1u) ? std::pair{p.high_lo, p.high_hi} : std::pair{p.low_lo, p.low_hi};
            }))
            return;
        for (std::size_t i = 0; i < wanted_count_; ++i) {
            const std::size_t m = wanted_[i];
            const auto [bottom, top] = extremes(b, at, m);
            out.low_at_most[m] = std::min(out.low_at_most[m], widen_up(top));
            out.high_at_least[m] = std::max(out.high_at_least[m], widen_down(bottom));
        }
    }

    /// Tightens `out` with the nominal values (2^w evaluations): they bound the
    /// nominal metrics, and the worst-case low is at most the largest nominal,
    /// the high at least the smallest. Also sets `swing[s][m]` to the largest
    /// change of metric m between two vertices that differ in slot s only.
    void add_nominal(const box& b, box_metric_bounds<M>& out, std::array<std::array<double, M>, S>& swing) const {
        swing = {};
        auto x = nominal_point(others_);
        vertex_values at;
        if (!evaluate_vertices(b, x, at, [&](std::size_t s) {
                return std::pair{b.spans[s].nominal_lo, b.spans[s].nominal_hi};
            }))
            return;
        for (std::size_t i = 0; i < wanted_count_; ++i) {
            const std::size_t m = wanted_[i];
            const auto [bottom, top] = extremes(b, at, m);
            out.nominal_low[m] = widen_down(bottom);
            out.nominal_high[m] = widen_up(top);
            out.low_at_most[m] = std::min(out.low_at_most[m], out.nominal_high[m]);
            out.high_at_least[m] = std::max(out.high_at_least[m], out.nominal_low[m]);
            for (std::uint32_t v = 0; v < (std::uint32_t{1} << b.w); ++v)
                for (std::size_t k = 0; k < b.w; ++k)
                    swing[b.wide[k]][m] = std::max(swing[b.wide[k]][m], std::abs(at[v][m] - at[v ^ (1u << k)][m]));
        }
    }

private:
    static constexpr double monotone_slack = 1e-12;

    /// A computed metric can step against its monotone direction by a few
    /// rounding errors between two nearby points: widen by far more than that
    /// (the metrics are times, rates and ratios of positive terms, accurate to
    /// about 1e-15 relative).
    static double widen_up(double v) { return v + monotone_slack * std::abs(v); }
    static double widen_down(double v) { return v - monotone_slack * std::abs(v); }

    static std::pair<double, double> extremes(const box& b, const vertex_values& at, std::size_t m) {
        double bottom = at[0][m], top = at[0][m];
        for (std::uint32_t v = 1; v < (std::uint32_t{1} << b.w); ++v)
            bottom = std::min(bottom, at[v][m]), top = std::max(top, at[v][m]);
        return {bottom, top};
    }

    /// Evaluates the metrics at the box's vertices: each slot's parameter at the
    /// low (or, by the vertex bits, the high) end of `range_of(slot)`, the other
    /// parameters as in x. False when some vertex cannot be evaluated or gives a
    /// wanted metric that is not finite.
    template <class Range>
    bool evaluate_vertices(const box& b, std::array<double, P>& x, vertex_values& at, Range&& range_of) const {
        try {
            for (std::uint32_t v = 0; v < (std::uint32_t{1} << b.w); ++v) {
                for (std::size_t s = 0; s < S; ++s) x[N::design_slots[s].parameter] = range_of(s).first;
                for (std::size_t k = 0; k < b.w; ++k)
                    if (v >> k & 1u) x[N::design_slots[b.wide[k]].parameter] = range_of(b.wide[k]).second;
                at[v] = net_.evaluate(x);
                for (std::size_t i = 0; i < wanted_count_; ++i)
                    if (!std::isfinite(at[v][wanted_[i]])) return false;
            }
        } catch (const domain_error&) {
            return false;
        } catch (const invalid_argument&) {
            return false;
        }
        return true;
    }

    /// Any corners give valid bounds; the tightest are those where each wanted
    /// metric is lowest and highest. They are taken at one design (every slot at
    /// its middle candidate): with metrics monotone the same way everywhere,
    /// they are the same corners everywhere.
    template <class List>
    void choose_corners(const std::array<List, S>& cands) {
        auto x = nominal_point(others_);
        std::array<double, M> lowest, highest;
        std::array<std::uint32_t, M> at_lowest{}, at_highest{};
        lowest.fill(std::numeric_limits<double>::infinity());
        highest.fill(-std::numeric_limits<double>::infinity());
        for (std::uint32_t c = 0; c < (std::uint32_t{1} << (S + free_count_)); ++c) {
            for (std::size_t s = 0; s < S; ++s) {
                const interval& i = slot_[s][cands[s].size() / 2];
                x[N::design_slots[s].parameter] = (c >> s & 1u) ? i.high : i.low;
            }
            for (std::size_t f = 0; f < free_count_; ++f)
                x[free_[f]] = (c >> (S + f) & 1u) ? others_[free_[f]].high : others_[free_[f]].low;
            const auto v = net_.evaluate(x);
            for (std::size_t m = 0; m < M; ++m) {
                if (v[m] < lowest[m]) lowest[m] = v[m], at_lowest[m] = c;
                if (v[m] > highest[m]) highest[m] = v[m], at_highest[m] = c;
            }
        }
        auto add = [&](std::uint32_t c) {
            const auto end = corners_.begin() + static_cast<std::ptrdiff_t>(corner_count_);
            if (std::find(corners_.begin(), end, c) == end) corners_[corner_count_++] = c;
        };
        for (std::size_t i = 0; i < wanted_count_; ++i) add(at_lowest[wanted_[i]]), add(at_highest[wanted_[i]]);
    }

    static constexpr bool is_slot_parameter(std::size_t j) {
        for (const auto& d : N::design_slots)
            if (d.parameter == j) return true;
        return false;
    }

    N net_{};
    std::array<interval, P> others_{};
    std::array<std::vector<interval>, S> slot_{};
    std::array<bool, S> sorted_ = [] {
        std::array<bool, S> a{};
        a.fill(true);
        return a;
    }();  ///< whether a slot's nominal values, low and high ends all rise with the index
    std::array<std::size_t, P> free_{};
    std::size_t free_count_ = 0;
    std::array<std::size_t, M> wanted_{};
    std::size_t wanted_count_ = 0;
    std::array<std::uint32_t, 2 * M> corners_{};  ///< the corners each box is bounded at
    std::size_t corner_count_ = 0;
    bool usable_ = false;
};

}  // namespace tauforge::detail
