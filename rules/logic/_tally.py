"""logic.pin-current's arithmetic: per-pin tallies, grades and the numbers its wording uses."""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from reviewer.build import Logic, PinLoad
from reviewer.engineering.pins import even_share, worst_pin_current
from reviewer.findings import Severity
from reviewer.profile import Limit
from reviewer.units import format_number


@dataclass
class Tally:
    """Current on one pin: worst case (with imbalance), even share, and the loads on it."""

    worst: float = 0.0
    even: float = 0.0
    loads: list[str] = field(default_factory=list)


def number(limit: Limit) -> float:
    value = limit.value
    if isinstance(value, bool | str):
        raise TypeError(f"profile limit {limit.key} must be a number")
    if isinstance(value, float | int):
        return float(value)
    return float(value.m_as("dimensionless"))


def ma(value: float) -> str:
    return f"{format_number(value)} mA"


def over_by(measured: float, allowed: float) -> int:
    """Whole milliamps to move so the measured current comes within the allowed one."""
    return max(1, math.ceil(round(measured - allowed, 6)))


def quoted(loads: list[str]) -> str:
    return ", ".join(f"'{name}'" for name in loads)


def pins_of(load: PinLoad) -> list[str]:
    return list(dict.fromkeys(load.pins))  # a pin named twice is still one pin


def pin_tallies(logic: Logic, drawn: dict[str, float], imbalance: float) -> dict[str, Tally]:
    tallies: dict[str, Tally] = {}
    for load in logic.loads:
        pins = pins_of(load)
        worst = worst_pin_current(drawn[load.name], len(pins), imbalance)
        share = even_share(drawn[load.name], len(pins))
        for pin in pins:
            tally = tallies.setdefault(pin, Tally())
            tally.worst += worst
            tally.even += share
            tally.loads.append(load.name)
    return tallies


def grade(measured: float, maximum: float, allowed: float) -> Severity:
    if measured > maximum:
        return Severity.STOP
    if measured > allowed:
        return Severity.FIX
    return Severity.PASS


def diode_words(load: PinLoad) -> str:
    """How the load's flyback diode reads in a rationale."""
    if load.inductive is None:
        return "; whether it is inductive is not stated, and its flyback diode covers either case"
    return "; flyback diode fitted" if load.inductive else ""


def driver_words(load: PinLoad) -> str:
    """What drives the load, as a rationale says it."""
    return {
        "pin": "logic pins directly",
        "transistor": "a transistor",
        "mosfet": "a MOSFET",
        "driver-ic": "a driver IC",
    }[load.driver]
