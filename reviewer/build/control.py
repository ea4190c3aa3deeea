"""How the rider commands the drive, and what stops it when that command goes wrong."""

import enum

from pydantic import Field, StrictBool

from reviewer.build.fields import Duration, _Model


class ThrottleKind(enum.Enum):
    HALL = "hall"  # a hall-sensor thumb or twist throttle
    POTENTIOMETER = "potentiometer"
    WIRELESS_REMOTE = "wireless-remote"  # a hand-held radio remote
    PEDAL_SENSOR = "pedal-sensor"  # pedal-assist cadence or torque sensor


class Control(_Model):
    throttle: ThrottleKind = Field(
        description="what the rider commands with: hall (a hall-sensor thumb or twist "
        "throttle), potentiometer (a resistive one), wireless-remote (a hand-held radio "
        "remote) or pedal-sensor (a pedal-assist cadence or torque sensor)"
    )
    power_up_inhibit: StrictBool | None = Field(
        None,
        description="the drive stays off at power-up until the throttle reads zero",
    )
    fault_reads_zero: StrictBool | None = Field(
        None,
        description="a broken throttle ground, supply or signal wire reads as zero throttle, "
        "not full (out-of-range detection in the controller or a pull-down)",
    )
    link_loss_cutoff: StrictBool | None = Field(
        None, description="a wireless remote: the drive stops when the radio link is lost"
    )
    link_loss_time: Duration | None = Field(
        None, description="how long after the link is lost the drive stops", examples=["0.3 s"]
    )
    kill_switch: StrictBool | None = Field(
        None, description="a kill switch or lanyard the rider can reach removes drive power"
    )
