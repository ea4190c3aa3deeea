"""Figures several rules share, computed from a validated build in SI floats.

This is the one place that knows how the build's parts connect: which wires carry which
motor's current, what the stall loop consists of, what the pack's voltages are. Rules call
these instead of re-deriving them, so two rules never disagree about the same current.
"""

from __future__ import annotations

from dataclasses import dataclass

from reviewer.build import Battery, Build, Circuit, Motor, Wire
from reviewer.engineering.cells import CELL_VOLTAGES, CellVoltages
from reviewer.engineering.conductors import conductor_resistance
from reviewer.units import unit


@dataclass(frozen=True)
class PackVoltages:
    nominal: float
    full: float
    cutoff: float


def cell_voltages(battery: Battery) -> CellVoltages:
    return CELL_VOLTAGES[battery.chemistry.value]


def pack_voltages(battery: Battery) -> PackVoltages:
    cell = cell_voltages(battery)
    n = battery.cells_series
    return PackVoltages(cell.nominal * n, cell.full * n, cell.cutoff * n)


def pack_resistance(battery: Battery) -> float | None:
    """Internal resistance of the whole pack in ohm, if the builder gave the cells'."""
    if battery.cell_internal_resistance is None:
        return None
    cell = battery.cell_internal_resistance.m_as("ohm")
    return cell * battery.cells_series / battery.cells_parallel


def wire_resistance(wire: Wire, temperature_c: float = 20.0) -> float:
    return conductor_resistance(wire.area.m_as(unit("mm**2")), wire.length.m_as("m"), temperature_c)


def motor_of(build: Build, wire: Wire) -> Motor | None:
    """The motor a motor-circuit wire feeds (the only motor, when there is one)."""
    if wire.circuit is not Circuit.MOTOR:
        return None
    if wire.motor is not None:
        return next(m for m in build.motors if m.name == wire.motor)
    return build.motors[0] if len(build.motors) == 1 else None


def shared_wires(build: Build) -> list[Wire]:
    """Battery-circuit wires: every motor's current flows through them."""
    return [w for w in build.wires if w.circuit is Circuit.BATTERY]


def branch_wires(build: Build, motor: Motor) -> list[Wire]:
    return [w for w in build.wires if motor_of(build, w) is motor]


@dataclass(frozen=True)
class StallLoop:
    """The stall current of every motor at once, all started against a locked wheel."""

    voltage: float  # pack full voltage, V
    shared_resistance: float  # pack internal + battery-circuit wires, ohm
    branch_resistance: dict[str, float]  # per motor: winding + switch + its own wires, ohm
    branch_current: dict[str, float]  # per motor, A
    total_current: float  # through the shared path, A
    pack_resistance_known: bool


def stall_loop(build: Build, temperature_c: float = 20.0) -> StallLoop | None:
    """V = I_total R_shared + I_k R_k for each motor k; None where an input is missing.

    With G = sum(1/R_k): I_total = V G / (1 + R_shared G). Cold (20 degC) resistances give the
    highest current, which is what wires and fuses must survive.
    """
    if build.battery is None or not build.motors:
        return None
    if any(m.winding_resistance is None for m in build.motors):
        return None
    voltage = pack_voltages(build.battery).full
    internal = pack_resistance(build.battery)
    shared = (internal or 0.0) + sum(wire_resistance(w, temperature_c) for w in shared_wires(build))
    switch = 0.0
    if build.controller is not None and build.controller.switch_on_resistance is not None:
        switch = build.controller.switch_on_resistance.m_as("ohm")
    branches: dict[str, float] = {}
    for motor in build.motors:
        assert motor.winding_resistance is not None
        branches[motor.name] = (
            motor.winding_resistance.m_as("ohm")
            + switch
            + sum(wire_resistance(w, temperature_c) for w in branch_wires(build, motor))
        )
    conductance = sum(1 / r for r in branches.values())
    total = voltage * conductance / (1 + shared * conductance)
    across = voltage - total * shared
    currents = {name: across / r for name, r in branches.items()}
    return StallLoop(voltage, shared, branches, currents, total, internal is not None)


def current_limit(build: Build) -> float | None:
    """The controller's per-motor current limit in A, or None where nothing limits current."""
    if build.controller is None or build.controller.current_limit is None:
        return None
    return build.controller.current_limit.m_as("A")


def ambient_temperature(build: Build, default_c: float) -> float:
    if build.usage.ambient_temperature is not None:
        return build.usage.ambient_temperature.m_as("degC")
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
