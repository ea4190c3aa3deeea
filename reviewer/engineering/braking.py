"""Dynamic braking: a permanent-magnet motor shorted through a resistance becomes a generator
driving its own back-EMF round the loop.

With the loop closed, I = E / R_loop = Ke w / R_loop (no supply in the loop), and the shaft
feels T = Kt I against its motion. Both are proportional to speed, so the braking force falls in
step with the speed and vanishes as the wheel stops: a shorted motor slows a vehicle but never
stops or holds it. A relay that closes the loop at speed makes and carries the full current at
once, which is what its DC contact rating has to be compared with.

Ground speed and the motor's speed are tied by the gearing (``reduction`` motor turns per wheel
turn, wheel radius in m). Drivetrain friction adds to the braking, so the braking force at the
wheel is Kt I x reduction / radius with no efficiency factor, which understates it slightly.

SI floats throughout: rad/s, A, ohm, N, m/s, kg; Kv in rpm/V where a name says so.
"""

from __future__ import annotations

from reviewer.engineering.motor import RPM_PER_RAD_S, back_emf_constant, torque_constant


def braking_current(kv_rpm_per_v: float, omega: float, loop_resistance: float) -> float:
    """Current in A round a shorted motor turning at ``omega`` rad/s: Ke w / R_loop."""
    if loop_resistance <= 0:
        raise ValueError("loop resistance must be positive")
    return back_emf_constant(kv_rpm_per_v) * omega / loop_resistance


def speed_at_current_rpm(current: float, loop_resistance: float, kv_rpm_per_v: float) -> float:
    """Motor speed in rpm at which the braking current equals ``current``: n = I R_loop Kv.

    The back-EMF in volts is n / Kv, and it drives I R_loop round the loop.
    """
    if current < 0 or loop_resistance <= 0 or kv_rpm_per_v <= 0:
        raise ValueError("current must not be negative; resistance and Kv must be positive")
    return current * loop_resistance * kv_rpm_per_v


def braking_wheel_force(
    kv_rpm_per_v: float, current: float, reduction: float, wheel_radius: float
) -> float:
    """Retarding force in N at the wheel: Kt I x reduction / radius (drivetrain losses ignored,
    as they only add to the braking)."""
    if wheel_radius <= 0:
        raise ValueError("wheel radius must be positive")
    return torque_constant(kv_rpm_per_v) * current * reduction / wheel_radius


def braking_force_per_speed(
    kv_rpm_per_v: float, loop_resistance: float, reduction: float, wheel_radius: float
) -> float:
    """Braking force per unit ground speed in N s/m: Kt Ke reduction^2 / (R_loop r^2).

    From I = Ke w / R, w = v reduction / r and F = Kt I reduction / r. The force is this
    coefficient times the speed, so the deceleration decays with the speed itself.
    """
    if loop_resistance <= 0 or wheel_radius <= 0:
        raise ValueError("loop resistance and wheel radius must be positive")
    kt = torque_constant(kv_rpm_per_v)
    ke = back_emf_constant(kv_rpm_per_v)
    return kt * ke * reduction * reduction / (loop_resistance * wheel_radius * wheel_radius)


def added_resistance_for(current_rating: float, back_emf: float, loop_resistance: float) -> float:
    """The series resistance in ohm to add so a loop with back-EMF ``back_emf`` V carries at
    most ``current_rating`` A: E / I_rating - R_loop, and 0 when it already does."""
    if current_rating <= 0:
        raise ValueError("current rating must be positive")
    return max(back_emf / current_rating - loop_resistance, 0.0)


def rpm_to_ground_speed(rpm: float, reduction: float, wheel_radius: float) -> float:
    """Ground speed in m/s at a motor speed in rpm."""
    return rpm / RPM_PER_RAD_S / reduction * wheel_radius
