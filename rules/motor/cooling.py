"""motor.cooling: the winding temperature each motor settles at when it carries its continuous
current for as long as the ride lasts."""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass

import pint
from firstride_rules.motor._stall import stall_protection
from firstride_rules.motor._wording import Held
from firstride_rules.motor._wording import rationale as motor_rationale
from firstride_rules.motor._wording import remedy as motor_remedy

from reviewer import figures
from reviewer import units as u
from reviewer.build import Build, Motor
from reviewer.engineering.motor import copper_loss
from reviewer.engineering.thermal import (
    ThermalClass,
    calibrated_thermal_resistance,
    copper_resistance_at,
    held_current,
    max_continuous_current,
    steady_winding_temperature,
    steady_winding_temperature_held,
    thermal_class,
)
from reviewer.findings import Assumption, DerivedFigure, Finding, Severity, Source, SourceStatus
from reviewer.profile import Profile
from reviewer.rule import Output, Rule

IEC_60085 = Source("IEC 60085: thermal classes A 105, E 120, B 130, F 155, H 180, N 200 degC")
IEC_60034_1 = Source(
    "IEC 60034-1: winding temperature-rise limits over 40 degC coolant, resistance method"
)
COPPER_TEMPERATURE = Source(
    "Copper resistance with temperature: R2/R1 = (234.5 + T2) / (234.5 + T1) (IEC 60028 basis)"
)
THERMAL_MODEL = Source(
    "One-node steady-state winding model calibrated at rated current: "
    "theta = (theta_amb + 234.5 a) / (1 - a), a = R_th I^2 R20 / 254.5",
    SourceStatus.DERIVED,
)
_STATUS = {s.value: s for s in SourceStatus}
_TOLERANCE_K = 1e-6  # rated current at 40 degC lands on the limit; rounding must not flip it
# Units parsed once: building quantities from unit text costs far more than the physics.
_A = u.unit("A")
_DEGC = u.unit("degC")
_OHM = u.unit("ohm")
_W = u.unit("W")


@dataclass(frozen=True)
class _Load:
    """What holds a locked rotor's current: the motor limit, the battery limit (as the power it
    lets the pack deliver) and the pack voltage behind the loop outside the winding."""

    motor_limit: float | None  # DC-equivalent A
    power_limit: float | None  # W: battery current limit x full pack voltage
    voltage: float | None  # full pack voltage, V; None when the pack is not described
    series: float  # ohm: the motor's own wires and switch, and the shared path once per motor

    @property
    def limited(self) -> bool:
        return self.motor_limit is not None or self.power_limit is not None


def _load(build: Build, motor: Motor, loop: figures.StallLoop | None) -> _Load:
    """A locked rotor on the full pack: its own wires and switch in series, and the shared path
    counted once per motor (exact when identical motors stall together)."""
    limit = figures.motor_limit(build, motor)
    battery = figures.battery_limit(build)
    if loop is None:
        return _Load(None if limit is None else limit.high, None, None, 0.0)
    assert motor.winding_resistance is not None
    own = loop.branch_resistance[motor.name] - _in(motor.winding_resistance, _OHM)
    series = own + len(loop.branch_resistance) * loop.shared_resistance
    return _Load(
        None if limit is None else limit.high,
        None if battery is None else battery * loop.voltage,
        loop.voltage,
        series,
    )


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Steady winding temperature of each motor at its continuous current, against its class.

    What it checks
      For each motor, the current it can carry indefinitely: the controller's per-motor current
      limit (``controller.current_limit``). With no current limit the continuous case is a
      stalled motor on the full pack (a locked wheel, an overload): its cold stall current comes
      from the shared stall loop (winding, switch, wires, pack resistance; ``battery`` needed)
      and falls as the winding heats. The winding temperature reached is compared with the
      insulation class (``insulation_class``).

    Formula
      Copper loss P = I^2 R_hot, with R(theta) = R20 (234.5 + theta) / 254.5 (copper, IEC 60028
      basis). The winding's thermal resistance R_th is calibrated from the rated continuous
      current (``rated_current``): at 40 degC coolant that current brings the winding to 40 degC
      plus the class's IEC 60034-1 rise limit, with its hot resistance. At the build's ambient
      (``usage.ambient_temperature``, else the profile's ``usage.default_ambient_temperature``)
      a held current I settles at theta = (theta_amb + 234.5 a) / (1 - a), with
      a = (R_th / k) I^2 R20 / 254.5; a >= 1 means no steady state (thermal runaway). A stalled
      motor is fed from a voltage, so theta = theta_amb + (R_th / k) V^2 R / (R_series + R)^2 is
      solved numerically (shared pack and battery wiring counted once per motor). k is 1 for the
      cooling the rating assumes; for a motor with a fan (``cooling.fan``) whose inlet or outlet
      is blocked it is ``cooling.blocked_cooling_factor`` or the profile's
      ``motor.blocked_cooling_factor``. Input power V I (pack nominal voltage for a held current,
      full voltage for a stall; full duty) is reported beside the copper loss: they are
      different figures, and most of the input power of a turning motor leaves as shaft work.

    What ends the locked rotor (stated as the case judged)
      With ``motors[].temperature_sensor`` (a sensor the controller cuts current back on) the
      stall is not held for ever: pass, the sensor's trip point stated as an assumption. With
      ``controller.stall_cutoff_time`` the stall lasts that long: from a winding already at its
      rise limit, at the cold stall current in still air, stepped exactly over the cut-off time
      (time constant ``motors[].thermal_time_constant``, or from ``motors[].mass``, or the
      profile's ``ride.default_time_constant``), against the class temperature. With neither,
      the steady state below, held for ever. The sustained climb is ``ride.heating``'s.

    Severities
      - stop: the winding would pass its IEC 60085 class temperature (insulation life halves for
        each 10 K over), or no steady temperature exists (thermal runaway).
      - fix: it would pass 40 degC plus the class's rise limit but stay under the class
        temperature.
      - pass: at or below 40 degC plus the rise limit.
      - unassessed: ``winding_resistance``, ``rated_current`` or ``insulation_class`` absent;
        or, with no current limit, the battery or another motor's winding resistance needed for
        the stall current.

    Rise limits (IEC 60034-1): B 80 K, F 105 K, H 125 K (published); A 60 K, E 75 K (from
    memory); N 145 K (derived conservatively from H's 15 K hot-spot allowance). IEC 60034-1's
    5 K higher figures for small or unventilated machines (from memory) are not used: the lower
    ones are the conservative choice. The remedy is
    the highest continuous current the present cooling allows at this ambient, and, for blocked
    vents, the current allowed once they are clear.
    """
    if not build.motors:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject="motors",
            rationale="The build lists no motor, so no winding temperature can be checked.",
            missing=("motors",),
        )
        return
    default_ambient = profile.limit("usage.default_ambient_temperature")
    ambient = figures.ambient_temperature(build, _in(default_ambient.quantity, _DEGC))
    if build.usage.ambient_temperature is None:
        yield Assumption(
            f"usage.ambient_temperature not given: {u.format_number(ambient)} °C taken for the "
            "motor heating check.",
            default_ambient.source,
        )
    loop = figures.stall_loop(build)
    if not figures.any_limit(build):
        yield Assumption(
            "No controller current limit: each motor is checked stalled on the full pack "
            "indefinitely (a locked or overloaded wheel), its current falling as it heats.",
            THERMAL_MODEL,
        )
    for index, motor in enumerate(build.motors):
        missing = _missing(build, index, motor, loop)
        if missing:
            yield Finding(
                severity=Severity.UNASSESSED,
                subject=f"motor '{motor.name}'",
                rationale=(
                    "The winding temperature needs the winding resistance, the rated continuous "
                    "current, the insulation class and what holds a locked rotor's current (the "
                    "controller's motor current limit, or the pack and motor circuit)."
                ),
                missing=missing,
                sources=(IEC_60085, IEC_60034_1),
            )
            continue
        load = _load(build, motor, loop)
        if load.voltage is None:
            yield Assumption(
                f"Motor '{motor.name}': the pack is not described, so its motor current limit "
                "is taken as held whatever the winding's temperature (no cap by what the pack "
                "voltage can drive through the hot winding: the higher figure).",
                THERMAL_MODEL,
            )
        yield from _check_motor(build, motor, load, ambient, profile)


def _in(quantity: pint.Quantity, unit: pint.Unit) -> float:
    """Magnitude in ``unit``, skipping pint's slow conversion when already in it."""
    return u.in_unit(quantity, unit)


def _missing(
    build: Build, index: int, motor: Motor, loop: figures.StallLoop | None
) -> tuple[str, ...]:
    missing = [
        f"motors[{index}].{name}"
        for name in ("winding_resistance", "rated_current", "insulation_class")
        if getattr(motor, name) is None
    ]
    if loop is None and figures.motor_limit(build, motor) is None:
        stall_needs = ["battery"] if build.battery is None else []
        stall_needs += [
            f"motors[{j}].winding_resistance"
            for j, other in enumerate(build.motors)
            if j != index and other.winding_resistance is None
        ]
        if stall_needs:
            missing += ["controller.motor_current_limit", *stall_needs]
    return tuple(missing)


def _cooling_factor(motor: Motor, profile: Profile) -> tuple[float, Assumption | None]:
    """The heat-loss coefficient of a locked rotor over the one its rating assumes. A shaft fan
    does not turn at a stall: no airflow, as if unventilated (IEC 60034-6 IC411 to IC410; brief
    12). An independently driven fan keeps its airflow unless its inlet or outlet is blocked."""
    cooling = motor.cooling
    blocked = cooling.inlet_blocked or cooling.outlet_blocked
    still = cooling.fan and not cooling.fan_independent
    if not (cooling.fan and (blocked or still)):
        return 1.0, None
    why = (
        "its shaft fan does not turn at a stall (no cooling.fan_independent)"
        if still
        else "blocked fan airflow"
    )
    if cooling.blocked_cooling_factor is not None:
        factor = cooling.blocked_cooling_factor
        note = None
        if still:
            note = Assumption(
                f"Motor '{motor.name}': {why}: judged with its cooling.blocked_cooling_factor, "
                f"{factor:.0%} of the open heat-loss coefficient.",
                None,
            )
        return factor, note
    default = profile.limit("motor.blocked_cooling_factor")
    factor = float(default.value)  # type: ignore[arg-type]
    note = Assumption(
        f"Motor '{motor.name}': {why}, taken to leave {factor:.0%} of the open heat-loss "
        "coefficient (no cooling.blocked_cooling_factor given).",
        default.source,
    )
    return factor, note


def _check_motor(
    build: Build, motor: Motor, load: _Load, ambient: float, profile: Profile
) -> Iterator[Output]:
    assert motor.winding_resistance is not None and motor.rated_current is not None
    assert motor.insulation_class is not None
    grade = thermal_class(motor.insulation_class.value)
    r20 = _in(motor.winding_resistance, _OHM)
    factor, assumption = _cooling_factor(motor, profile)
    if assumption is not None:
        yield assumption
    r_th = calibrated_thermal_resistance(_in(motor.rated_current, _A), r20, grade.rise_limit)
    if load.voltage is None:
        assert load.motor_limit is not None  # _missing asks for the pack otherwise
        current, held_by = load.motor_limit, "motor current limit"
        theta = steady_winding_temperature(current, r20, r_th, ambient, factor)
        cold = current
    else:
        args = (load.voltage, load.series, r20)
        theta = steady_winding_temperature_held(
            *args, r_th, ambient, factor, load.motor_limit, load.power_limit
        )
        current, held_by = held_current(theta, *args, load.motor_limit, load.power_limit)
        cold, _ = held_current(20.0, *args, load.motor_limit, load.power_limit)
    runaway = math.isinf(theta)
    # On runaway the loss has no steady value: quote it at the class temperature, a floor.
    loss_temperature = grade.class_temperature if runaway else theta
    hot = copper_resistance_at(r20, loss_temperature)
    loss = copper_loss(current, hot)
    # A locked rotor does no work: the pack's power all turns into heat in the loop.
    power = None if load.voltage is None else current * current * (hot + load.series)
    if power is not None:
        assert loss <= power * (1 + 1e-9), "copper loss above electrical input"
        assert power <= load.voltage * current * (1 + 1e-9), "battery current above motor current"
    allowed = max_continuous_current(r20, r_th, ambient, grade.rise_limit_temperature, factor)
    allowed_open = max_continuous_current(r20, r_th, ambient, grade.rise_limit_temperature)
    name = f"motor '{motor.name}'"

    yield DerivedFigure(
        f"copper loss at continuous current, {name}",
        u.quantity(loss, _W),
        note="I² R at the winding's hot resistance" + (" (at least)" if runaway else ""),
        order=40,
    )
    if power is not None:
        yield DerivedFigure(
            f"input power at a locked rotor, {name}",
            u.quantity(power, _W),
            note="drawn from the pack; a locked rotor does no work, so all of it is heat",
            order=41,
        )
    if not runaway:
        yield DerivedFigure(
            f"winding temperature, {name}",
            u.quantity(theta, _DEGC),
            note=f"steady state at {u.format_number(ambient)} °C ambient",
            order=42,
        )
    yield DerivedFigure(
        f"highest continuous current, {name}",
        u.quantity(allowed, _A),
        note=f"keeps class {grade.letter} within its rise limit at this ambient and cooling",
        order=43,
    )

    if runaway or theta > grade.class_temperature + _TOLERANCE_K:
        severity = Severity.STOP
    elif theta > grade.rise_limit_temperature + _TOLERANCE_K:
        severity = Severity.FIX
    else:
        severity = Severity.PASS
    measured: pint.Quantity | str | None = None if runaway else u.quantity(theta, _DEGC)
    limit = u.quantity(grade.rise_limit_temperature, _DEGC)
    severity, case, judged = yield from stall_protection(
        build, motor, (r20, r_th, factor, ambient), grade, cold, severity, profile
    )
    if judged is not None:
        measured, limit = judged
    remedy = None
    still = motor.cooling.fan and not motor.cooling.fan_independent
    held = Held(current, cold, held_by, loss, power, still)
    if severity is not Severity.PASS:
        remedy = motor_remedy(
            build, motor, load, held, (allowed, allowed_open), factor, ambient, grade
        )
    yield Finding(
        severity=severity,
        subject=name,
        rationale=motor_rationale(load, held, theta, ambient, grade, factor) + " " + case,
        measured=measured,
        limit=limit,
        remedy=remedy,
        sources=(IEC_60085, _rise_source(grade), COPPER_TEMPERATURE, THERMAL_MODEL),
    )


def _rise_source(grade: ThermalClass) -> Source:
    status = _STATUS.get(grade.rise_limit_status, SourceStatus.FROM_MEMORY)
    return Source(
        f"IEC 60034-1: class {grade.letter} winding rise limit {grade.rise_limit:g} K over "
        "40 degC coolant",
        status,
    )


RULE = Rule(
    id="motor.cooling",
    title="Motor winding temperature at continuous current",
    check=check,
    sources=(IEC_60085, IEC_60034_1, COPPER_TEMPERATURE, THERMAL_MODEL),
    inputs=(
        "motors[].winding_resistance",
        "motors[].rated_current",
        "motors[].insulation_class",
        "motors[].cooling",
        "controller.motor_current_limit",
        "controller.motor_current_basis",
        "controller.battery_current_limit",
        "controller.drive",
        "controller.stall_cutoff_time",
        "motors[].temperature_sensor",
        "motors[].thermal_time_constant",
        "motors[].mass",
        "battery",
        "usage.ambient_temperature",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
