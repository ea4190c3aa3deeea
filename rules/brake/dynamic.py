"""brake.dynamic: a brake that shorts the motor, against its relay contacts at the highest speed
the build reaches and the deceleration it gives.

A shorted permanent-magnet motor brakes with a current and a force in proportion to its speed:
strong at top speed, where the relay closes onto its largest current, and nothing at all as the
wheel stops (common practice: a relay with a coil near 60 mA and contacts rated 10 A is the
usual hobby part, and such contacts are often far below the braking current).
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

from firstride_rules._shared.wording import drive_model
from firstride_rules.brake._capability import brake_label
from firstride_rules.brake._fade import GENERATOR, deceleration_findings
from firstride_rules.brake._loops import (
    BrakingLoop,
    braking_loops,
    contact_remedy,
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
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import in_unit

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
FADES = Source(
    "Physics of dynamic braking: current and torque are proportional to speed and vanish as "
    "the wheel stops, so a second, friction brake is needed to stop fully and to hold",
    SourceStatus.DERIVED,
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
    """Each dynamic brake's contact current at the highest speed the build reaches, and the
    deceleration it gives each rider at their top speed.

    What it checks
      Every ``brakes[]`` entry of kind dynamic (the motor shorted through a relay):
      1. Braking current at the highest speed any rider reaches (the lightest on the flat,
         the heaviest downhill): the flat
         top speed of the drive model of ``speed.rider-class`` (pack, motors, gearing, road
         load), or the speed down ``usage.steepest_grade`` at full throttle where higher. The
         motor turns at w = v x reduction / wheel radius and drives I = Ke w / R_loop round a
         loop of its winding (``motors[].winding_resistance``), the ``brake``-circuit wires and
         ``brakes[].brake_resistance``, all at 20 degC (cold: the highest current; the relay's
         own contact resistance and the motor leads are left out, which errs high). Compared
         with the DC contact rating ``brakes[].relay_contact_rating``; the motor speed at which
         the current equals the rating is n* = I_rating R_loop Kv. With several motors each
         is taken to have its own contacts of that rating.
      2. Deceleration for each rider at their own flat top speed: a = sum(Kt I) x reduction
         / (wheel radius x mass), i.e. F = Kt Ke reduction^2 v / (R_loop r^2) per motor, times
         (R / |R + j w_e L|)^2 for a brushless winding's inductance. Drivetrain friction,
         rolling resistance and drag only add to the braking and are left out. Compared with
         the profile's ``brake.minimum_deceleration`` when no brake independent of the drive
         electronics is listed, else with ``brake.single_brake_fraction`` of it (each brake
         alone). The speed below which the deceleration falls under that figure is the speed
         below which it stops braking usefully: the force is proportional to speed.
      What stops the vehicle once the force has faded, and the whole stop, is
      ``brake.stopping``'s.

    Severities
      - stop: contacts over-rated on a vehicle with no brake independent of the electronics
        (it may weld or burn open when needed).
      - fix: contacts over-rated beside a friction or foot brake; the only kind of brake
        below the minimum deceleration at top speed.
      - advise: a dynamic brake beside an independent brake below its single-brake share.
      - pass: within limits; no dynamic brake listed: nothing here applies, which it says.
      - unassessed: no ``brakes`` list; riders, ``brakes[].relay_contact_rating``, drive-model
        inputs or (for contacts that hold at the flat top speed) ``usage.steepest_grade``
        missing; a brushless winding's inductance missing where the resistive figure passes.

    Remedies give a brake resistor (rounded up to 0.01 ohm and re-checked, with the
    deceleration it leaves), contacts rated for the current, or engaging the relay only below
    the speed at which the current equals the rating; a friction brake with the deceleration
    it must reach alone.
    """
    if build.brakes is None:
        yield Finding(
            Severity.UNASSESSED,
            "dynamic brake",
            "The build lists no brakes, so whether one shorts the motor is not known.",
            missing=("brakes",),
        )
        return
    dynamic = [(i, b) for i, b in enumerate(build.brakes) if b.kind is BrakeKind.DYNAMIC]
    if not dynamic:
        yield Finding(
            Severity.PASS,
            "dynamic brake",
            "No brake in brakes shorts the motor (kind dynamic): nothing here applies. "
            "brake.stopping judges the brakes the build has.",
        )
        return
    for index, brake in dynamic:
        tag = f", {brake_label(brake, index)}" if len(dynamic) > 1 else ""
        yield from _dynamic(build, brake, index, tag, profile)


def _dynamic(
    build: Build, brake: Brake, index: int, tag: str, profile: Profile
) -> Iterator[Output]:
    drive, notes, missing = drive_model(build, profile)
    lacking = list(missing)
    if not build.riders:
        lacking.insert(0, "riders")
    if drive is None or lacking:
        yield Finding(
            Severity.UNASSESSED,
            f"braking current and deceleration{tag}",
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
    grade = build.usage.steepest_grade
    downhill = [
        drive.descent_speed(mass, _in(grade, "percent")) if grade is not None else 0.0
        for mass in masses
    ]
    # The lightest rider is the fastest on the flat, the heaviest downhill: the fastest of all.
    fastest = max(range(len(masses)), key=lambda i: max(speeds[i], downhill[i]))
    speed, mass = speeds[fastest], masses[fastest]
    highest = max(speed, downhill[fastest])
    where = Where(
        build.riders[fastest],
        highest,
        highest > speed,
        grade is not None,
        tag,
    )
    omega = motor_speed_for(highest, drive.reduction, drive.wheel_radius)
    independent = any(not b.kind.electric for b in build.brakes or ())
    for loop in loops:
        yield from _contacts(brake, index, drive, loops, loop, where, omega, mass, independent)
    minimum = profile.limit("brake.minimum_deceleration")
    fraction = profile.limit("brake.single_brake_fraction")
    for rider, mass, speed in zip(build.riders, masses, speeds, strict=True):
        yield from deceleration_findings(
            build, drive, loops, rider, mass, speed, (minimum, fraction), (independent, tag)
        )


@dataclass(frozen=True)
class Where:
    """The speed the contacts are judged at: whose, how fast, whether downhill."""

    rider: Rider
    speed: float  # m/s
    descent: bool  # the descent's speed is the higher
    descent_known: bool  # the build gives its steepest grade
    tag: str  # the brake's label where a build has several dynamic brakes


def _contacts(
    brake: Brake,
    index: int,
    drive: Drive,
    loops: list[BrakingLoop],
    loop: BrakingLoop,
    where: Where,
    omega: float,
    mass: float,
    independent: bool,
) -> Iterator[Output]:
    f = u.format_number
    rider, speed = where.rider, where.speed
    name = f"motor '{loop.motor.name}'{where.tag}"
    current = braking_current(loop.kv, omega, loop.resistance)
    emf = back_emf_constant(loop.kv) * omega
    yield DerivedFigure(
        f"braking current at top speed, {name}",
        u.quantity(current, _A),
        note=f"dynamic brake closed at {f(ms_to_kmh(speed))} km/h (rider '{rider.name}'"
        f"{', downhill' if where.descent else ''}), "
        f"{f(loop.resistance)} ohm loop at 20 °C",
        order=60,
    )
    subject = f"brake relay contacts, {name}"
    reached = "on the steepest descent" if where.descent else "on the flat"
    situation = (
        f"At {f(ms_to_kmh(speed))} km/h, the highest speed of any rider, rider "
        f"'{rider.name}' ({reached}), "
        f"the motor turns at {rad_s_to_rpm(omega):.0f} rpm and its {f(emf)} V back-EMF, "
        f"shorted, drives {f(current)} A round a {f(loop.resistance)} ohm loop (winding and "
        f"brake wiring at 20 °C{', brake resistor' if loop.added else ''})."
    )
    if brake.relay_contact_rating is None:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            f"{situation} The relay's DC contact rating is not given.",
            missing=(f"brakes[{index}].relay_contact_rating",),
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
        severity = Severity.FIX if independent else Severity.STOP
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
    missing: tuple[str, ...] = ()
    if not over and not where.descent_known:
        severity, missing = Severity.UNASSESSED, ("usage.steepest_grade",)
        rationale += (
            " The steepest descent is not given: downhill the vehicle runs faster and the "
            "current is higher."
        )
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
        missing=missing,
        sources=tuple(sources),
    )


RULE = Rule(
    id="brake.dynamic",
    title="Dynamic brake current, deceleration and backup",
    check=check,
    sources=(GENERATOR, FADES, CONTACTS),
    inputs=(
        "brakes",
        "usage.steepest_grade",
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
