"""speed.rider-class: the top speed each rider reaches on the flat, against the limit for the
rider's class. A light rider is the fastest, so every rider is checked, not an average one."""

from __future__ import annotations

from collections.abc import Iterator

import pint
from firstride_rules._shared.wording import drive_model

from reviewer import figures
from reviewer import units as u
from reviewer.build import Build, Rider, RiderClass
from reviewer.engineering.motor import rad_s_to_rpm, torque_constant
from reviewer.engineering.roadload import (
    Drive,
    highest_duty_within,
    kinetic_energy,
    largest_pulley_within,
    ms_to_kmh,
    smallest_reduction_within,
    stopping_distance,
)
from reviewer.findings import Assumption, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Limit, Profile
from reviewer.rule import Output, Rule

KT_DEFINITION = Source("SI definition of the motor constants: Kt = Ke = 60 / (2 pi Kv)")
MOTOR_MODEL = Source.from_memory(
    "Chapman, Electric Machinery Fundamentals: DC motor torque-speed line V = Ke w + I R, "
    "T = Kt (I - I0)"
)
ROAD_LOAD = Source(
    "Road load F = m g (Crr cos(theta) + sin(theta)) + 0.5 rho CdA v^2; "
    "rho 1.225 kg/m^3 (ISA sea level), g 9.80665 m/s^2 (CGPM)"
)
ADULT_STOP_SOURCE = Source.common_practice(
    "An adult rider more than 20 % over the speed limit is a stop; a youth or child rider over "
    "it at all is a stop"
)
# An adult over the limit by more than this share is a stop rather than a fix (common practice).
ADULT_STOP_EXCESS = 0.20
_TOLERANCE_MS = 1e-9
_MAX_REDUCTION = 100.0  # the build model's bound on drivetrain.ratio
# Units parsed once: building quantities from unit text costs far more than the physics.
_KG = u.unit("kg")
_KJ = u.unit("kJ")
_KMH = u.unit("km/h")
_M = u.unit("m")
_MS2 = u.unit("m/s**2")
_NM_PER_A = u.unit("N*m/A")
_RPM = u.unit("rpm")
_RPM_PER_V = u.unit("rpm/V")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Top speed on the flat for each rider, against the profile's limit for the rider's class.

    What it checks
      Each rider (``riders[].mass``, ``riders[].class``: adult, youth or child) on the vehicle
      (``vehicle.mass``). The lightest rider is the fastest: rolling resistance grows with mass,
      so every rider gets a finding of their own.

    Formula
      Each motor is a torque-speed line at the pack's full voltage (``battery``) times
      ``controller.max_duty`` (100 % if unset): I(w) = min((V - Ke w) / R, I_lim),
      T = Kt (I - I0), Kt = Ke = 60 / (2 pi Kv) (``motors[].kv``, or no-load speed over rated
      voltage; ``motors[].no_load_current``, 0 if unset: the fast side). R is the loop at
      20 degC: winding (``motors[].winding_resistance``), switch and the motor's own wires, plus
      the pack and battery wiring they share (``wires``, ``battery.cell_internal_resistance``),
      counted once per motor and duty^2 times (averaged PWM; exact for identical motors). I_lim is
      ``controller.current_limit`` (none if unset). Wheel force is the sum over motors of
      T x reduction x efficiency / wheel radius (``drivetrain.ratio`` or pulley teeth,
      ``drivetrain.wheel_diameter``, ``drivetrain.efficiency``, 100 % if unset: again the fast
      side). Top speed is the root of wheel force = road load
      m g Crr + 0.5 rho CdA v^2 (flat, still air, rho 1.225 kg/m^3, g 9.80665 m/s^2), with Crr
      and CdA from ``usage.rolling_resistance`` and ``usage.drag_area`` or the profile's
      defaults (flagged as assumptions). Kinetic energy 0.5 m v^2 and stopping distance
      v^2 / (2 a) at the profile's ``speed.reference_deceleration`` are reported.

    Severities
      - stop: a youth or child rider over the class limit (``speed.max_speed.youth`` /
        ``.child``); an adult more than 20 % over ``speed.max_speed.adult``.
      - fix: an adult over the limit by 20 % or less.
      - pass: at or below the limit.
      - unassessed: riders, vehicle mass, battery, motors with Kv and winding resistance,
        reduction or wheel diameter absent (each named).

    The remedy gives the largest motor pulley smaller than the present one (or the smallest
    reduction above the present one) and the highest whole-percent max duty that each bring this
    rider's top speed within the limit, re-solved with the same model. A smaller pulley also
    gives more wheel torque; a larger one can lower the top speed of a current-limited drive
    too, but at the cost of torque, so it is not offered.
    """
    missing = figures.drive_model_missing(build)
    if not build.riders:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject="riders",
            rationale="The build lists no rider, so no top speed can be compared with a limit.",
            missing=("riders", *missing),
        )
        return
    if missing:
        for rider in build.riders:
            yield Finding(
                severity=Severity.UNASSESSED,
                subject=f"rider '{rider.name}'",
                rationale=(
                    "The top speed needs the vehicle's mass, the pack, each motor's Kv and "
                    "winding resistance, the reduction (ratio or pulley teeth) and the wheel "
                    "diameter."
                ),
                missing=missing,
                sources=(MOTOR_MODEL, ROAD_LOAD),
            )
        return
    drive, notes, _ = drive_model(build, profile)
    assert drive is not None
    yield Assumption(
        "Top speed is solved on flat ground in still air at sea-level air density.", ROAD_LOAD
    )
    yield from notes
    yield from _motor_figures(build, drive)
    deceleration = profile.limit("speed.reference_deceleration")
    for rider in build.riders:
        yield from _check_rider(build, drive, rider, profile, deceleration)


def _in(quantity: pint.Quantity, unit: pint.Unit) -> float:
    """Magnitude in ``unit``; build fields already sit in their fixed unit, so skip pint's
    conversion (the slow part of a review) when they do."""
    return u.in_unit(quantity, unit)


def _motor_figures(build: Build, drive: Drive) -> Iterator[DerivedFigure]:
    for motor, line in zip(build.motors, drive.lines(1.0), strict=True):
        name = f"motor '{motor.name}'"
        kv = line.kv_rpm_per_v
        yield DerivedFigure(f"Kv, {name}", u.quantity(kv, _RPM_PER_V), order=30)
        yield DerivedFigure(
            f"Kt, {name}",
            u.quantity(torque_constant(kv), _NM_PER_A),
            note="60 / (2 pi Kv); equal to Ke in V s/rad",
            order=31,
        )
        yield DerivedFigure(
            f"no-load speed at full voltage, {name}",
            u.quantity(rad_s_to_rpm(line.no_load_speed), _RPM),
            note=f"pack full {u.format_number(drive.full_voltage)} V, before any max duty",
            order=32,
        )


def _check_rider(
    build: Build, drive: Drive, rider: Rider, profile: Profile, deceleration: Limit
) -> Iterator[Output]:
    f = u.format_number
    limit = profile.limit(f"speed.max_speed.{rider.rider_class.value}")
    limit_ms = _in(limit.quantity, _KMH) / 3.6
    rider_mass = _in(rider.mass, _KG)
    assert build.vehicle.mass is not None
    mass = rider_mass + _in(build.vehicle.mass, _KG)
    speed = drive.top_speed(mass)
    energy = kinetic_energy(mass, speed)
    decel = _in(deceleration.quantity, _MS2)
    distance = stopping_distance(speed, decel)
    subject = f"rider '{rider.name}'"
    yield DerivedFigure(f"top speed, {subject}", u.quantity(ms_to_kmh(speed), _KMH), order=33)
    yield DerivedFigure(
        f"kinetic energy at top speed, {subject}",
        u.quantity(energy / 1000.0, _KJ),
        note="rider and vehicle",
        order=34,
    )
    yield DerivedFigure(
        f"braking distance from top speed, {subject}",
        u.quantity(distance, _M),
        note=f"at {f(decel)} m/s², no reaction time (brake.stopping gives the whole stop)",
        order=35,
    )

    over = speed > limit_ms + _TOLERANCE_MS
    if not over:
        severity = Severity.PASS
    elif (
        rider.rider_class is not RiderClass.ADULT
        or speed > limit_ms * (1.0 + ADULT_STOP_EXCESS) + _TOLERANCE_MS
    ):
        severity = Severity.STOP
    else:
        severity = Severity.FIX
    duty_text = "" if drive.duty >= 1.0 else f" at {drive.duty:.0%} max duty"
    rationale = (
        f"{rider.name} ({rider.rider_class.value}, {f(rider_mass)} kg; {f(mass)} kg with the "
        f"vehicle) reaches {f(ms_to_kmh(speed))} km/h on the flat on the full "
        f"{f(drive.full_voltage)} V pack{duty_text}, against the {f(ms_to_kmh(limit_ms))} km/h "
        f"{rider.rider_class.value} limit. At that speed rider and vehicle carry "
        f"{f(energy / 1000.0)} kJ and need {f(distance)} m to stop at {f(decel)} m/s²."
    )
    yield Finding(
        severity=severity,
        subject=subject,
        rationale=rationale,
        measured=u.quantity(ms_to_kmh(speed), _KMH),
        limit=u.quantity(ms_to_kmh(limit_ms), _KMH),
        remedy=None if severity is Severity.PASS else _remedy(build, drive, mass, limit_ms),
        sources=(
            limit.source,
            ADULT_STOP_SOURCE,
            KT_DEFINITION,
            MOTOR_MODEL,
            ROAD_LOAD,
            deceleration.source,
        ),
    )


def _remedy(build: Build, drive: Drive, mass: float, limit_ms: float) -> str:
    options = [_gearing_remedy(build, drive, mass, limit_ms), _duty_remedy(drive, mass, limit_ms)]
    texts = [text for text in options if text]
    if not texts:
        return (
            f"bring the top speed to {u.format_number(ms_to_kmh(limit_ms))} km/h or below with "
            "a lower-voltage pack or a speed limit in the controller"
        )
    return ", or ".join(texts)


def _gearing_remedy(build: Build, drive: Drive, mass: float, limit_ms: float) -> str | None:
    f = u.format_number
    drivetrain = build.drivetrain
    assert drivetrain is not None
    if drivetrain.motor_pulley_teeth and drivetrain.wheel_pulley_teeth:
        wheel_teeth = drivetrain.wheel_pulley_teeth
        teeth = largest_pulley_within(
            drive, mass, limit_ms, drivetrain.motor_pulley_teeth, wheel_teeth
        )
        if teeth is None:
            return None
        speed = drive.top_speed(mass, reduction=wheel_teeth / teeth)
        return (
            f"fit a motor pulley of {teeth} teeth or fewer (drivetrain.motor_pulley_teeth) "
            f"with the {wheel_teeth}-tooth wheel pulley ({f(ms_to_kmh(speed))} km/h)"
        )
    reduction = smallest_reduction_within(drive, mass, limit_ms, _MAX_REDUCTION)
    if reduction is None:
        return None
    speed = drive.top_speed(mass, reduction=reduction)
    return (
        f"use a reduction of at least {reduction:.2f}:1 motor turns per wheel turn "
        f"(drivetrain.ratio; {f(ms_to_kmh(speed))} km/h)"
    )


def _duty_remedy(drive: Drive, mass: float, limit_ms: float) -> str | None:
    percent = highest_duty_within(drive, mass, limit_ms)
    if percent is None:
        return None
    speed = drive.top_speed(mass, duty=percent / 100.0)
    return (
        f"set the controller's max duty (speed setting, controller.max_duty) at or below "
        f"{percent} % ({u.format_number(ms_to_kmh(speed))} km/h)"
    )


RULE = Rule(
    id="speed.rider-class",
    title="Top speed for each rider's class",
    check=check,
    sources=(KT_DEFINITION, MOTOR_MODEL, ROAD_LOAD, ADULT_STOP_SOURCE),
    inputs=(
        "motors[].no_load_speed",
        "motors[].rated_voltage",
        "riders",
        "vehicle.mass",
        "battery",
        "motors[].kv",
        "motors[].winding_resistance",
        "motors[].no_load_current",
        "controller.current_limit",
        "controller.max_duty",
        "drivetrain",
        "usage.rolling_resistance",
        "usage.drag_area",
        "wires",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
