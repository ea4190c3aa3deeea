"""One unit registry for the whole process, and the strict gate that turns text into quantities.

pint's own expression parser evaluates arithmetic (``9**9**9 V`` can hang it, ``1/0 V`` raises
ZeroDivisionError), so build files never reach it. A quantity string must match a strict
pattern: one decimal number, then a unit made of names joined by ``*``, ``/`` or spaces with
small integer exponents. Only the unit part goes to pint, as units, never as an expression.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import pint
from pydantic import GetCoreSchemaHandler, GetJsonSchemaHandler
from pydantic_core import PydanticCustomError, core_schema


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


_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d{1,3})?"
_UNIT_NAME = r"(?:[A-Za-z_°µΩ%]+)"
_EXPONENT = r"(?:(?:\^|\*\*)-?[1-4])?"
_FACTOR = _UNIT_NAME + _EXPONENT
_UNIT = rf"{_FACTOR}(?:\s*(?:[*/·]|\s)\s*{_FACTOR})*"
_QUANTITY_RE = re.compile(rf"^\s*(?P<number>{_NUMBER})\s*(?P<unit>{_UNIT})\s*$")


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


def parse_quantity(text: object, dimension: Dimension) -> pint.Quantity:
    """Parse ``"24 V"`` into a quantity in the dimension's unit, or raise QuantityError."""
    if not isinstance(text, str):
        raise QuantityError(
            f"expected {dimension.what} as a string with a unit, e.g. {dimension.example!r}"
        )
    if len(text) > MAX_QUANTITY_TEXT:
        raise QuantityError(f"quantity text longer than {MAX_QUANTITY_TEXT} characters")
    match = _QUANTITY_RE.match(text)
    if match is None:
        if re.fullmatch(rf"\s*{_NUMBER}\s*", text):
            raise QuantityError(
                f"{text!r} has no unit; expected {dimension.what}, e.g. {dimension.example!r}"
            )
        raise QuantityError(
            f"{text!r} is not a number followed by a unit; expected {dimension.what}, "
            f"e.g. {dimension.example!r}"
        )
    magnitude = float(match["number"])
    if not math.isfinite(magnitude):
        raise QuantityError(f"{text!r} is not a finite number")
    try:
        plan = _unit_plan(match["unit"], dimension.unit)
    except _UnknownUnit as exc:
        raise QuantityError(f"unknown unit {match['unit']!r} in {text!r}") from exc.__cause__
    if plan is None:
        raise QuantityError(
            f"{text!r} is not {dimension.what}; expected a unit like {dimension.unit!r}, "
            f"e.g. {dimension.example!r}"
        )
    convert, target = plan
    value = convert(magnitude)
    if not math.isfinite(value):
        raise QuantityError(f"{text!r} is out of range")
    quantity = _new_quantity(value, target)
    low, high = dimension.minimum, dimension.maximum
    if value == 0 and not dimension.allow_zero:
        raise QuantityError(f"{text!r} must not be zero for {dimension.what}")
    if low is not None and value < low:
        raise QuantityError(
            f"{text!r} is below the physical range for {dimension.what} "
            f"({low:g} {dimension.unit} to {high:g} {dimension.unit})"
        )
    if high is not None and value > high:
        raise QuantityError(
            f"{text!r} is above the physical range for {dimension.what} "
            f"({low:g} {dimension.unit} to {high:g} {dimension.unit})"
        )
    return quantity


class QuantityField:
    """Annotated marker: ``Annotated[pint.Quantity, QuantityField(VOLTAGE)]``."""

    def __init__(self, dimension: Dimension) -> None:
        self.dimension = dimension

    def __get_pydantic_core_schema__(
        self, source: Any, handler: GetCoreSchemaHandler
    ) -> core_schema.CoreSchema:
        dimension = self.dimension

        def validate(value: Any) -> pint.Quantity:
            if isinstance(value, pint.Quantity):
                value = f"{value.magnitude} {value.units:~}"
            try:
                return parse_quantity(value, dimension)
            except QuantityError as exc:
                raise PydanticCustomError("quantity", str(exc)) from None

        return core_schema.no_info_plain_validator_function(
            validate,
            serialization=core_schema.plain_serializer_function_ser_schema(format_quantity),
        )

    def __get_pydantic_json_schema__(
        self, schema: core_schema.CoreSchema, handler: GetJsonSchemaHandler
    ) -> dict[str, Any]:
        d = self.dimension
        description = f"{d.what} as a number and a unit (a unit like {d.unit})"
        if d.minimum is not None and d.maximum is not None:
            description += f"; accepted range {d.minimum:g} to {d.maximum:g} {d.unit}"
        return {
            "type": "string",
            "pattern": re.sub(r"\(\?P<\w+>", "(", _QUANTITY_RE.pattern),  # ECMA-262 form
            "maxLength": MAX_QUANTITY_TEXT,
            "examples": [d.example],
            "description": description,
            "x-dimension": str(d.reference.dimensionality),
        }


class _UnknownUnit(Exception):
    """The unit text of a quantity is not a unit of the registry (the cause says why)."""


@lru_cache(maxsize=1024)
def _unit_plan(written: str, target_text: str) -> tuple[Callable[[float], float], Any] | None:
    """How a magnitude written in the unit ``written`` becomes one in ``target_text``: the
    float conversion and the target's UnitsContainer; None when the dimensions differ.

    Found once per pair of unit texts, so validating a build costs a dictionary look-up per
    quantity rather than pint's unit comparison and conversion. Raises :class:`_UnknownUnit`
    (never cached) for a unit pint does not know."""
    try:
        units = unit(written.replace("^", "**").replace("·", "*"))
    except (pint.PintError, ValueError, TypeError, AttributeError, ArithmeticError) as exc:
        raise _UnknownUnit(written) from exc
    if units.dimensionality != _reference(target_text).dimensionality:
        return None
    return _converter(units, target_text), unit(target_text)._units


@lru_cache(maxsize=1024)
def _converter(source: pint.Unit, target_text: str) -> Callable[[float], float]:
    """A float-to-float conversion between two units, found once: pint's own conversion
    costs tens of microseconds per call. Offset scales (degC, degF) are affine: two points."""
    target = unit(target_text)
    at_zero = float(Quantity(0.0, source).to(target).magnitude)
    at_one = float(Quantity(1.0, source).to(target).magnitude)
    slope = at_one - at_zero
    if at_zero == 0.0 and slope == 1.0:
        return float
    return lambda value: at_zero + slope * value


@lru_cache(maxsize=1024)
def unit_symbol(units: pint.Unit) -> str:
    return f"{units:~P}"


@lru_cache(maxsize=1024)
def _symbol_of(units: Any) -> str:
    """The symbol of a quantity's UnitsContainer, keyed on the container itself: reading
    ``quantity.units`` would build a new pint Unit (and hash it) on every call."""
    return unit_symbol(ureg.Unit(units))


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
ENERGY = Dimension("Wh", "500 Wh", "an energy", 0.0, 1.0e6)
POWER = Dimension("W", "250 W", "a power", 0.0, 1.0e6)
