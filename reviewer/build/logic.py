"""The logic board: its pins, their loads and the regulator that feeds it."""

from typing import Literal, Self

from pydantic import Field, StrictBool, model_validator

from reviewer.build.fields import (
    MAX_ITEMS,
    Name,
    SmallCurrent,
    Temperature,
    ThermalResistance,
    Voltage,
    _Model,
)


class Regulator(_Model):
    kind: Literal["linear", "switching"]
    input_max: Voltage | None = None
    output_voltage: Voltage | None = None
    quiescent_current: SmallCurrent | None = None
    thermal_resistance: ThermalResistance | None = Field(None, description="junction to air")
    max_junction_temperature: Temperature | None = None
    fed_from_pack: StrictBool = True
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
    inductive: StrictBool | None = Field(
        None,
        description="a relay, solenoid or motor coil (true) or not (false); left out, the "
        "load is not passed unless a flyback diode is fitted and it is not pin-driven",
    )
    flyback_diode: StrictBool | None = None
    driver: Literal["pin", "transistor", "mosfet", "driver-ic"] = "pin"


class Logic(_Model):
    present: StrictBool = Field(
        True,
        description="false when there is no separate logic board (a sealed controller and "
        "its own remote or throttle): the logic checks then say so and pass",
    )
    supply_voltage: Voltage | None = None
    pins: list[Name] | None = Field(None, max_length=256, description="pins the part has")
    pin_current_max: SmallCurrent | None = Field(None, description="absolute maximum per pin")
    total_current_max: SmallCurrent | None = None
    port_groups: list[PortGroup] = Field(default_factory=list, max_length=MAX_ITEMS)
    loads: list[PinLoad] = Field(default_factory=list, max_length=MAX_ITEMS)
    board_current: SmallCurrent | None = Field(None, description="logic, sensors and radio")
    regulator: Regulator | None = None

    @model_validator(mode="after")
    def _absent_board(self) -> Self:
        if not self.present and any(
            (self.pins, self.port_groups, self.loads, self.board_current, self.regulator)
        ):
            raise ValueError(
                "logic.present = false says there is no logic board: remove its pins, port "
                "groups, loads, board current and regulator, or set present = true"
            )
        return self

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
