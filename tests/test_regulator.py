"""Linear and switching regulator figures against the dissipation and junction formulas."""

from __future__ import annotations

import math

import pytest

from reviewer.engineering.regulator import (
    junction_temperature,
    largest_thermal_resistance,
    linear_load_budget,
    linear_regulator_loss,
    switching_input_current,
    switching_loss,
)


def test_linear_check_value_42_v_to_5_v() -> None:
    # domain brief check value (derived from P = (Vin - Vout) I_out + Vin I_q, Horowitz and
    # Hill, from memory): 42 V to 5 V at 0.1 A is 3.7 W; at 50 K/W a 185 K rise (JEDEC JESD51
    # Tj = Ta + P R_th, from memory)
    power = linear_regulator_loss(42.0, 5.0, 0.1)
    assert power == pytest.approx(3.7)
    assert junction_temperature(0.0, power, 50.0) == pytest.approx(185.0)


def test_quiescent_current_is_drawn_at_the_input_voltage() -> None:
    # P = (Vin - Vout) I_out + Vin I_q: 5 mA of ground current at 42 V adds 0.21 W
    assert linear_regulator_loss(42.0, 5.0, 0.1, 0.005) == pytest.approx(3.7 + 0.21)


def test_budget_is_the_load_that_meets_the_junction_limit_exactly() -> None:
    # inverting Tj = Ta + P R_th: at 25 degC, 125 degC limit, 50 K/W the part may lose 2 W;
    # less the 0.21 W quiescent loss, over 37 V, that is 48.4 mA
    budget = linear_load_budget(42.0, 5.0, 50.0, 25.0, 125.0, 0.005)
    assert budget == pytest.approx((2.0 - 0.21) / 37.0)
    loss = linear_regulator_loss(42.0, 5.0, budget, 0.005)
    assert junction_temperature(25.0, loss, 50.0) == pytest.approx(125.0)


def test_budget_edges() -> None:
    # the quiescent loss alone uses the whole allowance: nothing left for a load
    assert linear_load_budget(42.0, 5.0, 50.0, 120.0, 125.0, 0.005) == 0.0
    # no voltage across the pass transistor: any load is within the limit
    assert linear_load_budget(5.0, 5.0, 50.0, 25.0, 125.0) == math.inf
    with pytest.raises(ValueError):
        linear_load_budget(42.0, 5.0, 0.0, 25.0, 125.0)


def test_largest_thermal_resistance_keeps_the_junction_at_its_limit() -> None:
    # Tj = Ta + P R_th: 3.7 W from 25 degC to 125 degC allows 27.03 K/W junction to air
    r_th = largest_thermal_resistance(3.7, 25.0, 125.0)
    assert r_th == pytest.approx(100.0 / 3.7)
    assert junction_temperature(25.0, 3.7, r_th) == pytest.approx(125.0)
    assert largest_thermal_resistance(0.0, 25.0, 125.0) == math.inf


def test_switching_regulator_draws_output_power_over_efficiency() -> None:
    # energy balance: 5 V x 0.1 A = 0.5 W out; at 85 % from 42 V that is 14.0 mA in, and the
    # loss is 0.5 W x (1/0.85 - 1) = 0.088 W, far below the linear part's 3.7 W
    assert switching_input_current(42.0, 5.0, 0.1, 0.85) == pytest.approx(0.5 / 0.85 / 42.0)
    assert switching_loss(5.0, 0.1, 0.85) == pytest.approx(0.5 / 0.85 - 0.5)
    assert switching_loss(5.0, 0.1, 1.0) == 0.0


def test_nonsense_is_rejected() -> None:
    with pytest.raises(ValueError):
        linear_regulator_loss(3.0, 5.0, 0.1)  # input below output: not a linear regulator
    with pytest.raises(ValueError):
        linear_regulator_loss(42.0, 5.0, -0.1)
    with pytest.raises(ValueError):
        switching_input_current(42.0, 5.0, 0.1, 0.0)
    with pytest.raises(ValueError):
        switching_loss(5.0, 0.1, 1.2)
    with pytest.raises(ValueError):
        junction_temperature(25.0, -1.0, 50.0)
