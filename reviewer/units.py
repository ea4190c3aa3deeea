"""One unit registry for the whole process: quantities carried as values, converted to floats
in a named unit, and written back as text.

The strict gate that turns build-file text into quantities (and the pydantic field type that
applies it) is :mod:`reviewer.quantity_text`; :class:`Dimension` and the table of dimensions
at the end of this module say what each field measures and the physical range it accepts.

Unit text in a review comes from firstride's own table (:func:`unit_symbol`), never from
pint's formatter, whose output has changed between versions: a review's bytes (and so its
signatures and ``--since`` comparisons) do not depend on the installed pint.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import pint

from reviewer.unit_text import unit_text


def _registry() -> pint.UnitRegistry:
    """pint's registry, with its parsed definitions kept in the user's cache folder; where that
    folder cannot be made (a read-only home, no home at all) they are parsed afresh instead of
    the program failing."""
    try:
        return pint.UnitRegistry(cache_folder=":auto:", autoconvert_offset_to_baseunit=True)
    except OSError:
        return pint.UnitRegistry(autoconvert_offset_to_baseunit=True)


ureg = _registry()
ureg.formatter.default_format = "~P"
Quantity = ureg.Quantity

MAX_QUANTITY_TEXT = 64


@lru_cache(maxsize=1024)
def unit(text: str) -> pint.Unit:
    """A parsed unit, cached: pint re-parses compound unit strings ('mm**2') on every use,
    which costs a hundred microseconds or more each time."""
    return ureg.Unit(text)


def in_unit(amount: pint.Quantity, target: str | pint.Unit) -> float:
    """A quantity's magnitude in ``target``.

    Build fields are parsed into their dimension's fixed unit through the unit cache, so they
    share its unit object and need no conversion: the identity test costs well under a
    microsecond, where pint's ``m_as`` (or even ``units ==``) costs tens. Anything else, a
    profile limit in another unit say, is converted properly."""
    units = unit(target) if isinstance(target, str) else target
    if amount._units is units._units:
        return float(amount.magnitude)
    return _magnitude_in(amount, units._units)


def in_units_of(amount: pint.Quantity, like: pint.Quantity) -> float:
    """``amount``'s magnitude in the unit of the quantity ``like``: :func:`in_unit` without
    making a pint Unit for ``like`` first (``like.units`` builds a new one on every access)."""
    if amount._units is like._units:
        return float(amount.magnitude)
    return _magnitude_in(amount, like._units)


def _magnitude_in(amount: pint.Quantity, target: Any) -> float:
    """As ``float(amount.m_as(target))``, with pint's per-call overhead taken out where the
    result is the same: equal units give the magnitude unchanged (pint's own shortcut), and a
    multiplicative pair multiplies by the conversion factor, found once per pair. Offset
    scales (degC) and anything unusual go through pint itself."""
    source = amount._units
    if source == target:
        return float(amount.magnitude)
    factor = _conversion_factor(source, target)
    if factor is None:
        return float(amount.m_as(ureg.Unit(target)))
    return float(amount.magnitude * factor)


@lru_cache(maxsize=1024)
def _conversion_factor(source: Any, target: Any) -> float | None:
    """pint's factor from ``source`` to ``target`` (two UnitsContainers): ``1.0 * factor``
    converted by pint is the factor itself. None when either side is an offset or logarithmic
    unit, which a factor cannot convert. Raises pint's DimensionalityError, never cached."""
    if _is_offset_units(source) or _is_offset_units(target):
        return None
    return float(Quantity(1.0, source).to(ureg.Unit(target)).magnitude)


def quantity(value: float, units: str | pint.Unit) -> pint.Quantity:
    """A quantity from a number and a unit (text, through the unit cache, or a Unit).

    pint's constructor checks its arguments for strings, sequences, arrays and other
    registries, several microseconds each time; a plain ``float`` or ``int`` in a unit of this
    registry needs none of it, so that case sets the same two attributes directly."""
    parsed = unit(units) if isinstance(units, str) else units
    if type(value) is float or type(value) is int:
        return _new_quantity(value, parsed._units)
    return Quantity(value, parsed)


def quantity_like(value: float, like: pint.Quantity) -> pint.Quantity:
    """A quantity of ``value`` (a float) in the unit of the quantity ``like``."""
    return _new_quantity(float(value), like._units)


def is_offset(amount: pint.Quantity) -> bool:
    """True for a quantity on an offset (or other non-multiplicative) scale, such as degC,
    where ratios and factors mean nothing."""
    return _is_offset_units(amount._units)


@lru_cache(maxsize=1024)
def _is_offset_units(units: Any) -> bool:
    # pint answers by looking up each unit's definition on every call; the answer is fixed.
    return not Quantity(1.0, units)._is_multiplicative


_make_instance = object.__new__


def _new_quantity(magnitude: float, units: Any) -> pint.Quantity:
    """What ``Quantity(magnitude, units)`` gives for a real number and a UnitsContainer of this
    registry (pint's constructor sets exactly ``_magnitude`` and ``_units`` then)."""
    made = _make_instance(Quantity)
    made._magnitude = magnitude
    made._units = units
    return made


class QuantityError(ValueError):
    """A quantity string that is not a number followed by a unit of the expected kind."""


@dataclass(frozen=True)
class Dimension:
    """What a field measures: its display unit, an example and the physical range it accepts."""

    unit: str
    example: str
    what: str
    minimum: float | None = None  # in `unit`
    maximum: float | None = None  # in `unit`
    allow_zero: bool = False

    @property
    def reference(self) -> pint.Quantity:
        return _reference(self.unit)


_REFERENCES: dict[str, pint.Quantity] = {}


def _reference(unit_text: str) -> pint.Quantity:
    ref = _REFERENCES.get(unit_text)
    if ref is None:
        ref = _REFERENCES[unit_text] = Quantity(1.0, unit(unit_text))
    return ref


@lru_cache(maxsize=1024)
def unit_symbol(units: pint.Unit, compact: bool = False) -> str:
    """A unit's text as reviews print it, from :mod:`reviewer.unit_text`'s own table: ``m/s²``
    (``m/s**2`` with ``compact``, the JSON form); never pint's version-dependent formatter."""
    return unit_text(units._units, compact)


@lru_cache(maxsize=1024)
def _symbol_of(units: Any) -> str:
    """The symbol of a quantity's UnitsContainer, keyed on the container itself: reading
    ``quantity.units`` would build a new pint Unit (and hash it) on every call."""
    return unit_text(units)


def format_quantity(quantity: pint.Quantity | None, digits: int = 3) -> str:
    """Short, stable text for a quantity: three significant figures and the unit's symbol."""
    if quantity is None:
        return "n/a"
    magnitude = float(quantity.magnitude)
    return f"{format_number(magnitude, digits)} {_symbol_of(quantity._units)}".strip()


def format_number(value: float, digits: int = 3) -> str:
    if not math.isfinite(value):
        return "∞" if value > 0 else ("-∞" if value < 0 else "n/a")
    if value == 0:
        return "0"
    text = f"{value:.{digits}g}"
    if "e" in text:
        mantissa, exponent = text.split("e")
        power = int(exponent)
        if 0 < power < 6:  # 2430 W reads better than 2.43×10^3 W; still three figures
            return f"{round(float(text)):d}"
        return f"{mantissa}×10^{power}"
    return text


# Dimensions used by build files and profiles. Ranges are physical sanity bounds for a light
# vehicle, wide enough for any real build; they catch typos like "1e30 V" or "-0.3 ohm".
VOLTAGE = Dimension("V", "24 V", "a voltage", 0.0, 1000.0)
CURRENT = Dimension("A", "20 A", "a current", 0.0, 100_000.0)
SMALL_CURRENT = Dimension("mA", "20 mA", "a current", 0.0, 100_000.0)
RESISTANCE = Dimension("ohm", "0.35 ohm", "a resistance", 0.0, 1.0e6)
LENGTH = Dimension("m", "0.5 m", "a length", 0.0, 1000.0)
DIAMETER = Dimension("mm", "90 mm", "a diameter", 0.0, 5000.0)
AREA = Dimension("mm**2", "2.5 mm^2", "a cross-section area", 0.0, 1000.0)
DRAG_AREA = Dimension("m**2", "0.6 m^2", "a drag area (CdA)", 0.0, 10.0)
MASS = Dimension("kg", "80 kg", "a mass", 0.0, 2000.0)
CHARGE = Dimension("mAh", "3000 mAh", "a cell capacity", 0.0, 1.0e7)
SPEED = Dimension("km/h", "25 km/h", "a speed", 0.0, 500.0)
ROTATION = Dimension("rpm", "4500 rpm", "a rotational speed", 0.0, 200_000.0)
KV = Dimension("rpm/V", "190 rpm/V", "a motor velocity constant Kv", 0.0, 100_000.0)
TEMPERATURE = Dimension("degC", "40 degC", "a temperature", -60.0, 400.0, allow_zero=True)
TIME = Dimension("s", "10 ms", "a duration", 0.0, 1.0e6)
FREQUENCY = Dimension("kHz", "16 kHz", "a frequency", 0.0, 10_000.0)
THERMAL_RESISTANCE = Dimension("K/W", "0.5 K/W", "a thermal resistance", 0.0, 1000.0)
ACCELERATION = Dimension("m/s**2", "3 m/s^2", "an acceleration", 0.0, 100.0)
GRADE = Dimension("percent", "8 %", "a grade (rise over run)", 0.0, 100.0, allow_zero=True)
FRACTION = Dimension("percent", "85 %", "a fraction", 0.0, 100.0)
INDUCTANCE = Dimension("uH", "120 uH", "an inductance", 0.0, 1.0e6)
ENERGY = Dimension("Wh", "500 Wh", "an energy", 0.0, 1.0e6)
POWER = Dimension("W", "250 W", "a power", 0.0, 1.0e6)
FORCE = Dimension("N", "400 N", "a force", 0.0, 100_000.0)
DISTANCE = Dimension("km", "1.5 km", "a distance along a route", 0.0, 1000.0)
SIGNED_GRADE = Dimension(
    "percent", "-6 %", "a grade (rise over run, negative downhill)", -100.0, 100.0, allow_zero=True
)
