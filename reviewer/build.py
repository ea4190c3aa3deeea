"""The build file: one vehicle described once, validated into frozen pydantic models.

Every quantity is parsed here, once, into a pint quantity in a fixed unit. Absent fields are
allowed: the rules that need them report ``unassessed`` and name the field. Unknown keys are
errors (a misspelt key would otherwise silently drop a limit).
"""

import enum
from typing import Annotated, Literal, Self

import pint
from pydantic import BaseModel, ConfigDict, Field, field_validator, model_validator

from reviewer import units as u
from reviewer.engineering.ingress import IngressCode, parse_ip_code

MAX_NAME = 80
MAX_TEXT = 400
MAX_RIDERS = 12
MAX_ITEMS = 64

Name = Annotated[str, Field(min_length=1, max_length=MAX_NAME)]
Text = Annotated[str, Field(max_length=MAX_TEXT)]


def _q(dimension: u.Dimension) -> object:
    return u.QuantityField(dimension)


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


class Chemistry(enum.Enum):
    LI_ION = "li-ion"
    LIPO = "lipo"
    LIFEPO4 = "lifepo4"
    NIMH = "nimh"
    LEAD_ACID = "lead-acid"

    @property
    def is_lithium(self) -> bool:
        return self in (Chemistry.LI_ION, Chemistry.LIPO, Chemistry.LIFEPO4)


class Battery(_Model):
    chemistry: Chemistry
    cells_series: int = Field(ge=1, le=40)
    cells_parallel: int = Field(1, ge=1, le=40)
    cell_capacity: Charge | None = None
    cell_continuous_current: Current | None = None
    cell_c_rate: float | None = Field(None, gt=0, le=500, description="continuous C-rating")
    cell_internal_resistance: Resistance | None = None
    bms: bool | None = Field(None, description="a battery management system is fitted")
    low_voltage_cutoff: Voltage | None = Field(None, description="pack-level cut-off setting")
    charger_voltage: Voltage | None = None


class MotorType(enum.Enum):
    BRUSHED = "brushed"
    BRUSHLESS = "brushless"


class InsulationClass(enum.Enum):
    """IEC 60085 thermal classes, by letter; the value is the class temperature in degC."""

    A = "A"
    E = "E"
    B = "B"
    F = "F"
    H = "H"
    N = "N"


class Cooling(_Model):
    fan: bool = Field(False, description="the motor has its own shaft fan or forced air")
    inlet_blocked: bool = False
    outlet_blocked: bool = False
    blocked_cooling_factor: float | None = Field(
        None,
        gt=0,
        le=1,
        description="heat-loss coefficient with blocked airflow over the open figure; "
        "default comes from the profile",
    )


class Motor(_Model):
    name: Name = "motor"
    type: MotorType
    kv: Kv | None = None
    no_load_speed: Rotation | None = Field(None, description="at rated_voltage, no load")
    rated_voltage: Voltage | None = None
    winding_resistance: Resistance | None = Field(None, description="terminal to terminal, 20 degC")
    no_load_current: Current | None = None
    rated_current: Current | None = Field(None, description="rated continuous current")
    insulation_class: InsulationClass | None = None
    cooling: Cooling = Cooling()

    @model_validator(mode="after")
    def _speed_constant(self) -> Self:
        if self.kv is None and self.no_load_speed is not None and self.rated_voltage is None:
            raise ValueError("no_load_speed needs rated_voltage to give the motor's Kv")
        return self

    @property
    def effective_kv(self) -> pint.Quantity | None:
        """Kv given, or no-load speed over rated voltage (brushed motors are specified so)."""
        if self.kv is not None:
            return self.kv
        if self.no_load_speed is not None and self.rated_voltage is not None:
            return (self.no_load_speed / self.rated_voltage).to("rpm/V")
        return None


class Drivetrain(_Model):
    motor_pulley_teeth: int | None = Field(None, ge=5, le=200)
    wheel_pulley_teeth: int | None = Field(None, ge=5, le=400)
    ratio: float | None = Field(None, gt=0.05, le=100, description="motor turns per wheel turn")
    wheel_diameter: Diameter | None = None
    efficiency: Fraction | None = None

    @model_validator(mode="after")
    def _one_ratio(self) -> Self:
        teeth = (self.motor_pulley_teeth, self.wheel_pulley_teeth)
        if self.ratio is not None and any(t is not None for t in teeth):
            raise ValueError("give either ratio or the two pulley tooth counts, not both")
        if (teeth[0] is None) != (teeth[1] is None):
            raise ValueError("give both motor_pulley_teeth and wheel_pulley_teeth")
        return self

    @property
    def reduction(self) -> float | None:
        """Motor turns per wheel turn."""
        if self.ratio is not None:
            return self.ratio
        if self.motor_pulley_teeth and self.wheel_pulley_teeth:
            return self.wheel_pulley_teeth / self.motor_pulley_teeth
        return None


class LimitKind(enum.Enum):
    HARDWARE = "hardware"
    SOFTWARE = "software"


class Controller(_Model):
    current_limit: Current | None = Field(None, description="per motor; absent means none")
    current_limit_kind: LimitKind | None = None
    current_limit_response: Duration | None = Field(
        None, description="time from overcurrent to the limit acting"
    )
    max_duty: Fraction | None = None
    pwm_frequency: Frequency | None = None
    switch_on_resistance: Resistance | None = None
    switch_max_voltage: Voltage | None = None
    switch_max_current: Current | None = None
    switch_max_junction_temperature: Temperature | None = None
    switch_thermal_resistance_junction_case: ThermalResistance | None = None
    switch_thermal_resistance_case_sink: ThermalResistance | None = None
    switch_thermal_resistance_sink_air: ThermalResistance | None = None
    switch_rise_time: Duration | None = None
    switch_fall_time: Duration | None = None
    freewheel_diode: bool | None = None
    diode_reverse_voltage: Voltage | None = None
    diode_average_current: Current | None = None
    diode_peak_current: Current | None = None
    current_sensor_range: Current | None = None
    current_samples_averaged: int | None = Field(None, ge=1, le=1_000_000)
    current_sample_rate: Frequency | None = None


class BrakeKind(enum.Enum):
    DYNAMIC = "dynamic"
    FRICTION = "friction"
    REGENERATIVE = "regenerative"
    NONE = "none"


class Brake(_Model):
    kind: BrakeKind
    friction_brake: bool | None = Field(None, description="a friction brake besides this one")
    relay_contact_rating: Current | None = Field(None, description="DC rating of the contacts")
    relay_contact_voltage: Voltage | None = None
    coil_current: SmallCurrent | None = None
    brake_resistance: Resistance | None = Field(None, description="added resistor, if any")


class Regulator(_Model):
    kind: Literal["linear", "switching"]
    input_max: Voltage | None = None
    output_voltage: Voltage | None = None
    quiescent_current: SmallCurrent | None = None
    thermal_resistance: ThermalResistance | None = Field(None, description="junction to air")
    max_junction_temperature: Temperature | None = None
    fed_from_pack: bool = True
    input_voltage: Voltage | None = Field(
        None, description="what feeds it when it is not fed from the traction pack"
    )


class PortGroup(_Model):
    name: Name
    pins: list[Name] = Field(min_length=1, max_length=MAX_ITEMS)
    current_max: SmallCurrent


class PinLoad(_Model):
    name: Name
    pins: list[Name] = Field(min_length=1, max_length=MAX_ITEMS)
    current: SmallCurrent
    inductive: bool = False
    flyback_diode: bool | None = None
    driver: Literal["pin", "transistor", "mosfet", "driver-ic"] = "pin"


class Logic(_Model):
    supply_voltage: Voltage | None = None
    pins: list[Name] | None = Field(None, max_length=256, description="pins the part has")
    pin_current_max: SmallCurrent | None = Field(None, description="absolute maximum per pin")
    total_current_max: SmallCurrent | None = None
    port_groups: list[PortGroup] = Field(default_factory=list, max_length=MAX_ITEMS)
    loads: list[PinLoad] = Field(default_factory=list, max_length=MAX_ITEMS)
    board_current: SmallCurrent | None = Field(None, description="logic, sensors and radio")
    regulator: Regulator | None = None

    @model_validator(mode="after")
    def _known_pins(self) -> Self:
        if self.pins is None:
            return self
        known = set(self.pins)
        for group in self.port_groups:
            for pin in group.pins:
                if pin not in known:
                    raise ValueError(f"port group {group.name!r} names pin {pin!r}, not in pins")
        for load in self.loads:
            for pin in load.pins:
                if pin not in known:
                    raise ValueError(
                        f"load {load.name!r} is on pin {pin!r}, which the part does not have "
                        f"(pins: {', '.join(self.pins[:12])}{'...' if len(self.pins) > 12 else ''})"
                    )
        return self


class Circuit(enum.Enum):
    BATTERY = "battery"
    MOTOR = "motor"
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
    circuit: Circuit
    motor: Name | None = Field(None, description="for motor-circuit wires in a multi-motor build")
    gauge: str | None = Field(None, max_length=12, description="AWG, e.g. '12 AWG' or '2/0 AWG'")
    cross_section: Area | None = None
    length: Length
    insulation: Insulation | None = None
    temperature_rating: Temperature | None = None
    bundled_with: int = Field(0, ge=0, le=100, description="other loaded conductors alongside")
    rated_ampacity: Current | None = Field(None, description="from the wire's own datasheet")

    @field_validator("gauge")
    @classmethod
    def _gauge(cls, value: str | None) -> str | None:
        if value is None:
            return None
        from reviewer.engineering.conductors import parse_awg

        parse_awg(value)  # raises ValueError with a clear message
        return value

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
        from reviewer.engineering.conductors import awg_area

        return u.quantity(awg_area(self.gauge or ""), "mm**2")


class Fuse(_Model):
    name: Name
    location: Literal["battery-positive", "battery-negative", "motor", "logic", "other"]
    rating: Current
    voltage_rating: Voltage | None = None
    breaking_capacity: Current | None = None
    clearing_time: Duration | None = Field(None, description="at the stall current, from its curve")
    protects: list[Name] = Field(default_factory=list, max_length=MAX_ITEMS)


class Enclosure(_Model):
    electronics_ip: str | None = Field(None, max_length=16)
    battery_ip: str | None = Field(None, max_length=16)
    battery_hard_case: bool | None = None
    battery_under_deck: bool | None = None

    @field_validator("electronics_ip", "battery_ip")
    @classmethod
    def _ip(cls, value: str | None) -> str | None:
        if value is not None:
            parse_ip_code(value)
        return value

    @property
    def electronics(self) -> IngressCode | None:
        return parse_ip_code(self.electronics_ip) if self.electronics_ip else None

    @property
    def battery(self) -> IngressCode | None:
        return parse_ip_code(self.battery_ip) if self.battery_ip else None


class Conditions(enum.Enum):
    DRY = "dry"
    DAMP = "damp"
    WET = "wet"


class Usage(_Model):
    conditions: Conditions | None = None
    ambient_temperature: Temperature | None = None
    steepest_grade: Grade | None = None
    rolling_resistance: float | None = Field(None, gt=0, le=0.5, description="Crr")
    drag_area: DragArea | None = None


class Build(_Model):
    """One vehicle, as its builder describes it."""

    vehicle: Vehicle
    riders: list[Rider] = Field(default_factory=list, max_length=MAX_RIDERS)
    battery: Battery | None = None
    motors: list[Motor] = Field(default_factory=list, max_length=8)
    drivetrain: Drivetrain | None = None
    controller: Controller | None = None
    brake: Brake | None = None
    logic: Logic | None = None
    wires: list[Wire] = Field(default_factory=list, max_length=MAX_ITEMS)
    fuses: list[Fuse] = Field(default_factory=list, max_length=MAX_ITEMS)
    enclosure: Enclosure | None = None
    usage: Usage = Usage()
    extensions: dict[Name, dict[str, object]] = Field(
        default_factory=dict,
        max_length=MAX_ITEMS,
        description="inputs of installed rule packs, one [extensions.<pack>] table each; "
        "each pack validates its own table (see reviewer.extensions)",
    )

    @model_validator(mode="after")
    def _cross_references(self) -> Self:
        names = [m.name for m in self.motors]
        if len(set(names)) != len(names):
            raise ValueError("motor names must be unique")
        wire_names = [w.name for w in self.wires]
        if len(set(wire_names)) != len(wire_names):
            raise ValueError("wire names must be unique")
        for wire in self.wires:
            if wire.motor is not None and wire.motor not in names:
                raise ValueError(f"wire {wire.name!r} names motor {wire.motor!r}, not in motors")
            if wire.circuit is Circuit.MOTOR and wire.motor is None and len(names) > 1:
                raise ValueError(
                    f"wire {wire.name!r} is on the motor circuit of a build with several motors: "
                    "name its motor"
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
                    merged.update(kept[0])
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
