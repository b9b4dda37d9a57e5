"""The exact first-order response (rc.hpp) against handbook relations."""
import math

import pytest

import tauforge as tf


def test_one_shot_width_is_rc_ln3():
    # Charging from 0 to 2/3 of the supply takes RC ln 3 (common practice: the
    # comparator-timer one-shot, pulse width = 1.1 RC).
    tau = 100e3 * 10e-9
    assert tf.crossing_time(0, 5, 5 * 2 / 3, tau) == pytest.approx(tau * math.log(3), rel=1e-15)
    assert tf.crossing_time("0V", "5V", "3.3333333333333335 V", "1ms") == pytest.approx(1e-3 * math.log(3), rel=1e-15)


def test_one_third_to_two_thirds_is_rc_ln2():
    # The astable's charge from 1/3 to 2/3 of the supply: RC ln 2 (common practice).
    assert tf.crossing_time(5 / 3, 5, 10 / 3, 1e-3) == pytest.approx(1e-3 * math.log(2), rel=1e-14)


def test_voltage_at_and_time_constant_for_invert_crossing_time():
    t = tf.crossing_time(0, 5, 2, 1e-3)
    assert tf.voltage_at(0, 5, 1e-3, t) == pytest.approx(2.0, rel=1e-14)
    assert tf.time_constant_for(0, 5, 2, t) == pytest.approx(1e-3, rel=1e-14)
    # v(t) = vf + (vs - vf) e^(-t/tau), written out.
    assert tf.voltage_at(1, 4, 2e-3, 1e-3) == pytest.approx(4 + (1 - 4) * math.exp(-0.5), rel=1e-15)


def test_settling_and_adc_rules():
    assert tf.settling_time(0.01, 1.0) == pytest.approx(math.log(100), rel=1e-15)   # 4.605 tau for 1 %
    assert tf.settling_time("1 %", "1 s") == pytest.approx(4.605170185988091, rel=1e-15)
    assert tf.half_lsb_time_constants(12) == pytest.approx(13 * math.log(2), rel=1e-15)


def test_thevenin_reductions():
    # Derivation: v_final = (vs rp + vsh rs) / (rs + rp), tau = C rs rp / (rs + rp).
    vf, tau = tf.with_shunt(5, "10k", "1u", "40k")
    assert vf == pytest.approx(5 * 40e3 / 50e3, rel=1e-15)
    assert tau == pytest.approx(1e-6 * 10e3 * 40e3 / 50e3, rel=1e-15)
    vf, tau = tf.with_leakage_current(5, "100k", "1u", "1uA")
    assert (vf, tau) == pytest.approx((5 - 1e-6 * 100e3, 0.1), rel=1e-15)


def test_ramp_with_zero_rise_is_a_step():
    assert tf.ramp_crossing_time(0, 5, 0, 0, 2.5, 1e-3) == pytest.approx(tf.crossing_time(0, 5, 2.5, 1e-3), rel=1e-14)
    # A slow ramp crosses later than the step.
    assert tf.ramp_crossing_time(0, 5, "2ms", 0, 2.5, 1e-3) > tf.crossing_time(0, 5, 2.5, 1e-3)
    assert tf.ramp_voltage_at(0, 5, 0, 0, 1e-3, 1e-3) == pytest.approx(5 * (1 - math.exp(-1)), rel=1e-14)
