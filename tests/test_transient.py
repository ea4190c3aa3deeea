"""The first-order thermal model against Newton cooling's analytic solution and the brief's
check value, heat capacities against the CRC Handbook."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from reviewer.engineering.transient import (
    COPPER_SPECIFIC_HEAT,
    IRON_SPECIFIC_HEAT,
    LossSegment,
    fan_airflow_factor,
    fan_cooling_factor,
    heat_capacity,
    steady_temperature,
    step_through,
    temperature_after,
    time_constant,
    time_constant_from_mass,
    time_to_reach,
)

R_TH = 0.5  # K/W
TAU = 600.0  # s
AMBIENT = 40.0  # degC


def test_specific_heats() -> None:
    # CRC Handbook of Chemistry and Physics: copper 385, iron 450 J/(kg K) at 25 degC
    assert COPPER_SPECIFIC_HEAT == 385.0
    assert IRON_SPECIFIC_HEAT == 450.0
    assert heat_capacity(1.0, 1.0) == pytest.approx(385.0)
    # 2 kg, 30 % copper: 2 (0.3 x 385 + 0.7 x 450) = 861 J/K
    assert heat_capacity(2.0, 0.3) == pytest.approx(861.0)
    assert time_constant_from_mass(0.5, 2.0, 0.3) == pytest.approx(430.5)
    assert time_constant(0.5, 861.0) == pytest.approx(430.5)
    with pytest.raises(ValueError):
        heat_capacity(2.0, 1.5)


def test_four_times_rated_loss_reaches_rated_rise_at_tau_ln_4_3() -> None:
    # brief 12 check value (D, Newton cooling): 4 x rated loss (2 x rated current) reaches the
    # rated rise after t = tau ln(4/3) = 0.288 tau
    rated_loss = 160.0  # W, so the rated rise is 80 K
    rated_rise = rated_loss * R_TH
    t = time_to_reach(AMBIENT + rated_rise, AMBIENT, 4 * rated_loss, R_TH, TAU, AMBIENT)
    assert t == pytest.approx(TAU * math.log(4.0 / 3.0))
    assert t / TAU == pytest.approx(0.288, abs=5e-4)
    assert temperature_after(AMBIENT, 4 * rated_loss, R_TH, TAU, AMBIENT, t) == pytest.approx(
        AMBIENT + rated_rise
    )


def test_one_time_constant_gives_63_percent() -> None:
    # Newton cooling, first-order step response: 1 - 1/e = 63.2 % of the final rise after tau
    rise = temperature_after(AMBIENT, 100.0, R_TH, TAU, AMBIENT, TAU) - AMBIENT
    assert rise / (100.0 * R_TH) == pytest.approx(0.632, abs=5e-4)


def test_rated_loss_never_exceeds_rated_rise() -> None:
    # Newton cooling: the rise approaches P R_th and never reaches it
    assert steady_temperature(160.0, R_TH, AMBIENT) == pytest.approx(120.0)
    assert time_to_reach(120.0, AMBIENT, 160.0, R_TH, TAU, AMBIENT) == math.inf
    assert time_to_reach(119.0, AMBIENT, 160.0, R_TH, TAU, AMBIENT) < math.inf
    assert time_to_reach(30.0, AMBIENT, 160.0, R_TH, TAU, AMBIENT) == 0.0


def test_exact_step_agrees_with_a_fine_integration_of_the_equation() -> None:
    # C dtheta/dt = P - (theta - theta_a) / R_th integrated by forward Euler at tau / 20000
    # (first-order method, error ~ dt / tau): agrees with the exact step to 1e-3 K
    c = TAU / R_TH
    theta, loss, dt = 70.0, 300.0, TAU / 20000.0
    for _ in range(20000 * 2):  # two time constants
        theta += dt * (loss - (theta - AMBIENT) / R_TH) / c
    assert temperature_after(70.0, loss, R_TH, TAU, AMBIENT, 2 * TAU) == pytest.approx(
        theta, abs=2e-3
    )


def test_many_exact_steps_equal_the_analytic_solution() -> None:
    # analytic solution of the linear ODE: cutting a constant stretch into 1000 steps changes
    # nothing, and two segments compose as theta_ss2 + (theta_1 - theta_ss2) e^(-t2/tau)
    many = step_through(AMBIENT, [LossSegment(1.2, 200.0)] * 1000, R_TH, TAU, AMBIENT)
    ss = AMBIENT + 200.0 * R_TH
    assert many[-1] == pytest.approx(ss + (AMBIENT - ss) * math.exp(-1200.0 / TAU), rel=1e-12)
    first = ss + (AMBIENT - ss) * math.exp(-300.0 / TAU)
    ss2 = AMBIENT + 20.0 * R_TH
    second = ss2 + (first - ss2) * math.exp(-900.0 / TAU)
    two = step_through(
        AMBIENT, [LossSegment(300.0, 200.0), LossSegment(900.0, 20.0)], R_TH, TAU, AMBIENT
    )
    assert two == pytest.approx([AMBIENT, first, second])


def test_halved_cooling_doubles_rise_and_time_constant() -> None:
    # Newton cooling with conductance k / R_th: theta_ss - theta_a = P R_th / k, tau' = tau / k
    assert steady_temperature(100.0, R_TH, AMBIENT, 0.5) == pytest.approx(AMBIENT + 100.0)
    slow = temperature_after(AMBIENT, 100.0, R_TH, TAU, AMBIENT, 2 * TAU, cooling_factor=0.5)
    assert slow - AMBIENT == pytest.approx(100.0 * (1 - math.exp(-1.0)))


def test_fan_airflow_factor() -> None:
    # brief 12 (M): airflow proportional to speed, heat transfer ~ airflow^0.8; none at stall
    assert fan_airflow_factor(0.0, 300.0) == 0.0
    assert fan_airflow_factor(300.0, 300.0) == pytest.approx(1.0)
    assert fan_airflow_factor(150.0, 300.0) == pytest.approx(0.5**0.8)
    assert fan_airflow_factor(-150.0, 300.0) == pytest.approx(0.574, abs=1e-3)


def test_fan_cooling_at_stall_is_still_air() -> None:
    # brief 12 (M): a motor held at a stall is cooled as if it had no fan (IC410)
    assert fan_cooling_factor(0.0, 300.0, 0.4) == pytest.approx(0.4)
    assert fan_cooling_factor(300.0, 300.0, 0.4) == pytest.approx(1.0)
    assert 0.4 < fan_cooling_factor(100.0, 300.0, 0.4) < 1.0


@settings(max_examples=300, deadline=None)
@given(
    start=st.floats(-20.0, 200.0),
    loss=st.floats(0.0, 2000.0),
    duration=st.floats(0.0, 1.0e5),
    cooling=st.floats(0.05, 3.0),
)
def test_exact_step_stays_between_start_and_steady_state(
    start: float, loss: float, duration: float, cooling: float
) -> None:
    # Newton cooling is monotonic: no overshoot past the steady state, no undershoot
    ss = steady_temperature(loss, R_TH, AMBIENT, cooling)
    theta = temperature_after(start, loss, R_TH, TAU, AMBIENT, duration, cooling)
    low, high = min(start, ss), max(start, ss)
    assert low - 1e-9 <= theta <= high + 1e-9


@settings(max_examples=200, deadline=None)
@given(rise_fraction=st.floats(0.01, 0.99), loss=st.floats(1.0, 2000.0))
def test_time_to_reach_inverts_the_step(rise_fraction: float, loss: float) -> None:
    # the closed-form inverse of the exponential: stepping for the time found lands on target
    target = AMBIENT + rise_fraction * loss * R_TH
    t = time_to_reach(target, AMBIENT, loss, R_TH, TAU, AMBIENT)
    assert temperature_after(AMBIENT, loss, R_TH, TAU, AMBIENT, t) == pytest.approx(target)
