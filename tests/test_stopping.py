"""Stopping distances against the brief's check value and a textbook kinematics problem;
shorted-motor braking against AC circuit theory; descent speed against the road load."""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from reviewer.engineering.braking import braking_current, braking_wheel_force
from reviewer.engineering.motor import back_emf_constant
from reviewer.engineering.roadload import (
    AIR_DENSITY_ISA,
    STANDARD_GRAVITY,
    kmh_to_ms,
    ms_to_kmh,
    road_load_force,
)
from reviewer.engineering.stopping import (
    achievable_deceleration,
    angle_to_grade_percent,
    braking_distance,
    electrical_speed,
    friction_limit,
    grade_percent_to_angle,
    inductance_corner_speed,
    mean_deceleration,
    net_deceleration,
    shorted_motor_current,
    shorted_three_phase_braking_torque,
    stopping_distance,
    terminal_speed_on_descent,
)


def test_descent_check_value() -> None:
    # brief 14 check value (D): a 3.0 m/s^2 brake on a 12 % descent leaves 1.83 m/s^2; from
    # 25 km/h with 1 s reaction that is 20.1 m, and 14.98 m on the flat
    assert net_deceleration(3.0, 12.0) == pytest.approx(1.83, abs=0.005)
    speed = kmh_to_ms(25.0)
    assert stopping_distance(speed, 3.0, 1.0, 12.0) == pytest.approx(20.1, abs=0.05)
    assert stopping_distance(speed, 3.0, 1.0) == pytest.approx(14.98, abs=0.005)


def test_textbook_stopping_distances() -> None:
    # Giancoli, Physics: Principles with Applications, 7th ed., ch. 2 problem 31: 95 km/h with
    # a 0.40 s reaction stops in 126.6 m at 3.0 m/s^2 and in 68.6 m at 6.0 m/s^2
    speed = kmh_to_ms(95.0)
    assert stopping_distance(speed, 3.0, 0.40) == pytest.approx(126.6, abs=0.05)
    assert stopping_distance(speed, 6.0, 0.40) == pytest.approx(68.6, abs=0.05)
    # and back again: the mean deceleration from the measured distance and speed
    assert mean_deceleration(speed, 126.63, 0.40) == pytest.approx(3.0, abs=0.001)


def test_braking_distance_is_v_squared_over_2a() -> None:
    # constant-acceleration kinematics, v^2 = u^2 + 2 a s: 20 m/s at 5 m/s^2 stops in 40 m
    assert braking_distance(20.0, 5.0) == pytest.approx(40.0)
    assert mean_deceleration(20.0, 40.0) == pytest.approx(5.0)


def test_a_brake_that_cannot_beat_the_slope_never_stops() -> None:
    # brief 14: a_net = a - g sin(theta); a 1.0 m/s^2 brake on a 12 % descent (g sin = 1.17)
    assert net_deceleration(1.0, 12.0) < 0
    assert stopping_distance(5.0, 1.0, 1.0, 12.0) == math.inf
    assert braking_distance(5.0, 0.0) == math.inf


def test_a_climb_helps_the_brake() -> None:
    # brief 14 with theta negative: a - g sin(-theta) = a + g sin(theta)
    assert net_deceleration(3.0, -12.0) == pytest.approx(3.0 + (3.0 - net_deceleration(3.0, 12.0)))


def test_speed_gained_during_reaction_on_a_descent() -> None:
    # constant-acceleration kinematics (s = u t + a t^2 / 2, then v^2 / 2a) with gravity's
    # g sin(theta) = 1.1685 m/s^2 pulling during the 1 s reaction on 12 %
    speed, pull = kmh_to_ms(25.0), STANDARD_GRAVITY * math.sin(math.atan(0.12))
    expected = speed + 0.5 * pull + (speed + pull) ** 2 / (2 * (3.0 - pull))
    found = stopping_distance(speed, 3.0, 1.0, 12.0, gravity_during_reaction=True)
    assert found == pytest.approx(expected)
    assert found == pytest.approx(25.5, abs=0.05)
    assert found > stopping_distance(speed, 3.0, 1.0, 12.0)


def test_friction_limit() -> None:
    # Coulomb friction: a <= mu g on the flat (brief 14), mu g cos(theta) on a slope
    assert friction_limit(0.7) == pytest.approx(0.7 * 9.80665)
    assert friction_limit(0.7, 12.0) == pytest.approx(0.7 * 9.80665 / math.sqrt(1 + 0.12**2))
    assert achievable_deceleration(9.0, 0.7) == pytest.approx(6.865, abs=0.001)
    assert achievable_deceleration(3.0, 0.7) == 3.0


def test_grade_and_angle() -> None:
    # trigonometry: 100 % is 45 degrees, 12 % is atan(0.12) = 6.843 degrees
    assert math.degrees(grade_percent_to_angle(100.0)) == pytest.approx(45.0)
    assert math.degrees(grade_percent_to_angle(12.0)) == pytest.approx(6.843, abs=5e-4)
    assert angle_to_grade_percent(math.radians(45.0)) == pytest.approx(100.0)


@given(grade=st.floats(-500.0, 500.0))
def test_grade_round_trip(grade: float) -> None:
    # tan and atan are inverses on (-90, 90) degrees
    assert angle_to_grade_percent(grade_percent_to_angle(grade)) == pytest.approx(grade, abs=1e-9)


def test_inductance_corner() -> None:
    # AC circuit theory: |R + j w L| = R sqrt 2 at w = R / L; mechanical = electrical / pairs
    r, l_h, pairs = 0.1, 100e-6, 7
    corner = inductance_corner_speed(r, l_h, pairs)
    assert electrical_speed(corner, pairs) == pytest.approx(r / l_h)
    at_corner = shorted_motor_current(10.0, r, l_h, electrical_speed(corner, pairs))
    assert at_corner == pytest.approx(10.0 / (r * math.sqrt(2.0)))
    assert shorted_motor_current(10.0, r, 0.0, 1e4) == pytest.approx(100.0)
    assert inductance_corner_speed(r, 0.0) == math.inf


def test_shorted_current_levels_off_above_the_corner() -> None:
    # AC circuit theory: with E = Ke w_m and w_e = p w_m, I -> Ke / (p L) as speed grows
    ke, r, l_h, pairs = 0.1, 0.1, 100e-6, 7
    ceiling = ke / (pairs * l_h)
    currents = [
        shorted_motor_current(ke * w, r, l_h, electrical_speed(w, pairs)) for w in (1e2, 1e3, 1e5)
    ]
    assert currents == sorted(currents)
    assert currents[-1] < ceiling
    assert currents[-1] == pytest.approx(ceiling, rel=1e-5)


def test_three_phase_short_without_inductance_is_the_dc_loop() -> None:
    # brief 6 (physics): a loop of R_LL = 2 R_phase with Ke_LL brakes with Kt Ke w / R_LL
    kv, r_phase, omega = 100.0, 0.05, 200.0
    ke = back_emf_constant(kv)
    torque = shorted_three_phase_braking_torque(ke, omega, 7, r_phase, 0.0)
    dc_torque = braking_wheel_force(kv, braking_current(kv, omega, 2 * r_phase), 1.0, 1.0)
    assert torque == pytest.approx(dc_torque)


def test_three_phase_braking_torque_peaks_at_the_corner() -> None:
    # calculus on T ~ w / (R^2 + (p w L)^2): dT/dw = 0 where p w L = R
    ke, pairs, r_phase, l_phase = 0.1, 7, 0.05, 60e-6
    corner = inductance_corner_speed(r_phase, l_phase, pairs)
    peak = shorted_three_phase_braking_torque(ke, corner, pairs, r_phase, l_phase)
    for factor in (0.5, 0.9, 1.1, 2.0):
        other = shorted_three_phase_braking_torque(ke, corner * factor, pairs, r_phase, l_phase)
        assert other < peak
    assert shorted_three_phase_braking_torque(ke, 0.0, pairs, r_phase, l_phase) == 0.0


def test_terminal_speed_against_the_road_load_check_value() -> None:
    # brief 3 check value (D): 100 kg, Crr 0.01, CdA 0.6 m^2 needs 27.53 N at 25 km/h, of which
    # 9.807 N is rolling, so drag is 17.72 N; on the descent where m g (sin - Crr cos) = 17.72 N
    # the vehicle runs away to 25 km/h
    drag = 27.53 - 100.0 * STANDARD_GRAVITY * 0.01
    k = drag / (100.0 * STANDARD_GRAVITY)
    theta = math.asin(k / math.hypot(1.0, 0.01)) + math.atan(0.01)
    grade = 100.0 * math.tan(theta)
    speed = terminal_speed_on_descent(100.0, grade, 0.01, 0.6)
    assert ms_to_kmh(speed) == pytest.approx(25.0, abs=0.01)
    # the root is where the road load (gravity counted as a negative climb) is zero
    assert road_load_force(100.0, speed, 0.01, 0.6, -grade) == pytest.approx(0.0, abs=1e-6)


def test_terminal_speed_closed_form() -> None:
    # m g sin = m g Crr cos + 0.5 rho CdA v^2, solved for v (ISA rho 1.225 kg/m^3)
    theta = math.atan(0.10)
    expected = math.sqrt(
        2
        * 100.0
        * STANDARD_GRAVITY
        * (math.sin(theta) - 0.01 * math.cos(theta))
        / (AIR_DENSITY_ISA * 0.6)
    )
    assert terminal_speed_on_descent(100.0, 10.0, 0.01, 0.6) == pytest.approx(expected)


def test_terminal_speed_with_a_retarding_force() -> None:
    # force balance with a shorted-motor force b v: the positive root of
    # 0.5 rho CdA v^2 + b v - m g (sin - Crr cos) = 0 (quadratic formula)
    b = 20.0
    theta = math.atan(0.10)
    drive = 100.0 * STANDARD_GRAVITY * (math.sin(theta) - 0.01 * math.cos(theta))
    a = 0.5 * AIR_DENSITY_ISA * 0.6
    expected = (-b + math.sqrt(b * b + 4 * a * drive)) / (2 * a)
    found = terminal_speed_on_descent(100.0, 10.0, 0.01, 0.6, retarding_force=lambda v: b * v)
    assert found == pytest.approx(expected, rel=1e-7)


def test_rolling_resistance_can_hold_a_gentle_slope() -> None:
    # Coulomb-like rolling resistance: on 0.5 % with Crr 0.01, sin < Crr cos: no run-away
    assert terminal_speed_on_descent(100.0, 0.5, 0.01, 0.6) == 0.0
    # with no drag and nothing else growing with speed nothing balances the slope
    assert terminal_speed_on_descent(100.0, 10.0, 0.01, 0.0) == math.inf
