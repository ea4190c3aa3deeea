"""The pack's voltages and internal resistance, from its cells."""

from __future__ import annotations

from dataclasses import dataclass

from reviewer.build import Battery
from reviewer.engineering.cells import CELL_VOLTAGES, CellVoltages
from reviewer.units import in_unit


@dataclass(frozen=True)
class PackVoltages:
    nominal: float
    full: float
    cutoff: float


def cell_voltages(battery: Battery) -> CellVoltages:
    return CELL_VOLTAGES[battery.chemistry.value]


def pack_voltages(battery: Battery) -> PackVoltages:
    cell = cell_voltages(battery)
    n = battery.cells_series
    return PackVoltages(cell.nominal * n, cell.full * n, cell.cutoff * n)


def pack_resistance(battery: Battery) -> float | None:
    """Internal resistance of the whole pack in ohm, if the builder gave the cells' and the
    strings in parallel (more strings, lower resistance: unknown is not taken as one)."""
    if battery.cell_internal_resistance is None or battery.cells_parallel is None:
        return None
    cell = in_unit(battery.cell_internal_resistance, "ohm")
    return cell * battery.cells_series / battery.cells_parallel
