"""performance.hill: can the drive carry the heaviest rider up the steepest grade the builder
rides, and at what current?

On a climb the grade term m g sin(theta) dwarfs everything else at walking pace, so the motor
needs a current that does not fall with speed: a current limit below it stalls the vehicle on
the hill, and a current above the motor's rating heats it however slowly the rider goes.
"""

from __future__ import annotations

from collections.abc import Generator, Iterator
from dataclasses import replace

from firstride_rules._shared.wording import drive_model
from firstride_rules.performance._climb import Climb, heat_remedy, stall_remedy, steepest_grade

from reviewer import units as u
from reviewer.build import Build, Rider
from reviewer.engineering.roadload import AIR_DENSITY_ISA, Drive, kmh_to_ms, ms_to_kmh
from reviewer.findings import Assumption, Comparison, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Limit, Profile
from reviewer.rule import Output, Rule
from reviewer.units import in_unit

ROAD_LOAD = Source(
    "Road load on a grade F = m g (Crr cos(theta) + sin(theta)) + 0.5 rho CdA v^2; "
    "rho 1.225 kg/m^3 (ISA sea level), g 9.80665 m/s^2 (CGPM)"
)
MOTOR_MODEL = Source.from_memory(
    "Chapman, Electric Machinery Fundamentals: DC motor torque-speed line V = Ke w + I R, "
    "T = Kt (I - I0), Kt = 60 / (2 pi Kv)"
)
COPPER_LOSS = Source.from_memory(
    "Copper loss I^2 R: above the rated continuous current the winding heats beyond its "
    "rated rise (IEC 60034-1 rating basis)"
)

_in = in_unit  # skips pint's conversion for fields already in the unit asked
_A = u.unit("A")
_KG = u.unit("kg")
_KMH = u.unit("km/h")
_PERCENT = u.unit("percent")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """The current the heaviest rider's climb of the steepest grade needs, against the
    controller's current limit and the motor's rated current.

    What it checks
      The heaviest rider (``riders[].mass``) on the vehicle (``vehicle.mass``) holding a steady
      walking pace (the profile's ``performance.hill.climb_speed``) up ``usage.steepest_grade``.
      Road load F = m g (Crr cos(theta) + sin(theta)) + 0.5 rho CdA v^2 with theta =
      atan(grade); Crr is ``usage.rolling_resistance`` or the profile's
      ``performance.hill.default_rolling_resistance`` (higher than the flat default: the
      conservative side on a hill), CdA ``usage.drag_area`` or ``usage.default_drag_area``.
      The drive is that of ``speed.rider-class`` (pack at full voltage, max duty, cold loop,
      current limit), with ``drivetrain.efficiency`` or the profile's
      ``performance.hill.default_drivetrain_efficiency``. Each motor carries the same current
      I = (F r / (reduction eff) + sum Kt I0) / sum Kt, with Kt = 60 / (2 pi Kv) and I0
      ``motors[].no_load_current`` (0 if unset, noted).

      The vehicle holds the climb if the drive's wheel force at walking pace (torque-speed
      line, capped by ``controller.current_limit``) reaches the road load. The full-throttle
      climbing speed (where the line meets the grade's road load) and the steepest grade held
      at walking pace are reported.

    Severities
      - fix: the drive cannot hold walking pace on the grade: the current needed is above the
        current limit, or above what the pack drives through the winding at that speed (the
        vehicle stalls or crawls).
      - advise: it climbs, but above the lowest ``motors[].rated_current``: beyond the
        motor's continuous rating, with copper loss (I / I_rated)^2 times the rated loss.
      - pass: it climbs within the rated current.
      - unassessed: ``usage.steepest_grade`` (the rule judges only the hills it is told of),
        riders, the drive model's inputs, or (for a climb that holds) the rated current.

    Remedies give the motor pulley (or reduction) and, for a stall, the current limit that
    would climb it, each re-checked with the same model; for heat, the gearing that brings the
    climb current within the rated current.
    """
    drive, notes, missing = drive_model(build, profile, bound="low")  # least torque: climbing
    lacking = list(missing)
    if not build.riders:
        lacking.insert(0, "riders")
    if build.usage.steepest_grade is None:
        lacking.insert(0, "usage.steepest_grade")
    if drive is None or lacking:
        yield Finding(
            Severity.UNASSESSED,
            "hill climb",
            "The climb needs the steepest grade ridden, the heaviest rider, the vehicle's mass "
            "and the drive (pack, motors' Kv and winding resistance, reduction, wheel "
            "diameter).",
            missing=tuple(lacking),
            sources=(ROAD_LOAD, MOTOR_MODEL),
        )
        return
    assert build.usage.steepest_grade is not None and build.vehicle.mass is not None
    yield from (note for note in notes if "motor_current_basis" in note.text)
    climb_speed = profile.limit("performance.hill.climb_speed")
    drive = yield from _climb_drive(build, drive, profile)
    rider = max(build.riders, key=lambda r: _in(r.mass, _KG))
    mass = _in(build.vehicle.mass, _KG) + _in(rider.mass, _KG)
    grade = _in(build.usage.steepest_grade, _PERCENT)
    climb = Climb(drive, mass, grade, kmh_to_ms(_in(climb_speed.quantity, _KMH)))
    yield from _climb_findings(build, climb, rider, climb_speed)


def _climb_drive(
    build: Build, drive: Drive, profile: Profile
) -> Generator[Assumption, None, Drive]:
    """The drive with the climb's defaults; yields an assumption for each default used."""
    assert build.drivetrain is not None
    crr = build.usage.rolling_resistance
    if crr is None:
        limit = profile.limit("performance.hill.default_rolling_resistance")
        crr = float(limit.value)  # type: ignore[arg-type]
        yield Assumption(
            f"usage.rolling_resistance not given: Crr {crr:g} taken for hills.",
            limit.source,
        )
    efficiency = drive.efficiency
    if build.drivetrain.efficiency is None:
        limit = profile.limit("performance.hill.default_drivetrain_efficiency")
        efficiency = _in(limit.quantity, _PERCENT) / 100.0
        yield Assumption(
            f"drivetrain.efficiency not given: {u.format_number(efficiency * 100)} % taken for "
            "hills.",
            limit.source,
        )
    if build.usage.drag_area is None:
        yield Assumption(
            f"usage.drag_area not given: CdA {drive.drag_area:g} m² taken.",
            profile.limit("usage.default_drag_area").source,
        )
    for motor in build.motors:
        if motor.no_load_current is None:
            yield Assumption(
                f"Motor '{motor.name}': no_load_current not given, taken as 0 A, which "
                "understates the current a climb needs."
            )
    return replace(drive, rolling_resistance=crr, efficiency=efficiency)


def _climb_findings(
    build: Build, climb: Climb, rider: Rider, climb_speed: Limit
) -> Iterator[Output]:
    f = u.format_number
    drive = climb.drive
    needed = climb.needed_current()
    available = climb.available_current()
    holds = climb.holds()
    speed = climb.climbing_speed()
    walking = ms_to_kmh(climb.speed)
    subject = f"climb of {f(climb.grade)} % with rider '{rider.name}'"
    yield DerivedFigure(
        f"current per motor to climb {f(climb.grade)} % at {f(walking)} km/h, rider '{rider.name}'",
        u.quantity(needed, _A),
        note=f"{f(climb.mass)} kg with the vehicle",
        order=70,
    )
    yield DerivedFigure(
        f"full-throttle climbing speed on {f(climb.grade)} %, rider '{rider.name}'",
        u.quantity(ms_to_kmh(speed), _KMH),
        order=71,
    )
    drag = 0.5 * AIR_DENSITY_ISA * drive.drag_area * climb.speed**2
    force = climb.force(drive, drive.reduction)(climb.speed)
    steepest = steepest_grade(force, drag, climb.mass, drive.rolling_resistance)
    yield DerivedFigure(
        f"steepest grade held at {f(walking)} km/h, rider '{rider.name}'",
        u.quantity(min(steepest, 100.0), _PERCENT),
        note="100 % or more" if steepest >= 100.0 else "",
        order=72,
    )
    load = climb.load(climb.speed)
    situation = (
        f"Holding {f(walking)} km/h up {f(climb.grade)} % with {rider.name} "
        f"({f(climb.mass)} kg with the vehicle) takes {f(load)} N at the wheel, "
        f"{f(needed)} A per motor."
    )
    sources = (ROAD_LOAD, MOTOR_MODEL, climb_speed.source)
    if not holds:
        cause = (
            "its current limit"
            if drive.current_limit is not None and available >= drive.current_limit - 1e-9
            else "the pack through the winding at that speed"
        )
        fate = (
            "it stalls on the grade"
            if speed <= 0
            else f"it slows to {f(ms_to_kmh(speed))} km/h, below walking pace"
        )
        gives = (
            f"gives at most {f(available)} A per motor there ({cause})"
            if available > 0
            else "gives no driving current there (walking pace is above the motor's no-load "
            "speed on this gearing)"
        )
        yield Finding(
            Severity.FIX,
            subject,
            f"{situation} The drive {gives}, so {fate}; it holds "
            f"{f(min(steepest, 100.0))} % at walking pace.",
            measured=u.quantity(needed, _A),
            limit=u.quantity(available, _A),
            comparison=Comparison.AT_MOST,
            remedy=stall_remedy(build, climb, needed),
            sources=sources,
        )
        return
    rated = [m.rated_current for m in build.motors]
    if any(r is None for r in rated):
        yield Finding(
            Severity.UNASSESSED,
            subject,
            f"{situation} The drive holds it (full throttle: {f(ms_to_kmh(speed))} km/h), but "
            "the motor's rated continuous current is not given, so its heating on the climb "
            "could not be judged.",
            missing=tuple(f"motors[{i}].rated_current" for i, r in enumerate(rated) if r is None),
            sources=sources,
        )
        return
    lowest = min(_in(r, _A) for r in rated if r is not None)
    hot = needed > lowest
    text = (
        f"{situation} The drive holds it (full throttle: {f(ms_to_kmh(speed))} km/h); "
        f"the motor is rated {f(lowest)} A continuous."
    )
    if hot:
        text += (
            f" That is beyond its continuous rating: {f((needed / lowest) ** 2)} x the rated "
            "copper loss for as long as the climb lasts."
        )
    yield Finding(
        Severity.ADVISE if hot else Severity.PASS,
        subject,
        text,
        measured=u.quantity(needed, _A),
        limit=u.quantity(lowest, _A),
        comparison=Comparison.AT_MOST,
        remedy=heat_remedy(build, climb, lowest) if hot else None,
        sources=(*sources, COPPER_LOSS) if hot else sources,
    )


RULE = Rule(
    id="performance.hill",
    title="Climbing the steepest grade",
    check=check,
    sources=(ROAD_LOAD, MOTOR_MODEL, COPPER_LOSS),
    inputs=(
        "motors[].no_load_speed",
        "motors[].rated_voltage",
        "usage.steepest_grade",
        "riders",
        "vehicle.mass",
        "battery",
        "motors[].kv",
        "motors[].winding_resistance",
        "motors[].no_load_current",
        "motors[].rated_current",
        "controller.current_limit",
        "controller.max_duty",
        "drivetrain",
        "usage.rolling_resistance",
        "usage.drag_area",
        "wires",
    ),
    severities=(Severity.FIX, Severity.ADVISE, Severity.PASS, Severity.UNASSESSED),
)
