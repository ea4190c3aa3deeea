"""brake.dynamic, part two: each motor's braking loop, the force it gives per unit of speed, and
the remedies worked out on those loops (each re-checked before it is named).

Everything here works in SI floats on the drive model of ``reviewer.figures``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from reviewer import figures
from reviewer import units as u
from reviewer.build import Brake, Build, Circuit, Motor, MotorType
from reviewer.engineering.braking import added_resistance_for, braking_force_per_speed
from reviewer.engineering.roadload import Drive, motor_speed_for, ms_to_kmh
from reviewer.units import in_unit

_in = in_unit  # skips pint's conversion for fields already in the unit asked
_OHM = u.unit("ohm")


@dataclass(frozen=True)
class BrakingLoop:
    """One motor's braking loop in SI floats."""

    motor: Motor
    kv: float  # rpm/V
    fixed: float  # ohm: winding and brake wires at 20 degC
    added: float  # ohm: the brake resistor, 0 if none
    wires: float = 0.0  # ohm: the brake wires' share of ``fixed``

    @property
    def resistance(self) -> float:
        return self.fixed + self.added


def braking_loops(build: Build, brake: Brake, drive: Drive) -> list[BrakingLoop]:
    """Each motor's loop: its winding, the brake-circuit wires that name it (all of them on a
    one-motor build) and the brake resistor."""
    added = _in(brake.brake_resistance, _OHM) if brake.brake_resistance else 0.0
    single = len(build.motors) == 1
    loops = []
    for motor, line in zip(build.motors, drive.motors, strict=True):
        assert motor.winding_resistance is not None
        wires = sum(
            figures.wire_resistance(wire)
            for wire in build.wires
            if wire.circuit is Circuit.BRAKE
            and (wire.motor == motor.name or (single and wire.motor is None))
        )
        fixed = _in(motor.winding_resistance, _OHM) + wires
        loops.append(BrakingLoop(motor, line.kv_rpm_per_v, fixed, added, wires))
    return loops


def force_per_speed(drive: Drive, loops: list[BrakingLoop], added: float | None = None) -> float:
    """All motors' braking force per unit ground speed, N s/m; ``added`` puts that brake
    resistor in every loop instead of the build's."""
    return sum(
        braking_force_per_speed(
            loop.kv,
            loop.resistance if added is None else loop.fixed + added,
            drive.reduction,
            drive.wheel_radius,
        )
        for loop in loops
    )


def contact_remedy(
    drive: Drive,
    loops: list[BrakingLoop],
    loop: BrakingLoop,
    emf: float,
    rating: float,
    current: float,
    ground: float,
    speed: float,
    mass: float,
) -> str:
    """A brake resistor that holds the current to the rating (rounded up to 0.01 ohm and
    re-checked), with the deceleration left if every motor's loop gets the same resistor."""
    f = u.format_number
    extra = added_resistance_for(rating, emf, loop.resistance)
    resistor = math.ceil((loop.added + extra) * 100.0 - 1e-9) / 100.0
    while emf / (loop.fixed + resistor) > rating:
        resistor += 0.01
    coefficient = force_per_speed(drive, loops, resistor)
    return (
        f"fit a brake resistor of at least {resistor:.2f} ohm in the loop "
        f"(brakes[].brake_resistance) "
        f"({f(emf / (loop.fixed + resistor))} A at top speed, leaving about "
        f"{f(coefficient * speed / mass)} m/s² of braking there), or relay contacts rated for "
        f"at least {math.ceil(current - 1e-9)} A DC (brakes[].relay_contact_rating), or let "
        f"the relay close only below "
        f"{f(ms_to_kmh(ground))} km/h"
    )


def share_remedy(
    drive: Drive, loops: list[BrakingLoop], speed: float, mass: float, needed: float, full: float
) -> str:
    """Beside a friction brake: lean on it, or lower the brake resistor (the same in every
    motor's loop) where that alone reaches ``needed`` at ``speed``."""
    f = u.format_number
    text = f"make sure the friction brake alone reaches at least {f(full)} m/s²"

    # Added resistance R such that sum(c_k(fixed_k + R)) v / m = needed, by bisection: the
    # force falls as R rises.
    def decel(added: float) -> float:
        return force_per_speed(drive, loops, added) * speed / mass

    present = loops[0].added
    if present <= 0 or decel(0.0) < needed:
        return text
    low, high = 0.0, present
    for _ in range(60):
        middle = 0.5 * (low + high)
        if decel(middle) >= needed:
            low = middle
        else:
            high = middle
    resistor = math.floor(low * 100.0) / 100.0
    return (
        f"{text}, or lower the brake resistor (brakes[].brake_resistance) to at most "
        f"{resistor:.2f} ohm "
        f"({f(decel(resistor))} m/s²)"
    )


def inductive_share(loop: BrakingLoop, drive: Drive, speed: float) -> float | None:
    """The share of the resistive braking force a shorted winding gives at ground ``speed``
    (m/s) once its inductance is counted: (R / |R + j w_e L|)^2, since I = E / |Z| and the
    force comes from the I^2 R it dissipates (brief 14; AC circuit theory). Line-to-line R and
    L give the same ratio as a phase's. 1 for a brushed motor (its commutated current is DC);
    None for a brushless motor without ``winding_inductance`` or ``pole_pairs``."""
    motor = loop.motor
    if motor.type is not MotorType.BRUSHLESS:
        return 1.0
    if motor.winding_inductance is None or motor.pole_pairs is None:
        return None
    omega = motor_speed_for(speed, drive.reduction, drive.wheel_radius)
    reactance = motor.pole_pairs * omega * in_unit(motor.winding_inductance, "H")
    return 1.0 / (1.0 + (reactance / loop.resistance) ** 2)
