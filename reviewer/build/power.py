"""The power train: pack, motors, drivetrain, controller and brake."""

import enum
from typing import Self

import pint
from pydantic import Field, model_validator

from reviewer.build.fields import (
    Charge,
    Current,
    Diameter,
    Duration,
    Fraction,
    Frequency,
    Kv,
    Name,
    Resistance,
    Rotation,
    SmallCurrent,
    Temperature,
    ThermalResistance,
    Voltage,
    _Model,
)


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
