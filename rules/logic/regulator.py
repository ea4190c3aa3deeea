"""logic.regulator: the regulator that feeds the logic board from the traction pack.

A linear regulator burns the whole voltage it drops at the full load current. From a pack of
many cells, a board with a sensor, a radio and a relay coil heats it past its junction limit;
it then shuts down or fails mid-ride, and whatever the logic controls (throttle, brake relay)
goes with it. A switching regulator or a separate 5 V supply avoids that (common practice).
"""

from __future__ import annotations

from collections.abc import Generator, Iterator
from dataclasses import dataclass

from firstride_rules._shared import voltage_rating as ratings
from firstride_rules.logic._regulator_load import (
    heat_defaults,
    heat_remedy,
    load_current,
    output_voltage,
)

from reviewer import figures
from reviewer import units as u
from reviewer.build import Build, Logic, Regulator
from reviewer.engineering.regulator import (
    junction_temperature,
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
from reviewer.units import in_unit

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

_in = in_unit  # skips pint's conversion for fields already in the unit asked
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
    rating: ratings.VoltageRating  # its input maximum against that voltage
    low_input: float  # V, the pack's cut-off (where a switcher draws most)


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """The logic regulator's input voltage and, for a linear one, its junction temperature.

    What it checks
      The regulator in ``logic.regulator`` (``kind`` linear or switching). Fed from the pack
      (``fed_from_pack``, the default), it sees the pack's full voltage (cells in series times
      the chemistry's full cell voltage), or ``battery.charger_voltage`` if that is higher,
      since the logic may be powered while charging.

      1. Input: that voltage against ``logic.regulator.input_max``, judged by
         ``regulator_input_rating`` (``firstride_rules._shared.voltage_rating``), the
         judgement voltage.ratings makes of the same input, so the two agree on the figure,
         the severity and the words.
      2. Heat (linear only): the load is ``logic.board_current`` (microcontroller, sensors,
         radio) plus every ``logic.loads[].current`` (all taken on the regulated rail at once)
         plus the brake relay's coil (``brakes[].coil_current``) unless a logic load that is
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
    if logic is not None and not logic.present:
        yield Finding(
            Severity.PASS,
            "logic supply",
            "The build states there is no separate logic board (logic.present = false): there "
            "is no logic regulator to check; the controller's own electronics are judged by the "
            "controller and voltage rules.",
        )
        return
    if logic is None:
        yield Finding(
            Severity.UNASSESSED,
            "logic supply",
            "The build does not describe its logic board, nor say it has none, so its regulator "
            "could not be checked (set logic.present = false when there is no separate board).",
            missing=("logic",),
            sources=(LINEAR_LOSS,),
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
        yield _input_finding(supply, estimate)
    else:
        yield _input_finding(supply)
        yield from _linear(build, logic, regulator, supply, profile)


def _supply(build: Build, regulator: Regulator) -> _Supply | Finding:
    if not regulator.fed_from_pack and regulator.input_voltage is not None:
        volts = in_unit(regulator.input_voltage, "V")
        rated = regulator.input_max
        rating = ratings.VoltageRating(
            "logic.regulator.input_max",
            None if rated is None else in_unit(rated, "V"),
            volts,
            volts,
            "the separate supply it is fed from",
            f"use a regulator rated for at least {u.format_number(volts)} V input",
        )
        return _Supply(volts, rating, volts)
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
    rating = ratings.regulator_input_rating(build)
    assert rating is not None  # fed from the pack, which is described
    return _Supply(rating.sees, rating, figures.pack_voltages(build.battery).cutoff)


def _input_finding(supply: _Supply, estimate: str = "") -> Finding:
    """The input maximum, judged as voltage.ratings judges it (one function, one severity)."""
    rating = supply.rating
    sources = (DATASHEET,) if rating.severity is not Severity.STOP else (DATASHEET, OVERVOLTAGE)
    return rating.finding("regulator input", sources, estimate)


def _switching(
    build: Build, logic: Logic, regulator: Regulator, supply: _Supply, profile: Profile
) -> Generator[Output, None, str]:
    """Figures for a switching regulator; returns a sentence with its input current."""
    efficiency_limit = profile.limit("logic.regulator.switching_efficiency")
    efficiency = _in(efficiency_limit.quantity, _PERCENT) / 100.0
    vout = output_voltage(logic, regulator)
    if logic.board_current is None or vout is None:
        return (
            " Its input current is not estimated: the logic board's current or output "
            "voltage is not given."
        )
    load, notes = load_current(build, logic)
    yield from notes
    low = max(supply.low_input, vout)
    current = switching_input_current(low, vout, load, efficiency)
    yield DerivedFigure(
        "logic regulator input current",
        u.quantity(current * 1000.0, _MA),
        note=(
            f"switching, {u.format_number(efficiency * 100)} % efficient assumed, "
            f"{u.format_number(load * 1000)} mA at {u.format_number(vout)} V, "
            f"from {u.format_number(low)} V (pack cut-off)"
        ),
        order=81,
    )
    yield DerivedFigure(
        "logic regulator dissipation",
        u.quantity(switching_loss(vout, load, efficiency), _W),
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
    vout = output_voltage(logic, regulator)
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
    load, notes = load_current(build, logic)
    yield from notes
    quiescent, tj_max, ambient = yield from heat_defaults(build, regulator, profile)
    r_th = _in(regulator.thermal_resistance, _KW)
    subject = "regulator heat"
    yield DerivedFigure("logic rail current", u.quantity(load * 1000.0, _MA), order=80)
    if vin <= vout:
        yield Finding(
            Severity.FIX,
            subject,
            f"The pack's {f(vin)} V is not above the {f(vout)} V output, so a linear "
            "regulator cannot hold its output.",
            measured=u.quantity(vin, _V),
            limit=u.quantity(vout, _V),
            comparison=Comparison.AT_LEAST,
            remedy=f"use a boost or buck-boost switching regulator for the {f(vout)} V rail",
            sources=(LINEAR_LOSS,),
        )
        return
    power = linear_regulator_loss(vin, vout, load, quiescent)
    junction = junction_temperature(ambient, power, r_th)
    yield DerivedFigure(
        "logic regulator dissipation",
        u.quantity(power, _W),
        note=f"linear: ({f(vin)} V - {f(vout)} V) x {f(load * 1000)} mA + {f(vin)} V x "
        f"{f(quiescent * 1000)} mA",
        order=82,
    )
    yield DerivedFigure(
        "logic regulator junction temperature",
        u.quantity(junction, _DEGC),
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
        measured=u.quantity(junction, _DEGC),
        limit=u.quantity(tj_max, _DEGC),
        comparison=Comparison.AT_MOST,
        remedy=heat_remedy(profile, vin, vout, load, quiescent, r_th, ambient, tj_max, power)
        if hot
        else None,
        sources=(LINEAR_LOSS, JUNCTION, DATASHEET, TRADE_PRACTICE)
        if hot
        else (LINEAR_LOSS, JUNCTION, DATASHEET),
    )


RULE = Rule(
    id="logic.regulator",
    title="Logic regulator input and heat",
    check=check,
    sources=(LINEAR_LOSS, JUNCTION, DATASHEET, TRADE_PRACTICE),
    inputs=(
        "logic.present",
        "logic.regulator",
        "logic.board_current",
        "logic.loads",
        "logic.supply_voltage",
        "brakes[].coil_current",
        "battery",
        "usage.ambient_temperature",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
