"""wiring.stall-current, part two: one wire judged against the stall and design currents.

Everything here works on the floats of ``_wiring_model``. A remedy is checked by judging the
wire again at the proposed size, so it never names a size that would fail in turn.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from firstride_rules.wiring._model import Conductor, StallContext

from reviewer import figures
from reviewer.engineering.conductors import (
    ADIABATIC_LIMIT_S,
    Ampacity,
    adiabatic_k,
    awg_area,
    awg_label,
    conductor_resistance,
    conductor_temperature,
    datasheet_ampacity,
    tabulated_ampacity,
    thin_wire_ampacity_bound,
    withstand_time,
)
from reviewer.units import format_number

# Sizes a wire remedy may name: the ones a table rates, so the remedy itself is checked.
REMEDY_GAUGES = (18, 16, 14, 12, 10, 8)
DROP_GAUGES = (22, 20, 18, 16, 14, 12, 10, 8, 6, 4, 2, 0, -1, -2, -3)


@dataclass(frozen=True)
class Acting:
    seconds: float
    who: str  # "fuse 'main'" or "the current limit"
    assumed: bool

    def __str__(self) -> str:
        assumed = " (assumed)" if self.assumed else ""
        return f"{self.who} acts after {format_number(self.seconds)} s{assumed}"


@dataclass(frozen=True)
class WireVerdict:
    """One wire (or a candidate size for it) against its stall and design currents."""

    stall: float
    design: float
    design_because: str
    ampacity: Ampacity | None
    bound: Ampacity | None  # with no ampacity: the most a wire this thin can be rated
    acting: Acting | None  # None: the stall current is sustained
    sustained_because: str
    withstand: float  # seconds at the stall current
    k: float
    survives: bool | None
    carries: bool | None

    @property
    def passes(self) -> bool:
        return bool(self.survives and self.carries)


def protection(
    ctx: StallContext,
    wire: Conductor,
    currents: tuple[float, dict[str, float]],
    limited: bool,
    record: bool,
) -> tuple[Acting | None, str]:
    """The earliest of a fuse on this wire rated below the stall current through it and the
    current limit; None (and why) when nothing interrupts the stall."""
    options: list[Acting] = []
    slow: list[str] = []
    fuses = ctx.fuses_on(wire)
    for fuse in fuses:
        through = fuse.current(*currents)
        if fuse.rating >= through:
            continue
        if fuse.clearing is not None:
            options.append(Acting(fuse.clearing, f"fuse '{fuse.name}'", False))
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
            options.append(Acting(seconds, f"fuse '{fuse.name}'", True))
    if limited:
        options.append(_limit_acting(ctx, record))
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


def _limit_acting(ctx: StallContext, record: bool) -> Acting:
    """When the controller's limit acts, from the one response every rule uses
    (``figures.limit_response``): stated for a hardware limit, its averaging window for a
    software one; where neither is known, the profile's assumed clearing time, stated."""
    response = ctx.response
    who = f"the {response.kind} current limit"
    if response.seconds is not None:
        if response.basis == "averaging window":
            who += " (after its averaging window)"
        return Acting(response.seconds, who, False)
    seconds, source = ctx.assumed_clearing
    if record:
        inputs = "controller.current_limit_response"
        if response.kind != "hardware":
            inputs += " (or controller.current_samples_averaged and current_sample_rate)"
        text = (
            f"How soon {who} acts is not known ({inputs} not given): taken to act within "
            f"the profile's assumed clearing time, {format_number(seconds)} s."
        )
        if response.kind == "software (kind unstated)":
            text = "controller.current_limit_kind not given: taken as software. " + text
        ctx.note(text, source)
    return Acting(seconds, who, True)


def _design_reason(ctx: StallContext, wire: Conductor, limited: bool, motors: int) -> str:
    """In words, what the design current of this wire rests on."""
    if limited and wire.motor is None:
        each = f" for each of {motors} motors" if motors > 1 else ""
        return f"what the controller draws from the pack while its limits hold{each}"
    if limited:
        motor = wire.motor or ""
        held = (
            "the motor current whose draw from the pack at a stall is the battery limit "
            "(I_b V = I_m² R)"
            if ctx.held_by.get(motor) == "battery current limit"
            else "the controller's motor current limit"
        )
        factor = ctx.phase_factor[motor] if wire.phase else 1.0
        if factor != 1:
            held = f"the peak phase current, {format_number(factor)} x {held}"
        return held
    if not ctx.limited:
        return "the stall current, as the controller sets no current limit"
    return "the stall current, as the current limit sits above it"


def judge(
    ctx: StallContext,
    wire: Conductor,
    wires: list[Conductor],
    area: float,
    awg: int,
    record: bool,
) -> WireVerdict:
    """Check ``wire`` as if its cross-section were ``area``: its own, or a remedy's size, which
    also changes the stall current slightly."""
    own = area == wire.area
    changed = {} if own else {wire.index: conductor_resistance(area, wire.length)}
    total, per_motor = ctx.currents(changed, wires)
    design_each = ctx.design(per_motor, wire)
    if wire.motor is None:
        stall, design = total, sum(design_each.values())
    else:
        stall, design = per_motor[wire.motor], design_each[wire.motor]
    fed = list(per_motor) if wire.motor is None else [wire.motor]
    limited = any(
        (limit := ctx.limit_for(wire, name)) is not None and limit < per_motor[name] for name in fed
    )
    design = design if limited else stall
    if limited and wire.phase and wire.motor is not None:
        design *= ctx.phase_factor[wire.motor]  # a locked rotor holds the peak in one phase
    why = _design_reason(ctx, wire, limited, len(per_motor))
    for cap, because in ctx.fuse_caps(wire):
        if cap < design:
            design, why = cap, because
    assert wire.insulation is not None and wire.rating is not None
    ampacity: Ampacity | None
    bound = None
    if own and wire.datasheet is not None:
        ampacity = datasheet_ampacity(wire.datasheet, wire.rating, ctx.ambient, wire.loaded)
    else:
        ampacity = tabulated_ampacity(awg, wire.rating, ctx.ambient, wire.loaded)
    if ampacity is None:
        bound = thin_wire_ampacity_bound(awg, wire.rating, ctx.ambient, wire.loaded)
    acting, because = protection(ctx, wire, (total, per_motor), limited, record)
    k = adiabatic_k(wire.insulation, wire.rating)
    withstand = withstand_time(k, area, stall) if stall > 0 else math.inf
    holds = _within(stall, ampacity, bound)
    if acting is None:
        survives = holds
    elif acting.seconds <= withstand:
        survives = True
    else:  # past 5 s the adiabatic figure ignores cooling: the wire may still carry it
        survives = holds if acting.seconds > ADIABATIC_LIMIT_S else False
    if acting is None:  # a sustained stall is the continuous current, whatever else applies
        design, why = stall, "the stall current, which nothing interrupts"
    carries = _within(design, ampacity, bound)
    return WireVerdict(
        stall, design, why, ampacity, bound, acting, because, withstand, k, survives, carries
    )


def _within(current: float, ampacity: Ampacity | None, bound: Ampacity | None) -> bool | None:
    """Whether a wire carries ``current``: known against an ampacity; against an upper bound
    only a current above it settles the question (the wire then certainly fails)."""
    if ampacity is not None:
        return current <= ampacity.current
    if bound is not None and current > bound.current:
        return False
    return None


def _up(amps: float) -> str:
    return f"{math.ceil(amps - 1e-9):d} A"


def _down(amps: float) -> str:
    return f"{max(math.floor(amps + 1e-9), 0):d} A"


def wire_remedy(
    ctx: StallContext, wire: Conductor, wires: list[Conductor], verdict: WireVerdict
) -> str:
    """The lightest tabulated size that passes every check (re-run at that size), and the other
    ways out: a datasheet rating, faster protection, a fuse or hardware limit."""
    heavier = [n for n in REMEDY_GAUGES if n < wire.awg]
    rating = wire.rating or 0.0
    # a size no table rates at this temperature cannot pass, so it is not worth judging
    rated = [
        n for n in heavier if tabulated_ampacity(n, rating, ctx.ambient, wire.loaded) is not None
    ]
    lightest = next(
        (n for n in rated if judge(ctx, wire, wires, awg_area(n), n, record=False).passes),
        None,
    )
    parts: list[str] = []
    if lightest is not None:
        parts.append(f"use {awg_label(lightest)} or heavier (wires[{wire.index}].gauge)")
    elif heavier:
        parts.append(f"no heavier size up to {awg_label(heavier[-1])} passes on the tables")
    if verdict.acting is not None and verdict.survives is False:
        parts.append(f"interrupt the stall within {format_number(verdict.withstand)} s")
        return "; or ".join(parts)
    factor = datasheet_ampacity(1.0, rating, ctx.ambient, wire.loaded).current
    if verdict.ampacity is not None and verdict.ampacity.ambient_factor == 0:
        parts.append(f"a wire rated well above the {format_number(ctx.ambient)} °C ambient")
    # Past the bound no datasheet can rate a wire this thin high enough: no point asking.
    over_bound = verdict.ampacity is None and verdict.carries is False
    if factor > 0 and not over_bound:
        needed = (verdict.stall if verdict.acting is None else verdict.design) / factor
        parts.append(
            f"a wire of this size with a datasheet ampacity of at least {_up(needed)} (given "
            f"as wires[{wire.index}].rated_ampacity)"
        )
    motors = len(ctx.loop.branch_current) if wire.motor is None else 1
    if verdict.acting is None and verdict.ampacity is not None:
        parts.append(
            f"stop the stall being sustained: a fuse on this wire rated at most "
            f"{_down(verdict.ampacity.current)} that clears {format_number(verdict.stall)} A "
            f"(a [[fuses]] entry with fuses[].rating and fuses[].clearing_time), or a hardware "
            f"current limit of at most {_down(verdict.ampacity.current / motors)} per motor "
            f"({_limit_field(wire)})"
        )
    elif verdict.acting is None and over_bound and verdict.bound is not None:
        share = f" (per motor, 1/{motors} of it)" if motors > 1 else ""
        parts.append(
            f"stop the stall being sustained: a fuse on this wire that clears "
            f"{format_number(verdict.stall)} A (give its clearing_time), or a hardware current "
            f"limit{share}, rated within the wire's datasheet ampacity (given as "
            f"wires[{wire.index}].rated_ampacity), which at this size is under "
            f"{_up(verdict.bound.current)}"
        )
    return "; or ".join(parts)


def _limit_field(wire: Conductor) -> str:
    """The controller limit that holds this wire's current: the battery-side one for a
    battery wire, the motor one for a motor or phase lead."""
    return (
        "controller.battery_current_limit"
        if wire.motor is None
        else ("controller.motor_current_limit")
    )


def running_temperature(
    ctx: StallContext, wire: Conductor, current: float, awg: int | None
) -> float:
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


def drop_path(wires: list[Conductor], motor: str) -> list[Conductor]:
    """The conductors a motor's current runs through, for its voltage drop: the battery wires,
    its motor wires, and of its phase leads the two of most resistance (line to line, two
    carry the current; the higher pair is the conservative choice for a drop)."""
    own = [w for w in wires if w.motor in (None, motor) and not w.phase]
    phases = sorted((w for w in wires if w.motor == motor and w.phase), key=lambda w: -w.r20)
    return own + phases[: figures.PHASES_IN_SERIES]


def path_drop(
    ctx: StallContext,
    motor: str,
    path: list[Conductor],
    wires: list[Conductor],
    sizes: dict[int, int],
) -> tuple[float, dict[bool, float]]:
    """Volts lost in a motor's path at the design currents, some wires resized (index: AWG),
    and the most the shared (True) and the motor's own (False) wires carry."""
    areas = {w.index: awg_area(sizes[w.index]) if w.index in sizes else w.area for w in path}
    changed = {i: conductor_resistance(areas[i], w.length) for w in path if (i := w.index) in sizes}
    _, per_motor = ctx.currents(changed, wires)
    volts, carried = 0.0, {}
    for wire in path:
        design = ctx.design(per_motor, wire)
        current = sum(design.values()) if wire.motor is None else design[motor]
        current = min([current, *(cap for cap, _ in ctx.fuse_caps(wire))])
        hot = running_temperature(ctx, wire, current, sizes.get(wire.index))
        volts += current * conductor_resistance(areas[wire.index], wire.length, hot)
        carried[wire.motor is None] = max(current, carried.get(wire.motor is None, 0.0))
    return volts, carried


def lightest_drop_gauge(
    ctx: StallContext, motor: str, path: list[Conductor], wires: list[Conductor], volts: float
) -> tuple[int, list[Conductor]] | None:
    """The lightest single size that, given to every thinner wire of the path, keeps its drop
    within ``volts``; and the wires it resizes. None if no size up to 4/0 AWG does."""
    for gauge in DROP_GAUGES:
        area = awg_area(gauge)
        sizes = {w.index: gauge for w in path if w.area < area}
        if sizes and path_drop(ctx, motor, path, wires, sizes)[0] <= volts:
            return gauge, [w for w in path if w.index in sizes]
    return None
