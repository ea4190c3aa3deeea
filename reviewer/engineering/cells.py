"""Cells and packs: voltages per chemistry, pack energy, continuous current and the air-transport
class of a lithium pack.

Cell voltages are from memory (Linden, Handbook of Batteries); re-check before using them as a
test value. The air-transport thresholds are the IATA Dangerous Goods Regulations' lithium
battery guidance for passengers. Pure functions of floats (V, Ah, A, Wh): no builds, no rules.
"""

from __future__ import annotations

import enum
import math
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

# IATA Dangerous Goods Regulations, lithium battery guidance for passengers.
AIR_ALLOWED_MAX_WH = 100.0
AIR_APPROVAL_MAX_WH = 160.0
# Energies are compared after rounding to this many decimals, so that 22.2 V x 4.5045... Ah
# is "100 Wh" and not 100.00000000000001 Wh, which would cross a threshold on float noise.
_WH_DECIMALS = 6


class AirTransportClass(enum.Enum):
    """Where a lithium battery of a given energy may travel in a passenger's baggage."""

    ALLOWED = "up to 100 Wh: allowed in passenger baggage"
    AIRLINE_APPROVAL = "over 100 Wh up to 160 Wh: only with the airline's approval"
    FORBIDDEN = "over 160 Wh: forbidden in passenger baggage"


def pack_energy_wh(
    cell_nominal_v: float, cells_series: int, cell_capacity_ah: float, cells_parallel: int = 1
) -> float:
    """Rated energy, Wh = nominal pack voltage x pack capacity (the figure IATA asks for)."""
    if cells_series < 1 or cells_parallel < 1:
        raise ValueError("a pack has at least one cell in series and one string")
    if cell_nominal_v <= 0 or cell_capacity_ah <= 0:
        raise ValueError("cell voltage and capacity must be positive")
    return cell_nominal_v * cells_series * cell_capacity_ah * cells_parallel


def air_transport_class(energy_wh: float) -> AirTransportClass:
    """IATA thresholds: not exceeding 100 Wh; exceeding 100 Wh but not 160 Wh; exceeding 160 Wh."""
    energy = round(energy_wh, _WH_DECIMALS)
    if energy <= AIR_ALLOWED_MAX_WH:
        return AirTransportClass.ALLOWED
    if energy <= AIR_APPROVAL_MAX_WH:
        return AirTransportClass.AIRLINE_APPROVAL
    return AirTransportClass.FORBIDDEN


def string_continuous_current(
    cell_continuous_a: float | None = None,
    cell_c_rate: float | None = None,
    cell_capacity_ah: float | None = None,
) -> float | None:
    """Continuous current of one series string (= one cell's): the datasheet current, or
    C-rate x capacity; the lower where both are given (the datasheets disagree, trust the
    smaller). None if neither can be formed."""
    options = []
    if cell_continuous_a is not None:
        options.append(cell_continuous_a)
    if cell_c_rate is not None and cell_capacity_ah is not None:
        options.append(cell_c_rate * cell_capacity_ah)
    return min(options) if options else None


def pack_continuous_current(string_a: float, cells_parallel: int) -> float:
    """Parallel strings share the load: pack current = one string's x the strings in parallel."""
    return string_a * cells_parallel


def strings_needed(current_a: float, string_a: float) -> int:
    """The fewest parallel strings that carry ``current_a`` continuously."""
    if string_a <= 0:
        raise ValueError("a string's continuous current must be positive")
    return max(1, math.ceil(current_a / string_a - 1e-9))
