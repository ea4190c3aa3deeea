"""ride.heating: the hottest each motor's winding gets over the ride, stepped in time, against its
insulation class; and how long the steepest climb can last at full load before the limit.
"""

from __future__ import annotations

import math
from collections.abc import Iterator

from firstride_rules.ride._model import Ride, ride_of

from reviewer import units as u
from reviewer.build import Build, Motor, Rider
from reviewer.engineering.ride import RideResult
from reviewer.engineering.ride_thermal import time_to_temperature
from reviewer.engineering.roadload import motor_speed_for, ms_to_kmh
from reviewer.engineering.thermal import ThermalClass
from reviewer.findings import DerivedFigure, Finding, Severity, Source, SourceStatus
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import in_unit

FIRST_ORDER = Source(
    "First-order winding model C dtheta/dt = P_loss(theta) - (theta - theta_amb) / R_th, tau = "
    "R_th C, stepped exactly; R_th calibrated on the rated continuous current (brief 12; Newton "
    "cooling)",
    SourceStatus.DERIVED,
)
IEC_60085 = Source("IEC 60085: thermal classes A 105, E 120, B 130, F 155, H 180, N 200 degC")
IEC_60034_1 = Source(
    "IEC 60034-1: winding temperature-rise limits over 40 degC coolant, resistance method"
)
_DEGC = u.unit("degC")
_MIN = u.unit("min")
_TOLERANCE_K = 1e-6


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Peak winding temperature of each motor over the ride, for each rider.

    What it checks
      The ride is the build's ``route`` (``[[route.segments]]``: length, grade, optional target
      speed and stops) or the profile's reference route (a flat stretch with stops, the
      steepest grade ``usage.steepest_grade`` for ``ride.reference_route.climb_length``, and
      back). Each rider rides it in the time simulation of ``reviewer.engineering.ride``: the
      drive's operating point each second (both controller limits), each winding a first-order
      thermal node with its time constant (``motors[].thermal_time_constant``, else estimated
      from ``motors[].mass``, else the profile's ``ride.default_time_constant``) and its
      thermal resistance calibrated on ``rated_current`` like ``motor.cooling``'s, a shaft fan's
      cooling growing with speed (none at rest). The peak temperature is compared with 40 degC
      plus the IEC 60034-1 rise limit and with the IEC 60085 class temperature. Beside it: the
      time the steepest climb can be held at full throttle before the rise limit, and the hill
      length that makes.

    Severities
      - stop: the winding passes its class temperature on the ride (or runs away).
      - fix: it passes the rise limit but not the class; the route cannot be ridden (the drive
        stalls on a grade).
      - pass: within the rise limit all ride.
      - unassessed: riders, the drive model, a motor's winding resistance, rated current or
        insulation class missing (named).
    """
    ride = ride_of(build, profile)
    if ride.missing or not ride.results:
        yield Finding(
            Severity.UNASSESSED,
            "winding heat over the ride",
            "Heating over the ride needs the riders, the drive model and each motor's winding "
            "resistance, rated continuous current and insulation class.",
            missing=ride.missing or ("riders",),
            sources=(FIRST_ORDER,),
        )
        return
    yield from ride.notes
    for rider, result in zip(build.riders, ride.results, strict=True):
        for index, motor in enumerate(build.motors):
            yield from _motor(build, ride, rider, result, index, motor)


def _motor(
    build: Build, ride: Ride, rider: Rider, result: RideResult, index: int, motor: Motor
) -> Iterator[Output]:
    f = u.format_number
    grade = ride.classes[index]
    temperatures = [sample[index] for sample in result.winding_c]
    peak = max(temperatures) if temperatures else math.nan
    when = result.time_s[temperatures.index(peak)] if temperatures else 0.0
    where = result.distance_m[temperatures.index(peak)] if temperatures else 0.0
    name = f"motor '{motor.name}', rider '{rider.name}'"
    yield DerivedFigure(
        f"peak winding temperature on the ride, {name}",
        u.quantity(peak, _DEGC) if math.isfinite(peak) else "runaway",
        note=f"{ride.route}, after {f(when / 60)} min, at {f(where / 1000)} km",
        order=44,
        series=(
            ("time", "s", tuple(result.time_s)),
            ("speed", "km/h", tuple(ms_to_kmh(v) for v in result.speed_ms)),
            ("motor current", "A", tuple(c[index] for c in result.motor_current_a)),
            ("winding temperature", "degC", tuple(temperatures)),
            ("pack voltage", "V", tuple(result.terminal_v)),
        ),
    )
    hold, hill = _steepest_hold(build, ride, rider, index, grade)
    if hold is not None:
        yield DerivedFigure(
            f"full-load time on the steepest climb before the rise limit, {name}",
            u.quantity(hold / 60, _MIN) if math.isfinite(hold) else "no limit reached",
            note=f"from {f(result.winding_c[0][index])} °C; {hill}",
            order=45,
        )
    limit, ceiling = grade.rise_limit_temperature, grade.class_temperature
    text = (
        f"Riding {ride.route} ({f(result.distance / 1000)} km), motor '{motor.name}' with "
        f"rider '{rider.name}' peaks at {f(peak)} °C after {f(when / 60)} min "
        f"({f(where / 1000)} km in); class {grade.letter} allows {f(limit)} °C (40 °C plus its "
        f"{f(grade.rise_limit)} K rise) and fails at {f(ceiling)} °C."
    )
    if hold is None and hill:
        text += f" On the steepest climb {hill}."
    elif hold is not None and math.isfinite(hold):
        text += (
            f" The steepest climb at full load reaches the rise limit after {f(hold / 60)} min "
            f"({hill})."
        )
    severity = Severity.PASS
    if not math.isfinite(peak) or peak > ceiling + _TOLERANCE_K:
        severity = Severity.STOP
    elif peak > limit + _TOLERANCE_K:
        severity = Severity.FIX
    if result.stop_reason is not None and "climb" in result.stop_reason:
        text += f" The ride ends early: {result.stop_reason}."
        severity = max(severity, Severity.FIX, key=_rank)
    remedy = None
    if severity is not Severity.PASS:
        remedy = (
            "keep climbs at full load shorter than the rise limit allows"
            + (f" ({hill})" if hold is not None and math.isfinite(hold) else "")
            + ", lower controller.motor_current_limit, gear the motor down (drivetrain.ratio), "
            "or cool it better (a fan with its own drive)"
        )
    yield Finding(
        severity,
        f"winding heat over the ride, {name}",
        text,
        measured=u.quantity(peak, _DEGC) if math.isfinite(peak) else "runaway",
        limit=u.quantity(limit, _DEGC),
        remedy=remedy,
        sources=(FIRST_ORDER, IEC_60085, IEC_60034_1),
    )


def _rank(severity: Severity) -> int:
    return (Severity.PASS, Severity.ADVISE, Severity.FIX, Severity.STOP).index(severity)


def _steepest_hold(
    build: Build, ride: Ride, rider: Rider, index: int, grade: ThermalClass
) -> tuple[float | None, str]:
    """Seconds at full throttle up the route's steepest climb before the rise limit, and the
    hill length that makes (None without a climb or a drive)."""
    drive = ride.drive
    climbs = [s.grade_percent for s in ride.segments if s.grade_percent > 0]
    if drive is None or not climbs or build.vehicle.mass is None or not ride.windings:
        return None, ""
    steepest = max(climbs)
    mass = in_unit(build.vehicle.mass, "kg") + in_unit(rider.mass, "kg")
    lines = drive.lines()
    speed = drive.climb_speed(mass, steepest)
    if speed <= 0:
        return None, f"the drive stalls on {steepest:g} %"
    omega = motor_speed_for(speed, drive.reduction, drive.wheel_radius)
    current = max(lines[index].current(omega), 0.0)
    winding = ride.windings[index]
    seconds = time_to_temperature(
        winding.initial_c, current, grade.rise_limit_temperature, winding, speed
    )
    if not math.isfinite(seconds):
        return seconds, f"{steepest:g} % can be climbed for as long as it lasts"
    return (
        seconds,
        f"a {seconds * speed / 1000:.2g} km climb at {steepest:g} % and "
        f"{ms_to_kmh(speed):.3g} km/h",
    )


RULE = Rule(
    id="ride.heating",
    title="Winding heat over the ride",
    check=check,
    sources=(FIRST_ORDER, IEC_60085, IEC_60034_1),
    inputs=(
        "route",
        "riders",
        "vehicle.mass",
        "battery",
        "motors",
        "motors[].thermal_time_constant",
        "motors[].mass",
        "drivetrain",
        "controller",
        "usage.steepest_grade",
        "usage.ambient_temperature",
        "usage.rolling_resistance",
        "usage.drag_area",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
