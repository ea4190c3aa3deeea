"""protection.fuse: a fuse or breaker on the pack's positive lead, sized between the current the
drive needs and the current its wires may carry, and able to break the fault it is there for.

A pack has no upstream protection of its own: a short anywhere after it, a chafed lead or a
failed switch, draws as much current as the cells and wires allow until something melts. The
fuse at the positive terminal is the one part that ends that.
"""

from __future__ import annotations

import math
from collections.abc import Iterator

from firstride_rules.protection._breaking import (
    FUSE_VOLTAGE,
    SHORT_CIRCUIT,
    Fault,
    fault_current,
    interruption,
)
from firstride_rules.protection._currents import (
    THIN_WIRE,
    THINNER_CEILING,
    Capacity,
    Design,
    design_current,
    protected_wires,
    wire_capacity,
)

from reviewer import figures
from reviewer.build import Build, Fuse
from reviewer.engineering.fuses import (
    rating_window,
)
from reviewer.findings import Assumption, Comparison, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import format_number, in_unit, quantity

COORDINATION = Source(
    "IEC 60364-4-43 clause 433.1: design current <= fuse rating <= conductor capacity "
    "(Ib <= In <= Iz)"
)
SMALL_CONDUCTORS = Source(
    "NEC (NFPA 70) 240.4(D): protection of at most 7 A for 18 AWG, 10 A 16 AWG, 15 A 14 AWG, "
    "20 A 12 AWG, 30 A 10 AWG copper"
)
AMPACITY = Source(
    "NEC Table 310.16 and FAA AC 43.13-1B Table 11-9 (or the wire's datasheet), corrected for "
    "ambient and bundling as in wiring.stall-current"
)
BATTERY_POSITIVE = "battery-positive"
_EPSILON = 1e-9


def _n(value: float) -> str:
    return format_number(value)


def _window(build: Build, design: Design, capacity: Capacity) -> str:
    """A fuse rating window, Ib to Iz in whole amperes, or what to change when none fits."""
    low = max(1, math.ceil(design.current - _EPSILON))
    if design.missing and capacity.current is None:
        return "fit a DC-rated fuse between the drive's normal current and the wires' ampacity"
    if capacity.current is None:
        return f"fit a fuse of at least {low} A (the wires' ratings set its upper bound)"
    unrated = ""
    if capacity.unrated:
        names = [f"'{name}'" for name in capacity.unrated]
        listed = names[0] if len(names) == 1 else ", ".join(names[:-1]) + " and " + names[-1]
        wires = "wire" if len(names) == 1 else "wires"
        unrated = f" (and within the ampacity of {wires} {listed}, which the build does not give)"
    if design.missing:
        high = math.floor(capacity.current + _EPSILON)
        return (
            f"fit a DC-rated fuse of at most {high} A, above the drive's normal current{unrated} "
            "(fuses[].rating)"
        )
    window = rating_window(design.current, capacity.current)
    if window is not None:
        amps = f"{window[0]} A" if window[0] == window[1] else f"{window[0]}-{window[1]} A"
        return f"fit a {amps} DC-rated fuse{unrated} (fuses[].rating)"
    remedy = (
        f"no fuse rating fits between the {_n(design.current)} A design current and the "
        f"{_n(capacity.current)} A wire '{capacity.wire}' may be protected at: use wire there "
        f"that may be protected at {low} A or more (its wires[].gauge)"
    )
    aux = figures.auxiliary_current(build).current
    if figures.any_limit(build) and build.motors:
        per_motor = math.floor((capacity.current - aux) / len(build.motors) + _EPSILON)
        if per_motor >= 1:
            each = " per motor" if len(build.motors) > 1 else ""
            remedy += f", or set controller.battery_current_limit at or below {per_motor} A{each}"
    return remedy


def _missing_fuse(
    build: Build, full: float, design: Design, capacity: Capacity, fault: Fault
) -> Finding:
    unlimited = not figures.any_limit(build)
    text = (
        "No fuse or breaker is on the pack's positive lead: a short anywhere after it draws "
        "the pack's fault current with nothing to break it"
    )
    text += ", and nothing limits a stalled motor's current either." if unlimited else "."
    for fuse in build.fuses:
        if fuse.location == "battery-negative":
            text += (
                f" Fuse '{fuse.name}' on the negative lead does not break a short from the "
                "positive side to the frame."
            )
    remedy = f"{_window(build, design, capacity)}, rated at least {_n(full)} V DC, at the battery "
    remedy += "positive"
    if fault.current is not None:
        remedy += f", with a breaking capacity of at least {math.ceil(fault.current)} A"
        if fault.source is None:
            remedy += " (worst case: battery wires only)"
    return Finding(
        Severity.STOP if unlimited else Severity.FIX,
        "fuse at the battery positive",
        text,
        remedy=remedy,
        sources=(SHORT_CIRCUIT, COORDINATION),
    )


def _coordination(build: Build, fuse: Fuse, design: Design, capacity: Capacity) -> Finding:
    rating = in_unit(fuse.rating, "A")
    subject = f"fuse '{fuse.name}' rating"
    text = f"Rated {_n(rating)} A; the design current is {_n(design.current)} A ({design.how})"
    if capacity.current is not None:
        text += (
            f", and wire '{capacity.wire}' may be protected at no more than "
            f"{_n(capacity.current)} A ({capacity.basis})"
        )
    text += "."
    measured = quantity(rating, "A")
    limit, comparison = None, Comparison.AT_MOST
    if capacity.current is not None:
        limit = quantity(capacity.current, "A")
    severity = Severity.PASS
    if capacity.current is not None and rating > capacity.current + _EPSILON:
        severity = Severity.FIX
        text += f" The fuse lets wire '{capacity.wire}' overheat before it opens."
    elif rating < design.current - _EPSILON:
        severity, comparison = Severity.FIX, Comparison.AT_LEAST
        limit = quantity(design.current, "A")
        text += " The fuse opens in normal riding: a sudden loss of power."
    missing = (*design.missing, *capacity.missing)
    if severity is Severity.PASS and (missing or capacity.current is None):
        severity = Severity.UNASSESSED
        text += " Some currents or ratings it is checked against are not given."
    remedy = None if severity is Severity.PASS else _window(build, design, capacity)
    sources = (COORDINATION, SMALL_CONDUCTORS, AMPACITY, *capacity.sources)
    missing = missing if severity is Severity.UNASSESSED else ()
    return Finding(severity, subject, text, measured, limit, comparison, remedy, sources, missing)


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """A fuse at the pack's positive terminal: present, coordinated, able to break a short.

    What it checks
      1. Presence: a fuse (or breaker) with ``location = "battery-positive"``. A fuse on the
         negative lead does not break a short from the positive side to the frame.
      2. Coordination of each such fuse (IEC 60364-4-43 433.1, Ib <= In <= Iz):
         Ib, the design current, is per motor what the controller draws from the pack while
         its limits hold: ``controller.battery_current_limit``, or the motor limit
         (``controller.motor_current_limit`` as a DC-equivalent current, highest reading)
         where it is lower or alone, as the pack carries the motor current near full duty
         (energy balance, brief 11); else the ``motors[i].rated_current`` (a stall is a
         fault, not service), plus
         ``logic.board_current`` (pack-fed) and ``brakes[].coil_current``. Iz is the least, over
         the wires the fuse protects, of the wire's ampacity (as wiring.stall-current rates it:
         datasheet ``rated_ampacity`` or NEC Table 310.16 / FAA AC 43.13-1B Table 11-9, with
         ambient and bundling corrections) and the NEC 240.4(D) ceiling for 18-10 AWG (7, 10,
         15, 20, 30 A; a metric wire is read as the heaviest AWG not above its area). A wire
         thinner than the tables has no ampacity figure, but an upper bound, as
         wiring.stall-current words it: the smallest size tabulated, in the column at or below
         its rating, with the same corrections; and both tables and 240.4(D) rise with size, so
         a wire thinner than 18 AWG may be protected at no more than 18 AWG's 7 A (derived).
         The 240.4(D) ceiling applies whether or not the wire's ampacity is known. A fuse above
         a bound is too large; one within it still needs the wire's datasheet
         ``rated_ampacity`` (or its ``temperature_rating``). The wires it protects: those in
         ``fuses[i].protects``; else the battery-circuit wires, and also the motor wires when
         there is no current limit to protect them.
      3. Interruption of each such fuse: ``fuses[i].voltage_rating`` (DC) at least the full
         pack voltage (ISO 8820-3 blade fuses: 32 V or 58 V), judged by
         ``fuse_voltage_rating`` (``firstride_rules._shared.voltage_rating``) as
         voltage.ratings judges the same fuse; and
         ``fuses[i].breaking_capacity``, once the voltage rating is not below the pack's,
         at least the prospective short-circuit current at the controller input,
         V_full / (R_pack + R_battery_wires), with R_pack from
         ``battery.cell_internal_resistance`` x series / parallel and the battery-circuit wires
         at 20 °C. Without the cells' resistance the wires alone give the worst case (noted).

    Severities
      - stop: no pack-positive fuse and no controller current limit; a fuse rated below the
        full pack voltage; a breaking capacity below the prospective current.
      - fix: no pack-positive fuse where a current limit exists; a rating below Ib (it opens
        in normal riding) or above Iz, the NEC 240.4(D) ceiling or the upper bound of a wire
        thinner than the tables (the wire overheats first).
      - pass: within every limit.
      - unassessed: no ``battery``; a current, wire rating, voltage rating or breaking capacity
        needed and not given (named); the worst-case short-circuit current above the breaking
        capacity while the cells' internal resistance is unknown (the finding says what
        resistance would suffice).

    The remedy gives a rating window, e.g. "fit a 13-20 A DC-rated fuse", the DC voltage and the
    breaking capacity to buy.
    """
    battery = build.battery
    if battery is None:
        yield Finding(
            Severity.UNASSESSED,
            "fuse at the battery positive",
            "No battery is described, so neither its voltage nor its fault current is known.",
            missing=("battery",),
            sources=(SHORT_CIRCUIT,),
        )
        return
    full = figures.pack_voltages(battery).full
    if build.usage.ambient_temperature is not None:
        ambient = in_unit(build.usage.ambient_temperature, "degC")
    else:
        default = profile.limit("usage.default_ambient_temperature")
        ambient = in_unit(default.quantity, "degC")
        yield Assumption(
            f"usage.ambient_temperature not given: {_n(ambient)} °C taken for wires.",
            default.source,
        )
    design = design_current(build)
    fault = fault_current(build, full)
    if fault.current is not None:
        note = "pack and battery wires at 20 °C, shorted at the controller input"
        if fault.source is None:
            note += "; wires only, pack internal resistance not given"
        yield DerivedFigure(
            "prospective short-circuit current", quantity(fault.current, "A"), note, order=25
        )
    fuses = [(i, f) for i, f in enumerate(build.fuses) if f.location == BATTERY_POSITIVE]
    if not fuses:
        capacity = wire_capacity(protected_wires(build, None), ambient)
        yield _missing_fuse(build, full, design, capacity, fault)
        return
    for index, fuse in fuses:
        capacity = wire_capacity(protected_wires(build, fuse), ambient)
        yield _coordination(build, fuse, design, capacity)
        yield from interruption(build, index, fuse, full, fault)


RULE = Rule(
    id="protection.fuse",
    title="Fuse at the battery positive: presence, coordination and breaking capacity",
    check=check,
    sources=(
        COORDINATION,
        SMALL_CONDUCTORS,
        SHORT_CIRCUIT,
        FUSE_VOLTAGE,
        AMPACITY,
        THIN_WIRE,
        THINNER_CEILING,
    ),
    inputs=(
        "battery.chemistry",
        "battery.cells_series",
        "battery.cells_parallel",
        "battery.cell_internal_resistance",
        "motors[].rated_current",
        "controller.battery_current_limit",
        "controller.motor_current_limit",
        "controller.motor_current_basis",
        "controller.drive",
        "logic.board_current",
        "brakes[].coil_current",
        "wires[].circuit",
        "wires[].gauge",
        "wires[].cross_section",
        "wires[].length",
        "wires[].temperature_rating",
        "wires[].bundled_with",
        "wires[].rated_ampacity",
        "fuses[].location",
        "fuses[].rating",
        "fuses[].voltage_rating",
        "fuses[].breaking_capacity",
        "fuses[].protects",
        "usage.ambient_temperature",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
