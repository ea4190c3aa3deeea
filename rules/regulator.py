"""logic.regulator: the regulator that feeds the logic board from the traction pack.

A linear regulator burns the whole voltage it drops at the full load current. From a pack of
many cells, a board with a sensor, a radio and a relay coil heats it past its junction limit;
it then shuts down or fails mid-ride, and whatever the logic controls (throttle, brake relay)
goes with it. A switching regulator or a separate 5 V supply avoids that (common practice).
"""

from __future__ import annotations

import math
from collections.abc import Generator, Iterator
from dataclasses import dataclass

from reviewer import derived
from reviewer import units as u
from reviewer.build import Build, Logic, Regulator
from reviewer.engineering.regulator import (
    junction_temperature,
    largest_thermal_resistance,
    linear_load_budget,
    linear_regulator_loss,
    switching_input_current,
    switching_loss,
)
from reviewer.findings import (
    Assumption,
    Comparison,
    DerivedFigure,
    Finding,
    Severity,
    Source,
    SourceStatus,
)
from reviewer.profile import Profile
from reviewer.rule import Output, Rule

LINEAR_LOSS = Source.from_memory(
    "Linear regulator dissipation P = (Vin - Vout) I_out + Vin I_q (Horowitz and Hill, The Art "
    "of Electronics, voltage regulators)"
)
JUNCTION = Source.from_memory("JEDEC JESD51 definitions: Tj = Ta + P R_th(j-a)")
DATASHEET = Source("The regulator's datasheet ratings, as entered in the build", SourceStatus.USER)
# common practice: a linear regulator that has to supply a sensor and a radio from a high pack
# voltage overheats, and a separate 5 V supply (or a switching regulator) solves it.
TRADE_PRACTICE = Source.common_practice(
    "A linear regulator feeding a sensor and a radio from a high pack voltage overheats; a "
    "switching regulator or a separate 5 V supply solves it"
)
OVERVOLTAGE = Source.common_practice(
    "A regulator above its maximum input voltage fails, and a failed pass element can put the "
    "pack voltage on the logic rail"
)

_in = derived.in_unit  # skips pint's conversion for fields already in the unit asked
_MA = u.unit("mA")
_V = u.unit("V")
_W = u.unit("W")
_DEGC = u.unit("degC")
_KW = u.unit("K/W")
_PERCENT = u.unit("percent")


@dataclass(frozen=True)
class _Supply:
    """What the regulator sees, in SI floats."""

    input_voltage: float  # V, the highest it is fed
    input_because: str
    low_input: float  # V, the pack's cut-off (where a switcher draws most)


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """The logic regulator's input voltage and, for a linear one, its junction temperature.

    What it checks
      The regulator in ``logic.regulator`` (``kind`` linear or switching). Fed from the pack
      (``fed_from_pack``, the default), it sees the pack's full voltage (cells in series times
      the chemistry's full cell voltage), or ``battery.charger_voltage`` if that is higher,
      since the logic may be powered while charging.

      1. Input: that voltage against ``logic.regulator.input_max``.
      2. Heat (linear only): the load is ``logic.board_current`` (microcontroller, sensors,
         radio) plus every ``logic.loads[].current`` (all taken on the regulated rail at once)
         plus the brake relay's coil (``brake.coil_current``) unless a logic load that is
         inductive and draws the same current is listed (that load is taken to be the coil,
         counted once). P = (Vin - Vout) I_out + Vin I_q, with Vout
         ``logic.regulator.output_voltage`` (else ``logic.supply_voltage``) and I_q
         ``logic.regulator.quiescent_current`` (else the profile's
         ``logic.regulator.default_quiescent_current``). Tj = Ta + P R_th(j-a), with R_th
         ``logic.regulator.thermal_resistance`` and Ta ``usage.ambient_temperature`` (else the
         profile's ``usage.default_ambient_temperature``), against
         ``logic.regulator.max_junction_temperature`` (else the profile's
         ``logic.regulator.default_max_junction_temperature``).
      A switching regulator's input current is estimated at the pack's cut-off voltage, where
      it is largest: Vout I_out / (eta Vin), eta the profile's
      ``logic.regulator.switching_efficiency``.

    Severities
      - stop: the input voltage exceeds the regulator's maximum.
      - fix: a linear regulator's junction runs above its maximum.
      - pass: within both; a switching regulator within its input rating; or no logic board
        described at all (nothing to check).
      - unassessed: a logic board without ``logic.regulator``; the pack (``battery``) or an
        input voltage the regulator is not fed from the pack with; ``input_max``; for a
        linear regulator ``thermal_resistance``, ``logic.board_current`` or an output voltage.

    Remedies name a regulator rated for the input voltage; for heat, a switching regulator at
    the profile's efficiency (with its input current and loss) or a separate 5 V supply, the
    load current at which the linear part would stay within its junction limit, and the
    junction-to-air thermal resistance (heatsink) that would do, each re-checked.
    """
    logic = build.logic
    if logic is None:
        yield Finding(
            Severity.PASS,
            "logic supply",
            "The build describes no logic board, so there is no logic regulator to check.",
        )
        return
    regulator = logic.regulator
    if regulator is None:
        yield Finding(
            Severity.UNASSESSED,
            "logic supply",
            "A logic board is described but not the regulator that feeds it, so its input "
            "voltage and heat could not be checked.",
            missing=("logic.regulator",),
            sources=(LINEAR_LOSS,),
        )
        return
    supply = _supply(build, regulator)
    if isinstance(supply, Finding):
        yield supply
        return
    if regulator.kind == "switching":
        estimate = yield from _switching(build, logic, regulator, supply, profile)
        yield _input_finding(regulator, supply, estimate)
    else:
        yield _input_finding(regulator, supply)
        yield from _linear(build, logic, regulator, supply, profile)


def _supply(build: Build, regulator: Regulator) -> _Supply | Finding:
    if not regulator.fed_from_pack:
        return Finding(
            Severity.UNASSESSED,
            "regulator input",
            "The regulator is not fed from the traction pack and the build gives no other "
            "input voltage, so neither its input rating nor its heat could be checked.",
            missing=("logic.regulator.input_voltage",),
            sources=(LINEAR_LOSS,),
        )
    if build.battery is None:
        return Finding(
            Severity.UNASSESSED,
            "regulator input",
            "The regulator is fed from the pack, which is not described.",
            missing=("battery",),
            sources=(LINEAR_LOSS,),
        )
    pack = derived.pack_voltages(build.battery)
    volts, because = pack.full, f"the full voltage of the {build.battery.cells_series}-cell pack"
    charger = build.battery.charger_voltage
    if charger is not None and _in(charger, _V) > volts:
        volts, because = _in(charger, _V), "the charger voltage"
    return _Supply(volts, because, pack.cutoff)


def _input_finding(regulator: Regulator, supply: _Supply, estimate: str = "") -> Finding:
    f = u.format_number
    vin = supply.input_voltage
    if regulator.input_max is None:
        return Finding(
            Severity.UNASSESSED,
            "regulator input",
            f"The regulator sees {f(vin)} V ({supply.input_because}) but its maximum input "
            f"voltage is not given.{estimate}",
            missing=("logic.regulator.input_max",),
            sources=(DATASHEET,),
        )
    rating = _in(regulator.input_max, _V)
    over = vin > rating
    return Finding(
        Severity.STOP if over else Severity.PASS,
        "regulator input",
        f"The {regulator.kind} regulator sees {f(vin)} V ({supply.input_because}) against "
        f"its {f(rating)} V maximum input.{estimate}",
        measured=u.Quantity(vin, _V),
        limit=u.Quantity(rating, _V),
        comparison=Comparison.AT_MOST,
        remedy=(f"use a regulator rated for at least {math.ceil(vin)} V input" if over else None),
        sources=(DATASHEET, OVERVOLTAGE) if over else (DATASHEET,),
    )


def _output_voltage(logic: Logic, regulator: Regulator) -> float | None:
    if regulator.output_voltage is not None:
        return _in(regulator.output_voltage, _V)
    if logic.supply_voltage is not None:
        return _in(logic.supply_voltage, _V)
    return None


def _load_current(build: Build, logic: Logic) -> tuple[float, list[Assumption]]:
    """The regulated rail's load in A: board, pin loads, and the brake coil counted once."""
    assert logic.board_current is not None
    total = _in(logic.board_current, _MA) / 1000.0
    notes: list[Assumption] = []
    if logic.loads:
        total += sum(_in(load.current, _MA) / 1000.0 for load in logic.loads)
        notes.append(
            Assumption(
                "Every logic load is taken to draw from the regulated rail, all at once "
                "(the worst case for the regulator)."
            )
        )
    coil = build.brake.coil_current if build.brake is not None else None
    if coil is not None:
        amps = _in(coil, _MA) / 1000.0
        twin = next(
            (
                load
                for load in logic.loads
                if load.inductive and math.isclose(_in(load.current, _MA) / 1000.0, amps)
            ),
            None,
        )
        if twin is None:
            total += amps
            notes.append(
                Assumption("The brake relay coil is taken to be fed from the regulated rail.")
            )
        else:
            notes.append(
                Assumption(
                    f"The brake relay coil ({u.format_number(amps * 1000)} mA) is taken to be "
                    f"logic load '{twin.name}', which draws the same current, and is counted once."
                )
            )
    return total, notes


def _switching(
    build: Build, logic: Logic, regulator: Regulator, supply: _Supply, profile: Profile
) -> Generator[Output, None, str]:
    """Figures for a switching regulator; returns a sentence with its input current."""
    efficiency_limit = profile.limit("logic.regulator.switching_efficiency")
    efficiency = _in(efficiency_limit.quantity, _PERCENT) / 100.0
    vout = _output_voltage(logic, regulator)
    if logic.board_current is None or vout is None:
        return (
            " Its input current is not estimated: the logic board's current or output "
            "voltage is not given."
        )
    load, notes = _load_current(build, logic)
    yield from notes
    low = max(supply.low_input, vout)
    current = switching_input_current(low, vout, load, efficiency)
    yield DerivedFigure(
        "logic regulator input current",
        u.Quantity(current * 1000.0, _MA),
        note=(
            f"switching, {u.format_number(efficiency * 100)} % efficient assumed, "
            f"{u.format_number(load * 1000)} mA at {u.format_number(vout)} V, "
            f"from {u.format_number(low)} V (pack cut-off)"
        ),
        order=81,
    )
    yield DerivedFigure(
        "logic regulator dissipation",
        u.Quantity(switching_loss(vout, load, efficiency), _W),
        note="switching: (1/efficiency - 1) x the output power",
        order=82,
    )
    yield Assumption(
        f"Switching regulator efficiency {u.format_number(efficiency * 100)} % taken for its "
        "input current.",
        efficiency_limit.source,
    )
    f = u.format_number
    return (
        f" At about {f(efficiency * 100)} % efficiency it draws an estimated "
        f"{f(current * 1000)} mA from the pack at its {f(low)} V cut-off to supply "
        f"{f(load * 1000)} mA at {f(vout)} V; its loss is a fraction of that power, not of "
        "the voltage dropped."
    )


def _linear(
    build: Build, logic: Logic, regulator: Regulator, supply: _Supply, profile: Profile
) -> Iterator[Output]:
    f = u.format_number
    vout = _output_voltage(logic, regulator)
    missing = []
    if regulator.thermal_resistance is None:
        missing.append("logic.regulator.thermal_resistance")
    if logic.board_current is None:
        missing.append("logic.board_current")
    if vout is None:
        missing.append("logic.regulator.output_voltage")
    if missing:
        yield Finding(
            Severity.UNASSESSED,
            "regulator heat",
            "A linear regulator's junction temperature needs its output voltage, the load it "
            "feeds and its junction-to-air thermal resistance.",
            missing=tuple(missing),
            sources=(LINEAR_LOSS, JUNCTION),
        )
        return
    assert vout is not None and regulator.thermal_resistance is not None
    vin = supply.input_voltage
    load, notes = _load_current(build, logic)
    yield from notes
    quiescent, tj_max, ambient = yield from _defaults(build, regulator, profile)
    r_th = _in(regulator.thermal_resistance, _KW)
    subject = "regulator heat"
    yield DerivedFigure("logic rail current", u.Quantity(load * 1000.0, _MA), order=80)
    if vin <= vout:
        yield Finding(
            Severity.FIX,
            subject,
            f"The pack's {f(vin)} V is not above the {f(vout)} V output, so a linear "
            "regulator cannot hold its output.",
            measured=u.Quantity(vin, _V),
            limit=u.Quantity(vout, _V),
            comparison=Comparison.AT_LEAST,
            remedy=f"use a boost or buck-boost switching regulator for the {f(vout)} V rail",
            sources=(LINEAR_LOSS,),
        )
        return
    power = linear_regulator_loss(vin, vout, load, quiescent)
    junction = junction_temperature(ambient, power, r_th)
    yield DerivedFigure(
        "logic regulator dissipation",
        u.Quantity(power, _W),
        note=f"linear: ({f(vin)} V - {f(vout)} V) x {f(load * 1000)} mA + {f(vin)} V x "
        f"{f(quiescent * 1000)} mA",
        order=82,
    )
    yield DerivedFigure(
        "logic regulator junction temperature",
        u.Quantity(junction, _DEGC),
        note=f"{f(ambient)} °C ambient + {f(power)} W x {f(r_th)} K/W",
        order=83,
    )
    hot = junction > tj_max
    rationale = (
        f"The linear regulator drops {f(vin)} V to {f(vout)} V at {f(load * 1000)} mA "
        f"(quiescent {f(quiescent * 1000)} mA) and so dissipates {f(power)} W; at "
        f"{f(r_th)} K/W that is a {f(power * r_th)} K rise over {f(ambient)} °C, a junction "
        f"at {f(junction)} °C against its {f(tj_max)} °C maximum."
    )
    yield Finding(
        Severity.FIX if hot else Severity.PASS,
        subject,
        rationale,
        measured=u.Quantity(junction, _DEGC),
        limit=u.Quantity(tj_max, _DEGC),
        comparison=Comparison.AT_MOST,
        remedy=_heat_remedy(profile, vin, vout, load, quiescent, r_th, ambient, tj_max, power)
        if hot
        else None,
        sources=(LINEAR_LOSS, JUNCTION, DATASHEET, TRADE_PRACTICE)
        if hot
        else (LINEAR_LOSS, JUNCTION, DATASHEET),
    )


def _defaults(
    build: Build, regulator: Regulator, profile: Profile
) -> Generator[Assumption, None, tuple[float, float, float]]:
    """Quiescent current (A), junction maximum and ambient (degC), noting each default used.
    A generator that yields the assumptions and returns the three figures."""
    if regulator.quiescent_current is not None:
        quiescent = _in(regulator.quiescent_current, _MA) / 1000.0
    else:
        limit = profile.limit("logic.regulator.default_quiescent_current")
        quiescent = _in(limit.quantity, _MA) / 1000.0
        yield Assumption(
            f"Regulator quiescent current not given: {u.format_number(quiescent * 1000)} mA taken.",
            limit.source,
        )
    if regulator.max_junction_temperature is not None:
        tj_max = _in(regulator.max_junction_temperature, _DEGC)
    else:
        limit = profile.limit("logic.regulator.default_max_junction_temperature")
        tj_max = _in(limit.quantity, _DEGC)
        yield Assumption(
            f"Regulator maximum junction temperature not given: {u.format_number(tj_max)} °C "
            "taken.",
            limit.source,
        )
    default = profile.limit("usage.default_ambient_temperature")
    ambient = derived.ambient_temperature(build, _in(default.quantity, _DEGC))
    if build.usage.ambient_temperature is None:
        yield Assumption(
            f"Ambient temperature not given: {u.format_number(ambient)} °C taken for the "
            "regulator.",
            default.source,
        )
    return quiescent, tj_max, ambient


def _heat_remedy(
    profile: Profile,
    vin: float,
    vout: float,
    load: float,
    quiescent: float,
    r_th: float,
    ambient: float,
    tj_max: float,
    power: float,
) -> str:
    """The alternatives, each re-checked against the same junction limit."""
    f = u.format_number
    efficiency = (
        _in(profile.limit("logic.regulator.switching_efficiency").quantity, _PERCENT) / 100.0
    )
    drawn = switching_input_current(vin, vout, load, efficiency)
    parts = [
        f"use a switching regulator rated for at least {math.ceil(vin)} V input (at about "
        f"{f(efficiency * 100)} % efficiency it draws {f(drawn * 1000)} mA from the pack and "
        f"dissipates {f(switching_loss(vout, load, efficiency))} W) or a separate "
        f"{f(vout)} V supply"
    ]
    budget = linear_load_budget(vin, vout, r_th, ambient, tj_max, quiescent)
    # Whole milliamps, rounded down, and re-checked against the junction limit.
    budget_ma = math.floor(budget * 1000.0 + 1e-9)
    while budget_ma > 0:
        tj = junction_temperature(
            ambient, linear_regulator_loss(vin, vout, budget_ma / 1000.0, quiescent), r_th
        )
        if tj <= tj_max:
            break
        budget_ma -= 1
    if budget_ma > 0:
        parts.append(
            f"keep this linear regulator only for a load of at most {budget_ma} mA (now "
            f"{f(load * 1000)} mA), the rest on another supply"
        )
    else:
        parts.append("this linear regulator cannot carry any load from this pack")
    needed = math.floor(largest_thermal_resistance(power, ambient, tj_max) * 10.0) / 10.0
    if needed > 0 and junction_temperature(ambient, power, needed) <= tj_max:
        parts.append(
            f"mount it so its junction-to-air thermal resistance is at most {needed:g} K/W "
            "(a heatsink)"
        )
    return "; or ".join(parts)


RULE = Rule(
    id="logic.regulator",
    title="Logic regulator input and heat",
    check=check,
    sources=(LINEAR_LOSS, JUNCTION, DATASHEET, TRADE_PRACTICE),
    inputs=(
        "logic.regulator",
        "logic.board_current",
        "logic.loads",
        "logic.supply_voltage",
        "brake.coil_current",
        "battery",
        "usage.ambient_temperature",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
