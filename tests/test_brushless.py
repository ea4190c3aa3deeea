"""Brushless drive currents against circuit theory, the three-phase power balance and the
energy balance of an averaged buck converter."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from reviewer.engineering.brushless import (
    FIELD_ORIENTED,
    LOCKED_ROTOR_HOTTEST_PHASE_FACTOR,
    SIX_STEP,
    battery_current,
    current_for_battery_limit,
    dc_equivalent_current,
    duty_cycle,
    kv_from_no_load,
    limited_currents,
    line_to_line_ke,
    line_to_line_resistance,
    locked_rotor_hottest_phase_loss,
    locked_rotor_phase_currents,
    motor_torque,
    phase_peak_current,
    quoted_current,
    torque_per_amp,
    winding_copper_loss,
)
from reviewer.engineering.motor import no_load_speed, rad_s_to_rpm

KE_100KV = 60.0 / (2.0 * math.pi * 100.0)  # SI definition of Kv, brief 3


def test_ke_from_kv() -> None:
    # brief 3 (C): Ke = 60 / (2 pi Kv) = 9.5493 / Kv
    assert line_to_line_ke(100.0) == pytest.approx(0.095493, abs=1e-6)


def test_star_winding_line_to_line_resistance() -> None:
    # circuit theory: two star phases in series between two terminals, R_LL = 2 R_phase
    assert line_to_line_resistance(0.05) == pytest.approx(0.10)
    with pytest.raises(ValueError):
        line_to_line_resistance(0.0)


def test_field_oriented_torque_per_peak_amp_is_0866() -> None:
    # brief 11 (D, three-phase power balance): T = (sqrt 3 / 2) Ke_LL I_pk, 0.866 per peak amp
    ratio = torque_per_amp(1.0, FIELD_ORIENTED, "peak") / torque_per_amp(1.0, SIX_STEP)
    assert ratio == pytest.approx(0.866, abs=5e-4)
    assert 1.0 - ratio == pytest.approx(0.13, abs=0.01)  # "about 13 % less torque per amp"


def test_field_oriented_torque_from_three_phase_power() -> None:
    # three-phase power balance (circuit theory): P = 3 E_rms I_rms = (3/2) E_ph,pk I_pk with
    # current in phase with the back-EMF; E_ph,pk = E_LL,pk / sqrt 3 for a star winding
    omega, peak = 300.0, 40.0
    phase_emf_peak = KE_100KV * omega / math.sqrt(3.0)
    power = 1.5 * phase_emf_peak * peak
    assert motor_torque(KE_100KV, peak, FIELD_ORIENTED, "peak") == pytest.approx(power / omega)


def test_six_step_torque_from_two_conducting_phases() -> None:
    # six-step (Mohan et al., from memory): two phases in series carry I against the flat-top
    # line-to-line back-EMF, P = E_LL I, so T = Ke_LL I
    omega, current = 300.0, 40.0
    power = KE_100KV * omega * current
    assert motor_torque(KE_100KV, current, SIX_STEP) == pytest.approx(power / omega)


def test_field_oriented_copper_loss_from_phase_rms() -> None:
    # circuit theory: a sinusoid's rms is peak / sqrt 2; three phases of R_LL / 2 each give
    # 3 (I_pk^2 / 2)(R_LL / 2) = (3/4) I_pk^2 R_LL
    r_ll, peak = 0.1, 40.0
    per_phase = (peak / math.sqrt(2.0)) ** 2 * (r_ll / 2.0)
    assert winding_copper_loss(peak, r_ll, FIELD_ORIENTED, "peak") == pytest.approx(3 * per_phase)
    assert winding_copper_loss(peak, r_ll, FIELD_ORIENTED, "peak") == pytest.approx(120.0)


def test_six_step_and_brushed_copper_loss() -> None:
    # Joule's law, P = I^2 R through the conducting loop (R_LL for six-step)
    assert winding_copper_loss(40.0, 0.1, SIX_STEP) == pytest.approx(160.0)
    assert winding_copper_loss(40.0, 0.1, "brushed") == pytest.approx(160.0)


def test_rms_figure_is_peak_over_root_two() -> None:
    # circuit theory: I_pk = sqrt 2 I_rms for a sinusoid
    assert phase_peak_current(10.0, FIELD_ORIENTED, "rms") == pytest.approx(14.142, abs=1e-3)
    assert dc_equivalent_current(10.0, FIELD_ORIENTED, "rms") == pytest.approx(
        math.sqrt(1.5) * 10.0
    )
    assert quoted_current(
        dc_equivalent_current(7.0, FIELD_ORIENTED, "rms"), FIELD_ORIENTED, "rms"
    ) == pytest.approx(7.0)


def test_field_oriented_basis_must_be_given() -> None:
    # engineering stance: an unknown basis is never silently taken as one or the other
    with pytest.raises(ValueError):
        dc_equivalent_current(10.0, FIELD_ORIENTED)
    with pytest.raises(ValueError):
        dc_equivalent_current(10.0, "trapezoid")


def test_stall_battery_current_is_i_squared_r_over_v() -> None:
    # brief 11 (energy balance): at a stall V I_b = I^2 R, so 40 A through 0.2 ohm on 36 V
    # draws 320 W / 36 V = 8.889 A from the pack
    assert battery_current(0.0, 40.0, 0.2, 36.0) == pytest.approx(320.0 / 36.0)
    point = limited_currents(0.0, 36.0, 0.2, 40.0, None)
    assert point.limited_by == "motor current limit"
    assert point.battery_current == pytest.approx(8.889, abs=1e-3)
    assert point.electrical_input == pytest.approx(point.copper_loss)


def test_stall_with_battery_limit() -> None:
    # energy balance at a stall: I_b V = I^2 R, so 5 A on 36 V through 0.2 ohm lets
    # I = sqrt(5 x 36 / 0.2) = 30 A through the winding
    point = limited_currents(0.0, 36.0, 0.2, None, 5.0)
    assert point.limited_by == "battery current limit"
    assert point.motor_current == pytest.approx(30.0)
    assert point.battery_current == pytest.approx(5.0)


def test_cruise_energy_balance() -> None:
    # energy balance (electrical in = mechanical out + copper loss): back-EMF 30 V, 20 A
    # through 0.2 ohm on 36 V: d = (30 + 4) / 36, I_b = 18.889 A,
    # V I_b = 680 W = E I (600 W) + I^2 R (80 W)
    point = limited_currents(30.0, 36.0, 0.2, 20.0, None)
    assert point.motor_current == pytest.approx(20.0)
    assert point.battery_current == pytest.approx(18.889, abs=1e-3)
    assert point.electrical_input == pytest.approx(30.0 * 20.0 + point.copper_loss)
    assert point.copper_loss == pytest.approx(80.0)


def test_cruise_battery_limit_root() -> None:
    # quadratic formula on 0.2 I^2 + 30 I - 10 x 36 = 0: I = (-30 + sqrt(900 + 288)) / 0.4
    expected = (-30.0 + math.sqrt(900.0 + 288.0)) / 0.4
    point = limited_currents(30.0, 36.0, 0.2, 20.0, 10.0)
    assert point.limited_by == "battery current limit"
    assert point.motor_current == pytest.approx(expected)
    assert point.battery_current == pytest.approx(10.0)


def test_near_no_load_speed_the_pack_voltage_limits() -> None:
    # Ohm's law: with E = 35 V on 36 V through 0.2 ohm only 5 A flows; duty is then 1, and
    # the battery current equals the motor current
    point = limited_currents(35.0, 36.0, 0.2, 20.0, 30.0)
    assert point.limited_by == "pack voltage"
    assert point.motor_current == pytest.approx(5.0)
    assert point.battery_current == pytest.approx(5.0)
    assert limited_currents(40.0, 36.0, 0.2, 20.0, None).motor_current == 0.0


def test_duty_is_clipped() -> None:
    # an averaged bridge cannot apply more than the pack voltage or less than none
    assert duty_cycle(50.0, 10.0, 0.2, 36.0) == 1.0
    assert duty_cycle(0.0, 0.0, 0.2, 36.0) == 0.0


@settings(max_examples=300, deadline=None)
@given(
    emf=st.floats(0.0, 100.0),
    voltage=st.floats(1.0, 100.0),
    resistance=st.floats(0.005, 5.0),
    motor_limit=st.none() | st.floats(0.0, 500.0),
    battery_limit=st.none() | st.floats(0.0, 500.0),
)
def test_limits_and_energy_balance_hold_everywhere(
    emf: float,
    voltage: float,
    resistance: float,
    motor_limit: float | None,
    battery_limit: float | None,
) -> None:
    # conservation of energy: copper loss never exceeds the electrical input; d <= 1 means the
    # battery current never exceeds the motor current; and no limit is ever exceeded
    point = limited_currents(emf, voltage, resistance, motor_limit, battery_limit)
    assert point.copper_loss <= point.electrical_input * (1 + 1e-9) + 1e-9
    assert point.battery_current <= point.motor_current * (1 + 1e-12) + 1e-12
    if motor_limit is not None:
        assert point.motor_current <= motor_limit
    if battery_limit is not None:
        assert point.battery_current <= battery_limit * (1 + 1e-9) + 1e-12
    assert voltage * point.battery_current == pytest.approx(
        min(emf, voltage) * point.motor_current + point.copper_loss, rel=1e-9, abs=1e-9
    )


def test_battery_limit_root_is_stable_at_high_back_emf() -> None:
    # the quadratic's root by the textbook formula in exact rationals: R I^2 + E I = I_b V
    current = current_for_battery_limit(1.0e4, 1.0e-3, 1.0e4, 1.0e-3)
    assert 1.0e-3 * current**2 + 1.0e4 * current == pytest.approx(1.0e-3 * 1.0e4, rel=1e-12)


def test_locked_rotor_hottest_phase_is_twice_the_mean() -> None:
    # brief 11 (M): with the current vector standing still one phase can carry all of I_pk,
    # I_pk^2 R_ph, against a mean of (1/2) I_pk^2 R_ph (the other two carry I_pk / 2 each)
    peak, r_phase = 40.0, 0.05
    mean = winding_copper_loss(peak, 2 * r_phase, FIELD_ORIENTED, "peak") / 3.0
    hottest = locked_rotor_hottest_phase_loss(peak, r_phase)
    assert hottest == pytest.approx(peak**2 * r_phase)
    assert hottest / mean == pytest.approx(LOCKED_ROTOR_HOTTEST_PHASE_FACTOR)
    assert locked_rotor_phase_currents(peak, 0.0)[1] == pytest.approx(-peak / 2)


@given(angle=st.floats(-10.0, 10.0))
def test_locked_rotor_phase_losses_sum_to_the_total(angle: float) -> None:
    # Kirchhoff's current law and cos^2 identity: the three currents sum to zero and their losses
    # to (3/2) I_pk^2 R_ph at any frozen angle; no phase exceeds twice the mean
    peak, r_phase = 40.0, 0.05
    currents = locked_rotor_phase_currents(peak, angle)
    assert sum(currents) == pytest.approx(0.0, abs=1e-9)
    assert sum(i * i * r_phase for i in currents) == pytest.approx(1.5 * peak**2 * r_phase)
    hottest = locked_rotor_hottest_phase_loss(peak, r_phase, angle)
    assert hottest <= 2.0 * (0.5 * peak**2 * r_phase) * (1 + 1e-12)


def test_kv_from_no_load_counts_the_drop_once() -> None:
    # DC machine equation V = E + I R (Chapman, from memory), worked case: 3564 rpm at 36 V with
    # I0 = 1.2 A through 0.3 ohm: E = 35.64 V, Kv = 100 rpm/V
    n0, volts, i0, r = 3564.0, 36.0, 1.2, 0.3
    kv = kv_from_no_load(n0, volts, i0, r)
    assert kv == pytest.approx(100.0)
    # the model subtracts I0 R itself, so the corrected Kv gives back the measured speed
    assert rad_s_to_rpm(no_load_speed(volts, kv, r, i0)) == pytest.approx(n0)
    # n0 / V counts the drop twice: Kv 99.0, and the model then predicts 1 % less speed than
    # was measured, which under-reads a top speed: the unsafe side for a speed limit
    naive = n0 / volts
    assert naive == pytest.approx(99.0)
    predicted = rad_s_to_rpm(no_load_speed(volts, naive, r, i0))
    assert predicted < n0
    assert 1.0 - predicted / n0 == pytest.approx(0.01, abs=1e-9)


def test_kv_from_no_load_rejects_impossible_tests() -> None:
    # V = E + I R: a drop as large as the voltage leaves no back-EMF to measure
    with pytest.raises(ValueError):
        kv_from_no_load(1000.0, 1.0, 10.0, 0.1)
