"""controller.switch-thermal: the junction temperature of the controller's power switch while it
carries the motor current, from its conduction and switching losses and its cooling path."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

import pint
from firstride_rules.controller._datasheet import (
    DATASHEET,
    has_ratings,
    rating_findings,
    sealed,
)
from firstride_rules.controller._drive import (
    STALL,
    controller_missing,
    current_limit,
    floor_significant,
    floor_tenth,
    magnitude,
    number,
    stall_missing,
    worst_stall,
)
from firstride_rules.controller._drive import (
    ambient as ambient_temperature,
)

from reviewer import figures
from reviewer import units as u
from reviewer.build import Build, Controller
from reviewer.engineering.switching import (
    conduction_loss,
    hot_on_resistance,
    junction_temperature,
    largest_current,
    largest_sink_to_air,
    switching_loss,
)
from reviewer.findings import Assumption, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Limit, Profile
from reviewer.rule import Output, Rule

LOSSES = Source.from_memory(
    "Mohan, Undeland and Robbins, Power Electronics: MOSFET conduction loss I^2 Rds(on) D, "
    "switching loss about 0.5 V I (tr + tf) f_sw"
)
JUNCTION = Source.from_memory(
    "JEDEC JESD51 thermal resistance definitions: Tj = Ta + P (R_jc + R_cs + R_sa)"
)
_A = u.unit("A")
_V = u.unit("V")
_OHM = u.unit("ohm")
_S = u.unit("s")
_KHZ = u.unit("kHz")  # build frequencies are held in kHz: read them so, no conversion
_PERCENT = u.unit("percent")
_W = u.unit("W")
_K = u.unit("K")
_K_PER_W = u.unit("K/W")
_DEGC = u.unit("degC")
_NEEDED = (
    "switch_on_resistance",
    "switch_rise_time",
    "switch_fall_time",
    "pwm_frequency",
    "switch_max_junction_temperature",
    "switch_thermal_resistance_junction_case",
    "switch_thermal_resistance_case_sink",
    "switch_thermal_resistance_sink_air",
)
_TOLERANCE_K = 1e-6


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Junction temperature of the power switch at the current it must carry, against its rating.

    What it checks
      The controller's power switch (a MOSFET; one per motor, all alike) carrying the motor
      current: the per-motor current limit (``controller.motor_current_limit``), or with none the
      highest cold stall current on the full pack (winding, switch and wires, from the shared
      stall loop). It conducts for the duty D: ``controller.max_duty`` if set, else D = 1. A
      brushed drive reaches its current limit at low speed, so the limit held at full duty is the
      conservative case; with no limit, a stalled motor's current at duty D is about D I_stall,
      so its loss is largest at D = 1 too.

    Formula
      Conduction loss I^2 Rds(on,hot) D, where Rds(on,hot) is ``switch_on_resistance`` (the
      datasheet 25 degC figure) times the profile's ``controller.switch.on_resistance_hot_factor``
      (on-resistance rises about 1.5-2 x from 25 degC to 125-150 degC). Switching loss about
      0.5 V I (tr + tf) f_sw at the pack's full voltage (``battery``), ``switch_rise_time``,
      ``switch_fall_time`` and ``pwm_frequency`` (Mohan, Undeland and Robbins). Junction
      temperature Tj = Ta + P (R_jc + R_cs + R_sa) (JEDEC JESD51 definitions) with the
      ``switch_thermal_resistance_*`` fields and the ambient (``usage.ambient_temperature``, else
      the profile's ``usage.default_ambient_temperature``).

    Severities
      - stop: Tj above ``switch_max_junction_temperature``.
      - fix: Tj within the maximum but inside the profile's
        ``controller.switch.junction_margin`` below it.
      - pass: Tj at or below the maximum less the margin.
      - unassessed: any of the switch fields above, the battery, or the current (a current limit,
        or the battery and every motor's winding resistance for the stall current) absent.

    Remedy: the sink-to-air resistance that brings Tj to the maximum less the margin (when a
    heatsink can), the current limit that does, and the 25 degC on-resistance that does.
    """
    controller = build.controller
    if controller is not None and not sealed(controller):  # its switches are described
        switch = ("switch_max_current",)
        yield from (f for f in rating_findings(build, switch) if "switch" in f.subject)
    if sealed(controller) and has_ratings(controller):
        yield Finding(
            Severity.PASS,
            "controller switch",
            "A sealed controller: its switches' losses and thermal path are not known, so it is "
            "judged by its datasheet current ratings instead (the findings beside this one).",
            sources=(DATASHEET,),
        )
        required = ("peak_current", "rated_continuous_current")
        yield from (f for f in rating_findings(build, required) if "switch" not in f.subject)
        return
    limit = current_limit(build)
    stall = worst_stall(build) if limit is None else None
    missing = controller_missing(build, _NEEDED)
    if build.battery is None:
        missing.append("battery")
    if limit is None and stall is None:
        needs = [m for m in stall_missing(build) if m not in missing]
        missing += ["controller.motor_current_limit", *needs]
    if missing or controller is None or build.battery is None:
        yield Finding(
            severity=Severity.UNASSESSED,
            subject="controller switch",
            rationale=(
                "The switch's junction temperature needs its on-resistance, rise and fall times, "
                "the PWM frequency, its thermal resistances and maximum junction temperature, the "
                "pack voltage and the current it carries (the current limit, or the stall current)."
                " A sealed controller may instead be judged by its datasheet ratings "
                "(controller.rated_continuous_current, controller.peak_current)."
            ),
            missing=tuple(missing),
            sources=(LOSSES, JUNCTION),
        )
        return

    hot_factor = number(profile.limit("controller.switch.on_resistance_hot_factor"))
    margin_limit = profile.limit("controller.switch.junction_margin")
    default_ambient = profile.limit("usage.default_ambient_temperature")
    ambient = ambient_temperature(build, default_ambient)
    if build.usage.ambient_temperature is None:
        yield Assumption(
            f"usage.ambient_temperature not given: {u.format_number(ambient)} °C taken for the "
            "switch junction temperature.",
            default_ambient.source,
        )
    yield Assumption(
        f"Switch on-resistance taken as the datasheet 25 °C figure, {hot_factor:g} x that at a "
        "hot junction.",
        profile.limit("controller.switch.on_resistance_hot_factor").source,
    )
    if controller.max_duty is None:
        duty = 1.0
        yield Assumption(
            "No controller.max_duty: the switch is taken to conduct the whole time (D = 1).",
            LOSSES,
        )
    else:
        duty = magnitude(controller.max_duty, _PERCENT) / 100.0
    if limit is not None:
        current = limit
    else:
        assert stall is not None
        current = stall.current
        yield Assumption(
            "No controller current limit: the switch is checked at the cold stall current of "
            f"motor '{stall.motor}' on the full pack.",
            STALL,
        )
    switch = _switch(controller)
    load = _Duty(
        current=current,
        limited=limit is not None,
        duty=duty,
        voltage=figures.pack_voltages(build.battery).full,
        ambient=ambient,
        hot_factor=hot_factor,
        target=switch.max_junction - magnitude(margin_limit.quantity, _K),
    )
    yield from _judge(switch, load, margin_limit)


@dataclass(frozen=True)
class _Switch:
    """The switch's datasheet figures and cooling path, in SI floats."""

    on_resistance_25c: float  # ohm
    rise_time: float  # s
    fall_time: float  # s
    frequency: float  # Hz, PWM
    junction_case: float  # K/W
    case_sink: float  # K/W
    sink_air: float  # K/W
    max_junction: float  # degC

    @property
    def thermal_resistance(self) -> float:
        return self.junction_case + self.case_sink + self.sink_air


@dataclass(frozen=True)
class _Duty:
    """What the switch is asked to do, and what it must stay under."""

    current: float  # A
    limited: bool  # the controller's current limit (else the stall current)
    duty: float  # 0..1
    voltage: float  # V, pack full
    ambient: float  # degC
    hot_factor: float
    target: float  # degC: the maximum less the margin


def _switch(controller: Controller) -> _Switch:
    def value(name: str, unit: pint.Unit) -> float:
        quantity = getattr(controller, name)
        assert quantity is not None, name  # absent fields were reported as unassessed
        return magnitude(quantity, unit)

    return _Switch(
        on_resistance_25c=value("switch_on_resistance", _OHM),
        rise_time=value("switch_rise_time", _S),
        fall_time=value("switch_fall_time", _S),
        frequency=value("pwm_frequency", _KHZ) * 1000.0,
        junction_case=value("switch_thermal_resistance_junction_case", _K_PER_W),
        case_sink=value("switch_thermal_resistance_case_sink", _K_PER_W),
        sink_air=value("switch_thermal_resistance_sink_air", _K_PER_W),
        max_junction=value("switch_max_junction_temperature", _DEGC),
    )


def _judge(switch: _Switch, load: _Duty, margin: Limit) -> Iterator[Output]:
    f = u.format_number
    r_hot = hot_on_resistance(switch.on_resistance_25c, load.hot_factor)
    p_cond = conduction_loss(load.current, r_hot, load.duty)
    p_sw = switching_loss(
        load.voltage, load.current, switch.rise_time, switch.fall_time, switch.frequency
    )
    power = p_cond + p_sw
    t_j = junction_temperature(
        load.ambient, power, switch.junction_case, switch.case_sink, switch.sink_air
    )
    yield DerivedFigure(
        "switch junction temperature",
        u.quantity(t_j, _DEGC),
        note=f"at {f(load.current)} A and {f(load.ambient)} °C ambient",
        order=50,
    )
    yield DerivedFigure(
        "switch conduction loss",
        u.quantity(p_cond, _W),
        note=f"I² Rds(on,hot) D with D = {f(load.duty)}",
        order=51,
    )
    yield DerivedFigure(
        "switch switching loss",
        u.quantity(p_sw, _W),
        note=f"0.5 V I (tr + tf) f_sw at {f(load.voltage)} V",
        order=52,
    )
    if t_j > switch.max_junction + _TOLERANCE_K:
        severity = Severity.STOP
    elif t_j > load.target + _TOLERANCE_K:
        severity = Severity.FIX
    else:
        severity = Severity.PASS
    basis = "the current limit" if load.limited else "the cold stall current, with no limit"
    rationale = (
        f"At {f(load.current)} A ({basis}) and {f(load.duty * 100)} % duty, the switch loses "
        f"{f(p_cond)} W in conduction ({f(r_hot * 1000)} mΩ hot, {load.hot_factor:g} x its 25 °C "
        f"figure) and {f(p_sw)} W in switching at {f(load.voltage)} V and "
        f"{f(switch.frequency / 1000)} kHz. {f(power)} W through "
        f"{f(switch.thermal_resistance)} K/W from {f(load.ambient)} °C puts the junction at "
        f"{f(t_j)} °C; it is rated {f(switch.max_junction)} °C and the profile keeps "
        f"{f(switch.max_junction - load.target)} K in hand ({f(load.target)} °C)."
    )
    yield Finding(
        severity=severity,
        subject="controller switch",
        rationale=rationale,
        measured=u.quantity(t_j, _DEGC),
        limit=u.quantity(load.target, _DEGC),
        remedy=None if severity is Severity.PASS else _remedy(switch, load, power, p_sw),
        sources=(LOSSES, JUNCTION, margin.source),
    )


def _remedy(switch: _Switch, load: _Duty, power: float, p_sw: float) -> str:
    """Three ways to bring Tj to the target, each on its own: heatsink, current, switch."""
    f = u.format_number
    if load.target <= load.ambient:
        return (
            f"use a switch rated well above {f(switch.max_junction)} °C junction: at "
            f"{f(load.ambient)} °C ambient no cooling keeps this one within its margin"
        )
    options = []
    sink = largest_sink_to_air(
        load.ambient, power, load.target, switch.junction_case, switch.case_sink
    )
    if sink > 0:
        options.append(
            f"fit a heatsink of at most {f(floor_significant(sink))} K/W sink to air "
            f"(controller.switch_thermal_resistance_sink_air, now {f(switch.sink_air)} K/W)"
        )
    amps = largest_current(
        load.ambient,
        load.target,
        switch.thermal_resistance,
        hot_on_resistance(switch.on_resistance_25c, load.hot_factor),
        load.duty,
        load.voltage,
        switch.rise_time + switch.fall_time,
        switch.frequency,
    )
    if load.limited:
        options.append(f"set controller.motor_current_limit at or below {floor_tenth(amps):g} A")
    else:
        options.append(
            f"fit a current limit at or below {floor_tenth(amps):g} A "
            f"(controller.motor_current_limit; without one the switch carries the stall "
            f"current, {f(load.current)} A)"
        )
    budget = (load.target - load.ambient) / switch.thermal_resistance - p_sw
    if budget > 0:
        ohms = budget / (load.current * load.current * load.duty * load.hot_factor)
        options.append(
            f"use a switch of at most {f(floor_significant(ohms) * 1000)} mΩ at 25 °C "
            "(controller.switch_on_resistance)"
        )
    return ", or ".join(options)


RULE = Rule(
    id="controller.switch-thermal",
    title="Power switch junction temperature",
    check=check,
    sources=(LOSSES, JUNCTION, STALL),
    inputs=(
        "controller.motor_current_limit",
        "controller.max_duty",
        "controller.pwm_frequency",
        *(f"controller.{name}" for name in _NEEDED if name != "pwm_frequency"),
        "battery",
        "motors[].winding_resistance",
        "usage.ambient_temperature",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
