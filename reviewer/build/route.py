"""The ride a build is for: a route of segments, each a length at a grade."""

from pydantic import Field, StrictInt

from reviewer.build.fields import Distance, Name, SignedGrade, Speed, _Model


class RouteSegment(_Model):
    length: Distance = Field(
        description="the segment's length along the road, in km", examples=["1.2 km"]
    )
    grade: SignedGrade = Field(
        description="its average grade, rise over run, in %: positive uphill, negative downhill",
        examples=["6 %", "-4 %"],
    )
    speed: Speed | None = Field(
        None,
        description="the speed the rider aims for; absent, as fast as the drive goes (the "
        "drive sets the speed where it cannot reach it)",
        examples=["20 km/h"],
    )
    stops: StrictInt = Field(
        0,
        ge=0,
        le=1000,
        description="starts from rest along the segment (junctions, lights)",
        examples=[3],
    )


class Route(_Model):
    name: Name | None = Field(None, description="what the rider calls it", examples=["commute"])
    segments: list[RouteSegment] = Field(
        min_length=1,
        max_length=200,
        description="the route in riding order, one [[route.segments]] table each",
    )
