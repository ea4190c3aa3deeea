"""Which wires carry which motor's current, and their resistance and ampacity."""

from __future__ import annotations

from reviewer.build import Build, Circuit, Motor, Wire
from reviewer.engineering.conductors import (
    Ampacity,
    awg_for_area,
    conductor_resistance,
    datasheet_ampacity,
    tabulated_ampacity,
    thin_wire_ampacity_bound,
)
from reviewer.units import in_unit


def wire_resistance(wire: Wire, temperature_c: float = 20.0) -> float:
    return conductor_resistance(wire_area_mm2(wire), in_unit(wire.length, "m"), temperature_c)


def wire_area_mm2(wire: Wire) -> float:
    if wire.cross_section is not None:
        return in_unit(wire.cross_section, "mm**2")
    assert wire.gauge is not None  # the build model requires one of the two
    return wire.gauge.area_mm2


#: A locked three-phase motor carries its current line to line: through two of its phase leads.
PHASES_IN_SERIES = 2


def motor_of(build: Build, wire: Wire) -> Motor | None:
    """The motor a motor-circuit or phase wire feeds (the only motor, when there is one)."""
    if wire.circuit not in (Circuit.MOTOR, Circuit.PHASE):
        return None
    if wire.motor is not None:
        return next(m for m in build.motors if m.name == wire.motor)
    return build.motors[0] if len(build.motors) == 1 else None


def shared_wires(build: Build) -> list[Wire]:
    """Battery-circuit wires: every motor's current flows through them."""
    return [w for w in build.wires if w.circuit is Circuit.BATTERY]


def branch_wires(build: Build, motor: Motor) -> list[Wire]:
    """Every wire between the controller and ``motor``: motor-circuit and phase leads."""
    return [w for w in build.wires if motor_of(build, w) is motor]


def loop_wires(build: Build, motor: Motor, temperature_c: float = 20.0) -> list[Wire]:
    """The wires a locked ``motor``'s current flows through after the controller: every
    motor-circuit wire (feed and return are listed), and of its phase leads the two of least
    resistance, since the current flows line to line through two of them and the lower pair
    gives the higher stall current (the conservative choice for wires and fuses)."""
    own = branch_wires(build, motor)
    phases = sorted(
        (w for w in own if w.circuit is Circuit.PHASE),
        key=lambda w: wire_resistance(w, temperature_c),
    )
    return [w for w in own if w.circuit is Circuit.MOTOR] + phases[:PHASES_IN_SERIES]


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
