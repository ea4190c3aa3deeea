"""The steady speed where a drive's pull meets the road load, in closed form where it has one.

The pull at the wheel of motors on one gearing is G sum Kt (I - I0) with G = reduction x
efficiency / radius and w = v reduction / radius (``motor.drive_force_function``); each line's
current is the least of three pieces: voltage-limited (V - Ke w) / R, the current limit, and the
battery limit's curve. The road load is ``steady + drag v^2`` (brief 3: rolling resistance and
grade in ``steady``, 1/2 rho CdA in ``drag``). Two of the pieces are straight:

- every line voltage-limited: the pull is a - b v, and the speed is the root of the quadratic
  drag v^2 + b v - (a - steady) = 0 (taken in its cancellation-free form);
- every line at its current limit: the pull is a constant c, v = sqrt((c - steady) / drag);
- down a grade, with the pull clamped at zero (a motor past its no-load speed is not counted
  as a brake): v = sqrt(-steady / drag), where the load itself is nil.

A candidate is kept only where every line's own current takes the assumed piece at it, so the
pull there is the piece's: the pull never rises with speed and the load always does, so there
is one crossing and this is it. A line on its battery limit, or lines on different pieces, give
None, and the caller searches for the root as before (``roadload.top_speed``).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence

from reviewer.engineering.motor import TorqueSpeedLine


def straight_piece_speed(
    lines: Sequence[TorqueSpeedLine],
    ratio: float,
    efficiency: float,
    radius: float,
    steady: float,
    drag: float,
    pull: Callable[[float], float],
    *,
    clamped: bool,
) -> float | None:
    """The steady speed in m/s, or None where no straight piece holds it.

    ``pull``: the lines' wheel force against speed (``drive_force_function`` of the same lines
    and gearing), read to confirm the pieces. ``clamped``: the surplus is ``max(pull, 0) -
    load`` (a descent's speed), not ``pull - load``.
    """
    gain = ratio * efficiency / radius
    per_speed = ratio / radius  # rad/s of the motor per m/s
    a = b = c = 0.0
    limited = True
    for line in lines:
        r = line.loop_resistance
        a += line.kt * (line.voltage / r - line.no_load_current)
        b += line.kt * line.ke / r
        if line.current_limit is None:
            limited = False
        else:
            c += line.kt * (line.current_limit - line.no_load_current)
    a, b, c = gain * a, gain * per_speed * b, gain * c
    # the candidates in turn: voltage-limited, at the current limit, the pull spent
    if a > steady and b > 0.0:
        root = math.sqrt(b * b + 4.0 * drag * (a - steady)) if drag > 0.0 else b
        speed = 2.0 * (a - steady) / (b + root)
        if speed > 0.0 and _on_piece(lines, "V", speed * per_speed, pull, speed, clamped):
            return speed
    if drag > 0.0:
        if limited and c > steady:
            speed = math.sqrt((c - steady) / drag)
            if speed > 0.0 and _on_piece(lines, "I", speed * per_speed, pull, speed, clamped):
                return speed
        if clamped and steady < 0.0:
            speed = math.sqrt(-steady / drag)
            if speed > 0.0 and pull(speed) <= 0.0:
                return speed
    return None


def _on_piece(
    lines: Sequence[TorqueSpeedLine],
    piece: str,
    omega: float,
    pull: Callable[[float], float],
    speed: float,
    clamped: bool,
) -> bool:
    """Whether every line's current takes ``piece`` ("V" or "I") at ``omega`` and, clamped,
    whether the pull is not below zero there."""
    for line in lines:
        unlimited = (line.voltage - line.ke * omega) / line.loop_resistance
        limit = line.current_limit
        if piece == "V":
            current = unlimited
            if limit is not None and limit < unlimited:
                return False
        else:
            assert limit is not None
            current = limit
            if limit > unlimited:
                return False
        if line.battery_limit is not None and line.current(omega) < current:
            return False
    return not clamped or pull(speed) >= 0.0
