"""ride.energy: energy use on the ride, the range it leaves, and the pack's voltage under full
power against its cut-off at each state of charge: a pack that sags to its cut-off cuts the
drive at speed, and any electric brake with it.
"""

from __future__ import annotations

import math
from collections.abc import Iterator

from firstride_rules._shared.demand import pack_demand
from firstride_rules.ride._model import Ride, ride_of

from reviewer import figures
from reviewer import units as u
from reviewer.build import Build
from reviewer.engineering.ride import RideResult
from reviewer.engineering.ride_pack import PackModel
from reviewer.findings import Comparison, DerivedFigure, Finding, Severity, Source, SourceStatus
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import in_unit

ENERGY = Source(
    "Energy use: the pack's energy over the ride (its open-circuit voltage times the current, "
    "integrated) per km; Wh/km = F_road / (3.6 x drivetrain efficiency) on the level (brief 13)",
    SourceStatus.DERIVED,
)
SAG = Source.from_memory(
    "Linden, Handbook of Batteries: terminal voltage V = OCV(state of charge) - I R_pack, "
    "R_pack = cells in series x R_cell / strings in parallel"
)
CUT_AT_SPEED = Source.common_practice(
    "A pack that sags to the controller's or BMS's cut-off stops the drive at once, at speed; "
    "every electric brake goes with it"
)
_WH_KM = u.unit("Wh/km")
_KM = u.unit("km")
_V = u.unit("V")
_PERCENT = u.unit("percent")


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """Energy per km, range and the voltage under load, per rider.

    What it checks
      On the ride of ``ride.heating`` (the build's ``route`` or the profile's reference route),
      from a full pack: the energy drawn from the cells per km (Wh/km) and the range to the
      profile's ``ride.reserve`` (usable energy = nominal pack energy x (1 - reserve) / Wh/km);
      the lowest terminal voltage on the ride. Then the pack at the drive's full battery current
      (``battery.discharge``'s demand) at every state of charge: V = OCV(s) - I R_pack against
      the cut-off (``battery.low_voltage_cutoff``, else the cells' cut-off x cells in series).

    Severities
      - stop: the pack reaches its cut-off at full power while above the reserve, or falls below
        it on the ride, and every brake is electric (the cut takes the brakes too).
      - fix: the same beside a friction or foot brake; the pack does not last the ride.
      - pass: the cut-off is reached at full power only within the reserve.
      - unassessed: the cells' capacity, internal resistance or strings in parallel missing, or
        what ``ride.heating`` lacks (named).
    """
    ride = ride_of(build, profile)
    lacking = ride.missing + ride.energy_missing
    if lacking or not ride.results or ride.pack is None:
        yield Finding(
            Severity.UNASSESSED,
            "energy and range",
            "Energy use, range and the voltage under load need the drive model, the riders and "
            "the pack's cell capacity, internal resistance and strings in parallel.",
            missing=tuple(dict.fromkeys(lacking)) or ("riders",),
            sources=(ENERGY,),
        )
        return
    pack = ride.pack
    reserve = profile.limit("ride.reserve")
    kept = in_unit(reserve.quantity, "percent") / 100.0
    assert build.battery is not None
    nominal_wh = figures.pack_voltages(build.battery).nominal * pack.capacity_ah
    independent = any(not b.kind.electric for b in build.brakes or ())
    for rider, result in zip(build.riders, ride.results, strict=True):
        yield from _rider(ride, rider.name, result, nominal_wh * (1.0 - kept), independent)
    yield from _sag(build, pack, ride, kept, independent, reserve.source)


def _rider(
    ride: Ride, name: str, result: RideResult, usable_wh: float, independent: bool
) -> Iterator[Output]:
    f = u.format_number
    wh_km = result.wh_per_km("cell")
    km = result.distance / 1000.0
    rng = usable_wh / wh_km if wh_km > 0 else math.inf
    yield DerivedFigure(
        f"energy use, rider '{name}'",
        u.quantity(wh_km, _WH_KM),
        note=f"{ride.route}, {f(km)} km, from the cells",
        order=50,
    )
    yield DerivedFigure(
        f"range to the reserve, rider '{name}'",
        u.quantity(rng, _KM) if math.isfinite(rng) else "no energy used",
        note=f"{f(usable_wh)} Wh usable at that use",
        order=51,
    )
    yield DerivedFigure(
        f"lowest pack voltage on the ride, rider '{name}'",
        u.quantity(result.min_terminal_v, _V),
        note=f"at {f(result.min_voltage_distance_m / 1000)} km, "
        f"{f(result.min_voltage_soc * 100)} % charge",
        order=52,
    )
    stop = result.stop_reason
    below = result.below_cutoff
    subject = f"energy on the ride, rider '{name}'"
    text = (
        f"Riding {ride.route} ({f(km)} km) uses {f(wh_km)} Wh/km from the cells: "
        f"{f(rng)} km to the reserve. The pack's lowest voltage under load is "
        f"{f(result.min_terminal_v)} V against its {f(result.cutoff_v)} V cut-off."
    )
    severity = Severity.PASS
    remedy = None
    if below:
        severity = Severity.FIX if independent else Severity.STOP
        text += (
            f" It falls below the cut-off {f(result.first_below_cutoff_m / 1000)} km in: "
            "the drive cuts at speed."
        )
        remedy = "lower controller.battery_current_limit or add strings in parallel"
    elif stop is not None and ("empty" in stop or "deliver" in stop or "power" in stop):
        severity = Severity.FIX if independent else Severity.STOP
        text += f" The ride ends early: {stop}."
        remedy = "a larger pack (more strings in parallel) or a shorter ride"
    yield Finding(
        severity,
        subject,
        text,
        measured=u.quantity(result.min_terminal_v, _V),
        limit=u.quantity(result.cutoff_v, _V),
        comparison=Comparison.AT_LEAST,
        remedy=remedy,
        sources=(ENERGY, SAG) + ((CUT_AT_SPEED,) if severity is not Severity.PASS else ()),
    )


def _sag(
    build: Build,
    pack: PackModel,
    ride: Ride,
    kept: float,
    independent: bool,
    reserve_source: Source,
) -> Iterator[Output]:
    f = u.format_number
    subject = "pack voltage at full power"
    demand = pack_demand(build)
    if demand.current is None:
        yield Finding(
            Severity.UNASSESSED,
            subject,
            "The drive's full battery current is not known.",
            missing=demand.missing,
            sources=(SAG,),
        )
        return
    amps = demand.current
    cutoff = ride.results[0].cutoff_v

    # The state of charge below which full power takes the pack to its cut-off (bisection:
    # the open-circuit voltage rises with the state of charge).
    def sags(state: float) -> bool:
        return pack.terminal_voltage(amps, state) < cutoff

    if sags(1.0):
        at = 1.0
    elif not sags(1e-9):
        at = 0.0
    else:
        low, high = 1e-9, 1.0
        for _ in range(60):
            middle = 0.5 * (low + high)
            low, high = (middle, high) if sags(middle) else (low, middle)
        at = high
    yield DerivedFigure(
        "state of charge at which full power reaches the cut-off",
        u.quantity(at * 100, _PERCENT),
        note=f"{f(amps)} A ({demand.how}) through {f(pack.resistance)} ohm",
        order=53,
    )
    text = (
        f"At full power the drive draws {f(amps)} A ({demand.how}); through the pack's "
        f"{f(pack.resistance)} ohm the terminals reach the {f(cutoff)} V cut-off below "
        f"{f(at * 100)} % charge, against a reserve of {f(kept * 100)} %."
    )
    over = at > kept
    severity = Severity.PASS
    if over:
        severity = Severity.FIX if independent else Severity.STOP
        text += " Above the reserve the drive cuts out under full power, at speed."
    yield Finding(
        severity,
        subject,
        text,
        measured=u.quantity(at * 100, _PERCENT),
        limit=u.quantity(kept * 100, _PERCENT),
        comparison=Comparison.AT_MOST,
        remedy="lower controller.battery_current_limit, add strings in parallel or use "
        "cells of lower internal resistance"
        if over
        else None,
        sources=(SAG, reserve_source) + ((CUT_AT_SPEED,) if over else ()),
    )


RULE = Rule(
    id="ride.energy",
    title="Energy, range and the pack's voltage under load",
    check=check,
    sources=(ENERGY, SAG, CUT_AT_SPEED),
    inputs=(
        "route",
        "riders",
        "battery",
        "battery.cell_capacity",
        "battery.cell_internal_resistance",
        "battery.low_voltage_cutoff",
        "motors",
        "drivetrain",
        "controller",
        "brakes",
    ),
    severities=(Severity.STOP, Severity.FIX, Severity.PASS, Severity.UNASSESSED),
)
