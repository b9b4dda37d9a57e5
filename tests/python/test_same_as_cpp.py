"""The module gives the C++ API's numbers bit for bit on the same inputs
(tests/python/cpp_reference.cpp calls the library directly and prints them)."""
import json
import math
import os
import subprocess

import pytest

import tauforge as tf


@pytest.fixture(scope="module")
def cpp():
    exe = os.environ.get("TAUFORGE_CPP_REFERENCE")
    if not exe:
        pytest.fail("TAUFORGE_CPP_REFERENCE is not set (ctest sets it to tauforge_python_reference)")
    return json.loads(subprocess.run([exe], check=True, capture_output=True, text=True).stdout)


def test_crossing_time(cpp):
    assert tf.crossing_time(0, 5, 5.0 * 2.0 / 3.0, 100e3 * 10e-9) == cpp["crossing_time"]


def test_synthesize(cpp):
    res = tf.synthesize(tf.RcDelay(), {"delay": "1ms,20%"}, resistors=tf.ResistorValues.from_series("E24", 1e3, 1e6),
                        capacitors=tf.CapacitorValues.from_series("E12", 1e-9, 1e-6), top=3)
    got = [{"R": d["parts"]["R"]["value"], "C": d["parts"]["C"]["value"], "margin": d["margin"],
            "worst_min": d["worst_min"]["delay"], "worst_max": d["worst_max"]["delay"]} for d in res["designs"]]
    assert got == cpp["synthesize"]
    assert res["evaluated"] == cpp["synthesize_evaluated"]


def test_analyses(cpp, one_shot):
    wc = tf.worst_case(one_shot)["pulse width"]
    assert [wc["nominal"], wc["min"], wc["max"]] == cpp["worst_case"]
    r = tf.rss(one_shot)["pulse width"]
    assert [r["sigma"], r["low"], r["high"]] == cpp["rss"]
    s = tf.sensitivity(one_shot)["pulse width"]
    assert [s["R"], s["C"]] == cpp["sensitivity"]


def test_monte_carlo_and_limits(cpp, one_shot):
    mc = tf.monte_carlo(one_shot, {"pulse width": (0.9e-3, 1.3e-3)}, samples=20000, seed=7)
    pw = mc["metrics"]["pulse width"]
    ref = cpp["monte_carlo"]
    assert [mc["yield"]["estimate"], mc["yield"]["low"], mc["yield"]["high"]] == ref["yield"]
    assert (pw["mean"], pw["stddev"], pw["min"], pw["max"], pw["percentiles"][0.5]) == (
        ref["mean"], ref["stddev"], ref["min"], ref["max"], ref["median"])
    (lim,) = tf.test_limits(one_shot, {"pulse width": (0.9e-3, 1.3e-3)}, uncertainty=10e-6, samples=20000, seed=7)
    assert [*lim["acceptance"], lim["rates"]["false_reject_rate"]] == cpp["test_limits"]
    rb = tf.read_back(one_shot, "C", ("pulse width", 1.05e-3), uncertainty=5e-6)
    assert list(rb["estimate"]) == cpp["read_back"]
    assert all(math.isfinite(v) for v in cpp["read_back"])
