"""brake.dynamic, part three: the deceleration a shorted motor gives each rider at their top
speed, and the speed below which it fades under what the profile asks of it.
"""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules.brake._capability import FRICTION_FIELDS
from firstride_rules.brake._loops import (
    BrakingLoop,
    force_per_speed,
    inductive_share,
    share_remedy,
)

from reviewer import units as u
from reviewer.build import Build, Rider
from reviewer.engineering.roadload import Drive, ms_to_kmh
from reviewer.findings import Comparison, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Limit
from reviewer.rule import Output
from reviewer.units import in_unit

GENERATOR = Source.from_memory(
    "Chapman, Electric Machinery Fundamentals: a shorted DC machine generates E = Ke w, "
    "carries I = E / R_loop and brakes with T = Kt I"
)
_MS2 = u.unit("m/s**2")
_in = in_unit


def deceleration_findings(
    build: Build,
    drive: Drive,
    loops: list[BrakingLoop],
    rider: Rider,
    mass: float,
    speed: float,
    limits: tuple[Limit, Limit],
    context: tuple[bool, str],
) -> Iterator[Output]:
    """One rider's deceleration at their own top speed (``mass`` with the vehicle, kg);
    ``context`` is whether an independent brake is fitted and the brake's label."""
    minimum, fraction = limits
    beside_friction, tag = context
    f = u.format_number
    coefficient = force_per_speed(drive, loops)
    shares = [inductive_share(loop, drive, speed) for loop in loops]
    unknown = [loop.motor.name for loop, share in zip(loops, shares, strict=True) if share is None]
    # With the inductance unknown, the resistive figure is an upper bound on a brushless
    # motor's braking: it settles only a shortfall, never a pass.
    decel = (
        sum(
            force_per_speed(drive, [loop]) * (1.0 if share is None else share)
            for loop, share in zip(loops, shares, strict=True)
        )
        * speed
        / mass
    )
    full = _in(minimum.quantity, _MS2)
    share = float(fraction.value) if beside_friction else 1.0  # type: ignore[arg-type]
    needed = full * share
    fade = needed * mass / coefficient  # speed below which it gives less than `needed`
    subject = f"dynamic braking, rider '{rider.name}'{tag}"
    yield DerivedFigure(
        f"dynamic-brake deceleration at top speed, rider '{rider.name}'{tag}",
        u.quantity(decel, _MS2),
        note=f"from {f(ms_to_kmh(speed))} km/h, {f(mass)} kg with the vehicle",
        order=62,
    )
    role = (
        f"beside a friction or foot brake it must reach {f(share * 100)} % of "
        f"{f(full)} m/s² on its own, {f(needed)} m/s²"
        if beside_friction
        else f"as the only brake it must reach {f(needed)} m/s²"
    )
    short = decel < needed
    fading = (
        f"it would reach {f(needed)} m/s² only from {f(ms_to_kmh(fade))} km/h, above that speed"
        if short
        else f"below {f(ms_to_kmh(fade))} km/h it gives under {f(needed)} m/s²"
    )
    rationale = (
        f"Closed at {f(ms_to_kmh(speed))} km/h, the top speed of rider '{rider.name}' "
        f"({f(mass)} kg with the vehicle), the dynamic brake decelerates at {f(decel)} m/s², "
        f"and less as the speed falls: {fading}. {role[0].upper()}{role[1:]}."
    )
    severity = Severity.PASS
    if short:
        severity = Severity.ADVISE if beside_friction else Severity.FIX
    missing: tuple[str, ...] = ()
    if unknown:
        names = ", ".join(f"'{name}'" for name in unknown)
        rationale += (
            f" The winding inductance of brushless motor {names} is not given: above "
            "w_e = R / L a shorted winding's current stops rising with speed, so this figure, "
            "which leaves it out, is an upper bound."
        )
        if not short:
            severity = Severity.UNASSESSED
            missing = tuple(
                f"motors[{i}].{field}"
                for i, motor in enumerate(build.motors)
                for field in ("winding_inductance", "pole_pairs")
                if motor.name in unknown and getattr(motor, field) is None
            )
    remedy = None
    if short:
        remedy = (
            f"fit a friction brake that reaches at least {f(full)} m/s² with this brake, and "
            f"at least {f(full * float(fraction.value))} m/s² on its own "  # type: ignore[arg-type]
            f"({FRICTION_FIELDS})"
            if not beside_friction
            else share_remedy(drive, loops, speed, mass, needed, full)
        )
    yield Finding(
        severity,
        subject,
        rationale,
        measured=u.quantity(decel, _MS2),
        limit=u.quantity(needed, _MS2),
        comparison=Comparison.AT_LEAST,
        remedy=remedy,
        missing=missing,
        sources=(GENERATOR, minimum.source, fraction.source)
        if beside_friction
        else (GENERATOR, minimum.source),
    )
