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
from firstride_rules._shared import voltage_rating as ratings
from firstride_rules._shared.voltage_rating import VoltageRating, whole_volts_up

from reviewer import figures
from reviewer.build import Battery, Build, Controller, MotorType
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
from reviewer.units import format_number, in_unit, quantity

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


@dataclass(frozen=True)
class _Part:
    """One part the pack reaches: its rating, judged as every rule that checks it judges it
    (``firstride_rules._shared.voltage_rating.VoltageRating``), and the sources this rule
    cites for it."""

    subject: str
    rating: VoltageRating
    sources: tuple[Source, ...]


def _judge(part: _Part) -> Finding:
    rated = part.rating.rated is not None
    return part.rating.finding(part.subject, (*part.sources, DATASHEET) if rated else part.sources)


def _maybe(amount: pint.Quantity | None) -> float | None:
    return None if amount is None else in_unit(amount, "V")


def _factor(profile: Profile, key: str) -> tuple[float, Source]:
    limit = profile.limit(key)
    return float(limit.value), limit.source  # type: ignore[arg-type]


BRIDGE = Source.from_memory(
    "Mohan, Undeland and Robbins, Power Electronics: each switch of a three-phase inverter bridge "
    "has an antiparallel diode that carries the phase current when the switch opens, clamping "
    "the turn-off spike to the supply"
)
CONTROLLER_INPUT = Source(
    "The controller's datasheet maximum input voltage, as entered in the build", SourceStatus.USER
)


def _bridge(build: Build) -> bool:
    """A three-phase bridge drives every motor (all brushless): no freewheel diode applies."""
    return bool(build.motors) and all(m.type is MotorType.BRUSHLESS for m in build.motors)


def _switch_parts(
    build: Build, controller: Controller, full: float, profile: Profile
) -> Iterator[_Part | Assumption]:
    clamped, clamped_source = _factor(profile, "voltage.switch_margin.with_diode")
    if controller.max_input_voltage is not None or (
        controller.switch_max_voltage is None and _bridge(build)
    ):
        # A sealed controller: its datasheet input maximum is the rating the pack meets; the
        # spike margin inside is the maker's to keep.
        yield _Part(
            "controller input",
            VoltageRating(
                "controller.max_input_voltage",
                _maybe(controller.max_input_voltage),
                full,
                full,
                f"the {_n(full)} V full pack, within the controller's own datasheet maximum",
                f"use a controller rated for at least {whole_volts_up(full)} input, or a pack "
                "of fewer cells in series",
            ),
            (CELL_LIMITS, CONTROLLER_INPUT),
        )
        if controller.switch_max_voltage is None:
            return
    if _bridge(build):
        switch = VoltageRating(
            "controller.switch_max_voltage",
            _maybe(controller.switch_max_voltage),
            full,
            full * clamped,
            f"{_n(clamped)} x the {_n(full)} V full pack: the bridge's own diodes clamp the "
            "turn-off spike of a brushless motor, so no freewheel diode is asked for",
            f"use bridge switches rated at least {whole_volts_up(full * clamped)}",
            clamped_source,
        )
        yield _Part("bridge switches", switch, (CELL_LIMITS, BRIDGE, clamped_source))
        return
    diode = controller.freewheel_diode
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
    remedy = (
        f"use a switch rated at least {whole_volts_up(full * factor)} "
        "(controller.switch_max_voltage)"
    )
    if not diode:
        remedy += (
            f", or fit a freewheel diode across the motor (controller.freewheel_diode), after "
            f"which "
            f"{whole_volts_up(full * clamped)} suffices"
        )
    switch = VoltageRating(
        "controller.switch_max_voltage",
        _maybe(controller.switch_max_voltage),
        full,
        full * factor,
        f"{_n(factor)} x the {_n(full)} V full pack, as {how}",
        remedy,
        source,
    )
    yield _Part("motor switch", switch, (CELL_LIMITS, SWITCH_SPIKE, source))
    if diode or (diode is None and controller.diode_reverse_voltage is not None):
        reverse = ratings.diode_reverse_rating(build, profile)
        assert reverse is not None and reverse.margin_source is not None  # the pack is known
        yield _Part("freewheel diode", reverse, (CELL_LIMITS, SWITCH_SPIKE, reverse.margin_source))


def _parts(build: Build, full: float, profile: Profile) -> Iterator[_Part | Assumption]:
    """Every part in the build that the pack voltage reaches, with its requirement."""
    if build.controller is not None:
        yield from _switch_parts(build, build.controller, full, profile)
    regulator = ratings.regulator_input_rating(build)
    if regulator is not None:
        yield _Part("logic regulator input", regulator, (CELL_LIMITS,))
    for index, fuse in enumerate(build.fuses):
        rating = ratings.fuse_voltage_rating(build, index)
        assert rating is not None  # the pack is known
        yield _Part(f"fuse '{fuse.name}'", rating, (CELL_LIMITS, FUSE_VOLTAGE))
    relays = build.relay_brakes()
    for index, brake in relays:
        contacts = VoltageRating(
            f"brakes[{index}].relay_contact_voltage",
            _maybe(brake.relay_contact_voltage),
            full,
            full,
            f"the {_n(full)} V full pack, DC",
            f"use a relay whose contacts are rated at least {whole_volts_up(full)} DC",
        )
        name = "brake relay contacts"
        if len(relays) > 1:
            name += f" '{brake.name or f'brakes[{index}]'}'"
        yield _Part(name, contacts, (CELL_LIMITS, RELAY_ARC))


def _motor_findings(
    build: Build, battery: Battery, full: float, profile: Profile
) -> Iterator[Finding]:
    advise, advise_source = _factor(profile, "voltage.motor_overvoltage.advise")
    fix, fix_source = _factor(profile, "voltage.motor_overvoltage.fix")
    cell_full = figures.cell_voltages(battery).full
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
        rated = in_unit(motor.rated_voltage, "V")
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
        remedy = f"use a motor rated at least {whole_volts_up(full / advise)}"
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
      - logic regulator (``logic.regulator.input_max``, when ``fed_from_pack``): at least full,
        or ``battery.charger_voltage`` where that is higher (the logic may run while charging);
      - every fuse (``fuses[i].voltage_rating``, DC): at least full; a fuse interrupts only at
        or below its rated voltage (ISO 8820-3 blade fuses come in 32 V and 58 V: a 32 V fuse
        is invalid on a 10-cell Li-ion pack at 42 V);
      - brake relay contacts (``brakes[].relay_contact_voltage``, DC, when the brake has a relay):
        at least full;
      - every motor (``motors[i].rated_voltage``): its speed scales with voltage, so full over
        rated is its overspeed ratio, within ``voltage.motor_overvoltage.advise`` (1.25).

    The switch, diode, regulator and fuse ratings are judged by one shared ``VoltageRating``
    (``firstride_rules._shared``), which controller.freewheel, logic.regulator and
    protection.fuse use for the same parts: one judgement, one severity, one wording of the
    limit.

    Severities
      - stop: a switch, diode, regulator, fuse or relay rated below the voltage it sees.
      - fix: a switch or diode between the voltage it sees and its margin; a motor's overspeed
        ratio above ``voltage.motor_overvoltage.fix`` (1.5).
      - advise: a motor's ratio between 1.25 and 1.5.
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
    full = figures.pack_voltages(battery).full
    cell = figures.cell_voltages(battery)
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
        "battery.charger_voltage",
        "fuses[].voltage_rating",
        "brakes[].relay_contact_voltage",
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
