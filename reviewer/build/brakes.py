"""The brakes: what each one is, where it acts and what the builder knows of it."""

import enum
from typing import Self

from pydantic import Field, model_validator

from reviewer.build.fields import (
    Acceleration,
    Current,
    Force,
    Length,
    Mass,
    Name,
    Resistance,
    SmallCurrent,
    Speed,
    Voltage,
    _Model,
)


class BrakeKind(enum.Enum):
    FRICTION = "friction"  # disc, drum, rim or band, on a cable or hydraulics
    FOOT = "foot"  # the rider's foot on a fender or the ground
    DYNAMIC = "dynamic"  # the motor shorted through a relay or switch
    REGENERATIVE = "regenerative"  # the controller drives braking current into the pack

    @property
    def electric(self) -> bool:
        """It brakes through the motor and the drive electronics, and is lost with them."""
        return self in (BrakeKind.DYNAMIC, BrakeKind.REGENERATIVE)


class BrakePosition(enum.Enum):
    FRONT = "front"  # the front wheel(s)
    REAR = "rear"  # the rear wheel(s)
    BOTH = "both"  # every wheel (a linked brake, a foot on the ground)
    MOTOR = "motor"  # through the motor, on the wheel(s) it drives


RELAY_FIELDS = ("relay_contact_rating", "relay_contact_voltage", "coil_current", "brake_resistance")

#: The one-line explanation when a build still has the single [brake] table.
ONE_BRAKE_TABLE = (
    "the single [brake] table is replaced by one [[brakes]] table per brake, each with its "
    "kind (friction, foot, dynamic, regenerative), acts_on and what is known of it "
    "(deceleration, force or a tested stopping distance); a build with no brake writes "
    "brakes = []"
)


class Brake(_Model):
    name: Name | None = Field(None, description="what the builder calls it", examples=["rear disc"])
    kind: BrakeKind = Field(
        description="friction (disc, drum, rim), foot, dynamic (the motor shorted through a "
        "relay) or regenerative (the controller brakes into the pack)"
    )
    acts_on: BrakePosition | None = Field(
        None,
        description="where it acts: front, rear, both (every wheel) or motor (the driven "
        "wheels); absent, the rear is taken, the axle with the least grip under braking",
    )
    deceleration: Acceleration | None = Field(
        None,
        description="the mean deceleration it gives on its own, from its datasheet or a "
        "test (with tested_with_mass)",
        examples=["4 m/s^2"],
    )
    force: Force | None = Field(
        None, description="the braking force it gives at the ground on its own", examples=["350 N"]
    )
    tested_stopping_distance: Length | None = Field(
        None,
        description="a measured stop with this brake alone, from the moment it is applied",
        examples=["6.5 m"],
    )
    tested_from_speed: Speed | None = Field(
        None, description="the speed that stop was measured from", examples=["24 km/h"]
    )
    tested_with_mass: Mass | None = Field(
        None,
        description="vehicle and rider in the test or rating; absent, the lightest rider's",
        examples=["95 kg"],
    )
    relay_contact_rating: Current | None = Field(
        None, description="a dynamic brake's relay: DC rating of the contacts", examples=["40 A"]
    )
    relay_contact_voltage: Voltage | None = Field(
        None,
        description="a dynamic brake's relay: DC voltage rating of the contacts",
        examples=["48 V"],
    )
    coil_current: SmallCurrent | None = Field(
        None, description="a dynamic brake's relay: coil current", examples=["60 mA"]
    )
    brake_resistance: Resistance | None = Field(
        None, description="a dynamic brake's added resistor, if any", examples=["0.5 ohm"]
    )

    @model_validator(mode="after")
    def _consistent(self) -> Self:
        if self.kind is not BrakeKind.DYNAMIC:
            for name in RELAY_FIELDS:
                if getattr(self, name) is not None:
                    raise ValueError(
                        f"{name} belongs to a dynamic brake, not a {self.kind.value} one"
                    )
        if (self.tested_stopping_distance is None) != (self.tested_from_speed is None):
            raise ValueError("tested_stopping_distance and tested_from_speed go together")
        return self
