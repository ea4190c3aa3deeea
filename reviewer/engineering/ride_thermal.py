"""A motor winding heating and cooling over time: one thermal node, stepped exactly.

C dtheta/dt = P_loss(theta) - k(v) (theta - theta_amb) / R_th, tau = R_th C (brief 12, Newton
cooling). The copper loss grows with temperature, P_loss = I^2 R20 (1 + alpha (theta - 20)),
alpha = 0.00393 /K for annealed copper (IEC 60228, CRC Handbook; 1 / (234.5 + 20) rounds to the
same value). With the current held over a step the equation is linear in theta,
C dtheta/dt = A + B theta, so the step is exact for any step length:

    theta(t + dt) = theta + (A + B theta) / B x expm1(B dt / C)

B = I^2 R20 alpha - k / R_th. B < 0: the winding settles at theta_ss = -A / B with the time
constant C / -B. B >= 0 (I^2 R20 alpha R_th / k >= 1): no steady temperature exists, the loss
outgrows the cooling (thermal runaway). :func:`winding_step` raises :class:`ThermalRunaway`
there unless the caller allows it; allowed, the step is still the exact (finite, growing)
solution, which is what a short burst above the runaway current really does.

``k(v)`` multiplies the heat-loss coefficient 1 / R_th with the vehicle's speed: a shaft fan or
a hub shell cools better the faster it turns, and a fan that does not turn moves no air.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field

from reviewer.engineering.thermal import REFERENCE_COOLANT_C, calibrated_thermal_resistance

COPPER_ALPHA_20 = 0.00393  # 1/K at 20 degC, annealed copper (IEC 60228; CRC Handbook)
COPPER_SPECIFIC_HEAT = 385.0  # J/(kg K), CRC Handbook
IRON_SPECIFIC_HEAT = 450.0  # J/(kg K), CRC Handbook
# Share of a small permanent-magnet motor's mass in its copper and in its laminated iron (from
# memory: windings a quarter to a third, stator and rotor iron about two fifths). Only these two
# are counted: magnets, housing and shaft also warm up, but through poorer paths, so leaving
# them out gives the lower heat capacity, the faster-heating and cautious estimate.
COPPER_MASS_FRACTION = 0.3
IRON_MASS_FRACTION = 0.4
# Forced-convection heat transfer grows roughly with airflow^0.8 (brief 12, from memory).
FORCED_CONVECTION_EXPONENT = 0.8
_MAX_EXPONENT = 700.0  # exp() beyond this overflows a float


class ThermalRunaway(ValueError):
    """The copper loss grows faster with temperature than the cooling: no steady state."""


def thermal_capacity_from_mass(
    mass_kg: float,
    copper_fraction: float = COPPER_MASS_FRACTION,
    iron_fraction: float = IRON_MASS_FRACTION,
) -> float:
    """Heat capacity C in J/K of a motor's copper and iron: m (f_cu 385 + f_fe 450).

    With the default split (from memory) 295.5 J/K per kg of motor, below both metals' own
    specific heat: the lower estimate, since a smaller C heats the winding faster on a climb.
    """
    if mass_kg <= 0:
        raise ValueError("motor mass must be positive")
    if copper_fraction < 0 or iron_fraction < 0 or copper_fraction + iron_fraction > 1:
        raise ValueError("the copper and iron fractions must lie in [0, 1] and sum to at most 1")
    specific = copper_fraction * COPPER_SPECIFIC_HEAT + iron_fraction * IRON_SPECIFIC_HEAT
    if specific <= 0:
        raise ValueError("at least one of copper and iron must have a share of the mass")
    return mass_kg * specific


def time_constant_from_mass(mass_kg: float, thermal_resistance: float, **split: float) -> float:
    """tau = R_th C in s, C from :func:`thermal_capacity_from_mass`."""
    return thermal_resistance * thermal_capacity_from_mass(mass_kg, **split)


@dataclass(frozen=True)
class ConstantCooling:
    """The same cooling at every speed: ``factor`` x the cooling the rating was made with."""

    factor: float = 1.0

    def __call__(self, speed_ms: float) -> float:
        return self.factor


@dataclass(frozen=True)
class AirflowCooling:
    """Cooling that grows with speed: a shaft fan (airflow in proportion to its speed) or a hub
    motor's shell in the wind.

    k(v) = k0 + (1 - k0) min(v / v_ref, 1)^0.8, with k0 the cooling with no airflow (the
    IC410-like still-air factor) and ``reference_speed_ms`` the vehicle speed at which the
    rating's airflow is reached. Above it no extra cooling is credited (cautious).
    """

    still_air_factor: float
    reference_speed_ms: float
    exponent: float = FORCED_CONVECTION_EXPONENT

    def __post_init__(self) -> None:
        if not 0 < self.still_air_factor <= 1:
            raise ValueError("the still-air cooling factor must lie in (0, 1]")
        if self.reference_speed_ms <= 0:
            raise ValueError("the reference speed must be positive")

    def __call__(self, speed_ms: float) -> float:
        share = min(max(speed_ms, 0.0) / self.reference_speed_ms, 1.0)
        if share <= 0.0:
            return self.still_air_factor
        return self.still_air_factor + (1.0 - self.still_air_factor) * share**self.exponent


@dataclass(frozen=True)
class Winding:
    """One motor's winding as a thermal node.

    ``thermal_resistance`` (K/W) and ``time_constant`` (s) hold at cooling factor 1;
    ``cooling(speed_ms)`` scales the heat-loss coefficient 1 / R_th. ``start_c`` is the winding
    temperature when the ride begins (the ambient when None).
    """

    resistance_20c: float  # ohm, the winding alone
    thermal_resistance: float  # K/W
    time_constant: float  # s
    ambient_c: float = REFERENCE_COOLANT_C
    start_c: float | None = None
    cooling: Callable[[float], float] = field(default_factory=ConstantCooling)
    alpha: float = COPPER_ALPHA_20

    def __post_init__(self) -> None:
        if self.resistance_20c <= 0 or self.thermal_resistance <= 0 or self.time_constant <= 0:
            raise ValueError("winding resistance, thermal resistance and time constant must be > 0")

    @property
    def capacity(self) -> float:
        """Heat capacity C = tau / R_th in J/K."""
        return self.time_constant / self.thermal_resistance

    @property
    def initial_c(self) -> float:
        return self.ambient_c if self.start_c is None else self.start_c

    def resistance(self, theta_c: float) -> float:
        """R(theta) = R20 (1 + alpha (theta - 20)) in ohm."""
        return self.resistance_20c * (1.0 + self.alpha * (theta_c - 20.0))


def winding_from_rating(
    rated_current: float,
    resistance_20c: float,
    rise_limit: float,
    time_constant: float,
    ambient_c: float = REFERENCE_COOLANT_C,
    cooling: Callable[[float], float] | None = None,
    start_c: float | None = None,
) -> Winding:
    """A winding whose R_th is calibrated like the steady-state model's
    (:func:`reviewer.engineering.thermal.calibrated_thermal_resistance`): the rated continuous
    current, with 40 degC coolant, heats it by exactly ``rise_limit``."""
    r_th = calibrated_thermal_resistance(rated_current, resistance_20c, rise_limit)
    return Winding(
        resistance_20c,
        r_th,
        time_constant,
        ambient_c,
        start_c,
        ConstantCooling() if cooling is None else cooling,
    )


def first_order_step(theta: float, theta_ss: float, dt: float, tau: float) -> float:
    """Constant loss, exact: theta(t + dt) = theta_ss + (theta - theta_ss) exp(-dt / tau)."""
    if tau <= 0:
        raise ValueError("the time constant must be positive")
    return theta_ss + (theta - theta_ss) * math.exp(-dt / tau)


def _coefficients(
    current: float, winding: Winding, speed_ms: float, factor: float | None = None
) -> tuple[float, float]:
    """A and B of C dtheta/dt = A + B theta, in W and W/K (``factor``: k(v), if known)."""
    if factor is None:
        factor = winding.cooling(speed_ms)
    if not factor > 0:
        raise ValueError(f"cooling factor must be positive, got {factor!r} at {speed_ms} m/s")
    conductance = factor / winding.thermal_resistance
    loss = current * current * winding.resistance_20c
    a = loss * (1.0 - 20.0 * winding.alpha) + conductance * winding.ambient_c
    b = loss * winding.alpha - conductance
    return a, b


def runaway_parameter(current: float, winding: Winding, speed_ms: float = 0.0) -> float:
    """I^2 R20 alpha R_th / k(v): at or above 1 no steady temperature exists."""
    return (
        current
        * current
        * winding.resistance_20c
        * winding.alpha
        * winding.thermal_resistance
        / winding.cooling(speed_ms)
    )


def runaway_current(winding: Winding, speed_ms: float = 0.0) -> float:
    """The current in A at which the winding runs away: sqrt(k / (R_th R20 alpha))."""
    if winding.alpha <= 0:
        return math.inf
    return math.sqrt(
        winding.cooling(speed_ms)
        / (winding.thermal_resistance * winding.resistance_20c * winding.alpha)
    )


def winding_steady_temperature(current: float, winding: Winding, speed_ms: float = 0.0) -> float:
    """Steady temperature in degC at a constant current, -A / B; ``math.inf`` on runaway."""
    a, b = _coefficients(current, winding, speed_ms)
    return math.inf if b >= 0 else -a / b


def winding_step(
    theta: float,
    current: float,
    dt: float,
    winding: Winding,
    speed_ms: float = 0.0,
    allow_runaway: bool = False,
) -> float:
    """The winding temperature in degC after ``dt`` s at ``current`` A, exact for any ``dt``.

    Raises :class:`ThermalRunaway` when no steady state exists at this current and cooling,
    unless ``allow_runaway``: then the exact growing solution is returned (``math.inf`` only if
    it overflows a float).
    """
    if dt < 0:
        raise ValueError("the step must not be negative")
    a, b = _coefficients(current, winding, speed_ms)
    if b > 0.0 and not allow_runaway:
        raise ThermalRunaway(
            f"thermal runaway at {current:.4g} A: I^2 R20 alpha R_th / k = "
            f"{runaway_parameter(current, winding, speed_ms):.4g} >= 1, no steady temperature"
        )
    return _advance(theta, a, b, dt, winding.capacity)


def _advance(theta: float, a: float, b: float, dt: float, capacity: float) -> float:
    """C dtheta/dt = A + B theta solved exactly over ``dt`` from ``theta``."""
    rate = a + b * theta  # W: net heat flow into the node now
    if b == 0.0:
        return theta + rate * dt / capacity
    exponent = b * dt / capacity
    if exponent > _MAX_EXPONENT:
        return math.inf if rate > 0 else -math.inf
    return theta + rate / b * math.expm1(exponent)


def ride_stepper(winding: Winding) -> Callable[[float, float, float, float], tuple[float, bool]]:
    """The ride's step of one winding, ``step(theta, current, dt, speed_ms)``: the temperature
    after ``dt`` s (:func:`winding_step` with runaway allowed) and whether the current is at or
    past the runaway current (:func:`runaway_parameter` >= 1), the cooling at the speed read
    once and the winding's constants read once, in the same arithmetic as those two (a test
    holds them equal to the last bit): a ride takes hundreds of steps of each winding."""
    r20, alpha, r_th, ambient = (
        winding.resistance_20c,
        winding.alpha,
        winding.thermal_resistance,
        winding.ambient_c,
    )
    capacity, cooling, cold = winding.capacity, winding.cooling, 1.0 - 20.0 * alpha
    # the same cooling at every speed is read once (and checked once)
    fixed = cooling.factor if isinstance(cooling, ConstantCooling) else None
    if fixed is not None and not fixed > 0:
        raise ValueError(f"cooling factor must be positive, got {fixed!r}")
    expm1 = math.expm1

    def step(theta: float, current: float, dt: float, speed_ms: float) -> tuple[float, bool]:
        if dt < 0:
            raise ValueError("the step must not be negative")
        factor = fixed if fixed is not None else cooling(speed_ms)
        if not factor > 0:
            raise ValueError(f"cooling factor must be positive, got {factor!r} at {speed_ms} m/s")
        conductance = factor / r_th
        loss = current * current * r20
        a = loss * cold + conductance * ambient
        b = loss * alpha - conductance
        runaway = current * current * r20 * alpha * r_th / factor >= 1.0
        # _advance, inline
        rate = a + b * theta
        if b == 0.0:
            return theta + rate * dt / capacity, runaway
        exponent = b * dt / capacity
        if exponent > _MAX_EXPONENT:
            return (math.inf if rate > 0 else -math.inf), runaway
        return theta + rate / b * expm1(exponent), runaway

    return step


def time_to_temperature(
    theta: float, current: float, limit_c: float, winding: Winding, speed_ms: float = 0.0
) -> float:
    """Seconds at a constant ``current`` from ``theta`` until the winding reaches ``limit_c``;
    0 if it is there already, ``math.inf`` if it never gets there."""
    if theta >= limit_c:
        return 0.0
    a, b = _coefficients(current, winding, speed_ms)
    capacity = winding.capacity
    if b == 0.0:
        rate = a + b * theta
        return math.inf if rate <= 0 else (limit_c - theta) * capacity / rate
    # theta(t) = theta_ss + (theta0 - theta_ss) exp(b t / C), also for b > 0 (theta_ss < theta0)
    theta_ss = -a / b
    ratio = (limit_c - theta_ss) / (theta - theta_ss)
    if ratio <= 0:
        return math.inf
    t = capacity / b * math.log(ratio)
    return t if t >= 0 else math.inf
