"""Voltage ratings judged once, for every rule that checks the same part.

voltage.ratings checks every part the pack reaches; a part's own rule (the freewheel diode's, the
fuse's, the regulator's) checks the same rating again. Both build their finding from one judgement
here, so they cannot disagree on the figure, the severity or the words.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import pint

from reviewer.build import Build
from reviewer.engineering.fuses import blade_fuse_voltage
from reviewer.figures import pack_voltages
from reviewer.findings import Comparison, Finding, Severity, Source
from reviewer.profile import Profile
from reviewer.units import format_number, in_unit, quantity

_VOLTAGE_TOLERANCE = 1e-9  # V: a rating equal to its requirement must not fail on float noise


def whole_volts_up(value: float) -> str:
    """A voltage to ask for, rounded up to a whole volt so the remedy itself passes."""
    return f"{math.ceil(value - 1e-6):d} V"


@dataclass(frozen=True)
class VoltageRating:
    """A part's voltage rating against the most voltage it sees.

    voltage.ratings checks every part the pack reaches; a part's own rule (the freewheel
    diode's, the fuse's, the regulator's) checks the same rating again. Both build their
    finding from this one judgement, so they cannot disagree on the figure, the severity or the
    words: stop below what the part sees (it fails at the first full charge), fix below that
    times the margin (spikes and ringing ride on top), pass at or above the margin, and
    unassessed while the rating is not given.
    """

    field: str  # the build path of the rating
    rated: float | None  # V, None when the build does not give it
    sees: float  # V: the most the part sees
    required: float  # V: ``sees`` times the margin (equal to it with no margin)
    basis: str  # how ``required`` is formed, in words
    remedy: str  # what to fit, with a rating that passes when re-checked
    margin_source: Source | None = None

    @property
    def severity(self) -> Severity:
        if self.rated is None:
            return Severity.UNASSESSED
        if self.rated < self.sees - _VOLTAGE_TOLERANCE:
            return Severity.STOP
        if self.rated < self.required - _VOLTAGE_TOLERANCE:
            return Severity.FIX
        return Severity.PASS

    @property
    def rationale(self) -> str:
        n = format_number
        need = f"it needs at least {n(self.required)} V ({self.basis})"
        if self.rated is None:
            return f"Its voltage rating is not given; {need}."
        severity, tail = self.severity, ""
        if severity is Severity.STOP:
            tail = f", below the {n(self.sees)} V it sees at full charge"
        elif severity is Severity.FIX:
            tail = ", above the voltage it sees but short of the margin"
        return f"Rated {n(self.rated)} V{tail}; {need}."

    def finding(self, subject: str, sources: tuple[Source, ...], note: str = "") -> Finding:
        """The finding on this rating; ``note`` is a sentence the rule adds after the judgement."""
        severity = self.severity
        if severity is Severity.UNASSESSED:
            return Finding(
                severity, subject, self.rationale + note, missing=(self.field,), sources=sources
            )
        assert self.rated is not None
        return Finding(
            severity,
            subject,
            self.rationale + note,
            quantity(self.rated, "V"),
            quantity(self.required, "V"),
            Comparison.AT_LEAST,
            None if severity is Severity.PASS else self.remedy,
            sources,
        )


def _volts(amount: pint.Quantity | None) -> float | None:
    return None if amount is None else in_unit(amount, "V")


def diode_reverse_rating(build: Build, profile: Profile) -> VoltageRating | None:
    """The freewheel diode's reverse voltage: it blocks the full pack while the switch conducts,
    with the profile's ``voltage.diode_margin`` over it for turn-off ringing. None without a
    battery (the voltage it sees is then unknown)."""
    if build.battery is None:
        return None
    full = pack_voltages(build.battery).full
    limit = profile.limit("voltage.diode_margin")
    margin = float(limit.value)  # type: ignore[arg-type]
    rated = None if build.controller is None else _volts(build.controller.diode_reverse_voltage)
    n = format_number
    return VoltageRating(
        "controller.diode_reverse_voltage",
        rated,
        full,
        full * margin,
        f"{n(margin)} x the {n(full)} V full pack it blocks while the switch conducts, for "
        "turn-off ringing",
        f"use a diode with a reverse rating of at least {whole_volts_up(full * margin)}",
        limit.source,
    )


def fuse_voltage_rating(build: Build, index: int) -> VoltageRating | None:
    """Fuse ``index``'s DC voltage rating against the full pack: a fuse interrupts only at or
    below its rated voltage (ISO 8820-3). None without a battery."""
    if build.battery is None:
        return None
    full = pack_voltages(build.battery).full
    n = format_number
    remedy = f"use a fuse rated at least {n(full)} V DC"
    blade = blade_fuse_voltage(full)
    if blade is not None:
        remedy += f" (a {n(blade)} V ISO 8820-3 blade fuse qualifies)"
    return VoltageRating(
        f"fuses[{index}].voltage_rating",
        _volts(build.fuses[index].voltage_rating),
        full,
        full,
        f"the {n(full)} V full pack, DC: a fuse interrupts only at or below its rated voltage",
        remedy,
    )


def regulator_input_rating(build: Build) -> VoltageRating | None:
    """The logic regulator's maximum input against what the pack feeds it: the full pack, or
    the charger's voltage where that is higher, since the logic may run while charging. None
    where there is no regulator, it is not fed from the pack, or there is no battery."""
    logic, battery = build.logic, build.battery
    regulator = logic.regulator if logic is not None else None
    if regulator is None or not regulator.fed_from_pack or battery is None:
        return None
    n = format_number
    full = pack_voltages(battery).full
    sees, basis = full, f"the {n(full)} V full pack"
    charger = _volts(battery.charger_voltage)
    if charger is not None and charger > full:
        sees = charger
        basis = (
            f"the {n(charger)} V charger, above the {n(full)} V full pack: the logic may run "
            "while charging"
        )
    return VoltageRating(
        "logic.regulator.input_max",
        _volts(regulator.input_max),
        sees,
        sees,
        basis,
        f"use a regulator rated for at least {whole_volts_up(sees)} input",
    )
