"""Worst case, sensitivities, RSS, Monte Carlo, test limits and read-back from Python."""
import math

import pytest

import tauforge as tf


def test_worst_case_corners_of_the_one_shot(one_shot):
    # t = R C ln 3 is increasing in R and C: the minimum at both low, the maximum at both high (derivation).
    wc = tf.worst_case(one_shot)["pulse width"]
    assert wc["min"] == pytest.approx(99e3 * 9e-9 * math.log(3), rel=1e-14)
    assert wc["max"] == pytest.approx(101e3 * 11e-9 * math.log(3), rel=1e-14)
    assert wc["min_corner"] == {"R": (pytest.approx(99e3), "low"), "C": (pytest.approx(9e-9), "low")}
    assert wc["max_corner"]["R"][1] == "high" and wc["max_corner"]["C"][1] == "high"


def test_sensitivities_of_rc_ln3(one_shot):
    s = tf.sensitivity(one_shot)["pulse width"]
    assert s["R"] == pytest.approx(1.0, abs=1e-9)    # d ln(RC ln 3) / d ln R = 1 (derivation)
    assert s["C"] == pytest.approx(1.0, abs=1e-9)


def test_rss_of_one_and_ten_percent(one_shot):
    # sigma_t / t = sqrt((0.01/3)^2 + (0.10/3)^2); the 3-sigma band is sqrt(0.01^2 + 0.1^2) = 0.1005 (derivation).
    r = tf.rss(one_shot)["pulse width"]
    assert r["relative_half_band"] == pytest.approx(math.hypot(0.01, 0.10), rel=1e-6)
    assert tf.rss(one_shot, sigmas=2.0)["pulse width"]["relative_half_band"] == pytest.approx(
        1.5 * math.hypot(0.01, 0.10), rel=1e-6)


def test_monte_carlo_is_reproducible_and_thread_independent(one_shot):
    spec = {"pulse width": ("0.9ms", "1.3ms")}
    a = tf.monte_carlo(one_shot, spec, samples=20000, seed=7)
    b = tf.monte_carlo(one_shot, spec, samples=20000, seed=7, threads=2)
    c = tf.monte_carlo(one_shot, spec, samples=20000, seed=8)
    assert a == b
    assert a["metrics"]["pulse width"]["mean"] != c["metrics"]["pulse width"]["mean"]
    pw = a["metrics"]["pulse width"]
    # The mean of R C ln 3 with independent R and C is the nominal (derivation; 20,000 samples, 3.35 % sigma).
    assert pw["mean"] == pytest.approx(1e-3 * math.log(3), rel=5 * 0.0335 / math.sqrt(20000))
    assert pw["window"] == (0.9e-3, 1.3e-3)
    y = a["yield"]
    assert y["low"] <= y["estimate"] <= 1.0
    assert y["high"] == pytest.approx(1.0, abs=1e-15)      # every sample inside: the interval's top is 1
    assert a["samples"] == 20000 and a["seed"] == 7
    assert set(pw["percentiles"]) == {0.00135, 0.025, 0.5, 0.975, 0.99865}


def test_monte_carlo_yield_of_a_tight_window(one_shot):
    # A window of +/-1 sigma of the RSS spread: about 68.3 % inside (normal distribution, common practice).
    sigma = tf.rss(one_shot)["pulse width"]["sigma"]
    nominal = one_shot.evaluate()["pulse width"]
    mc = tf.monte_carlo(one_shot, {"pulse width": (nominal - sigma, nominal + sigma)}, samples=100000, seed=3)
    assert mc["yield"]["estimate"] == pytest.approx(0.6827, abs=0.01)


def test_monte_carlo_releases_the_gil(one_shot, ticks_during):
    elapsed, ticks = ticks_during(lambda: tf.monte_carlo(one_shot, samples=2_000_000, seed=1))
    # The other thread ran while the samples were drawn (it would get nothing with the GIL held).
    assert elapsed > 0.05
    assert ticks > 0.2 * elapsed / 0.001


def test_test_limits_guard_band(one_shot):
    limits = tf.test_limits(one_shot, "pulse-width=0.9ms..1.3ms", uncertainty="10us", samples=20000, seed=7)
    (row,) = limits
    # acceptance = window shrunk by U = k u = 2 x 10 us on each side (the rule in test_limits.hpp).
    assert row["acceptance"] == pytest.approx((0.92e-3, 1.28e-3), rel=1e-12)
    assert row["guard"] == pytest.approx(20e-6)
    assert row["window_source"] == "spec"
    assert 0.0 <= row["rates"]["false_reject_rate"] < 1e-3
    spread = tf.test_limits(one_shot, metric="pulse width", uncertainty="1%", samples=5000)
    assert spread[0]["window_source"] == "worst case"
    wc = tf.worst_case(one_shot)["pulse width"]
    assert spread[0]["window"] == (wc["min"], wc["max"])


def test_read_back_of_the_capacitor(one_shot):
    # Measuring exactly the nominal width reads back the nominal C (t = R C ln 3 solved for C).
    nominal = one_shot.evaluate()["pulse width"]
    rb = tf.read_back(one_shot, "C", ("pulse width", nominal))
    assert rb["estimate"][0] == pytest.approx(10e-9, rel=1e-9)
    # R spans +/-1 %, so C is known to about +/-1 % (plus the tester's 2 u).
    rb = tf.read_back(one_shot, "C", "pulse width=1.05ms", uncertainty="5us")
    c, lo, hi = rb["estimate"]
    assert c == pytest.approx(1.05e-3 / (100e3 * math.log(3)), rel=1e-9)
    assert lo == pytest.approx(c * (1.05e-3 - 10e-6) / 1.05e-3 / 1.01, rel=1e-6)
    assert hi == pytest.approx(c * (1.05e-3 + 10e-6) / 1.05e-3 / 0.99, rel=1e-6)
    assert rb["within_marked"]
