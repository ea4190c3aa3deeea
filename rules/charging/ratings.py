"""charging.ratings: the charger against the pack: its voltage against full charge, its current
against the cells and the BMS, the charge port's ratings, and charging in the cold.
"""

from __future__ import annotations

from collections.abc import Iterator

from firstride_rules.battery._cells import CELL_LIMITS
from firstride_rules.battery._cells import EPSILON as _EPSILON

from reviewer import figures
from reviewer import units as u
from reviewer.build import Battery, Build
from reviewer.engineering.cells import CellVoltages
from reviewer.findings import Comparison, Finding, Severity, Source, SourceStatus
from reviewer.profile import Profile
from reviewer.rule import Output, Rule
from reviewer.units import format_number, in_unit, quantity

COLD = Source.from_memory(
    "Lithium cell datasheets: charge between 0 degC and 45 degC; charging below 0 degC plates "
    "lithium metal on the anode, which can later short the cell"
)
RATINGS = Source(
    "The charger's label and the charge port's and cells' datasheet ratings, as entered in the "
    "build",
    SourceStatus.USER,
)
_CHEMISTRY = {"li-ion": "Li-ion", "lipo": "LiPo", "lifepo4": "LiFePO4", "nimh": "NiMH"}


def _n(value: float) -> str:
    return format_number(value)


def _chemistry(battery: Battery) -> str:
    return _CHEMISTRY.get(battery.chemistry.value, battery.chemistry.value)


def check(build: Build, profile: Profile) -> Iterator[Output]:
    """The charger's voltage and current, the charge port, and charging below freezing.

    What it checks (lithium chemistries: li-ion, lipo, lifepo4; others are charged on other
    principles, which the rule says)
      1. Charger voltage (``battery.charger_voltage``) against the full pack voltage (4.2 V
         per cell for Li-ion and LiPo, 3.65 V for LiFePO4), within the profile's
         ``battery.charger_tolerance_per_cell`` x cells in series.
      2. Charger current (``charger.current``) per string (``battery.cells_parallel``)
         against ``battery.cell_max_charge_current``.
      3. The charge port (``charger.port_current_rating``, ``port_voltage_rating``) against
         the charger's current and voltage.
      4. Charging below 0 degC: a caution unless ``battery.bms.low_temperature_charge_cutoff``.

    Severities
      - stop: a charger above full voltage plus the tolerance (overcharge).
      - fix: charger current above the cells' charge rating; a port rated below the charger.
      - advise: a charger below full voltage minus the tolerance (undercharge); no cut-off
        against charging below 0 degC.
      - pass: within each limit; not a lithium pack.
      - unassessed: each rating or figure not given (named).
    """
    battery = build.battery
    if battery is None:
        yield Finding(
            Severity.UNASSESSED,
            "charging",
            "No battery is described.",
            missing=("battery",),
            sources=(CELL_LIMITS,),
        )
        return
    if not battery.chemistry.is_lithium:
        yield Finding(
            Severity.PASS,
            "charging",
            f"The pack is {_chemistry(battery)}, not lithium: the checks here are for lithium "
            "cells only, and nothing more applies.",
            sources=(CELL_LIMITS,),
        )
        return
    cell = figures.cell_voltages(battery)
    yield _voltage(battery, cell, profile)
    yield _cell_current(build, battery)
    yield from _port(build, battery)
    yield _cold(battery)


def _voltage(battery: Battery, cell: CellVoltages, profile: Profile) -> Finding:
    subject = "charger voltage"
    series = battery.cells_series
    full = cell.full * series
    if battery.charger_voltage is None:
        return Finding(
            Severity.UNASSESSED,
            subject,
            f"The charger's voltage is not given, so it cannot be checked against the pack's "
            f"{_n(full)} V full charge.",
            missing=("battery.charger_voltage",),
            sources=(CELL_LIMITS,),
        )
    tolerance = profile.limit("battery.charger_tolerance_per_cell")
    band = in_unit(tolerance.quantity, "V") * series
    volts = in_unit(battery.charger_voltage, "V")
    text = (
        f"The charger ends at {_n(volts)} V, {_n(volts / series)} V per cell; a full "
        f"{_chemistry(battery)} cell is {_n(cell.full)} V ({_n(full)} V for {series} in "
        f"series, within {_n(band)} V)."
    )
    severity, bound, comparison = Severity.PASS, full + band, Comparison.AT_MOST
    if volts > full + band + _EPSILON:
        severity = Severity.STOP
        text += " It overcharges every cell, which can set a lithium cell on fire."
    elif volts < full - band - _EPSILON:
        severity, bound, comparison = Severity.ADVISE, full - band, Comparison.AT_LEAST
        text += " The pack never charges fully, which costs range but is not a hazard."
    remedy = (
        f"use a {_n(full)} V charger ({series} x {_n(cell.full)} V) and set "
        "battery.charger_voltage to it"
    )
    return Finding(
        severity,
        subject,
        text,
        quantity(volts, "V"),
        quantity(bound, "V"),
        comparison,
        None if severity is Severity.PASS else remedy,
        (CELL_LIMITS, tolerance.source),
    )


def _cell_current(build: Build, battery: Battery) -> Finding:
    subject = "charger current into the cells"
    amps = None
    if build.charger is not None and build.charger.current is not None:
        amps = in_unit(build.charger.current, "A")
    missing = [
        name
        for name, value in (
            ("charger.current", amps),
            ("battery.cell_max_charge_current", battery.cell_max_charge_current),
            ("battery.cells_parallel", battery.cells_parallel),
        )
        if value is None
    ]
    if missing:
        return Finding(
            Severity.UNASSESSED,
            subject,
            "The charger's current, the cells' charge rating or the strings in parallel are "
            "not given.",
            missing=tuple(missing),
            sources=(RATINGS,),
        )
    assert amps is not None and battery.cell_max_charge_current is not None
    strings = battery.cells_parallel or 1
    each = amps / strings
    rating = in_unit(battery.cell_max_charge_current, "A")
    over = each > rating + _EPSILON
    return Finding(
        Severity.FIX if over else Severity.PASS,
        subject,
        f"The charger drives {_n(amps)} A, {_n(each)} A into each of {strings} string(s), "
        f"against the cells' {_n(rating)} A charge rating.",
        measured=quantity(each, "A"),
        limit=quantity(rating, "A"),
        comparison=Comparison.AT_MOST,
        remedy=f"use a charger of at most {_n(rating * strings)} A (charger.current)"
        if over
        else None,
        sources=(RATINGS,),
    )


def _port(build: Build, battery: Battery) -> Iterator[Finding]:
    charger = build.charger
    amps = in_unit(charger.current, "A") if charger and charger.current is not None else None
    volts = (
        in_unit(battery.charger_voltage, "V")
        if battery.charger_voltage is not None
        else figures.pack_voltages(battery).full
    )
    for subject, rating, needed, unit, field, need_field in (
        (
            "charge port current rating",
            charger.port_current_rating if charger else None,
            amps,
            "A",
            "charger.port_current_rating",
            "charger.current",
        ),
        (
            "charge port voltage rating",
            charger.port_voltage_rating if charger else None,
            volts,
            "V",
            "charger.port_voltage_rating",
            "",
        ),
    ):
        if rating is None or needed is None:
            missing = tuple(n for n, v in ((field, rating), (need_field, needed)) if v is None)
            yield Finding(
                Severity.UNASSESSED,
                subject,
                "The charge port's rating or what it carries is not given.",
                missing=missing,
                sources=(RATINGS,),
            )
            continue
        limit = in_unit(rating, unit)
        over = needed > limit + _EPSILON
        what = "the charger's current" if unit == "A" else "the charging voltage"
        yield Finding(
            Severity.FIX if over else Severity.PASS,
            subject,
            f"The charge port is rated {_n(limit)} {unit} against {what}, {_n(needed)} {unit}.",
            measured=u.quantity(needed, u.unit(unit)),
            limit=u.quantity(limit, u.unit(unit)),
            comparison=Comparison.AT_MOST,
            remedy=f"fit a charge port rated at least {_n(needed)} {unit} DC" if over else None,
            sources=(RATINGS,),
        )


def _cold(battery: Battery) -> Finding:
    subject = "charging below 0 °C"
    bms = battery.bms
    if bms is not None and bms.fitted and bms.low_temperature_charge_cutoff:
        return Finding(
            Severity.PASS,
            subject,
            "The BMS refuses charge below 0 °C.",
            sources=(COLD,),
        )
    return Finding(
        Severity.ADVISE,
        subject,
        "Nothing stops the lithium pack being charged below 0 °C (no BMS low-temperature "
        "charge cut-off is stated): charged cold, its cells plate lithium and can later short.",
        measured="no cut-off",
        limit="no charge below 0 °C",
        remedy="charge indoors above 0 °C, or fit a BMS with a low-temperature charge cut-off "
        "and set battery.bms.low_temperature_charge_cutoff = true",
        sources=(COLD,),
    )


RULE = Rule(
    id="charging.ratings",
    title="Charger voltage and current, charge port and cold charging",
    check=check,
    sources=(CELL_LIMITS, RATINGS, COLD),
    inputs=(
        "battery.chemistry",
        "battery.cells_series",
        "battery.cells_parallel",
        "battery.charger_voltage",
        "battery.cell_max_charge_current",
        "battery.bms.low_temperature_charge_cutoff",
        "charger",
    ),
    severities=(
        Severity.STOP,
        Severity.FIX,
        Severity.ADVISE,
        Severity.PASS,
        Severity.UNASSESSED,
    ),
)
