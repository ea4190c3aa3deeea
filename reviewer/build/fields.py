"""The field types of the build file: names, quantities and codes, each parsed once here.

A quantity becomes a pint quantity in its dimension's fixed unit (``reviewer.units``); a wire
gauge a :class:`WireGauge`; an IP code an :class:`~reviewer.engineering.ingress.IngressCode`.
Nothing after the build model parses their text again.
"""

import re
from dataclasses import dataclass
from functools import cached_property
from typing import Annotated, Any

import pint
from pydantic import BaseModel, ConfigDict, Field, GetCoreSchemaHandler, GetJsonSchemaHandler
from pydantic_core import PydanticCustomError, core_schema

from reviewer import quantity_text as qt
from reviewer import units as u
from reviewer.engineering.conductors import AWG_PATTERN, awg_area, awg_label, parse_awg
from reviewer.engineering.ingress import IP_PATTERN, IngressCode, parse_ip_code

MAX_NAME = 80
MAX_TEXT = 400
MAX_RIDERS = 12
MAX_ITEMS = 64

Name = Annotated[str, Field(min_length=1, max_length=MAX_NAME)]
Text = Annotated[str, Field(max_length=MAX_TEXT)]


def _q(dimension: u.Dimension) -> object:
    return qt.QuantityField(dimension)


Voltage = Annotated[pint.Quantity, _q(u.VOLTAGE)]
Current = Annotated[pint.Quantity, _q(u.CURRENT)]
SmallCurrent = Annotated[pint.Quantity, _q(u.SMALL_CURRENT)]
Resistance = Annotated[pint.Quantity, _q(u.RESISTANCE)]
Length = Annotated[pint.Quantity, _q(u.LENGTH)]
Diameter = Annotated[pint.Quantity, _q(u.DIAMETER)]
Area = Annotated[pint.Quantity, _q(u.AREA)]
DragArea = Annotated[pint.Quantity, _q(u.DRAG_AREA)]
Mass = Annotated[pint.Quantity, _q(u.MASS)]
Charge = Annotated[pint.Quantity, _q(u.CHARGE)]
Rotation = Annotated[pint.Quantity, _q(u.ROTATION)]
Kv = Annotated[pint.Quantity, _q(u.KV)]
Temperature = Annotated[pint.Quantity, _q(u.TEMPERATURE)]
Duration = Annotated[pint.Quantity, _q(u.TIME)]
Frequency = Annotated[pint.Quantity, _q(u.FREQUENCY)]
ThermalResistance = Annotated[pint.Quantity, _q(u.THERMAL_RESISTANCE)]
Grade = Annotated[pint.Quantity, _q(u.GRADE)]
Fraction = Annotated[pint.Quantity, _q(u.FRACTION)]
Inductance = Annotated[pint.Quantity, _q(u.INDUCTANCE)]
Speed = Annotated[pint.Quantity, _q(u.SPEED)]
Acceleration = Annotated[pint.Quantity, _q(u.ACCELERATION)]
Force = Annotated[pint.Quantity, _q(u.FORCE)]
Distance = Annotated[pint.Quantity, _q(u.DISTANCE)]
SignedGrade = Annotated[pint.Quantity, _q(u.SIGNED_GRADE)]


class _Model(BaseModel):
    # Start-up cost, measured: this module's annotations are evaluated by Python as each class
    # is made (no ``from __future__ import annotations``, which would have pydantic evaluate
    # every field's annotation from its text), and each model's validator is built when first
    # needed, not on import: ``Build``'s holds all the nested models, so a review builds one.
    # Together they take a fifth off the time making these models costs at every start.
    model_config = ConfigDict(
        extra="forbid",
        frozen=True,
        arbitrary_types_allowed=True,
        allow_inf_nan=False,
        defer_build=True,
    )


# --- codes ------------------------------------------------------------------------------------


@dataclass(frozen=True)
class WireGauge:
    """A wire size on the AWG scale: ``awg`` 12 for 12 AWG, 0 for 1/0, -3 for 4/0 (ASTM B258)."""

    awg: int

    @property
    def label(self) -> str:
        return awg_label(self.awg)

    @cached_property
    def area_mm2(self) -> float:
        """Cross-section of a solid conductor of this gauge, mm^2."""
        return awg_area(self.awg)

    def __str__(self) -> str:
        return self.label


class _CodeField:
    """Annotated marker for a code parsed once into a structured value (a gauge, an IP code)."""

    kind = ""
    max_length = 16
    examples: tuple[str, ...] = ()
    description = ""
    pattern = ""

    def parse(self, text: str) -> Any:
        raise NotImplementedError

    def text(self, value: Any) -> str:
        raise NotImplementedError

    def __get_pydantic_core_schema__(
        self, source: Any, handler: GetCoreSchemaHandler
    ) -> core_schema.CoreSchema:
        def validate(value: Any) -> Any:
            if not isinstance(value, str):
                raise PydanticCustomError(self.kind, f"text such as {self.examples[0]!r}")
            if len(value) > self.max_length:
                raise PydanticCustomError(
                    "string_too_long", f"String should have at most {self.max_length} characters"
                )
            try:
                return self.parse(qt.screened(value))  # NFKC, ASCII digits, no control chars
            except ValueError as exc:
                raise PydanticCustomError(self.kind, str(exc)) from None

        return core_schema.no_info_plain_validator_function(
            validate,
            serialization=core_schema.plain_serializer_function_ser_schema(self.text),
        )

    def __get_pydantic_json_schema__(
        self, schema: core_schema.CoreSchema, handler: GetJsonSchemaHandler
    ) -> dict[str, Any]:
        return {
            "type": "string",
            "pattern": re.sub(r"\(\?P<\w+>", "(", self.pattern),  # ECMA-262 form
            "maxLength": self.max_length,
            "examples": list(self.examples),
            "description": self.description,
        }


class GaugeField(_CodeField):
    kind = "gauge"
    max_length = 12
    examples = ("12 AWG", "2/0 AWG")
    description = "AWG size of the conductor, e.g. '12 AWG' or '2/0 AWG' (ASTM B258)"
    pattern = AWG_PATTERN

    def parse(self, text: str) -> WireGauge:
        return WireGauge(parse_awg(text))

    def text(self, value: Any) -> str:
        return value.label if isinstance(value, WireGauge) else str(value)


class IpCodeField(_CodeField):
    kind = "ip_code"
    max_length = 16
    examples = ("IP54", "IPX7", "IPX5/IPX7")
    description = (
        "IP code from the part's datasheet or marking (IEC 60529), e.g. 'IP54'; "
        "a dual marking as 'IPX5/IPX7'"
    )
    pattern = IP_PATTERN

    def parse(self, text: str) -> IngressCode:
        return parse_ip_code(text)

    def text(self, value: Any) -> str:
        return value.text if isinstance(value, IngressCode) else str(value)


Gauge = Annotated[WireGauge, GaugeField()]
IpCode = Annotated[IngressCode, IpCodeField()]
