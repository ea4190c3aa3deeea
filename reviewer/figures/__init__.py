"""Figures several rules share, computed from a validated build: plain numbers, no wording.

This is the one place that knows how the build's parts connect: which wires carry which motor's
current, what the stall loop consists of, what the pack's voltages are. Rules call these instead
of re-deriving them, so two rules never disagree about the same current; each rule words the
figures (and the defaults taken) itself. One module per subject: ``pack``, ``wires``,
``stall``, ``drive``, ``loads``.
"""

from __future__ import annotations

from reviewer.figures.currents import (
    DesignCurrent,
    LimitResponse,
    MotorLimit,
    any_limit,
    battery_design_current,
    battery_limit,
    drive_kind,
    limit_response,
    motor_limit,
    phase_conductor_current,
)
from reviewer.figures.drive import DriveDefaults, drive_model, drive_model_missing, motor_kv
from reviewer.figures.loads import AuxiliaryLoad, auxiliary_current
from reviewer.figures.pack import PackVoltages, cell_voltages, pack_resistance, pack_voltages
from reviewer.figures.stall import (
    StallLoop,
    ambient_temperature,
    current_limit,
    stall_currents,
    stall_loop,
    stall_point,
)
from reviewer.figures.wires import (
    PHASES_IN_SERIES,
    branch_wires,
    loop_wires,
    motor_of,
    shared_wires,
    wire_ampacity,
    wire_ampacity_bound,
    wire_area_mm2,
    wire_awg,
    wire_resistance,
)

__all__ = [
    "PHASES_IN_SERIES",
    "AuxiliaryLoad",
    "DesignCurrent",
    "DriveDefaults",
    "LimitResponse",
    "MotorLimit",
    "PackVoltages",
    "StallLoop",
    "ambient_temperature",
    "any_limit",
    "auxiliary_current",
    "battery_design_current",
    "battery_limit",
    "branch_wires",
    "cell_voltages",
    "current_limit",
    "drive_kind",
    "drive_model",
    "drive_model_missing",
    "limit_response",
    "loop_wires",
    "motor_kv",
    "motor_limit",
    "motor_of",
    "pack_resistance",
    "pack_voltages",
    "phase_conductor_current",
    "shared_wires",
    "stall_currents",
    "stall_loop",
    "stall_point",
    "wire_ampacity",
    "wire_ampacity_bound",
    "wire_area_mm2",
    "wire_awg",
    "wire_resistance",
]
