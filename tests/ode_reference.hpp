#pragma once
// Boost.Odeint references for the network tests: integrate a circuit's own
// differential equations (written out in each test), find events by a sign change
// over a step and bisection on the dense output. Nothing here calls tauforge.

#include <boost/numeric/odeint.hpp>

#include <array>
#include <cmath>
#include <cstddef>
#include <optional>
#include <utility>
#include <vector>

namespace tauforge_test::ode {

namespace odeint = boost::numeric::odeint;

template <std::size_t N>
using state = std::array<double, N>;

/// x' = f(x, t) integrated with Dormand-Prince 5(4) under error control (abs, rel),
/// ending exactly at t1 (the controlled stepper shortens its last step). For a piecewise
/// input, integrate each interval on its own so no step straddles a switching instant.
template <std::size_t N, class F>
state<N> integrate(F f, state<N> x, double t0, double t1, double tol = 1e-13) {
    if (t1 <= t0) return x;
    auto stepper = odeint::make_controlled(tol, tol, odeint::runge_kutta_dopri5<state<N>>());
    auto sys = [&](const state<N>& y, state<N>& dy, double t) { dy = f(y, t); };
    odeint::integrate_adaptive(stepper, sys, x, t0, t1, (t1 - t0) * 1e-4);
    return x;
}

/// A dense-output path of x' = f(x, t) from (t0, x0), stepped on demand.
template <std::size_t N, class F>
class path {
public:
    path(F f, state<N> x0, double t0, double t_scale, double tol = 1e-13)
        : f_(std::move(f)), stepper_(odeint::make_dense_output(tol, tol, odeint::runge_kutta_dopri5<state<N>>())) {
        stepper_.initialize(x0, t0, t_scale * 1e-6);
    }
    void step() {
        auto sys = [&](const state<N>& y, state<N>& dy, double t) { dy = f_(y, t); };
        stepper_.do_step(sys);
    }
    double time() const { return stepper_.current_time(); }
    double previous_time() const { return stepper_.previous_time(); }
    /// The state at t within the last step.
    state<N> at(double t) {
        state<N> y;
        stepper_.calc_state(t, y);
        return y;
    }

    /// The first t in (start, t_end] where h(x) changes sign from its sign at the
    /// start: a sign change over a step, then bisection to the last bit.
    template <class H>
    std::optional<double> first_root(H h, double t_end) {
        const double side = h(stepper_.current_state()) > 0.0 ? 1.0 : -1.0;
        while (time() < t_end) {
            step();
            const double b = std::min(time(), t_end);
            if (side * h(at(b)) <= 0.0) return bisect(h, previous_time(), b, side);
            if (b == t_end) break;
        }
        return std::nullopt;
    }

    /// Calls visit(t) at every root of h in (start, t_end] (sign changes over a
    /// step, located by bisection), for extremum searches.
    template <class H, class Visit>
    void roots(H h, double t_end, Visit visit) {
        double side = h(stepper_.current_state()) > 0.0 ? 1.0 : -1.0;
        while (time() < t_end) {
            step();
            const double b = std::min(time(), t_end);
            if (side * h(at(b)) <= 0.0) {
                visit(bisect(h, previous_time(), b, side));
                side = -side;
            }
            if (b == t_end) break;
        }
    }

private:
    template <class H>
    double bisect(H h, double lo, double hi, double side) {
        for (int i = 0; i < 200 && hi - lo > 0.0; ++i) {
            const double mid = lo + (hi - lo) / 2.0;
            if (mid == lo || mid == hi) break;
            (side * h(at(mid)) > 0.0 ? lo : hi) = mid;
        }
        return hi;
    }

    F f_;
    decltype(odeint::make_dense_output(1e-13, 1e-13, odeint::runge_kutta_dopri5<state<N>>())) stepper_;
};

template <std::size_t N, class F>
path<N, F> make_path(F f, state<N> x0, double t0, double t_scale, double tol = 1e-13) {
    return path<N, F>(std::move(f), x0, t0, t_scale, tol);
}

/// The first t in (t0, t_end] where v, from v0 under dv/dt = f(t, v), reaches
/// `target`, and v there; t < 0 when it never does.
struct crossing {
    double t = -1.0, v = 0.0;
};
template <class F>
crossing first_crossing(F f, double t0, double v0, double target, double t_end) {
    auto path = make_path<1>([f](const state<1>& x, double t) { return state<1>{f(t, x[0])}; }, state<1>{v0}, t0,
                             t_end - t0);
    const auto t = path.first_root([target](const state<1>& x) { return x[0] - target; }, t_end);
    if (!t) return {};
    return {*t, path.at(*t)[0]};
}

/// A switching circuit: run dv/dt = f0 until target0, then f1 until target1, and
/// so on from v0 at t = 0, each restarted from the state at the event; the event
/// times (empty if a phase never ends within `span`).
template <class F0, class F1>
std::vector<double> switching_times(F0 f0, double target0, F1 f1, double target1, double v0, int events, double span) {
    std::vector<double> times;
    double t = 0.0, v = v0;
    for (int i = 0; i < events; ++i) {
        const crossing e =
            i % 2 ? first_crossing(f1, t, v, target1, t + span) : first_crossing(f0, t, v, target0, t + span);
        if (e.t < 0.0) return {};
        times.push_back(e.t);
        t = e.t;
        v = e.v;
    }
    return times;
}

}  // namespace tauforge_test::ode
