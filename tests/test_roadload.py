"""Road load, wheel force and top speed against the road-load equation's check values."""

from __future__ import annotations

import math
from dataclasses import replace

import pytest

from reviewer.engineering.roadload import (
    AIR_DENSITY_ISA,
    STANDARD_GRAVITY,
    Drive,
    DriveMotor,
    bracketed_root,
    grade_angle,
    ground_speed_for,
    highest_duty_within,
    kinetic_energy,
    kmh_to_ms,
    largest_pulley_within,
    motor_speed_for,
    ms_to_kmh,
    road_load_force,
    road_load_power,
    smallest_reduction_within,
    stopping_distance,
    top_speed,
    wheel_force,
)


def test_constants() -> None:
    # ISA sea level air density; CGPM 1901 standard gravity
    assert AIR_DENSITY_ISA == 1.225
    assert STANDARD_GRAVITY == 9.80665


def test_road_load_check_value() -> None:
    # derived from the road-load equation, ISA rho, CGPM g (domain brief check value):
    # 100 kg, Crr 0.01, CdA 0.6 m^2, 25 km/h gives F = 27.53 N, P = 191.2 W
    speed = kmh_to_ms(25.0)
    assert road_load_force(100.0, speed, 0.01, 0.6) == pytest.approx(27.53, abs=0.005)
    assert road_load_power(100.0, speed, 0.01, 0.6) == pytest.approx(191.2, abs=0.05)


def test_grade_is_rise_over_run() -> None:
    # derived from the road-load equation: 10 % grade is atan(0.1) = 5.71 deg, and a 100 kg
    # vehicle at rest on it with no rolling loss needs m g sin(theta) = 97.58 N
    assert math.degrees(grade_angle(10.0)) == pytest.approx(5.7106, abs=1e-4)
    assert road_load_force(100.0, 0.0, 0.0, 0.6, grade_percent=10.0) == pytest.approx(
        97.58, abs=0.01
    )


def test_wheel_force_is_torque_times_reduction_over_radius() -> None:
    # lever rule (physics): 1 N m through 5:1 at 90 % on a 0.1 m wheel radius is 45 N
    assert wheel_force(1.0, 5.0, 0.9, 0.1) == pytest.approx(45.0)


def test_motor_and_ground_speed_are_inverse() -> None:
    # rolling without slip (physics): v = w r / reduction
    omega = motor_speed_for(kmh_to_ms(25.0), 5.0, 0.1)
    assert omega == pytest.approx(6.9444 / 0.1 * 5.0, rel=1e-4)
    assert ms_to_kmh(ground_speed_for(omega, 5.0, 0.1)) == pytest.approx(25.0)


def test_top_speed_inverts_the_check_value() -> None:
    # derived from the road-load equation, ISA rho, CGPM g: a steady 27.53 N at the wheel holds
    # the check-value vehicle at 25 km/h
    force = road_load_force(100.0, kmh_to_ms(25.0), 0.01, 0.6)
    speed = top_speed(lambda v: force, 100.0, 0.01, 0.6, speed_bound_ms=1.0)
    assert ms_to_kmh(speed) == pytest.approx(25.0, rel=1e-6)


def test_top_speed_of_a_falling_drive_line() -> None:
    # derived from the road-load equation: drive force 60 - 4 v against m g Crr + 0.5 rho CdA v^2;
    # the root of the quadratic is the steady speed
    mass, crr, cda = 90.0, 0.012, 0.55
    speed = top_speed(lambda v: 60.0 - 4.0 * v, mass, crr, cda, speed_bound_ms=15.0)
    a, b, c = 0.5 * AIR_DENSITY_ISA * cda, 4.0, mass * STANDARD_GRAVITY * crr - 60.0
    expected = (-b + math.sqrt(b * b - 4 * a * c)) / (2 * a)
    assert speed == pytest.approx(expected, rel=1e-7)


def test_a_drive_that_cannot_start_the_vehicle_has_no_top_speed() -> None:
    # derived from the road-load equation: 5 N against 100 kg x g x 0.01 = 9.8 N of rolling loss
    assert top_speed(lambda v: 5.0, 100.0, 0.01, 0.6, speed_bound_ms=10.0) == 0.0


def test_kinetic_energy_and_stopping_distance() -> None:
    # kinematics: 0.5 m v^2; v^2 / (2 a). 100 kg at 25 km/h: 2411 J; 8.04 m at 3 m/s^2
    speed = kmh_to_ms(25.0)
    assert kinetic_energy(100.0, speed) == pytest.approx(2411.3, abs=0.1)
    assert stopping_distance(speed, 3.0) == pytest.approx(8.038, abs=0.001)
    with pytest.raises(ValueError):
        stopping_distance(speed, 0.0)


def test_bracketed_root_finds_known_roots() -> None:
    # arithmetic: sqrt(2), and the fixed point of cos x (Dottie number 0.7390851332)
    assert bracketed_root(lambda x: x * x - 2.0, 0.0, 5.0) == pytest.approx(math.sqrt(2.0))
    assert bracketed_root(lambda x: math.cos(x) - x, 0.0, 1.0) == pytest.approx(0.7390851332)
    with pytest.raises(ValueError):
        bracketed_root(lambda x: x * x + 1.0, -1.0, 1.0)


# A drive that is easy to check by hand: one 100 rpm/V motor, 0.1 ohm loop, 1 A no-load
# current, held at 10 A, on a 42 V pack, 5:1 to a 0.1 m radius wheel at 90 %.
DRIVE = Drive(
    motors=(DriveMotor(kv_rpm_per_v=100.0, branch_resistance=0.1, no_load_current=1.0),),
    full_voltage=42.0,
    reduction=5.0,
    wheel_radius=0.1,
    rolling_resistance=0.01,
    drag_area=0.8,
    current_limit=10.0,
    efficiency=0.9,
)


def test_current_limited_drive_matches_the_closed_form() -> None:
    # derived from the road-load equation, ISA rho, CGPM g: with the current limit holding, the
    # wheel force F = Kt (I_lim - I0) x 5 x 0.9 / 0.1 m is constant, so
    # v = sqrt((F - m g Crr) / (0.5 rho CdA)); Kt = 9.5493 / Kv (SI definition of Kt and Ke)
    force = 9.5493 / 100.0 * 9.0 * 5.0 * 0.9 / 0.1
    expected = math.sqrt((force - 100.0 * STANDARD_GRAVITY * 0.01) / (0.5 * AIR_DENSITY_ISA * 0.8))
    assert DRIVE.top_speed(100.0) == pytest.approx(expected, rel=1e-5)


def test_two_identical_motors_double_the_force() -> None:
    # lever rule (physics): wheel forces of motors on one gearing add
    twin = replace(DRIVE, motors=DRIVE.motors * 2, drag_area=3.0)
    force = 2 * 9.5493 / 100.0 * 9.0 * 5.0 * 0.9 / 0.1
    expected = math.sqrt((force - 100.0 * STANDARD_GRAVITY * 0.01) / (0.5 * AIR_DENSITY_ISA * 3.0))
    assert twin.top_speed(100.0) == pytest.approx(expected, rel=1e-5)


def test_exceeds_agrees_with_the_solved_top_speed() -> None:
    speed = DRIVE.top_speed(100.0)
    assert DRIVE.exceeds(100.0, 0.99 * speed)
    assert not DRIVE.exceeds(100.0, 1.01 * speed)


def test_lower_duty_only_slows_the_drive() -> None:
    # V = E + I R: a lower effective voltage lowers the line at every speed
    speeds = [DRIVE.top_speed(100.0, duty=d / 10) for d in range(2, 11)]
    assert speeds == sorted(speeds)


def test_searches_return_the_boundary_setting() -> None:
    limit = kmh_to_ms(25.0)
    percent = highest_duty_within(DRIVE, 100.0, limit)
    assert percent is not None
    assert not DRIVE.exceeds(100.0, limit, duty=percent / 100)
    assert DRIVE.exceeds(100.0, limit, duty=(percent + 1) / 100)
    teeth = largest_pulley_within(DRIVE, 100.0, limit, present_teeth=12, wheel_teeth=60)
    assert teeth is not None
    assert DRIVE.top_speed(100.0, reduction=60 / teeth) <= limit
    assert DRIVE.top_speed(100.0, reduction=60 / (teeth + 1)) > limit
    reduction = smallest_reduction_within(DRIVE, 100.0, limit)
    assert reduction is not None
    assert DRIVE.top_speed(100.0, reduction=reduction) <= limit
    assert DRIVE.top_speed(100.0, reduction=reduction - 0.01) > limit


def test_searches_report_when_nothing_is_slow_enough() -> None:
    # 5 teeth on a 60-tooth pulley still leaves a no-load wheel speed of 4190 rpm / 12 x 0.2 pi m
    # = 13.2 km/h, above a 10 km/h limit
    limit = kmh_to_ms(10.0)
    assert largest_pulley_within(DRIVE, 30.0, limit, present_teeth=12, wheel_teeth=60) is None
