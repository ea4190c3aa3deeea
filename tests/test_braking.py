"""Dynamic braking of a shorted DC motor against E = Ke w, I = E / R and T = Kt I."""

from __future__ import annotations

import math

import pytest

from reviewer.engineering.braking import (
    added_resistance_for,
    braking_current,
    braking_force_per_speed,
    braking_wheel_force,
    rpm_to_ground_speed,
    speed_at_current_rpm,
)
from reviewer.engineering.motor import rpm_to_rad_s


def test_speed_at_contact_rating_check_value() -> None:
    # domain brief check value (derived from E = Ke w, I = E / R_loop): 30 A, 0.2 ohm,
    # 100 rpm/V gives n* = 600 rpm
    assert speed_at_current_rpm(30.0, 0.2, 100.0) == pytest.approx(600.0)


def test_braking_current_at_that_speed_is_the_rating() -> None:
    # the same check value the other way round: at 600 rpm a 100 rpm/V motor makes 6 V,
    # which drives 30 A round 0.2 ohm (Ke = 60 / (2 pi Kv), SI definition)
    assert braking_current(100.0, rpm_to_rad_s(600.0), 0.2) == pytest.approx(30.0)


def test_braking_current_is_proportional_to_speed() -> None:
    # physics of dynamic braking: I = Ke w / R, so half the speed gives half the current and
    # a standing wheel none at all
    full = braking_current(100.0, 100.0, 0.5)
    assert braking_current(100.0, 50.0, 0.5) == pytest.approx(full / 2)
    assert braking_current(100.0, 0.0, 0.5) == 0.0


def test_wheel_force_is_kt_i_times_reduction_over_radius() -> None:
    # lever rule with Kt = 9.5493 / Kv (SI definition): 100 rpm/V, 30 A, 5:1, 0.1 m radius
    # gives 0.095493 x 30 x 5 / 0.1 = 143.2 N
    assert braking_wheel_force(100.0, 30.0, 5.0, 0.1) == pytest.approx(143.24, abs=0.01)


def test_force_per_speed_matches_current_and_lever() -> None:
    # F = Kt I reduction / r with I = Ke (v reduction / r) / R: the coefficient times v
    kv, resistance, reduction, radius, speed = 100.0, 0.4, 5.0, 0.1, 6.0
    omega = speed * reduction / radius
    current = braking_current(kv, omega, resistance)
    force = braking_wheel_force(kv, current, reduction, radius)
    coefficient = braking_force_per_speed(kv, resistance, reduction, radius)
    assert coefficient * speed == pytest.approx(force)
    # doubling the loop resistance halves the braking force
    assert braking_force_per_speed(kv, 2 * resistance, reduction, radius) == pytest.approx(
        coefficient / 2
    )


def test_added_resistance_holds_the_current_to_the_rating() -> None:
    # I = E / (R_loop + R_added): 36 V round 0.1 ohm needs 3.5 ohm more to stay at 10 A
    extra = added_resistance_for(10.0, 36.0, 0.1)
    assert extra == pytest.approx(3.5)
    assert 36.0 / (0.1 + extra) == pytest.approx(10.0)
    assert added_resistance_for(10.0, 0.5, 0.1) == 0.0  # already within the rating


def test_ground_speed_from_motor_rpm() -> None:
    # wheel speed = motor speed / reduction x 2 pi r: 600 rpm through 5:1 on a 0.1 m radius
    # is 120 rpm of the wheel, 1.257 m/s
    assert rpm_to_ground_speed(600.0, 5.0, 0.1) == pytest.approx(120 / 60 * 2 * math.pi * 0.1)


def test_nonsense_is_rejected() -> None:
    with pytest.raises(ValueError):
        braking_current(100.0, 10.0, 0.0)
    with pytest.raises(ValueError):
        speed_at_current_rpm(30.0, 0.0, 100.0)
    with pytest.raises(ValueError):
        added_resistance_for(0.0, 36.0, 0.1)
    with pytest.raises(ValueError):
        braking_wheel_force(100.0, 30.0, 5.0, 0.0)
