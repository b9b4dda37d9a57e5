#pragma once
/// Building a node waveform for the plot from first-order segments. Every voltage
/// comes from the library's rc.hpp (detail::rc::voltage_at), the one home of the
/// exponential; the networks' own crossing times set where each segment ends.

#include "common.hpp"

#include <tauforge/rc.hpp>

#include <algorithm>
#include <string>

namespace tfcli {

class trace_builder {
public:
    /// t_end <= 0: no limit (the caller decides the natural length).
    explicit trace_builder(std::string node, double t_end) : t_end_(t_end) { w_.node = std::move(node); }

    /// True once the plot's end is reached.
    bool full() const { return t_end_ > 0.0 && !w_.points.empty() && w_.points.back().first >= t_end_; }

    /// An exponential from v0 towards vf with time constant tau, for `length` seconds
    /// starting at t0; returns the voltage at its end.
    double segment(double t0, double length, double v0, double vf, double tau, int steps = 160) {
        for (int i = 0; i <= steps; ++i) {
            const double dt = length * i / steps;
            if (!add(t0 + dt, tauforge::detail::rc::voltage_at(v0, vf, tau, dt) - offset_)) break;
        }
        return tauforge::detail::rc::voltage_at(v0, vf, tau, length);
    }

    /// An arbitrary function of time since t0, sampled.
    template <class F>
    void sampled(double t0, double length, F&& v_of, int steps = 160) {
        for (int i = 0; i <= steps; ++i) {
            const double dt = length * i / steps;
            if (!add(t0 + dt, v_of(dt) - offset_)) break;
        }
    }

    /// A constant level from t0 to t1.
    void hold(double t0, double t1, double v) {
        add(t0, v - offset_);
        add(t1, v - offset_);
    }

    /// Plot every value minus `v` from here on (a filter's output about its average).
    void offset(double v) { offset_ = v; }

    void threshold(std::string label, double v) { w_.thresholds.emplace_back(std::move(label), v); }
    /// The vertical axis: label, unit (as in format_si), logarithmic or not.
    void axis(std::string label, std::string unit, bool log_y) {
        w_.y_label = std::move(label);
        w_.y_unit = std::move(unit);
        w_.log_y = log_y;
    }
    void event(std::string label, double t) { w_.events.emplace_back(std::move(label), t); }

    /// The time the plot should run to: the limit, or `natural` without one.
    double end(double natural) const { return t_end_ > 0.0 ? t_end_ : natural; }

    waveform take() && { return std::move(w_); }

private:
    /// Adds a point, cut at t_end (the last point lands on it); false once past it.
    bool add(double t, double v) {
        if (t_end_ > 0.0 && t > t_end_) {
            if (!w_.points.empty() && w_.points.back().first < t_end_) {
                const auto [t0, v0] = w_.points.back();
                w_.points.emplace_back(t_end_, v0 + (v - v0) * (t_end_ - t0) / (t - t0));
            }
            return false;
        }
        w_.points.emplace_back(t, v);
        return true;
    }

    waveform w_;
    double t_end_;
    double offset_ = 0.0;
};

}  // namespace tfcli
