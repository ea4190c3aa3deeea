"""brake.dynamic: a brake that shorts the motor, against its relay contacts and the deceleration
it gives, and the friction brake it needs beside it.

A shorted permanent-magnet motor brakes with a current and a force in proportion to its speed:
strong at top speed, where the relay closes onto its largest current, and nothing at all as the
wheel stops (common practice: a relay with a coil near 60 mA and contacts rated 10 A is the
usual hobby part, and such contacts are often far below the braking current).
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass

from reviewer import derived
from reviewer import units as u
from reviewer.build import Brake, BrakeKind, Build, Circuit, Motor, Rider
from reviewer.engineering.braking import (
    added_resistance_for,
    braking_current,
    braking_force_per_speed,
    rpm_to_ground_speed,
    speed_at_current_rpm,
)
from reviewer.engineering.motor import back_emf_constant, rad_s_to_rpm
from reviewer.engineering.roadload import Drive, motor_speed_for, ms_to_kmh
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

GENERATOR = Source.from_memory(
    "Chapman, Electric Machinery Fundamentals: a shorted DC machine generates E = Ke w, "
    "carries I = E / R_loop and brakes with T = Kt I"
)
FADES = Source(
    "Physics of dynamic braking: current and torque are proportional to speed and vanish as "
    "the wheel stops, so a second, friction brake is needed to stop fully and to hold",
    SourceStatus.DERIVED,
)
TO_STANDSTILL = Source(
    "Germany, eKFV section 4(1) no. 1: a vehicle's brakes must be able to brake it to a "
    "standstill (an example national rule)"
)
# common practice: dynamic braking force falls to zero as the wheel stops; the usual hobby
# brake relay has a coil near 60 mA and contacts rated 10 A, far below a shorted motor's current.
CONTACTS = Source(
    "The relay's DC contact rating, as entered in the build: contacts closing onto more than "
    "their rating arc, pit and can weld",
    SourceStatus.USER,
)
ONLY_BRAKE = Source.common_practice(
    "A brake whose contacts are over-rated may weld or burn open; as the only brake that is a stop"
)
FLAT = Source(
    "Road load F = m g Crr + 0.5 rho CdA v^2 on the flat; rho 1.225 kg/m^3 (ISA), "
    "g 9.80665 m/s^2 (CGPM)"
)

_in = derived.in_unit  # skips pint's conversion for fields already in the unit asked
_A = u.unit("A")
_OHM = u.unit("ohm")
_KG = u.unit("kg")
_KMH = u.unit("km/h")
_MS2 = u.unit("m/s**2")


@dataclass(frozen=True)
class _Loop:
    """One motor's braking loop in SI floats."""

    motor: Motor
    kv: float  # rpm/V
    fixed: float  # ohm: winding and brake wires at 20 degC
    added: float  # ohm: the brake resistor, 0 if none
    wires: float = 0.0  # ohm: the brake wires' share of ``fixed``

    @property
    def resistance(self) -> float:
        return self.fixed + self.added


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """A dynamic brake's contact current and deceleration at top speed, and what stops the
    vehicle once its force has faded.

    What it checks
      For ``brake.kind`` dynamic (the motor shorted through a relay):
      1. Braking current at the top speed of the lightest rider (the fastest; the drive model
         of ``speed.rider-class``: pack, motors, gearing, road load on the flat). The motor
         turns at w = v x reduction / wheel radius and drives I = Ke w / R_loop round a loop
         of its winding (``motors[].winding_resistance``), the ``brake``-circuit wires and
         ``brake.brake_resistance``, all at 20 degC (cold: the highest current; the relay's
         own contact resistance and the motor leads are left out, which errs high). Compared
         with the DC contact rating ``brake.relay_contact_rating``; the motor speed at which
         the current equals the rating is n* = I_rating R_loop Kv. With several motors each
         is taken to have its own contacts of that rating.
      2. Deceleration for each rider at their own top speed: a = sum(Kt I) x reduction /
         (wheel radius x mass), i.e. F = Kt Ke reduction^2 v / (R_loop r^2) per motor.
         Drivetrain friction, rolling resistance and drag only add to the braking and are left
         out. Compared with the profile's ``brake.minimum_deceleration`` when the dynamic brake
         is the only brake (``brake.friction_brake`` not true), else with
         ``brake.single_brake_fraction`` of it (each brake alone). The speed below which the
         deceleration falls under that figure is reported: the force is proportional to speed.
      3. Low speed: the force vanishes as the wheel stops; ``brake.friction_brake`` must be
         true. The same check applies to a regenerative brake.

    Severities
      - stop: contacts over-rated on a vehicle whose only brake this is (it may weld or burn
        open when needed).
      - fix: contacts over-rated beside a friction brake; no friction brake beside a dynamic
        or regenerative brake; the only brake below the minimum deceleration at top speed.
      - advise: a dynamic brake beside a friction brake below its single-brake share.
      - pass: within limits; a friction brake, or no brake declared (``none``): nothing here
        applies, which the finding says.
      - unassessed: no ``brake`` section; ``brake.friction_brake`` not stated; riders,
        ``brake.relay_contact_rating`` or drive-model inputs missing (each named).

    Remedies give a brake resistor (rounded up to 0.01 ohm and re-checked, with the
    deceleration it leaves), contacts rated for the current, or engaging the relay only below
    the speed at which the current equals the rating; a friction brake with the deceleration
    it must reach alone.
    """
    brake = build.brake
    if brake is None:
        yield Finding(
            Severity.UNASSESSED,
            "brake",
            "The build describes no brake, so whether it shorts the motor is unknown.",
            missing=("brake.kind",),
        )
        return
    if brake.kind in (BrakeKind.FRICTION, BrakeKind.NONE):
        what = "a friction brake" if brake.kind is BrakeKind.FRICTION else "no brake"
        yield Finding(
            Severity.PASS,
            "brake",
            f"The build declares {what} (brake.kind {brake.kind.value}). This rule checks "
            "brakes that short the motor or regenerate, whose force fades at low speed; "
            "nothing of that applies here.",
        )
        return
    yield _standstill_finding(brake)
    if brake.kind is BrakeKind.DYNAMIC:
        yield from _dynamic(build, brake, profile)


def _standstill_finding(brake: Brake) -> Finding:
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


def _dynamic(build: Build, brake: Brake, profile: Profile) -> Iterator[Output]:
    drive, notes, missing = derived.drive_model(build, profile)
    lacking = list(missing)
    if not build.riders:
        lacking.insert(0, "riders")
    if drive is None or lacking:
        yield Finding(
            Severity.UNASSESSED,
            "braking current and deceleration",
            "The braking current and deceleration need each rider's top speed, and so the "
            "riders, the vehicle's mass, the pack, each motor's Kv and winding resistance, "
            "the reduction and the wheel diameter.",
            missing=tuple(lacking),
            sources=(GENERATOR,),
        )
        return
    yield Assumption(
        "Top speed is solved on flat ground in still air at sea-level air density.", FLAT
    )
    yield from notes
    loops = _loops(build, brake, drive)
    if len(loops) > 1:
        yield Assumption(
            "Each motor is taken to be shorted through its own relay contacts of the brake's "
            "rating; one set of contacts shorting several motors carries their sum."
        )
    if any(w.circuit is Circuit.BRAKE for w in build.wires) and len(loops) > 1:
        yield Assumption(
            "A brake-circuit wire that names no motor is left out of every braking loop "
            "(which errs towards a higher current)."
        )
    assert build.vehicle.mass is not None
    vehicle = _in(build.vehicle.mass, _KG)
    masses = [vehicle + _in(rider.mass, _KG) for rider in build.riders]
    speeds = [drive.top_speed(mass) for mass in masses]
    lightest = min(range(len(masses)), key=masses.__getitem__)
    speed, mass = speeds[lightest], masses[lightest]
    omega = motor_speed_for(speed, drive.reduction, drive.wheel_radius)
    for loop in loops:
        yield from _contacts(brake, drive, loops, loop, build.riders[lightest], speed, omega, mass)
    minimum = profile.limit("brake.minimum_deceleration")
    fraction = profile.limit("brake.single_brake_fraction")
    for rider, mass, speed in zip(build.riders, masses, speeds, strict=True):
        yield from _deceleration(brake, drive, loops, rider, mass, speed, minimum, fraction)


def _loops(build: Build, brake: Brake, drive: Drive) -> list[_Loop]:
    added = _in(brake.brake_resistance, _OHM) if brake.brake_resistance else 0.0
    single = len(build.motors) == 1
    loops = []
    for motor, line in zip(build.motors, drive.motors, strict=True):
        assert motor.winding_resistance is not None
        wires = sum(
            derived.wire_resistance(wire)
            for wire in build.wires
            if wire.circuit is Circuit.BRAKE
            and (wire.motor == motor.name or (single and wire.motor is None))
        )
        fixed = _in(motor.winding_resistance, _OHM) + wires
        loops.append(_Loop(motor, line.kv_rpm_per_v, fixed, added, wires))
    return loops


def _coefficient(drive: Drive, loops: list[_Loop], added: float | None = None) -> float:
    """All motors' braking force per unit ground speed, N s/m; ``added`` puts that brake
    resistor in every loop instead of the build's."""
    return sum(
        braking_force_per_speed(
            loop.kv,
            loop.resistance if added is None else loop.fixed + added,
            drive.reduction,
            drive.wheel_radius,
        )
        for loop in loops
    )


def _contacts(
    brake: Brake,
    drive: Drive,
    loops: list[_Loop],
    loop: _Loop,
    rider: Rider,
    speed: float,
    omega: float,
    mass: float,
) -> Iterator[Output]:
    f = u.format_number
    name = f"motor '{loop.motor.name}'"
    current = braking_current(loop.kv, omega, loop.resistance)
    emf = back_emf_constant(loop.kv) * omega
    yield DerivedFigure(
        f"braking current at top speed, {name}",
        u.Quantity(current, _A),
        note=f"dynamic brake closed at {f(ms_to_kmh(speed))} km/h (rider '{rider.name}'), "
        f"{f(loop.resistance)} ohm loop at 20 °C",
        order=60,
    )
    subject = f"brake relay contacts, {name}"
    situation = (
        f"At {f(ms_to_kmh(speed))} km/h, the top speed of the lightest rider '{rider.name}', "
        f"the motor turns at {rad_s_to_rpm(omega):.0f} rpm and its {f(emf)} V back-EMF, "
        f"shorted, drives {f(current)} A round a {f(loop.resistance)} ohm loop (winding and "
        f"brake wiring at 20 °C{', brake resistor' if loop.added else ''})."
    )
    if brake.relay_contact_rating is None:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            f"{situation} The relay's DC contact rating is not given.",
            missing=("brake.relay_contact_rating",),
            sources=(GENERATOR,),
        )
        return
    rating = _in(brake.relay_contact_rating, _A)
    at_rating = speed_at_current_rpm(rating, loop.resistance, loop.kv)
    ground = rpm_to_ground_speed(at_rating, drive.reduction, drive.wheel_radius)
    yield DerivedFigure(
        f"speed at which the braking current equals the contact rating, {name}",
        u.Quantity(ms_to_kmh(ground), _KMH),
        note=f"n* = I_rating R_loop Kv = {at_rating:.0f} rpm",
        order=61,
    )
    over = current > rating
    severity = Severity.PASS
    if over:
        severity = Severity.STOP if brake.friction_brake is False else Severity.FIX
    rationale = (
        f"{situation} The contacts are rated {f(rating)} A DC; the current equals that at "
        f"{at_rating:.0f} rpm, {f(ms_to_kmh(ground))} km/h."
    )
    if loop.wires:
        rationale += (
            f" The brake wiring ({f(loop.wires)} ohm) carries the same pulse: a short "
            "one, for which the contact rating rather than the wire's ampacity is the limit."
        )
    if severity is Severity.STOP:
        rationale += " As the only brake, it may weld shut or burn open when it is needed."
    remedy = None
    if over:
        remedy = _contact_remedy(drive, loops, loop, emf, rating, current, ground, speed, mass)
    sources = [GENERATOR, CONTACTS]
    if severity is Severity.STOP:
        sources.append(ONLY_BRAKE)
    yield Finding(
        severity,
        subject,
        rationale,
        measured=u.Quantity(current, _A),
        limit=u.Quantity(rating, _A),
        comparison=Comparison.AT_MOST,
        remedy=remedy,
        sources=tuple(sources),
    )


def _contact_remedy(
    drive: Drive,
    loops: list[_Loop],
    loop: _Loop,
    emf: float,
    rating: float,
    current: float,
    ground: float,
    speed: float,
    mass: float,
) -> str:
    """A brake resistor that holds the current to the rating (rounded up to 0.01 ohm and
    re-checked), with the deceleration left if every motor's loop gets the same resistor."""
    f = u.format_number
    extra = added_resistance_for(rating, emf, loop.resistance)
    resistor = math.ceil((loop.added + extra) * 100.0 - 1e-9) / 100.0
    while emf / (loop.fixed + resistor) > rating:
        resistor += 0.01
    coefficient = _coefficient(drive, loops, resistor)
    return (
        f"fit a brake resistor of at least {resistor:.2f} ohm in the loop "
        f"({f(emf / (loop.fixed + resistor))} A at top speed, leaving about "
        f"{f(coefficient * speed / mass)} m/s² of braking there), or relay contacts rated for "
        f"at least {math.ceil(current - 1e-9)} A DC, or let the relay close only below "
        f"{f(ms_to_kmh(ground))} km/h"
    )


def _deceleration(
    brake: Brake,
    drive: Drive,
    loops: list[_Loop],
    rider: Rider,
    mass: float,
    speed: float,
    minimum: Limit,
    fraction: Limit,
) -> Iterator[Output]:
    """One rider's deceleration at their own top speed (``mass`` with the vehicle, kg)."""
    f = u.format_number
    coefficient = _coefficient(drive, loops)
    decel = coefficient * speed / mass
    full = _in(minimum.quantity, _MS2)
    beside_friction = brake.friction_brake is True
    share = float(fraction.value) if beside_friction else 1.0  # type: ignore[arg-type]
    needed = full * share
    fade = needed * mass / coefficient  # speed below which it gives less than `needed`
    subject = f"dynamic braking, rider '{rider.name}'"
    yield DerivedFigure(
        f"dynamic-brake deceleration at top speed, rider '{rider.name}'",
        u.Quantity(decel, _MS2),
        note=f"from {f(ms_to_kmh(speed))} km/h, {f(mass)} kg with the vehicle",
        order=62,
    )
    role = (
        f"beside the friction brake it must reach {f(share * 100)} % of "
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
    remedy = None
    if short:
        remedy = (
            f"fit a friction brake that reaches at least {f(full)} m/s² with this brake, and "
            f"at least {f(full * float(fraction.value))} m/s² on its own"  # type: ignore[arg-type]
            if not beside_friction
            else _share_remedy(drive, loops, speed, mass, needed, full)
        )
    yield Finding(
        severity,
        subject,
        rationale,
        measured=u.Quantity(decel, _MS2),
        limit=u.Quantity(needed, _MS2),
        comparison=Comparison.AT_LEAST,
        remedy=remedy,
        sources=(GENERATOR, minimum.source, fraction.source)
        if beside_friction
        else (GENERATOR, minimum.source),
    )


def _share_remedy(
    drive: Drive, loops: list[_Loop], speed: float, mass: float, needed: float, full: float
) -> str:
    """Beside a friction brake: lean on it, or lower the brake resistor (the same in every
    motor's loop) where that alone reaches ``needed`` at ``speed``."""
    f = u.format_number
    text = f"make sure the friction brake alone reaches at least {f(full)} m/s²"

    # Added resistance R such that sum(c_k(fixed_k + R)) v / m = needed, by bisection: the
    # force falls as R rises.
    def decel(added: float) -> float:
        return _coefficient(drive, loops, added) * speed / mass

    present = loops[0].added
    if present <= 0 or decel(0.0) < needed:
        return text
    low, high = 0.0, present
    for _ in range(60):
        middle = 0.5 * (low + high)
        if decel(middle) >= needed:
            low = middle
        else:
            high = middle
    resistor = math.floor(low * 100.0) / 100.0
    return (
        f"{text}, or lower the brake resistor to at most {resistor:.2f} ohm "
        f"({f(decel(resistor))} m/s²)"
    )


RULE = Rule(
    id="brake.dynamic",
    title="Dynamic brake current, deceleration and backup",
    check=check,
    sources=(GENERATOR, FADES, TO_STANDSTILL, CONTACTS),
    inputs=(
        "brake",
        "riders",
        "vehicle.mass",
        "battery",
        "motors[].kv",
        "motors[].winding_resistance",
        "drivetrain",
        "controller",
        "usage.rolling_resistance",
        "usage.drag_area",
        "wires",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.ADVISE, Severity.PASS, Severity.UNASSESSED),
)
