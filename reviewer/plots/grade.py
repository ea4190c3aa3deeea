"""Speed against grade: each rider's steady speed at full throttle climbing grades from the flat
to the steepest one the build names (0-15 % if it names none). Where a curve reaches zero the
drive can no longer hold the vehicle on that grade.

The speeds come from the same drive model and root find as the operating chart
(:func:`reviewer.plots.operating.steady_speed`), so the curve starts at the flat top speed.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from reviewer.build import Build
from reviewer.engineering.roadload import Drive, ms_to_kmh
from reviewer.plots import _style
from reviewer.plots.operating import build_drive, riders_of, steady_speed, steepest_grade_of
from reviewer.profile import Profile
from reviewer.units import format_number

DEFAULT_STEEPEST = 15.0  # percent, when the build names no steepest grade
STEPS = 60  # grade intervals across the chart


@dataclass(frozen=True)
class GradeCurve:
    rider: str
    mass_kg: float  # vehicle and rider
    speeds_kmh: tuple[float, ...]  # one per grade of the chart; 0 where the drive cannot climb

    def first_stall(self, grades: Sequence[float]) -> float | None:
        """The least grade in percent of the chart at which the speed is 0, if any."""
        return next((g for g, v in zip(grades, self.speeds_kmh, strict=True) if v <= 0), None)


@dataclass(frozen=True)
class GradeData:
    grades_percent: tuple[float, ...]
    curves: tuple[GradeCurve, ...]
    steepest_given: float | None  # usage.steepest_grade, percent


def grade_data_for(
    drive: Drive,
    riders: Sequence[tuple[str, float]],
    steepest_percent: float | None = None,
    steps: int = STEPS,
) -> GradeData:
    """Speed against grade for a drive and riders given as (name, total mass kg), from 0 to
    ``steepest_percent`` (0-15 % when None or not above 0) in ``steps`` equal intervals."""
    if steps < 1:
        raise ValueError("steps must be at least 1")
    end = steepest_percent if steepest_percent and steepest_percent > 0 else DEFAULT_STEEPEST
    grades = tuple(end * i / steps for i in range(steps + 1))
    curves = tuple(
        GradeCurve(
            rider=name,
            mass_kg=mass,
            speeds_kmh=tuple(ms_to_kmh(steady_speed(drive, mass, g)) for g in grades),
        )
        for name, mass in riders
    )
    given = steepest_percent if steepest_percent and steepest_percent > 0 else None
    return GradeData(grades, curves, given)


def grade_data(build: Build, profile: Profile, steps: int = STEPS) -> GradeData | None:
    """Speed against grade for a validated build (the model the speed rules judge, flat top
    speed at 0 %); None when the build lacks riders or the drive model's inputs."""
    drive = build_drive(build, profile)
    riders = riders_of(build)
    if drive is None or not riders:
        return None
    return grade_data_for(drive, riders, steepest_grade_of(build), steps)


def grade_svg(data: GradeData, title: str | None = None) -> str:
    """Speed against grade as SVG text: steady speed (km/h) against grade (%)."""
    _style.require_matplotlib()

    def draw(figure: Any) -> None:
        ax = figure.add_subplot()
        grades = data.grades_percent
        for index, curve in enumerate(data.curves):
            colour = _style.colour(index)
            ax.plot(
                grades,
                curve.speeds_kmh,
                color=colour,
                linestyle=_style.LINE_STYLES[index % len(_style.LINE_STYLES)],
                label=f"{curve.rider} ({format_number(curve.mass_kg)} kg with the vehicle)",
            )
            stall = curve.first_stall(grades)
            if stall is not None:
                ax.plot(
                    [stall],
                    [0.0],
                    marker=_style.marker(index),
                    color=colour,
                    linestyle="none",
                    clip_on=False,
                )
                ax.annotate(
                    f"{curve.rider}: cannot climb {format_number(stall)} %",
                    xy=(stall, 0.0),
                    xytext=(-4, 8 + 11 * index),
                    textcoords="offset points",
                    ha="right",
                    fontsize=7.5,
                    color=colour,
                )
        if data.steepest_given is not None:
            ax.axvline(data.steepest_given, color=_style.LIMIT_COLOUR, linewidth=1.0)
            ax.annotate(
                f"steepest grade given: {format_number(data.steepest_given)} %",
                xy=(data.steepest_given, 1.0),
                xycoords=("data", "axes fraction"),
                xytext=(-4, -12),
                textcoords="offset points",
                ha="right",
                fontsize=7.5,
                color=_style.LIMIT_COLOUR,
            )
        fastest = max((max(c.speeds_kmh) for c in data.curves), default=0.0)
        ax.set_ylim(0.0, 1.12 * fastest if fastest > 0 else 1.0)
        ax.set_xlim(0.0, grades[-1])
        ax.set_xlabel("grade (%, rise over run)")
        ax.set_ylabel("steady speed at full throttle (km/h)")
        ax.set_title(title or "Speed against grade")
        ax.legend(loc="lower left", frameon=False)

    return _style.render("grade", draw)


def grade_chart(build: Build, profile: Profile, title: str | None = None) -> str | None:
    """Speed against grade of a validated build as SVG text; None when it cannot be drawn."""
    _style.require_matplotlib()
    data = grade_data(build, profile)
    return None if data is None else grade_svg(data, title)
