"""What the controller's switch, diode and current sensor must handle, shared by the controller
rules so that they agree: the per-motor current limit and the highest cold stall current on the
full pack; plus the small readers and rounding rules the three use alike.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import pint

from reviewer import figures
from reviewer.build import Build, MotorType
from reviewer.findings import Source
from reviewer.profile import Limit
from reviewer.units import in_unit, unit

_A = unit("A")
_DEGC = unit("degC")
STALL = Source.from_memory(
    "Chapman, Electric Machinery Fundamentals: a locked rotor draws V / R_loop (cold resistance "
    "for the highest current)"
)


@dataclass(frozen=True)
class Stall:
    """The highest per-motor cold stall current on the full pack, and whose it is."""

    current: float  # A
    motor: str


def _stall_loop(build: Build) -> figures.StallLoop | None:
    return figures.stall_loop(build)  # remembered there for the next rule on the same build


def current_limit(build: Build) -> float | None:
    """The most current the switch, freewheel path and sensor carry while the controller's
    limits hold, in A: per motor the locked-rotor motor current with both limits acting
    (``figures.stall_point``: the battery limit alone still lets sqrt(I_b V / R) into a locked
    motor), as the phase current for a brushless drive; the highest over the motors. None when
    nothing limits current, or when only a battery limit is given and the stall loop is
    unknown."""
    if not figures.any_limit(build) or not build.motors:
        return None
    amps = []
    for motor in build.motors:
        point = figures.stall_point(build, motor.name)
        if point is not None:
            dc = point.motor_current
        else:
            limit = figures.motor_limit(build, motor)
            if limit is None:
                return None
            dc = limit.high
        amps.append(figures.phase_conductor_current(build, motor, dc))
    return max(amps)


def worst_stall(build: Build, brushed_only: bool = False) -> Stall | None:
    """The largest per-motor stall current from the shared stall loop, or None if unknown."""
    loop = _stall_loop(build)
    if loop is None:
        return None
    names = {m.name for m in build.motors if not brushed_only or m.type is MotorType.BRUSHED}
    if not names:
        return None
    name = max(names, key=lambda n: (loop.branch_current[n], n))
    return Stall(loop.branch_current[name], name)


def stall_missing(build: Build) -> tuple[str, ...]:
    """The build fields the stall current needs that are absent."""
    missing = [] if build.battery is not None else ["battery"]
    if not build.motors:
        missing.append("motors")
    missing += [
        f"motors[{i}].winding_resistance"
        for i, motor in enumerate(build.motors)
        if motor.winding_resistance is None
    ]
    return tuple(missing)


def controller_missing(build: Build, fields: tuple[str, ...]) -> list[str]:
    """``controller.<field>`` for each of ``fields`` the build leaves absent."""
    controller = build.controller
    return [
        f"controller.{name}"
        for name in fields
        if controller is None or getattr(controller, name) is None
    ]


def number(limit: Limit) -> float:
    """A profile limit that must be a plain number (a factor, a tolerance)."""
    if isinstance(limit.value, bool | str):
        raise TypeError(f"profile limit {limit.key} must be a number")
    if isinstance(limit.value, float | int):
        return float(limit.value)
    return float(limit.value.m_as("dimensionless"))


def magnitude(value: pint.Quantity, unit: pint.Unit) -> float:
    """Magnitude in ``unit``, skipping pint's conversion when the quantity is already in it
    (build fields arrive in fixed units, so this is the usual case)."""
    return in_unit(value, unit)


def ambient(build: Build, default: Limit) -> float:
    """The build's ambient temperature in degC, else the profile default (as
    ``figures.ambient_temperature``, without pint's conversion)."""
    given = build.usage.ambient_temperature
    return magnitude(given if given is not None else default.quantity, _DEGC)


def floor_tenth(value: float) -> float:
    """Round down to 0.1: a remedy ceiling must itself pass when re-checked."""
    return math.floor(value * 10.0 + 1e-9) / 10.0


def ceil_whole(value: float) -> int:
    """Round up to a whole unit: a remedy rating must itself pass when re-checked."""
    return math.ceil(value - 1e-9)


def floor_significant(value: float, digits: int = 2) -> float:
    """Round down to ``digits`` significant figures (a thermal resistance for a remedy)."""
    if value <= 0 or not math.isfinite(value):
        return value
    scale = 10.0 ** (digits - 1 - math.floor(math.log10(value)))
    return math.floor(value * scale + 1e-9) / scale
