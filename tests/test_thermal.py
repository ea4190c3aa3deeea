"""Winding thermal model against IEC 60085, IEC 60034-1 and copper's resistance law."""

from __future__ import annotations

import math

import pytest

from reviewer.engineering.thermal import (
    THERMAL_CLASSES,
    calibrated_thermal_resistance,
    copper_resistance_at,
    insulation_life_factor,
    max_continuous_current,
    steady_winding_temperature,
    steady_winding_temperature_fed,
    temperature_from_resistance,
    thermal_class,
)


def test_insulation_class_temperatures() -> None:
    # IEC 60085 thermal classes: 105 (A), 120 (E), 130 (B), 155 (F), 180 (H), 200 (N)
    expected = {"A": 105, "E": 120, "B": 130, "F": 155, "H": 180, "N": 200}
    assert {k: c.class_temperature for k, c in THERMAL_CLASSES.items()} == expected


def test_published_rise_limits() -> None:
    # IEC 60034-1 winding rise limits over 40 degC coolant, resistance method: B 80, F 105, H 125
    assert thermal_class("B").rise_limit == 80
    assert thermal_class("F").rise_limit == 105
    assert thermal_class("H").rise_limit == 125
    assert {thermal_class(k).rise_limit_status for k in "BFH"} == {"published"}


def test_older_rise_limits_from_memory() -> None:
    # from memory: IEC 60034-1 older editions, class A 60 K, class E 75 K
    assert thermal_class("A").rise_limit == 60
    assert thermal_class("E").rise_limit == 75
    assert thermal_class("a").rise_limit_status == "from memory"


def test_class_n_rise_is_derived_within_its_class_temperature() -> None:
    # derived: N keeps class H's 15 K hot-spot allowance (IEC 60034-1 H 125 K, IEC 60085 H 180)
    h, n = thermal_class("H"), thermal_class("N")
    assert h.class_temperature - h.rise_limit_temperature == 15
    assert n.class_temperature - n.rise_limit_temperature == 15
    assert n.rise_limit_status == "derived"
    for grade in THERMAL_CLASSES.values():
        assert grade.rise_limit_temperature < grade.class_temperature


def test_unknown_class_is_refused() -> None:
    with pytest.raises(ValueError):
        thermal_class("Z")


def test_copper_resistance_with_temperature() -> None:
    # IEC 60028 basis: R2/R1 = (234.5 + T2)/(234.5 + T1), i.e. 0.00393 /K at 20 degC
    assert copper_resistance_at(1.0, 75.0) == pytest.approx(309.5 / 254.5)
    assert copper_resistance_at(1.0, 75.0) == pytest.approx(1 + 0.00393 * 55, rel=1e-4)
    assert copper_resistance_at(2.0, 20.0, from_temperature_c=75.0) == pytest.approx(
        2.0 * 254.5 / 309.5
    )


def test_resistance_method_reads_temperature_back() -> None:
    # IEC 60034-1 resistance method: theta2 = (R2/R1)(234.5 + theta1) - 234.5; 1.2 x at 20 degC
    assert temperature_from_resistance(0.25, 20.0, 0.30) == pytest.approx(70.9)


def test_calibration_reproduces_the_rating() -> None:
    # IEC 60034-1: at rated current and 40 degC coolant the winding reaches 40 + rise limit
    r_th = calibrated_thermal_resistance(10.0, 0.3, 105.0)
    assert steady_winding_temperature(10.0, 0.3, r_th, 40.0) == pytest.approx(145.0)
    assert max_continuous_current(0.3, r_th, 40.0, 145.0) == pytest.approx(10.0)


def test_steady_temperature_balances_loss_and_cooling() -> None:
    # energy balance: theta - theta_amb = R_th I^2 R(theta), with R(theta) by IEC 60028's law
    r_th, r20, current, ambient = 1.2, 0.25, 8.0, 25.0
    theta = steady_winding_temperature(current, r20, r_th, ambient)
    hot = copper_resistance_at(r20, theta)
    assert theta - ambient == pytest.approx(r_th * current * current * hot)
    assert hot > r20  # the loss is taken at the hot resistance, not the 20 degC one


def test_thermal_runaway_when_loss_outgrows_cooling() -> None:
    # derived: a = R_th I^2 R20 / 254.5 >= 1 means no steady state
    r20, r_th = 0.3, 1.0
    edge = math.sqrt(254.5 / (r_th * r20))
    assert math.isinf(steady_winding_temperature(edge * 1.001, r20, r_th, 25.0))
    assert math.isfinite(steady_winding_temperature(edge * 0.5, r20, r_th, 25.0))


def test_blocked_vents_run_hotter_and_allow_less_current() -> None:
    # common practice: a fan-cooled motor with blocked vents runs hotter; from memory (domain
    # brief section 4): allowed current scales with the square root of the cooling ratio
    r_th = calibrated_thermal_resistance(10.0, 0.3, 105.0)
    open_vents = steady_winding_temperature(9.0, 0.3, r_th, 35.0)
    blocked = steady_winding_temperature(9.0, 0.3, r_th, 35.0, cooling_factor=0.5)
    assert blocked > open_vents + 20.0
    allowed_open = max_continuous_current(0.3, r_th, 35.0, 145.0)
    allowed_blocked = max_continuous_current(0.3, r_th, 35.0, 145.0, cooling_factor=0.5)
    assert allowed_blocked == pytest.approx(allowed_open * math.sqrt(0.5))


def test_no_current_allowed_when_ambient_is_at_the_limit() -> None:
    assert max_continuous_current(0.3, 1.0, 150.0, 145.0) == 0.0


def test_insulation_life_halves_per_ten_kelvin() -> None:
    # the usual Arrhenius rule: each +10 K roughly halves insulation life
    assert insulation_life_factor(165.0, 155.0) == pytest.approx(0.5)
    assert insulation_life_factor(175.0, 155.0) == pytest.approx(0.25)
    assert insulation_life_factor(145.0, 155.0) == pytest.approx(2.0)


def test_voltage_fed_locked_rotor_limits_itself() -> None:
    # energy balance with V = I (R_series + R(theta)): the heated winding draws less current
    voltage, series, r20, r_th, ambient = 24.0, 0.02, 0.3, 1.5, 30.0
    theta = steady_winding_temperature_fed(voltage, series, r20, r_th, ambient)
    hot = copper_resistance_at(r20, theta)
    current = voltage / (series + hot)
    assert theta - ambient == pytest.approx(r_th * current * current * hot, rel=1e-6)
    assert current < voltage / (series + r20)
    # held at its cold stall current instead, the same winding would have no steady state
    assert math.isinf(steady_winding_temperature(voltage / (series + r20), r20, r_th, ambient))
