"""brake.stopping: how far each rider travels to a standstill from the highest speed the build
reaches, with every brake and with the electric brake lost, on the flat and on the steepest
descent; and that some brake stops the vehicle without the drive electronics.
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import replace

from firstride_rules._shared.wording import drive_model
from firstride_rules.brake._capability import (
    FRICTION_FIELDS,
    BrakeEffect,
    brake_label,
    combined,
    effects_for,
    grip_caps,
    reference_distance,
    stopping_distance,
)

from reviewer import units as u
from reviewer.build import Build, Rider
from reviewer.engineering.roadload import STANDARD_GRAVITY, Drive, ms_to_kmh
from reviewer.engineering.stopping import grade_percent_to_angle
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
from reviewer.units import in_unit

KINEMATICS = Source(
    "Stopping distance s = v t_r + v^2 / (2 (a - g sin theta)) on a descent of angle theta; "
    "tyre friction caps a at mu g cos theta (constant-deceleration kinematics, Coulomb friction)",
    SourceStatus.DERIVED,
)
INDEPENDENT = Source.common_practice(
    "A brake that acts through the motor is lost with the drive electronics: a pack cut-off, a "
    "BMS trip, a full pack refusing regenerative current, a failed controller. A vehicle needs "
    "a brake that stops it without them"
)
FLAT = Source(
    "Road load F = m g Crr + 0.5 rho CdA v^2; rho 1.225 kg/m^3 (ISA), g 9.80665 m/s^2 (CGPM)"
)
_M = u.unit("m")
_MS2 = u.unit("m/s**2")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Each rider's stopping distance from the build's top speed and its steepest descent's
    speed, with all brakes and without the electric ones, against the profile's minimum
    deceleration; and a brake that works without the drive electronics.

    What it checks
      1. Some brake in ``brakes`` is not electric (friction or foot): a dynamic or
         regenerative brake is lost with the electronics or a full pack.
      2. For each rider (mass with ``vehicle.mass``), from the flat top speed of the drive
         model (``speed.rider-class``'s) and from the speed down ``usage.steepest_grade`` at
         full throttle (the higher; a motor above its no-load speed taken to brake nothing):
         the distance to standstill after the profile's ``brake.reaction_time`` (speed gained
         downhill during it counted), each brake's deceleration (``brakes[].force``,
         ``deceleration`` or a tested stop, at ``tested_with_mass``; dynamic and
         regenerative worked from the motor and controller) capped per axle by the tyres'
         grip on a dry road (``brake.tyre_friction.dry`` x ``brake.axle_share.*``; wet-road
         figures given too). Rolling resistance and drag, which help, are left out.
      3. Against the distance a brake of exactly the profile's ``brake.minimum_deceleration``
         makes from the same speed on the flat, with every brake; without the electric
         brakes, against ``brake.single_brake_fraction`` of it.

    Severities
      - stop: no brake at all (``brakes = []``); no brake independent of the drive
        electronics; a brake set that cannot bring the vehicle to a standstill (on the flat
        or the descent).
      - fix: a stop longer than the reference distance.
      - pass: within the reference; a brake whose figure is unknown is counted as nothing,
        which the review states.
      - unassessed: no ``brakes`` list; no riders or drive-model inputs; a shortfall where
        some brake's figure is unknown (named); no ``usage.steepest_grade`` for the descent.

    Remedies give the deceleration the brakes must reach together (or the friction brake
    alone), on the flat or the descent, and point to a front brake where grip limits it.
    """
    brakes = build.brakes
    if brakes is None:
        yield Finding(
            Severity.UNASSESSED,
            "stopping",
            "The build lists no brakes (no [[brakes]] tables and no brakes = []), so what "
            "stops the vehicle is not known.",
            missing=("brakes",),
        )
        return
    minimum = profile.limit("brake.minimum_deceleration")
    needed = in_unit(minimum.quantity, _MS2)
    if not brakes:
        yield Finding(
            Severity.STOP,
            "brake independent of the drive electronics",
            "The build declares no brake (brakes = []): nothing but rolling resistance and "
            "drag slows it, and nothing stops it or holds it on a slope.",
            measured="none",
            limit="a brake",
            remedy="fit a friction brake (disc, drum or rim) that reaches "
            f"{u.format_number(needed)} m/s² and holds the vehicle on a slope ({FRICTION_FIELDS})",
            sources=(INDEPENDENT, minimum.source),
        )
        return
    yield _independence(build, profile, needed, minimum)
    drive, notes, missing = drive_model(build, profile)
    lacking = (("riders",) if not build.riders else ()) + tuple(missing)
    if drive is None or lacking:
        yield Finding(
            Severity.UNASSESSED,
            "stopping distances",
            "The stopping distances start from each rider's top speed, which needs the riders, "
            "the vehicle's mass, the pack, each motor's Kv and winding resistance, the "
            "reduction and the wheel diameter.",
            missing=lacking,
            sources=(KINEMATICS,),
        )
        return
    yield Assumption(
        "Top speed is solved on flat ground in still air at sea-level air density.", FLAT
    )
    yield from notes
    yield from _stated_assumptions(build, profile)
    grade = build.usage.steepest_grade
    if grade is None:
        yield Finding(
            Severity.UNASSESSED,
            "stopping on the steepest descent",
            "The steepest descent is not given, so the speed the vehicle gathers downhill and "
            "what is left of the brakes against the slope are not known.",
            missing=("usage.steepest_grade",),
            sources=(KINEMATICS,),
        )
    for rider in build.riders:
        yield from _rider(build, profile, drive, rider, grade)


def _independence(build: Build, profile: Profile, needed: float, minimum: Limit) -> Finding:
    brakes = build.brakes or []
    independent = [brake_label(b, i) for i, b in enumerate(brakes) if not b.kind.electric]
    subject = "brake independent of the drive electronics"
    if independent:
        return Finding(
            Severity.PASS,
            subject,
            f"{', '.join(independent)} act(s) without the motor and the drive electronics.",
            sources=(INDEPENDENT,),
        )
    fraction = float(profile.limit("brake.single_brake_fraction").value)  # type: ignore[arg-type]
    return Finding(
        Severity.STOP,
        subject,
        "Every brake acts through the motor (dynamic or regenerative): a pack cut-off at "
        "speed, a BMS trip, a full pack after charging or a failed controller leaves the rider "
        "with no brake at all.",
        measured="none",
        limit="a friction or foot brake",
        remedy="fit a friction brake (disc, drum or rim) that reaches at least "
        f"{u.format_number(needed * fraction)} m/s² on its own ({FRICTION_FIELDS})",
        sources=(INDEPENDENT, minimum.source),
    )


def _stated_assumptions(build: Build, profile: Profile) -> Iterator[Assumption]:
    reaction = profile.limit("brake.reaction_time")
    dry = profile.limit("brake.tyre_friction.dry")
    seconds = u.format_number(in_unit(reaction.quantity, "s"))
    mu = u.format_number(float(dry.value))  # type: ignore[arg-type]
    yield Assumption(
        f"Each stop begins after a reaction time of {seconds} s and is judged on a dry road "
        f"(tyre friction {mu}), as braking requirements are measured; rolling resistance and "
        "drag, which help, are left out.",
        reaction.source,
    )
    for index, brake in enumerate(build.brakes or ()):
        if brake.acts_on is None:
            yield Assumption(
                f"brakes[{index}].acts_on not given: {brake_label(brake, index)} is taken to "
                "act on the rear, the axle with the least grip under braking.",
                profile.limit("brake.axle_share.rear").source,
            )
        elif brake.acts_on.value == "motor":
            yield Assumption(
                f"{brake_label(brake, index)} acts through the motor: its grip is taken as the "
                "rear axle's, the least under braking."
            )
        if (
            brake.tested_with_mass is None
            and not brake.kind.electric
            and (brake.deceleration is not None or brake.tested_stopping_distance is not None)
        ):
            yield Assumption(
                f"brakes[{index}].tested_with_mass not given: its deceleration is taken as "
                "measured with the lightest rider, and heavier riders get the same force."
            )


def _rider(
    build: Build, profile: Profile, drive: Drive, rider: Rider, grade: object
) -> Iterator[Output]:
    assert build.vehicle.mass is not None
    vehicle = in_unit(build.vehicle.mass, "kg")
    masses = [vehicle + in_unit(r.mass, "kg") for r in build.riders]
    mass = vehicle + in_unit(rider.mass, "kg")
    effects = effects_for(build, profile, drive, mass, min(masses))
    reaction = in_unit(profile.limit("brake.reaction_time").quantity, "s")
    flat = drive.top_speed(mass)
    cases = [("flat", flat, 0.0)]
    if grade is not None:
        percent = in_unit(grade, "percent")  # type: ignore[arg-type]
        cases.append(("descent", max(drive.descent_speed(mass, percent), flat), percent))
    electric = any(e.brake.kind.electric for e in effects)
    independent = [e for e in effects if not e.brake.kind.electric]
    for where, speed, percent in cases:
        yield from _case(profile, rider, effects, speed, percent, where, reaction, "all", build)
        if electric and independent:
            yield from _case(
                profile, rider, independent, speed, percent, where, reaction, "lost", build
            )
        elif not electric:  # no electric brake to lose: the same stop, said so
            for item in _case(
                profile, rider, effects, speed, percent, where, reaction, "all", build
            ):
                if isinstance(item, DerivedFigure):
                    yield replace(
                        item,
                        name=item.name.replace("every brake", "the electric brake lost"),
                        note=item.note + "; no electric brake is fitted, so the same stop",
                    )


def _case(
    profile: Profile,
    rider: Rider,
    effects: list[BrakeEffect],
    speed: float,
    percent: float,
    where: str,
    reaction: float,
    which: str,
    build: Build,
) -> Iterator[Output]:
    f = u.format_number
    minimum = profile.limit("brake.minimum_deceleration")
    fraction = profile.limit("brake.single_brake_fraction")
    needed = in_unit(minimum.quantity, _MS2)
    if which == "lost":
        needed *= float(fraction.value)  # type: ignore[arg-type]
    dry = grip_caps(profile, float(profile.limit("brake.tyre_friction.dry").value), percent)  # type: ignore[arg-type]
    wet = grip_caps(profile, float(profile.limit("brake.tyre_friction.wet").value), percent)  # type: ignore[arg-type]
    shape = {
        "constant": all(not e.brake.kind.electric for e in effects),
        "kinks": (in_unit(profile.limit("brake.regenerative_fade_speed").quantity, "m/s"),),
    }
    distance = stopping_distance(
        lambda v: combined(effects, dry, v), speed, reaction, percent, **shape
    )
    wet_distance = stopping_distance(
        lambda v: combined(effects, wet, v), speed, reaction, percent, **shape
    )
    reference = reference_distance(speed, reaction, needed)
    with_what = "every brake" if which == "all" else "the electric brake lost"
    place = "on the flat" if where == "flat" else f"down the {f(percent)} % descent"
    subject = f"stopping {place}, {with_what}, rider '{rider.name}'"
    kmh = f(ms_to_kmh(speed))
    yield DerivedFigure(
        f"stopping distance {place}, {with_what}, rider '{rider.name}'",
        u.quantity(distance, _M) if math.isfinite(distance) else "no standstill",
        note=f"from {kmh} km/h, {f(reaction)} s reaction, dry road",
        order=63,
    )
    brakes_text = "; ".join(f"{e.label}: {e.how}" for e in effects)
    unknown = [name for e in effects if e.at is None for name in e.missing]
    pull = STANDARD_GRAVITY * math.sin(grade_percent_to_angle(percent))
    reached = "the top speed" if where == "flat" else "the speed it reaches"
    start = f"From {kmh} km/h ({reached} {place}) with {with_what} ({brakes_text})"
    if math.isfinite(distance):
        rationale = (
            f"{start}, rider '{rider.name}' stops in {f(distance)} m after a {f(reaction)} s "
            f"reaction; a brake of exactly {f(needed)} m/s² stops in {f(reference)} m on the flat."
        )
    else:
        rationale = f"{start}, the brakes cannot bring rider '{rider.name}' to a standstill " + (
            "on the flat: their force fades with speed."
            if where == "flat"
            else f"{place}: the slope pulls with {f(pull)} m/s²."
        )
    if math.isfinite(wet_distance):
        rationale += f" On a wet road it is {f(wet_distance)} m."
    else:
        rationale += " On a wet road the tyres' grip is not enough to stop."
    over = not math.isfinite(distance) or distance > reference
    severity = Severity.PASS
    missing: tuple[str, ...] = ()
    if over and unknown:
        severity = Severity.UNASSESSED
        missing = tuple(dict.fromkeys(unknown))
        rationale += " Some brakes' figures are not given, so the shortfall cannot be settled."
    elif over:
        severity = Severity.FIX if math.isfinite(distance) else Severity.STOP
    elif unknown:
        rationale += (
            " Brakes whose figures are not given are counted as nothing "
            f"({', '.join(dict.fromkeys(unknown))})."
        )
    remedy = None
    if severity in (Severity.FIX, Severity.STOP):
        target = needed + max(pull, 0.0)
        who = "together" if which == "all" else "without the electric brake (friction or foot)"
        remedy = (
            f"brakes that reach at least {f(target)} m/s² {who} {place}"
            + (f" (the slope takes {f(pull)} m/s²)" if pull > 0 else "")
            + " (each brake's brakes[].deceleration); a front "
            "brake uses the most of the tyres' grip"
        )
    sources = [KINEMATICS, minimum.source, profile.limit("brake.tyre_friction.dry").source]
    if which == "lost":
        sources.insert(2, fraction.source)
    yield Finding(
        severity,
        subject,
        rationale,
        measured=u.quantity(distance, _M) if math.isfinite(distance) else "no standstill",
        limit=u.quantity(reference, _M),
        comparison=Comparison.AT_MOST,
        remedy=remedy,
        missing=missing,
        sources=tuple(sources),
    )


RULE = Rule(
    id="brake.stopping",
    title="Stopping distance, with and without the electric brake",
    check=check,
    sources=(KINEMATICS, INDEPENDENT),
    inputs=(
        "brakes",
        "riders",
        "vehicle.mass",
        "battery",
        "motors",
        "drivetrain",
        "controller",
        "usage.steepest_grade",
        "usage.rolling_resistance",
        "usage.drag_area",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
