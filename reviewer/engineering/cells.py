"""Cell voltages per chemistry (from memory: Linden, Handbook of Batteries; re-check before
using as a test value). Nominal, full charge and discharge cut-off, in volts per cell."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class CellVoltages:
    nominal: float
    full: float
    cutoff: float
    floor: float  # below this the cell is damaged


CELL_VOLTAGES: dict[str, CellVoltages] = {
    "li-ion": CellVoltages(nominal=3.6, full=4.2, cutoff=3.0, floor=2.5),
    "lipo": CellVoltages(nominal=3.7, full=4.2, cutoff=3.0, floor=2.5),
    "lifepo4": CellVoltages(nominal=3.2, full=3.65, cutoff=2.5, floor=2.0),
    "nimh": CellVoltages(nominal=1.2, full=1.45, cutoff=1.0, floor=0.9),
    "lead-acid": CellVoltages(nominal=2.0, full=2.15, cutoff=1.75, floor=1.6),
}
