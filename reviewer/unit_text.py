"""How units are written in a review: firstride's own table, never pint's formatter.

pint's formatter has changed its output between versions (the order of a product's factors,
the multiplication sign, how several divisors are written), and a review's bytes must not
depend on the installed pint: they are signed, and compared by ``--since``. So a unit's text
is composed here from the names in its pint UnitsContainer (``{"meter": 1, "second": -2}``):

- each name's symbol from :data:`SYMBOLS`, or a prefix from :data:`PREFIXES` and the symbol of
  the rest (``milliampere_hour`` is ``mAh``); a name in neither is written as the name itself;
- the factors with a positive exponent, in alphabetical order of their names, joined by ``·``
  (``*`` in the compact form of the JSON export), then each divisor in the same order after a
  ``/``; a numerator of nothing is ``1`` (``1/s``);
- an exponent other than one as a superscript (``m²``; ``m**2`` in the compact form).

The rules reproduce what the reviews printed when the table was made, so no review changed.
"""

from __future__ import annotations

from collections.abc import Mapping
from functools import lru_cache

#: Symbols of the units firstride and its packs use, by pint's name for them.
SYMBOLS = {
    "ampere": "A",
    "ampere_hour": "Ah",
    "bar": "bar",
    "coulomb": "C",
    "day": "d",
    "degree": "deg",
    "degree_Celsius": "°C",
    "degree_Fahrenheit": "°F",
    "delta_degree_Celsius": "Δ°C",
    "delta_degree_Fahrenheit": "Δ°F",
    "farad": "F",
    "foot": "ft",
    "gram": "g",
    "henry": "H",
    "hertz": "Hz",
    "hour": "h",
    "inch": "in",
    "joule": "J",
    "kelvin": "K",
    "liter": "l",
    "meter": "m",
    "mile": "mi",
    "mile_per_hour": "mph",
    "minute": "min",
    "newton": "N",
    "ohm": "Ω",
    "pascal": "Pa",
    "percent": "%",
    "pound": "lb",
    "radian": "rad",
    "revolution": "rev",
    "revolutions_per_minute": "rpm",
    "second": "s",
    "siemens": "S",
    "tesla": "T",
    "volt": "V",
    "volt_ampere": "VA",
    "watt": "W",
    "watt_hour": "Wh",
    "weber": "Wb",
}
#: SI prefixes, by pint's name for them.
PREFIXES = {
    "pico": "p",
    "nano": "n",
    "micro": "µ",
    "milli": "m",
    "centi": "c",
    "deci": "d",
    "kilo": "k",
    "mega": "M",
    "giga": "G",
}
_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


@lru_cache(maxsize=256)
def symbol(name: str) -> str:
    """The symbol of one unit name (``kilometer`` is ``km``); the name itself if unknown."""
    found = SYMBOLS.get(name)
    if found is not None:
        return found
    for prefix, short in PREFIXES.items():
        if name.startswith(prefix) and name[len(prefix) :] in SYMBOLS:
            return short + SYMBOLS[name[len(prefix) :]]
    return name


def _factor(name: str, power: float, compact: bool) -> str:
    text = symbol(name)
    if power == 1:
        return text
    exponent = f"{int(power)}" if float(power).is_integer() else f"{power:g}"
    return f"{text}**{exponent}" if compact else text + exponent.translate(_SUPERSCRIPT)


def unit_text(units: Mapping[str, float], compact: bool = False) -> str:
    """The text of a unit given as pint's UnitsContainer (or any mapping of name to power)."""
    items = sorted(units.items())
    above = [_factor(name, power, compact) for name, power in items if power > 0]
    below = [_factor(name, -power, compact) for name, power in items if power < 0]
    text = ("*" if compact else "·").join(above) or ("1" if below else "")
    return text + "".join("/" + factor for factor in below)
