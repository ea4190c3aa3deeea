"""motor.cooling: the winding temperature each motor settles at when it carries its continuous
current for as long as the ride lasts."""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass

import pint

from reviewer import figures
from reviewer import units as u
from reviewer.build import Build, Motor
from reviewer.engineering.motor import copper_loss, input_power
from reviewer.engineering.thermal import (
    REFERENCE_COOLANT_C,
    ThermalClass,
    calibrated_thermal_resistance,
    copper_resistance_at,
    insulation_life_factor,
    max_continuous_current,
    steady_winding_temperature,
    steady_winding_temperature_fed,
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
# The 10 K halving rule is quoted only this far past the class temperature; beyond it the
# figure would be meaningless precision about a winding that is burning.
_LIFE_QUOTE_SPAN_K = 50.0
_TOLERANCE_K = 1e-6  # rated current at 40 degC lands on the limit; rounding must not flip it
# Units parsed once: building quantities from unit text costs far more than the physics.
_A = u.unit("A")
_DEGC = u.unit("degC")
_OHM = u.unit("ohm")
_W = u.unit("W")


@dataclass(frozen=True)
class _Load:
    """What drives a motor's winding: a held current, or the pack voltage on a locked rotor."""

    current: float  # the held current; for a stall, the cold stall current
    voltage: float | None  # volts behind the current (input power), if the battery is known
    stall_series_resistance: float | None = None  # None: current-limited; else stall feed


def _stall_load(loop: figures.StallLoop, motor: Motor) -> _Load:
    """A locked rotor fed from the full pack: its own wires and switch in series, and the shared
    path counted once per motor (exact when identical motors stall together)."""
    assert motor.winding_resistance is not None
    own = loop.branch_resistance[motor.name] - _in(motor.winding_resistance, _OHM)
    series = own + len(loop.branch_resistance) * loop.shared_resistance
    return _Load(loop.branch_current[motor.name], loop.voltage, series)


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
            f"Ambient temperature not given: {u.format_number(ambient)} °C taken for the motor "
            "heating check.",
            default_ambient.source,
        )
    limit = figures.current_limit(build)
    loop = figures.stall_loop(build) if limit is None else None
    pack_voltage = figures.pack_voltages(build.battery).nominal if build.battery else None
    if limit is None:
        yield Assumption(
            "No controller current limit: each motor is checked stalled on the full pack "
            "indefinitely (a locked or overloaded wheel), its current falling as it heats.",
            THERMAL_MODEL,
        )
    for index, motor in enumerate(build.motors):
        missing = _missing(build, index, motor, limit)
        if missing:
            yield Finding(
                severity=Severity.UNASSESSED,
                subject=f"motor '{motor.name}'",
                rationale=(
                    "The winding temperature needs the winding resistance, the rated continuous "
                    "current, the insulation class and a continuous current (the controller's "
                    "current limit, or the stall current from the battery and motor circuit)."
                ),
                missing=missing,
                sources=(IEC_60085, IEC_60034_1),
            )
            continue
        if limit is not None:
            load = _Load(limit, pack_voltage)
        else:
            assert loop is not None
            load = _stall_load(loop, motor)
        yield from _check_motor(motor, load, ambient, profile)


def _in(quantity: pint.Quantity, unit: pint.Unit) -> float:
    """Magnitude in ``unit``, skipping pint's slow conversion when already in it."""
    return u.in_unit(quantity, unit)


def _missing(build: Build, index: int, motor: Motor, limit: float | None) -> tuple[str, ...]:
    missing = [
        f"motors[{index}].{name}"
        for name in ("winding_resistance", "rated_current", "insulation_class")
        if getattr(motor, name) is None
    ]
    if limit is None:
        stall_needs = ["battery"] if build.battery is None else []
        stall_needs += [
            f"motors[{j}].winding_resistance"
            for j, other in enumerate(build.motors)
            if j != index and other.winding_resistance is None
        ]
        if stall_needs:
            missing += ["controller.current_limit", *stall_needs]
    return tuple(missing)


def _cooling_factor(motor: Motor, profile: Profile) -> tuple[float, Assumption | None]:
    cooling = motor.cooling
    if not (cooling.fan and (cooling.inlet_blocked or cooling.outlet_blocked)):
        return 1.0, None
    if cooling.blocked_cooling_factor is not None:
        return cooling.blocked_cooling_factor, None
    default = profile.limit("motor.blocked_cooling_factor")
    factor = float(default.value)  # type: ignore[arg-type]
    note = Assumption(
        f"Motor '{motor.name}': blocked fan airflow taken to leave {factor:.0%} of the open "
        "heat-loss coefficient (no cooling.blocked_cooling_factor given).",
        default.source,
    )
    return factor, note


def _check_motor(motor: Motor, load: _Load, ambient: float, profile: Profile) -> Iterator[Output]:
    assert motor.winding_resistance is not None and motor.rated_current is not None
    assert motor.insulation_class is not None
    grade = thermal_class(motor.insulation_class.value)
    r20 = _in(motor.winding_resistance, _OHM)
    factor, assumption = _cooling_factor(motor, profile)
    if assumption is not None:
        yield assumption
    r_th = calibrated_thermal_resistance(_in(motor.rated_current, _A), r20, grade.rise_limit)
    if load.stall_series_resistance is None:
        current = load.current
        theta = steady_winding_temperature(current, r20, r_th, ambient, factor)
    else:
        assert load.voltage is not None
        series = load.stall_series_resistance
        theta = steady_winding_temperature_fed(load.voltage, series, r20, r_th, ambient, factor)
        current = load.voltage / (series + copper_resistance_at(r20, theta))
    runaway = math.isinf(theta)
    # On runaway the loss has no steady value: quote it at the class temperature, a floor.
    loss_temperature = grade.class_temperature if runaway else theta
    loss = copper_loss(current, copper_resistance_at(r20, loss_temperature))
    power = input_power(load.voltage, current) if load.voltage is not None else None
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
            f"input power at continuous current, {name}",
            u.quantity(power, _W),
            note="V I drawn at full duty; not all of it heats the winding",
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
    remedy = None
    if severity is not Severity.PASS:
        remedy = _remedy(load, current, allowed, allowed_open, factor, ambient, grade)
    yield Finding(
        severity=severity,
        subject=name,
        rationale=_rationale(load, current, loss, power, theta, ambient, grade, factor),
        measured=None if runaway else u.quantity(theta, _DEGC),
        limit=u.quantity(grade.rise_limit_temperature, _DEGC),
        remedy=remedy,
        sources=(IEC_60085, _rise_source(grade), COPPER_TEMPERATURE, THERMAL_MODEL),
    )


def _rationale(
    load: _Load,
    current: float,
    loss: float,
    power: float | None,
    theta: float,
    ambient: float,
    grade: ThermalClass,
    factor: float,
) -> str:
    f = u.format_number
    drawn = ""
    if power is not None and load.voltage is not None:
        drawn = f", of {f(power)} W drawn at {f(load.voltage)} V and full duty"
    if load.stall_series_resistance is None:
        first = (
            f"Held at {f(current)} A by the controller's current limit, the winding's copper "
            f"loss is {'at least ' if math.isinf(theta) else ''}{f(loss)} W{drawn}."
        )
    else:
        first = (
            f"With no current limit a stalled motor draws {f(load.current)} A cold, falling to "
            f"{f(current)} A as it heats; the winding's copper loss is then {f(loss)} W{drawn}."
        )
    cooling = "" if factor == 1.0 else f" with blocked airflow ({factor:.0%} of the cooling)"
    limits = (
        f"class {grade.letter} allows {f(grade.rise_limit_temperature)} °C "
        f"({f(REFERENCE_COOLANT_C)} °C plus its {f(grade.rise_limit)} K rise limit) and its "
        f"insulation is rated {f(grade.class_temperature)} °C"
    )
    if math.isinf(theta):
        return (
            f"{first} At {f(ambient)} °C ambient{cooling} no steady temperature exists: the loss "
            f"grows with the winding's resistance faster than cooling removes it; {limits}."
        )
    life = ""
    excess = theta - grade.class_temperature
    if excess > _LIFE_QUOTE_SPAN_K:
        life = f"; that is {f(excess)} K past its insulation rating"
    elif excess > 0:
        share = insulation_life_factor(theta, grade.class_temperature)
        life = f"; insulation life falls to about {f(share, 2)} of its rated life"
    return (
        f"{first} At {f(ambient)} °C ambient{cooling} it settles at {f(theta)} °C; {limits}{life}."
    )


def _remedy(
    load: _Load,
    current: float,
    allowed: float,
    allowed_open: float,
    factor: float,
    ambient: float,
    grade: ThermalClass,
) -> str:
    f = u.format_number
    if allowed <= 0:
        return (
            f"do not run this motor at {f(ambient)} °C ambient: even without current it is over "
            f"its class {grade.letter} limit; use a motor of a higher insulation class"
        )
    amps = _floor_tenth(allowed)
    if load.stall_series_resistance is None:
        text = f"set the current limit at or below {amps:g} A"
    else:
        text = (
            f"fit a current limit at or below {amps:g} A (without one the motor can sit at its "
            f"stall current, {f(load.current)} A cold)"
        )
    if factor < 1.0:
        open_amps = _floor_tenth(allowed_open)
        if load.stall_series_resistance is None and current <= allowed_open:
            text += (
                f", or unblock the fan's inlet and outlet (then up to {open_amps:g} A is allowed)"
            )
        else:
            text += f"; unblocking the fan's inlet and outlet raises that to {open_amps:g} A"
    return text


def _floor_tenth(value: float) -> float:
    return math.floor(value * 10.0 + 1e-9) / 10.0


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
        "controller.current_limit",
        "battery",
        "usage.ambient_temperature",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
