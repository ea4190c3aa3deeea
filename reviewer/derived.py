"""Figures several rules share, computed from a validated build in SI floats.

This is the one place that knows how the build's parts connect: which wires carry which
motor's current, what the stall loop consists of, what the pack's voltages are. Rules call
these instead of re-deriving them, so two rules never disagree about the same current.
"""

from __future__ import annotations

from dataclasses import dataclass

from reviewer.build import Battery, Build, Circuit, Motor, Wire
from reviewer.engineering.cells import CELL_VOLTAGES, CellVoltages
from reviewer.engineering.conductors import (
    Ampacity,
    awg_for_area,
    conductor_resistance,
    datasheet_ampacity,
    tabulated_ampacity,
    thin_wire_ampacity_bound,
)
from reviewer.engineering.roadload import Drive, DriveMotor
from reviewer.findings import Assumption, Source
from reviewer.profile import Profile
from reviewer.units import in_unit, unit

__all__ = ["in_unit"]  # re-exported: rules read build fields through it


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
    cell = in_unit(battery.cell_internal_resistance, "ohm")
    return cell * battery.cells_series / battery.cells_parallel


def wire_resistance(wire: Wire, temperature_c: float = 20.0) -> float:
    return conductor_resistance(wire_area_mm2(wire), in_unit(wire.length, "m"), temperature_c)


def wire_area_mm2(wire: Wire) -> float:
    if wire.cross_section is not None:
        return in_unit(wire.cross_section, "mm**2")
    assert wire.gauge is not None  # the build model requires one of the two
    return wire.gauge.area_mm2


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


#: Where the stall current V / R_loop comes from; every rule that quotes it cites this.
STALL_SOURCE = Source.from_memory(
    "Chapman, Electric Machinery Fundamentals: stall current V / R_loop"
)


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
        branches[motor.name] = (
            in_unit(motor.winding_resistance, "ohm")
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
    return in_unit(build.controller.current_limit, "A")


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


# --- The drive model: motors, gearing and vehicle, shared by speed, braking and hill rules -----


def motor_kv(motor: Motor) -> float | None:
    """Kv in rpm/V: given, or no-load speed over rated voltage (as ``Motor.effective_kv``, in
    floats: pint division is slow)."""
    if motor.kv is not None:
        return in_unit(motor.kv, unit("rpm/V"))
    if motor.no_load_speed is not None and motor.rated_voltage is not None:
        return in_unit(motor.no_load_speed, unit("rpm")) / in_unit(motor.rated_voltage, unit("V"))
    return None


def drive_model_missing(build: Build) -> tuple[str, ...]:
    """The build fields the drive model needs and the build lacks, as field paths."""
    missing: list[str] = []
    if build.vehicle.mass is None:
        missing.append("vehicle.mass")
    if build.battery is None:
        missing.append("battery")
    if not build.motors:
        missing.append("motors")
    for index, motor in enumerate(build.motors):
        if motor_kv(motor) is None:
            missing.append(f"motors[{index}].kv")
        if motor.winding_resistance is None:
            missing.append(f"motors[{index}].winding_resistance")
    drivetrain = build.drivetrain
    if drivetrain is None or drivetrain.reduction is None:
        missing.append("drivetrain.ratio")
    if drivetrain is None or drivetrain.wheel_diameter is None:
        missing.append("drivetrain.wheel_diameter")
    return tuple(missing)


def drive_model(
    build: Build, profile: Profile
) -> tuple[Drive | None, list[Assumption], tuple[str, ...]]:
    """The build's motors, gearing and vehicle as one ``Drive`` (SI floats), the assumptions
    made for inputs the build leaves out, and the missing fields (the drive is None then).

    Each motor is a torque-speed line on the full pack (cold stall loop: winding, switch, its
    own wires, plus the shared pack and battery wiring), at ``controller.max_duty`` (100 % if
    unset) and the per-motor ``controller.current_limit``. Defaults, each noted: no-load current
    0 A, drivetrain efficiency 100 % (both on the fast side), Crr and CdA from the profile's
    ``usage.default_rolling_resistance`` and ``usage.default_drag_area``.
    """
    missing = drive_model_missing(build)
    if missing:
        return None, [], missing
    assert build.battery is not None and build.drivetrain is not None
    assert build.vehicle.mass is not None and build.drivetrain.wheel_diameter is not None
    assert build.drivetrain.reduction is not None
    loop = stall_loop(build)
    assert loop is not None
    notes: list[Assumption] = []
    motors = []
    for motor in build.motors:
        kv = motor_kv(motor)
        assert kv is not None
        no_load = 0.0
        if motor.no_load_current is None:
            notes.append(
                Assumption(
                    f"Motor '{motor.name}': no-load current not given, taken as 0 A "
                    "(no friction), which errs on the fast side."
                )
            )
        else:
            no_load = in_unit(motor.no_load_current, unit("A"))
        motors.append(DriveMotor(kv, loop.branch_resistance[motor.name], no_load))
    usage = build.usage
    if usage.rolling_resistance is not None:
        crr = usage.rolling_resistance
    else:
        limit = profile.limit("usage.default_rolling_resistance")
        crr = float(limit.value)  # type: ignore[arg-type]
        notes.append(Assumption(f"Rolling resistance not given: Crr {crr:g} taken.", limit.source))
    if usage.drag_area is not None:
        drag_area = in_unit(usage.drag_area, unit("m**2"))
    else:
        limit = profile.limit("usage.default_drag_area")
        drag_area = in_unit(limit.quantity, unit("m**2"))
        notes.append(Assumption(f"Drag area not given: CdA {drag_area:g} m² taken.", limit.source))
    efficiency = 1.0
    if build.drivetrain.efficiency is not None:
        efficiency = in_unit(build.drivetrain.efficiency, unit("percent")) / 100.0
    else:
        notes.append(
            Assumption("Drivetrain efficiency not given: 100 % taken, which errs on the fast side.")
        )
    duty = 1.0
    if build.controller is not None and build.controller.max_duty is not None:
        duty = in_unit(build.controller.max_duty, unit("percent")) / 100.0
    drive = Drive(
        motors=tuple(motors),
        full_voltage=loop.voltage,
        reduction=build.drivetrain.reduction,
        wheel_radius=in_unit(build.drivetrain.wheel_diameter, unit("mm")) / 2000.0,
        rolling_resistance=crr,
        drag_area=drag_area,
        shared_resistance=loop.shared_resistance,
        duty=duty,
        current_limit=current_limit(build),
        efficiency=efficiency,
    )
    return drive, notes, ()


# --- Wire ampacity and the pack's small loads, shared by the battery and protection rules -----


def wire_awg(wire: Wire) -> int:
    """The AWG row a wire is looked up by: its gauge, or for a metric wire the heaviest AWG size
    not above its area (rounding down is conservative)."""
    if wire.cross_section is not None:
        return awg_for_area(in_unit(wire.cross_section, "mm**2"))
    assert wire.gauge is not None  # the build model requires one of the two
    return wire.gauge.awg


def wire_ampacity(wire: Wire, ambient_c: float) -> Ampacity | None:
    """A wire's continuous ampacity on the basis wiring.stall-current rates it by: its datasheet
    ``rated_ampacity`` (read as for 30 degC air) if given, else the higher of NEC Table 310.16 and
    FAA AC 43.13-1B Table 11-9 in the column at or below its rating; corrected for ambient and
    for its bundle. None without ``temperature_rating`` or for a size outside both tables."""
    if wire.temperature_rating is None:
        return None
    rating_c = in_unit(wire.temperature_rating, "degC")
    loaded = wire.bundled_with + 1
    if wire.rated_ampacity is not None:
        rated = in_unit(wire.rated_ampacity, "A")
        return datasheet_ampacity(rated, rating_c, ambient_c, loaded)
    return tabulated_ampacity(wire_awg(wire), rating_c, ambient_c, loaded)


@dataclass(frozen=True)
class AuxiliaryLoad:
    """Current the pack feeds besides the motors: the logic board (through a regulator fed from
    the pack) and the brake relay's coil, in A; and the fields of parts present whose current
    the build does not give."""

    current: float
    parts: tuple[str, ...]  # "logic board 0.12 A", for rationales
    missing: tuple[str, ...]


def auxiliary_current(build: Build) -> AuxiliaryLoad:
    """Logic board current (counted at the pack as drawn: a linear regulator passes its output
    current through, a switching one draws less, so this errs high) and brake relay coil."""
    current, parts, missing = 0.0, [], []
    logic = build.logic
    if logic is not None and (logic.regulator is None or logic.regulator.fed_from_pack):
        if logic.board_current is None:
            missing.append("logic.board_current")
        else:
            amps = in_unit(logic.board_current, "mA") / 1000
            current += amps
            parts.append(f"logic board {amps:.3g} A")
    brake = build.brake
    if brake is not None and any(
        value is not None
        for value in (brake.relay_contact_rating, brake.relay_contact_voltage, brake.coil_current)
    ):
        if brake.coil_current is None:
            missing.append("brake.coil_current")
        else:
            amps = in_unit(brake.coil_current, "mA") / 1000
            current += amps
            parts.append(f"brake relay coil {amps:.3g} A")
    return AuxiliaryLoad(current, tuple(parts), tuple(missing))


def wire_ampacity_bound(wire: Wire, ambient_c: float) -> Ampacity | None:
    """For a wire thinner than every size the ampacity tables rate, the upper bound on its
    ampacity that wiring.stall-current uses too: the smallest size tabulated, in the column at
    or below its rating, with the same corrections. None for a wire the tables rate or whose
    datasheet ``rated_ampacity`` is given (``wire_ampacity`` has its figure), without
    ``temperature_rating``, or where no table has a column at or below its rating."""
    if wire.temperature_rating is None or wire.rated_ampacity is not None:
        return None
    rating_c = in_unit(wire.temperature_rating, "degC")
    return thin_wire_ampacity_bound(wire_awg(wire), rating_c, ambient_c, wire.bundled_with + 1)
