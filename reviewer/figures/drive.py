"""The drive model: motors, gearing and vehicle as one torque-speed system, in SI floats."""

from __future__ import annotations

from dataclasses import dataclass

from reviewer.build import Build, Motor
from reviewer.engineering.brushless import kv_from_no_load
from reviewer.engineering.roadload import Drive, DriveMotor
from reviewer.figures.currents import battery_limit
from reviewer.figures.stall import current_limit, stall_loop
from reviewer.units import in_unit, unit


@dataclass(frozen=True)
class DriveDefaults:
    """Which of the drive model's inputs the build left out and which value stood in: plain
    facts, so the rules that use the model can word them as the review's assumptions."""

    no_load_current: tuple[str, ...] = ()  # motors whose no-load current was taken as 0 A
    rolling_resistance: float | None = None  # the default Crr taken, if the build gave none
    drag_area: float | None = None  # the default CdA taken, m^2
    efficiency: bool = False  # drivetrain efficiency taken as 100 %


def motor_kv(motor: Motor) -> float | None:
    """Kv in rpm/V: given, or from the no-load speed with the no-load drop taken out once,
    n0 / (V - I0 R) (as ``Motor.effective_kv``, in floats: pint division is slow)."""
    if motor.kv is not None:
        return in_unit(motor.kv, unit("rpm/V"))
    if motor.no_load_speed is not None and motor.rated_voltage is not None:
        no_load = 0.0 if motor.no_load_current is None else in_unit(motor.no_load_current, "A")
        resistance = (
            0.0 if motor.winding_resistance is None else in_unit(motor.winding_resistance, "ohm")
        )
        return kv_from_no_load(
            in_unit(motor.no_load_speed, unit("rpm")),
            in_unit(motor.rated_voltage, unit("V")),
            no_load,
            resistance,
        )
    return None


def drive_model_missing(build: Build) -> tuple[str, ...]:
    """The build fields the drive model needs and the build lacks, as field paths."""
    missing: list[str] = []
    if build.vehicle.mass is None:
        missing.append("vehicle.mass")
    if build.battery is None:
        missing.append("battery")
    if not build.motors:
        missing.append("motors")
    for index, motor in enumerate(build.motors):
        if motor_kv(motor) is None:
            missing.append(f"motors[{index}].kv")
        if motor.winding_resistance is None:
            missing.append(f"motors[{index}].winding_resistance")
    drivetrain = build.drivetrain
    if drivetrain is None or drivetrain.reduction is None:
        missing.append("drivetrain.ratio")
    if drivetrain is None or drivetrain.wheel_diameter is None:
        missing.append("drivetrain.wheel_diameter")
    return tuple(missing)


def drive_model(
    build: Build,
    default_rolling_resistance: float,
    default_drag_area: float,
    bound: str = "high",
) -> tuple[Drive | None, DriveDefaults, tuple[str, ...]]:
    """The build's motors, gearing and vehicle as one ``Drive`` (SI floats), the defaults
    taken for inputs the build leaves out, and the missing fields (the drive is None then).

    Each motor is a torque-speed line on the full pack (cold stall loop: winding, switch, its
    own wires, plus the shared pack and battery wiring), at ``controller.max_duty`` (100 % if
    unset), the per-motor ``controller.motor_current_limit`` (its ``bound`` reading: ``high``
    for speed, ``low`` for climbing) and ``battery_current_limit``. Defaults: no-load current 0 A,
    drivetrain efficiency 100 % (both on the fast side), Crr and CdA as given (the caller's
    profile values, m^2 for the drag area).
    """
    missing = drive_model_missing(build)
    if missing:
        return None, DriveDefaults(), missing
    assert build.battery is not None and build.drivetrain is not None
    assert build.vehicle.mass is not None and build.drivetrain.wheel_diameter is not None
    assert build.drivetrain.reduction is not None
    loop = stall_loop(build)
    assert loop is not None
    motors, frictionless = [], []
    for motor in build.motors:
        kv = motor_kv(motor)
        assert kv is not None
        no_load = 0.0
        if motor.no_load_current is None:
            frictionless.append(motor.name)
        else:
            no_load = in_unit(motor.no_load_current, unit("A"))
        motors.append(DriveMotor(kv, loop.branch_resistance[motor.name], no_load))
    usage = build.usage
    crr = usage.rolling_resistance
    drag_area = in_unit(usage.drag_area, unit("m**2")) if usage.drag_area is not None else None
    efficiency = 1.0
    if build.drivetrain.efficiency is not None:
        efficiency = in_unit(build.drivetrain.efficiency, unit("percent")) / 100.0
    duty = 1.0
    if build.controller is not None and build.controller.max_duty is not None:
        duty = in_unit(build.controller.max_duty, unit("percent")) / 100.0
    drive = Drive(
        motors=tuple(motors),
        full_voltage=loop.voltage,
        reduction=build.drivetrain.reduction,
        wheel_radius=in_unit(build.drivetrain.wheel_diameter, unit("mm")) / 2000.0,
        rolling_resistance=default_rolling_resistance if crr is None else crr,
        drag_area=default_drag_area if drag_area is None else drag_area,
        shared_resistance=loop.shared_resistance,
        duty=duty,
        current_limit=current_limit(build, bound),
        battery_limit=battery_limit(build),
        efficiency=efficiency,
    )
    defaults = DriveDefaults(
        no_load_current=tuple(frictionless),
        rolling_resistance=default_rolling_resistance if crr is None else None,
        drag_area=default_drag_area if drag_area is None else None,
        efficiency=build.drivetrain.efficiency is None,
    )
    return drive, defaults, ()
