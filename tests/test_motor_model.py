"""The DC motor torque-speed line against its textbook definition and trade figures."""

from __future__ import annotations

import math

import pytest

from reviewer.engineering.motor import (
    TorqueSpeedLine,
    back_emf_constant,
    copper_loss,
    input_power,
    no_load_speed,
    rad_s_to_rpm,
    rpm_to_rad_s,
    stall_current,
    torque_constant,
)


@pytest.mark.parametrize("kv", [50.0, 100.0, 190.0, 1000.0])
def test_torque_constant_is_9_5493_over_kv(kv: float) -> None:
    # SI definition of Kt and Ke: Kt = Ke = 60 / (2 pi Kv) = 9.5493 / Kv
    assert torque_constant(kv) == pytest.approx(9.5493 / kv, rel=1e-5)
    assert back_emf_constant(kv) == torque_constant(kv)


def test_back_emf_power_equals_shaft_power() -> None:
    # SI definition of Kt and Ke: E I = T w holds only because Kt = Ke in SI units
    kv, current, omega = 150.0, 12.0, rpm_to_rad_s(3000.0)
    electrical = back_emf_constant(kv) * omega * current
    mechanical = torque_constant(kv) * current * omega
    assert electrical == pytest.approx(mechanical)


def test_kv_times_voltage_is_ideal_no_load_speed() -> None:
    # SI definition of Kt and Ke: Kv in rpm per volt of back-EMF, so 100 rpm/V at 24 V is 2400 rpm
    assert rad_s_to_rpm(no_load_speed(24.0, 100.0)) == pytest.approx(2400.0)


def test_stall_current_is_voltage_over_loop_resistance() -> None:
    # from memory: Chapman, Electric Machinery Fundamentals: locked rotor, E = 0, I = V / R
    assert stall_current(24.0, 0.2) == pytest.approx(120.0)
    line = TorqueSpeedLine(kv_rpm_per_v=100.0, voltage=24.0, loop_resistance=0.2)
    assert line.current(0.0) == pytest.approx(120.0)


def test_line_is_straight_from_stall_to_no_load() -> None:
    # from memory: Chapman, V = E + I R with E = Ke w gives a straight torque-speed line
    line = TorqueSpeedLine(kv_rpm_per_v=100.0, voltage=24.0, loop_resistance=0.2)
    stall_torque = line.torque(0.0)
    assert line.torque(line.no_load_speed) == pytest.approx(0.0, abs=1e-9)
    assert line.torque(0.5 * line.no_load_speed) == pytest.approx(0.5 * stall_torque)
    assert stall_torque == pytest.approx(9.5493 / 100.0 * 120.0, rel=1e-5)


def test_current_limit_flattens_the_low_speed_end() -> None:
    # from memory: Chapman, V = E + I R; the limit caps I where (V - E) / R exceeds it
    line = TorqueSpeedLine(
        kv_rpm_per_v=100.0, voltage=24.0, loop_resistance=0.2, current_limit=20.0
    )
    knee = (24.0 - 20.0 * 0.2) / line.ke
    assert line.current(0.0) == 20.0
    assert line.current(0.9 * knee) == 20.0
    assert line.current(1.1 * knee) < 20.0
    assert line.stall_current == pytest.approx(120.0)  # what the limit has to hold back


def test_no_load_current_takes_friction_off_the_torque() -> None:
    # from memory: Chapman; the no-load current only overcomes friction, so T = Kt (I - I0)
    line = TorqueSpeedLine(
        kv_rpm_per_v=100.0, voltage=24.0, loop_resistance=0.2, no_load_current=1.5
    )
    assert line.current(line.no_load_speed) == pytest.approx(1.5)
    assert line.torque(line.no_load_speed) == pytest.approx(0.0, abs=1e-9)
    assert line.torque(0.0) == pytest.approx(line.kt * (120.0 - 1.5))


def test_shorted_motor_braking_current_check_value() -> None:
    # domain brief section 6 check value (derived from V = E + I R): 30 A, 0.2 ohm, 100 rpm/V
    # gives n* = I R Kv = 600 rpm; a shorted motor is the line at V = 0
    shorted = TorqueSpeedLine(kv_rpm_per_v=100.0, voltage=0.0, loop_resistance=0.2)
    assert shorted.current(rpm_to_rad_s(600.0)) == pytest.approx(-30.0)


def test_holding_eight_amps_at_24_volts_still_draws_192_watts() -> None:
    # common practice: a current limit of 8 A at 24 V still puts close to 200 W into the drive
    assert input_power(24.0, 8.0) == pytest.approx(192.0)
    # and that is not the winding's heat: copper loss in 0.3 ohm at 8 A is a tenth of it
    assert copper_loss(8.0, 0.3) == pytest.approx(19.2)


def test_halving_the_pack_voltage_about_halves_no_load_speed() -> None:
    # common practice: a brushed motor on 12 V runs at about half its 24 V no-load speed
    full = no_load_speed(24.0, 150.0, loop_resistance=0.3, no_load_current=1.0)
    half = no_load_speed(12.0, 150.0, loop_resistance=0.3, no_load_current=1.0)
    assert full / half == pytest.approx(2.0, rel=0.05)
    assert full / half > 2.0  # the friction current's drop weighs more at the lower voltage


def test_rpm_conversion_round_trip() -> None:
    # SI definition of the radian: one turn is 2 pi rad
    assert rpm_to_rad_s(60.0) == pytest.approx(2 * math.pi)
    assert rad_s_to_rpm(rpm_to_rad_s(4321.0)) == pytest.approx(4321.0)


def test_nonsense_inputs_are_refused() -> None:
    with pytest.raises(ValueError):
        torque_constant(0.0)
    with pytest.raises(ValueError):
        stall_current(24.0, 0.0)
    with pytest.raises(ValueError):
        TorqueSpeedLine(kv_rpm_per_v=100.0, voltage=24.0, loop_resistance=0.0)
