"""The vehicle, its riders, where it is used and how its parts are housed."""

import enum

from pydantic import ConfigDict, Field, StrictBool, StrictFloat

from reviewer.build.fields import DragArea, Grade, IpCode, Mass, Name, Temperature, _Model
from reviewer.engineering.ingress import IngressCode


class VehicleKind(enum.Enum):
    SKATEBOARD = "skateboard"
    SCOOTER = "scooter"
    BIKE = "bike"
    KART = "kart"
    OTHER = "other"


class Vehicle(_Model):
    name: Name
    kind: VehicleKind
    revision: Name = "1"
    mass: Mass | None = Field(None, description="the vehicle without its rider")
    rated_load: Mass | None = Field(
        None, description="the deck's or frame's rated load (rider and cargo)", examples=["100 kg"]
    )
    builder: Name | None = None


class RiderClass(enum.Enum):
    ADULT = "adult"
    YOUTH = "youth"
    CHILD = "child"


class Rider(_Model):
    name: Name
    mass: Mass
    rider_class: RiderClass = Field(alias="class")

    model_config = ConfigDict(populate_by_name=True)


class Enclosure(_Model):
    electronics_ip: IpCode | None = None
    battery_ip: IpCode | None = None
    battery_hard_case: StrictBool | None = None
    battery_under_deck: StrictBool | None = None

    @property
    def electronics(self) -> IngressCode | None:
        return self.electronics_ip

    @property
    def battery(self) -> IngressCode | None:
        return self.battery_ip


class Conditions(enum.Enum):
    DRY = "dry"
    DAMP = "damp"
    WET = "wet"


class Usage(_Model):
    conditions: Conditions | None = None
    ambient_temperature: Temperature | None = None
    steepest_grade: Grade | None = None
    rolling_resistance: StrictFloat | None = Field(None, gt=0, le=0.5, description="Crr")
    drag_area: DragArea | None = None
