"""Stopping on the flat and on a descent, friction limits, shorted-motor braking with inductance
and the speed a vehicle runs away to downhill, in SI floats.

Stopping distance s = v t_r + v^2 / (2 a_net), with a_net = a - g sin(theta) on a descent of
angle theta (brief 14; constant-deceleration kinematics). A brake whose deceleration does not
beat the slope never stops the vehicle: the distance is ``math.inf``. Tyre friction caps the
deceleration at mu g cos(theta) (Coulomb friction on an incline; brief 14 gives mu g on the flat).

A shorted motor's braking current meets the winding's inductance as well as its resistance:
I = E / sqrt(R^2 + (w_e L)^2), w_e = pole pairs x mechanical speed (AC circuit theory, brief
14, from memory). Above the corner w_e = R / L the current stops rising with speed, and the
braking torque, P_cu / w, peaks at the corner and falls beyond it.

Grades are rise over run in percent, positive downhill where a name says ``descent``.
"""

from __future__ import annotations

import math
from collections.abc import Callable

from reviewer.engineering.roadload import (
    AIR_DENSITY_ISA,
    STANDARD_GRAVITY,
    bracketed_root,
    grade_angle,
    road_load_force,
)


def grade_percent_to_angle(grade_percent: float) -> float:
    """Slope angle in rad of a grade in percent (rise over run): atan(grade / 100)."""
    return grade_angle(grade_percent)


def angle_to_grade_percent(angle_rad: float) -> float:
    """Grade in percent (rise over run) of a slope angle in rad: 100 tan(theta)."""
    if not -math.pi / 2 < angle_rad < math.pi / 2:
        raise ValueError("slope angle must lie strictly between -90 and 90 degrees")
    return 100.0 * math.tan(angle_rad)


def net_deceleration(brake_deceleration: float, descent_percent: float = 0.0) -> float:
    """Deceleration in m/s^2 left after gravity's pull along a descent: a - g sin(theta).

    A negative ``descent_percent`` is a climb, which helps the brake.
    """
    theta = grade_percent_to_angle(descent_percent)
    return brake_deceleration - STANDARD_GRAVITY * math.sin(theta)


def braking_distance(speed_ms: float, deceleration: float) -> float:
    """Distance in m to stop from ``speed_ms`` at a constant net deceleration: v^2 / (2 a);
    ``math.inf`` when the deceleration is not positive."""
    if speed_ms < 0:
        raise ValueError("speed must not be negative")
    if deceleration <= 0:
        return math.inf
    return speed_ms * speed_ms / (2.0 * deceleration)


def stopping_distance(
    speed_ms: float,
    brake_deceleration: float,
    reaction_time_s: float = 0.0,
    descent_percent: float = 0.0,
    *,
    gravity_during_reaction: bool = False,
) -> float:
    """Distance in m from the moment a hazard appears: v t_r + v^2 / (2 (a - g sin theta)).

    The plain formula (brief 14) covers the reaction time at the starting speed. On a descent
    the vehicle gathers speed before the brake acts; ``gravity_during_reaction`` counts that,
    at g sin(theta) with rolling and drag left out (the pessimistic side): 25 km/h, 1 s, a 12 %
    descent and a 3.0 m/s^2 brake give 25.5 m instead of 20.1 m. ``math.inf`` when the brake
    cannot beat the slope.
    """
    if reaction_time_s < 0:
        raise ValueError("reaction time must not be negative")
    if speed_ms < 0:
        raise ValueError("speed must not be negative")
    net = net_deceleration(brake_deceleration, descent_percent)
    gain = 0.0
    if gravity_during_reaction and descent_percent > 0:
        gain = STANDARD_GRAVITY * math.sin(grade_percent_to_angle(descent_percent))
    braking_speed = speed_ms + gain * reaction_time_s
    reaction = speed_ms * reaction_time_s + 0.5 * gain * reaction_time_s * reaction_time_s
    return reaction + braking_distance(braking_speed, net)


def friction_limit(friction_coefficient: float, descent_percent: float = 0.0) -> float:
    """The highest braking deceleration in m/s^2 tyre friction allows: mu g cos(theta).

    On a slope the normal force is m g cos(theta), so the limit is a little below mu g.
    """
    if friction_coefficient < 0:
        raise ValueError("friction coefficient must not be negative")
    theta = grade_percent_to_angle(descent_percent)
    return friction_coefficient * STANDARD_GRAVITY * math.cos(theta)


def achievable_deceleration(
    brake_deceleration: float, friction_coefficient: float, descent_percent: float = 0.0
) -> float:
    """The brake's deceleration capped by tyre friction, in m/s^2 (before the slope's pull)."""
    return min(brake_deceleration, friction_limit(friction_coefficient, descent_percent))


def mean_deceleration(speed_ms: float, distance_m: float, reaction_time_s: float = 0.0) -> float:
    """Mean deceleration in m/s^2 from a stop measured from ``speed_ms`` over ``distance_m``.

    a = v^2 / (2 (s - v t_r)): the inverse of ``stopping_distance`` on the flat, with the part
    covered before the brake acts taken off first.
    """
    if speed_ms <= 0:
        raise ValueError("speed must be positive")
    braking = distance_m - speed_ms * reaction_time_s
    if braking <= 0:
        raise ValueError("the stopping distance is not longer than the reaction distance")
    return speed_ms * speed_ms / (2.0 * braking)


def electrical_speed(mechanical_omega: float, pole_pairs: int) -> float:
    """Electrical angular speed in rad/s: pole pairs x mechanical rad/s."""
    if pole_pairs < 1:
        raise ValueError("a motor has at least one pole pair")
    return pole_pairs * mechanical_omega


def shorted_motor_current(
    back_emf: float, resistance: float, inductance: float, electrical_omega: float
) -> float:
    """Current amplitude in A of a shorted winding: E / sqrt(R^2 + (w_e L)^2).

    Take E, R and L of one circuit: for a DC motor the loop; for a shorted three-phase star,
    one phase (E_phase, peak = Ke_LL w / sqrt 3, with R_phase, L_phase) for the peak phase
    current. ``inductance`` 0 gives the resistive E / R of reviewer.engineering.braking.
    """
    if resistance <= 0 or inductance < 0:
        raise ValueError("resistance must be positive and inductance not negative")
    reactance = electrical_omega * inductance
    return abs(back_emf) / math.hypot(resistance, reactance)


def inductance_corner_speed(resistance: float, inductance: float, pole_pairs: int = 1) -> float:
    """Mechanical speed in rad/s of the corner w_e = R / L, above which a shorted winding's
    current stops rising with speed; ``math.inf`` without inductance."""
    if resistance <= 0 or inductance < 0:
        raise ValueError("resistance must be positive and inductance not negative")
    if inductance == 0:
        return math.inf
    return resistance / inductance / electrical_speed(1.0, pole_pairs)


def shorted_three_phase_braking_torque(
    ke_ll: float,
    mechanical_omega: float,
    pole_pairs: int,
    phase_resistance: float,
    phase_inductance: float,
) -> float:
    """Braking torque in N m of a star-wound motor with all three terminals shorted.

    Per phase E_pk = Ke_LL w / sqrt 3 drives I_pk = E_pk / |R + j w_e L|; the three phases
    dissipate (3/2) I_pk^2 R, and that power comes off the shaft: T = P / w. Without inductance
    this is Ke_LL^2 w / R_LL, the DC loop's Kt Ke w / R (brief 6).
    """
    if mechanical_omega == 0:
        return 0.0
    phase_emf = ke_ll * abs(mechanical_omega) / math.sqrt(3.0)
    w_e = electrical_speed(abs(mechanical_omega), pole_pairs)
    peak = shorted_motor_current(phase_emf, phase_resistance, phase_inductance, w_e)
    return 1.5 * peak * peak * phase_resistance / abs(mechanical_omega)


def terminal_speed_on_descent(
    mass_kg: float,
    descent_percent: float,
    rolling_resistance: float,
    drag_area_m2: float,
    air_density: float = AIR_DENSITY_ISA,
    retarding_force: Callable[[float], float] | None = None,
) -> float:
    """Steady speed in m/s a vehicle runs to downhill with the drive off.

    Where m g sin(theta) equals the road load (rolling and drag, reviewer.engineering.roadload)
    plus any ``retarding_force(v)`` in N (e.g. a shorted motor; it must not fall as speed rises
    faster than drag grows). 0 when rolling resistance alone holds the vehicle; ``math.inf``
    when nothing grows with speed to balance the slope (no drag and no retarding force).
    """
    if mass_kg <= 0 or drag_area_m2 < 0:
        raise ValueError("mass must be positive and drag area not negative")
    extra = retarding_force or (lambda _speed: 0.0)

    def surplus(speed: float) -> float:
        # Road load on the grade taken as a negative climb: gravity is part of it.
        load = road_load_force(
            mass_kg, speed, rolling_resistance, drag_area_m2, -descent_percent, air_density
        )
        return -(load + extra(speed))

    if surplus(0.0) <= 0:
        return 0.0
    high = 1.0
    for _ in range(60):
        if surplus(high) < 0:
            return bracketed_root(surplus, 0.0, high)
        high *= 2.0
    return math.inf
