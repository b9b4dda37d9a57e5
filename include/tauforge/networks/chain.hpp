#pragma once
/// Chains of stages: two networks whose timings constrain each other, analysed
/// and designed as one network.
///
/// A `chain<First, Second, Link>` is itself a TimingNetwork: its parameters are
/// the first stage's followed by the second's (named "<stage>: <parameter>"),
/// its metrics are both stages' metrics followed by the link's own metrics,
/// computed from the two stages' metric values. A link may also feed the first
/// stage's metrics into parameters of the second (a one-shot's width becomes the
/// pulse width of the train an averaging filter sees); fed parameters are fixed
/// in the chain's ranges and overwritten at every evaluation. When both stages
/// are DesignableNetwork the chain is too (its slots are both stages' slots),
/// and when both are SolvableNetwork it solves a slot for a metric of its own
/// stage, so synthesis chooses the stages' parts together.
///
///     using trigger_chain = chain<edge_detector, timer_monostable, trigger_link>;
///     trigger_chain c{edge, one_shot};
///     auto verdict = check_chain(c, {{"trigger / output", spec_window::at_most(1.0)}});
///
/// A Link is a type with
///   static constexpr std::string_view first_name, second_name;   // stage labels
///   static constexpr std::array<quantity_info, L> metrics;         // link metrics
///   static std::array<double, L> evaluate(const std::array<double, M1>&, const std::array<double, M2>&);
/// and optionally
///   static constexpr std::array<std::size_t, K> fed_parameters;   // indices into Second::parameters
///   static void feed(const std::array<double, M1>&, std::array<double, P2>&);

#include "tauforge/concepts.hpp"

#include <array>
#include <cstddef>
#include <limits>
#include <string_view>

namespace tauforge {

namespace detail {

/// "<prefix>: <name>" for every entry, concatenated into one static buffer at
/// compile time, so the chain's tables are constexpr like any network's.
constexpr std::string_view unit_of(const quantity_info& q) { return q.unit; }
constexpr std::string_view unit_of(const design_slot&) { return {}; }

template <std::string_view const& Prefix, auto const& Table>
struct prefixed_names {
    static constexpr std::size_t count = Table.size();
    static constexpr std::size_t length = [] {
        std::size_t n = 0;
        for (const auto& q : Table) n += Prefix.size() + 2 + q.name.size();
        return n;
    }();
    static constexpr std::array<char, length + 1> buffer = [] {
        std::array<char, length + 1> b{};
        std::size_t at = 0;
        for (const auto& q : Table) {
            for (char ch : Prefix) b[at++] = ch;
            b[at++] = ':';
            b[at++] = ' ';
            for (char ch : q.name) b[at++] = ch;
        }
        return b;
    }();
    static constexpr std::array<quantity_info, count> table = [] {
        std::array<quantity_info, count> out{};
        std::size_t at = 0;
        for (std::size_t i = 0; i < count; ++i) {
            const std::size_t n = Prefix.size() + 2 + Table[i].name.size();
            out[i] = {std::string_view(buffer.data() + at, n), unit_of(Table[i])};
            at += n;
        }
        return out;
    }();
};

template <class T, std::size_t A, std::size_t B>
constexpr std::array<T, A + B> join(const std::array<T, A>& a, const std::array<T, B>& b) {
    std::array<T, A + B> out{};
    for (std::size_t i = 0; i < A; ++i) out[i] = a[i];
    for (std::size_t i = 0; i < B; ++i) out[A + i] = b[i];
    return out;
}

template <class L>
concept FeedingLink = requires { L::fed_parameters; };

template <class L>
constexpr auto fed_parameters_of() {
    if constexpr (FeedingLink<L>)
        return L::fed_parameters;
    else
        return std::array<std::size_t, 0>{};
}

template <DesignableNetwork N>
constexpr std::size_t slot_count_of() { return N::design_slots.size(); }

}  // namespace detail

/// Two stages and the link between them; see the header comment.
template <TimingNetwork First, TimingNetwork Second, class Link>
struct chain {
    First first{};
    Second second{};

    static constexpr std::size_t first_parameters = First::parameters.size();
    static constexpr std::size_t second_parameters = Second::parameters.size();
    static constexpr std::size_t first_metrics = First::metrics.size();
    static constexpr std::size_t second_metrics = Second::metrics.size();
    static constexpr std::size_t link_metrics = Link::metrics.size();

    static constexpr std::array<quantity_info, first_parameters + second_parameters> parameters =
        detail::join(detail::prefixed_names<Link::first_name, First::parameters>::table,
                     detail::prefixed_names<Link::second_name, Second::parameters>::table);
    static constexpr std::array<quantity_info, first_metrics + second_metrics + link_metrics> metrics =
        detail::join(detail::join(detail::prefixed_names<Link::first_name, First::metrics>::table,
                                  detail::prefixed_names<Link::second_name, Second::metrics>::table),
                     Link::metrics);

    /// Corner bounds are exact only when they are for both stages (links are
    /// assumed monotone in the stages' metrics).
    bool corners_are_bounds() const {
        return tauforge::corners_are_bounds(first) && tauforge::corners_are_bounds(second);
    }

    /// Index of the first link metric in `metrics`.
    static constexpr std::size_t link_metric_offset = first_metrics + second_metrics;

    /// Both stages' intervals; parameters the link feeds are fixed (their value
    /// comes from the first stage at every evaluation).
    std::array<interval, first_parameters + second_parameters> ranges() const {
        auto b = second.ranges();
        for (std::size_t i : detail::fed_parameters_of<Link>()) b[i] = interval::exactly(b[i].nominal);
        return detail::join(first.ranges(), b);
    }

    /// Both stages' metrics, then the link's.
    std::array<double, first_metrics + second_metrics + link_metrics> evaluate(
        const std::array<double, first_parameters + second_parameters>& x) const {
        std::array<double, first_parameters> xa{};
        std::array<double, second_parameters> xb{};
        for (std::size_t i = 0; i < first_parameters; ++i) xa[i] = x[i];
        for (std::size_t i = 0; i < second_parameters; ++i) xb[i] = x[first_parameters + i];
        const auto ma = first.evaluate(xa);
        if constexpr (detail::FeedingLink<Link>) Link::feed(ma, xb);
        const auto mb = second.evaluate(xb);
        return detail::join(detail::join(ma, mb), Link::evaluate(ma, mb));
    }
};

/// A designable chain: both stages' slots, the second's parameter indices shifted.
template <DesignableNetwork First, DesignableNetwork Second, class Link>
struct designable_chain : chain<First, Second, Link> {
    using base = chain<First, Second, Link>;
    static constexpr std::size_t first_slots = First::design_slots.size();
    static constexpr std::size_t second_slots = Second::design_slots.size();

    static constexpr std::array<design_slot, first_slots + second_slots> design_slots = [] {
        std::array<design_slot, first_slots + second_slots> out{};
        const auto& a = detail::prefixed_names<Link::first_name, First::design_slots>::table;
        const auto& b = detail::prefixed_names<Link::second_name, Second::design_slots>::table;
        for (std::size_t i = 0; i < first_slots; ++i)
            out[i] = {a[i].name, First::design_slots[i].kind, First::design_slots[i].parameter};
        for (std::size_t i = 0; i < second_slots; ++i)
            out[first_slots + i] = {b[i].name, Second::design_slots[i].kind,
                                    base::first_parameters + Second::design_slots[i].parameter};
        return out;
    }();

    /// A copy with both stages' slots bought as given.
    designable_chain with_parts(const std::array<part_choice, first_slots + second_slots>& p) const {
        std::array<part_choice, first_slots> pa{};
        std::array<part_choice, second_slots> pb{};
        for (std::size_t i = 0; i < first_slots; ++i) pa[i] = p[i];
        for (std::size_t i = 0; i < second_slots; ++i) pb[i] = p[first_slots + i];
        designable_chain c = *this;
        c.first = this->first.with_parts(pa);
        c.second = this->second.with_parts(pb);
        return c;
    }

    /// Solves a slot for a metric of the same stage (NaN for link metrics, for
    /// a slot of the other stage, or a stage that cannot be solved).
    double solve_slot(std::size_t slot, std::size_t metric, double target,
                      const std::array<double, first_slots + second_slots>& v) const {
        constexpr double nan = std::numeric_limits<double>::quiet_NaN();
        if (slot < first_slots && metric < base::first_metrics) {
            if constexpr (SolvableNetwork<First>) {
                std::array<double, first_slots> va{};
                for (std::size_t i = 0; i < first_slots; ++i) va[i] = v[i];
                return this->first.solve_slot(slot, metric, target, va);
            }
        } else if (slot >= first_slots && metric >= base::first_metrics && metric < base::link_metric_offset) {
            if constexpr (SolvableNetwork<Second> && !detail::FeedingLink<Link>) {
                std::array<double, second_slots> vb{};
                for (std::size_t i = 0; i < second_slots; ++i) vb[i] = v[first_slots + i];
                return this->second.solve_slot(slot - first_slots, metric - base::first_metrics, target, vb);
            }
        }
        return nan;
    }
};

}  // namespace tauforge
