"""The steady speed in closed form against the quadratic formula worked by hand and against the
searched root it replaces. Drives here are invented."""

from __future__ import annotations

import math
import random
from dataclasses import replace

import pytest

from reviewer.engineering.motor import TorqueSpeedLine, drive_force_function
from reviewer.engineering.roadload import (
    AIR_DENSITY_ISA,
    STANDARD_GRAVITY,
    Drive,
    DriveMotor,
    road_load_force,
    top_speed,
)
from reviewer.engineering.steady_speed import straight_piece_speed

# One 95.49 rpm/V motor (Kt = Ke = 0.1 in SI units), 0.2 ohm loop, no friction, direct to a
# 0.1 m radius wheel at 100 %: the line is I = (36 - 0.1 w) / 0.2 and w = 10 v, so the wheel
# force is F = 0.1 I / 0.1 = 180 - 5 v N (brief 3, V = E + I R, T = Kt I).
KV = 60.0 / (2.0 * math.pi * 0.1)
HAND = Drive(
    motors=(DriveMotor(kv_rpm_per_v=KV, branch_resistance=0.2),),
    full_voltage=36.0,
    reduction=1.0,
    wheel_radius=0.1,
    rolling_resistance=0.01,
    drag_area=0.5,
)


def _parts(drive: Drive, mass: float, grade: float) -> tuple[list[TorqueSpeedLine], float, float]:
    lines = drive.lines()
    steady = road_load_force(mass, 0.0, drive.rolling_resistance, 0.0, grade)
    return lines, steady, 0.5 * AIR_DENSITY_ISA * drive.drag_area


def _closed(drive: Drive, mass: float, grade: float, clamped: bool) -> float | None:
    lines, steady, drag = _parts(drive, mass, grade)
    pull = drive_force_function(lines, drive.reduction, drive.efficiency, drive.wheel_radius)
    return straight_piece_speed(
        lines,
        drive.reduction,
        drive.efficiency,
        drive.wheel_radius,
        steady,
        drag,
        pull,
        clamped=clamped,
    )


def _searched(drive: Drive, mass: float, grade: float, clamped: bool) -> float:
    """The root the closed form replaces: roadload.top_speed's bracketed search."""
    lines = drive.lines()
    pull = drive_force_function(lines, drive.reduction, drive.efficiency, drive.wheel_radius)
    force = (lambda v: max(pull(v), 0.0)) if clamped else pull
    bound = max(line.no_load_speed for line in lines) / drive.reduction * drive.wheel_radius
    return top_speed(force, mass, drive.rolling_resistance, drive.drag_area, bound, grade)


def test_voltage_limited_speed_is_the_root_of_the_road_load_quadratic() -> None:
    # worked by hand from the road-load equation (brief 3, ISA rho, CGPM g): 180 - 5 v against
    # 100 kg x g x 0.01 + 0.5 rho 0.5 v^2, so 0.30625 v^2 + 5 v - (180 - 9.80665) = 0
    drag = 0.5 * AIR_DENSITY_ISA * 0.5
    rest = 180.0 - 100.0 * STANDARD_GRAVITY * 0.01
    expected = (-5.0 + math.sqrt(25.0 + 4.0 * drag * rest)) / (2.0 * drag)
    assert _closed(HAND, 100.0, 0.0, clamped=False) == pytest.approx(expected, rel=1e-12)
    assert HAND.top_speed(100.0) == pytest.approx(expected, rel=1e-12)
    # without drag the quadratic is linear: v = (180 - 9.80665) / 5
    still = replace(HAND, drag_area=0.0)
    assert _closed(still, 100.0, 0.0, clamped=False) == pytest.approx(rest / 5.0, rel=1e-12)


def test_current_limited_climb_is_the_square_root_of_the_spare_pull() -> None:
    # worked by hand (brief 3): held at 20 A the pull is 0.1 x 20 / 0.1 = 20 N; up 0.5 % a
    # 100 kg load is m g (Crr cos + sin) of atan(0.005), so v = sqrt((20 - that) / (0.5 rho
    # CdA)) = 4.16 m/s, where the free line would give (36 - 0.416) / 0.2 = 178 A, far above 20 A
    held = replace(HAND, current_limit=20.0)
    theta = math.atan(0.005)
    load = 100.0 * STANDARD_GRAVITY * (0.01 * math.cos(theta) + math.sin(theta))
    expected = math.sqrt((20.0 - load) / (0.5 * AIR_DENSITY_ISA * 0.5))
    assert expected == pytest.approx(4.16, abs=0.01)
    assert _closed(held, 100.0, 0.5, clamped=False) == pytest.approx(expected, rel=1e-12)
    assert held.climb_speed(100.0, 0.5) == pytest.approx(expected, rel=1e-12)


def test_a_steep_descent_past_the_no_load_speed_runs_where_the_load_is_nil() -> None:
    # worked by hand (brief 3): down 30 % with the pull clamped at zero the speed is where
    # m g (Crr cos - sin) + 0.5 rho CdA v^2 = 0; on 24 V the motor's no-load ground speed is
    # 24 / 0.1 rad/s x 0.1 m = 24 m/s, below it
    low = replace(HAND, full_voltage=24.0)
    theta = math.atan(0.3)
    pulling = 100.0 * STANDARD_GRAVITY * (math.sin(theta) - 0.01 * math.cos(theta))
    expected = math.sqrt(pulling / (0.5 * AIR_DENSITY_ISA * 0.5))
    assert expected > 24.0
    assert _closed(low, 100.0, -30.0, clamped=True) == pytest.approx(expected, rel=1e-12)
    assert low.descent_speed(100.0, 30.0) == pytest.approx(expected, rel=1e-12)


def test_a_battery_limited_or_mixed_drive_is_left_to_the_search() -> None:
    # the battery limit's piece is curved (I (E + I R) = I_b V): no closed form is claimed
    curved = replace(HAND, battery_limit=5.0)
    assert _closed(curved, 100.0, 0.0, clamped=False) is None
    assert curved.top_speed(100.0) == pytest.approx(
        _searched(curved, 100.0, 0.0, clamped=False), rel=1e-9
    )
    # two motors, one held at its limit at the top speed and one free: neither straight piece
    mixed = replace(
        HAND,
        motors=(
            DriveMotor(kv_rpm_per_v=KV, branch_resistance=0.2),
            DriveMotor(kv_rpm_per_v=KV / 3.0, branch_resistance=0.05),
        ),
        current_limit=60.0,
    )
    lines = mixed.lines()
    speed = _searched(mixed, 100.0, 0.0, clamped=False)
    omega = speed / mixed.wheel_radius * mixed.reduction
    pieces = {line.current(omega) >= 60.0 - 1e-9 for line in lines}
    assert pieces == {True, False}
    assert _closed(mixed, 100.0, 0.0, clamped=False) is None


def _random_drive(rng: random.Random) -> Drive:
    motors = tuple(
        DriveMotor(
            kv_rpm_per_v=rng.uniform(8.0, 300.0),
            branch_resistance=rng.uniform(0.02, 0.6),
            no_load_current=rng.uniform(0.0, 3.0),
        )
        for _ in range(rng.choice((1, 1, 2, 3)))
    )
    if len(motors) > 1 and rng.random() < 0.5:
        motors = (motors[0],) * len(motors)  # identical motors, the common twin build
    kv = motors[0].kv_rpm_per_v
    return Drive(
        motors=motors,
        full_voltage=rng.uniform(12.0, 60.0),
        reduction=1.0 if kv < 30.0 else rng.uniform(2.0, 8.0),
        wheel_radius=rng.uniform(0.04, 0.35),
        rolling_resistance=rng.uniform(0.005, 0.03),
        drag_area=rng.choice((0.0, rng.uniform(0.1, 1.0))),
        shared_resistance=rng.uniform(0.0, 0.2),
        current_limit=rng.choice((None, rng.uniform(5.0, 80.0))),
        battery_limit=rng.choice((None, None, rng.uniform(5.0, 40.0))),
        efficiency=rng.uniform(0.7, 1.0),
    )


def test_closed_form_equals_the_searched_root_wherever_it_answers() -> None:
    # the searched root (roadload.top_speed, Illinois regula falsi to 1e-9) is the reference:
    # on 3,000 invented drives, grades and masses the closed form either declines or agrees
    rng = random.Random(20261203)
    answered = {"V": 0, "I": 0, "0": 0}
    declined = 0
    for _ in range(3000):
        drive = _random_drive(rng)
        mass = rng.uniform(40.0, 250.0)
        grade = rng.choice((0.0, rng.uniform(-35.0, 30.0)))
        clamped = grade < 0.0 and rng.random() < 0.7
        if clamped and drive.drag_area == 0.0:
            continue  # nothing holds a coasting vehicle without drag: no steady speed at all
        closed = _closed(drive, mass, grade, clamped)
        searched = _searched(drive, mass, grade, clamped)
        if closed is None:
            declined += 1
            continue
        assert closed == pytest.approx(searched, rel=1e-8, abs=1e-9), (drive, mass, grade)
        omega = closed / drive.wheel_radius * drive.reduction
        lines = drive.lines()
        pull = drive_force_function(lines, drive.reduction, drive.efficiency, drive.wheel_radius)
        if clamped and pull(closed) <= 0.0:
            answered["0"] += 1
        elif all(
            line.current_limit is not None and line.current(omega) == line.current_limit
            for line in lines
        ):
            answered["I"] += 1
        else:
            answered["V"] += 1
    # every piece was met and some drives were left to the search: the comparison bites
    assert min(answered.values()) >= 50, answered
    assert declined >= 100
