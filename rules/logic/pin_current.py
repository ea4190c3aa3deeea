"""logic.pin-current: current on each logic pin, port group and package against the part's own
datasheet limits, and inductive loads switched from logic."""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules.logic._tally import (
    Tally,
    diode_words,
    driver_words,
    grade,
    ma,
    number,
    over_by,
    pin_tallies,
    pins_of,
    quoted,
)

from reviewer.build import Build, Logic, PinLoad
from reviewer.engineering.pins import (
    allowed_current,
    even_share,
    pin_side_current,
    worst_group_current,
    worst_pin_current,
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
from reviewer.profile import Limit, Profile
from reviewer.rule import Output, Rule
from reviewer.units import format_number, in_unit, quantity, unit

# The cached unit object: build fields in mA share it, so in_unit reads them without converting.
MA = unit("mA")
DATASHEET = Source(
    "The logic part's datasheet absolute maximum ratings, as entered in the build",
    SourceStatus.USER,
)
INDUCTIVE_KICK = Source(
    "Faraday's law, v = L di/dt: interrupting a coil's current with no freewheel path drives "
    "its voltage far beyond the supply"
)
FLYBACK_PRACTICE = Source.from_memory(
    "Horowitz and Hill, The Art of Electronics: a diode across a relay coil clamps the "
    "turn-off spike; drive coils through a transistor switch"
)
COIL_REMEDY = (
    "drive the coil through a logic-level MOSFET or NPN transistor and fit a flyback diode "
    "across the coil"
)
SWITCH_REMEDY = "drive it through a logic-level MOSFET or NPN transistor"


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Current through each logic pin, port group and the package, and coils on logic pins.

    The builder enters the logic part's own datasheet limits: ``logic.pin_current_max``
    (absolute maximum per pin), ``logic.port_groups`` (pins sharing a supply rail, each with its
    ``current_max``) and ``logic.total_current_max`` (the package), and the loads on its pins
    (``logic.loads``: pins, current, inductive, flyback_diode, driver).

    Pin-side current of a load: the whole load when ``driver`` is ``pin``; load / forced gain
    (profile ``logic.transistor_forced_gain``) for a bipolar transistor's base; 0 for a MOSFET
    gate or a driver IC's input (noted as an assumption).

    Paralleled pins do not share evenly, so over n pins the worst pin is counted at
    ``logic.parallel_pin_imbalance`` x I/n, capped at I; a port group holding k of the n pins
    at imbalance x I k/n, capped at I. The package total is the plain sum of pin-side currents.
    Each is compared with the datasheet maximum times the profile fraction
    (``logic.pin_current_fraction`` for pins, ``logic.total_current_fraction`` for groups and
    the package).

    Severities
      - stop: a pin, group or package over the datasheet absolute maximum itself; an inductive
        load (relay coil) with no flyback diode (false or not stated), whatever drives it:
        the turn-off spike lands on the driver.
      - fix: over the derated limit; an inductive load driven straight from logic pins.
      - advise: a load shared over paralleled pins (uneven sharing).
      - pass: within the derated limits; a load with a suitable driver and diode.
      - unassessed: no ``logic`` section, no ``logic.loads``, or no
        ``logic.pin_current_max`` / ``logic.total_current_max`` (named in the finding).

    Remedies give values: the per-pin ceiling, the current to move off a port group or the
    package, and a MOSFET or transistor driver with a flyback diode for coils.
    """
    logic = build.logic
    if logic is not None and not logic.present:
        yield Finding(
            severity=Severity.PASS,
            subject="logic pins",
            rationale="The build states there is no separate logic board (logic.present = "
            "false): no pin, port group or package currents and no coils on logic pins to "
            "check; the controller's own electronics are judged by the controller rules.",
            sources=(DATASHEET,),
        )
        return
    missing_limits = _missing_limits(logic)
    if logic is None or not logic.loads:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject="logic pins",
            rationale="No logic part with loads on its pins is described, so pin currents "
            "could not be checked.",
            sources=(DATASHEET,),
            missing=("logic.loads", *missing_limits),
        )
        return
    pin_fraction = number(profile.limit("logic.pin_current_fraction"))
    total_fraction = number(profile.limit("logic.total_current_fraction"))
    imbalance_limit = profile.limit("logic.parallel_pin_imbalance")
    imbalance = number(imbalance_limit)
    gain = number(profile.limit("logic.transistor_forced_gain"))

    drawn: dict[str, float] = {}
    for load in logic.loads:
        drawn[load.name] = pin_side_current(in_unit(load.current, MA), load.driver, gain)
    yield from _driver_assumptions(logic)

    for index, load in enumerate(logic.loads):
        if load.inductive is None and not (load.flyback_diode is True and load.driver != "pin"):
            yield _unknown_coil(load, index)
            continue
        yield _load_finding(load, index, drawn[load.name], imbalance, imbalance_limit)

    tallies = pin_tallies(logic, drawn, imbalance)
    yield from _pin_findings(logic, tallies, pin_fraction, profile, imbalance)
    yield from _group_findings(logic, drawn, imbalance, total_fraction, profile)
    yield from _total_finding(logic, drawn, total_fraction, profile)


def _missing_limits(logic: Logic | None) -> tuple[str, ...]:
    names = []
    if logic is None or logic.pin_current_max is None:
        names.append("logic.pin_current_max")
    if logic is None or logic.total_current_max is None:
        names.append("logic.total_current_max")
    return tuple(names)


def _driver_assumptions(logic: Logic) -> Iterator[Assumption]:
    drivers = {load.driver for load in logic.loads}
    if "transistor" in drivers:
        yield Assumption(
            "A transistor-driven load draws its collector current / forced gain from the logic "
            "pin (saturated switch).",
            FLYBACK_PRACTICE,
        )
    if drivers & {"mosfet", "driver-ic"}:
        yield Assumption(
            "A MOSFET gate or driver-IC input is taken to draw no steady current from its "
            "logic pin."
        )


def _unknown_coil(load: PinLoad, index: int) -> Finding:
    """A load whose inductance is not stated: it may be a relay, solenoid or motor coil, whose
    turn-off spike needs a flyback path, so it is never passed as a plain resistive load."""
    return Finding(
        severity=Severity.UNASSESSED,
        subject=f"load '{load.name}'",
        rationale=(
            "Whether it is inductive (a relay, solenoid or motor coil) is not stated, so "
            "neither its turn-off spike nor its flyback diode can be judged."
        ),
        missing=(f"logic.loads[{index}].inductive",),
        sources=(INDUCTIVE_KICK,),
    )


def _load_finding(
    load: PinLoad, index: int, drawn: float, imbalance: float, imbalance_limit: Limit
) -> Finding:
    subject = f"load '{load.name}'"
    pins = pins_of(load)
    current = in_unit(load.current, MA)
    issues: list[tuple[Severity, str]] = []
    remedies: list[str] = []
    sources: list[Source] = []
    diode_rating = f"rated for at least {ma(current)} and the coil's supply voltage"
    if load.inductive and load.flyback_diode is not True:
        stated = "is not stated" if load.flyback_diode is None else "is absent"
        issues.append(
            (
                Severity.STOP,
                f"It is inductive and its flyback diode {stated}: at turn-off the coil's "
                f"{ma(current)} has no path and its voltage spikes onto the {load.driver}.",
            )
        )
        sources += [INDUCTIVE_KICK, FLYBACK_PRACTICE]
    if load.inductive and load.driver == "pin":
        issues.append(
            (Severity.FIX, f"The coil is driven straight from logic pin(s) {', '.join(pins)}.")
        )
        remedies.append(
            f"{COIL_REMEDY} ({diode_rating}; then logic.loads[{index}].driver and "
            f"logic.loads[{index}].flyback_diode = true)"
        )
        sources.append(FLYBACK_PRACTICE)
    elif load.inductive and load.flyback_diode is not True:
        remedies.append(
            f"fit a flyback diode across the coil ({diode_rating}; then "
            f"logic.loads[{index}].flyback_diode = true)"
        )
    if len(pins) > 1:
        share = even_share(drawn, len(pins))
        worst = worst_pin_current(drawn, len(pins), imbalance)
        issues.append(
            (
                Severity.ADVISE,
                f"It is shared over {len(pins)} paralleled pins ({', '.join(pins)}), which do "
                f"not share evenly: one pin may carry {ma(worst)} rather than the even "
                f"{ma(share)}.",
            )
        )
        if not (load.inductive and load.driver == "pin"):
            remedies.append(
                f"drive '{load.name}' from one pin and {SWITCH_REMEDY} "
                f"(logic.loads[{index}].pins, logic.loads[{index}].driver)"
            )
        sources.append(imbalance_limit.source)
    if not issues:
        return Finding(
            severity=Severity.PASS,
            subject=subject,
            rationale=f"{ma(current)} load driven by {driver_words(load)} on "
            f"{', '.join(pins)}{diode_words(load)}.",
            measured=quantity(drawn, MA),
            sources=(DATASHEET,),
        )
    severity = min((s for s, _ in issues), key=lambda s: s.rank)
    return Finding(
        severity=severity,
        subject=subject,
        rationale=f"{ma(current)} load driven by {driver_words(load)}. "
        + " ".join(text for _, text in issues),
        measured=quantity(drawn, MA),
        remedy="; ".join(remedies) or None,
        sources=tuple(dict.fromkeys(sources)),
    )


def _pin_findings(
    logic: Logic, tallies: dict[str, Tally], fraction: float, profile: Profile, imbalance: float
) -> Iterator[Finding]:
    if logic.pin_current_max is None:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject="each pin",
            rationale="The part's per-pin absolute maximum current is not given.",
            sources=(DATASHEET,),
            missing=("logic.pin_current_max",),
        )
        return
    maximum = in_unit(logic.pin_current_max, MA)
    allowed = allowed_current(maximum, fraction)
    sources = (DATASHEET, profile.limit("logic.pin_current_fraction").source)
    for pin, tally in tallies.items():
        severity = grade(tally.worst, maximum, allowed)
        uneven = (
            f" (even share {ma(tally.even)}, x{format_number(imbalance)} for paralleled pins)"
            if tally.worst > tally.even
            else ""
        )
        rationale = (
            f"Pin {pin} carries up to {ma(tally.worst)}{uneven} for "
            f"{quoted(tally.loads)}; the datasheet maximum is "
            f"{ma(maximum)} and the profile keeps pins at or below "
            f"{format_number(fraction * 100)} % of it, {ma(allowed)}."
        )
        remedy = None
        if severity is not Severity.PASS:
            excess = over_by(tally.worst, allowed)
            remedy = (
                f"keep each pin at or below {ma(allowed)}: move {excess} mA off pin {pin}, "
                f"e.g. drive {quoted(tally.loads)} through a logic-level MOSFET or NPN "
                "transistor (logic.loads[].pins, logic.loads[].driver)"
            )
        yield Finding(
            severity=severity,
            subject=f"pin {pin}",
            rationale=rationale,
            measured=quantity(tally.worst, MA),
            limit=quantity(allowed, MA),
            comparison=Comparison.AT_MOST,
            remedy=remedy,
            sources=sources,
        )


def _group_findings(
    logic: Logic, drawn: dict[str, float], imbalance: float, fraction: float, profile: Profile
) -> Iterator[Finding]:
    sources = (DATASHEET, profile.limit("logic.total_current_fraction").source)
    for group in logic.port_groups:
        members = set(group.pins)
        current = 0.0
        for load in logic.loads:
            pins = pins_of(load)
            inside = sum(1 for pin in pins if pin in members)
            current += worst_group_current(drawn[load.name], inside, len(pins), imbalance)
        maximum = in_unit(group.current_max, MA)
        allowed = allowed_current(maximum, fraction)
        severity = grade(current, maximum, allowed)
        remedy = None
        if severity is not Severity.PASS:
            remedy = (
                f"move {over_by(current, allowed)} mA off port group {group.name} "
                f"(keep it at or below {ma(allowed)}), e.g. onto another group or through "
                "a transistor or MOSFET driver"
            )
        yield Finding(
            severity=severity,
            subject=f"port group {group.name}",
            rationale=f"Port group {group.name} carries up to {ma(current)}, counting "
            f"uneven sharing of loads split across groups; its datasheet maximum is "
            f"{ma(maximum)} and the profile allows {format_number(fraction * 100)} % of it, "
            f"{ma(allowed)}.",
            measured=quantity(current, MA),
            limit=quantity(allowed, MA),
            remedy=remedy,
            sources=sources,
        )


def _total_finding(
    logic: Logic, drawn: dict[str, float], fraction: float, profile: Profile
) -> Iterator[Output]:
    total = sum(drawn.values())
    yield DerivedFigure("logic pins, total current", quantity(total, MA), order=80)
    if logic.total_current_max is None:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject="package total",
            rationale=f"The loads draw {ma(total)} from the part's pins in all, but its "
            "total (package) maximum current is not given.",
            sources=(DATASHEET,),
            missing=("logic.total_current_max",),
        )
        return
    maximum = in_unit(logic.total_current_max, MA)
    allowed = allowed_current(maximum, fraction)
    severity = grade(total, maximum, allowed)
    remedy = None
    if severity is not Severity.PASS:
        remedy = (
            f"move {over_by(total, allowed)} mA of load off the part's pins (keep the "
            f"package at or below {ma(allowed)}): {SWITCH_REMEDY}"
        )
    yield Finding(
        severity=severity,
        subject="package total",
        rationale=f"The loads draw {ma(total)} from the part's pins in all; its datasheet "
        f"maximum is {ma(maximum)} and the profile allows {format_number(fraction * 100)} % "
        f"of it, {ma(allowed)}.",
        measured=quantity(total, MA),
        limit=quantity(allowed, MA),
        remedy=remedy,
        sources=(DATASHEET, profile.limit("logic.total_current_fraction").source),
    )


RULE = Rule(
    id="logic.pin-current",
    title="Logic pin, port and package current",
    check=check,
    sources=(DATASHEET, INDUCTIVE_KICK, FLYBACK_PRACTICE),
    inputs=(
        "logic.present",
        "logic.pins",
        "logic.pin_current_max",
        "logic.total_current_max",
        "logic.port_groups",
        "logic.loads",
    ),
    severities=(
        Severity.STOP,
        Severity.FIX,
        Severity.ADVISE,
        Severity.PASS,
        Severity.UNASSESSED,
    ),
)
