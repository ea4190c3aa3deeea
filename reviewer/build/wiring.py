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
    name: Name
    circuit: Circuit = Field(
        description="what the wire carries: battery (pack to controller), motor (brushed motor "
        "leads), phase (brushless phase leads), logic, brake or other"
    )
    motor: Name | None = Field(None, description="for motor-circuit wires in a multi-motor build")
    gauge: Gauge | None = None
    cross_section: Area | None = None
    length: Length
    insulation: Insulation | None = None
    temperature_rating: Temperature | None = None
    bundled_with: StrictInt = Field(
        0, ge=0, le=100, description="other loaded conductors alongside"
    )
    rated_ampacity: Current | None = Field(None, description="from the wire's own datasheet")

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
    name: Name
    location: Literal["battery-positive", "battery-negative", "motor", "logic", "other"]
    rating: Current
    voltage_rating: Voltage | None = None
    breaking_capacity: Current | None = None
    clearing_time: Duration | None = Field(None, description="at the stall current, from its curve")
    protects: list[Name] = Field(default_factory=list, max_length=MAX_ITEMS)
