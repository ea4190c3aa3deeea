"""Winding temperature over time: the first-order (one-body) thermal model, in SI floats.

C dtheta/dt = P - (theta - theta_a) / R_th, with heat capacity C [J/K], thermal resistance to the
ambient R_th [K/W] and time constant tau = R_th C (Newton cooling; any heat-transfer text, brief
12). For a constant loss P the solution is exact, so a ride is stepped as a sequence of
constant-loss segments with no integration error: theta(t) = theta_ss + (theta_0 - theta_ss)
exp(-t / tau), theta_ss = theta_a + P R_th. Within a segment the temperature moves monotonically
from its start towards theta_ss, so the hottest moment of a ride is always at a segment end.

Cooling that changes with speed (a shaft fan, a hub motor in the wind) is a ``cooling_factor`` k
multiplying the heat-loss coefficient 1 / R_th: the steady rise becomes P R_th / k and the time
constant tau / k (the heat capacity is unchanged).

Temperatures in degC (rises in K), losses in W, times in s.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass

#: Specific heats in J/(kg K) near room temperature (CRC Handbook of Chemistry and Physics).
COPPER_SPECIFIC_HEAT = 385.0
IRON_SPECIFIC_HEAT = 450.0
#: Forced-convection heat transfer against airflow, h ~ airflow^0.8 (brief 12, from memory;
#: the turbulent-flow exponent of the usual Nusselt correlations).
AIRFLOW_EXPONENT = 0.8


def heat_capacity(mass_kg: float, copper_fraction: float) -> float:
    """Heat capacity in J/K of a motor of ``mass_kg`` taken as copper and iron only.

    C = m (f c_Cu + (1 - f) c_Fe), f the copper mass fraction (an estimate the caller states;
    magnets, aluminium and plastic are counted as iron).
    """
    if mass_kg <= 0:
        raise ValueError("mass must be positive")
    if not 0.0 <= copper_fraction <= 1.0:
        raise ValueError("copper fraction must lie between 0 and 1")
    return mass_kg * (
        copper_fraction * COPPER_SPECIFIC_HEAT + (1.0 - copper_fraction) * IRON_SPECIFIC_HEAT
    )


def time_constant(thermal_resistance: float, heat_capacity_j_per_k: float) -> float:
    """tau = R_th C in s."""
    if thermal_resistance <= 0 or heat_capacity_j_per_k <= 0:
        raise ValueError("thermal resistance and heat capacity must be positive")
    return thermal_resistance * heat_capacity_j_per_k


def time_constant_from_mass(
    thermal_resistance: float, mass_kg: float, copper_fraction: float
) -> float:
    """tau in s estimated from the motor's mass: R_th m (f c_Cu + (1 - f) c_Fe).

    The whole mass heating as one body overstates the capacity the winding itself sees (the
    winding runs ahead of the frame), so this tau is long: the favourable side for a short peak.
    A rule using it must state it as an estimate.
    """
    return time_constant(thermal_resistance, heat_capacity(mass_kg, copper_fraction))


def steady_temperature(
    loss: float, thermal_resistance: float, ambient_c: float, cooling_factor: float = 1.0
) -> float:
    """theta_ss = theta_a + P R_th / k in degC: where a constant loss settles."""
    _check_cooling(cooling_factor)
    if thermal_resistance <= 0:
        raise ValueError("thermal resistance must be positive")
    return ambient_c + loss * thermal_resistance / cooling_factor


def temperature_after(
    start_c: float,
    loss: float,
    thermal_resistance: float,
    time_constant_s: float,
    ambient_c: float,
    duration_s: float,
    cooling_factor: float = 1.0,
) -> float:
    """Temperature in degC after ``duration_s`` s at a constant loss: the exact step
    theta_ss + (theta_0 - theta_ss) exp(-k t / tau)."""
    if time_constant_s <= 0:
        raise ValueError("time constant must be positive")
    if duration_s < 0 or loss < 0:
        raise ValueError("duration and loss must not be negative")
    steady = steady_temperature(loss, thermal_resistance, ambient_c, cooling_factor)
    decay = math.exp(-duration_s * cooling_factor / time_constant_s)
    return steady + (start_c - steady) * decay


def time_to_reach(
    target_c: float,
    start_c: float,
    loss: float,
    thermal_resistance: float,
    time_constant_s: float,
    ambient_c: float,
    cooling_factor: float = 1.0,
) -> float:
    """Seconds until a winding heating at a constant loss first reaches ``target_c``.

    t = (tau / k) ln((theta_ss - theta_0) / (theta_ss - theta_target)); 0 when it starts at or
    above the target, ``math.inf`` when it settles at or below the target (never reached).
    """
    if time_constant_s <= 0:
        raise ValueError("time constant must be positive")
    if start_c >= target_c:
        return 0.0
    steady = steady_temperature(loss, thermal_resistance, ambient_c, cooling_factor)
    if steady <= target_c:
        return math.inf
    return time_constant_s / cooling_factor * math.log((steady - start_c) / (steady - target_c))


def fan_airflow_factor(speed: float, rated_speed: float) -> float:
    """Heat transfer of a shaft-driven fan's air relative to rated speed: (n / n_rated)^0.8.

    The fan's airflow is proportional to its speed, and forced convection grows about as
    airflow^0.8 (brief 12, from memory). Exactly 0 at a stall: a stalled fan moves no air.
    Either direction of rotation moves air; above rated speed the factor exceeds 1.
    """
    if rated_speed <= 0:
        raise ValueError("rated speed must be positive")
    ratio = abs(speed) / rated_speed
    if ratio == 0.0:
        return 0.0
    return ratio**AIRFLOW_EXPONENT


def fan_cooling_factor(speed: float, rated_speed: float, still_air_factor: float) -> float:
    """Cooling factor k (heat-loss coefficient over the rated one) of a fan-cooled motor.

    k = k_still + (1 - k_still) x ``fan_airflow_factor``: the still-air part (what an IC410
    machine keeps, brief 4) plus the fan's part, which scales with airflow^0.8. So k is the
    still-air factor at a stall and 1 at rated speed. ``still_air_factor`` is an input with a
    flagged default, not a property of the motor this module can know.
    """
    if not 0.0 < still_air_factor <= 1.0:
        raise ValueError("still-air factor must lie in (0, 1]")
    return still_air_factor + (1.0 - still_air_factor) * fan_airflow_factor(speed, rated_speed)


@dataclass(frozen=True)
class LossSegment:
    """A stretch of a ride at constant winding loss (W) and constant cooling factor."""

    duration_s: float
    loss: float
    cooling_factor: float = 1.0


def step_through(
    start_c: float,
    segments: Iterable[LossSegment],
    thermal_resistance: float,
    time_constant_s: float,
    ambient_c: float,
) -> list[float]:
    """Winding temperatures in degC at the start and at the end of each segment, in order.

    Each segment is one exact step, so the result does not depend on how a constant stretch is
    cut up, and ``max`` of the list is the hottest the winding gets (temperature is monotonic
    within a constant-loss segment).
    """
    temperatures = [start_c]
    for segment in segments:
        temperatures.append(
            temperature_after(
                temperatures[-1],
                segment.loss,
                thermal_resistance,
                time_constant_s,
                ambient_c,
                segment.duration_s,
                segment.cooling_factor,
            )
        )
    return temperatures


def _check_cooling(cooling_factor: float) -> None:
    if not cooling_factor > 0:
        raise ValueError("cooling factor must be positive")
