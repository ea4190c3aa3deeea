"""The power path around the pack: its management system, the connectors and switches current
flows through, and the charger."""

import enum
from typing import Self

from pydantic import Field, StrictBool, model_validator

from reviewer.build.fields import Current, Name, Voltage, _Model

#: The one-line explanation when a build still has the yes/no ``bms`` field.
BMS_TABLE = (
    "battery.bms is a table now: [battery.bms] with its ratings (continuous_discharge_current, "
    "peak_discharge_current, charge_current, guards_discharge), or bms = { fitted = false } "
    "when the pack has none"
)


class Bms(_Model):
    fitted: StrictBool = Field(True, description="false: the pack has no BMS at all")
    guards_discharge: StrictBool | None = Field(
        None,
        description="it switches the discharge path off on a fault; false for a charge-only "
        "BMS (separate charge port) that guards charging alone",
    )
    continuous_discharge_current: Current | None = Field(
        None, description="the BMS datasheet's continuous discharge current", examples=["30 A"]
    )
    peak_discharge_current: Current | None = Field(
        None,
        description="the BMS datasheet's peak (short-time) discharge current",
        examples=["60 A"],
    )
    charge_current: Current | None = Field(
        None, description="the BMS datasheet's largest charge current", examples=["10 A"]
    )
    low_temperature_charge_cutoff: StrictBool | None = Field(
        None, description="it refuses charge below 0 degC (it has a temperature sensor for that)"
    )

    @model_validator(mode="after")
    def _none_fitted(self) -> Self:
        if not self.fitted:
            given = [n for n, v in self.model_dump().items() if n != "fitted" and v is not None]
            if given:
                raise ValueError(f"a BMS that is not fitted has no {given[0]}")
        return self


class ConnectorKind(enum.Enum):
    CONNECTOR = "connector"  # a plug and socket
    SWITCH = "switch"  # the main power switch or a loop key
    ANTI_SPARK = "anti-spark"  # a connector with a built-in pre-charge resistor


class ConnectorCircuit(enum.Enum):
    BATTERY = "battery"  # between the pack and the controller
    MOTOR = "motor"  # between the controller and a brushed motor
    PHASE = "phase"  # between the controller and a brushless motor
    CHARGE = "charge"  # the charge port


class Connector(_Model):
    name: Name = Field(description="what findings call it", examples=["main plug"])
    kind: ConnectorKind = Field(
        ConnectorKind.CONNECTOR,
        description="connector (a plug and socket), switch (the main power switch or a loop "
        "key) or anti-spark (a connector with a built-in pre-charge resistor)",
    )
    circuit: ConnectorCircuit = Field(
        description="battery (pack to controller), motor or phase (controller to a brushed or "
        "brushless motor) or charge (the charge port)"
    )
    motor: Name | None = Field(
        None, description="the motor a phase connector serves", examples=["front hub"]
    )
    current_rating: Current | None = Field(
        None, description="its datasheet continuous current per contact", examples=["50 A"]
    )
    voltage_rating: Voltage | None = Field(
        None, description="its datasheet DC voltage rating", examples=["75 V"]
    )
    precharge: StrictBool | None = Field(
        None,
        description="it charges the controller's capacitors through a resistor before the "
        "main contact closes (an anti-spark connector or a pre-charge switch)",
    )

    @property
    def precharges(self) -> bool | None:
        if self.kind is ConnectorKind.ANTI_SPARK:
            return True
        return self.precharge


class Charger(_Model):
    current: Current | None = Field(
        None, description="the charger's output current (its label)", examples=["2 A"]
    )
    port_current_rating: Current | None = Field(
        None, description="the charge port's datasheet current rating", examples=["8 A"]
    )
    port_voltage_rating: Voltage | None = Field(
        None, description="the charge port's datasheet DC voltage rating", examples=["50 V"]
    )
    separate_port: StrictBool | None = Field(
        None, description="it charges through its own port, bypassing the discharge path"
    )
