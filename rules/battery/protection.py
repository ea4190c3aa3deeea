"""battery.protection: what keeps a lithium pack from being charged or drained past its
cells' limits: a management system and a low-voltage cut-off (the charger is
``charging.ratings``'s).
"""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules.battery._cells import CELL_LIMITS
from firstride_rules.battery._cells import EPSILON as _EPSILON

from reviewer import figures
from reviewer.build import Battery, Build
from reviewer.engineering.cells import CellVoltages
from reviewer.findings import Comparison, DerivedFigure, Finding, Severity, Source
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import format_number, in_unit, quantity

CELL_PROTECTION = Source.from_memory(
    "UL 2272 and UL 2849 evaluate a personal e-mobility battery's protection against "
    "overcharge, over-discharge and short circuit"
)


def _n(value: float) -> str:
    return format_number(value)


_CHEMISTRY = {"li-ion": "Li-ion", "lipo": "LiPo", "lifepo4": "LiFePO4", "nimh": "NiMH"}


def _chemistry(battery: Battery) -> str:
    return _CHEMISTRY.get(battery.chemistry.value, battery.chemistry.value)


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """A lithium pack's management system and low-voltage cut-off.

    What it checks (lithium chemistries: li-ion, lipo, lifepo4)
      1. Battery management system (``battery.bms``): a series pack's voltage hides one cell
         drifting from the rest, so over-charge and over-discharge must be caught per cell.
      2. Low-voltage cut-off: a BMS counts as one; otherwise ``battery.low_voltage_cutoff`` must
         be at or above the chemistry's cut-off x ``battery.cells_series`` (Li-ion and LiPo
         3.0 V, LiFePO4 2.5 V per cell; from memory: Linden, Handbook of Batteries).
      The charger's voltage is ``charging.ratings``'s.
      Other chemistries are charged and cut off on other principles (constant-current
      termination, float voltages): the rule says so and passes.

    Severities
      - stop: no BMS (``bms.fitted`` false); a cut-off set below the cells' damage floor
        (Li-ion and LiPo 2.5 V, LiFePO4 2.0 V per cell).
      - fix: a cut-off between the floor and the chemistry's cut-off.
      - advise: with a BMS, a controller cut-off set below the cells' cut-off (the BMS then
        cuts power abruptly before the controller's cut-off acts).
      - pass: within each limit; or not a lithium pack.
      - unassessed: no ``battery``; ``battery.bms`` not stated; no BMS and no
        ``battery.low_voltage_cutoff``.

    Remedies give voltages: "set the cut-off at or above 21 V (7 x 3.0 V)".
    """
    battery = build.battery
    if battery is None:
        yield Finding(
            Severity.UNASSESSED,
            "lithium pack protection",
            "No battery is described.",
            missing=("battery",),
            sources=(CELL_LIMITS,),
        )
        return
    if not battery.chemistry.is_lithium:
        yield Finding(
            Severity.PASS,
            "lithium pack protection",
            f"The pack is {_chemistry(battery)}, not lithium: the management-system, "
            "cut-off checks here are for lithium cells only, and nothing "
            "more applies.",
            sources=(CELL_LIMITS,),
        )
        return
    cell = figures.cell_voltages(battery)
    series = battery.cells_series
    yield DerivedFigure(
        "pack cut-off voltage",
        quantity(cell.cutoff * series, "V"),
        f"{series} cells in series at {_n(cell.cutoff)} V",
        order=21,
    )
    yield _bms_finding(battery)
    yield _cutoff_finding(battery, cell)


def _bms_finding(battery: Battery) -> Finding:
    subject = "battery management system"
    series = battery.cells_series
    if battery.bms is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            "The build does not say whether the lithium pack has a battery management system.",
            missing=("battery.bms",),
            sources=(CELL_PROTECTION,),
        )
    if battery.bms.fitted:
        return Finding(
            Severity.PASS,
            subject,
            f"The {series}-cell lithium pack has a battery management system guarding each cell.",
            sources=(CELL_PROTECTION,),
        )
    return Finding(
        Severity.STOP,
        subject,
        f"The {series}-cell lithium pack has no battery management system: nothing stops one "
        "cell being overcharged or drained while the pack voltage looks normal, and an abused "
        "lithium cell can catch fire.",
        remedy=f"fit a {series}S {_chemistry(battery)} battery management system "
        "(per-cell over-charge and over-discharge cut-off, over-current cut-off), then "
        "describe it as battery.bms",
        sources=(CELL_PROTECTION, CELL_LIMITS),
    )


def _has_bms(battery: Battery) -> bool:
    return battery.bms is not None and battery.bms.fitted


def _cutoff_finding(battery: Battery, cell: CellVoltages) -> Finding:
    subject = "low-voltage cut-off"
    series = battery.cells_series
    required = cell.cutoff * series
    floor = cell.floor * series
    remedy = (
        f"set battery.low_voltage_cutoff at or above {_n(required)} V "
        f"({series} x {_n(cell.cutoff)} V)"
    )
    setting = battery.low_voltage_cutoff
    if setting is None:
        if _has_bms(battery):
            return Finding(
                Severity.PASS,
                subject,
                f"The battery management system disconnects the pack before a cell falls below "
                f"its cut-off ({_n(cell.cutoff)} V per cell, {_n(required)} V for the pack); no "
                "battery.low_voltage_cutoff is given, so the BMS's is the one relied on.",
                sources=(CELL_LIMITS,),
            )
        return Finding(
            Severity.UNASSESSED,
            subject,
            "With no battery management system stated, the pack's cut-off must be set in the "
            "controller, and the build gives none.",
            missing=("battery.low_voltage_cutoff",),
            sources=(CELL_LIMITS,),
        )
    volts = in_unit(setting, "V")
    text = (
        f"The cut-off is set at {_n(volts)} V, {_n(volts / series)} V per cell; "
        f"{_chemistry(battery)} cells stop at {_n(cell.cutoff)} V ({_n(required)} V for "
        f"{series} in series) and are damaged below {_n(cell.floor)} V."
    )
    measured, limit = quantity(volts, "V"), quantity(required, "V")
    if volts >= required - _EPSILON:
        severity = Severity.PASS
    elif _has_bms(battery):
        severity = Severity.ADVISE
        text += " The BMS will cut power abruptly before this cut-off acts."
    elif volts < floor - _EPSILON:
        severity = Severity.STOP
        text += " The cells are drained into damage; a damaged lithium cell can fail on recharge."
    else:
        severity = Severity.FIX
    return Finding(
        severity,
        subject,
        text,
        measured,
        limit,
        Comparison.AT_LEAST,
        None if severity is Severity.PASS else remedy,
        (CELL_LIMITS,),
    )


RULE = Rule(
    id="battery.protection",
    title="Lithium pack management system and cut-off",
    check=check,
    sources=(CELL_LIMITS, CELL_PROTECTION),
    inputs=(
        "battery.chemistry",
        "battery.cells_series",
        "battery.bms",
        "battery.low_voltage_cutoff",
    ),
    severities=(
        Severity.STOP,
        Severity.FIX,
        Severity.ADVISE,
        Severity.PASS,
        Severity.UNASSESSED,
    ),
)
