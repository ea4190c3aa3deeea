"""The power train: pack, motors, drivetrain and controller."""

import enum
from typing import Self

import pint
from pydantic import Field, StrictBool, StrictFloat, StrictInt, field_validator, model_validator

from reviewer import units as u
from reviewer.build.fields import (
    Charge,
    Current,
    Diameter,
    Duration,
    Fraction,
    Frequency,
    Inductance,
    Kv,
    Mass,
    Name,
    Resistance,
    Rotation,
    Temperature,
    ThermalResistance,
    Voltage,
    _Model,
)
from reviewer.build.power_path import BMS_TABLE, Bms


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
    chemistry: Chemistry = Field(
        description="li-ion, lipo (polymer pouch), lifepo4 (iron phosphate), nimh or lead-acid"
    )
    cells_series: StrictInt = Field(
        ge=1, le=40, description="cells in series (the 10 of a 10S3P pack)", examples=[10]
    )
    cells_parallel: StrictInt | None = Field(
        None,
        ge=1,
        le=40,
        description="strings of cells in parallel; left out, one string is taken for what the "
        "pack delivers and the pack's internal resistance is taken as unknown (the higher "
        "stall and fault current)",
        examples=[3],
    )
    cell_capacity: Charge | None = Field(
        None, description="one cell's rated capacity, from its datasheet", examples=["3500 mAh"]
    )
    cell_continuous_current: Current | None = Field(
        None, description="one cell's datasheet continuous discharge current", examples=["12 A"]
    )
    cell_c_rate: StrictFloat | None = Field(
        None, gt=0, le=500, description="continuous C-rating: 5.0 for 5C", examples=[5.0]
    )
    cell_internal_resistance: Resistance | None = Field(
        None,
        description="one cell's internal resistance, from its datasheet",
        examples=["0.025 ohm"],
    )
    cell_max_charge_current: Current | None = Field(
        None,
        description="the cell datasheet's largest charge current (regenerative braking charges "
        "the pack too)",
        examples=["4 A"],
    )
    bms: Bms | None = Field(None, description="the pack's BMS: its ratings, or fitted = false")
    low_voltage_cutoff: Voltage | None = Field(
        None, description="pack-level cut-off setting (BMS or controller)", examples=["30 V"]
    )
    charger_voltage: Voltage | None = Field(
        None, description="the charger's end-of-charge voltage", examples=["42 V"]
    )

    @field_validator("bms", mode="before")
    @classmethod
    def _bms_table(cls, value: object) -> object:
        if isinstance(value, bool):
            raise ValueError(BMS_TABLE)
        return value


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
    fan: StrictBool = Field(False, description="the motor has its own shaft fan or forced air")
    fan_independent: StrictBool = Field(
        False,
        description="the fan has its own drive and turns while the motor stands still "
        "(IC416); a shaft fan (the default) moves no air at a stall",
    )
    inlet_blocked: StrictBool = Field(False, description="a housing or deck covers its air inlet")
    outlet_blocked: StrictBool = Field(False, description="a housing covers its air outlet")
    blocked_cooling_factor: StrictFloat | None = Field(
        None,
        gt=0,
        le=1,
        description="heat-loss coefficient with blocked airflow over the open figure; "
        "default comes from the profile",
        examples=[0.6],
    )


class Motor(_Model):
    name: Name = Field("motor", description="what findings call it", examples=["rear"])
    type: MotorType = Field(description="brushed (two leads) or brushless (three phase leads)")
    kv: Kv | None = Field(
        None, description="datasheet speed constant, no-load rpm per volt", examples=["150 rpm/V"]
    )
    no_load_speed: Rotation | None = Field(
        None, description="at rated_voltage, no load", examples=["3200 rpm"]
    )
    rated_voltage: Voltage | None = Field(
        None, description="the datasheet's rated voltage", examples=["36 V"]
    )
    winding_resistance: Resistance | None = Field(
        None,
        description="terminal to terminal at 20 degC: for a brushless motor line to line "
        "(twice the phase resistance of a star winding)",
        examples=["0.28 ohm"],
    )
    winding_inductance: Inductance | None = Field(
        None,
        description="terminal to terminal (line to line for a brushless motor), from the "
        "motor's datasheet or an LCR meter",
        examples=["85 uH"],
    )
    pole_pairs: StrictInt | None = Field(
        None,
        ge=1,
        le=100,
        description="magnet pole pairs (a brushless motor's poles / 2)",
        examples=[7],
    )
    no_load_current: Current | None = Field(
        None, description="the datasheet's current at rated_voltage, no load", examples=["1.2 A"]
    )
    rated_current: Current | None = Field(
        None, description="rated continuous current (datasheet)", examples=["13 A"]
    )
    insulation_class: InsulationClass | None = Field(
        None, description="winding class, IEC 60085: A 105, E 120, B 130, F 155, H 180, N 200 degC"
    )
    thermal_time_constant: Duration | None = Field(
        None,
        description="the winding's thermal time constant (its datasheet, or a heating test: "
        "63 % of the final rise); absent, estimated from mass",
        examples=["12 min"],
    )
    mass: Mass | None = Field(None, description="the motor's mass", examples=["2.8 kg"])
    temperature_sensor: StrictBool | None = Field(
        None,
        description="a winding temperature sensor the controller reads and cuts current back on",
    )
    cooling: Cooling = Field(Cooling(), description="its fan and what blocks its air")

    @model_validator(mode="after")
    def _speed_constant(self) -> Self:
        if self.kv is None and self.no_load_speed is not None and self.rated_voltage is None:
            raise ValueError("no_load_speed needs rated_voltage to give the motor's Kv")
        if (
            self.kv is None
            and self.rated_voltage is not None
            and self.no_load_current is not None
            and self.winding_resistance is not None
            and self.no_load_current.m_as("A") * self.winding_resistance.m_as("ohm")
            >= self.rated_voltage.m_as("V")
        ):
            raise ValueError("no_load_current x winding_resistance must be below rated_voltage")
        return self

    @property
    def effective_kv(self) -> pint.Quantity | None:
        """Kv given, or from the no-load speed: n0 / (V - I0 R), the no-load current's own drop
        taken out once (reviewer.engineering.brushless.kv_from_no_load)."""
        from reviewer.engineering.brushless import kv_from_no_load

        if self.kv is not None:
            return self.kv
        if self.no_load_speed is not None and self.rated_voltage is not None:
            no_load = self.no_load_current.m_as("A") if self.no_load_current is not None else 0.0
            resistance = (
                self.winding_resistance.m_as("ohm") if self.winding_resistance is not None else 0.0
            )
            kv = kv_from_no_load(
                self.no_load_speed.m_as("rpm"), self.rated_voltage.m_as("V"), no_load, resistance
            )
            return u.quantity(kv, "rpm/V")
        return None


class Drivetrain(_Model):
    motor_pulley_teeth: StrictInt | None = Field(
        None, ge=5, le=200, description="teeth of the motor's pulley or sprocket", examples=[15]
    )
    wheel_pulley_teeth: StrictInt | None = Field(
        None, ge=5, le=400, description="teeth of the wheel's pulley or sprocket", examples=[44]
    )
    ratio: StrictFloat | None = Field(
        None, gt=0.05, le=100, description="motor turns per wheel turn", examples=[2.9]
    )
    wheel_diameter: Diameter | None = Field(
        None, description="the driven wheel's outer diameter, tyre inflated", examples=["200 mm"]
    )
    efficiency: Fraction | None = Field(
        None, description="wheel power over motor shaft power", examples=["92 %"]
    )
    hub_motor: StrictBool = Field(False, description="the motor is in the wheel: ratio 1")

    @model_validator(mode="after")
    def _one_ratio(self) -> Self:
        teeth = (self.motor_pulley_teeth, self.wheel_pulley_teeth)
        if self.hub_motor and (self.ratio not in (None, 1.0) or any(t is not None for t in teeth)):
            raise ValueError("a hub motor turns with its wheel: give no ratio or pulleys")
        if self.ratio is not None and any(t is not None for t in teeth):
            raise ValueError("give either ratio or the two pulley tooth counts, not both")
        if (teeth[0] is None) != (teeth[1] is None):
            raise ValueError("give both motor_pulley_teeth and wheel_pulley_teeth")
        return self

    @property
    def reduction(self) -> float | None:
        """Motor turns per wheel turn."""
        if self.hub_motor:
            return 1.0
        if self.ratio is not None:
            return self.ratio
        if self.motor_pulley_teeth and self.wheel_pulley_teeth:
            return self.wheel_pulley_teeth / self.motor_pulley_teeth
        return None


class LimitKind(enum.Enum):
    HARDWARE = "hardware"
    SOFTWARE = "software"


class DriveKind(enum.Enum):
    """How the controller drives the motor (brief 11)."""

    BRUSHED = "brushed"  # a PWM switch on a brushed motor
    SIX_STEP = "six-step"  # trapezoidal commutation of a brushless motor
    FIELD_ORIENTED = "field-oriented"  # sinusoidal (FOC) drive of a brushless motor


class CurrentBasis(enum.Enum):
    PEAK = "peak"
    RMS = "rms"


SPLIT_LIMIT = (
    "controller.current_limit is split in two: motor_current_limit (the motor current, the "
    "phase current for a brushless motor: it sets torque and heats the winding) and "
    "battery_current_limit (what the controller draws from the pack)"
)


class Controller(_Model):
    motor_current_limit: Current | None = Field(
        None,
        description="per motor: the motor current the controller holds; for a brushless motor "
        "the phase current (say peak or rms in motor_current_basis); absent means none",
        examples=["35 A"],
    )
    motor_current_basis: CurrentBasis | None = Field(
        None, description="whether a field-oriented controller's phase limit is peak or rms"
    )
    battery_current_limit: Current | None = Field(
        None,
        description="per motor: the current the controller draws from the pack at most",
        examples=["15 A"],
    )
    drive: DriveKind | None = Field(
        None,
        description="how the controller drives the motor: brushed, six-step (trapezoidal) or "
        "field-oriented (sinusoidal); absent, the review takes the worse reading per check",
    )
    current_limit_kind: LimitKind | None = Field(
        None,
        description="hardware (a comparator acting within current_limit_response) or software "
        "(acting no sooner than its averaging window); absent is taken as software",
    )
    current_limit_response: Duration | None = Field(
        None, description="time from overcurrent to the limit acting", examples=["50 us"]
    )
    rated_continuous_current: Current | None = Field(
        None,
        description="the controller's datasheet continuous (motor or phase) current",
        examples=["25 A"],
    )
    peak_current: Current | None = Field(
        None, description="the datasheet peak current", examples=["45 A"]
    )
    peak_duration: Duration | None = Field(
        None, description="how long the datasheet peak current may last", examples=["10 s"]
    )
    max_input_voltage: Voltage | None = Field(
        None, description="the datasheet's highest input (pack) voltage", examples=["60 V"]
    )
    stall_cutoff_time: Duration | None = Field(
        None,
        description="the controller cuts drive after the motor stands still under current "
        "this long (its stall protection)",
        examples=["3 s"],
    )
    thermal_cutback: StrictBool | None = Field(
        None, description="it reduces current as it overheats (its datasheet says so)"
    )
    regen: StrictBool | None = Field(None, description="it brakes by driving current into the pack")
    regen_current_limit: Current | None = Field(
        None,
        description="the most battery current regenerative braking drives into the pack",
        examples=["5 A"],
    )
    max_duty: Fraction | None = Field(None, description="its largest PWM duty", examples=["95 %"])
    pwm_frequency: Frequency | None = Field(
        None, description="its switching (PWM) frequency", examples=["18 kHz"]
    )
    switch_on_resistance: Resistance | None = Field(
        None, description="a power switch's datasheet R_DS(on)", examples=["0.004 ohm"]
    )
    switch_max_voltage: Voltage | None = Field(
        None, description="a switch's datasheet V_DS rating", examples=["80 V"]
    )
    switch_max_current: Current | None = Field(
        None, description="a switch's datasheet continuous drain current", examples=["120 A"]
    )
    switch_max_junction_temperature: Temperature | None = Field(
        None, description="a switch's datasheet maximum junction temperature", examples=["175 degC"]
    )
    switch_thermal_resistance_junction_case: ThermalResistance | None = Field(
        None, description="a switch's datasheet R_thJC", examples=["0.9 K/W"]
    )
    switch_thermal_resistance_case_sink: ThermalResistance | None = Field(
        None, description="case to heat sink, through its pad or paste", examples=["0.6 K/W"]
    )
    switch_thermal_resistance_sink_air: ThermalResistance | None = Field(
        None, description="heat sink (or the case) to air", examples=["3 K/W"]
    )
    switch_rise_time: Duration | None = Field(
        None, description="a switch's datasheet rise time", examples=["40 ns"]
    )
    switch_fall_time: Duration | None = Field(
        None, description="a switch's datasheet fall time", examples=["30 ns"]
    )
    freewheel_diode: StrictBool | None = Field(
        None, description="a brushed drive has a diode across the motor"
    )
    diode_reverse_voltage: Voltage | None = Field(
        None, description="that diode's datasheet reverse voltage", examples=["100 V"]
    )
    diode_average_current: Current | None = Field(
        None, description="that diode's datasheet average current", examples=["16 A"]
    )
    diode_peak_current: Current | None = Field(
        None, description="that diode's datasheet peak current", examples=["150 A"]
    )
    current_sensor_range: Current | None = Field(
        None, description="the current sensor's full scale", examples=["75 A"]
    )
    current_samples_averaged: StrictInt | None = Field(
        None, ge=1, le=1_000_000, description="samples a software limit averages", examples=[16]
    )
    current_sample_rate: Frequency | None = Field(
        None, description="how often it samples the current", examples=["40 kHz"]
    )

    @model_validator(mode="before")
    @classmethod
    def _old_limit(cls, data: object) -> object:
        if isinstance(data, dict) and "current_limit" in data:
            raise ValueError(SPLIT_LIMIT)
        return data
