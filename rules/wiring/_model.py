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
from reviewer.engineering.brushless import current_for_battery_limit
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
    phase: bool = False  # a phase lead of a brushless motor (two of them carry a stall)


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
    motor_limits: dict[str, float]  # per motor: the motor limit, DC-equivalent A (high)
    battery_limits: dict[str, float]  # per motor: what it draws from the pack at most, A
    phase_factor: dict[str, float]  # per motor: peak phase current over DC-equivalent current
    response: figures.LimitResponse
    held_by: dict[str, str] = field(default_factory=dict)  # which limit holds a locked motor
    fuses: list[WireFuse] = field(default_factory=list)
    assumptions: dict[str, Assumption] = field(default_factory=dict)
    _wire_index: (
        tuple[list[Conductor], dict[int, Conductor], dict[str, list[tuple[int, float]]]] | None
    ) = field(default=None, repr=False, compare=False)

    @cached_property
    def assumed_clearing(self) -> tuple[float, Source]:
        limit = self.profile.limit("wiring.assumed_clearing_time")
        return in_unit(limit.quantity, "s"), limit.source

    @cached_property
    def clearing_multiple(self) -> float:
        return float(self.profile.limit("wiring.assumed_clearing_multiple").value)

    def fuses_on(self, wire: Conductor) -> list[WireFuse]:
        return [fuse for fuse in self.fuses if fuse.covers(wire)]

    def fuse_caps(self, wire: Conductor) -> list[tuple[float, str]]:
        """What each fuse on this wire lets it carry for long, and why. A fuse passes its
        rating indefinitely (IEC 60364-4-43 433.1): that caps a battery wire, or a motor or
        phase lead the fuse is itself on. A fuse on the pack side of a PWM drive caps only
        the pack's current: below full duty the motor carries more than the pack supplies,
        and at a stall I_b V = I_m^2 R (brief 11, energy balance), so the lead's cap is the
        motor current whose draw is the fuse's rating (x the peak phase factor for a phase
        lead)."""
        caps = []
        for fuse in self.fuses_on(wire):
            if wire.motor is None or not fuse.whole_pack:
                why = f"the rating of fuse '{fuse.name}', the most it lets through for long"
                caps.append((fuse.rating, why))
                continue
            resistance = self.loop.branch_resistance[wire.motor] + self.loop.shared_resistance
            drawn = current_for_battery_limit(0.0, resistance, self.loop.voltage, fuse.rating)
            factor = self.phase_factor[wire.motor] if wire.phase else 1.0
            why = (
                f"the motor current whose draw from the pack at a stall is the {fuse.rating:g} A "
                f"rating of fuse '{fuse.name}' (I_b V = I_m² R: a PWM drive below full duty "
                "carries more in the motor than it draws)"
            )
            caps.append((drawn * factor, why))
        return caps

    @property
    def limited(self) -> bool:
        return bool(self.motor_limits or self.battery_limits)

    def currents(
        self, changed: dict[int, float], wires: list[Conductor]
    ) -> tuple[float, dict[str, float]]:
        """Stall currents (total, per motor) with some wires at new 20 degC resistances. Of a
        motor's phase leads the two of least resistance carry the stall, chosen again after
        the change (``figures.loop_wires``). Only the changed wires are visited, in their
        order in the build, and the phase leads of the motors they belong to: one call costs
        the same with five wires as with five hundred."""
        shared = self.loop.shared_resistance
        branches = dict(self.loop.branch_resistance)
        by_index, leads = self._indexed(wires)
        touched: dict[str, None] = {}
        for index in sorted(changed):
            wire = by_index.get(index)
            if wire is None:
                continue
            now = changed[index]
            if wire.phase and wire.motor is not None:
                touched[wire.motor] = None
            elif wire.motor is None:
                shared += now - wire.r20
            else:
                branches[wire.motor] += now - wire.r20
        pair = figures.PHASES_IN_SERIES
        for motor in touched:
            before = [r20 for _, r20 in leads[motor]]
            after = [changed.get(i, r20) for i, r20 in leads[motor]]
            branches[motor] += sum(sorted(after)[:pair]) - sum(sorted(before)[:pair])
        return figures.stall_currents(self.loop.voltage, shared, branches)

    def _indexed(
        self, wires: list[Conductor]
    ) -> tuple[dict[int, Conductor], dict[str, list[tuple[int, float]]]]:
        """The wires by index, and each motor's phase leads (index, R20) in build order; kept
        for the list last asked about (held, so its identity cannot be reused)."""
        if self._wire_index is None or self._wire_index[0] is not wires:
            leads: dict[str, list[tuple[int, float]]] = {}
            for wire in wires:
                if wire.phase and wire.motor is not None:
                    leads.setdefault(wire.motor, []).append((wire.index, wire.r20))
            self._wire_index = (wires, {w.index: w for w in wires}, leads)
        return self._wire_index[1], self._wire_index[2]

    def limit_for(self, wire: Conductor, motor: str) -> float | None:
        """The limit that holds ``motor``'s share of this wire's current: the battery-side
        figure for a battery wire, the motor limit for a motor or phase lead."""
        limits = self.battery_limits if wire.motor is None else self.motor_limits
        return limits.get(motor)

    def design(self, per_motor: dict[str, float], wire: Conductor) -> dict[str, float]:
        """Per motor the current this wire carries for long while the limits hold: the limit
        where it sits below the stall current, else the stall current."""
        design = {}
        for name, current in per_motor.items():
            limit = self.limit_for(wire, name)
            design[name] = current if limit is None else min(limit, current)
        return design

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
    if wire.circuit in (Circuit.MOTOR, Circuit.PHASE):
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
        wire.circuit is Circuit.PHASE,
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
    """Every battery, motor and phase wire, indexed by its place in ``build.wires``."""
    return [
        conductor_from(build, i, w)
        for i, w in enumerate(build.wires)
        if w.circuit in POWER_CIRCUITS
    ]


POWER_CIRCUITS = (Circuit.BATTERY, Circuit.MOTOR, Circuit.PHASE)


def limits_of(
    build: Build,
) -> tuple[dict[str, float], dict[str, float], dict[str, float], dict[str, str]]:
    """Per motor: the motor current the limits hold a locked rotor at (DC-equivalent; both
    limits together, ``figures.stall_point``: the motor limit at its highest reading, or the
    current whose draw from the pack is the battery limit, I_b V = I_m^2 R, where lower; absent
    where neither holds it below the stall current), what it draws from the pack at most while
    the limits hold, and its peak phase current per amp of DC-equivalent current (1 for
    brushed and six-step drive), and which limit holds each locked motor."""
    motor_limits, battery_limits, factors, held_by = {}, {}, {}, {}
    for motor in build.motors:
        point = figures.stall_point(build, motor.name)
        if point is not None and point.limited_by != "pack voltage":
            motor_limits[motor.name] = point.motor_current
            held_by[motor.name] = point.limited_by
        design = figures.battery_design_current(build, motor)
        if design is not None:
            battery_limits[motor.name] = design.amps
        factors[motor.name] = figures.phase_conductor_current(build, motor, 1.0)
    return motor_limits, battery_limits, factors, held_by
