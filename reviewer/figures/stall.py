"""The stall loop: every motor started at once against a locked wheel, on the full pack."""

from __future__ import annotations

from dataclasses import dataclass

from reviewer.build import Build
from reviewer.engineering.brushless import DriveCurrents, limited_currents
from reviewer.figures.currents import battery_limit, motor_limit
from reviewer.figures.pack import pack_resistance, pack_voltages
from reviewer.figures.wires import loop_wires, shared_wires, wire_resistance
from reviewer.units import in_unit


@dataclass(frozen=True)
class StallLoop:
    """The stall current of every motor at once, all started against a locked wheel."""

    voltage: float  # pack full voltage, V
    shared_resistance: float  # pack internal + battery-circuit wires, ohm
    branch_resistance: dict[str, float]  # per motor: winding + switch + its own wires, ohm
    branch_current: dict[str, float]  # per motor, A
    total_current: float  # through the shared path, A
    pack_resistance_known: bool


# Many rules ask for the stall loop of the same build in turn: keep the last one. Holding the
# build itself (not its id) makes the identity test sound; builds are frozen.
_last_stall_loop: tuple[Build, float, StallLoop | None] | None = None


def stall_loop(build: Build, temperature_c: float = 20.0) -> StallLoop | None:
    """V = I_total R_shared + I_k R_k for each motor k; None where an input is missing.

    With G = sum(1/R_k): I_total = V G / (1 + R_shared G). Cold (20 degC) resistances give the
    highest current, which is what wires and fuses must survive.
    """
    global _last_stall_loop
    memo = _last_stall_loop
    if memo is not None and memo[0] is build and memo[1] == temperature_c:
        return memo[2]
    loop = _solve_stall_loop(build, temperature_c)
    _last_stall_loop = (build, temperature_c, loop)
    return loop


def _solve_stall_loop(build: Build, temperature_c: float) -> StallLoop | None:
    if build.battery is None or not build.motors:
        return None
    if any(m.winding_resistance is None for m in build.motors):
        return None
    voltage = pack_voltages(build.battery).full
    internal = pack_resistance(build.battery)
    shared = (internal or 0.0) + sum(wire_resistance(w, temperature_c) for w in shared_wires(build))
    switch = 0.0
    if build.controller is not None and build.controller.switch_on_resistance is not None:
        switch = in_unit(build.controller.switch_on_resistance, "ohm")
    branches: dict[str, float] = {}
    for motor in build.motors:
        assert motor.winding_resistance is not None
        path = loop_wires(build, motor, temperature_c)
        branches[motor.name] = (
            in_unit(motor.winding_resistance, "ohm")
            + switch
            + sum(wire_resistance(w, temperature_c) for w in path)
        )
    conductance = sum(1 / r for r in branches.values())
    total = voltage * conductance / (1 + shared * conductance)
    across = voltage - total * shared
    currents = {name: across / r for name, r in branches.items()}
    return StallLoop(voltage, shared, branches, currents, total, internal is not None)


def current_limit(build: Build, bound: str = "high") -> float | None:
    """The per-motor motor current limit in DC-equivalent A (``high`` or ``low`` reading, see
    :mod:`reviewer.figures.currents`), or None where the build states no motor limit."""
    limits = [motor_limit(build, motor) for motor in build.motors] or [None]
    values = [getattr(limit, bound) for limit in limits if limit is not None]
    if not values:
        return None
    return max(values) if bound == "high" else min(values)


def stall_point(build: Build, motor_name: str, temperature_c: float = 20.0) -> DriveCurrents | None:
    """The locked rotor of one motor with both limits acting (after their response): its
    DC-equivalent motor current and its battery current, on the full pack through its branch
    and the shared path (cold resistances: the highest current)."""
    loop = stall_loop(build, temperature_c)
    if loop is None:
        return None
    motor = next(m for m in build.motors if m.name == motor_name)
    limit = motor_limit(build, motor)
    resistance = loop.branch_resistance[motor_name] + loop.shared_resistance
    return limited_currents(
        0.0, loop.voltage, resistance, None if limit is None else limit.high, battery_limit(build)
    )


def ambient_temperature(build: Build, default_c: float) -> float:
    if build.usage.ambient_temperature is not None:
        return in_unit(build.usage.ambient_temperature, "degC")
    return default_c


def stall_currents(
    voltage: float, shared_resistance: float, branch_resistance: dict[str, float]
) -> tuple[float, dict[str, float]]:
    """The stall_loop equations on what-if resistances (a heavier wire tried in a remedy):
    returns the total current and each motor's, in A."""
    conductance = sum(1 / r for r in branch_resistance.values())
    total = voltage * conductance / (1 + shared_resistance * conductance)
    across = voltage - total * shared_resistance
    return total, {name: across / r for name, r in branch_resistance.items()}
