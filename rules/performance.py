"""performance.hill: can the drive carry the heaviest rider up the steepest grade the builder
rides, and at what current?

On a climb the grade term m g sin(theta) dwarfs everything else at walking pace, so the motor
needs a current that does not fall with speed: a current limit below it stalls the vehicle on
the hill, and a current above the motor's rating heats it however slowly the rider goes.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Generator, Iterator
from dataclasses import dataclass, replace

from reviewer import derived
from reviewer import units as u
from reviewer.build import Build, Rider
from reviewer.engineering.motor import torque_constant
from reviewer.engineering.roadload import (
    AIR_DENSITY_ISA,
    STANDARD_GRAVITY,
    Drive,
    ground_speed_for,
    kmh_to_ms,
    motor_speed_for,
    ms_to_kmh,
    road_load_force,
    top_speed,
    wheel_force,
)
from reviewer.findings import Assumption, Comparison, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Limit, Profile
from reviewer.rule import Output, Rule

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

_in = derived.in_unit  # skips pint's conversion for fields already in the unit asked
_A = u.unit("A")
_KG = u.unit("kg")
_KMH = u.unit("km/h")
_PERCENT = u.unit("percent")
_MAX_REDUCTION = 100.0  # the build model's bound on drivetrain.ratio
_FEWEST_TEETH = 5  # the build model's bound on pulley teeth


@dataclass(frozen=True)
class _Climb:
    """The heaviest rider's climb in SI floats."""

    drive: Drive  # with the climb's Crr and efficiency
    mass: float  # kg, vehicle and rider
    grade: float  # percent
    speed: float  # m/s, the steady climbing speed judged (walking pace)

    def load(self, speed: float) -> float:
        drive = self.drive
        return road_load_force(
            self.mass, speed, drive.rolling_resistance, drive.drag_area, self.grade
        )

    def force(self, drive: Drive, reduction: float) -> Callable[[float], float]:
        lines = drive.lines()
        radius, efficiency = drive.wheel_radius, drive.efficiency

        def at(speed: float) -> float:
            omega = motor_speed_for(speed, reduction, radius)
            torque = sum(line.torque(omega) for line in lines)
            return wheel_force(torque, reduction, efficiency, radius)

        return at

    def holds(self, reduction: float | None = None, current_cap: float | None = None) -> bool:
        """Whether the drive (re-geared, or capped at a lower current) holds the judged speed
        on the grade."""
        drive = self.drive
        if current_cap is not None:
            limit = drive.current_limit
            drive = replace(
                drive, current_limit=current_cap if limit is None else min(limit, current_cap)
            )
        ratio = drive.reduction if reduction is None else reduction
        return self.force(drive, ratio)(self.speed) >= self.load(self.speed)

    def needed_current(self, reduction: float | None = None) -> float:
        """Current in A each motor carries to hold the judged speed on the grade, all motors
        at the same current: sum Kt (I - I0) x reduction x eff / r = load."""
        drive = self.drive
        ratio = drive.reduction if reduction is None else reduction
        kts = [torque_constant(motor.kv_rpm_per_v) for motor in drive.motors]
        shaft = self.load(self.speed) * drive.wheel_radius / (ratio * drive.efficiency)
        friction = sum(
            kt * motor.no_load_current for kt, motor in zip(kts, drive.motors, strict=True)
        )
        return (shaft + friction) / sum(kts)

    def available_current(self) -> float:
        """The most current the weakest motor's line gives at the judged speed: the current
        limit, or the pack over the loop less the back-EMF."""
        omega = motor_speed_for(self.speed, self.drive.reduction, self.drive.wheel_radius)
        return min(line.current(omega) for line in self.drive.lines())

    def climbing_speed(self) -> float:
        """Steady speed in m/s at full throttle on the grade; 0 if it cannot start."""
        drive = self.drive
        bound = max(
            ground_speed_for(line.no_load_speed, drive.reduction, drive.wheel_radius)
            for line in drive.lines()
        )
        force = self.force(drive, drive.reduction)
        return top_speed(
            force, self.mass, drive.rolling_resistance, drive.drag_area, bound, self.grade
        )


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
    drive, _, missing = derived.drive_model(build, profile)
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
    climb_speed = profile.limit("performance.hill.climb_speed")
    drive = yield from _climb_drive(build, drive, profile)
    rider = max(build.riders, key=lambda r: _in(r.mass, _KG))
    mass = _in(build.vehicle.mass, _KG) + _in(rider.mass, _KG)
    grade = _in(build.usage.steepest_grade, _PERCENT)
    climb = _Climb(drive, mass, grade, kmh_to_ms(_in(climb_speed.quantity, _KMH)))
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
            f"Rolling resistance not given: Crr {crr:g} taken for hills.", limit.source
        )
    efficiency = drive.efficiency
    if build.drivetrain.efficiency is None:
        limit = profile.limit("performance.hill.default_drivetrain_efficiency")
        efficiency = _in(limit.quantity, _PERCENT) / 100.0
        yield Assumption(
            f"Drivetrain efficiency not given: {u.format_number(efficiency * 100)} % taken for "
            "hills.",
            limit.source,
        )
    if build.usage.drag_area is None:
        yield Assumption(
            f"Drag area not given: CdA {drive.drag_area:g} m² taken.",
            profile.limit("usage.default_drag_area").source,
        )
    for motor in build.motors:
        if motor.no_load_current is None:
            yield Assumption(
                f"Motor '{motor.name}': no-load current not given, taken as 0 A, which "
                "understates the current a climb needs."
            )
    return replace(drive, rolling_resistance=crr, efficiency=efficiency)


def _steepest_grade(force: float, drag: float, mass: float, crr: float) -> float:
    """The steepest grade in percent on which ``force`` N (less ``drag`` N) holds ``mass`` kg:
    the root of Crr cos(theta) + sin(theta) = k, theta = asin(k / sqrt(1 + Crr^2)) - atan(Crr);
    ``math.inf`` if it would hold the vehicle on a vertical wall."""
    k = (force - drag) / (mass * STANDARD_GRAVITY)
    if k < crr:
        return 0.0
    reach = k / math.hypot(1.0, crr)
    if reach >= 1.0:
        return math.inf
    theta = math.asin(reach) - math.atan(crr)
    return 100.0 * math.tan(theta) if theta < math.pi / 2 else math.inf


def _climb_findings(
    build: Build, climb: _Climb, rider: Rider, climb_speed: Limit
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
        u.Quantity(needed, _A),
        note=f"{f(climb.mass)} kg with the vehicle",
        order=70,
    )
    yield DerivedFigure(
        f"full-throttle climbing speed on {f(climb.grade)} %, rider '{rider.name}'",
        u.Quantity(ms_to_kmh(speed), _KMH),
        order=71,
    )
    drag = 0.5 * AIR_DENSITY_ISA * drive.drag_area * climb.speed**2
    force = climb.force(drive, drive.reduction)(climb.speed)
    steepest = _steepest_grade(force, drag, climb.mass, drive.rolling_resistance)
    yield DerivedFigure(
        f"steepest grade held at {f(walking)} km/h, rider '{rider.name}'",
        u.Quantity(min(steepest, 100.0), _PERCENT),
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
        yield Finding(
            Severity.FIX,
            subject,
            f"{situation} The drive gives at most {f(available)} A per motor there "
            f"({cause}), so {fate}; it holds {f(min(steepest, 100.0))} % at walking pace.",
            measured=u.Quantity(needed, _A),
            limit=u.Quantity(available, _A),
            comparison=Comparison.AT_MOST,
            remedy=_stall_remedy(build, climb, needed),
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
        measured=u.Quantity(needed, _A),
        limit=u.Quantity(lowest, _A),
        comparison=Comparison.AT_MOST,
        remedy=_heat_remedy(build, climb, lowest) if hot else None,
        sources=(*sources, COPPER_LOSS) if hot else sources,
    )


def _gearing(build: Build, climb: _Climb, current_cap: float | None) -> str | None:
    """The least change of gearing, up from the present, at which the climb holds walking pace
    within ``current_cap`` (and the current limit); None if no gearing in range does."""
    f = u.format_number
    drivetrain = build.drivetrain
    assert drivetrain is not None
    if drivetrain.motor_pulley_teeth and drivetrain.wheel_pulley_teeth:
        wheel = drivetrain.wheel_pulley_teeth
        for teeth in range(drivetrain.motor_pulley_teeth - 1, _FEWEST_TEETH - 1, -1):
            if climb.holds(wheel / teeth, current_cap):
                current = climb.needed_current(wheel / teeth)
                return (
                    f"fit a motor pulley of {teeth} teeth or fewer with the {wheel}-tooth "
                    f"wheel pulley ({f(current)} A per motor on the climb)"
                )
        return None
    present = climb.drive.reduction
    failing, trial = present, present
    while trial < _MAX_REDUCTION:
        trial = min(trial * 1.05, _MAX_REDUCTION)
        if climb.holds(trial, current_cap):
            break
        failing = trial
    else:
        return None
    passing = trial
    while passing - failing > 0.005:
        middle = 0.5 * (failing + passing)
        if climb.holds(middle, current_cap):
            passing = middle
        else:
            failing = middle
    rounded = min(math.ceil(passing * 100.0 - 1e-9) / 100.0, _MAX_REDUCTION)
    while not climb.holds(rounded, current_cap) and rounded < _MAX_REDUCTION:
        rounded = min(rounded + 0.01, _MAX_REDUCTION)
    if not climb.holds(rounded, current_cap):
        return None
    return (
        f"use a reduction of at least {rounded:.2f}:1 motor turns per wheel turn "
        f"({f(climb.needed_current(rounded))} A per motor on the climb)"
    )


def _stall_remedy(build: Build, climb: _Climb, needed: float) -> str:
    parts = []
    gearing = _gearing(build, climb, None)
    if gearing:
        parts.append(gearing)
    limit = climb.drive.current_limit
    if limit is not None:
        amps = math.ceil(needed - 1e-9)
        raised = _Climb(
            replace(climb.drive, current_limit=float(amps)), climb.mass, climb.grade, climb.speed
        )
        if raised.holds():
            parts.append(
                f"raise the controller's current limit to at least {amps} A per motor "
                "(check the wiring and motor heating at that current)"
            )
    if not parts:
        return (
            f"this drive cannot hold walking pace on {u.format_number(climb.grade)} % at any "
            "gearing in range: a stronger motor or a higher-voltage pack is needed"
        )
    return ", or ".join(parts)


def _heat_remedy(build: Build, climb: _Climb, rated: float) -> str:
    gearing = _gearing(build, climb, rated)
    keep_short = "keep such climbs short and let the motor cool between them"
    if gearing:
        return f"{gearing}, or {keep_short}"
    return keep_short


RULE = Rule(
    id="performance.hill",
    title="Climbing the steepest grade",
    check=check,
    sources=(ROAD_LOAD, MOTOR_MODEL, COPPER_LOSS),
    inputs=(
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
