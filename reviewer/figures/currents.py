"""The controller's two current limits, as every rule reads them: plain numbers, no wording.

A controller limits the motor current (the phase current of a brushless motor: torque, winding
heat, phase wires, switches, sensor) and the battery current (pack, BMS, fuse, battery wires).
The build states each as quoted on the datasheet; here they become DC-equivalent amps
(:mod:`reviewer.engineering.brushless`). Where the build leaves the drive kind or the basis of
a field-oriented phase limit unsaid, the figure is a range: ``high`` for the checks a larger
current makes worse (heat, wires, pack), ``low`` for those a smaller one makes worse (climbing),
and the flags say which input was missing, so the rule can state it as an assumption.

The response of a limit is derived once here, for every rule: a hardware limit acts within its
stated ``controller.current_limit_response``; a software limit no sooner than its averaging
window (``current_samples_averaged`` / ``current_sample_rate``); a limit of unstated kind is
taken as software.
"""

from __future__ import annotations

from dataclasses import dataclass

from reviewer.build import Build, DriveKind, LimitKind, Motor, MotorType
from reviewer.engineering.brushless import SQRT3_OVER_2, dc_equivalent_current
from reviewer.units import in_unit


@dataclass(frozen=True)
class MotorLimit:
    """The motor current limit of one motor, as DC-equivalent amps."""

    quoted: float  # A, as the build gives it
    low: float  # DC-equivalent A: the smallest reading the inputs allow
    high: float  # DC-equivalent A: the largest
    phase_peak: float  # A: the highest current one phase (or motor) conductor carries
    drive: str  # the drive kind used ("brushed", "six-step", "field-oriented", "unstated")
    basis_assumed: bool  # a field-oriented (or unstated) drive without motor_current_basis


@dataclass(frozen=True)
class LimitResponse:
    """How soon the limits act: seconds (None when not known), and on what ground."""

    seconds: float | None
    kind: str  # "hardware", "software", "software (kind unstated)", "none"
    basis: str  # "stated", "averaging window", "not known"


def drive_kind(build: Build, motor: Motor) -> str:
    """The drive kind of a motor: as stated, ``brushed`` for a brushed motor, else ``unstated``."""
    controller = build.controller
    if controller is not None and controller.drive is not None:
        return controller.drive.value
    return DriveKind.BRUSHED.value if motor.type is MotorType.BRUSHED else "unstated"


def motor_limit(build: Build, motor: Motor) -> MotorLimit | None:
    """The motor current limit for ``motor`` (None when the build states none)."""
    controller = build.controller
    if controller is None or controller.motor_current_limit is None:
        return None
    quoted = in_unit(controller.motor_current_limit, "A")
    drive = drive_kind(build, motor)
    basis = controller.motor_current_basis.value if controller.motor_current_basis else None
    if drive in ("brushed", "six-step"):
        return MotorLimit(quoted, quoted, quoted, quoted, drive, False)
    if drive == "field-oriented" and basis is not None:
        value = dc_equivalent_current(quoted, drive, basis)
        return MotorLimit(quoted, value, value, value / SQRT3_OVER_2, drive, False)
    # Unstated basis (or drive): every reading the inputs allow, from a peak-quoted
    # field-oriented limit (least torque) to an rms one (most current, most heat).
    readings = [dc_equivalent_current(quoted, "field-oriented", "peak")]
    readings.append(dc_equivalent_current(quoted, "field-oriented", "rms"))
    if drive == "unstated":
        readings.append(quoted)  # six-step
    peak = max(quoted * 2**0.5, quoted)
    return MotorLimit(quoted, min(readings), max(readings), peak, drive, True)


def battery_limit(build: Build) -> float | None:
    """The battery current limit in A (per motor), or None when the build states none."""
    controller = build.controller
    if controller is None or controller.battery_current_limit is None:
        return None
    return in_unit(controller.battery_current_limit, "A")


def any_limit(build: Build) -> bool:
    """Whether anything limits current at all (a stall current is sustained otherwise)."""
    controller = build.controller
    return controller is not None and (
        controller.motor_current_limit is not None or controller.battery_current_limit is not None
    )


def limit_response(build: Build) -> LimitResponse:
    """The one response time every rule uses for the controller's limits."""
    controller = build.controller
    if not any_limit(build):
        return LimitResponse(None, "none", "not known")
    assert controller is not None
    if controller.current_limit_kind is LimitKind.HARDWARE:
        if controller.current_limit_response is not None:
            return LimitResponse(
                in_unit(controller.current_limit_response, "s"), "hardware", "stated"
            )
        return LimitResponse(None, "hardware", "not known")
    kind = (
        "software"
        if controller.current_limit_kind is LimitKind.SOFTWARE
        else ("software (kind unstated)")
    )
    samples, rate = controller.current_samples_averaged, controller.current_sample_rate
    if samples is not None and rate is not None:
        window = samples / in_unit(rate, "Hz")
        stated = controller.current_limit_response
        if stated is not None:  # never sooner than its averaging window allows
            window = max(window, in_unit(stated, "s"))
        return LimitResponse(window, kind, "averaging window")
    if controller.current_limit_response is not None and kind == "software":
        return LimitResponse(in_unit(controller.current_limit_response, "s"), kind, "stated")
    return LimitResponse(None, kind, "not known")


@dataclass(frozen=True)
class DesignCurrent:
    """The most current a conductor or part carries while the limits hold (A), and on what it
    rests: ``motor limit``, ``battery limit``, ``stall`` (nothing limits it) and the like."""

    amps: float
    basis: str


def battery_design_current(build: Build, motor: Motor) -> DesignCurrent | None:
    """Per motor, the most the controller draws from the pack while its limits hold: the battery
    limit, or the motor limit where it is lower or alone (near full speed the duty nears 1 and
    the pack carries the motor current). None when nothing limits current: the stall current
    (``reviewer.figures.stall_loop``) is what flows then."""
    battery = battery_limit(build)
    limit = motor_limit(build, motor)
    motor_amps = None if limit is None else limit.high
    if battery is not None and (motor_amps is None or battery <= motor_amps):
        return DesignCurrent(battery, "battery limit")
    if motor_amps is not None:
        return DesignCurrent(motor_amps, "motor limit")
    return None


def phase_conductor_current(build: Build, motor: Motor, dc_current: float) -> float:
    """The current one motor (or phase) conductor carries for a DC-equivalent motor current: the
    current itself for brushed and six-step drive; the peak phase current for field-oriented
    drive, which a locked rotor holds in one phase for as long as it lasts. An unstated drive
    of a brushless motor is taken as field-oriented (the larger figure)."""
    if drive_kind(build, motor) in ("brushed", "six-step"):
        return dc_current
    return dc_current / SQRT3_OVER_2
