"""protection.fuse, part two: the two currents a fuse is sized between (IEC 60364-4-43 clause
433.1, Ib <= In <= Iz): the design current the pack lead carries in normal riding, and the most
the wires it protects may be protected at.

A wire no table rates still has a figure here when it is thinner than the tables: both its
ampacity and its NEC 240.4(D) ceiling rise with size, so the smallest size listed bounds it from
above. A fuse over that bound is certainly too large; one under it still needs the wire's
datasheet, so such a wire stays among the missing inputs.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from functools import partial

from firstride_rules._shared.wording import small_loads
from firstride_rules.wiring._findings import THIN_WIRE

from reviewer import figures
from reviewer.build import Build, Circuit, Fuse, Wire
from reviewer.engineering.conductors import Ampacity, awg_label
from reviewer.engineering.fuses import small_conductor_limit
from reviewer.findings import Source, SourceStatus
from reviewer.units import format_number, in_unit

THINNER_CEILING = Source(
    "NEC 240.4(D) ceilings rise with size (7 A for 18 AWG up to 30 A for 10 AWG), so a wire "
    "thinner than 18 AWG may be protected at no more than 18 AWG's 7 A",
    SourceStatus.DERIVED,
)
LIGHTEST_LISTED_AWG = 18  # the lightest size NEC 240.4(D) lists


def _n(value: float) -> str:
    return format_number(value)


@dataclass(frozen=True)
class Design:
    """Ib: the current the pack lead carries in normal riding (a lower bound if ``missing``)."""

    current: float
    how: str
    missing: tuple[str, ...]


def design_current(build: Build) -> Design:
    """Per motor what the controller draws from the pack while its limits hold (the battery
    limit, or the motor limit where it is lower or alone: near full duty the pack carries the
    motor current), else the motor's rated continuous current (a stall is a fault, not
    service), plus the logic board and brake relay coil."""
    aux = figures.auxiliary_current(build)
    amps, missing = aux.current, list(aux.missing)
    bases: list[str] = []
    for index, motor in enumerate(build.motors):
        design = figures.battery_design_current(build, motor)
        if design is not None:
            amps += design.amps
            bases.append(f"the {_n(design.amps)} A {design.basis}")
        elif motor.rated_current is not None:
            amps += in_unit(motor.rated_current, "A")
            bases.append("the motor's rated continuous current, as the controller sets no limit")
        else:
            missing.append(f"motors[{index}].rated_current")
    unlimited = not figures.any_limit(build)
    if unlimited and len(missing) > len(aux.missing):
        missing.append("controller.battery_current_limit")
    if not build.motors:
        missing.append("motors")
    count = len(build.motors)
    if bases and all(basis == bases[0] for basis in bases):
        how = bases[0] + (f" x {count} motors" if count > 1 else "")
    elif bases:
        how = " + ".join(bases)
    else:
        how = "the motors' rated continuous current, as the controller sets no limit"
    if aux.parts:
        how += f", plus the {small_loads(aux)}"
    return Design(amps, how, tuple(missing))


def protected_wires(build: Build, fuse: Fuse | None) -> list[tuple[int, Wire]]:
    """The wires a pack fuse must protect: those it names; else the battery-circuit wires, and
    the motor wires too when no current limit guards them (the fuse is then their only
    overload protection; behind a limit, motor wires are the controller's to protect, as NEC
    240.4(G) leaves motor circuits to Article 430; from memory)."""
    if fuse is not None and fuse.protects:
        return [(i, w) for i, w in enumerate(build.wires) if w.name in fuse.protects]
    circuits = {Circuit.BATTERY}
    if not figures.any_limit(build):
        circuits |= {Circuit.MOTOR, Circuit.PHASE}
    return [(i, w) for i, w in enumerate(build.wires) if w.circuit in circuits]


@dataclass(frozen=True)
class Capacity:
    """Iz: the most the protected wires may be protected at, the wire that sets it and why.

    ``unrated`` names the protected wires whose ampacity neither a table nor a datasheet gives:
    their figure is at most an upper bound, so a fuse within it is still not shown to protect
    them (their fields are in ``missing``)."""

    current: float | None
    wire: str
    basis: str
    missing: tuple[str, ...]
    unrated: tuple[str, ...] = ()
    sources: tuple[Source, ...] = ()  # behind a bound, where the figure is one


def _ceiling(awg: int) -> tuple[float, Callable[[], str], tuple[Source, ...]] | None:
    """The NEC 240.4(D) ceiling for this size, or for a thinner wire the lightest size's."""
    listed = small_conductor_limit(awg)
    if listed is not None:
        return listed, partial(_listed_basis, awg), ()
    lightest = small_conductor_limit(LIGHTEST_LISTED_AWG)
    if awg > LIGHTEST_LISTED_AWG and lightest is not None:
        return lightest, partial(_thinner_basis, awg), (THINNER_CEILING,)
    return None


def _ampacity_basis(ampacity: Ampacity) -> str:
    return f"ampacity, {ampacity.basis}"


def _listed_basis(awg: int) -> str:
    return f"NEC 240.4(D) ceiling for {awg_label(awg)}"


def _thinner_basis(awg: int) -> str:
    return (
        f"NEC 240.4(D) ceiling for {awg_label(LIGHTEST_LISTED_AWG)}, the lightest size it "
        f"lists, which bounds this thinner {awg_label(awg)} wire"
    )


def _bound_basis(wire: Wire, awg: int, bound: Ampacity, ambient: float) -> str:
    """Worded as wiring.stall-current words the same bound."""
    corrections = f"x{bound.ambient_factor:.2f} for {_n(ambient)} °C ambient"
    if bound.bundling_factor != 1.0:
        loaded = wire.bundled_with + 1
        corrections += f", x{bound.bundling_factor:.2f} for {loaded} loaded conductors"
    assert wire.temperature_rating is not None
    rating = in_unit(wire.temperature_rating, "degC")
    return (
        f"no table rates a wire this thin ({awg_label(awg)}) at {_n(rating)} °C, and it carries "
        f"at most {_n(bound.current)} A, an upper bound from the smallest size tabulated "
        f"({bound.basis}: {_n(bound.tabulated)} A, {corrections})"
    )


def wire_capacity(wires: list[tuple[int, Wire]], ambient: float) -> Capacity:
    """The least, over ``wires``, of each wire's ampacity (or, thinner than the tables, its
    upper bound) and its NEC 240.4(D) ceiling; ties go to the ampacity. Only the figure that
    sets Iz is put into words."""
    best: tuple[float, Callable[[], str], tuple[Source, ...], str] | None = None
    missing: list[str] = [] if wires else ["wires"]
    unrated: list[str] = []
    for index, wire in wires:
        awg = figures.wire_awg(wire)
        bounds: list[tuple[float, Callable[[], str], tuple[Source, ...]]] = []
        ampacity = figures.wire_ampacity(wire, ambient)
        if ampacity is not None:
            bounds.append((ampacity.current, partial(_ampacity_basis, ampacity), ()))
        else:
            field = "temperature_rating" if wire.temperature_rating is None else "rated_ampacity"
            missing.append(f"wires[{index}].{field}")
            unrated.append(wire.name)
            bound = figures.wire_ampacity_bound(wire, ambient)
            if bound is not None:
                words = partial(_bound_basis, wire, awg, bound, ambient)
                bounds.append((bound.current, words, (THIN_WIRE,)))
        ceiling = _ceiling(awg)
        if ceiling is not None:
            bounds.append(ceiling)
        for allowed, words, sources in bounds:
            if best is None or allowed < best[0]:
                best = (allowed, words, sources, wire.name)
    if best is None:
        return Capacity(None, "", "", tuple(missing), tuple(unrated))
    allowed, words, sources, name = best
    return Capacity(allowed, name, words(), tuple(missing), tuple(unrated), sources)
