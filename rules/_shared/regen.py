"""Regenerative braking's force at the wheel, from the energy balance: what the brake stopping
check and the descent check both count.

The controller drives at most ``controller.regen_current_limit`` into the pack. The wheel's
mechanical power F v becomes that electrical power plus the losses on the way, so
F v >= V_pack I_regen; the review takes F = V I / v, the least force that current implies
(physics: energy balance), on the pack at its cut-off voltage (the least power for the
current). The motor current limit caps the force (F <= sum Kt I_m reduction / r), and below
the profile's ``brake.regenerative_fade_speed`` the review counts nothing (common practice:
too little back-EMF to push current into the pack).
"""

from __future__ import annotations

from dataclasses import dataclass

from reviewer import figures
from reviewer.build import Build
from reviewer.engineering.motor import torque_constant
from reviewer.engineering.roadload import Drive
from reviewer.findings import Source, SourceStatus
from reviewer.profile import Profile
from reviewer.units import in_unit

ENERGY_BALANCE = Source(
    "Energy balance of a regenerating drive: the wheel's power F v supplies the pack's V I and "
    "the losses, so F >= V I / v",
    SourceStatus.DERIVED,
)


@dataclass(frozen=True)
class RegenForce:
    """Regenerative braking force in N against ground speed in m/s."""

    pack_voltage: float  # V: the pack voltage the force is worked on
    current: float  # A into the pack, all motors
    cap: float | None  # N: what the motor current limit allows, None without one
    fade_speed: float  # m/s: below it, nothing

    def __call__(self, speed: float) -> float:
        if speed <= self.fade_speed:
            return 0.0
        force = self.pack_voltage * self.current / speed
        assert force >= 0.0, "regenerative braking never pushes the vehicle"
        return force if self.cap is None else min(force, self.cap)


def regen_current(build: Build) -> float | None:
    """The battery current regenerative braking drives into the pack, A; None if not given."""
    controller = build.controller
    if controller is None or controller.regen_current_limit is None:
        return None
    return in_unit(controller.regen_current_limit, "A")


def regen_force(build: Build, drive: Drive, profile: Profile) -> RegenForce | None:
    """The regenerative braking force on ``drive`` (None without a regen current limit)."""
    current = regen_current(build)
    if current is None or build.battery is None:
        return None
    voltage = figures.pack_voltages(build.battery).cutoff
    if build.battery.low_voltage_cutoff is not None:
        voltage = max(voltage, in_unit(build.battery.low_voltage_cutoff, "V"))
    limit = figures.current_limit(build, "low")
    cap = None
    if limit is not None:
        cap = sum(
            torque_constant(motor.kv_rpm_per_v) * limit * drive.reduction / drive.wheel_radius
            for motor in drive.motors
        )
    fade = in_unit(profile.limit("brake.regenerative_fade_speed").quantity, "m/s")
    return RegenForce(voltage, current, cap, fade)


def regen_description(force: RegenForce) -> str:
    """'4 A into the pack at 30 V, F = V I / v, capped at 52 N by the motor current limit'."""
    text = (
        f"{force.current:g} A into the pack at {force.pack_voltage:.3g} V (F = V I / v, the "
        "least force that current implies)"
    )
    if force.cap is not None:
        text += f", at most {force.cap:.3g} N by the motor current limit"
    return text
