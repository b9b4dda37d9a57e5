"""Synthesis from Python: ranked designs, infeasible specs, progress and the GIL."""
import pytest

import tauforge as tf

README_DESIGNS = [
    "R = 1.1 kΩ, C = 820 nF: delay 847 µs .. 1.14 ms; margin 23.6 % (delay min)",
    "R = 11 kΩ, C = 82 nF: delay 847 µs .. 1.14 ms; margin 23.6 % (delay min)",
    "R = 110 kΩ, C = 8.2 nF: delay 847 µs .. 1.14 ms; margin 23.6 % (delay min)",
]


def test_readme_delay_design():
    r = tf.ResistorValues.from_series("E24", "1k", "1M")
    c = tf.CapacitorValues.from_series("E12", "1n", "1u")
    res = tf.synthesize(tf.RcDelay(), {"delay": "1ms,20%"}, resistors=r, capacitors=c, top=3)
    assert res["feasible"] and res["why"] == ""
    assert [d["description"] for d in res["designs"]] == README_DESIGNS
    best = res["designs"][0]
    assert best["parts"]["R"]["value"] == 1100.0 and best["parts"]["C"]["origin"] == "E12"
    assert best["holds"] and best["margin"] == pytest.approx(0.236, abs=5e-4)
    assert 0.8e-3 <= best["worst_min"]["delay"] < best["nominal"]["delay"] < best["worst_max"]["delay"] <= 1.2e-3
    # The design's network is a network: it can be checked further.
    wc = tf.worst_case(best["network"])["delay"]
    assert (wc["min"], wc["max"]) == pytest.approx((best["worst_min"]["delay"], best["worst_max"]["delay"]), rel=1e-12)


def test_value_sets_as_text_lists_and_slots():
    by_text = tf.synthesize(tf.RcDelay(), ["delay=0.8ms..1.2ms"], resistors="E24,1k..1M", capacitors="E12,1n..1u", top=3)
    by_object = tf.synthesize(tf.RcDelay(), {"delay": (0.8e-3, 1.2e-3)},
                              slots={"R": tf.ResistorValues.from_series("E24", 1e3, 1e6),
                                     "C": tf.CapacitorValues.from_series("E12", 1e-9, 1e-6)}, top=3)
    assert [d["description"] for d in by_text["designs"]] == [d["description"] for d in by_object["designs"]]
    stock = tf.synthesize(tf.RcDelay(), {"delay": "1ms,20%"}, resistors=[("10k", "1%"), ("22k", "1%")],
                          capacitors=[("100n", "5%"), ("47n", "5%")], top=5)
    assert {d["parts"]["R"]["origin"] for d in stock["designs"]} == {"stock"}


def test_exhaustive_and_fast_agree():
    spec = {"frequency": "2.4kHz,10%", "duty": "55%..65%"}
    kw = dict(resistors="E12,1k..100k", capacitors="E6,1n..100n", top=5)
    fast = tf.synthesize(tf.TimerAstable(), spec, method="fast", **kw)
    full = tf.synthesize(tf.TimerAstable(), spec, method="exhaustive", **kw)
    assert [d["description"] for d in fast["designs"]] == [d["description"] for d in full["designs"]]
    assert fast["evaluated"] < full["evaluated"]


def test_infeasible_spec_names_the_constraint():
    res = tf.synthesize(tf.RcDelay(), {"delay": "1ms,1%"}, top=3)
    assert not res["feasible"] and res["designs"] == []
    assert res["why"] == "tolerance too wide"
    assert res["reason"].startswith("no design holds delay within")


def test_progress_callback_reports_and_can_cancel():
    seen = []
    spec = {"frequency": "2.4kHz,10%", "duty": "55%..65%"}
    res = tf.synthesize(tf.TimerAstable(), spec, top=3, progress=seen.append, progress_interval=0.0)
    assert seen and seen == sorted(seen)
    plain = tf.synthesize(tf.TimerAstable(), spec, top=3)
    assert [d["description"] for d in res["designs"]] == [d["description"] for d in plain["designs"]]

    class Stop(Exception):
        pass

    def stop(count):
        raise Stop(f"stopped after {count}")

    with pytest.raises(Stop, match="stopped after"):
        tf.synthesize(tf.TimerAstable(), spec, top=3, progress=stop, progress_interval=0.0)


def test_synthesis_releases_the_gil(ticks_during):
    elapsed, ticks = ticks_during(lambda: tf.synthesize(
        tf.TimerAstable(), {"frequency": "2.4kHz,10%", "duty": "55%..65%"}, resistors="E24", capacitors="E12", top=10,
        method="exhaustive"))
    assert elapsed > 0.05
    assert ticks > 0.2 * elapsed / 0.001


def test_invalid_settings_are_an_error_not_an_empty_result():
    # A threshold above the supply: the network's own message, before any search.
    with pytest.raises(ValueError, match="threshold") as e:
        tf.synthesize(tf.RcDelay(threshold="1.5"), {"delay": "1ms,20%"})
    assert isinstance(e.value, (tf.InvalidArgument, tf.DomainError))
