"""controller.freewheel: a path for a brushed motor's winding current when the switch opens, and a
freewheel diode rated for the voltage and current it will see."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from firstride_rules._shared import voltage_rating as ratings
from firstride_rules.controller._drive import (
    STALL,
    ceil_whole,
    current_limit,
    magnitude,
    number,
    stall_missing,
    worst_stall,
)

from reviewer import units as u
from reviewer.build import Build, Controller, MotorType
from reviewer.engineering.switching import worst_freewheel_average_current
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

AVALANCHE = Source.from_memory(
    "Mohan, Undeland and Robbins, Power Electronics: an inductive load switched off with no "
    "freewheel path drives its energy into the switch as avalanche; the freewheel diode carries "
    "the load current while the switch is off, on average about I (1 - D)"
)
WORST_DUTY = Source(
    "Worst duty for the diode: a locked rotor draws about D I_stall at duty D, up to the limit, "
    "so min(D I_stall, I_limit) (1 - D) peaks at D = 0.5 or where the limit is reached",
    SourceStatus.DERIVED,
)
BRIDGE = Source.from_memory(
    "Mohan, Undeland and Robbins, Power Electronics: each switch of a three-phase inverter "
    "bridge has an antiparallel diode that carries the phase current when the switch opens"
)
_A = u.unit("A")
SUBJECT = "freewheel diode"


@dataclass(frozen=True)
class _Needs:
    """What the diode must be rated for; None where an input is missing."""

    reverse: ratings.VoltageRating | None  # None without a battery
    voltage: float | None  # V reverse
    average: float | None  # A
    peak: float | None  # A
    missing_voltage: tuple[str, ...]
    missing_current: tuple[str, ...]
    average_bound: bool  # stall current unknown: the whole limit taken (D -> 0)
    voltage_factor: float


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """A freewheel path for each brushed motor, and the diode's ratings against what it carries.

    What it checks
      A brushed motor's winding is an inductor. When the PWM switch opens, its current must go
      on flowing: through a freewheel diode across the motor (``controller.freewheel_diode``),
      or, with none, into the switch as avalanche at every turn-off. Brushless motors are driven
      by a three-phase bridge whose switches' own diodes give that path, so they pass as such.
      A fitted diode's ratings are checked: ``diode_reverse_voltage`` against the pack's full
      voltage (``battery``) it blocks while the switch conducts, with the profile's
      ``voltage.diode_margin`` over it for turn-off ringing. That judgement is
      ``diode_reverse_rating`` (``firstride_rules._shared.voltage_rating``), the one
      voltage.ratings makes of the same diode, so the two agree on the figure, the severity
      and the words;
      ``diode_average_current`` at least the worst average current; ``diode_peak_current`` at
      least the current limit (``controller.motor_current_limit``), or the cold stall current with
      no limit.

    Formula
      The diode carries the motor current while the switch is off: on average I (1 - D). The
      worst duty is a locked rotor, where the current at duty D is about D I_stall (no
      back-EMF), held at the limit I_L once reached: min(D I_stall, I_L) (1 - D) is largest at
      D = I_L / I_stall, giving I_L (1 - I_L / I_stall), when I_L < I_stall / 2, and at D = 0.5,
      giving I_stall / 4, otherwise (and with no limit). I_stall is the cold stall current of the
      worst brushed motor on the full pack (shared stall loop). When the stall current is
      unknown but a limit is set, the bound D -> 0 is used: the whole limit, noted as an
      assumption.

    Severities
      - stop: a brushed motor and ``freewheel_diode`` false; a reverse rating below the full
        pack voltage.
      - fix: a reverse rating between the full pack voltage and its margin; a current rating
        below what the diode carries.
      - pass: every rating enough; or only brushless motors.
      - unassessed: no motors, ``freewheel_diode`` not stated, or a rating or the figure it is
        compared with unknown (the missing fields are named).

    Remedy: the diode to fit, e.g. "fit a diode rated at least 40 V reverse, 15 A average and
    30 A peak across the motor (cathode to its positive side)"; for the reverse rating alone,
    the reverse voltage to buy, rounded up to a whole volt.
    """
    if not build.motors:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject=SUBJECT,
            rationale="The build lists no motor, so no freewheel path can be checked.",
            missing=("motors",),
            sources=(AVALANCHE,),
        )
        return
    if not any(m.type is MotorType.BRUSHED for m in build.motors):
        yield Finding(
            severity=Severity.PASS,
            subject=SUBJECT,
            rationale=(
                "Every motor is brushless: the controller's three-phase bridge carries the "
                "winding current through its switches' diodes at each turn-off, so no separate "
                "freewheel diode applies."
            ),
            sources=(BRIDGE,),
        )
        return
    controller = build.controller
    if controller is None or controller.freewheel_diode is None:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject=SUBJECT,
            rationale=(
                "Whether a freewheel diode sits across the brushed motor is not stated; without "
                "one the switch takes the winding's energy at every turn-off."
            ),
            missing=("controller.freewheel_diode",),
            sources=(AVALANCHE,),
        )
        return
    voltage_factor = profile.limit("voltage.diode_margin")
    needs = _needs(build, profile, voltage_factor)
    if needs.average_bound:
        yield Assumption(
            "Stall current unknown: the freewheel diode's average current is taken as the whole "
            "current limit (the bound as the duty falls to zero).",
            AVALANCHE,
        )
    if needs.average is not None:
        yield DerivedFigure(
            "freewheel diode average current, worst duty",
            u.quantity(needs.average, _A),
            note="I (1 - D) over every duty, locked rotor",
            order=55,
        )
    if not controller.freewheel_diode:
        yield Finding(
            severity=Severity.STOP,
            subject=SUBJECT,
            rationale=(
                "No freewheel diode across the brushed motor: at every PWM turn-off the "
                "winding's stored energy has no path but through the switch, which takes it as "
                "avalanche until it fails."
            ),
            measured="none",
            limit="a freewheel diode",
            remedy=_diode_remedy(needs),
            sources=(AVALANCHE,),
        )
        return
    yield from _ratings(controller, needs, voltage_factor)


def _needs(build: Build, profile: Profile, voltage_factor: Limit) -> _Needs:
    reverse = ratings.diode_reverse_rating(build, profile)
    voltage = None if reverse is None else reverse.required
    limit = current_limit(build)
    stall = worst_stall(build, brushed_only=True)
    # With the stall current unknown, the bound as D -> 0: the whole limit.
    average = limit if stall is None else worst_freewheel_average_current(stall.current, limit)
    peak = limit if limit is not None else (stall.current if stall is not None else None)
    missing_current: tuple[str, ...] = ()
    if peak is None:
        missing_current = ("controller.motor_current_limit", *stall_missing(build))
    return _Needs(
        reverse=reverse,
        voltage=voltage,
        average=average,
        peak=peak,
        missing_voltage=() if voltage is not None else ("battery",),
        missing_current=missing_current,
        average_bound=stall is None and limit is not None,
        voltage_factor=number(voltage_factor),
    )


def _diode_remedy(needs: _Needs) -> str:
    parts = []
    if needs.voltage is not None:
        parts.append(f"{ceil_whole(needs.voltage)} V reverse")
    if needs.average is not None:
        parts.append(f"{ceil_whole(needs.average)} A average")
    if needs.peak is not None:
        parts.append(f"{ceil_whole(needs.peak)} A peak")
    if not parts:
        return (
            "fit a diode across the motor (cathode to its positive side) rated at least "
            f"{needs.voltage_factor:g} x the pack's full voltage and the motor's stall current"
        )
    listed = parts[0] if len(parts) == 1 else ", ".join(parts[:-1]) + " and " + parts[-1]
    return (
        f"fit a diode rated at least {listed} across the motor (cathode to its positive side), "
        "then set controller.freewheel_diode = true with its ratings"
    )


def _ratings(controller: Controller, needs: _Needs, voltage_factor: Limit) -> Iterator[Finding]:
    f = u.format_number
    reverse_sources = (AVALANCHE, voltage_factor.source)
    if needs.reverse is not None:
        # judged as voltage.ratings judges the same diode: one function, one severity
        yield needs.reverse.finding(f"{SUBJECT} reverse voltage", reverse_sources)
    else:
        missing = (
            ()
            if controller.diode_reverse_voltage is not None
            else ("controller.diode_reverse_voltage",)
        )
        yield Finding(
            severity=Severity.UNASSESSED,
            subject=f"{SUBJECT} reverse voltage",
            rationale=(
                f"The diode's reverse voltage is checked against the pack's full voltage times "
                f"{needs.voltage_factor:g}, for turn-off ringing; an input is missing."
            ),
            missing=(*missing, *needs.missing_voltage),
            sources=reverse_sources,
        )
    checks = (
        (
            "average current",
            controller.diode_average_current,
            _A,
            needs.average,
            needs.missing_current,
            "the worst average current I (1 - D), at the duty of a locked rotor",
            (AVALANCHE, WORST_DUTY, STALL),
        ),
        (
            "peak current",
            controller.diode_peak_current,
            _A,
            needs.peak,
            needs.missing_current,
            "the motor current it takes over at turn-off (the current limit, else the stall "
            "current)",
            (AVALANCHE, STALL),
        ),
    )
    for what, rating, unit, needed, missing_inputs, basis, sources in checks:
        field = "diode_" + what.replace(" ", "_")
        subject = f"{SUBJECT} {what}"
        missing = (() if rating is not None else (f"controller.{field}",)) + missing_inputs
        if missing or rating is None or needed is None:
            yield Finding(
                severity=Severity.UNASSESSED,
                subject=subject,
                rationale=f"The diode's {what} is checked against {basis}; an input is missing.",
                missing=missing,
                sources=sources,
            )
            continue
        rated = magnitude(rating, unit)
        symbol = u.unit_symbol(unit)
        short = rated < needed * (1 - 1e-9)
        yield Finding(
            severity=Severity.FIX if short else Severity.PASS,
            subject=subject,
            rationale=(
                f"The diode is rated {f(rated)} {symbol} {what}; it needs at least "
                f"{f(needed)} {symbol}, {basis}."
            ),
            measured=u.quantity(rated, unit),
            limit=u.quantity(needed, unit),
            comparison=Comparison.AT_LEAST,
            remedy=_diode_remedy(needs) if short else None,
            sources=sources,
        )


RULE = Rule(
    id="controller.freewheel",
    title="Freewheel path and diode ratings for a brushed motor",
    check=check,
    sources=(AVALANCHE, WORST_DUTY, BRIDGE, STALL),
    inputs=(
        "motors[].type",
        "controller.freewheel_diode",
        "controller.diode_reverse_voltage",
        "controller.diode_average_current",
        "controller.diode_peak_current",
        "controller.motor_current_limit",
        "battery",
        "motors[].winding_resistance",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
