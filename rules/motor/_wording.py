"""motor.cooling, its words: what holds a locked rotor's current, why the winding settles where
it does, and the remedy in the field a builder sets."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Protocol

from reviewer import figures
from reviewer import units as u
from reviewer.build import Build, Motor
from reviewer.engineering.brushless import dc_equivalent_current
from reviewer.engineering.thermal import (
    REFERENCE_COOLANT_C,
    ThermalClass,
    insulation_life_factor,
)

# The 10 K halving rule is quoted only this far past the class temperature; beyond it the
# figure would be meaningless precision about a winding that is burning.
_LIFE_QUOTE_SPAN_K = 50.0


class Load(Protocol):
    """What holds a locked rotor's current (``cooling._Load``)."""

    motor_limit: float | None
    voltage: float | None

    @property
    def limited(self) -> bool: ...


@dataclass(frozen=True)
class Held:
    current: float  # A, DC-equivalent, at the steady temperature
    cold: float  # A, with the winding at 20 degC
    by: str  # "motor current limit", "battery current limit" or "pack voltage"
    loss: float  # W, copper
    power: float | None  # W, drawn from the pack
    still_air: bool = False  # a shaft fan standing still at the locked rotor


def rationale(
    load: Load, held: Held, theta: float, ambient: float, grade: ThermalClass, factor: float
) -> str:
    f = u.format_number
    current, loss = held.current, held.loss
    drawn = ""
    if held.power is not None:
        drawn = f", of {f(held.power)} W drawn from the pack (a locked rotor does no work)"
    least = "at least " if math.isinf(theta) else ""
    if held.by == "motor current limit":
        first = (
            f"Held against a locked rotor at {f(current)} A by the controller's motor current "
            f"limit, the winding's copper loss is {least}{f(loss)} W{drawn}."
        )
    elif held.by == "battery current limit":
        first = (
            f"Held against a locked rotor by the battery current limit (the pack's power "
            f"I_b V all turns into heat: I_m = sqrt(I_b V / R)), the motor carries {f(held.cold)} "
            f"A cold, {f(current)} A hot; the winding's copper loss is {f(loss)} W{drawn}."
        )
    elif load.limited:
        first = (
            f"The pack cannot drive the limit's current through the hot winding: a locked "
            f"rotor draws {f(held.cold)} A cold, falling to {f(current)} A as it heats; the "
            f"winding's copper loss is then {f(loss)} W{drawn}."
        )
    else:
        first = (
            f"With no current limit a stalled motor draws {f(held.cold)} A cold, falling to "
            f"{f(current)} A as it heats; the winding's copper loss is then {f(loss)} W{drawn}."
        )
    airflow = "its shaft fan standing still" if held.still_air else "blocked airflow"
    cooling = "" if factor == 1.0 else f" with {airflow} ({factor:.0%} of the cooling)"
    limits = (
        f"class {grade.letter} allows {f(grade.rise_limit_temperature)} °C "
        f"({f(REFERENCE_COOLANT_C)} °C plus its {f(grade.rise_limit)} K rise limit) and its "
        f"insulation is rated {f(grade.class_temperature)} °C"
    )
    if math.isinf(theta):
        return (
            f"{first} At {f(ambient)} °C ambient{cooling} no steady temperature exists: the loss "
            f"grows with the winding's resistance faster than cooling removes it; {limits}."
        )
    life = ""
    excess = theta - grade.class_temperature
    if excess > _LIFE_QUOTE_SPAN_K:
        life = f"; that is {f(excess)} K past its insulation rating"
    elif excess > 0:
        share = insulation_life_factor(theta, grade.class_temperature)
        life = f"; insulation life falls to about {f(share, 2)} of its rated life"
    return (
        f"{first} At {f(ambient)} °C ambient{cooling} it settles at {f(theta)} °C; {limits}{life}."
    )


def remedy(
    build: Build,
    motor: Motor,
    load: Load,
    held: Held,
    allowed_pair: tuple[float, float],
    factor: float,
    ambient: float,
    grade: ThermalClass,
) -> str:
    f = u.format_number
    allowed, allowed_open = allowed_pair
    cold, current = held.cold, held.current
    if allowed <= 0:
        return (
            f"do not run this motor at {f(ambient)} °C ambient: even without current it is over "
            f"its class {grade.letter} limit; use a motor of a higher insulation class"
        )
    amps = floor_tenth(quoted(build, motor, allowed))
    stated = (
        ""
        if amps == floor_tenth(allowed)
        else f" (as the datasheet quotes it; {f(allowed)} A DC-equivalent)"
    )
    if load.motor_limit is not None:
        text = f"set controller.motor_current_limit at or below {amps:g} A{stated}"
    else:
        text = (
            f"fit a current limit: controller.motor_current_limit at or below {amps:g} A"
            f"{stated} (without one a locked rotor carries {f(cold)} A cold)"
        )
    if factor < 1.0:
        open_amps = floor_tenth(quoted(build, motor, allowed_open))
        vents = motor.cooling.inlet_blocked or motor.cooling.outlet_blocked
        if motor.cooling.fan and not motor.cooling.fan_independent:
            text += (
                "; or a stall cut-off, since a shaft fan does not cool a locked rotor "
                f"(with airflow {open_amps:g} A would be allowed)"
            )
        elif vents and load.motor_limit is not None and current <= allowed_open:
            text += (
                f", or unblock the fan's inlet and outlet (then up to {open_amps:g} A is allowed)"
            )
        elif vents:
            text += f"; unblocking the fan's inlet and outlet raises that to {open_amps:g} A"
    return text


def quoted(build: Build, motor: Motor, dc_current: float) -> float:
    """A DC-equivalent current as the controller's datasheet quotes its motor limit; with the
    basis or drive unstated, the reading that gives the smaller quoted figure."""
    limit = figures.motor_limit(build, motor)
    if limit is not None:
        return dc_current * limit.quoted / limit.high
    drive = figures.drive_kind(build, motor)
    if drive in ("brushed", "six-step"):
        return dc_current
    controller = build.controller
    basis = controller.motor_current_basis if controller is not None else None
    return dc_current / dc_equivalent_current(
        1.0, "field-oriented", basis.value if basis else "rms"
    )


def floor_tenth(value: float) -> float:
    return math.floor(value * 10.0 + 1e-9) / 10.0
