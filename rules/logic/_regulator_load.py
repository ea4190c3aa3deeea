"""logic.regulator, part two: what a linear regulator carries (its output voltage, the rail's
load, the defaults its heat is worked out with) and the remedies for a hot one, each re-checked
against the same junction limit before it is named.
"""

from __future__ import annotations

import math
from collections.abc import Generator

from reviewer import figures
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
from reviewer.findings import Assumption
from reviewer.profile import Profile
from reviewer.units import in_unit

_in = in_unit  # skips pint's conversion for fields already in the unit asked
_MA = u.unit("mA")
_V = u.unit("V")
_DEGC = u.unit("degC")
_PERCENT = u.unit("percent")


def output_voltage(logic: Logic, regulator: Regulator) -> float | None:
    if regulator.output_voltage is not None:
        return _in(regulator.output_voltage, _V)
    if logic.supply_voltage is not None:
        return _in(logic.supply_voltage, _V)
    return None


def load_current(build: Build, logic: Logic) -> tuple[float, list[Assumption]]:
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
    coils = [b.coil_current for _, b in build.relay_brakes() if b.coil_current is not None]
    if coils:
        amps = sum(_in(coil, _MA) for coil in coils) / 1000.0
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


def heat_defaults(
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
    ambient = figures.ambient_temperature(build, _in(default.quantity, _DEGC))
    if build.usage.ambient_temperature is None:
        yield Assumption(
            f"usage.ambient_temperature not given: {u.format_number(ambient)} °C taken for the "
            "regulator.",
            default.source,
        )
    return quiescent, tj_max, ambient


def heat_remedy(
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
        f"use a switching regulator (logic.regulator.kind) rated for at least "
        f"{math.ceil(vin)} V input (logic.regulator.input_max; at about "
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
