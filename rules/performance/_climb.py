"""performance.hill, part two: the climb in SI floats (road load on the grade, the drive's force
at the wheel, the current it takes) and the remedies worked out on it, each re-checked with the
same model before it is named.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, replace

from reviewer import units as u
from reviewer.build import Build
from reviewer.engineering.motor import torque_constant
from reviewer.engineering.roadload import (
    STANDARD_GRAVITY,
    Drive,
    ground_speed_for,
    motor_speed_for,
    road_load_force,
    top_speed,
    wheel_force,
)

_MAX_REDUCTION = 100.0  # the build model's bound on drivetrain.ratio
_FEWEST_TEETH = 5  # the build model's bound on pulley teeth


@dataclass(frozen=True)
class Climb:
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


def steepest_grade(force: float, drag: float, mass: float, crr: float) -> float:
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


def gearing_remedy(build: Build, climb: Climb, current_cap: float | None) -> str | None:
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
                    f"fit a motor pulley of {teeth} teeth or fewer "
                    f"(drivetrain.motor_pulley_teeth) with the {wheel}-tooth wheel pulley "
                    f"({f(current)} A per motor on the climb)"
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
        f"(drivetrain.ratio; {f(climb.needed_current(rounded))} A per motor on the climb)"
    )


def stall_remedy(build: Build, climb: Climb, needed: float) -> str:
    parts = []
    gearing = gearing_remedy(build, climb, None)
    if gearing:
        parts.append(gearing)
    limit = climb.drive.current_limit
    if limit is not None:
        amps = math.ceil(needed - 1e-9)
        raised = Climb(
            replace(climb.drive, current_limit=float(amps)), climb.mass, climb.grade, climb.speed
        )
        if raised.holds():
            parts.append(
                f"raise the controller's current limit (controller.motor_current_limit) to at "
                f"least {amps} A per motor "
                "(check the wiring and motor heating at that current)"
            )
    if not parts:
        return (
            f"this drive cannot hold walking pace on {u.format_number(climb.grade)} % at any "
            "gearing in range: a stronger motor or a higher-voltage pack is needed"
        )
    return ", or ".join(parts)


def heat_remedy(build: Build, climb: Climb, rated: float) -> str:
    gearing = gearing_remedy(build, climb, rated)
    keep_short = "keep such climbs short and let the motor cool between them"
    if gearing:
        return f"{gearing}, or {keep_short}"
    return keep_short
