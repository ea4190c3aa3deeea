"""ride.heating and ride.energy, part two: the ride they judge. The build's route (or the
profile's reference route), each motor's winding as a thermal node and the pack, handed to the
time simulation of ``reviewer.engineering.ride``; one simulation per rider, shared by both rules.

Absent inputs take the side that heats faster or sags deeper, each stated: the profile's short
time constant, a pack that starts full (the most power), no pack resistance for heating (the
most current), one string in parallel.
"""

from __future__ import annotations

from dataclasses import dataclass

from firstride_rules._shared.time_constant import winding_time_constant
from firstride_rules._shared.wording import drive_model

from reviewer import figures
from reviewer.build import Build, Motor
from reviewer.engineering.ride import RideResult, Segment, simulate
from reviewer.engineering.ride_drive import SharedLines
from reviewer.engineering.ride_pack import PackModel
from reviewer.engineering.ride_thermal import (
    AirflowCooling,
    ConstantCooling,
    Winding,
    winding_from_rating,
)
from reviewer.engineering.roadload import Drive, ground_speed_for
from reviewer.engineering.thermal import (
    ThermalClass,
    calibrated_thermal_resistance,
    thermal_class,
)
from reviewer.findings import Assumption
from reviewer.profile import Profile
from reviewer.units import in_unit

_VOLTAGE_STEP = 0.05  # V: the grid the drive's lines are taken on (rounded down)
_TEMPERATURE_STEP = 5.0  # K: the same for each winding's temperature (rounded up)
_UNLIMITED_AH = 1.0e6  # a pack whose capacity is unknown: it never runs down (the most power)


@dataclass(frozen=True)
class Ride:
    """What the two rules share for one build: the route, the windings, the pack and one
    simulated ride per rider (None where the inputs do not allow one)."""

    route: str
    segments: tuple[Segment, ...]
    notes: tuple[Assumption, ...]
    classes: tuple[ThermalClass, ...]
    results: tuple[RideResult, ...]
    windings: tuple[Winding, ...]
    drive: Drive | None
    pack: PackModel | None
    missing: tuple[str, ...]  # what the heating judgement lacks
    energy_missing: tuple[str, ...]  # what the energy judgement lacks besides


_LAST: list[tuple[Build, Profile, Ride]] = []


def ride_of(build: Build, profile: Profile) -> Ride:
    """The ride of ``build`` under ``profile``, simulated once for both rules."""
    if _LAST and _LAST[0][0] is build and _LAST[0][1] is profile:
        return _LAST[0][2]
    ride = _simulate(build, profile)
    _LAST[:] = [(build, profile, ride)]
    return ride


def _simulate(build: Build, profile: Profile) -> Ride:
    # more road load is the pessimistic side for both heat and energy: the high defaults
    drive, drive_notes, drive_missing = drive_model(
        build,
        profile,
        defaults_from=("performance.hill.default_rolling_resistance", "ride.default_drag_area"),
    )
    segments, route, notes = route_segments(build, profile)
    notes = [*drive_notes, *notes]
    missing = list(drive_missing) + (["riders"] if not build.riders else [])
    classes, windings = [], []
    ambient = _ambient(build, profile, notes)
    for index, motor in enumerate(build.motors):
        lacking = [
            f"motors[{index}].{name}"
            for name in ("winding_resistance", "rated_current", "insulation_class")
            if getattr(motor, name) is None
        ]
        if lacking:
            missing += lacking
            continue
        grade = thermal_class(motor.insulation_class.value)  # type: ignore[union-attr]
        classes.append(grade)
        if drive is not None:
            windings.append(_winding(motor, grade, ambient, drive, profile, notes))
    notes.append(
        Assumption(
            "Each ride starts from rest with a full pack and the windings at the ambient "
            "temperature (a cold start: a second ride straight after starts hotter)."
        )
    )
    pack, energy_missing = _pack(build, notes)
    results: list[RideResult] = []
    if drive is not None and not missing and build.vehicle.mass is not None:
        assert pack is not None or build.battery is not None
        heat_pack = pack if pack is not None else _heating_pack(build)
        if pack is None:
            notes.append(
                Assumption(
                    f"{', '.join(energy_missing)} not given: for the winding's heat the pack is "
                    "taken as stiff and full all ride (the most power it could give)."
                )
            )
        cutoff = _cutoff(build)
        # a state's lines are the same whoever rides: the riders' rides share them
        shared = SharedLines(drive, tuple(windings), _VOLTAGE_STEP, _TEMPERATURE_STEP)
        for rider in build.riders:
            mass = in_unit(build.vehicle.mass, "kg") + in_unit(rider.mass, "kg")
            results.append(
                simulate(
                    drive,
                    mass,
                    segments,
                    tuple(windings),
                    heat_pack,
                    in_unit(profile.limit("ride.time_step").quantity, "s"),
                    cutoff_voltage=cutoff,
                    cruise_dt=in_unit(profile.limit("ride.cruise_time_step").quantity, "s"),
                    voltage_step=_VOLTAGE_STEP,
                    temperature_step=_TEMPERATURE_STEP,
                    shared=shared,
                )
            )
    return Ride(
        route,
        tuple(segments),
        tuple(notes),
        tuple(classes),
        tuple(results),
        tuple(windings),
        drive,
        pack,
        tuple(dict.fromkeys(missing)),
        energy_missing,
    )


def route_segments(build: Build, profile: Profile) -> tuple[list[Segment], str, list[Assumption]]:
    """The build's route, or the profile's reference route: a flat stretch with stops, the
    steepest grade for a stated length, and the way back (the climb as a descent)."""
    notes: list[Assumption] = []
    if build.route is not None:
        segments = [
            Segment(
                in_unit(s.length, "m"),
                in_unit(s.grade, "percent"),
                None if s.speed is None else in_unit(s.speed, "m/s"),
                s.stops,
            )
            for s in build.route.segments
        ]
        return segments, f"route '{build.route.name or 'of the build'}'", notes
    flat = profile.limit("ride.reference_route.flat_length")
    climb = profile.limit("ride.reference_route.climb_length")
    stops = int(profile.limit("ride.reference_route.stops").value)  # type: ignore[arg-type]
    if build.usage.steepest_grade is not None:
        grade = in_unit(build.usage.steepest_grade, "percent")
    else:
        default = profile.limit("ride.reference_route.default_grade")
        grade = in_unit(default.quantity, "percent")
        notes.append(
            Assumption(
                f"usage.steepest_grade not given: the reference route climbs {grade:g} %.",
                default.source,
            )
        )
    flat_m, climb_m = in_unit(flat.quantity, "m"), in_unit(climb.quantity, "m")
    notes.append(
        Assumption(
            f"No route given: the profile's reference route, {flat_m / 1000:g} km on the flat "
            f"with {stops} stops, {climb_m / 1000:g} km up {grade:g} %, and back, each at the "
            "drive's top speed.",
            flat.source,
        )
    )
    segments = [
        Segment(flat_m, 0.0, None, stops),
        Segment(climb_m, grade, None, 0),
        Segment(climb_m, -grade, None, 0),
        Segment(flat_m, 0.0, None, stops),
    ]
    return segments, "the profile's reference route", notes


def _ambient(build: Build, profile: Profile, notes: list[Assumption]) -> float:
    default = profile.limit("usage.default_ambient_temperature")
    ambient = figures.ambient_temperature(build, in_unit(default.quantity, "degC"))
    if build.usage.ambient_temperature is None:
        notes.append(
            Assumption(
                f"usage.ambient_temperature not given: {ambient:g} °C taken for the ride.",
                default.source,
            )
        )
    return ambient


def _winding(
    motor: Motor,
    grade: ThermalClass,
    ambient: float,
    drive: Drive,
    profile: Profile,
    notes: list[Assumption],
) -> Winding:
    assert motor.rated_current is not None and motor.winding_resistance is not None
    rated = in_unit(motor.rated_current, "A")
    r20 = in_unit(motor.winding_resistance, "ohm")
    r_th = calibrated_thermal_resistance(rated, r20, grade.rise_limit)
    tau, note = winding_time_constant(motor, r_th, profile)
    if note is not None:
        notes.append(note)
    cooling = motor.cooling
    if cooling.fan and (cooling.inlet_blocked or cooling.outlet_blocked):
        factor = cooling.blocked_cooling_factor or float(
            profile.limit("motor.blocked_cooling_factor").value  # type: ignore[arg-type]
        )
        cool: object = ConstantCooling(factor)
    elif cooling.fan and not cooling.fan_independent:
        still = cooling.blocked_cooling_factor or float(
            profile.limit("motor.blocked_cooling_factor").value  # type: ignore[arg-type]
        )
        line = drive.lines()[0]
        reference = ground_speed_for(line.no_load_speed, drive.reduction, drive.wheel_radius)
        cool = AirflowCooling(still, max(reference, 0.1))
    else:
        cool = ConstantCooling()
    return winding_from_rating(rated, r20, grade.rise_limit, tau, ambient, cool)  # type: ignore[arg-type]


def _pack(build: Build, notes: list[Assumption]) -> tuple[PackModel | None, tuple[str, ...]]:
    """The pack for the energy judgement (None with what is missing)."""
    battery = build.battery
    if battery is None:
        return None, ("battery",)
    missing = tuple(
        f"battery.{name}"
        for name in ("cell_capacity", "cell_internal_resistance", "cells_parallel")
        if getattr(battery, name) is None
    )
    if missing:
        return None, missing
    assert battery.cell_capacity is not None and battery.cells_parallel is not None
    resistance = figures.pack_resistance(battery)
    assert resistance is not None
    return (
        PackModel(
            battery.chemistry.value,
            battery.cells_series,
            in_unit(battery.cell_capacity, "mAh") / 1000.0 * battery.cells_parallel,
            resistance,
        ),
        (),
    )


def _heating_pack(build: Build) -> PackModel:
    """A pack for heating alone when its capacity or resistance is unknown: full all ride and
    stiff (no sag), the most power it could give."""
    battery = build.battery
    assert battery is not None
    resistance = figures.pack_resistance(battery) or 0.0
    strings = battery.cells_parallel or 1
    capacity = _UNLIMITED_AH
    if battery.cell_capacity is not None:
        capacity = in_unit(battery.cell_capacity, "mAh") / 1000.0 * strings
    return PackModel(battery.chemistry.value, battery.cells_series, capacity, resistance)


def _cutoff(build: Build) -> float | None:
    battery = build.battery
    if battery is None or battery.low_voltage_cutoff is None:
        return None
    return in_unit(battery.low_voltage_cutoff, "V")
