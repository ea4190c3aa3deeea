"""The strict gate that turns build-file text into quantities, and the pydantic field type
that applies it.

pint's own expression parser evaluates arithmetic (``9**9**9 V`` can hang it, ``1/0 V`` raises
ZeroDivisionError), so build files never reach it. A quantity string must match a strict
pattern: one decimal number, then a unit made of names joined by ``*``, ``/`` or spaces with
small integer exponents. Only the unit part goes to pint, as units, never as an expression.

The text is NFKC-normalised first, so compatibility forms read as what they stand for:
full-width ``２４ Ｖ`` is ``24 V``, a no-break space is a space, the micro sign and the ohm sign
are the Greek letters pint knows. After that the number must be ASCII digits: other digits
(Arabic-Indic ``٢٤``, Devanagari...) are refused rather than read as a value a reviewer may
not recognise. Also refused: a leading ``+``, any white space but the plain space (so no line
break inside), any control or invisible character, a magnitude too small to be physical
(``5e-324 V``), a temperature difference (``delta_degC``) where a temperature is expected and
any unit pint cannot convert to the field's unit. Each is one QuantityError line.
"""

from __future__ import annotations

import math
import re
import unicodedata
from collections.abc import Callable
from functools import lru_cache
from typing import Any

import pint
from pydantic import GetCoreSchemaHandler, GetJsonSchemaHandler
from pydantic_core import PydanticCustomError, core_schema

from reviewer.unit_text import unit_text
from reviewer.units import (
    MAX_QUANTITY_TEXT,
    Dimension,
    Quantity,
    QuantityError,
    _is_offset_units,
    _new_quantity,
    _reference,
    format_quantity,
    unit,
)

_NUMBER = r"-?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]{1,3})?"


_UNIT_NAME = "(?:[A-Za-z_°µμΩ%]+)"


_EXPONENT = r"(?:(?:\^|\*\*)-?[1-4])?"


_FACTOR = _UNIT_NAME + _EXPONENT


_UNIT = rf"{_FACTOR}(?: *(?:[*/·]| ) *{_FACTOR})*"


QUANTITY_RE = re.compile(rf"^ *(?P<number>{_NUMBER}) *(?P<unit>{_UNIT}) *$")


#: The smallest non-zero magnitude accepted, in the field's own unit: far below any real
#: part (a picosecond of switching time, a picoampere), far above the subnormal floats
#: (``5e-324``) a typo or a probe gives.
MIN_MAGNITUDE = 1e-12


def screened(text: str) -> str:
    """Quantity or code text NFKC-normalised, or QuantityError for a character no quantity holds:
    a control or invisible character, white space other than a space, a non-ASCII digit."""
    if not text.isascii():
        text = unicodedata.normalize("NFKC", text)
    if not text.isprintable():
        bad = next(c for c in text if not c.isprintable())
        raise QuantityError(
            f"{text!r} holds a line break, control or invisible character (U+{ord(bad):04X})"
        )
    if not text.isascii():
        digit = next((c for c in text if c.isdigit() and not c.isascii()), None)
        if digit is not None:
            raise QuantityError(
                f"{text!r} has a digit that is not 0-9 (U+{ord(digit):04X}); write the number "
                "in ASCII digits"
            )
    return text


def parse_quantity(text: object, dimension: Dimension) -> pint.Quantity:
    """Parse ``"24 V"`` into a quantity in the dimension's unit, or raise QuantityError."""
    if not isinstance(text, str):
        raise QuantityError(
            f"expected {dimension.what} as a string with a unit, e.g. {dimension.example!r}"
        )
    if len(text) > MAX_QUANTITY_TEXT:
        raise QuantityError(f"quantity text longer than {MAX_QUANTITY_TEXT} characters")
    text = screened(text)
    match = QUANTITY_RE.match(text)
    if match is None:
        if re.fullmatch(rf" *\+?{_NUMBER} *", text):
            raise QuantityError(
                f"{text!r} has no unit; expected {dimension.what}, e.g. {dimension.example!r}"
            )
        sign = " (no '+' sign before the number)" if text.lstrip(" ").startswith("+") else ""
        raise QuantityError(
            f"{text!r} is not a number followed by a unit{sign}; expected {dimension.what}, "
            f"e.g. {dimension.example!r}"
        )
    magnitude = float(match["number"])
    if not math.isfinite(magnitude):
        raise QuantityError(f"{text!r} is not a finite number")
    written = match["unit"]
    try:
        plan = _unit_plan(written, dimension.unit)
    except _UnknownUnit as exc:
        raise QuantityError(f"unknown unit {written!r} in {text!r}") from exc.__cause__
    except _Unconvertible:
        raise QuantityError(
            f"{text!r}: the unit {written!r} cannot be converted to {dimension.unit!r}; "
            f"expected {dimension.what}, e.g. {dimension.example!r}"
        ) from None
    if plan is None:
        if _is_difference(written, dimension):
            raise QuantityError(
                f"{text!r} is a temperature difference; expected {dimension.what} on a scale, "
                f"e.g. {dimension.example!r}"
            )
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
    if value != 0 and abs(value) < MIN_MAGNITUDE and (low is None or low >= 0):
        raise QuantityError(
            f"{text!r} is too small to be {dimension.what} (under {MIN_MAGNITUDE:g} "
            f"{dimension.unit}); write 0 or the real value"
        )
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
                value = f"{value.magnitude} {unit_text(value._units, compact=True)}"
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
            "pattern": re.sub(r"\(\?P<\w+>", "(", QUANTITY_RE.pattern),  # ECMA-262 form
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
        units = unit(written.replace("^", "**").replace("·", "*").replace("μ", "µ"))
        dimensionality = units.dimensionality
    except _PINT_FAILURES as exc:
        raise _UnknownUnit(written) from exc
    if dimensionality != _reference(target_text).dimensionality:
        return None
    if _is_offset_units(unit(target_text)._units) and _has_delta(units):
        return None  # a difference is not a reading on the scale (see _is_difference)
    try:
        return _converter(units, target_text), unit(target_text)._units
    except _PINT_FAILURES as exc:
        raise _Unconvertible(written) from exc


_PINT_FAILURES = (pint.PintError, ValueError, TypeError, AttributeError, ArithmeticError, KeyError)


class _Unconvertible(Exception):
    """A unit of the right dimension that pint still cannot convert (a logarithmic or offset
    unit inside a compound one)."""


def _has_delta(units: pint.Unit) -> bool:
    return any(name.startswith("delta_") for name in units._units)


def _is_difference(written: str, dimension: Dimension) -> bool:
    """True for a temperature difference (``delta_degC``) written where the field wants a
    temperature on a scale (degC): pint refuses to convert one to the other."""
    try:
        units = unit(written.replace("^", "**").replace("·", "*").replace("μ", "µ"))
        target = unit(dimension.unit)
        return (
            _is_offset_units(target._units)
            and _has_delta(units)
            and units.dimensionality == target.dimensionality
        )
    except _PINT_FAILURES:
        return False


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
