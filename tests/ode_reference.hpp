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

}  // namespace tauforge_test::ode
