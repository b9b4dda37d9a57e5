"""Value notation: SI prefixes, RKM code and tolerance letters (notation.hpp)."""
import math

import pytest

import tauforge as tf


def test_parse_every_quantity():
    assert tf.parse_resistance("4k7") == 4700.0           # IEC 60062 RKM code (from memory)
    assert tf.parse_resistance("4.7 kΩ") == 4700.0
    assert tf.parse_resistance("470R") == 470.0
    assert tf.parse_resistance("R47") == 0.47
    assert tf.parse_capacitance("2n2") == 2.2e-9
    assert tf.parse_capacitance("100 nF") == 100e-9
    assert tf.parse_duration("250ms") == 0.25
    assert tf.parse_voltage("-12 V") == -12.0
    assert tf.parse_current("250 nA") == 250e-9
    assert tf.parse_frequency("2.4kHz") == 2400.0
    assert tf.parse_ratio("50 %") == 0.5


def test_format_engineering_notation():
    assert tf.format(4700, "Ω") == "4.7 kΩ"
    assert tf.format(4700, "Ω", ascii=True) == "4.7 kohm"
    assert tf.format(4700, "Ω", trailing_zeros=True) == "4.70 kΩ"
    assert tf.format(1e-7, "F") == "100 nF"
    assert tf.format(999.96, "Ω") == "1 kΩ"      # rounded first, then the prefix chosen
    assert tf.format(2.2e-6, "s", ascii=True) == "2.2 us"


def test_rkm_codes_iec_60062():
    # IEC 60062 letter at the decimal point (from memory).
    assert tf.format_rkm_resistance(4700) == "4K7"
    assert tf.format_rkm_resistance("1k") == "1K0"
    assert tf.format_rkm_resistance(0.47) == "R47"
    assert tf.format_rkm_capacitance(2.2e-9) == "2n2"
    assert tf.format_rkm_capacitance(2.2e-9, upper=True) == "2N2"
    assert tf.parse_resistance(tf.format_rkm_resistance(1.5e6)) == 1.5e6


def test_tolerance_letters_iec_60062():
    # IEC 60062 tolerance letters (from memory).
    letters = {"B": 0.001, "C": 0.0025, "D": 0.005, "F": 0.01, "G": 0.02, "J": 0.05, "K": 0.10, "M": 0.20}
    for letter, band in letters.items():
        t = tf.parse_tolerance(letter)
        assert (t.minus, t.plus) == pytest.approx((band, band), rel=1e-12)
        assert t.letter == letter
    z = tf.parse_tolerance("Z")
    assert (z.minus, z.plus) == pytest.approx((0.20, 0.80))
    assert tf.parse_tolerance("+80/-20%") == z


def test_tolerance_objects():
    t = tf.Tolerance(0.05)
    assert str(t) == "±5 %"
    assert tf.format_tolerance(t, ascii=True) == "+/-5 %"
    assert tf.format_tolerance((0.2, 0.8)) == "+80/-20 %"
    assert tf.Tolerance(0.2, 0.8).widest == 0.8
    assert tf.Tolerance(0.03).letter is None
    assert tf.format_percent(0.05) == "5 %"


def test_round_trip_of_formatted_values():
    for v in (1.0, 4.7e3, 3.3e-12, 1.5e6, 0.47, 82e-9):
        assert tf.parse_resistance(tf.format(v, "Ω", digits=17)) == v
    assert math.isclose(tf.parse_capacitance(tf.format(1e-6 / 3, "F", digits=17)), 1e-6 / 3, rel_tol=0)
