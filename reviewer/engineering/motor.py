"""A permanent-magnet DC motor as a straight torque-speed line (brushed, or brushless seen from
its DC bus).

The model is the textbook one: V = E + I R with back-EMF E = Ke w, torque T = Kt (I - I0), and
Kt [N m/A] = Ke [V s/rad] = 60 / (2 pi Kv[rpm/V]) in SI units. A brushless motor driven by
six-step commutation behaves the same way seen from the DC bus: two phases conduct at a time, so
its terminal-to-terminal (line-to-line) resistance is the loop resistance and its Kv is quoted
per DC volt. I0 (the no-load current) stands for friction and iron loss; the controller's current
limit cuts the line off as a flat top at low speed.

Speeds are in rad/s unless a name says rpm. Use cold (20 degC) resistance for peak current and
hot resistance for heating.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field

RPM_PER_RAD_S = 60.0 / (2.0 * math.pi)


def rpm_to_rad_s(rpm: float) -> float:
    return rpm / RPM_PER_RAD_S


def rad_s_to_rpm(omega: float) -> float:
    return omega * RPM_PER_RAD_S


def torque_constant(kv_rpm_per_v: float) -> float:
    """Kt in N m/A from Kv in rpm/V: 60 / (2 pi Kv) = 9.5493 / Kv. Equal to Ke in V s/rad."""
    if kv_rpm_per_v <= 0:
        raise ValueError("Kv must be positive")
    return RPM_PER_RAD_S / kv_rpm_per_v


def back_emf_constant(kv_rpm_per_v: float) -> float:
    """Ke in V s/rad; in SI units it is the same number as Kt (energy balance E I = T w)."""
    return torque_constant(kv_rpm_per_v)


def stall_current(voltage: float, loop_resistance: float) -> float:
    """Current with the rotor locked (no back-EMF): V / R_loop."""
    if loop_resistance <= 0:
        raise ValueError("loop resistance must be positive")
    return voltage / loop_resistance


def no_load_speed(
    voltage: float, kv_rpm_per_v: float, loop_resistance: float = 0.0, no_load_current: float = 0.0
) -> float:
    """Free-running speed in rad/s: the back-EMF equals V less the drop of the no-load current."""
    return max(voltage - no_load_current * loop_resistance, 0.0) / back_emf_constant(kv_rpm_per_v)


def input_power(voltage: float, current: float) -> float:
    """Electrical power drawn, V I, in W. Not the same as the winding's copper loss I^2 R."""
    return voltage * current


def copper_loss(current: float, resistance: float) -> float:
    """Heat in the winding, I^2 R, in W; use the hot resistance for heating checks."""
    return current * current * resistance


@dataclass(frozen=True)
class TorqueSpeedLine:
    """One motor at a fixed effective voltage: current and shaft torque against speed.

    ``current_limit`` (the motor current, DC-equivalent) and ``battery_limit`` (what the
    controller draws from the pack) of None mean nothing limits the current below the stall
    current. Both act together (reviewer.engineering.brushless).
    """

    kv_rpm_per_v: float
    voltage: float
    loop_resistance: float
    no_load_current: float = 0.0
    current_limit: float | None = None
    battery_limit: float | None = None
    #: Kt in N m/A and Ke in V s/rad, from Kv once (a ride builds thousands of lines)
    kt: float = field(init=False, repr=False, compare=False)
    ke: float = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        if self.loop_resistance <= 0:
            raise ValueError("loop resistance must be positive")
        if self.kv_rpm_per_v <= 0:
            raise ValueError("Kv must be positive")
        object.__setattr__(self, "kt", torque_constant(self.kv_rpm_per_v))
        object.__setattr__(self, "ke", back_emf_constant(self.kv_rpm_per_v))

    def at(self, voltage: float, loop_resistance: float) -> TorqueSpeedLine:
        """This line at another effective voltage and loop resistance, Kv, I0 and both limits
        kept: equal to the line built afresh (a test holds it), with Kt and Ke carried over
        rather than derived again. The fields are written into the new instance's ``__dict__``
        directly, as the frozen dataclass's own ``__init__`` does through ``object.__setattr__``:
        a ride builds a line for every state it passes through."""
        if not loop_resistance > 0:
            raise ValueError("loop resistance must be positive")
        line = object.__new__(TorqueSpeedLine)
        line.__dict__.update(self.__dict__, voltage=voltage, loop_resistance=loop_resistance)
        return line

    @property
    def stall_current(self) -> float:
        """Locked-rotor current before any current limit acts."""
        return stall_current(self.voltage, self.loop_resistance)

    @property
    def no_load_speed(self) -> float:
        """Speed in rad/s where the shaft torque falls to zero (friction included)."""
        return no_load_speed(
            self.voltage, self.kv_rpm_per_v, self.loop_resistance, self.no_load_current
        )

    def current(self, omega: float) -> float:
        """I(w) = min((V - Ke w) / R, I_lim, the current whose battery draw is I_b,lim), in A."""
        unlimited = (self.voltage - self.ke * omega) / self.loop_resistance
        current = unlimited if self.current_limit is None else min(unlimited, self.current_limit)
        if self.battery_limit is None:
            return current
        emf = max(self.ke * omega, 0.0)
        r = self.loop_resistance
        drawn = (-emf + math.sqrt(emf * emf + 4.0 * r * self.battery_limit * self.voltage)) / (
            2 * r
        )
        return min(current, drawn)

    def torque(self, omega: float) -> float:
        """Shaft torque T = Kt (I - I0) in N m; negative above the no-load speed."""
        return self.kt * (self.current(omega) - self.no_load_current)


def drive_force_function(
    lines: Sequence[TorqueSpeedLine], ratio: float, efficiency: float, radius: float
) -> Callable[[float], float]:
    """The wheel force in N against ground speed in m/s of ``lines`` on one gearing: the sum
    of ``TorqueSpeedLine.torque`` through ``wheel_force``, the same arithmetic in the same order
    (a test holds them equal), with each line's numbers read once: a top speed or a ride
    evaluates this thousands of times."""
    numbers = [
        (
            line.kt,
            line.ke,
            line.voltage,
            line.loop_resistance,
            line.no_load_current,
            line.current_limit,
            line.battery_limit,
            4.0 * line.loop_resistance * (line.battery_limit or 0.0) * line.voltage,
        )
        for line in lines
    ]
    sqrt = math.sqrt

    def drive_force(speed: float) -> float:
        omega = speed / radius * ratio  # motor_speed_for
        torque = 0
        for kt, ke, voltage, r, i0, limit, battery, four_r_ib_v in numbers:
            current = (voltage - ke * omega) / r
            if limit is not None and limit < current:
                current = limit
            if battery is not None:
                emf = ke * omega
                if emf < 0.0:
                    emf = 0.0
                drawn = (-emf + sqrt(emf * emf + four_r_ib_v)) / (2 * r)
                if drawn < current:
                    current = drawn
            torque += kt * (current - i0)
        return torque * ratio * efficiency / radius  # wheel_force

    return drive_force
