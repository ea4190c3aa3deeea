"""What carries the rider: wheels and tyres, and the deck or frame."""

import enum

from pydantic import Field, StrictInt

from reviewer.build.fields import Mass, Name, Speed, _Model


class WheelPosition(enum.Enum):
    FRONT = "front"
    REAR = "rear"


class Wheel(_Model):
    name: Name = Field(description="what findings call it", examples=["rear tyre"])
    position: WheelPosition = Field(description="front or rear axle")
    count: StrictInt = Field(
        1, ge=1, le=4, description="wheels of this kind on that axle", examples=[2]
    )
    rated_load: Mass | None = Field(
        None,
        description="each wheel's or tyre's rated load (its load index in kg)",
        examples=["120 kg"],
    )
    speed_rating: Speed | None = Field(
        None, description="the wheel's or tyre's rated speed", examples=["40 km/h"]
    )
