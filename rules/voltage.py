"""voltage.ratings: the pack's full-charge voltage against the voltage rating of every part it
reaches: the motor switch, the freewheel diode, a regulator fed from the pack, each fuse, the
brake relay's contacts and each motor.

A part rated below the voltage it sees fails at the first full charge, and some fail in the
worst way: a fuse that cannot quench its DC arc, relay contacts that weld, a regulator that
passes the pack through to the logic.
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass

import pint

from reviewer import derived
from reviewer.build import Battery, Build, Controller
from reviewer.engineering.fuses import blade_fuse_voltage
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
from reviewer.units import format_number, quantity

CELL_LIMITS = Source.from_memory(
    "Linden, Handbook of Batteries: full charge 4.2 V per Li-ion or LiPo cell, 3.65 V LiFePO4"
)
DATASHEET = Source("the part's datasheet maximum, as entered in the build", SourceStatus.USER)
SWITCH_SPIKE = Source.from_memory(
    "Mohan, Undeland and Robbins, Power Electronics: a winding switched off without a freewheel "
    "path drives the switch above the supply; a freewheel diode clamps it near the supply and "
    "must itself block the supply"
)
FUSE_VOLTAGE = Source(
    "ISO 8820-3: blade fuses rated 32 V or 58 V DC; a fuse interrupts only at or below its "
    "rated voltage"
)
RELAY_ARC = Source.from_memory(
    "A DC arc has no current zero to quench it: relay contacts break DC only up to their rated "
    "DC voltage"
)
MOTOR_SPEED = Source.from_memory(
    "Chapman, Electric Machinery Fundamentals: E = Ke w, so a DC motor's no-load speed rises in "
    "proportion to its supply voltage"
)
_EPSILON = 1e-9


def _n(value: float) -> str:
    return format_number(value)


def _volts_up(value: float) -> str:
    """A voltage to ask for, rounded up to a whole volt so the remedy itself passes."""
    return f"{math.ceil(value - 1e-6):d} V"


@dataclass(frozen=True)
class _Rating:
    """One part's voltage rating and what it must reach."""

    subject: str
    field: str  # the build path of the rating
    rated: float | None  # V
    floor: float  # V: below it the part fails at full charge (stop)
    required: float  # V: the rating it should have, margin included
    short: Severity  # between floor and required
    why: str  # how ``required`` is formed, in words
    remedy: str
    sources: tuple[Source, ...]


def _judge(part: _Rating) -> Finding:
    need = f"it needs at least {_n(part.required)} V ({part.why})"
    if part.rated is None:
        return Finding(
            Severity.UNASSESSED,
            part.subject,
            f"Its voltage rating is not given; {need}.",
            missing=(part.field,),
            sources=part.sources,
        )
    if part.rated < part.floor - _EPSILON:
        severity = Severity.STOP
        tail = f", below the {_n(part.floor)} V it sees at full charge"
    elif part.rated < part.required - _EPSILON:
        severity, tail = part.short, ", above the voltage it sees but short of the margin"
    else:
        severity, tail = Severity.PASS, ""
    return Finding(
        severity,
        part.subject,
        f"Rated {_n(part.rated)} V{tail}; {need}.",
        quantity(part.rated, "V"),
        quantity(part.required, "V"),
        Comparison.AT_LEAST,
        None if severity is Severity.PASS else part.remedy,
        (*part.sources, DATASHEET),
    )


def _maybe(amount: pint.Quantity | None) -> float | None:
    return None if amount is None else derived.in_unit(amount, "V")


def _factor(profile: Profile, key: str) -> tuple[float, Source]:
    limit = profile.limit(key)
    return float(limit.value), limit.source  # type: ignore[arg-type]


def _switch_parts(
    controller: Controller, full: float, profile: Profile
) -> Iterator[_Rating | Assumption]:
    diode = controller.freewheel_diode
    clamped, clamped_source = _factor(profile, "voltage.switch_margin.with_diode")
    bare, bare_source = _factor(profile, "voltage.switch_margin.without_diode")
    factor, source = (clamped, clamped_source) if diode else (bare, bare_source)
    if diode:
        how = "a freewheel diode clamps the turn-off spike"
    elif diode is False:
        how = "no freewheel diode clamps the turn-off spike"
    else:
        how = "the build does not say a freewheel diode clamps the turn-off spike"
        yield Assumption(
            "controller.freewheel_diode not given: the switch is held to the margin for an "
            "unclamped turn-off spike.",
            bare_source,
        )
    remedy = f"use a switch rated at least {_volts_up(full * factor)}"
    if not diode:
        remedy += (
            f", or fit a freewheel diode across the motor, after which "
            f"{_volts_up(full * clamped)} suffices"
        )
    yield _Rating(
        "motor switch",
        "controller.switch_max_voltage",
        _maybe(controller.switch_max_voltage),
        full,
        full * factor,
        Severity.FIX,
        f"{_n(factor)} x the {_n(full)} V full pack, as {how}",
        remedy,
        (CELL_LIMITS, SWITCH_SPIKE, source),
    )
    if diode or (diode is None and controller.diode_reverse_voltage is not None):
        margin, margin_source = _factor(profile, "voltage.diode_margin")
        yield _Rating(
            "freewheel diode",
            "controller.diode_reverse_voltage",
            _maybe(controller.diode_reverse_voltage),
            full,
            full * margin,
            Severity.ADVISE,
            f"{_n(margin)} x the {_n(full)} V full pack it blocks while the switch conducts",
            f"use a diode with a reverse rating of at least {_volts_up(full * margin)}",
            (CELL_LIMITS, SWITCH_SPIKE, margin_source),
        )


def _parts(build: Build, full: float, profile: Profile) -> Iterator[_Rating | Assumption]:
    """Every part in the build that the pack voltage reaches, with its requirement."""
    pack = f"the {_n(full)} V full pack"
    if build.controller is not None:
        yield from _switch_parts(build.controller, full, profile)
    regulator = build.logic.regulator if build.logic is not None else None
    if regulator is not None and regulator.fed_from_pack:
        yield _Rating(
            "logic regulator input",
            "logic.regulator.input_max",
            _maybe(regulator.input_max),
            full,
            full,
            Severity.STOP,
            pack,
            f"use a regulator rated for at least {_volts_up(full)} input",
            (CELL_LIMITS,),
        )
    blade = blade_fuse_voltage(full)
    for index, fuse in enumerate(build.fuses):
        remedy = f"use a fuse rated at least {_n(full)} V DC"
        if blade is not None:
            remedy += f" (a {_n(blade)} V ISO 8820-3 blade fuse qualifies)"
        yield _Rating(
            f"fuse '{fuse.name}'",
            f"fuses[{index}].voltage_rating",
            _maybe(fuse.voltage_rating),
            full,
            full,
            Severity.STOP,
            f"{pack}, DC",
            remedy,
            (CELL_LIMITS, FUSE_VOLTAGE),
        )
    brake = build.brake
    if brake is not None and any(
        value is not None
        for value in (brake.relay_contact_rating, brake.relay_contact_voltage, brake.coil_current)
    ):
        yield _Rating(
            "brake relay contacts",
            "brake.relay_contact_voltage",
            _maybe(brake.relay_contact_voltage),
            full,
            full,
            Severity.STOP,
            f"{pack}, DC",
            f"use a relay whose contacts are rated at least {_volts_up(full)} DC",
            (CELL_LIMITS, RELAY_ARC),
        )


def _motor_findings(
    build: Build, battery: Battery, full: float, profile: Profile
) -> Iterator[Finding]:
    advise, advise_source = _factor(profile, "voltage.motor_overvoltage.advise")
    fix, fix_source = _factor(profile, "voltage.motor_overvoltage.fix")
    cell_full = derived.cell_voltages(battery).full
    for index, motor in enumerate(build.motors):
        subject = f"motor '{motor.name}'"
        if motor.rated_voltage is None:
            yield Finding(
                Severity.UNASSESSED,
                subject,
                f"Its rated voltage is not given, so the overspeed on the {_n(full)} V full "
                "pack cannot be worked out.",
                missing=(f"motors[{index}].rated_voltage",),
                sources=(MOTOR_SPEED,),
            )
            continue
        rated = derived.in_unit(motor.rated_voltage, "V")
        ratio = full / rated
        text = (
            f"The {_n(full)} V full pack is {ratio:.2f} x the motor's {_n(rated)} V rating, so it "
            f"spins up to {ratio:.2f} x its rated no-load speed."
        )
        if ratio <= advise + _EPSILON:
            severity, sources = Severity.PASS, (MOTOR_SPEED, advise_source)
        elif ratio <= fix + _EPSILON:
            severity, sources = Severity.ADVISE, (MOTOR_SPEED, advise_source)
        else:
            severity, sources = Severity.FIX, (MOTOR_SPEED, fix_source)
        cells = math.floor(advise * rated / cell_full + _EPSILON)
        remedy = f"use a motor rated at least {_volts_up(full / advise)}"
        if cells >= 1:
            remedy = (
                f"use at most {cells} cells in series ({_n(cells * cell_full)} V full); or "
                + remedy
            )
        yield Finding(
            severity,
            subject,
            text,
            quantity(full, "V"),
            quantity(rated * advise, "V"),
            Comparison.AT_MOST,
            None if severity is Severity.PASS else remedy,
            (CELL_LIMITS, *sources),
        )


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Each part's voltage rating against the pack's full-charge voltage.

    What it checks
      The full pack voltage is ``battery.cells_series`` x the chemistry's full-charge cell
      voltage (from memory: Linden; 4.2 V Li-ion and LiPo, 3.65 V LiFePO4). One finding for
      each part present:
      - motor switch (``controller.switch_max_voltage``): at least full x the profile's
        ``voltage.switch_margin.with_diode`` (1.25) when ``controller.freewheel_diode`` is
        true, else ``voltage.switch_margin.without_diode`` (2; also when not stated, noted as
        an assumption): the winding's turn-off spike rides on the supply;
      - freewheel diode (``controller.diode_reverse_voltage``, when a diode is fitted): at
        least full x ``voltage.diode_margin`` (1.25); it blocks the supply while the switch
        conducts;
      - logic regulator (``logic.regulator.input_max``, when ``fed_from_pack``): at least full;
      - every fuse (``fuses[i].voltage_rating``, DC): at least full; a fuse interrupts only at
        or below its rated voltage (ISO 8820-3 blade fuses come in 32 V and 58 V: a 32 V fuse
        is invalid on a 10-cell Li-ion pack at 42 V);
      - brake relay contacts (``brake.relay_contact_voltage``, DC, when the brake has a relay):
        at least full;
      - every motor (``motors[i].rated_voltage``): its speed scales with voltage, so full over
        rated is its overspeed ratio, within ``voltage.motor_overvoltage.advise`` (1.25).

    Severities
      - stop: a switch, diode, regulator, fuse or relay rated below the full pack voltage.
      - fix: a switch between full voltage and its spike margin; a motor's overspeed ratio
        above ``voltage.motor_overvoltage.fix`` (1.5).
      - advise: a diode between full voltage and its margin; a motor's ratio between 1.25 and
        1.5.
      - pass: rated at or above its requirement; a build with no rated part besides the pack.
      - unassessed: no ``battery``; a present part's rating not given (the field is named).

    Remedies name the voltage to buy, rounded up to a whole volt, or the cells in series
    that keep a motor within its margin.
    """
    battery = build.battery
    if battery is None:
        yield Finding(
            Severity.UNASSESSED,
            "voltage ratings",
            "No battery is described, so the voltage the parts see is unknown.",
            missing=("battery",),
            sources=(CELL_LIMITS,),
        )
        return
    full = derived.pack_voltages(battery).full
    cell = derived.cell_voltages(battery)
    yield DerivedFigure(
        "pack full voltage",
        quantity(full, "V"),
        f"{battery.cells_series} cells in series at {_n(cell.full)} V",
        order=20,
    )
    found = False
    for part in _parts(build, full, profile):
        if isinstance(part, Assumption):
            yield part
            continue
        found = True
        yield _judge(part)
    for finding in _motor_findings(build, battery, full, profile):
        found = True
        yield finding
    if not found:
        yield Finding(
            Severity.PASS,
            "voltage ratings",
            f"The build describes no controller, pack-fed regulator, fuse, brake relay or motor "
            f"whose rating the {_n(full)} V full pack could exceed; nothing more applies.",
            sources=(CELL_LIMITS,),
        )


RULE = Rule(
    id="voltage.ratings",
    title="Part voltage ratings against the full pack voltage",
    check=check,
    sources=(CELL_LIMITS, SWITCH_SPIKE, FUSE_VOLTAGE, RELAY_ARC, MOTOR_SPEED),
    inputs=(
        "battery.chemistry",
        "battery.cells_series",
        "controller.switch_max_voltage",
        "controller.freewheel_diode",
        "controller.diode_reverse_voltage",
        "logic.regulator.input_max",
        "logic.regulator.fed_from_pack",
        "fuses[].voltage_rating",
        "brake.relay_contact_voltage",
        "motors[].rated_voltage",
    ),
    severities=(
        Severity.STOP,
        Severity.FIX,
        Severity.ADVISE,
        Severity.PASS,
        Severity.UNASSESSED,
    ),
)
