"""protection.fuse, part three: whether the pack fuse can break the short it is there for: its
DC voltage rating (judged as voltage.ratings judges it) and its breaking capacity against the
prospective short-circuit current at the controller input."""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass

import pint
from firstride_rules._shared import voltage_rating as ratings

from reviewer import figures
from reviewer.build import Build, Fuse
from reviewer.engineering.fuses import prospective_fault_current, source_resistance_needed
from reviewer.findings import Assumption, Comparison, Finding, Severity, Source
from reviewer.rule import Output
from reviewer.units import format_number, in_unit, quantity

SHORT_CIRCUIT = Source.from_memory(
    "IEC 60364-4-43 clause 434: a device must break any short-circuit current before it harms "
    "the conductors; its breaking capacity at least the prospective current V / (R_source + "
    "R_loop)"
)
FUSE_VOLTAGE = Source(
    "ISO 8820-3: blade fuses rated 32 V or 58 V DC with 1000 A breaking capacity; a fuse "
    "interrupts only at or below its rated voltage"
)
_EPSILON = 1e-9


def _n(value: float) -> str:
    return format_number(value)


@dataclass(frozen=True)
class Fault:
    """The prospective short-circuit current at the controller input, if it can be formed."""

    current: float | None
    source: float | None  # pack internal resistance, ohm
    loop: float  # battery-circuit wires, ohm


def fault_current(build: Build, full: float) -> Fault:
    loop = sum(figures.wire_resistance(w) for w in figures.shared_wires(build))
    assert build.battery is not None
    source = figures.pack_resistance(build.battery)
    if source is None and loop <= 0:
        return Fault(None, None, loop)
    return Fault(prospective_fault_current(full, source or 0.0, loop), source, loop)


def _amps(value: float) -> str:
    """Whole amperes from 100 A up (a breaking capacity reads '1000 A', not '1×10^3 A')."""
    return f"{value:.0f} A" if value >= 100 else f"{_n(value)} A"


def _maybe(amount: pint.Quantity | None, target: str) -> float | None:
    return None if amount is None else in_unit(amount, target)


def interruption(
    build: Build, index: int, fuse: Fuse, full: float, fault: Fault
) -> Iterator[Output]:
    sources = (SHORT_CIRCUIT, FUSE_VOLTAGE)
    rating = ratings.fuse_voltage_rating(build, index)
    assert rating is not None  # the pack is known
    # judged as voltage.ratings judges the same fuse: one function, one severity, one wording
    yield rating.finding(f"fuse '{fuse.name}' voltage rating", sources)
    if rating.severity is Severity.STOP:
        return  # its breaking capacity holds only up to its rated voltage: nothing to add
    subject = f"fuse '{fuse.name}' interrupting rating"
    volts = rating.rated
    breaking = _maybe(fuse.breaking_capacity, "A")
    missing = [] if breaking is not None else [f"fuses[{index}].breaking_capacity"]
    if fault.current is None:
        missing += ["battery.cell_internal_resistance", "wires"]
    if missing:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            "Its breaking capacity and the prospective short-circuit current (pack internal "
            "resistance or battery wires) are both needed.",
            missing=tuple(missing),
            sources=sources,
        )
        return
    assert breaking is not None and fault.current is not None
    text = (
        f"A short at the controller input draws {_amps(fault.current)} from the {_n(full)} V "
        f"pack through {_n(fault.loop * 1000)} mΩ of battery wiring"
    )
    if fault.source is None:
        text += " (worst case: the pack's internal resistance is not given)"
        unknown = (
            "battery.cell_internal_resistance"
            if build.battery is None or build.battery.cell_internal_resistance is None
            else "battery.cells_parallel"
        )
        yield Assumption(
            f"{unknown} not given: the prospective short-circuit current counts the battery "
            "wires only, which overstates it.",
            SHORT_CIRCUIT,
        )
    else:
        text += f" and {_n(fault.source * 1000)} mΩ inside the pack"
    at = f" at {_n(volts)} V DC" if volts is not None else ""
    text += f"; the fuse breaks up to {_amps(breaking)}{at}."
    remedy = f"use a fuse with a breaking capacity of at least {math.ceil(fault.current)} A DC"
    if fault.source is None:
        remedy = f"give battery.cell_internal_resistance, or {remedy}"
    if fault.current <= breaking + _EPSILON:
        severity, remedy = Severity.PASS, None
        missing_fields: tuple[str, ...] = ()
    elif fault.source is None:
        severity = Severity.UNASSESSED
        assert build.battery is not None
        needed = source_resistance_needed(full, breaking, fault.loop)
        parallel = build.battery.cells_parallel
        missing_fields = ("battery.cell_internal_resistance",)
        if parallel is None:
            missing_fields += ("battery.cells_parallel",)
            least = _n(needed * 1000)
            text += f" It suffices if the pack's internal resistance is at least {least} mΩ."
        else:
            per_cell = needed * parallel / build.battery.cells_series
            text += (
                f" It suffices if each cell's internal resistance is at least "
                f"{_n(per_cell * 1000)} mΩ (the pack's {_n(needed * 1000)} mΩ)."
            )
    else:
        severity, missing_fields = Severity.STOP, ()
        text += " It may fail to clear the short."
    yield Finding(
        severity,
        subject,
        text,
        quantity(fault.current, "A"),
        quantity(breaking, "A"),
        Comparison.AT_MOST,
        remedy,
        sources,
        missing_fields,
    )
