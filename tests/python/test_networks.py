"""Every catalogue network is bound, with its parameters, metrics, parts and settings."""
import math

import pytest

import tauforge as tf

CLASSES = ["RcDelay", "TimerMonostable", "TimerAstable", "SchmittOscillator", "EdgeDetector", "Debounce",
           "PulseFilter", "TwoStagePulseFilter", "AdcSettling"]


def test_the_catalogue_is_complete():
    assert sorted(tf.NETWORKS) == sorted(["rc_delay", "timer_monostable", "timer_astable", "schmitt_oscillator",
                                          "edge_detector", "debounce", "pulse_filter", "two_stage_pulse_filter",
                                          "adc_settling"])
    for name in CLASSES:
        assert getattr(tf, name) in tf.NETWORKS.values()


@pytest.mark.parametrize("name", CLASSES)
def test_every_network_evaluates_its_example(name):
    cls = getattr(tf, name)
    net = cls.example()
    assert isinstance(net, tf.Network)
    assert net.name == cls.catalogue_name
    assert cls.__doc__ and cls.title in cls.__doc__
    params, metrics = net.parameters, net.metrics
    assert params and metrics
    ranges = net.ranges()
    assert list(ranges) == [p for p, _ in params]
    for nominal, low, high in ranges.values():
        assert low <= nominal <= high
    values = net.evaluate()
    assert list(values) == [m for m, _ in metrics]
    # The nominal point given explicitly evaluates the same.
    assert net.evaluate([r[0] for r in ranges.values()]) == values
    wc = tf.worst_case(net)
    for m, v in values.items():
        if math.isfinite(v):
            assert wc[m]["min"] <= v <= wc[m]["max"]
    assert set(net.settings) >= set(net.setting_help)
    assert [p["name"] for p in net.parts] == [p for p in net.part_names if p in {q["name"] for q in net.parts}]


def test_parts_and_settings_by_keyword():
    net = tf.TimerMonostable(R="100k,1%", C="10n,10%,X7R", supply="4.5V..5.5V", temperature="-20..70")
    assert net.settings["supply"] == "4.5 V .. 5.5 V"
    assert net.settings["temperature"] == "-20..70"
    c = [p for p in net.parts if p["name"] == "C"][0]
    assert c["tempco"] == "X7R" and c["tolerance"] == tf.Tolerance(0.10)
    nominal, low, high = net.ranges()["C"]
    assert low < 9e-9 and high > 11e-9           # X7R widens the band beyond ±10 % over -20..70 °C
    net.set("propagation_delay", "100ns..300ns")   # '_' reads as '-'
    assert net.settings["propagation-delay"] == "100 ns .. 300 ns"
    net.set("R", "200k,1%")
    assert net.ranges()["R"][0] == 200e3
    copy = net.copy()
    copy.set("R", "1k,1%")
    assert net.ranges()["R"][0] == 200e3


def test_network_by_name_or_alias():
    a = tf.network("one-shot", R="10k,1%", C="100n,5%")
    assert isinstance(a, tf.TimerMonostable)
    assert tf.network("timer_monostable", R="10k,1%", C="100n,5%").evaluate() == a.evaluate()


def test_one_shot_width_is_rc_ln3():
    # Comparator-timer one-shot: t = R C ln 3 = 1.1 R C (common practice).
    net = tf.TimerMonostable(R="10k,1%", C="100n,5%")
    assert net.evaluate()["pulse width"] == pytest.approx(10e3 * 100e-9 * math.log(3), rel=1e-14)


def test_astable_frequency_handbook_relation():
    # Comparator-timer astable: f = 1 / (ln 2 (Ra + 2 Rb) C), duty = (Ra + Rb) / (Ra + 2 Rb)
    # (common practice, without steering diode).
    net = tf.TimerAstable(Ra="10k,1%", Rb="47k,1%", C="10n,5%")
    f = net.evaluate()
    assert f["frequency"] == pytest.approx(1 / (math.log(2) * (10e3 + 2 * 47e3) * 10e-9), rel=1e-12)
    assert f["duty"] == pytest.approx((10e3 + 47e3) / (10e3 + 2 * 47e3), rel=1e-12)


def test_evaluate_at_a_named_point():
    net = tf.RcDelay(R="10k,5%", C="100n,10%")
    base = net.evaluate()["delay"]
    twice = net.evaluate({"R": 20e3})["delay"]
    assert twice == pytest.approx(2 * base, rel=1e-12)   # delay proportional to R C (derivation)


def test_repr_reads_back_and_parts_before_values():
    net = tf.TimerMonostable(R="100k,1%", C="10n,10%,X7R")
    assert repr(net) == 'TimerMonostable(R="100 kΩ,±1 %", C="10 nF,±10 %,X7R")'
    again = eval(repr(net), {"TimerMonostable": tf.TimerMonostable})
    assert again.ranges() == net.ranges()
    empty = tf.RcDelay()
    assert repr(empty) == "RcDelay()"
    assert [p["range"] for p in empty.parts] == [None, None]   # no values yet: no ranges
    assert net.evaluate({"R": "200k"})["pulse width"] == pytest.approx(2 * net.evaluate()["pulse width"], rel=1e-12)


def test_every_public_name_is_documented():
    assert tf.__version__ == "0.1.0"                 # project(tauforge VERSION ...) in CMakeLists.txt
    undocumented = [name for name in dir(tf) if not name.startswith("_") and callable(getattr(tf, name))
                    and not (getattr(tf, name).__doc__ or "").strip()]
    assert undocumented == []


def test_capacitor_kinds_dc_bias_and_ageing():
    # The part texts of the command line: an X7R part with rating and case size takes the
    # library's generic DC-bias estimate. 100 kΩ ±1 %, 10 nF ±10 %: R C ln 3 = 1.0986 ms at
    # nominal without bias (common practice); with the 16 V 0603 estimate the same worst case
    # as the command line's check (764 µs .. 952 µs, tests/cli/CMakeLists.txt).
    plain = tf.TimerMonostable(R="100k,1%", C="10n,10%,X7R")
    assert tf.worst_case(plain)["pulse width"]["nominal"] == pytest.approx(100e3 * 10e-9 * math.log(3), rel=1e-12)
    biased = tf.TimerMonostable(R="100k,1%", C="10n,10%,X7R,16V,0603")
    wc = tf.worst_case(biased)["pulse width"]
    assert tf.format(wc["min"], "s") == "764 µs"
    assert tf.format(wc["max"], "s") == "952 µs"
    # An electrolytic ages over its service life: 2000 h at 105 °C lasts 32,000 h at 65 °C
    # (10 K rule, common practice); five years is past its end of life.
    aged = tf.RcDelay(R="100k,1%", C="100u,AL", temperature="0..65", service_life="2y")
    assert aged.settings["service life"] == "2y"
    assert aged.ranges()["C"][1] == pytest.approx(100e-6 * 0.8 * 0.7 * (1 - 0.2 * 17532 / 32000), rel=1e-12)
    with pytest.raises(tf.DomainError, match="service_hours = 43830 h is invalid"):
        tf.RcDelay(R="100k,1%", C="100u,AL", temperature="0..65", service_life="5y").ranges()
