"""A pack under load: open-circuit voltage against state of charge, sag, energy use and range.

Terminal voltage V = OCV(state of charge) - I R_pack, with R_pack = cells in series x R_cell /
strings in parallel (Linden, Handbook of Batteries, from memory; brief 13). When the sag at a
peak current takes the pack below a cut-off, the controller or BMS stops the drive at once, so
the lowest state of charge that still carries a peak current is the end of usable charge.

The OCV tables are piecewise linear and ``from memory`` (typical curves of the chemistry at
room temperature, slow rate): good to about 0.05 V, not a cell's datasheet. Their ends are the
full and cut-off voltages of reviewer.engineering.cells, so the two never disagree.

Energy use from the road load: Wh/km = F [N] x 1000 m / 3600 J/Wh / efficiency (brief 13).
State of charge is a fraction from 0 (at cut-off) to 1 (full); volts, amps, ohms, Wh, km.
"""

from __future__ import annotations

import bisect
import itertools
from collections.abc import Sequence

from reviewer.engineering.cells import CELL_VOLTAGES


def _table(chemistry: str, inner: Sequence[tuple[float, float]]) -> tuple[tuple[float, float], ...]:
    cell = CELL_VOLTAGES[chemistry]
    return ((0.0, cell.cutoff), *inner, (1.0, cell.full))


# from memory: typical open-circuit curves (state of charge, cell volts) between the ends.
OCV_TABLES: dict[str, tuple[tuple[float, float], ...]] = {
    # nickel-rich cylindrical cells: a steady slope with a knee below about 10 %
    "li-ion": _table(
        "li-ion",
        [
            (0.05, 3.30),
            (0.10, 3.45),
            (0.20, 3.56),
            (0.30, 3.63),
            (0.40, 3.68),
            (0.50, 3.73),
            (0.60, 3.80),
            (0.70, 3.88),
            (0.80, 3.96),
            (0.90, 4.06),
        ],
    ),
    # cobalt-oxide pouch cells: a little higher in the middle than li-ion
    "lipo": _table(
        "lipo",
        [
            (0.05, 3.45),
            (0.10, 3.60),
            (0.20, 3.69),
            (0.30, 3.74),
            (0.40, 3.78),
            (0.50, 3.82),
            (0.60, 3.87),
            (0.70, 3.93),
            (0.80, 4.00),
            (0.90, 4.09),
        ],
    ),
    # iron phosphate: flat from 20 % to 90 %, steep knees at both ends
    "lifepo4": _table(
        "lifepo4",
        [
            (0.05, 3.00),
            (0.10, 3.15),
            (0.20, 3.24),
            (0.30, 3.26),
            (0.40, 3.28),
            (0.50, 3.29),
            (0.60, 3.30),
            (0.70, 3.31),
            (0.80, 3.32),
            (0.90, 3.34),
            (0.95, 3.37),
        ],
    ),
}


def ocv_table(chemistry: str) -> tuple[tuple[float, float], ...]:
    """The (state of charge, cell OCV) points of a chemistry, lowest charge first."""
    try:
        return OCV_TABLES[chemistry]
    except KeyError:
        raise ValueError(
            f"no open-circuit curve for {chemistry!r}; expected one of {', '.join(OCV_TABLES)}"
        ) from None


def cell_open_circuit_voltage(chemistry: str, state_of_charge: float) -> float:
    """Cell OCV in V at a state of charge in [0, 1], by linear interpolation in the table."""
    if not 0.0 <= state_of_charge <= 1.0:
        raise ValueError("state of charge must lie between 0 and 1")
    table = ocv_table(chemistry)
    charges = [point[0] for point in table]
    index = max(1, bisect.bisect_left(charges, state_of_charge))
    (s0, v0), (s1, v1) = table[index - 1], table[index]
    return v0 + (v1 - v0) * (state_of_charge - s0) / (s1 - s0)


def state_of_charge_at(chemistry: str, cell_voltage: float) -> float | None:
    """The lowest state of charge whose cell OCV is at least ``cell_voltage`` V.

    0 when the cut-off end already reaches it; None when not even a full cell does.
    """
    table = ocv_table(chemistry)
    if cell_voltage <= table[0][1]:
        return 0.0
    if cell_voltage > table[-1][1]:
        return None
    for (s0, v0), (s1, v1) in itertools.pairwise(table):
        if v1 >= cell_voltage:
            return s0 + (s1 - s0) * (cell_voltage - v0) / (v1 - v0)
    return None  # pragma: no cover - the last point is checked above


def pack_resistance(cell_resistance: float, cells_series: int, cells_parallel: int = 1) -> float:
    """Internal resistance of the pack in ohm: series x R_cell / parallel (interconnects aside,
    which only add to it)."""
    if cells_series < 1 or cells_parallel < 1:
        raise ValueError("a pack has at least one cell in series and one string")
    if cell_resistance < 0:
        raise ValueError("cell resistance must not be negative")
    return cells_series * cell_resistance / cells_parallel


def terminal_voltage(open_circuit_voltage: float, current: float, resistance: float) -> float:
    """Terminal voltage in V under a discharge current (A, positive out of the pack): OCV - I R."""
    return open_circuit_voltage - current * resistance


def pack_open_circuit_voltage(chemistry: str, state_of_charge: float, cells_series: int) -> float:
    """Pack OCV in V: cells in series x the cell OCV (cells assumed balanced)."""
    return cells_series * cell_open_circuit_voltage(chemistry, state_of_charge)


def lowest_charge_for_peak(
    chemistry: str,
    cells_series: int,
    resistance: float,
    peak_current: float,
    cutoff_voltage: float | None = None,
) -> float | None:
    """The lowest state of charge at which ``peak_current`` A keeps the terminal voltage at or
    above ``cutoff_voltage`` V (default: the cells' own cut-off x series).

    Below it the sag trips the cut-off and the drive stops at speed. None when even a full pack
    sags below the cut-off at that current.
    """
    if cutoff_voltage is None:
        cutoff_voltage = cells_series * CELL_VOLTAGES[chemistry].cutoff
    needed_cell_ocv = (cutoff_voltage + peak_current * resistance) / cells_series
    return state_of_charge_at(chemistry, needed_cell_ocv)


def mean_open_circuit_voltage(chemistry: str, upper: float = 1.0, lower: float = 0.0) -> float:
    """The cell OCV averaged over charge between two states of charge, in V (exact for the
    piecewise-linear table: the trapezoid rule on each piece)."""
    if not 0.0 <= lower < upper <= 1.0:
        raise ValueError("need 0 <= lower < upper <= 1")
    points = [lower, *(s for s, _ in ocv_table(chemistry) if lower < s < upper), upper]
    area = 0.0
    for a, b in itertools.pairwise(points):
        area += (
            0.5
            * (b - a)
            * (cell_open_circuit_voltage(chemistry, a) + cell_open_circuit_voltage(chemistry, b))
        )
    return area / (upper - lower)


def delivered_energy_wh(
    chemistry: str,
    cells_series: int,
    pack_capacity_ah: float,
    resistance: float,
    current: float,
    upper: float = 1.0,
    lower: float = 0.0,
) -> float:
    """Energy in Wh the terminals deliver at a constant ``current`` A from ``upper`` down to
    ``lower`` state of charge: Q (upper - lower) (series x mean OCV - I R).

    The I R term is the pack's own I^2 R loss per amp-hour: what the OCV energy overstates.
    """
    if pack_capacity_ah <= 0:
        raise ValueError("capacity must be positive")
    if upper <= lower:
        return 0.0
    charge_ah = pack_capacity_ah * (upper - lower)
    mean_ocv = cells_series * mean_open_circuit_voltage(chemistry, upper, lower)
    return max(0.0, charge_ah * (mean_ocv - current * resistance))


def usable_energy_wh(
    chemistry: str,
    cells_series: int,
    pack_capacity_ah: float,
    resistance: float,
    current: float,
    peak_current: float | None = None,
    cutoff_voltage: float | None = None,
    start_charge: float = 1.0,
) -> float:
    """Energy in Wh delivered at a steady ``current`` from ``start_charge`` until the sag at
    ``peak_current`` (default, or when lower: the steady current) would trip the cut-off.

    The ride ends where the next peak can no longer be carried, not where the cells are empty.
    """
    peak = current if peak_current is None else max(current, peak_current)
    end = lowest_charge_for_peak(chemistry, cells_series, resistance, peak, cutoff_voltage)
    if end is None:
        return 0.0
    return delivered_energy_wh(
        chemistry, cells_series, pack_capacity_ah, resistance, current, start_charge, end
    )


def energy_per_km(road_load_force_n: float, drivetrain_efficiency: float) -> float:
    """Energy use in Wh/km from the pack: F x 1 km / 3600 J/Wh / eta = F / (3.6 eta)."""
    if not 0.0 < drivetrain_efficiency <= 1.0:
        raise ValueError("drivetrain efficiency must lie in (0, 1]")
    if road_load_force_n < 0:
        raise ValueError("road load must not be negative (regeneration is not counted)")
    return road_load_force_n / (3.6 * drivetrain_efficiency)


def range_km(usable_energy: float, wh_per_km: float, reserve_fraction: float = 0.0) -> float:
    """Range in km: usable energy (Wh) less a reserve fraction, over the energy use (Wh/km)."""
    if wh_per_km <= 0:
        raise ValueError("energy use must be positive")
    if not 0.0 <= reserve_fraction < 1.0:
        raise ValueError("reserve fraction must lie in [0, 1)")
    if usable_energy < 0:
        raise ValueError("usable energy must not be negative")
    return usable_energy * (1.0 - reserve_fraction) / wh_per_km
