"""Road load, wheel force and top speed of a small vehicle, in SI floats.

Road load is rolling resistance plus climbing plus aerodynamic drag:
F = m g (Crr cos(theta) + sin(theta)) + 0.5 rho CdA v^2, with rho the ISA sea-level air density
and g the CGPM standard gravity. Top speed is where the drive's force at the wheel falls to the
road load; the drive force never rises with speed and the load never falls, so their difference
has one root, found by a bracketing search (no numerical library needed; it cannot diverge).

``Drive`` puts motors (``TorqueSpeedLine``), gearing and vehicle together; the ``*_within``
searches find the gearing or duty that brings a top speed down to a limit.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from functools import cached_property

from reviewer.engineering.motor import TorqueSpeedLine, drive_force_function
from reviewer.engineering.steady_speed import straight_piece_speed

AIR_DENSITY_ISA = 1.225  # kg/m^3, ISA sea level, 15 degC
STANDARD_GRAVITY = 9.80665  # m/s^2, CGPM 1901


def kmh_to_ms(speed_kmh: float) -> float:
    return speed_kmh / 3.6


def ms_to_kmh(speed_ms: float) -> float:
    return speed_ms * 3.6


def grade_angle(grade_percent: float) -> float:
    """Slope angle in rad of a grade given as rise over run in percent (10 % is 5.71 deg)."""
    return math.atan(grade_percent / 100.0)


def road_load_force(
    mass_kg: float,
    speed_ms: float,
    rolling_resistance: float,
    drag_area_m2: float,
    grade_percent: float = 0.0,
    air_density: float = AIR_DENSITY_ISA,
) -> float:
    """Force in N to hold ``speed_ms`` steady: rolling + grade + aerodynamic drag (still air)."""
    theta = grade_angle(grade_percent)
    weight = mass_kg * STANDARD_GRAVITY
    rolling_and_grade = weight * (rolling_resistance * math.cos(theta) + math.sin(theta))
    return rolling_and_grade + 0.5 * air_density * drag_area_m2 * speed_ms * speed_ms


def road_load_power(
    mass_kg: float,
    speed_ms: float,
    rolling_resistance: float,
    drag_area_m2: float,
    grade_percent: float = 0.0,
    air_density: float = AIR_DENSITY_ISA,
) -> float:
    """Power in W at the wheel to hold the speed: F v."""
    force = road_load_force(
        mass_kg, speed_ms, rolling_resistance, drag_area_m2, grade_percent, air_density
    )
    return force * speed_ms


def wheel_force(
    motor_torque: float, reduction: float, efficiency: float, wheel_radius_m: float
) -> float:
    """Tractive force in N: shaft torque x reduction (motor turns per wheel turn) x efficiency
    over the wheel radius."""
    return motor_torque * reduction * efficiency / wheel_radius_m


def motor_speed_for(speed_ms: float, reduction: float, wheel_radius_m: float) -> float:
    """Motor shaft speed in rad/s at a ground speed (no wheel slip)."""
    return speed_ms / wheel_radius_m * reduction


def ground_speed_for(motor_omega: float, reduction: float, wheel_radius_m: float) -> float:
    """Ground speed in m/s at a motor shaft speed in rad/s."""
    return motor_omega / reduction * wheel_radius_m


def bracketed_root(
    function: Callable[[float], float],
    low: float,
    high: float,
    tolerance: float = 1e-9,
    max_iterations: int = 200,
    values: tuple[float, float] | None = None,
) -> float:
    """A root of ``function`` between ``low`` and ``high``, whose signs must differ.

    Regula falsi with the Illinois modification (the end that stays put has its value halved,
    so both ends close in): a handful of evaluations on smooth curves, and never outside the
    bracket. Stops when the bracket is narrower than ``tolerance`` (relative above 1).
    ``values``: the function at ``low`` and ``high`` when the caller has them already.
    """
    f_low, f_high = (function(low), function(high)) if values is None else values
    if f_low == 0:
        return low
    if f_high == 0:
        return high
    if (f_low > 0) == (f_high > 0):
        raise ValueError("the function has the same sign at both ends of the bracket")
    kept = 0  # which end survived the last step: -1 low, +1 high
    for _ in range(max_iterations):
        guess = (low * f_high - high * f_low) / (f_high - f_low)
        if not low < guess < high:
            guess = 0.5 * (low + high)
        f_guess = function(guess)
        if f_guess == 0:
            return guess
        if (f_guess > 0) == (f_high > 0):
            high, f_high = guess, f_guess
            if kept == -1:
                f_low *= 0.5
            kept = -1
        else:
            low, f_low = guess, f_guess
            if kept == 1:
                f_high *= 0.5
            kept = 1
        if high - low <= tolerance * max(1.0, abs(guess)):
            break
    return 0.5 * (low + high)


def top_speed(
    drive_force: Callable[[float], float],
    mass_kg: float,
    rolling_resistance: float,
    drag_area_m2: float,
    speed_bound_ms: float,
    grade_percent: float = 0.0,
    air_density: float = AIR_DENSITY_ISA,
) -> float:
    """Steady speed in m/s where ``drive_force(v)`` (N at the wheel) equals the road load.

    ``speed_bound_ms`` is a speed the drive cannot reach (e.g. its no-load ground speed); it is
    doubled until the load exceeds the drive. Returns 0 when the drive cannot start the vehicle.
    """

    # The same road_load_force terms, hoisted: this runs a dozen times per solve.
    steady = road_load_force(mass_kg, 0.0, rolling_resistance, 0.0, grade_percent, air_density)
    drag = 0.5 * air_density * drag_area_m2

    def surplus(speed: float) -> float:
        return drive_force(speed) - steady - drag * speed * speed

    if surplus(0.0) <= 0:
        return 0.0
    high = max(speed_bound_ms, 1e-3)
    for _ in range(60):
        if surplus(high) < 0:
            break
        high *= 2.0
    else:
        raise ValueError("no speed bound found where the road load exceeds the drive force")
    return bracketed_root(surplus, 0.0, high)


def kinetic_energy(mass_kg: float, speed_ms: float) -> float:
    """0.5 m v^2 in J."""
    return 0.5 * mass_kg * speed_ms * speed_ms


def stopping_distance(speed_ms: float, deceleration: float) -> float:
    """Distance in m to stop from ``speed_ms`` at a constant deceleration: v^2 / (2 a)."""
    if deceleration <= 0:
        raise ValueError("deceleration must be positive")
    return speed_ms * speed_ms / (2.0 * deceleration)


# --- A whole drive: motors on one gearing, against the road load ------------------------------


@dataclass(frozen=True)
class DriveMotor:
    """One motor of a drive: its Kv, its own loop resistance and its no-load current."""

    kv_rpm_per_v: float
    branch_resistance: float  # ohm: winding + switch + the motor's own wires
    no_load_current: float = 0.0  # A


@dataclass(frozen=True)
class Drive:
    """Motors on one pack and one gearing, driving one vehicle on the flat in still air.

    Averaged PWM: at duty D each motor sees D x V; the battery side carries D x I, so the
    resistance all motors share (pack, battery wiring) counts D^2 times, and once per motor
    (exact for identical motors pulling together). Their wheel forces add.
    """

    motors: tuple[DriveMotor, ...]
    full_voltage: float
    reduction: float  # motor turns per wheel turn
    wheel_radius: float  # m
    rolling_resistance: float
    drag_area: float  # m^2
    shared_resistance: float = 0.0  # ohm
    duty: float = 1.0
    current_limit: float | None = None  # A per motor (DC-equivalent motor current)
    efficiency: float = 1.0
    battery_limit: float | None = None  # A per motor, from the pack

    def lines(self, duty: float | None = None) -> list[TorqueSpeedLine]:
        duty = self.duty if duty is None else duty
        shared = len(self.motors) * duty * duty * self.shared_resistance
        return [
            TorqueSpeedLine(
                kv_rpm_per_v=motor.kv_rpm_per_v,
                voltage=duty * self.full_voltage,
                loop_resistance=motor.branch_resistance + shared,
                no_load_current=motor.no_load_current,
                current_limit=self.current_limit,
                battery_limit=self.battery_limit,
            )
            for motor in self.motors
        ]

    def top_speed(
        self, total_mass: float, *, duty: float | None = None, reduction: float | None = None
    ) -> float:
        """Steady top speed in m/s of the vehicle and rider (``total_mass`` kg)."""
        lines = self.lines(duty)
        ratio = self.reduction if reduction is None else reduction
        bound = max(
            ground_speed_for(line.no_load_speed, ratio, self.wheel_radius) for line in lines
        )
        force = self._drive_force(lines, ratio)
        exact = self._straight(lines, ratio, total_mass, 0.0, force, clamped=False)
        if exact is not None:
            return exact
        return top_speed(force, total_mass, self.rolling_resistance, self.drag_area, bound)

    def climb_speed(self, total_mass: float, grade_percent: float) -> float:
        """Steady speed in m/s up a ``grade_percent`` grade at full throttle (0 if it stalls)."""
        lines = self.lines()
        bound = max(
            ground_speed_for(line.no_load_speed, self.reduction, self.wheel_radius)
            for line in lines
        )
        force = self._drive_force(lines, self.reduction)
        exact = self._straight(lines, self.reduction, total_mass, grade_percent, force, False)
        if exact is not None:
            return exact
        return top_speed(
            force, total_mass, self.rolling_resistance, self.drag_area, bound, grade_percent
        )

    def descent_speed(self, total_mass: float, descent_percent: float) -> float:
        """Steady speed in m/s down a ``descent_percent`` grade at full throttle, where the
        drive's pull and gravity's meet the road load. Above its no-load speed a motor would
        brake; that is left out (a full pack or a freewheeling controller gives none), so this
        is the higher, pessimistic speed, never below the speed it coasts to with the drive off.
        """
        lines = self.lines()
        bound = max(
            ground_speed_for(line.no_load_speed, self.reduction, self.wheel_radius)
            for line in lines
        )
        pull = self._drive_force(lines, self.reduction)
        exact = self._straight(lines, self.reduction, total_mass, -descent_percent, pull, True)
        if exact is not None:
            return exact
        return top_speed(
            lambda speed: max(pull(speed), 0.0),
            total_mass,
            self.rolling_resistance,
            self.drag_area,
            bound,
            -descent_percent,
        )

    def exceeds(
        self,
        total_mass: float,
        speed: float,
        *,
        duty: float | None = None,
        reduction: float | None = None,
    ) -> bool:
        """Whether the top speed lies above ``speed``: the drive still outpulls the road load
        there. Drive force never rises with speed and drag always does, so one evaluation
        answers what a whole top-speed solve would."""
        ratio = self.reduction if reduction is None else reduction
        load = road_load_force(total_mass, speed, self.rolling_resistance, self.drag_area)
        return self._drive_force(self.lines(duty), ratio)(speed) > load

    def _straight(
        self,
        lines: list[TorqueSpeedLine],
        ratio: float,
        total_mass: float,
        grade: float,
        pull: Callable[[float], float],
        clamped: bool,
    ) -> float | None:
        """The steady speed in closed form where a straight piece of the lines holds it
        (``steady_speed.straight_piece_speed``), else None: search the root."""
        steady = road_load_force(total_mass, 0.0, self.rolling_resistance, 0.0, grade)
        drag = 0.5 * AIR_DENSITY_ISA * self.drag_area
        return straight_piece_speed(
            lines, ratio, self.efficiency, self.wheel_radius, steady, drag, pull, clamped=clamped
        )

    def _drive_force(self, lines: list[TorqueSpeedLine], ratio: float) -> Callable[[float], float]:
        return drive_force_function(lines, ratio, self.efficiency, self.wheel_radius)

    def lines_at(self, voltage: float, extra_resistance: Sequence[float]) -> list[TorqueSpeedLine]:
        """The lines at full throttle on a pack at ``voltage``, each motor's branch resistance
        raised by its ``extra_resistance`` (a warm winding): what ``lines()`` gives for a
        copy of the drive so changed, without building the copy."""
        shared = len(self.motors) * self.duty * self.duty * self.shared_resistance
        return [
            line.at(self.duty * voltage, (motor.branch_resistance + extra) + shared)
            for line, motor, extra in zip(self._lines, self.motors, extra_resistance, strict=True)
        ]

    @cached_property
    def _lines(self) -> tuple[TorqueSpeedLine, ...]:
        """``lines()``, kept: what ``lines_at`` derives its lines from."""
        return tuple(self.lines())


# Top speed against reduction rises while a drive is under-geared, then falls. Starting from a
# reduction that is too fast, the reductions that meet a limit therefore form one run up to the
# largest reduction tried, and a bisection finds where it begins. Top speed only rises with duty.


def largest_pulley_within(
    drive: Drive,
    total_mass: float,
    speed_limit: float,
    present_teeth: int,
    wheel_teeth: int,
    fewest_teeth: int = 5,
) -> int | None:
    """The most motor pulley teeth, fewer than ``present_teeth``, whose top speed is at most
    ``speed_limit`` (m/s); None if even ``fewest_teeth`` is too fast."""

    def meets(teeth: int) -> bool:
        return not drive.exceeds(total_mass, speed_limit, reduction=wheel_teeth / teeth)

    if present_teeth - 1 < fewest_teeth or not meets(fewest_teeth):
        return None
    too_fast, passing = present_teeth, fewest_teeth
    while too_fast - passing > 1:
        middle = (too_fast + passing) // 2
        if meets(middle):
            passing = middle
        else:
            too_fast = middle
    return passing


def smallest_reduction_within(
    drive: Drive, total_mass: float, speed_limit: float, largest: float = 100.0
) -> float | None:
    """The least reduction above the drive's own, rounded up to 0.01, whose top speed is at
    most ``speed_limit`` (m/s); None if even ``largest`` is too fast."""

    def meets(reduction: float) -> bool:
        return not drive.exceeds(total_mass, speed_limit, reduction=reduction)

    if not meets(largest):
        return None
    too_fast, passing = drive.reduction, largest
    while passing - too_fast > 0.005:
        middle = 0.5 * (too_fast + passing)
        if meets(middle):
            passing = middle
        else:
            too_fast = middle
    rounded = min(math.ceil(passing * 100.0 - 1e-9) / 100.0, largest)
    while not meets(rounded) and rounded < largest:
        rounded = min(rounded + 0.01, largest)
    return rounded


def highest_duty_within(drive: Drive, total_mass: float, speed_limit: float) -> int | None:
    """The highest whole-percent duty, up to the drive's own, whose top speed is at most
    ``speed_limit`` (m/s); None if not even 1 % is slow enough."""
    meets, too_fast = 0, math.ceil(drive.duty * 100.0 - 1e-9)
    if not drive.exceeds(total_mass, speed_limit, duty=too_fast / 100.0):
        return too_fast
    while too_fast - meets > 1:
        middle = (meets + too_fast) // 2
        if drive.exceeds(total_mass, speed_limit, duty=middle / 100.0):
            too_fast = middle
        else:
            meets = middle
    return meets if meets >= 1 else None
