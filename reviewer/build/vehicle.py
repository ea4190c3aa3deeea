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
    name: Name = Field(
        description="the vehicle's name, the review's title", examples=["Harbour Runabout"]
    )
    kind: VehicleKind = Field(
        description="skateboard (a deck, no handlebar), scooter (standing, with a handlebar), "
        "bike (seated, pedals or footpegs), kart (a seated frame on four wheels) or other"
    )
    revision: Name = Field(
        "1", description="the build's revision, shown beside its name", examples=["B"]
    )
    mass: Mass | None = Field(
        None, description="the vehicle without its rider, weighed", examples=["16 kg"]
    )
    rated_load: Mass | None = Field(
        None, description="the deck's or frame's rated load (rider and cargo)", examples=["100 kg"]
    )
    builder: Name | None = Field(
        None, description="who built it, for the review's header", examples=["Dockside club"]
    )


class RiderClass(enum.Enum):
    ADULT = "adult"
    YOUTH = "youth"
    CHILD = "child"


class Rider(_Model):
    name: Name = Field(description="what findings call the rider", examples=["Alex"])
    mass: Mass = Field(
        description="the rider dressed, with what they carry, in kg", examples=["72 kg"]
    )
    rider_class: RiderClass = Field(
        alias="class",
        description="adult, youth or child: which of the profile's speed limits applies "
        "(speed.max_speed.adult, .youth, .child)",
    )

    model_config = ConfigDict(populate_by_name=True)


class Enclosure(_Model):
    electronics_ip: IpCode | None = Field(
        None, description="the controller's or electronics box's rating"
    )
    battery_ip: IpCode | None = Field(None, description="the battery pack's or its box's rating")
    battery_hard_case: StrictBool | None = Field(
        None, description="the pack is in a rigid case; false for shrink-wrap or a soft bag"
    )
    battery_under_deck: StrictBool | None = Field(
        None,
        description="the pack sits under the deck or frame, where ground strikes reach it; "
        "absent on a skateboard, taken as true",
    )

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
    conditions: Conditions | None = Field(
        None,
        description="the wettest riding it sees, which sets the minimum IP codes: dry (dry "
        "days only), damp (damp roads) or wet (wet roads, rain and spray)",
    )
    ambient_temperature: Temperature | None = Field(
        None, description="the hottest air it is ridden in", examples=["32 degC"]
    )
    steepest_grade: Grade | None = Field(
        None, description="the steepest hill it climbs, rise over run", examples=["12 %"]
    )
    rolling_resistance: StrictFloat | None = Field(
        None,
        gt=0,
        le=0.5,
        description="Crr: the tyres' rolling-resistance coefficient on the usual surface",
        examples=[0.012],
    )
    drag_area: DragArea | None = Field(
        None, description="drag coefficient times frontal area, rider aboard", examples=["0.55 m^2"]
    )
