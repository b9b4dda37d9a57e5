"""Each library error kind arrives as its own ValueError subclass with the library's message."""
import math

import pytest

import tauforge as tf


def test_the_classes():
    assert issubclass(tf.InvalidArgument, ValueError)
    assert issubclass(tf.DomainError, ValueError)
    assert issubclass(tf.ParseError, tf.InvalidArgument)
    assert not issubclass(tf.DomainError, tf.InvalidArgument)


def test_nan_and_negative():
    # Messages word for word as tests/rc_errors_test.cpp and tests/series_test.cpp check them in C++.
    with pytest.raises(tf.InvalidArgument) as e:
        tf.crossing_time(0, 5, 1, math.nan)
    assert str(e.value) == "crossing_time: tau = nan s is invalid; expected a positive, finite time constant"
    with pytest.raises(tf.InvalidArgument) as e:
        tf.crossing_time(0, 5, 1, -1e-3)
    assert str(e.value) == "crossing_time: tau = -1 ms is invalid; expected a positive, finite time constant"
    with pytest.raises(tf.InvalidArgument) as e:
        tf.ResistorValues.from_series("E24", -10, 1e6)
    assert str(e.value) == "value_set::from_series: min = -10 Ω is invalid; expected a positive, finite resistance"
    with pytest.raises(tf.InvalidArgument):
        tf.TimerMonostable(R="100k,1%", C="10n,10%").set("supply", "nan V")


def test_unreachable_threshold():
    with pytest.raises(tf.DomainError) as e:
        tf.crossing_time(0, 5, 6, 1e-3)
    assert str(e.value) == ("crossing_time: v_threshold = 6 V is not reached from v_start = 0 V towards v_final = 5 V; "
                            "expected a threshold strictly between start and final value, or equal to the start")


def test_empty_set():
    with pytest.raises(tf.InvalidArgument) as e:
        tf.CapacitorValues.from_list([])
    assert str(e.value) == "value_set::from_list: parts = (none) is invalid; expected at least one value"
    with pytest.raises(tf.InvalidArgument, match="at least one E3 value"):
        tf.ResistorValues.from_series("E3", "5k", "6k")


def test_malformed_text():
    with pytest.raises(tf.ParseError) as e:
        tf.parse_resistance("4x7")
    assert str(e.value) == ('parse: "4x7" is not a resistance: unexpected "x7" after "4"; '
                            'expected e.g. "4.7k", "4k7" or "4.7 kohm"')
    with pytest.raises(tf.ParseError):
        tf.parse_tolerance("5")
    with pytest.raises(tf.ParseError):
        tf.crossing_time("0V", "5V", "2 volts-ish", "1ms")
    with pytest.raises(tf.InvalidArgument, match="is not a setting of timer_monostable"):
        tf.TimerMonostable(voltage="5V")
    with pytest.raises(tf.InvalidArgument, match="expected one of"):
        tf.synthesize(tf.RcDelay(), {"width": "1ms,10%"})
    with pytest.raises(tf.InvalidArgument, match="expected normal or uniform"):
        tf.monte_carlo(tf.TimerMonostable.example(), distribution="lognormal")


def test_wrong_types_raise_type_error_not_crash():
    with pytest.raises(TypeError):
        tf.crossing_time(0, 5, 1, None)
    with pytest.raises(TypeError):
        tf.worst_case("rc_delay")
