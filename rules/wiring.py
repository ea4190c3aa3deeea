"""wiring.stall-current: every battery and motor wire against the current a stalled motor drives.

A locked wheel (a kerb, a foot, a jammed belt) turns the motor into a resistor across the full
pack. Its wires carry that stall current until something interrupts it, or for ever if nothing
does, and then the controller's limit for the rest of the ride.
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass, field
from functools import cached_property

from reviewer import derived
from reviewer.build import Build, Circuit, Fuse, Wire
from reviewer.engineering.conductors import (
    ADIABATIC_LIMIT_S,
    INSULATION_TEMPERATURES,
    Ampacity,
    adiabatic_k,
    awg_area,
    awg_for_area,
    awg_label,
    conductor_resistance,
    conductor_temperature,
    datasheet_ampacity,
    parse_awg,
    tabulated_ampacity,
    withstand_time,
)
from reviewer.findings import (
    Assumption,
    Comparison,
    DerivedFigure,
    Finding,
    Severity,
    Source,
    SourceStatus,
)
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import Quantity, format_number, ureg

ADIABATIC = Source(
    "IEC 60364-4-43 clause 434.5.2, IEC 60364-5-54 Annex A: a conductor withstands I for "
    "t <= k^2 S^2 / I^2 (up to 5 s); copper k by insulation"
)
GENERAL_K = Source(
    "IEC 60364-4-43 clause 434.5.2, general form for copper: "
    "k = 226 sqrt(ln(1 + (theta_f - theta_i)/(234.5 + theta_i)))"
)
PTFE_K = Source.from_memory("PTFE: general copper k from 200 °C to 300 °C (below its melt)")
STALL = Source.from_memory("Chapman, Electric Machinery Fundamentals: stall current V / R_loop")
NEC_TABLE = Source("NEC (NFPA 70) Table 310.16: copper, 30 °C ambient, up to 3 conductors")
FAA_TABLE = Source("FAA AC 43.13-1B Table 11-9: copper wire in bundles, 70 °C ambient")
DATASHEET = Source("the wire's datasheet ampacity, read as for 30 °C ambient", SourceStatus.USER)
AMBIENT = Source.from_memory(
    "NEC 310.15(B) ambient correction, as f = sqrt((T_rating - T_ambient)/(T_rating - T_table))"
)
BUNDLING = Source("NEC 310.15(C)(1): adjustment for more than three loaded conductors")
RUNNING = Source("FAA AC 43.13-1B para 11-66: T2 = T1 + (T_rating - T1)(I2/I_max)^2")
_TABLE_SOURCES = {
    "NEC Table 310.16": NEC_TABLE,
    "FAA AC 43.13-1B Table 11-9": FAA_TABLE,
    "wire datasheet": DATASHEET,
}
# Sizes a wire remedy may name: the ones a table rates, so the remedy itself is checked.
REMEDY_GAUGES = (18, 16, 14, 12, 10, 8)
DROP_GAUGES = (22, 20, 18, 16, 14, 12, 10, 8, 6, 4, 2, 0, -1, -2, -3)
BATTERY_POSITIVE = "battery-positive"  # a fuse here is in series with every power wire
# Unit objects parsed once: converting with a unit string re-parses it on every call.
_UNIT = {u: ureg.Unit(u) for u in ("", "A", "s", "m", "mm**2", "degC", "V", "W", "ohm", "percent")}


def _q(value: float, unit: str) -> Quantity:
    return Quantity(value, _UNIT[unit])


@dataclass(frozen=True)
class _Conductor:
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
class _Fuse:
    """A fuse in floats. One at the battery positive, or on a battery wire, carries every
    motor's current; one on motor wires only, the current of those motors."""

    name: str
    rating: float  # A
    clearing: float | None  # s, at the stall current
    protects: frozenset[str]
    at_pack: bool  # at the battery positive: in series with every power wire
    whole_pack: bool
    motors: frozenset[str]

    def covers(self, wire: _Conductor) -> bool:
        return self.at_pack or wire.name in self.protects

    def current(self, total: float, per_motor: dict[str, float]) -> float:
        if self.whole_pack:
            return total
        return max((per_motor[m] for m in self.motors), default=0.0)


@dataclass(frozen=True)
class _Acting:
    seconds: float
    who: str  # "fuse 'main'" or "the current limit"
    assumed: bool

    def __str__(self) -> str:
        assumed = " (assumed)" if self.assumed else ""
        return f"{self.who} acts after {format_number(self.seconds)} s{assumed}"


@dataclass
class _Loop:
    """The build's stall loop and protection in floats, and the assumptions made on the way."""

    profile: Profile
    loop: derived.StallLoop
    nominal: float
    ambient: float
    limit: float | None
    limit_response: float | None
    fuses: list[_Fuse] = field(default_factory=list)
    assumptions: dict[str, Assumption] = field(default_factory=dict)

    @cached_property
    def assumed_clearing(self) -> tuple[float, Source]:
        limit = self.profile.limit("wiring.assumed_clearing_time")
        return limit.quantity.m_as(_UNIT["s"]), limit.source

    @cached_property
    def clearing_multiple(self) -> float:
        return float(self.profile.limit("wiring.assumed_clearing_multiple").value)

    def fuses_on(self, wire: _Conductor) -> list[_Fuse]:
        return [fuse for fuse in self.fuses if fuse.covers(wire)]

    def currents(self, changed: dict[int, float], wires: list[_Conductor]):
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
        return derived.stall_currents(self.loop.voltage, shared, branches)

    def design(self, per_motor: dict[str, float]) -> dict[str, float]:
        if self.limit is None:
            return per_motor
        return {name: min(self.limit, current) for name, current in per_motor.items()}

    def note(self, text: str, source: Source | None) -> None:
        self.assumptions.setdefault(text, Assumption(text, source))


@dataclass(frozen=True)
class _Verdict:
    """One wire (or a candidate size for it) against its stall and design currents."""

    stall: float
    design: float
    design_because: str
    ampacity: Ampacity | None
    acting: _Acting | None  # None: the stall current is sustained
    sustained_because: str
    withstand: float  # seconds at the stall current
    k: float
    survives: bool | None
    carries: bool | None

    @property
    def passes(self) -> bool:
        return bool(self.survives and self.carries)


def _protection(
    ctx: _Loop,
    wire: _Conductor,
    currents: tuple[float, dict[str, float]],
    limited: bool,
    record: bool,
) -> tuple[_Acting | None, str]:
    """The earliest of a fuse on this wire rated below the stall current through it and the
    current limit; None (and why) when nothing interrupts the stall."""
    options: list[_Acting] = []
    slow: list[str] = []
    fuses = ctx.fuses_on(wire)
    for fuse in fuses:
        through = fuse.current(*currents)
        if fuse.rating >= through:
            continue
        if fuse.clearing is not None:
            options.append(_Acting(fuse.clearing, f"fuse '{fuse.name}'", False))
        elif through < ctx.clearing_multiple * fuse.rating:
            slow.append(f"'{fuse.name}'")
        else:
            seconds, source = ctx.assumed_clearing
            if record:
                text = (
                    f"Fuse '{fuse.name}' gives no clearing_time: taken to clear "
                    f"{format_number(ctx.clearing_multiple)} x its rating or more within "
                    f"{format_number(seconds)} s."
                )
                ctx.note(text, source)
            options.append(_Acting(seconds, f"fuse '{fuse.name}'", True))
    if limited and ctx.limit_response is not None:
        options.append(_Acting(ctx.limit_response, "the current limit", False))
    elif limited:
        seconds, source = ctx.assumed_clearing
        if record:
            text = (
                "controller.current_limit_response not given: the current limit is taken to "
                f"act within the profile's assumed clearing time, {format_number(seconds)} s."
            )
            ctx.note(text, source)
        options.append(_Acting(seconds, "the current limit", True))
    if options:
        return min(options, key=lambda a: a.seconds), ""
    if slow:
        return None, (
            f"fuse {', '.join(slow)} gives no clearing time and the stall current is under "
            "the multiple of its rating at which it can be counted on"
        )
    if fuses:
        return None, "its fuse is rated at or above the stall current, and no current limit acts"
    return None, "no fuse protects it and no controller current limit sits below it"


def _judge(
    ctx: _Loop, wire: _Conductor, wires: list[_Conductor], area: float, awg: int, record: bool
) -> _Verdict:
    """Check ``wire`` as if its cross-section were ``area``: its own, or a remedy's size, which
    also changes the stall current slightly."""
    own = area == wire.area
    changed = {} if own else {wire.index: conductor_resistance(area, wire.length)}
    total, per_motor = ctx.currents(changed, wires)
    design_each = ctx.design(per_motor)
    if wire.motor is None:
        stall, design = total, sum(design_each.values())
    else:
        stall, design = per_motor[wire.motor], design_each[wire.motor]
    fed = per_motor.values() if wire.motor is None else (per_motor[wire.motor],)
    limited = ctx.limit is not None and any(ctx.limit < current for current in fed)
    design = design if limited else stall
    motors = len(per_motor)
    if limited:
        why = "the controller current limit"
        why += f" for each of {motors} motors" if wire.motor is None and motors > 1 else ""
    elif ctx.limit is None:
        why = "the stall current, as the controller sets no current limit"
    else:
        why = "the stall current, as the current limit sits above it"
    for fuse in ctx.fuses_on(wire):  # a fuse passes no more than its rating for long
        if fuse.rating < design:
            design = fuse.rating
            why = f"the rating of fuse '{fuse.name}', the most it lets through for long"
    assert wire.insulation is not None and wire.rating is not None
    ampacity: Ampacity | None
    if own and wire.datasheet is not None:
        ampacity = datasheet_ampacity(wire.datasheet, wire.rating, ctx.ambient, wire.loaded)
    else:
        ampacity = tabulated_ampacity(awg, wire.rating, ctx.ambient, wire.loaded)
    acting, because = _protection(ctx, wire, (total, per_motor), limited, record)
    k = adiabatic_k(wire.insulation, wire.rating)
    withstand = withstand_time(k, area, stall) if stall > 0 else math.inf
    holds = None if ampacity is None else stall <= ampacity.current
    if acting is None:
        survives = holds
    elif acting.seconds <= withstand:
        survives = True
    else:  # past 5 s the adiabatic figure ignores cooling: the wire may still carry it
        survives = holds if acting.seconds > ADIABATIC_LIMIT_S else False
    if acting is None:  # a sustained stall is the continuous current, whatever else applies
        design, why = stall, "the stall current, which nothing interrupts"
    carries = None if ampacity is None else design <= ampacity.current
    return _Verdict(stall, design, why, ampacity, acting, because, withstand, k, survives, carries)


def _sources(wire: _Conductor, verdict: _Verdict) -> tuple[Source, ...]:
    found = [STALL, ADIABATIC]
    assert wire.insulation is not None and wire.rating is not None
    if wire.insulation == "ptfe":
        found.append(PTFE_K)
    elif wire.rating > INSULATION_TEMPERATURES[wire.insulation].initial_c:
        found.append(GENERAL_K)
    if verdict.ampacity is not None:
        found += [_TABLE_SOURCES[verdict.ampacity.table], AMBIENT]
        if verdict.ampacity.bundling_factor != 1.0:
            found.append(BUNDLING)
    return tuple(found)


def _up(amps: float) -> str:
    return f"{math.ceil(amps - 1e-9):d} A"


def _down(amps: float) -> str:
    return f"{max(math.floor(amps + 1e-9), 0):d} A"


def _remedy(ctx: _Loop, wire: _Conductor, wires: list[_Conductor], verdict: _Verdict) -> str:
    """The lightest tabulated size that passes every check (re-run at that size), and the other
    ways out: a datasheet rating, faster protection, a fuse or hardware limit."""
    heavier = [n for n in REMEDY_GAUGES if n < wire.awg]
    lightest = next(
        (n for n in heavier if _judge(ctx, wire, wires, awg_area(n), n, record=False).passes),
        None,
    )
    parts: list[str] = []
    if lightest is not None:
        parts.append(f"use {awg_label(lightest)} or heavier")
    elif heavier:
        parts.append(f"no heavier size up to {awg_label(heavier[-1])} passes on the tables")
    if verdict.acting is not None and verdict.survives is False:
        parts.append(f"interrupt the stall within {format_number(verdict.withstand)} s")
        return "; or ".join(parts)
    factor = datasheet_ampacity(1.0, wire.rating or 0.0, ctx.ambient, wire.loaded).current
    if verdict.ampacity is not None and verdict.ampacity.ambient_factor == 0:
        parts.append(f"a wire rated well above the {format_number(ctx.ambient)} °C ambient")
    if factor > 0:
        needed = (verdict.stall if verdict.acting is None else verdict.design) / factor
        parts.append(f"a wire of this size with a datasheet ampacity of at least {_up(needed)}")
    if verdict.acting is None and verdict.ampacity is not None:
        motors = len(ctx.loop.branch_current) if wire.motor is None else 1
        parts.append(
            f"stop the stall being sustained: a fuse on this wire rated at most "
            f"{_down(verdict.ampacity.current)} that clears {format_number(verdict.stall)} A "
            f"(give its clearing_time), or a hardware current limit of at most "
            f"{_down(verdict.ampacity.current / motors)} per motor"
        )
    return "; or ".join(parts)


def _wire_finding(ctx: _Loop, wire: _Conductor, wires: list[_Conductor]) -> Finding:
    subject = f"wire '{wire.name}'"
    missing = tuple(
        f"wires[{wire.index}].{name}"
        for name, value in (("insulation", wire.insulation), ("temperature_rating", wire.rating))
        if value is None
    )
    if missing:
        return Finding(
            Severity.UNASSESSED,
            subject,
            "Without the insulation and its temperature rating neither the short-circuit "
            "constant k nor a tabulated ampacity can be chosen.",
            missing=missing,
            sources=(ADIABATIC,),
        )
    verdict = _judge(ctx, wire, wires, wire.area, wire.awg, record=True)
    amp, n, acting = verdict.ampacity, format_number, verdict.acting
    stall = f"{n(verdict.stall)} A stall current"

    def finding(severity: Severity, text: str, measured: Quantity, limit: Quantity) -> Finding:
        remedy = None if severity is Severity.PASS else _remedy(ctx, wire, wires, verdict)
        return Finding(
            severity=severity,
            subject=subject,
            rationale=text,
            measured=measured,
            limit=limit,
            comparison=Comparison.AT_MOST,
            remedy=remedy,
            sources=_sources(wire, verdict),
        )

    if acting is not None and verdict.survives is False:
        return finding(
            Severity.STOP,
            f"The {stall} flows until {acting}, but this {n(wire.area)} mm² wire withstands it "
            f"for only {n(verdict.withstand)} s (adiabatic, k = {n(verdict.k)}).",
            _q(acting.seconds, "s"),
            _q(verdict.withstand, "s"),
        )
    if acting is not None and acting.seconds <= verdict.withstand:
        survival = f"it withstands the {stall} for {n(verdict.withstand)} s and {acting}"
    elif acting is not None:
        survival = f"{acting}, past the 5 s adiabatic span, so it must carry the {stall}"
    else:
        survival = f"nothing interrupts the {stall} ({verdict.sustained_because})"
    if amp is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            f"Its size ({n(wire.area)} mm², read as {awg_label(wire.awg)}) has no row in NEC "
            f"Table 310.16 or FAA Table 11-9 for a {n(wire.rating or 0)} °C rating, so its "
            f"ampacity needs the wire's datasheet; {survival}.",
            missing=(f"wires[{wire.index}].rated_ampacity",),
            sources=_sources(wire, verdict),
        )
    basis = f"{amp.basis}, x{amp.ambient_factor:.2f} for {n(ctx.ambient)} °C ambient"
    if amp.bundling_factor != 1.0:
        basis += f", x{amp.bundling_factor:.2f} for {wire.loaded} loaded conductors"
    rated = f"{n(amp.current)} A ({basis})"
    if acting is None:
        return finding(
            Severity.PASS if verdict.survives else Severity.STOP,
            f"Nothing interrupts the {stall} ({verdict.sustained_because}), so the wire must "
            f"carry it continuously; it is rated {rated}.",
            _q(verdict.stall, "A"),
            _q(amp.current, "A"),
        )
    return finding(
        Severity.PASS if verdict.carries else Severity.FIX,
        f"It must carry {n(verdict.design)} A continuously ({verdict.design_because}) and is "
        f"rated {rated}; {survival}.",
        _q(verdict.design, "A"),
        _q(amp.current, "A"),
    )


def _running_temperature(ctx: _Loop, wire: _Conductor, current: float, awg: int | None) -> float:
    """The conductor temperature a current keeps it at (FAA AC 43.13-1B 11-66 estimate), as
    it is or resized to ``awg``; at its rating where no ampacity is known."""
    if wire.rating is None:
        return ctx.ambient
    if awg is None and wire.datasheet is not None:
        amp = datasheet_ampacity(wire.datasheet, wire.rating, ctx.ambient, wire.loaded)
    else:
        size = wire.awg if awg is None else awg
        amp = tabulated_ampacity(size, wire.rating, ctx.ambient, wire.loaded)
    if amp is None or amp.current <= 0:
        return wire.rating
    estimate = conductor_temperature(ctx.ambient, amp.column_c, current, amp.current)
    return min(max(estimate, ctx.ambient), wire.rating)


def _drop(
    ctx: _Loop, motor: str, path: list[_Conductor], wires: list[_Conductor], sizes: dict[int, int]
) -> tuple[float, dict[bool, float]]:
    """Volts lost in a motor's path at the design currents, some wires resized (index: AWG),
    and the most the shared (True) and the motor's own (False) wires carry."""
    areas = {w.index: awg_area(sizes[w.index]) if w.index in sizes else w.area for w in path}
    changed = {i: conductor_resistance(areas[i], w.length) for w in path if (i := w.index) in sizes}
    _, per_motor = ctx.currents(changed, wires)
    design = ctx.design(per_motor)
    volts, carried = 0.0, {}
    for wire in path:
        current = sum(design.values()) if wire.motor is None else design[motor]
        current = min([current, *(f.rating for f in ctx.fuses_on(wire))])
        hot = _running_temperature(ctx, wire, current, sizes.get(wire.index))
        volts += current * conductor_resistance(areas[wire.index], wire.length, hot)
        carried[wire.motor is None] = max(current, carried.get(wire.motor is None, 0.0))
    return volts, carried


def _path_finding(ctx: _Loop, motor: str, wires: list[_Conductor]) -> Finding:
    subject = f"motor path '{motor}'"
    path = [w for w in wires if w.motor in (None, motor)]
    if not path:
        return Finding(
            Severity.UNASSESSED,
            subject,
            "No battery or motor wire is listed for this motor, so its voltage drop is unknown.",
            missing=("wires",),
        )
    limit = ctx.profile.limit("wiring.voltage_drop.power")
    allowed = limit.quantity.m_as(_UNIT[""])
    volts, carried = _drop(ctx, motor, path, wires, {})
    fraction = volts / ctx.nominal
    n = format_number
    currents = [
        f"{n(amps)} A in the {'battery' if shared else 'motor'} wires"
        for shared, amps in sorted(carried.items(), reverse=True)
    ]
    text = (
        f"At the design current ({', '.join(currents)}) its {len(path)} listed conductors, "
        f"{n(sum(w.length for w in path))} m feed and return, drop {n(volts)} V: "
        f"{n(fraction * 100)} % of the {n(ctx.nominal)} V nominal pack."
    )
    remedy = None
    if fraction > allowed:
        remedy = "shorten the wires: no single size up to 4/0 AWG brings the drop within limit"
        for gauge in DROP_GAUGES:
            area = awg_area(gauge)
            sizes = {w.index: gauge for w in path if w.area < area}
            if sizes and _drop(ctx, motor, path, wires, sizes)[0] <= allowed * ctx.nominal:
                names = ", ".join(f"'{w.name}'" for w in path if w.index in sizes)
                remedy = f"use {awg_label(gauge)} or heavier for {names}"
                break
    return Finding(
        Severity.PASS if remedy is None else Severity.ADVISE,
        subject,
        text,
        _q(fraction * 100, "percent"),
        limit.quantity,
        Comparison.AT_MOST,
        remedy,
        (limit.source, RUNNING),
    )


def _conductor(build: Build, index: int, wire: Wire) -> _Conductor:
    if wire.cross_section is not None:
        area = wire.cross_section.m_as(_UNIT["mm**2"])
        awg = awg_for_area(area)
    else:
        awg = parse_awg(wire.gauge or "")
        area = awg_area(awg)
    motor = None
    if wire.circuit is Circuit.MOTOR:
        fed = derived.motor_of(build, wire)
        assert fed is not None  # the build model requires a motor name when there are several
        motor = fed.name
    length = wire.length.m_as(_UNIT["m"])
    return _Conductor(
        index,
        wire.name,
        motor,
        area,
        awg,
        length,
        conductor_resistance(area, length),
        wire.insulation.value if wire.insulation is not None else None,
        wire.temperature_rating.m_as(_UNIT["degC"])
        if wire.temperature_rating is not None
        else None,
        wire.bundled_with + 1,
        wire.rated_ampacity.m_as(_UNIT["A"]) if wire.rated_ampacity is not None else None,
    )


def _fuse(fuse: Fuse, wires: list[_Conductor]) -> _Fuse:
    protected = [w for w in wires if w.name in fuse.protects]
    return _Fuse(
        fuse.name,
        fuse.rating.m_as(_UNIT["A"]),
        fuse.clearing_time.m_as(_UNIT["s"]) if fuse.clearing_time is not None else None,
        frozenset(fuse.protects),
        fuse.location == BATTERY_POSITIVE,
        fuse.location == BATTERY_POSITIVE or any(w.motor is None for w in protected),
        frozenset(w.motor for w in protected if w.motor is not None),
    )


def _missing(build: Build) -> tuple[str, ...]:
    missing = ["battery"] if build.battery is None else []
    if not build.motors:
        missing.append("motors")
    missing += [
        f"motors[{i}].winding_resistance"
        for i, motor in enumerate(build.motors)
        if motor.winding_resistance is None
    ]
    if not any(w.circuit in (Circuit.BATTERY, Circuit.MOTOR) for w in build.wires):
        missing.append("wires")
    return tuple(missing)


def _figures(build: Build, loop: derived.StallLoop) -> Iterator[DerivedFigure]:
    battery = build.battery
    assert battery is not None
    cell = derived.cell_voltages(battery)
    volts = loop.voltage
    yield DerivedFigure(
        "pack full voltage",
        _q(volts, "V"),
        f"{battery.cells_series} cells in series at {format_number(cell.full)} V",
        order=20,
    )
    for name, current in loop.branch_current.items():
        yield DerivedFigure(f"stall current, motor '{name}'", _q(current, "A"), order=21)
        yield DerivedFigure(
            f"stall power, motor '{name}'", _q(volts * current, "W"), "V x I", order=22
        )
    yield DerivedFigure(
        "stall current, all motors",
        _q(loop.total_current, "A"),
        "every motor locked at once, from the full pack",
        order=23,
    )
    pack = "" if loop.pack_resistance_known else "; pack internal resistance not given"
    yield DerivedFigure(
        "stall loop resistance",
        _q(volts / loop.total_current, "ohm"),
        f"pack, wires, switch and windings at 20 °C, as seen by the pack{pack}",
        order=24,
    )


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Each battery and motor wire against a stalled motor, and each motor path's voltage drop.

    What it checks
      A locked wheel makes each motor a resistor across the full pack. The stall current is
      the pack's full voltage over the cold (20 °C) loop resistance: pack internal resistance
      (``battery.cell_internal_resistance``, if given), battery-circuit wires, controller switch
      (``controller.switch_on_resistance``), the motor's own wires and its winding
      (``motors[].winding_resistance``). Several motors share the battery wires:
      I_total = V G / (1 + R_shared G) with G the sum of the branch conductances, so a battery
      wire carries the total and a motor wire its motor's share.

      For every wire on the ``battery`` or ``motor`` circuit:
      1. Stall survival. Protection acts if a fuse protects the wire (``fuses[].protects``
         names it, or the fuse's location is battery-positive) and is rated below the stall
         current through the fuse (every motor's for a fuse at the battery positive or on a
         battery wire, else that of the motors whose wires it names), or if the controller's
         per-motor ``current_limit`` sits below the wire's stall current. The earliest acts: a
         fuse after its ``clearing_time``; a fuse without one after the profile's
         ``wiring.assumed_clearing_time``, but only if its current is at least
         ``wiring.assumed_clearing_multiple`` times its rating (nearer its rating a fuse can
         hold for minutes); the limit after ``controller.current_limit_response`` (else the
         assumed clearing time). The wire survives if t <= k^2 S^2 / I^2 (IEC 60364-4-43
         434.5.2, adiabatic, valid to 5 s; past 5 s a wire that carries the current
         continuously also survives). k comes from ``wires[].insulation`` (PVC 115, PVC 90 °C
         100, rubber 141, XLPE 143, silicone 132; PTFE from the general formula, 200 to 300 °C,
         from memory); a wire rated hotter than the table's starting temperature gets k from
         the general formula at its own rating. With no protection acting the stall current is
         sustained and must be within the wire's ampacity.
      2. Continuous current. The design current is the current limit (summed over the motors
         for a battery wire), or the stall current where no limit sits below it, and no more
         than the rating of a fuse on the wire (a fuse passes its rating indefinitely; IEC
         60364-4-43 433.1, Ib <= In <= Iz). It must be
         within the ampacity: the wire's ``rated_ampacity`` (datasheet, read as for 30 °C
         ambient) or else the higher of NEC Table 310.16 (14-8 AWG; 60/75/90 °C columns, 30 °C
         ambient) and FAA AC 43.13-1B Table 11-9 (18-10 AWG; 105/150/200 °C, bundled, 70 °C
         ambient), in the column at or below ``wires[].temperature_rating``. Corrections:
         ambient f = sqrt((T_col - T_amb)/(T_col - T_table)) with ``usage.ambient_temperature``
         or the profile's ``usage.default_ambient_temperature``; NEC 310.15(C)(1) for more than
         three loaded conductors (``wires[].bundled_with`` + 1; not on the FAA table, which is
         already for bundles). A metric wire is read as the heaviest AWG size not above its
         area, and an odd size as the next lighter row.
      3. Voltage drop of each motor's path: its own wires and the battery wires (every
         conductor is listed, so feed and return both count) at the design currents (with no
         current limit, the stall currents), each
         wire at its FAA AC 43.13-1B 11-66 running temperature, as a fraction of the pack's
         nominal voltage, against the profile's ``wiring.voltage_drop.power``.

    Severities
      - stop: the wire cannot survive the stall current until protection acts, or nothing
        interrupts a stall current above its ampacity.
      - fix: the continuous design current exceeds the ampacity.
      - advise: a motor path's voltage drop exceeds the profile's limit.
      - pass: within every limit.
      - unassessed: no ``battery``, no ``motors``, a ``motors[i].winding_resistance`` or no
        battery or motor ``wires``; per wire, ``wires[i].insulation`` or
        ``wires[i].temperature_rating`` absent, or a size outside both tables with no
        ``wires[i].rated_ampacity``.

    The remedy names the lightest tabulated AWG size that passes every check, re-run at that
    size (its lower resistance raises the stall current a little), a datasheet ampacity that
    would pass, and, where the stall is sustained, a fuse or hardware current limit.
    """
    missing = _missing(build)
    loop = None if missing else derived.stall_loop(build)
    if loop is None or build.battery is None:
        yield Finding(
            Severity.UNASSESSED,
            "battery and motor wiring",
            "The stall current needs the pack, every motor's winding resistance and the wires "
            "that carry it.",
            missing=missing,
            sources=(STALL,),
        )
        return
    if build.usage.ambient_temperature is not None:
        ambient = build.usage.ambient_temperature.m_as(_UNIT["degC"])
        default = None
    else:
        default = profile.limit("usage.default_ambient_temperature")
        ambient = default.quantity.m_as(_UNIT["degC"])
    nominal = derived.pack_voltages(build.battery).nominal
    limit = derived.current_limit(build)
    response = build.controller.current_limit_response if build.controller else None
    seconds = response.m_as(_UNIT["s"]) if response is not None else None
    ctx = _Loop(profile, loop, nominal, ambient, limit, seconds)
    if default is not None:
        text = f"Ambient temperature not given: {format_number(ambient)} °C taken for wires."
        ctx.note(text, default.source)
    if not loop.pack_resistance_known:
        text = (
            "battery.cell_internal_resistance not given: the stall current leaves out the "
            "pack's own resistance, which overstates it (conservative)."
        )
        ctx.note(text, STALL)
    wires = [
        _conductor(build, i, w)
        for i, w in enumerate(build.wires)
        if w.circuit in (Circuit.BATTERY, Circuit.MOTOR)
    ]
    if any(w.datasheet is not None for w in wires):
        text = (
            "A wire's datasheet ampacity is read as for one conductor in 30 °C air, then "
            "corrected for ambient and bundling."
        )
        ctx.note(text, DATASHEET)
    ctx.fuses = [_fuse(fuse, wires) for fuse in build.fuses]
    yield from _figures(build, loop)
    for wire in wires:
        yield _wire_finding(ctx, wire, wires)
    for motor in build.motors:
        yield _path_finding(ctx, motor.name, wires)
    yield from ctx.assumptions.values()


RULE = Rule(
    id="wiring.stall-current",
    title="Battery and motor wires against the stall current",
    check=check,
    sources=(STALL, ADIABATIC, GENERAL_K, NEC_TABLE, FAA_TABLE, AMBIENT, BUNDLING, RUNNING),
    inputs=(
        "battery.chemistry",
        "battery.cells_series",
        "battery.cells_parallel",
        "battery.cell_internal_resistance",
        "motors[].winding_resistance",
        "controller.current_limit",
        "controller.current_limit_response",
        "controller.switch_on_resistance",
        "wires[].circuit",
        "wires[].motor",
        "wires[].gauge",
        "wires[].cross_section",
        "wires[].length",
        "wires[].insulation",
        "wires[].temperature_rating",
        "wires[].bundled_with",
        "wires[].rated_ampacity",
        "fuses[].location",
        "fuses[].rating",
        "fuses[].clearing_time",
        "fuses[].protects",
        "usage.ambient_temperature",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.ADVISE, Severity.PASS, Severity.UNASSESSED),
)
