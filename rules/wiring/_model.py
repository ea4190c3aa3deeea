"""wiring.stall-current, part one: the build's power wiring and protection in SI floats.

The rule reads each battery and motor wire, each fuse and the stall loop once, here, so the
judging (``_wiring_calc``) never touches a pint quantity; only the findings' own figures are
built as quantities again (``_wiring_findings``). ``wiring`` holds the rule and its check.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property

from reviewer import figures
from reviewer.build import Build, Circuit, Fuse, Wire
from reviewer.engineering.conductors import (
    awg_for_area,
    conductor_resistance,
)
from reviewer.findings import Assumption, Source
from reviewer.profile import Profile
from reviewer.units import in_unit

BATTERY_POSITIVE = "battery-positive"  # a fuse here is in series with every power wire


@dataclass(frozen=True)
class Conductor:
    """One battery or motor wire in floats; ``motor`` is None for a shared battery wire."""

    index: int
    name: str
    motor: str | None
    area: float  # mm^2
    awg: int  # the AWG row its size is looked up by
    length: float  # m
    r20: float  # ohm at 20 degC
    insulation: str | None
    rating: float | None  # degC
    loaded: int  # loaded conductors in its bundle, itself included
    datasheet: float | None  # A


@dataclass(frozen=True)
class WireFuse:
    """A fuse in floats. One at the battery positive, or on a battery wire, carries every
    motor's current; one on motor wires only, the current of those motors."""

    name: str
    rating: float  # A
    clearing: float | None  # s, at the stall current
    protects: frozenset[str]
    at_pack: bool  # at the battery positive: in series with every power wire
    whole_pack: bool
    motors: frozenset[str]

    def covers(self, wire: Conductor) -> bool:
        return self.at_pack or wire.name in self.protects

    def current(self, total: float, per_motor: dict[str, float]) -> float:
        if self.whole_pack:
            return total
        return max((per_motor[m] for m in self.motors), default=0.0)


@dataclass
class StallContext:
    """The build's stall loop and protection in floats, and the assumptions made on the way."""

    profile: Profile
    loop: figures.StallLoop
    nominal: float
    ambient: float
    limit: float | None
    limit_response: float | None
    fuses: list[WireFuse] = field(default_factory=list)
    assumptions: dict[str, Assumption] = field(default_factory=dict)

    @cached_property
    def assumed_clearing(self) -> tuple[float, Source]:
        limit = self.profile.limit("wiring.assumed_clearing_time")
        return in_unit(limit.quantity, "s"), limit.source

    @cached_property
    def clearing_multiple(self) -> float:
        return float(self.profile.limit("wiring.assumed_clearing_multiple").value)

    def fuses_on(self, wire: Conductor) -> list[WireFuse]:
        return [fuse for fuse in self.fuses if fuse.covers(wire)]

    def currents(
        self, changed: dict[int, float], wires: list[Conductor]
    ) -> tuple[float, dict[str, float]]:
        """Stall currents (total, per motor) with some wires at new 20 degC resistances."""
        shared = self.loop.shared_resistance
        branches = dict(self.loop.branch_resistance)
        for wire in wires:
            if wire.index in changed:
                delta = changed[wire.index] - wire.r20
                if wire.motor is None:
                    shared += delta
                else:
                    branches[wire.motor] += delta
        return figures.stall_currents(self.loop.voltage, shared, branches)

    def design(self, per_motor: dict[str, float]) -> dict[str, float]:
        if self.limit is None:
            return per_motor
        return {name: min(self.limit, current) for name, current in per_motor.items()}

    def note(self, text: str, source: Source | None) -> None:
        self.assumptions.setdefault(text, Assumption(text, source))


def conductor_from(build: Build, index: int, wire: Wire) -> Conductor:
    """A wire in floats: a metric size is read as the heaviest AWG row not above it."""
    if wire.cross_section is not None:
        area = in_unit(wire.cross_section, "mm**2")
        awg = awg_for_area(area)
    else:
        assert wire.gauge is not None  # the build model requires one of the two
        awg, area = wire.gauge.awg, wire.gauge.area_mm2
    motor = None
    if wire.circuit is Circuit.MOTOR:
        fed = figures.motor_of(build, wire)
        assert fed is not None  # the build model requires a motor name when there are several
        motor = fed.name
    length = in_unit(wire.length, "m")
    rating = wire.temperature_rating
    rated = wire.rated_ampacity
    return Conductor(
        index,
        wire.name,
        motor,
        area,
        awg,
        length,
        conductor_resistance(area, length),
        wire.insulation.value if wire.insulation is not None else None,
        in_unit(rating, "degC") if rating is not None else None,
        wire.bundled_with + 1,
        in_unit(rated, "A") if rated is not None else None,
    )


def fuse_from(fuse: Fuse, wires: list[Conductor]) -> WireFuse:
    protected = [w for w in wires if w.name in fuse.protects]
    return WireFuse(
        fuse.name,
        in_unit(fuse.rating, "A"),
        in_unit(fuse.clearing_time, "s") if fuse.clearing_time is not None else None,
        frozenset(fuse.protects),
        fuse.location == BATTERY_POSITIVE,
        fuse.location == BATTERY_POSITIVE or any(w.motor is None for w in protected),
        frozenset(w.motor for w in protected if w.motor is not None),
    )


def power_wires(build: Build) -> list[Conductor]:
    """Every battery and motor wire, indexed by its place in ``build.wires``."""
    return [
        conductor_from(build, i, w)
        for i, w in enumerate(build.wires)
        if w.circuit in (Circuit.BATTERY, Circuit.MOTOR)
    ]
