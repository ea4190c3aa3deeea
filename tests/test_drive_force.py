"""The flattened wheel-force curve a ride and every top speed evaluate, against the
torque-speed lines it flattens and against the textbook motor equations."""

from __future__ import annotations

import itertools
import math

import pytest

from reviewer.engineering.motor import TorqueSpeedLine, drive_force_function
from reviewer.engineering.roadload import Drive, DriveMotor, motor_speed_for, wheel_force


def test_a_worked_line_gives_the_textbook_force() -> None:
    # V = E + I R, E = Ke w, T = Kt (I - I0), Kt = Ke = 60 / (2 pi Kv) (Hughes, "Electric Motors
    # and Drives", ch. 3, from memory): Kv 100 rpm/V, 36 V, 0.2 ohm, I0 1 A, at 300 rad/s:
    # E = 28.648 V, I = 36.76 A, T = 3.4148 N m; 5:1, 90 %, 0.1 m wheel: F = T 5 0.9 / 0.1
    line = TorqueSpeedLine(100.0, 36.0, 0.2, no_load_current=1.0)
    force = drive_force_function([line], 5.0, 0.9, 0.1)
    kt = 60.0 / (2.0 * math.pi * 100.0)
    current = (36.0 - kt * 300.0) / 0.2
    assert current == pytest.approx(36.76, abs=0.01)
    assert force(300.0 * 0.1 / 5.0) == pytest.approx(kt * (current - 1.0) * 5 * 0.9 / 0.1)
    assert force(6.0) == pytest.approx(153.7, abs=0.1)


@pytest.mark.parametrize(
    ("limit", "battery"), [(None, None), (30.0, None), (None, 12.0), (30.0, 12.0), (5.0, 40.0)]
)
def test_the_curve_is_the_sum_of_its_lines_torques(
    limit: float | None, battery: float | None
) -> None:
    # the same arithmetic as TorqueSpeedLine.torque through motor_speed_for and wheel_force,
    # to the last bit, from standstill past the no-load speed (where the torque turns negative)
    lines = [
        TorqueSpeedLine(kv, volts, r, i0, limit, battery)
        for kv, volts, r, i0 in ((180.0, 42.0, 0.11, 1.2), (60.0, 36.0, 0.35, 0.4))
    ]
    ratio, efficiency, radius = 4.2, 0.92, 0.083
    force = drive_force_function(lines, ratio, efficiency, radius)
    for speed in (0.0, 0.5, 3.0, 7.77, 12.0, 25.0, 60.0):
        omega = motor_speed_for(speed, ratio, radius)
        torque = sum(line.torque(omega) for line in lines)
        assert force(speed) == wheel_force(torque, ratio, efficiency, radius)


def test_lines_at_a_voltage_are_the_lines_of_the_changed_drive() -> None:
    from dataclasses import replace

    drive = Drive(
        (DriveMotor(120.0, 0.2, 0.8), DriveMotor(120.0, 0.25, 0.8)),
        44.0,
        3.5,
        0.1,
        0.015,
        0.5,
        shared_resistance=0.05,
        duty=0.9,
        current_limit=40.0,
        battery_limit=25.0,
    )
    for voltage, extra in itertools.product((30.0, 41.3), ((0.0, 0.0), (0.03, 0.07))):
        motors = tuple(
            replace(m, branch_resistance=m.branch_resistance + r)
            for m, r in zip(drive.motors, extra, strict=True)
        )
        changed = replace(drive, full_voltage=voltage, motors=motors)
        assert drive.lines_at(voltage, extra) == changed.lines()
        for derived, built in zip(drive.lines_at(voltage, extra), changed.lines(), strict=True):
            assert (derived.kt, derived.ke) == (built.kt, built.ke)  # not compared by ==


def test_a_line_moved_to_another_voltage_is_the_line_built_afresh() -> None:
    # Kt = Ke = 60 / (2 pi Kv) depend on Kv alone (SI definition), so a line carried to another
    # voltage and resistance keeps them; every field and both constants match a fresh line
    line = TorqueSpeedLine(150.0, 42.0, 0.2, 0.9, 35.0, 20.0)
    moved = line.at(37.5, 0.26)
    fresh = TorqueSpeedLine(150.0, 37.5, 0.26, 0.9, 35.0, 20.0)
    assert moved == fresh and vars(moved) == vars(fresh)
    assert moved.kt == pytest.approx(60.0 / (2.0 * math.pi * 150.0), rel=1e-15)
    assert (line.voltage, line.loop_resistance) == (42.0, 0.2)  # the original is untouched
    with pytest.raises(ValueError):
        line.at(37.5, 0.0)
