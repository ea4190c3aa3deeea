"""Wires and fuses of the power and logic circuits."""

import enum
from typing import Literal, Self

import pint
from pydantic import Field, StrictInt, model_validator

from reviewer import units as u
from reviewer.build.fields import (
    MAX_ITEMS,
    Area,
    Current,
    Duration,
    Gauge,
    Length,
    Name,
    Temperature,
    Voltage,
    _Model,
)


class Circuit(enum.Enum):
    BATTERY = "battery"
    MOTOR = "motor"
    PHASE = "phase"  # between a brushless controller and its motor
    LOGIC = "logic"
    BRAKE = "brake"
    OTHER = "other"


class Insulation(enum.Enum):
    PVC = "pvc"
    PVC_90 = "pvc-90"
    RUBBER = "rubber"
    XLPE = "xlpe"
    SILICONE = "silicone"
    PTFE = "ptfe"


class Wire(_Model):
    name: Name = Field(description="what findings and fuses call it", examples=["pack positive"])
    circuit: Circuit = Field(
        description="what the wire carries: battery (pack to controller), motor (brushed motor "
        "leads), phase (brushless phase leads), logic (the logic board's wiring), brake (a "
        "dynamic brake's loop) or other"
    )
    motor: Name | None = Field(
        None, description="for motor-circuit wires in a multi-motor build", examples=["rear"]
    )
    gauge: Gauge | None = Field(None, description="as printed on the insulation; or cross_section")
    cross_section: Area | None = Field(
        None, description="the conductor's metric size; or gauge", examples=["4 mm^2"]
    )
    length: Length = Field(description="the wire's length end to end, in m", examples=["0.35 m"])
    insulation: Insulation | None = Field(
        None,
        description="the insulation on its marking or datasheet: pvc (70 degC PVC), pvc-90 "
        "(90 degC PVC), rubber, xlpe (cross-linked polyethylene), silicone or ptfe",
    )
    temperature_rating: Temperature | None = Field(
        None, description="the insulation's rating, as printed", examples=["105 degC"]
    )
    bundled_with: StrictInt = Field(
        0, ge=0, le=100, description="other loaded conductors alongside", examples=[2]
    )
    rated_ampacity: Current | None = Field(
        None, description="from the wire's own datasheet", examples=["38 A"]
    )

    @model_validator(mode="after")
    def _one_size(self) -> Self:
        if self.gauge is not None and self.cross_section is not None:
            raise ValueError("give either gauge or cross_section, not both")
        if self.gauge is None and self.cross_section is None:
            raise ValueError("give gauge (AWG) or cross_section (mm^2)")
        return self

    @property
    def area(self) -> pint.Quantity:
        if self.cross_section is not None:
            return self.cross_section
        assert self.gauge is not None  # one of the two is required
        return u.quantity(self.gauge.area_mm2, "mm**2")


class Fuse(_Model):
    name: Name = Field(description="what findings call it", examples=["main fuse"])
    location: Literal["battery-positive", "battery-negative", "motor", "logic", "other"] = Field(
        description="where it sits: battery-positive or battery-negative (in the pack's lead "
        "of that side), motor (a motor lead), logic (the logic supply) or other"
    )
    rating: Current = Field(description="its rated current as marked, in A", examples=["32 A"])
    voltage_rating: Voltage | None = Field(
        None, description="its datasheet DC voltage rating", examples=["58 V"]
    )
    breaking_capacity: Current | None = Field(
        None, description="the most fault current it interrupts (datasheet)", examples=["2000 A"]
    )
    clearing_time: Duration | None = Field(
        None, description="at the stall current, from its curve", examples=["80 ms"]
    )
    protects: list[Name] = Field(
        default_factory=list,
        max_length=MAX_ITEMS,
        description="the wires it protects, by name",
        examples=[["pack positive"]],
    )
