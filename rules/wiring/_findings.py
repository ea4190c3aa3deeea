"""wiring.stall-current, part three: the words and numbers of each finding and figure.

Every rationale states the figures it rests on and the basis of each rating (table, row,
column and corrections), and every finding carries the sources of the formulas it used.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator

from firstride_rules._shared.wording import STALL_SOURCE
from firstride_rules.wiring._calc import (
    WireVerdict,
    drop_path,
    judge,
    lightest_drop_gauge,
    path_drop,
    wire_remedy,
)
from firstride_rules.wiring._model import Conductor, StallContext

from reviewer import figures
from reviewer.build import Build
from reviewer.engineering.conductors import INSULATION_TEMPERATURES, Ampacity, awg_label
from reviewer.findings import (
    Comparison,
    DerivedFigure,
    Finding,
    Severity,
    Source,
    SourceStatus,
)
from reviewer.units import Quantity, format_number, in_unit, quantity

ADIABATIC = Source(
    "IEC 60364-4-43 clause 434.5.2, IEC 60364-5-54 Annex A: a conductor withstands I for "
    "t <= k^2 S^2 / I^2 (up to 5 s); copper k by insulation"
)
GENERAL_K = Source(
    "IEC 60364-4-43 clause 434.5.2, general form for copper: "
    "k = 226 sqrt(ln(1 + (theta_f - theta_i)/(234.5 + theta_i)))"
)
PTFE_K = Source.from_memory("PTFE: general copper k from 200 °C to 300 °C (below its melt)")
STALL = STALL_SOURCE
NEC_TABLE = Source("NEC (NFPA 70) Table 310.16: copper, 30 °C ambient, up to 3 conductors")
FAA_TABLE = Source("FAA AC 43.13-1B Table 11-9: copper wire in bundles, 70 °C ambient")
DATASHEET = Source("the wire's datasheet ampacity, read as for 30 °C ambient", SourceStatus.USER)
AMBIENT = Source.from_memory(
    "NEC 310.15(B) ambient correction, as f = sqrt((T_rating - T_ambient)/(T_rating - T_table))"
)
BUNDLING = Source("NEC 310.15(C)(1): adjustment for more than three loaded conductors")
RUNNING = Source("FAA AC 43.13-1B para 11-66: T2 = T1 + (T_rating - T1)(I2/I_max)^2")
THIN_WIRE = Source(
    "A wire thinner than every size a table rates at its temperature carries no more than the "
    "smallest one: each column of NEC Table 310.16 and FAA AC 43.13-1B Table 11-9 rises with "
    "size",
    SourceStatus.DERIVED,
)
_TABLE_SOURCES = {
    "NEC Table 310.16": NEC_TABLE,
    "FAA AC 43.13-1B Table 11-9": FAA_TABLE,
    "wire datasheet": DATASHEET,
}


def wire_sources(wire: Conductor, verdict: WireVerdict) -> tuple[Source, ...]:
    found = [STALL, ADIABATIC]
    assert wire.insulation is not None and wire.rating is not None
    if wire.insulation == "ptfe":
        found.append(PTFE_K)
    elif wire.rating > INSULATION_TEMPERATURES[wire.insulation].initial_c:
        found.append(GENERAL_K)
    rating = verdict.ampacity or verdict.bound
    if rating is not None:
        found += [_TABLE_SOURCES[rating.table], AMBIENT]
        if rating.bundling_factor != 1.0:
            found.append(BUNDLING)
        if verdict.ampacity is None:
            found.append(THIN_WIRE)
    return tuple(found)


def _corrections(ctx: StallContext, wire: Conductor, amp: Ampacity) -> str:
    text = f"x{amp.ambient_factor:.2f} for {format_number(ctx.ambient)} °C ambient"
    if amp.bundling_factor != 1.0:
        text += f", x{amp.bundling_factor:.2f} for {wire.loaded} loaded conductors"
    return text


def wire_finding(ctx: StallContext, wire: Conductor, wires: list[Conductor]) -> Finding:
    """One battery or motor wire: survival of the stall, then its continuous current."""
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
    verdict = judge(ctx, wire, wires, wire.area, wire.awg, record=True)
    amp, n, acting = verdict.ampacity, format_number, verdict.acting
    stall = f"{n(verdict.stall)} A stall current"

    def finding(severity: Severity, text: str, measured: Quantity, limit: Quantity) -> Finding:
        remedy = None if severity is Severity.PASS else wire_remedy(ctx, wire, wires, verdict)
        return Finding(
            severity=severity,
            subject=subject,
            rationale=text,
            measured=measured,
            limit=limit,
            comparison=Comparison.AT_MOST,
            remedy=remedy,
            sources=wire_sources(wire, verdict),
        )

    if acting is not None and verdict.survives is False:
        return finding(
            Severity.STOP,
            f"The {stall} flows until {acting}, but this {n(wire.area)} mm² wire withstands it "
            f"for only {n(verdict.withstand)} s (adiabatic, k = {n(verdict.k)}).",
            quantity(acting.seconds, "s"),
            quantity(verdict.withstand, "s"),
        )
    if acting is not None and acting.seconds <= verdict.withstand:
        survival = f"it withstands the {stall} for {n(verdict.withstand)} s and {acting}"
    elif acting is not None:
        survival = f"{acting}, past the 5 s adiabatic span, so it must carry the {stall}"
    else:
        survival = f"nothing interrupts the {stall} ({verdict.sustained_because})"
    if amp is None:
        return _beyond_the_tables(ctx, wire, wires, verdict, survival, finding)
    rated = f"{n(amp.current)} A ({amp.basis}, {_corrections(ctx, wire, amp)})"
    if acting is None:
        return finding(
            Severity.PASS if verdict.survives else Severity.STOP,
            f"Nothing interrupts the {stall} ({verdict.sustained_because}), so the wire must "
            f"carry it continuously; it is rated {rated}.",
            quantity(verdict.stall, "A"),
            quantity(amp.current, "A"),
        )
    return finding(
        Severity.PASS if verdict.carries else Severity.FIX,
        f"It must carry {n(verdict.design)} A continuously ({verdict.design_because}) and is "
        f"rated {rated}; {survival}.",
        quantity(verdict.design, "A"),
        quantity(amp.current, "A"),
    )


def _beyond_the_tables(
    ctx: StallContext,
    wire: Conductor,
    wires: list[Conductor],
    verdict: WireVerdict,
    survival: str,
    finding: Callable[[Severity, str, Quantity, Quantity], Finding],
) -> Finding:
    """A wire no table rates at its size and temperature. Thinner than the tables, it carries
    at most what their smallest size does: above that bound it fails (stop if the stall is
    sustained, else fix); below it, only its datasheet can tell."""
    n, bound, subject = format_number, verdict.bound, f"wire '{wire.name}'"
    size = f"{n(wire.area)} mm², read as {awg_label(wire.awg)}"
    rating = f"{n(wire.rating or 0)} °C"
    missing = (f"wires[{wire.index}].rated_ampacity",)
    if bound is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            f"Its size ({size}) has no row in NEC Table 310.16 or FAA Table 11-9 for a "
            f"{rating} rating, so its ampacity needs the wire's datasheet; {survival}.",
            missing=missing,
            sources=wire_sources(wire, verdict),
        )
    capped = (
        f"at most {n(bound.current)} A, an upper bound from the smallest size tabulated "
        f"({bound.basis}: {n(bound.tabulated)} A, {_corrections(ctx, wire, bound)})"
    )
    thinner = f"no table rates a wire this thin ({size}) at {rating}, and it carries {capped}"
    if verdict.acting is None and verdict.carries is False:
        return finding(
            Severity.STOP,
            f"Nothing interrupts the {n(verdict.stall)} A stall current "
            f"({verdict.sustained_because}), so the wire must carry it continuously; {thinner}.",
            quantity(verdict.stall, "A"),
            quantity(bound.current, "A"),
        )
    if verdict.carries is False:
        return finding(
            Severity.FIX,
            f"It must carry {n(verdict.design)} A continuously ({verdict.design_because}), but "
            f"{thinner}; {survival}.",
            quantity(verdict.design, "A"),
            quantity(bound.current, "A"),
        )
    return Finding(
        Severity.UNASSESSED,
        subject,
        f"Its size ({size}) has no row in NEC Table 310.16 or FAA Table 11-9 for a {rating} "
        f"rating. The smallest size they rate caps it at {n(bound.current)} A ({bound.basis}: "
        f"{n(bound.tabulated)} A, {_corrections(ctx, wire, bound)}), above the "
        f"{n(verdict.design)} A it must carry, but only the wire's datasheet ampacity can show "
        f"it carries that; {survival}.",
        remedy=wire_remedy(ctx, wire, wires, verdict),
        missing=missing,
        sources=wire_sources(wire, verdict),
    )


def path_finding(ctx: StallContext, motor: str, wires: list[Conductor]) -> Finding:
    subject = f"motor path '{motor}'"
    path = drop_path(wires, motor)
    if not path:
        return Finding(
            Severity.UNASSESSED,
            subject,
            "No battery or motor wire is listed for this motor, so its voltage drop is unknown.",
            missing=("wires",),
        )
    limit = ctx.profile.limit("wiring.voltage_drop.power")
    allowed = in_unit(limit.quantity, "percent") / 100
    volts, carried = path_drop(ctx, motor, path, wires, {})
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
    advice = None
    if fraction > allowed:
        found = lightest_drop_gauge(ctx, motor, path, wires, allowed * ctx.nominal)
        if found is None:
            advice = "shorten the wires: no single size up to 4/0 AWG brings the drop within limit"
        else:
            gauge, resized = found
            names = ", ".join(f"'{w.name}' (wires[{w.index}].gauge)" for w in resized)
            advice = f"use {awg_label(gauge)} or heavier for {names}"
    return Finding(
        Severity.PASS if advice is None else Severity.ADVISE,
        subject,
        text,
        quantity(fraction * 100, "percent"),
        limit.quantity,
        Comparison.AT_MOST,
        advice,
        (limit.source, RUNNING),
    )


def stall_figures(build: Build, loop: figures.StallLoop) -> Iterator[DerivedFigure]:
    battery = build.battery
    assert battery is not None
    cell = figures.cell_voltages(battery)
    volts = loop.voltage
    yield DerivedFigure(
        "pack full voltage",
        quantity(volts, "V"),
        f"{battery.cells_series} cells in series at {format_number(cell.full)} V",
        order=20,
    )
    for name, current in loop.branch_current.items():
        yield DerivedFigure(f"stall current, motor '{name}'", quantity(current, "A"), order=21)
        yield DerivedFigure(
            f"stall power, motor '{name}'", quantity(volts * current, "W"), "V x I", order=22
        )
    yield DerivedFigure(
        "stall current, all motors",
        quantity(loop.total_current, "A"),
        "every motor locked at once, from the full pack",
        order=23,
    )
    pack = "" if loop.pack_resistance_known else "; pack internal resistance not given"
    yield DerivedFigure(
        "stall loop resistance",
        quantity(volts / loop.total_current, "ohm"),
        f"pack, wires, switch and windings at 20 °C, as seen by the pack{pack}",
        order=24,
    )
