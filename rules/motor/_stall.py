"""motor.cooling, part three: what ends a locked rotor, and so which case sets the severity: a
winding temperature sensor with cut-back, the controller's stall cut-off, or nothing at all.
"""

from __future__ import annotations

import math
from collections.abc import Generator

import pint
from firstride_rules._shared.time_constant import winding_time_constant

from reviewer import units as u
from reviewer.build import Build, Motor
from reviewer.engineering.ride_thermal import ConstantCooling, Winding, winding_step
from reviewer.engineering.thermal import ThermalClass
from reviewer.findings import Assumption, Severity
from reviewer.profile import Profile
from reviewer.rule import Output

_DEGC = u.unit("degC")
_TOLERANCE_K = 1e-6


def stall_protection(
    build: Build,
    motor: Motor,
    thermal: tuple[float, float, float, float],
    grade: ThermalClass,
    current: float,
    severity: Severity,
    profile: Profile,
) -> Generator[Output, None, tuple[Severity, str, tuple[object, pint.Quantity] | None]]:
    """What ends a locked rotor: a winding temperature sensor with cut-back, the controller's
    stall cut-off, or nothing (held for ever in still air); the severity that case sets and a
    sentence saying which case it was. With a cut-off the stall is judged from a winding already
    at its rise limit (after a climb), at the cold stall current, for the cut-off time, against
    the class temperature."""
    r20, r_th, factor, ambient = thermal
    if motor.temperature_sensor:
        yield Assumption(
            f"Motor '{motor.name}': its temperature sensor is taken to cut the current back at or "
            f"below {u.format_number(grade.rise_limit_temperature)} °C (its trip point is not "
            "given)."
        )
        return (
            Severity.PASS,
            "Case judged: the winding temperature sensor cuts current back before the limit, "
            "so the locked rotor is not held for ever.",
            ("cut back by its sensor", u.quantity(grade.rise_limit_temperature, _DEGC)),
        )
    controller = build.controller
    cutoff = controller.stall_cutoff_time if controller is not None else None
    if cutoff is None:
        return (
            severity,
            "Case judged: no stall cut-off (controller.stall_cutoff_time) and no temperature "
            "cut-back (motors[].temperature_sensor), so the locked rotor is held for ever in "
            "still air.",
            None,
        )
    seconds = u.in_unit(cutoff, "s")
    tau, note = winding_time_constant(motor, r_th, profile)
    if note is not None:
        yield note
    winding = Winding(r20, r_th, tau, ambient, cooling=ConstantCooling(factor))
    start = grade.rise_limit_temperature
    end = winding_step(start, current, seconds, winding, 0.0, allow_runaway=True)
    f = u.format_number
    over = not math.isfinite(end) or end > grade.class_temperature + _TOLERANCE_K
    text = (
        f"Case judged: the controller cuts a stall after {f(seconds)} s; from the "
        f"{f(start)} °C rise limit the {f(current)} A stall takes the winding to "
        f"{f(end)} °C in that time (time constant {f(tau / 60)} min), against class "
        f"{grade.letter}'s {f(grade.class_temperature)} °C."
    )
    shown = u.quantity(end, _DEGC) if math.isfinite(end) else None
    return (
        Severity.STOP if over else Severity.PASS,
        text,
        (shown, u.quantity(grade.class_temperature, _DEGC)),
    )
