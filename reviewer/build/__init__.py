"""The build file: one vehicle described once, validated into frozen pydantic models.

Every quantity and code is parsed here, once (:mod:`reviewer.build.fields`): quantities into
pint quantities in a fixed unit, wire gauges and IP codes into structured values. Absent fields
are allowed: the rules that need them report ``unassessed`` and name the field. Unknown keys are
errors (a misspelt key would otherwise silently drop a limit). One module per section:
``vehicle`` (vehicle, riders, use, housing), ``power`` (pack, motors, drivetrain, controller),
``brakes``, ``logic`` (the logic board), ``wiring`` (wires and fuses), ``power_path`` (BMS,
connectors, charger), ``control`` (throttle and kill switch), ``wheels``.
"""

from typing import Self

from pydantic import Field, field_validator, model_validator
from pydantic.json_schema import SkipJsonSchema

from reviewer.build.brakes import ONE_BRAKE_TABLE, Brake, BrakeKind, BrakePosition
from reviewer.build.control import Control, ThrottleKind
from reviewer.build.fields import MAX_ITEMS, MAX_RIDERS, Name, WireGauge, _Model
from reviewer.build.logic import Logic, PinLoad, PortGroup, Regulator
from reviewer.build.power import (
    Battery,
    Chemistry,
    Controller,
    Cooling,
    CurrentBasis,
    DriveKind,
    Drivetrain,
    InsulationClass,
    LimitKind,
    Motor,
    MotorType,
)
from reviewer.build.power_path import Bms, Charger, Connector, ConnectorCircuit, ConnectorKind
from reviewer.build.route import Route, RouteSegment
from reviewer.build.vehicle import (
    Conditions,
    Enclosure,
    Rider,
    RiderClass,
    Usage,
    Vehicle,
    VehicleKind,
)
from reviewer.build.wheels import Wheel, WheelPosition
from reviewer.build.wiring import Circuit, Fuse, Insulation, Wire

__all__ = [
    "Battery",
    "Bms",
    "Brake",
    "BrakeKind",
    "BrakePosition",
    "Build",
    "Charger",
    "Chemistry",
    "Circuit",
    "Conditions",
    "Connector",
    "ConnectorCircuit",
    "ConnectorKind",
    "Control",
    "Controller",
    "Cooling",
    "CurrentBasis",
    "DriveKind",
    "Drivetrain",
    "Enclosure",
    "Fuse",
    "Insulation",
    "InsulationClass",
    "LimitKind",
    "Logic",
    "Motor",
    "MotorType",
    "PinLoad",
    "PortGroup",
    "Regulator",
    "Rider",
    "RiderClass",
    "Route",
    "RouteSegment",
    "ThrottleKind",
    "Usage",
    "Vehicle",
    "VehicleKind",
    "Wheel",
    "WheelPosition",
    "Wire",
    "WireGauge",
    "build_json_schema",
]


class Build(_Model):
    """One vehicle, as its builder describes it."""

    vehicle: Vehicle = Field(description="the vehicle: its name, kind and mass")
    riders: list[Rider] = Field(
        default_factory=list,
        max_length=MAX_RIDERS,
        description="everyone who rides it, one [[riders]] table each",
    )
    battery: Battery | None = Field(
        None, description="the traction pack: its cells and their datasheet ratings"
    )
    motors: list[Motor] = Field(
        default_factory=list, max_length=8, description="each motor, one [[motors]] table each"
    )
    drivetrain: Drivetrain | None = Field(
        None, description="how the motor turns the wheel: pulleys or ratio, wheel diameter"
    )
    controller: Controller | None = Field(
        None, description="the motor controller: its current limits and datasheet ratings"
    )
    brakes: list[Brake] | None = Field(
        None,
        max_length=MAX_ITEMS,
        description="every brake, one [[brakes]] table each; brakes = [] declares none",
    )
    brake: SkipJsonSchema[dict[str, object] | None] = Field(None, exclude=True)
    logic: Logic | None = Field(
        None, description="the logic board that reads the controls: its pins, loads, regulator"
    )
    control: Control | None = Field(
        None, description="the throttle and what stops the drive when its command goes wrong"
    )
    connectors: list[Connector] | None = Field(
        None,
        max_length=MAX_ITEMS,
        description="every connector and switch in the power path; connectors = [] for none",
    )
    charger: Charger | None = Field(None, description="the charger and its charge port")
    route: Route | None = Field(
        None, description="the ride the build is for; absent, the profile's reference route"
    )
    wheels: list[Wheel] | None = Field(
        None, max_length=MAX_ITEMS, description="each wheel or tyre kind, by axle"
    )
    wires: list[Wire] = Field(
        default_factory=list,
        max_length=MAX_ITEMS,
        description="each wire of the power and logic circuits, one [[wires]] table each",
    )
    fuses: list[Fuse] = Field(
        default_factory=list,
        max_length=MAX_ITEMS,
        description="each fuse or breaker, one [[fuses]] table each",
    )
    enclosure: Enclosure | None = Field(
        None, description="how the electronics and the pack are housed: IP codes, the pack's case"
    )
    usage: Usage = Field(
        Usage(), description="where it is ridden: wet or dry, heat, hills, rolling and air drag"
    )
    extensions: dict[Name, dict[str, object]] = Field(
        default_factory=dict,
        max_length=MAX_ITEMS,
        description="inputs of installed rule packs, one [extensions.<pack>] table each; "
        "each pack validates its own table (see reviewer.extensions)",
    )

    def relay_brakes(self) -> list[tuple[int, Brake]]:
        """Each dynamic brake the build says anything of its relay for, with its index."""
        return [
            (index, brake)
            for index, brake in enumerate(self.brakes or ())
            if brake.kind is BrakeKind.DYNAMIC
            and any(
                value is not None
                for value in (
                    brake.relay_contact_rating,
                    brake.relay_contact_voltage,
                    brake.coil_current,
                )
            )
        ]

    @field_validator("brake", mode="before")
    @classmethod
    def _one_brake_table(cls, value: object) -> object:
        raise ValueError(ONE_BRAKE_TABLE)

    @model_validator(mode="after")
    def _cross_references(self) -> Self:
        regenerative = [b for b in self.brakes or () if b.kind is BrakeKind.REGENERATIVE]
        if regenerative and self.controller is not None and self.controller.regen is False:
            raise ValueError("a regenerative brake is listed but controller.regen is false")
        brake_names = [b.name for b in self.brakes or () if b.name is not None]
        if len(set(brake_names)) != len(brake_names):
            raise ValueError("brake names must be unique")
        names = [m.name for m in self.motors]
        if len(set(names)) != len(names):
            raise ValueError("motor names must be unique")
        wire_names = [w.name for w in self.wires]
        if len(set(wire_names)) != len(wire_names):
            raise ValueError("wire names must be unique")
        for wire in self.wires:
            if wire.motor is not None and wire.motor not in names:
                raise ValueError(f"wire {wire.name!r} names motor {wire.motor!r}, not in motors")
            if (
                wire.circuit in (Circuit.MOTOR, Circuit.PHASE)
                and wire.motor is None
                and len(names) > 1
            ):
                raise ValueError(
                    f"wire {wire.name!r} is on the {wire.circuit.value} circuit of a build with "
                    "several motors: name its motor"
                )
        for connector in self.connectors or ():
            if connector.motor is not None and connector.motor not in names:
                raise ValueError(
                    f"connector {connector.name!r} names motor {connector.motor!r}, not in motors"
                )
        for fuse in self.fuses:
            for name in fuse.protects:
                if name not in wire_names:
                    raise ValueError(f"fuse {fuse.name!r} protects {name!r}, not in wires")
        return self


def build_json_schema() -> dict[str, object]:
    """The build file's JSON Schema. TOML has no null, so optional fields are simply optional:
    drop the ``null`` branch pydantic adds for ``X | None``."""

    def strip_null(node: object) -> object:
        if isinstance(node, dict):
            options = node.get("anyOf")
            if isinstance(options, list):
                kept = [o for o in options if o != {"type": "null"}]
                if len(kept) == 1 and len(kept) != len(options):
                    merged = {k: v for k, v in node.items() if k != "anyOf"}
                    own = merged.get("description")
                    merged.update({k: v for k, v in kept[0].items() if k not in merged})
                    kind = kept[0].get("description")
                    if own and kind and kind != own:  # the field's words, then its type's
                        merged["description"] = f"{own}. {kind[0].upper()}{kind[1:]}"
                    node = merged
            if isinstance(node, dict):
                if node.get("default", 0) is None:
                    node = {k: v for k, v in node.items() if k != "default"}
                return {k: strip_null(v) for k, v in node.items()}
        if isinstance(node, list):
            return [strip_null(item) for item in node]
        return node

    schema = strip_null(Build.model_json_schema(by_alias=True))
    assert isinstance(schema, dict)
    schema["$schema"] = "https://json-schema.org/draft/2020-12/schema"
    schema["title"] = "firstride build file"
    return schema
