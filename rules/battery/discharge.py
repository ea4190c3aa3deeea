"""battery.discharge: the most current the drive can draw, against what the pack delivers
continuously; with the pack's voltages, energy and air-transport class as derived figures.
"""

from __future__ import annotations

import math
from collections.abc import Iterator

from firstride_rules._shared.demand import pack_demand
from firstride_rules._shared.wording import STALL_SOURCE, small_loads
from firstride_rules.battery._cells import CELL_LIMITS
from firstride_rules.battery._cells import EPSILON as _EPSILON

from reviewer import figures
from reviewer.build import Battery, Build
from reviewer.engineering.cells import (
    air_transport_class,
    pack_continuous_current,
    pack_energy_wh,
    string_continuous_current,
    strings_needed,
)
from reviewer.findings import Assumption, Comparison, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import format_number, in_unit, quantity

STALL = STALL_SOURCE
CAPABILITY = Source.common_practice(
    "Pack continuous current = the cell's continuous current (or C-rate x capacity) x the "
    "strings in parallel"
)
IATA = Source(
    "IATA Dangerous Goods Regulations, lithium battery guidance: Wh = nominal V x Ah; up to "
    "100 Wh allowed in passenger baggage, over 100 Wh up to 160 Wh with the airline's approval, "
    "over 160 Wh forbidden"
)
BATTERY_POSITIVE = "battery-positive"


def _n(value: float) -> str:
    return format_number(value)


def _string_capability(battery: Battery) -> tuple[float | None, str]:
    """One string's continuous current in A and the basis, in words."""
    rated = battery.cell_continuous_current
    rated_a = in_unit(rated, "A") if rated is not None else None
    capacity = battery.cell_capacity
    capacity_ah = in_unit(capacity, "mAh") / 1000 if capacity is not None else None
    string_a = string_continuous_current(rated_a, battery.cell_c_rate, capacity_ah)
    by_rate = ""
    if battery.cell_c_rate is not None and capacity_ah is not None:
        by_rate = f"{_n(battery.cell_c_rate)} C x {_n(capacity_ah)} Ah"
    if rated_a is not None and by_rate:
        return string_a, f"the lower of the cells' {_n(rated_a)} A rating and {by_rate}"
    if rated_a is not None:
        return string_a, f"the cells' {_n(rated_a)} A continuous rating"
    return string_a, by_rate


def _capability_missing(battery: Battery) -> tuple[str, ...]:
    missing = ["battery.cell_continuous_current"]
    if battery.cell_c_rate is None:
        missing.append("battery.cell_c_rate")
    if battery.cell_capacity is None:
        missing.append("battery.cell_capacity")
    return tuple(missing)


def _pack_figures(battery: Battery) -> Iterator[DerivedFigure]:
    cell = figures.cell_voltages(battery)
    volts = figures.pack_voltages(battery)
    series = battery.cells_series
    yield DerivedFigure(
        "pack nominal voltage",
        quantity(volts.nominal, "V"),
        f"{series} cells in series at {_n(cell.nominal)} V",
        order=19,
    )
    yield DerivedFigure(
        "pack full voltage",
        quantity(volts.full, "V"),
        f"{series} cells in series at {_n(cell.full)} V",
        order=20,
    )
    if battery.cell_capacity is None or battery.cells_parallel is None:
        return  # with the strings unknown, one would understate the energy (and its class)
    capacity_ah = in_unit(battery.cell_capacity, "mAh") / 1000
    parallel = battery.cells_parallel
    energy = pack_energy_wh(cell.nominal, series, capacity_ah, parallel)
    yield DerivedFigure(
        "pack energy",
        quantity(energy, "Wh"),
        f"{_n(volts.nominal)} V nominal x {_n(capacity_ah)} Ah x {parallel} in parallel",
        order=17,
    )
    if battery.chemistry.is_lithium:
        yield DerivedFigure(
            "air transport class",
            air_transport_class(energy).value,
            "IATA Dangerous Goods Regulations, lithium battery guidance; for the battery only: "
            "the airline decides on the vehicle",
            order=18,
        )


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """The most current the drive can draw, against what the pack delivers continuously.

    What it checks
      Demand: with neither ``controller.battery_current_limit`` nor
      ``controller.motor_current_limit``, the stall current of every motor at once (full pack
      voltage over the cold loop: pack, wires, switch and windings; see wiring.stall-current);
      otherwise, per motor, what the controller draws from the pack while its limits hold: the
      battery limit, or the motor limit (DC-equivalent, highest reading) where it is lower or
      alone, since near full duty the pack carries the motor current (energy balance, brief
      11); a motor's stall current where lower. Plus ``logic.board_current`` (when its
      regulator is fed from the pack; counted at the pack as drawn, which errs high for a
      switching regulator) and the brake relay's ``brakes[].coil_current``.
      Capability: ``battery.cell_continuous_current``, or ``battery.cell_c_rate`` x
      ``battery.cell_capacity`` (the lower if both are given), times ``battery.cells_parallel``.

    Derived figures
      Pack nominal and full voltage (cells in series x the chemistry's cell voltages, from
      memory: Linden); pack energy Wh = nominal V x cell Ah x strings; for lithium packs the
      air-transport class (IATA: up to 100 Wh allowed, over 100 up to 160 Wh with the airline's
      approval, over 160 Wh forbidden in passenger baggage).

    Severities
      - stop: no current limit and the stall current exceeds the pack's capability by more
        than the profile's ``battery.stall_overload_stop`` ratio (2), with no fuse at the
        battery positive rated at or below the capability to end a sustained stall.
      - fix: the demand exceeds the capability otherwise.
      - pass: the demand is within the capability.
      - unassessed: no ``battery``; no ``motors``; no controller current limit nor
        every ``motors[i].winding_resistance``; no cell rating (``cell_continuous_current``, or
        ``cell_c_rate`` with ``cell_capacity``); or a logic board or brake relay present
        without its current while the motors alone are within the capability.

    The remedy names a battery current limit at or below the capability less the small loads, shared
    among the motors, the number of cells in parallel that carries the demand, and the cell
    rating that would.
    """
    battery = build.battery
    subject = "pack discharge current"
    if battery is None:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            "No battery is described, so neither its capability nor its voltage is known.",
            missing=("battery",),
            sources=(CAPABILITY,),
        )
        return
    yield from _pack_figures(battery)
    string_a, basis = _string_capability(battery)
    demand = pack_demand(build)
    aux = figures.auxiliary_current(build)
    missing = (*(_capability_missing(battery) if string_a is None else ()), *demand.missing)
    if missing or string_a is None or demand.current is None:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            "The check needs the cells' continuous rating and the motors' demand: a current "
            "limit, or the winding resistances that give the stall current.",
            missing=missing,
            sources=(CAPABILITY, STALL),
        )
        return
    parallel = battery.cells_parallel or 1
    if battery.cells_parallel is None:
        yield Assumption(
            "battery.cells_parallel not given: one string taken, the least the pack can deliver.",
            CAPABILITY,
        )
    capability = pack_continuous_current(string_a, parallel)
    total = demand.current + aux.current
    yield DerivedFigure(
        "pack continuous current", quantity(capability, "A"), f"{basis}, x {parallel}", order=15
    )
    yield DerivedFigure("peak drive current", quantity(total, "A"), demand.how, order=16)
    loads = f", plus the {small_loads(aux)}" if aux.parts else ""
    unknown = f" ({', '.join(aux.missing)} not given, not counted)" if aux.missing else ""
    strings = f"{parallel} parallel strings deliver" if parallel > 1 else "single string delivers"
    text = (
        f"The drive can draw {_n(total)} A: {demand.how}{loads}{unknown}. The pack's {strings} "
        f"{_n(capability)} A continuously ({basis} per string)."
    )
    sources = (CAPABILITY, STALL) if demand.unlimited else (CAPABILITY,)
    measured, limit = quantity(total, "A"), quantity(capability, "A")
    if total <= capability + _EPSILON:
        severity = Severity.UNASSESSED if aux.missing else Severity.PASS
        text += " Parts present draw currents the build does not give." if aux.missing else ""
        yield Finding(
            severity, subject, text, measured, limit, sources=sources, missing=aux.missing
        )
        return
    stop = profile.limit("battery.stall_overload_stop")
    ratio = float(stop.value)  # type: ignore[arg-type]
    fuse = next(
        (
            f
            for f in build.fuses
            if f.location == BATTERY_POSITIVE and in_unit(f.rating, "A") <= capability + _EPSILON
        ),
        None,
    )
    severity = Severity.FIX
    if demand.unlimited and total > ratio * capability + _EPSILON:
        if fuse is None:
            severity = Severity.STOP
            text += (
                f" That is {total / capability:.2g} x its rating with nothing to limit it, "
                f"beyond the {_n(ratio)} x the profile allows: the cells overheat."
            )
            sources = (*sources, stop.source)
        else:
            text += f" Fuse '{fuse.name}' at the battery positive ends a sustained stall."
    remedy = _discharge_remedy(build, string_a, capability, total, aux.current)
    yield Finding(severity, subject, text, measured, limit, Comparison.AT_MOST, remedy, sources)


def _discharge_remedy(
    build: Build, string_a: float, capability: float, total: float, aux: float
) -> str:
    assert build.battery is not None
    parallel = build.battery.cells_parallel or 1
    count = len(build.motors)
    parts = []
    per_motor = math.floor((capability - aux) / count + _EPSILON)
    if per_motor >= 1:
        each = " per motor" if count > 1 else ""
        parts.append(f"set controller.battery_current_limit at or below {per_motor} A{each}")
    needed = strings_needed(total, string_a)
    parts.append(f"use {needed} cells in parallel instead of {parallel}")
    parts.append(f"use cells rated at least {math.ceil(total / parallel - _EPSILON)} A continuous")
    return "; or ".join(parts)


RULE = Rule(
    id="battery.discharge",
    title="Pack continuous current against the drive's demand",
    check=check,
    sources=(CAPABILITY, STALL, IATA, CELL_LIMITS),
    inputs=(
        "battery.chemistry",
        "battery.cells_series",
        "battery.cells_parallel",
        "battery.cell_capacity",
        "battery.cell_continuous_current",
        "battery.cell_c_rate",
        "battery.cell_internal_resistance",
        "motors[].winding_resistance",
        "controller.battery_current_limit",
        "controller.motor_current_limit",
        "controller.motor_current_basis",
        "controller.drive",
        "controller.switch_on_resistance",
        "logic.board_current",
        "logic.regulator.fed_from_pack",
        "brakes[].coil_current",
        "wires[].circuit",
        "fuses[].location",
        "fuses[].rating",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
