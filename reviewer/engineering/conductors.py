"""Copper conductors: AWG geometry (ASTM B258), resistance (IEC 60028), short-circuit withstand
(IEC 60364-4-43 clause 434.5.2 / IEC 60364-5-54 Annex A) and tabulated ampacity."""

from __future__ import annotations

import math
import re

# IEC 60028: annealed copper, 100 % IACS, resistivity at 20 degC in ohm mm^2 / m.
COPPER_RESISTIVITY_20C = 1 / 58
# Inferred zero-resistance temperature of copper: R2/R1 = (234.5 + T2) / (234.5 + T1).
COPPER_INFERRED_ZERO = 234.5

_AWG_RE = re.compile(r"^\s*(?P<n>\d{1,2})(?:/0)?\s*(?:AWG)?\s*$", re.IGNORECASE)


def parse_awg(text: str) -> int:
    """'12 AWG' -> 12; '2/0 AWG' -> -1 (n/0 sizes map to n = 1 - m, ASTM B258)."""
    match = _AWG_RE.match(text)
    if match is None:
        raise ValueError(f"{text!r} is not an AWG size; expected e.g. '12 AWG' or '2/0 AWG'")
    n = int(match["n"])
    if "/0" in text:
        if not 1 <= n <= 4:
            raise ValueError(f"{text!r}: n/0 sizes run from 1/0 to 4/0")
        return 1 - n
    if not 0 <= n <= 40:
        raise ValueError(f"{text!r}: AWG sizes run from 4/0 to 40")
    return n


def awg_label(n: int) -> str:
    return f"{1 - n}/0 AWG" if n <= 0 and n != 0 else f"{n} AWG" if n > 0 else "1/0 AWG"


def awg_diameter_mm(n: int) -> float:
    """ASTM B258: d = 0.127 mm x 92^((36 - n) / 39)."""
    return 0.127 * 92 ** ((36 - n) / 39)


def awg_area(gauge: str | int) -> float:
    """Cross-section in mm^2 of a solid conductor of that gauge."""
    n = parse_awg(gauge) if isinstance(gauge, str) else gauge
    d = awg_diameter_mm(n)
    return math.pi * d * d / 4


def conductor_resistance(area_mm2: float, length_m: float, temperature_c: float = 20.0) -> float:
    """Resistance in ohm of a copper conductor: rho L / A at 20 degC (IEC 60028), corrected
    with R2/R1 = (234.5 + T2) / (234.5 + T1)."""
    r20 = COPPER_RESISTIVITY_20C * length_m / area_mm2
    return r20 * (COPPER_INFERRED_ZERO + temperature_c) / (COPPER_INFERRED_ZERO + 20.0)
