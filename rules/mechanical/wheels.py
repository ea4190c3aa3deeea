"""mechanical.wheels: each wheel's or tyre's rated load and speed against the share of rider and
vehicle it carries and the highest speed it sees, descents included; the deck or frame's rated
load where the builder gives one.
"""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules._shared.wording import drive_model

from reviewer import units as u
from reviewer.build import Build, Wheel
from reviewer.engineering.roadload import Drive, ms_to_kmh
from reviewer.findings import Assumption, Comparison, Finding, Severity, Source, SourceStatus
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import in_unit

RATINGS = Source(
    "The wheel's or tyre's rated load (its load index, ETRTO) and speed rating, and the deck's "
    "or frame's rated load, as entered in the build",
    SourceStatus.USER,
)
_KG = u.unit("kg")
_KMH = u.unit("km/h")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Each ``wheels[]`` entry's load and speed, and the deck or frame's load.

    What it checks
      1. Load: the heaviest rider with the vehicle (``vehicle.mass``) times the profile's
         ``mechanical.axle_share`` (the more loaded axle) and ``mechanical.dynamic_factor``
         (bumps and kerbs), shared by the ``count`` wheels on that axle, against each wheel's
         ``rated_load``.
      2. Speed: the highest speed any rider reaches, the flat top speed or the speed down
         ``usage.steepest_grade`` at full throttle (``speed.descent``'s), against
         ``speed_rating``.
      3. ``vehicle.rated_load`` against the heaviest rider, where it is given.

    Severities
      - fix: a wheel or the deck below its load, or below the speed it sees.
      - pass: within each rating.
      - unassessed: no ``wheels``; riders, masses, ratings or the drive model missing (named);
        a speed within the flat top speed's rating with no ``usage.steepest_grade``.
    """
    wheels = build.wheels
    if not wheels:
        yield Finding(
            Severity.UNASSESSED,
            "wheels and tyres",
            "The build describes no wheels ([[wheels]]), so their load and speed ratings are "
            "not known.",
            missing=("wheels",),
            sources=(RATINGS,),
        )
        return
    if not build.riders or build.vehicle.mass is None:
        yield Finding(
            Severity.UNASSESSED,
            "wheels and tyres",
            "The wheels' loads need the riders and the vehicle's mass.",
            missing=tuple(
                name
                for name, absent in (
                    ("riders", not build.riders),
                    ("vehicle.mass", build.vehicle.mass is None),
                )
                if absent
            ),
            sources=(RATINGS,),
        )
        return
    heaviest = max(in_unit(r.mass, "kg") for r in build.riders)
    total = in_unit(build.vehicle.mass, "kg") + heaviest
    share = profile.limit("mechanical.axle_share")
    factor = profile.limit("mechanical.dynamic_factor")
    drive, notes, missing = drive_model(build, profile)
    yield from notes
    speed = _highest_speed(build, drive)
    for index, wheel in enumerate(wheels):
        load = total * float(share.value) * float(factor.value) / wheel.count  # type: ignore[arg-type]
        yield _load(index, wheel, load, total, (share, factor))
        yield _speed(build, index, wheel, speed, missing)
    yield from _deck(build, heaviest)


def _highest_speed(build: Build, drive: Drive | None) -> float | None:
    """The highest speed in m/s any rider reaches (descent included where given)."""
    if drive is None or build.vehicle.mass is None:
        return None
    vehicle = in_unit(build.vehicle.mass, "kg")
    speeds = []
    for rider in build.riders:
        mass = vehicle + in_unit(rider.mass, "kg")
        speeds.append(drive.top_speed(mass))
        if build.usage.steepest_grade is not None:
            percent = in_unit(build.usage.steepest_grade, "percent")
            speeds.append(drive.descent_speed(mass, percent))
    return max(speeds)


def _load(index: int, wheel: Wheel, load: float, total: float, limits: tuple) -> Finding:
    f = u.format_number
    share, factor = limits
    subject = f"wheel '{wheel.name}' load"
    basis = (
        f"{f(total)} kg (the heaviest rider with the vehicle) x {f(float(share.value))} on the "
        f"{wheel.position.value} axle x {f(float(factor.value))} for bumps"
        + (f", over {wheel.count} wheels" if wheel.count > 1 else "")
    )
    if wheel.rated_load is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            f"Each wheel carries up to {f(load)} kg ({basis}); its rated load is not given.",
            missing=(f"wheels[{index}].rated_load",),
            sources=(RATINGS, share.source, factor.source),
        )
    rating = in_unit(wheel.rated_load, "kg")
    over = load > rating
    return Finding(
        Severity.FIX if over else Severity.PASS,
        subject,
        f"Each wheel carries up to {f(load)} kg ({basis}) against its {f(rating)} kg rating.",
        measured=u.quantity(load, _KG),
        limit=u.quantity(rating, _KG),
        comparison=Comparison.AT_MOST,
        remedy=f"use a wheel or tyre rated for at least {f(load)} kg (wheels[{index}].rated_load)"
        if over
        else None,
        sources=(RATINGS, share.source, factor.source),
    )


def _speed(
    build: Build, index: int, wheel: Wheel, speed: float | None, missing: tuple[str, ...]
) -> Finding:
    f = u.format_number
    subject = f"wheel '{wheel.name}' speed rating"
    if speed is None or wheel.speed_rating is None:
        lacking = missing if speed is None else ()
        if wheel.speed_rating is None:
            lacking = (*lacking, f"wheels[{index}].speed_rating")
        return Finding(
            Severity.UNASSESSED,
            subject,
            "Its speed rating or the highest speed the vehicle reaches is not known.",
            missing=lacking,
            sources=(RATINGS,),
        )
    kmh = ms_to_kmh(speed)
    rating = in_unit(wheel.speed_rating, "km/h")
    over = kmh > rating
    descent = build.usage.steepest_grade is not None
    where = "on the flat or down the steepest descent" if descent else "on the flat"
    severity = Severity.FIX if over else Severity.PASS
    text = f"The vehicle reaches {f(kmh)} km/h {where} against the wheel's {f(rating)} km/h."
    lacking: tuple[str, ...] = ()
    if not over and not descent:
        severity, lacking = Severity.UNASSESSED, ("usage.steepest_grade",)
        text += " The steepest descent is not given: downhill it runs faster."
    return Finding(
        severity,
        subject,
        text,
        measured=u.quantity(kmh, _KMH),
        limit=u.quantity(rating, _KMH),
        comparison=Comparison.AT_MOST,
        remedy=f"use a wheel or tyre rated for at least {f(kmh)} km/h "
        f"(wheels[{index}].speed_rating)"
        if over
        else None,
        missing=lacking,
        sources=(RATINGS,),
    )


def _deck(build: Build, heaviest: float) -> Iterator[Output]:
    f = u.format_number
    if build.vehicle.rated_load is None:
        yield Assumption("vehicle.rated_load not given: the deck or frame's load is not checked.")
        return
    rating = in_unit(build.vehicle.rated_load, "kg")
    over = heaviest > rating
    yield Finding(
        Severity.FIX if over else Severity.PASS,
        "deck or frame load",
        f"The heaviest rider is {f(heaviest)} kg against the deck's or frame's {f(rating)} kg "
        "rating.",
        measured=u.quantity(heaviest, _KG),
        limit=u.quantity(rating, _KG),
        comparison=Comparison.AT_MOST,
        remedy=f"use a deck or frame rated for at least {f(heaviest)} kg" if over else None,
        sources=(RATINGS,),
    )


RULE = Rule(
    id="mechanical.wheels",
    title="Wheel and tyre load and speed, deck or frame load",
    check=check,
    sources=(RATINGS,),
    inputs=(
        "wheels",
        "riders",
        "vehicle.mass",
        "vehicle.rated_load",
        "usage.steepest_grade",
        "battery",
        "motors",
        "drivetrain",
        "controller",
        "usage.rolling_resistance",
        "usage.drag_area",
    ),
    severities=(Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
