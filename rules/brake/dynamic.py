"""brake.dynamic: a brake that shorts the motor, against its relay contacts and the deceleration
it gives, and the friction brake it needs beside it.

A shorted permanent-magnet motor brakes with a current and a force in proportion to its speed:
strong at top speed, where the relay closes onto its largest current, and nothing at all as the
wheel stops (common practice: a relay with a coil near 60 mA and contacts rated 10 A is the
usual hobby part, and such contacts are often far below the braking current).
"""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules._shared.wording import drive_model
from firstride_rules.brake._backup import (
    FADES,
    TO_STANDSTILL,
    no_brake_finding,
    standstill_finding,
)
from firstride_rules.brake._loops import (
    BrakingLoop,
    braking_loops,
    contact_remedy,
    force_per_speed,
    inductive_share,
    share_remedy,
)

from reviewer import units as u
from reviewer.build import Brake, BrakeKind, Build, Circuit, Rider
from reviewer.engineering.braking import (
    braking_current,
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
from reviewer.units import in_unit

GENERATOR = Source.from_memory(
    "Chapman, Electric Machinery Fundamentals: a shorted DC machine generates E = Ke w, "
    "carries I = E / R_loop and brakes with T = Kt I"
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

_in = in_unit  # skips pint's conversion for fields already in the unit asked
_A = u.unit("A")
_KG = u.unit("kg")
_KMH = u.unit("km/h")
_MS2 = u.unit("m/s**2")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """A dynamic brake's contact current and deceleration at top speed, and what stops the
    vehicle once its force has faded; and that the vehicle has a brake at all.

    What it checks
      ``brake.kind`` none declares a vehicle with no brake: nothing stops it or holds it on a
      slope. ``brake.kind`` friction has nothing here to check. For ``brake.kind`` dynamic (the
      motor shorted through a relay):
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
      - stop: no brake at all (``brake.kind`` none); contacts over-rated on a vehicle whose
        only brake this is (it may weld or burn open when needed).
      - fix: contacts over-rated beside a friction brake; no friction brake beside a dynamic
        or regenerative brake; the only brake below the minimum deceleration at top speed.
      - advise: a dynamic brake beside a friction brake below its single-brake share.
      - pass: within limits; a friction brake: nothing here applies, which the finding says.
      - unassessed: no ``brake`` section (named as ``brake``); ``brake.friction_brake`` not
        stated beside a dynamic or regenerative brake; riders,
        ``brake.relay_contact_rating`` or drive-model inputs missing (each named).

    Remedies give a brake resistor (rounded up to 0.01 ohm and re-checked, with the
    deceleration it leaves), contacts rated for the current, or engaging the relay only below
    the speed at which the current equals the rating; a friction brake with the deceleration
    it must reach alone (for no brake at all, the profile's ``brake.minimum_deceleration``).
    """
    brake = build.brake
    if brake is None:
        yield Finding(
            Severity.UNASSESSED,
            "brake",
            "The build describes no brake, so neither what stops the vehicle nor whether it "
            "shorts the motor is known.",
            missing=("brake",),
        )
        return
    if brake.kind is BrakeKind.NONE:
        yield no_brake_finding(brake, profile)
        return
    if brake.kind is BrakeKind.FRICTION:
        yield Finding(
            Severity.PASS,
            "brake",
            "The build declares a friction brake (brake.kind friction). This rule checks "
            "brakes that short the motor or regenerate, whose force fades at low speed; "
            "nothing of that applies here.",
        )
        return
    yield standstill_finding(brake)
    if brake.kind is BrakeKind.DYNAMIC:
        yield from _dynamic(build, brake, profile)


def _dynamic(build: Build, brake: Brake, profile: Profile) -> Iterator[Output]:
    drive, notes, missing = drive_model(build, profile)
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
    loops = braking_loops(build, brake, drive)
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
        yield from _deceleration(build, drive, loops, rider, mass, speed, (minimum, fraction))


def _contacts(
    brake: Brake,
    drive: Drive,
    loops: list[BrakingLoop],
    loop: BrakingLoop,
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
        u.quantity(current, _A),
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
        u.quantity(ms_to_kmh(ground), _KMH),
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
        remedy = contact_remedy(drive, loops, loop, emf, rating, current, ground, speed, mass)
    sources = [GENERATOR, CONTACTS]
    if severity is Severity.STOP:
        sources.append(ONLY_BRAKE)
    yield Finding(
        severity,
        subject,
        rationale,
        measured=u.quantity(current, _A),
        limit=u.quantity(rating, _A),
        comparison=Comparison.AT_MOST,
        remedy=remedy,
        sources=tuple(sources),
    )


def _deceleration(
    build: Build,
    drive: Drive,
    loops: list[BrakingLoop],
    rider: Rider,
    mass: float,
    speed: float,
    limits: tuple[Limit, Limit],
) -> Iterator[Output]:
    """One rider's deceleration at their own top speed (``mass`` with the vehicle, kg)."""
    minimum, fraction = limits
    brake = build.brake
    assert brake is not None
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
    beside_friction = brake.friction_brake is True
    share = float(fraction.value) if beside_friction else 1.0  # type: ignore[arg-type]
    needed = full * share
    fade = needed * mass / coefficient  # speed below which it gives less than `needed`
    subject = f"dynamic braking, rider '{rider.name}'"
    yield DerivedFigure(
        f"dynamic-brake deceleration at top speed, rider '{rider.name}'",
        u.quantity(decel, _MS2),
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
            f"at least {f(full * float(fraction.value))} m/s² on its own"  # type: ignore[arg-type]
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
        "motors[].winding_inductance",
        "motors[].pole_pairs",
        "drivetrain",
        "controller",
        "usage.rolling_resistance",
        "usage.drag_area",
        "wires",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.ADVISE, Severity.PASS, Severity.UNASSESSED),
)
