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
    kind: Literal["linear", "switching"] = Field(
        description="linear (it drops the excess voltage as heat) or switching (a buck converter)"
    )
    input_max: Voltage | None = Field(
        None, description="its datasheet's highest input voltage", examples=["40 V"]
    )
    output_voltage: Voltage | None = Field(
        None, description="what it supplies the logic board", examples=["5 V"]
    )
    quiescent_current: SmallCurrent | None = Field(
        None, description="its own draw with no load, from its datasheet", examples=["5 mA"]
    )
    thermal_resistance: ThermalResistance | None = Field(
        None, description="junction to air, from its datasheet", examples=["60 K/W"]
    )
    max_junction_temperature: Temperature | None = Field(
        None, description="its datasheet's maximum junction temperature", examples=["125 degC"]
    )
    fed_from_pack: StrictBool = Field(
        True, description="it is fed from the traction pack; false: give input_voltage"
    )
    input_voltage: Voltage | None = Field(
        None,
        description="what feeds it when it is not fed from the traction pack",
        examples=["12 V"],
    )


class PortGroup(_Model):
    name: Name = Field(description="the port as the part's datasheet names it", examples=["PORTB"])
    pins: list[Name] = Field(
        min_length=1,
        max_length=MAX_ITEMS,
        description="its pins, as named in logic.pins",
        examples=[["PB0", "PB1", "PB2"]],
    )
    current_max: SmallCurrent = Field(
        description="the datasheet's absolute maximum for its pins together, in mA",
        examples=["100 mA"],
    )


class PinLoad(_Model):
    name: Name = Field(description="what the load is", examples=["brake light"])
    pins: list[Name] = Field(
        min_length=1,
        max_length=MAX_ITEMS,
        description="the pins that drive it, as named in logic.pins",
        examples=[["D7"]],
    )
    current: SmallCurrent = Field(description="what the load draws, in mA", examples=["18 mA"])
    inductive: StrictBool | None = Field(
        None,
        description="a relay, solenoid or motor coil (true) or not (false); left out, the "
        "load is not passed unless a flyback diode is fitted and it is not pin-driven",
    )
    flyback_diode: StrictBool | None = Field(
        None, description="a diode across the coil carries its current at switch-off"
    )
    driver: Literal["pin", "transistor", "mosfet", "driver-ic"] = Field(
        "pin",
        description="what switches it: pin (the pin itself), transistor (a bipolar transistor "
        "the pin drives), mosfet (a MOSFET the pin drives) or driver-ic (a driver chip)",
    )


class Logic(_Model):
    present: StrictBool = Field(
        True,
        description="false when there is no separate logic board (a sealed controller and "
        "its own remote or throttle): the logic checks then say so and pass",
    )
    supply_voltage: Voltage | None = Field(
        None, description="the logic's supply voltage", examples=["3.3 V"]
    )
    pins: list[Name] | None = Field(
        None,
        max_length=256,
        description="pins the part has, by their datasheet names",
        examples=[["D2", "D3", "D7", "A0"]],
    )
    pin_current_max: SmallCurrent | None = Field(
        None, description="absolute maximum per pin (datasheet)", examples=["40 mA"]
    )
    total_current_max: SmallCurrent | None = Field(
        None, description="absolute maximum for all pins together", examples=["200 mA"]
    )
    port_groups: list[PortGroup] = Field(
        default_factory=list,
        max_length=MAX_ITEMS,
        description="pins that share a current limit, one [[logic.port_groups]] table each",
    )
    loads: list[PinLoad] = Field(
        default_factory=list,
        max_length=MAX_ITEMS,
        description="what the pins drive, one [[logic.loads]] table each",
    )
    board_current: SmallCurrent | None = Field(
        None, description="logic, sensors and radio", examples=["80 mA"]
    )
    regulator: Regulator | None = Field(None, description="the regulator that feeds the board")

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
