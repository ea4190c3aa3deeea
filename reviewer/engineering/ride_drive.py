"""The drive at one pack voltage and winding temperature, as the ride simulation reads it: its
torque-speed lines, its pull at the wheel, its steady top speed on each grade, and how a cruise
shares its torque among the motors.

A ride passes through many such states as the pack drains and the windings warm; each steady top
speed lies close to the last one found for the same grade, so that bracket is tried first.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence

from reviewer.engineering.motor import TorqueSpeedLine
from reviewer.engineering.roadload import (
    AIR_DENSITY_ISA,
    Drive,
    bracketed_root,
    ground_speed_for,
    road_load_force,
    top_speed,
)
from reviewer.engineering.steady_speed import straight_piece_speed


class RideModelError(AssertionError):
    """An invariant of the model failed: a defect in the model, never an input's fault."""


def require(condition: bool, message: str) -> None:
    """Raise :class:`RideModelError` unless ``condition`` (kept under ``python -O``)."""
    if not condition:
        raise RideModelError(message)


class DriveAt:
    """The drive's lines at one pack voltage and winding temperature, and its cruise speeds.
    ``hints`` (shared by every state of one ride): the last top speed found per (grade, target).
    """

    def __init__(
        self,
        drive: Drive,
        lines: tuple[list[TorqueSpeedLine], Callable[[float], float]],
        mass: float,
        hints: dict[tuple[float, float | None], float] | None = None,
    ) -> None:
        """``lines``: the state's lines and wheel force, from :meth:`SharedLines.lines_for`."""
        self.drive, self.mass = drive, mass
        self.lines, self.pull = lines
        self._cruise: dict[tuple[float, float | None], float] = {}
        self._currents: dict[tuple[float, float | None], tuple[float, ...]] = {}
        self.hints = {} if hints is None else hints

    def cruise(self, grade: float, target: float | None) -> float:
        """min(target, the steady top speed on ``grade``) in m/s; 0 when it cannot climb."""
        key = (grade, target)
        found = self._cruise.get(key)
        if found is None:
            d = self.drive
            if target is not None and max(self.pull(target), 0.0) >= road_load_force(
                self.mass, target, d.rolling_resistance, d.drag_area, grade
            ):
                found = target  # the load only rises and the pull only falls
            else:
                found = self._top_speed(grade, self.hints.get(key))
            self._cruise[key] = self.hints[key] = found
        return found

    def cruise_currents(
        self, grade: float, target: float | None, torque: float
    ) -> tuple[float, ...]:
        """:func:`cruise_currents` at this state's cruise on ``grade`` for ``target`` (whose
        torque demand is ``torque`` N m), found once per state (a cruise holds one speed) and
        kept as a tuple, so no caller can change what the next one reads."""
        key = (grade, target)
        found = self._currents.get(key)
        if found is None:
            omega = self.cruise(grade, target) / self.drive.wheel_radius * self.drive.reduction
            found = self._currents[key] = tuple(cruise_currents(self.lines, torque, omega))
        return found

    def _top_speed(self, grade: float, hint: float | None) -> float:
        d, pull = self.drive, self.pull
        # road_load_force's terms, hoisted (the same arithmetic): steady + drag v^2
        steady = road_load_force(self.mass, 0.0, d.rolling_resistance, 0.0, grade)
        drag = 0.5 * AIR_DENSITY_ISA * d.drag_area
        exact = straight_piece_speed(
            self.lines, d.reduction, d.efficiency, d.wheel_radius, steady, drag, pull, clamped=True
        )
        if exact is not None:
            return exact

        def surplus(v: float) -> float:
            return max(pull(v), 0.0) - (steady + drag * v * v)

        if hint is not None and hint > 0.0:
            # the pull never rises with speed and the load always does: one crossing, most
            # often within 0.2 % of the last state's (a narrow bracket closes in fewer steps); a
            # winding heating through a climb moves it further
            for width in (0.002, 0.02, 0.1):
                low, high = (1.0 - width) * hint, (1.0 + width) * hint
                values = surplus(low), surplus(high)
                if values[0] > 0.0 > values[1]:
                    return bracketed_root(surplus, low, high, values=values)
        bound = max(
            ground_speed_for(line.no_load_speed, d.reduction, d.wheel_radius) for line in self.lines
        )
        return top_speed(
            lambda v: max(self.pull(v), 0.0),
            self.mass,
            d.rolling_resistance,
            d.drag_area,
            bound,
            grade,
        )


class SharedLines:
    """The drive's lines and wheel force at each (voltage, temperatures) state of a ride,
    shared by the rides of several riders on the same drive, windings and grids: a state's
    lines do not depend on who rides. ``simulate`` refuses it for another drive or grid."""

    def __init__(
        self, drive: Drive, windings: Sequence[object], voltage_step: float, t_step: float
    ) -> None:
        self.identity = (drive, tuple(windings), voltage_step, t_step)
        self.states: dict[
            tuple[int, ...], tuple[list[TorqueSpeedLine], Callable[[float], float]]
        ] = {}

    def lines_for(
        self, key: tuple[int, ...], voltage: float, extra: Sequence[float]
    ) -> tuple[list[TorqueSpeedLine], Callable[[float], float]]:
        found = self.states.get(key)
        if found is None:
            drive = self.identity[0]
            built = drive.lines_at(voltage, extra)
            found = self.states[key] = built, drive._drive_force(built, drive.reduction)
        return found


#: N m: a cruise demand this small is no demand (the top speed's root is found to 1e-9 of the
#: speed; the road load there is then a few 1e-9 N, far below this).
NO_TORQUE = 1e-6


def cruise_currents(lines: list[TorqueSpeedLine], torque: float, omega: float) -> list[float]:
    """Motor currents giving ``torque`` N m in all, shared in proportion to each line's
    torque at ``omega``; I = T / Kt + I0, never above the line. A demand at or below
    :data:`NO_TORQUE` (a top speed found where the road load itself is nil, coasting down a
    grade: what is left is the root's rounding) draws nothing."""
    if torque <= NO_TORQUE:
        return [0.0] * len(lines)
    if len(lines) == 1:  # the same arithmetic for the one-motor build, without the lists
        line = lines[0]
        most_one = line.current(omega)
        share = line.kt * (most_one - line.no_load_current)
        share = 0.0 if share < 0.0 else share  # max(share, 0.0)
        require(share >= torque * (1.0 - 1e-6), "cruise demands more torque than the drive gives")
        one = torque * share / share / line.kt + line.no_load_current
        return [most_one if most_one < one else one]  # min(one, most_one)
    most = [line.current(omega) for line in lines]
    maxima = [max(ln.kt * (c - ln.no_load_current), 0.0) for ln, c in zip(lines, most, strict=True)]
    total = sum(maxima)
    require(total >= torque * (1.0 - 1e-6), "cruise demands more torque than the drive gives")
    return [
        min(torque * m / total / ln.kt + ln.no_load_current, c)
        for ln, m, c in zip(lines, maxima, most, strict=True)
    ]
