"""Winding heating of a small motor: insulation classes, rise limits and a one-node thermal model.

The model treats the winding as one body losing heat to the air through a thermal resistance
R_th (K/W). The copper loss I^2 R(theta) grows with temperature, since copper's resistance does:
R(theta) = R20 (234.5 + theta) / (234.5 + 20). In steady state
theta = theta_amb + R_th I^2 R(theta), which solves in closed form to
theta = (theta_amb + a 234.5) / (1 - a) with a = R_th I^2 R20 / (234.5 + 20).
When a >= 1 no steady temperature exists: the loss outgrows the cooling (thermal runaway).

R_th is not known for a hobby motor, so it is calibrated from the maker's rated continuous
current: IEC 60034-1 rates a machine so that at rated current, with 40 degC coolant, the winding
reaches 40 degC plus its class's rise limit. A blocked fan lowers the heat-loss coefficient
(1 / R_th) by a factor; copper loss scales with I^2, so the allowed current scales with the
square root of that factor.

A locked rotor fed from a voltage, rather than held at a current, limits itself: its current
V / (R_series + R(theta)) falls as it heats. That case is solved numerically.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from reviewer.engineering.conductors import COPPER_INFERRED_ZERO

REFERENCE_COOLANT_C = 40.0  # IEC 60034-1: rise limits are over a 40 degC coolant
RESISTANCE_REFERENCE_C = 20.0  # winding resistance is given at 20 degC


@dataclass(frozen=True)
class ThermalClass:
    """An IEC 60085 thermal class and the IEC 60034-1 winding rise limit that goes with it."""

    letter: str
    class_temperature: float  # degC, IEC 60085
    rise_limit: float  # K over 40 degC coolant, resistance method, IEC 60034-1
    rise_limit_status: str  # "published", "from memory" or "derived"

    @property
    def rise_limit_temperature(self) -> float:
        """The winding temperature the rise limit allows at the reference coolant, degC."""
        return REFERENCE_COOLANT_C + self.rise_limit


# Class temperatures: IEC 60085. Rise limits: IEC 60034-1 (indirectly air-cooled windings,
# resistance method). B, F and H are in the current edition; A and E were in older editions and
# are recalled. N has no rise limit in IEC 60034-1: it is derived conservatively by keeping the
# largest hot-spot allowance of the listed classes (H: 180 - 40 - 125 = 15 K),
# 200 - 40 - 15 = 145 K.
THERMAL_CLASSES: dict[str, ThermalClass] = {
    "A": ThermalClass("A", 105.0, 60.0, "from memory"),
    "E": ThermalClass("E", 120.0, 75.0, "from memory"),
    "B": ThermalClass("B", 130.0, 80.0, "published"),
    "F": ThermalClass("F", 155.0, 105.0, "published"),
    "H": ThermalClass("H", 180.0, 125.0, "published"),
    "N": ThermalClass("N", 200.0, 145.0, "derived"),
}


def thermal_class(letter: str) -> ThermalClass:
    try:
        return THERMAL_CLASSES[letter.upper()]
    except KeyError:
        raise ValueError(
            f"unknown insulation class {letter!r}; expected one of {', '.join(THERMAL_CLASSES)}"
        ) from None


def copper_resistance_at(
    resistance: float, temperature_c: float, from_temperature_c: float = RESISTANCE_REFERENCE_C
) -> float:
    """Copper resistance moved from one temperature to another: R2/R1 = (234.5+T2)/(234.5+T1)."""
    return (
        resistance
        * (COPPER_INFERRED_ZERO + temperature_c)
        / (COPPER_INFERRED_ZERO + from_temperature_c)
    )


def temperature_from_resistance(
    cold_resistance: float, cold_temperature_c: float, hot_resistance: float
) -> float:
    """The resistance method: theta2 = (R2/R1)(234.5 + theta1) - 234.5, in degC."""
    ratio = hot_resistance / cold_resistance
    return ratio * (COPPER_INFERRED_ZERO + cold_temperature_c) - COPPER_INFERRED_ZERO


def calibrated_thermal_resistance(
    rated_current: float,
    resistance_20c: float,
    rise_limit: float,
    coolant_c: float = REFERENCE_COOLANT_C,
) -> float:
    """R_th in K/W such that the rated current, at ``coolant_c``, heats the winding by exactly
    ``rise_limit`` with the resistance it has when that hot."""
    if rated_current <= 0 or resistance_20c <= 0 or rise_limit <= 0:
        raise ValueError("rated current, resistance and rise limit must be positive")
    hot = copper_resistance_at(resistance_20c, coolant_c + rise_limit)
    return rise_limit / (rated_current * rated_current * hot)


def _runaway_parameter(
    current: float, resistance_20c: float, thermal_resistance: float, cooling_factor: float
) -> float:
    effective = thermal_resistance / cooling_factor
    return (
        effective
        * current
        * current
        * resistance_20c
        / (COPPER_INFERRED_ZERO + RESISTANCE_REFERENCE_C)
    )


def steady_winding_temperature(
    current: float,
    resistance_20c: float,
    thermal_resistance: float,
    ambient_c: float,
    cooling_factor: float = 1.0,
) -> float:
    """Steady winding temperature in degC at a constant current; ``math.inf`` on runaway.

    ``cooling_factor`` multiplies the heat-loss coefficient (1 for the cooling the rating was
    made with, below 1 for blocked airflow).
    """
    if cooling_factor <= 0:
        raise ValueError("cooling factor must be positive")
    a = _runaway_parameter(current, resistance_20c, thermal_resistance, cooling_factor)
    if a >= 1.0:
        return math.inf
    return (ambient_c + a * COPPER_INFERRED_ZERO) / (1.0 - a)


def max_continuous_current(
    resistance_20c: float,
    thermal_resistance: float,
    ambient_c: float,
    limit_temperature_c: float,
    cooling_factor: float = 1.0,
) -> float:
    """The highest constant current, in A, that keeps the winding at or below the limit.

    Inverts the steady-state formula: a = (limit - ambient) / (234.5 + limit). Zero when the
    ambient is already at or above the limit.
    """
    if limit_temperature_c <= ambient_c:
        return 0.0
    a = (limit_temperature_c - ambient_c) / (COPPER_INFERRED_ZERO + limit_temperature_c)
    effective = thermal_resistance / cooling_factor
    return math.sqrt(
        a * (COPPER_INFERRED_ZERO + RESISTANCE_REFERENCE_C) / (effective * resistance_20c)
    )


def insulation_life_factor(temperature_c: float, reference_c: float) -> float:
    """Insulation life relative to life at ``reference_c``: halves for every 10 K hotter."""
    return 2.0 ** ((reference_c - temperature_c) / 10.0)


def steady_winding_temperature_fed(
    voltage: float,
    series_resistance: float,
    resistance_20c: float,
    thermal_resistance: float,
    ambient_c: float,
    cooling_factor: float = 1.0,
) -> float:
    """Steady winding temperature in degC of a locked rotor fed from a fixed voltage.

    Unlike a current-limited winding, a voltage-fed one limits itself: as it heats, its
    resistance rises and its current I = V / (R_series + R(theta)) falls. The loss
    V^2 R / (R_series + R)^2 is the one at which theta = theta_amb + (R_th / k) x loss holds;
    the lowest such temperature (the one reached heating up from ambient) is returned.
    """
    return steady_winding_temperature_held(
        voltage, series_resistance, resistance_20c, thermal_resistance, ambient_c, cooling_factor
    )


def held_current(
    theta: float,
    voltage: float,
    series_resistance: float,
    resistance_20c: float,
    current_limit: float | None = None,
    power_limit: float | None = None,
) -> tuple[float, str]:
    """The current in A a locked rotor carries with its winding at ``theta`` degC, and what
    sets it: the lowest of the motor current limit, what the pack voltage drives through the
    loop, V / (R_series + R(theta)), and the current whose loop loss is the battery's power
    limit, sqrt(P / (R_series + R(theta))) (at a stall the pack's power all turns into heat:
    I_b V = I_m^2 R, brief 11)."""
    loop = series_resistance + copper_resistance_at(resistance_20c, theta)
    options = [(voltage / loop, "pack voltage")]
    if current_limit is not None:
        options.append((current_limit, "motor current limit"))
    if power_limit is not None:
        options.append((math.sqrt(max(power_limit, 0.0) / loop), "battery current limit"))
    return min(options, key=lambda pair: pair[0])


def steady_winding_temperature_held(
    voltage: float,
    series_resistance: float,
    resistance_20c: float,
    thermal_resistance: float,
    ambient_c: float,
    cooling_factor: float = 1.0,
    current_limit: float | None = None,
    power_limit: float | None = None,
) -> float:
    """Steady winding temperature in degC of a locked rotor on a pack of ``voltage`` V behind a
    controller whose limits hold it (:func:`held_current`): the lowest temperature, heating up
    from ambient, at which theta = theta_amb + (R_th / k) I(theta)^2 R(theta).

    The pack voltage bounds the loss by V^2 / R(theta_amb), so a steady state always exists; a
    held current above what the pack can drive through the hot winding is never credited.
    """
    if cooling_factor <= 0:
        raise ValueError("cooling factor must be positive")
    effective = thermal_resistance / cooling_factor

    def surplus(theta: float) -> float:
        current, _ = held_current(
            theta, voltage, series_resistance, resistance_20c, current_limit, power_limit
        )
        return (
            ambient_c
            + effective * current * current * copper_resistance_at(resistance_20c, theta)
            - theta
        )

    cold = copper_resistance_at(resistance_20c, ambient_c)
    high = ambient_c + effective * voltage * voltage / cold + 1.0
    low = ambient_c
    steps = 256
    for step in range(1, steps + 1):
        upper = ambient_c + (high - ambient_c) * step / steps
        if surplus(upper) <= 0:
            high = upper
            break
        low = upper
    for _ in range(100):
        middle = 0.5 * (low + high)
        if surplus(middle) > 0:
            low = middle
        else:
            high = middle
    return high
