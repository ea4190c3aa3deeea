"""The operating chart: the drive's wheel force at full throttle against speed, with each rider's
road load on the flat and up the steepest grade; where they cross is that rider's steady top
speed (brief section 3: a one-dimensional root of drive force = road load).

``operating_data`` computes the numbers (plain floats, for tests and the report), and
``operating_svg`` draws them; ``operating_chart`` does both from a validated build.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Any

from reviewer import figures
from reviewer.build import Build
from reviewer.engineering.roadload import (
    Drive,
    ground_speed_for,
    kmh_to_ms,
    motor_speed_for,
    ms_to_kmh,
    road_load_force,
    top_speed,
    wheel_force,
)
from reviewer.plots import _style
from reviewer.profile import Profile
from reviewer.units import format_number, in_unit, unit

#: Speed grid step in km/h; coarser only for a drive so fast the grid would pass this many points.
SPEED_STEP_KMH = 0.25
MAX_POINTS = 600


@dataclass(frozen=True)
class RoadLoad:
    """One rider's road load on one grade, sampled on the chart's speed grid."""

    rider: str
    mass_kg: float  # vehicle and rider
    grade_percent: float
    force_n: tuple[float, ...]
    top_speed_kmh: float  # where the drive's force meets this load; 0 if it cannot move
    top_force_n: float  # the load (= the drive's force) at that speed


@dataclass(frozen=True)
class OperatingData:
    speeds_kmh: tuple[float, ...]
    drive_force_n: tuple[float, ...]  # the drive at full throttle (its max duty)
    loads: tuple[RoadLoad, ...]  # per rider: the flat first, then the steepest grade if any


def full_throttle_force(drive: Drive) -> Callable[[float], float]:
    """Wheel force in N at a ground speed in m/s, all motors at the drive's duty: the sum of the
    torque-speed lines times reduction and efficiency over the wheel radius."""
    lines = drive.lines()
    ratio, radius, efficiency = drive.reduction, drive.wheel_radius, drive.efficiency

    def force(speed: float) -> float:
        omega = motor_speed_for(speed, ratio, radius)
        return wheel_force(sum(line.torque(omega) for line in lines), ratio, efficiency, radius)

    return force


def no_load_ground_speed(drive: Drive) -> float:
    """The ground speed in m/s where the fastest motor's torque falls to zero."""
    return max(
        ground_speed_for(line.no_load_speed, drive.reduction, drive.wheel_radius)
        for line in drive.lines()
    )


def steady_speed(drive: Drive, total_mass: float, grade_percent: float = 0.0) -> float:
    """Steady speed in m/s at full throttle up ``grade_percent`` (the flat at 0): the root of
    the drive's force = road load; 0 where the drive cannot hold the vehicle on the grade.
    On the flat this is ``Drive.top_speed``."""
    return top_speed(
        full_throttle_force(drive),
        total_mass,
        drive.rolling_resistance,
        drive.drag_area,
        no_load_ground_speed(drive),
        grade_percent,
    )


def build_drive(build: Build, profile: Profile, bound: str = "high") -> Drive | None:
    """The build's drive model with the profile's default Crr and CdA (the model the speed
    rules judge), or None when the build lacks one of its inputs."""
    crr = float(profile.limit("usage.default_rolling_resistance").value)
    cda = in_unit(profile.limit("usage.default_drag_area").quantity, unit("m**2"))
    drive, _, missing = figures.drive_model(build, crr, cda, bound)
    return None if missing else drive


def riders_of(build: Build) -> list[tuple[str, float]]:
    """Each rider's name and the mass in kg of vehicle and rider together."""
    if build.vehicle.mass is None:
        return []
    vehicle = in_unit(build.vehicle.mass, "kg")
    return [(rider.name, vehicle + in_unit(rider.mass, "kg")) for rider in build.riders]


def steepest_grade_of(build: Build) -> float | None:
    grade = build.usage.steepest_grade
    return None if grade is None else in_unit(grade, unit("percent"))


def operating_data_for(
    drive: Drive, riders: Sequence[tuple[str, float]], grade_percent: float | None = None
) -> OperatingData:
    """The operating chart's numbers for a drive and riders given as (name, total mass kg),
    on the flat and, if given and not 0, up ``grade_percent``."""
    force = full_throttle_force(drive)
    grades = [0.0] + ([grade_percent] if grade_percent else [])
    tops = {
        (name, grade): steady_speed(drive, mass, grade) for name, mass in riders for grade in grades
    }
    reach = max([ms_to_kmh(no_load_ground_speed(drive)), *(1.15 * v for v in tops.values())])
    reach = max(reach, 1.0)
    step = max(SPEED_STEP_KMH, reach / MAX_POINTS)
    count = math.ceil(reach / step - 1e-9)
    speeds = tuple(i * step for i in range(count + 1))
    loads = tuple(
        RoadLoad(
            rider=name,
            mass_kg=mass,
            grade_percent=grade,
            force_n=tuple(
                road_load_force(
                    mass, kmh_to_ms(v), drive.rolling_resistance, drive.drag_area, grade
                )
                for v in speeds
            ),
            top_speed_kmh=ms_to_kmh(tops[name, grade]),
            top_force_n=road_load_force(
                mass, tops[name, grade], drive.rolling_resistance, drive.drag_area, grade
            ),
        )
        for name, mass in riders
        for grade in grades
    )
    return OperatingData(speeds, tuple(force(kmh_to_ms(v)) for v in speeds), loads)


def operating_data(build: Build, profile: Profile) -> OperatingData | None:
    """The operating chart's numbers for a validated build: every rider on the flat and up
    ``usage.steepest_grade``; None when the build lacks riders or the drive model's inputs."""
    drive = build_drive(build, profile)
    riders = riders_of(build)
    if drive is None or not riders:
        return None
    return operating_data_for(drive, riders, steepest_grade_of(build))


def speed_label(load: RoadLoad) -> str:
    """'Morgan, flat: 24.3 km/h' (three figures, as the review prints a top speed)."""
    where = "flat" if load.grade_percent == 0 else f"{format_number(load.grade_percent)} %"
    return f"{load.rider}, {where}: {format_number(load.top_speed_kmh)} km/h"


def operating_svg(data: OperatingData, title: str | None = None) -> str:
    """The operating chart as SVG text: wheel force (N) against speed (km/h)."""
    _style.require_matplotlib()

    def draw(figure: Any) -> None:
        ax = figure.add_subplot()
        speeds = data.speeds_kmh
        ax.plot(
            speeds,
            data.drive_force_n,
            color=_style.DRIVE_COLOUR,
            linewidth=2.2,
            label="drive at full throttle",
        )
        riders = list(dict.fromkeys(load.rider for load in data.loads))
        for load in data.loads:
            index = riders.index(load.rider)
            colour = _style.colour(index)
            dashed = load.grade_percent != 0
            where = "flat" if not dashed else f"{format_number(load.grade_percent)} % grade"
            ax.plot(
                speeds,
                load.force_n,
                color=colour,
                linestyle="--" if dashed else "-",
                linewidth=1.3,
                label=f"road load, {load.rider}, {where}",
            )
            if load.top_speed_kmh > 0:
                ax.plot(
                    [load.top_speed_kmh],
                    [load.top_force_n],
                    marker=_style.marker(index),
                    markersize=6,
                    markerfacecolor="white" if dashed else colour,
                    markeredgecolor=colour,
                    linestyle="none",
                )
            dx, align = _style.beside(load.top_speed_kmh, 0.0, speeds[-1])
            ax.annotate(
                speed_label(load)
                if load.top_speed_kmh > 0
                else f"{load.rider}: cannot move on {where}",
                xy=(load.top_speed_kmh, load.top_force_n),
                xytext=(dx, -12 if dashed else 6),
                textcoords="offset points",
                ha=align,
                fontsize=7.5,
                color=colour,
            )
        top = max([*data.drive_force_n, *(max(load.force_n) for load in data.loads)])
        ax.set_ylim(0.0, 1.08 * top if top > 0 else 1.0)
        ax.set_xlim(0.0, speeds[-1])
        ax.set_xlabel("speed (km/h)")
        ax.set_ylabel("force at the wheel (N)")
        ax.set_title(title or "Drive force and road load: top speed where they cross")
        figure.legend(loc="outside lower center", ncols=2, frameon=False)

    return _style.render("operating", draw)


def operating_chart(build: Build, profile: Profile, title: str | None = None) -> str | None:
    """The operating chart of a validated build as SVG text; None when it cannot be drawn."""
    _style.require_matplotlib()
    data = operating_data(build, profile)
    return None if data is None else operating_svg(data, title)
