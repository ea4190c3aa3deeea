"""brake.dynamic, part three: what stops and holds the vehicle where the electric brake cannot:
a vehicle with no brake at all, and the friction brake a fading brake needs beside it.
"""

from __future__ import annotations

from reviewer import units as u
from reviewer.build import Brake
from reviewer.findings import Finding, Severity, Source, SourceStatus
from reviewer.profile import Profile
from reviewer.units import in_unit

FADES = Source(
    "Physics of dynamic braking: current and torque are proportional to speed and vanish as "
    "the wheel stops, so a second, friction brake is needed to stop fully and to hold",
    SourceStatus.DERIVED,
)
TO_STANDSTILL = Source(
    "Germany, eKFV section 4(1) no. 1: a vehicle's brakes must be able to brake it to a "
    "standstill (an example national rule)"
)
_MS2 = u.unit("m/s**2")


def no_brake_finding(brake: Brake, profile: Profile) -> Finding:
    """brake.kind none: nothing slows, stops or holds the vehicle."""
    minimum = profile.limit("brake.minimum_deceleration")
    deceleration = in_unit(minimum.quantity, _MS2)
    text = (
        "The vehicle has no brake (brake.kind none): nothing but rolling resistance and drag "
        "slows it, and nothing stops it or holds it on a slope."
    )
    if brake.friction_brake:
        text += (
            " brake.friction_brake says a friction brake is fitted; if so, declare it as "
            "brake.kind friction."
        )
    return Finding(
        Severity.STOP,
        "brake",
        text,
        measured="none",
        limit="a brake",
        remedy=(
            "fit a friction brake (disc, drum or rim) that decelerates the vehicle at "
            f"{u.format_number(deceleration)} m/s² or more and holds it on a slope"
        ),
        sources=(TO_STANDSTILL, minimum.source),
    )


def standstill_finding(brake: Brake) -> Finding:
    kind = brake.kind.value
    subject = "brake at low speed"
    fades = (
        f"The {kind} brake's force is proportional to the wheel's speed and vanishes as the "
        "wheel stops"
    )
    if brake.friction_brake is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            f"{fades}; whether a friction brake is fitted beside it is not stated.",
            missing=("brake.friction_brake",),
            sources=(FADES,),
        )
    if brake.friction_brake:
        return Finding(
            Severity.PASS,
            subject,
            f"{fades}; the friction brake beside it stops and holds the vehicle.",
            sources=(FADES, TO_STANDSTILL),
        )
    return Finding(
        Severity.FIX,
        subject,
        f"{fades}, and there is no friction brake: the vehicle can be slowed but neither "
        "brought to a standstill nor held on a slope.",
        remedy="fit a friction brake that stops and holds the vehicle on its own",
        sources=(FADES, TO_STANDSTILL),
    )
