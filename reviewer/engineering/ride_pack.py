"""A pack under load: open-circuit voltage by state of charge, sag, and the current a power needs.

Terminal voltage V = OCV(s) - I R (brief 13, Linden); the battery current that delivers a power
P at the terminals solves R I^2 - OCV I + P = 0. The smaller root is the one a pack runs on
(the larger lies past the pack's maximum power OCV^2 / (4 R), reached at I = OCV / (2 R)). A
negative discriminant means the pack cannot deliver that power at all: :class:`PackPowerExceeded`,
never a clipped current. State of charge falls by the charge drawn over the capacity.

The OCV tables are per cell, state of charge 0 at the chemistry's cut-off and 1 at its full
voltage (both as in :data:`reviewer.engineering.cells.CELL_VOLTAGES`); the points between are
resting voltages from memory (Linden, Handbook of Batteries, and typical cell datasheets):
re-check before using them as a test value.
"""

from __future__ import annotations

import bisect
import math
from collections.abc import Callable
from dataclasses import dataclass

from reviewer.engineering.cells import CELL_VOLTAGES

# (state of charge, cell open-circuit voltage in V); from memory, ends from CELL_VOLTAGES.
_LITHIUM_COBALT_NICKEL = (
    (0.0, 3.00),
    (0.05, 3.30),
    (0.10, 3.45),
    (0.20, 3.55),
    (0.30, 3.62),
    (0.40, 3.68),
    (0.50, 3.74),
    (0.60, 3.81),
    (0.70, 3.89),
    (0.80, 3.97),
    (0.90, 4.07),
    (1.0, 4.20),
)
OCV_TABLES: dict[str, tuple[tuple[float, float], ...]] = {
    "li-ion": _LITHIUM_COBALT_NICKEL,  # from memory: NMC / NCA cells
    "lipo": _LITHIUM_COBALT_NICKEL,  # from memory: same cathodes, pouch format
    "lifepo4": (  # from memory: the long flat plateau, steep at both ends
        (0.0, 2.50),
        (0.05, 3.00),
        (0.10, 3.20),
        (0.20, 3.25),
        (0.40, 3.29),
        (0.60, 3.31),
        (0.80, 3.33),
        (0.90, 3.35),
        (0.97, 3.40),
        (1.0, 3.65),
    ),
    "nimh": (  # from memory
        (0.0, 1.00),
        (0.10, 1.20),
        (0.20, 1.24),
        (0.50, 1.27),
        (0.80, 1.30),
        (0.90, 1.35),
        (1.0, 1.45),
    ),
    "lead-acid": (  # from memory: close to linear in resting voltage
        (0.0, 1.75),
        (0.10, 1.96),
        (0.25, 2.00),
        (0.50, 2.04),
        (0.75, 2.08),
        (1.0, 2.15),
    ),
}


class PackPowerExceeded(ValueError):
    """The pack cannot deliver the power asked of it: the discriminant OCV^2 - 4 R P < 0."""

    def __init__(self, power: float, max_power: float) -> None:
        super().__init__(
            f"the pack cannot deliver {power:.4g} W: at most OCV^2 / (4 R) = {max_power:.4g} W"
        )
        self.power = power
        self.max_power = max_power


def _table(chemistry: str) -> tuple[tuple[float, float], ...]:
    try:
        return OCV_TABLES[chemistry]
    except KeyError:
        raise ValueError(
            f"no open-circuit voltage table for {chemistry!r}; expected one of "
            f"{', '.join(OCV_TABLES)}"
        ) from None


def cell_open_circuit_voltage(chemistry: str, state_of_charge: float) -> float:
    """One cell's open-circuit voltage in V, linear between the table's points."""
    if not 0.0 <= state_of_charge <= 1.0:
        raise ValueError(f"state of charge {state_of_charge!r} is outside [0, 1]")
    table = _table(chemistry)
    return _between(table, _CHARGES[chemistry], state_of_charge)


#: each table's states of charge, for the bisection
_CHARGES = {chemistry: [point[0] for point in table] for chemistry, table in OCV_TABLES.items()}


def _between(
    table: tuple[tuple[float, float], ...], charges: list[float], state_of_charge: float
) -> float:
    """The table's voltage at ``state_of_charge`` (in [0, 1]), linear between its points."""
    index = bisect.bisect_left(charges, state_of_charge)
    if index == 0:
        return table[0][1]
    (s0, v0), (s1, v1) = table[index - 1], table[index]
    return v0 + (v1 - v0) * (state_of_charge - s0) / (s1 - s0)


def battery_current(open_circuit_v: float, resistance: float, power: float) -> float:
    """The current in A that delivers ``power`` W at the terminals: the smaller root of
    R I^2 - OCV I + P = 0, written 2 P / (OCV + sqrt(OCV^2 - 4 R P)) so it stays exact as R
    goes to 0 (then P / OCV). Raises :class:`PackPowerExceeded` past the maximum power."""
    if open_circuit_v <= 0 or resistance < 0:
        raise ValueError("the open-circuit voltage must be positive and the resistance >= 0")
    if power < 0:
        raise ValueError("charging (negative power) is not modelled")
    discriminant = open_circuit_v * open_circuit_v - 4.0 * resistance * power
    if discriminant < 0:
        raise PackPowerExceeded(power, max_power(open_circuit_v, resistance))
    return 2.0 * power / (open_circuit_v + math.sqrt(discriminant))


def max_power(open_circuit_v: float, resistance: float) -> float:
    """The most a pack delivers at its terminals, OCV^2 / (4 R), in W (inf with no resistance)."""
    return math.inf if resistance <= 0 else open_circuit_v * open_circuit_v / (4.0 * resistance)


def pack_resistance(cells_series: int, cells_parallel: int, cell_resistance: float) -> float:
    """R of the pack = cells in series x R_cell / strings in parallel (brief 13), ohm."""
    if cells_series < 1 or cells_parallel < 1 or cell_resistance < 0:
        raise ValueError("a pack has at least one cell in series and one string")
    return cells_series * cell_resistance / cells_parallel


@dataclass(frozen=True)
class PackModel:
    """A pack of ``cells_series`` cells of one chemistry in series (strings in parallel folded
    into ``capacity_ah`` and ``resistance``), at ``state_of_charge`` when the ride begins."""

    chemistry: str
    cells_series: int
    capacity_ah: float
    resistance: float  # ohm, the whole pack's internal resistance
    state_of_charge: float = 1.0

    def __post_init__(self) -> None:
        _table(self.chemistry)
        if self.cells_series < 1 or self.capacity_ah <= 0 or self.resistance < 0:
            raise ValueError("a pack needs a cell in series, a capacity > 0 and a resistance >= 0")
        if not 0.0 < self.state_of_charge <= 1.0:
            raise ValueError("the starting state of charge must lie in (0, 1]")

    def open_circuit_voltage(self, state_of_charge: float) -> float:
        """OCV of the pack in V at a state of charge."""
        return self.cells_series * cell_open_circuit_voltage(self.chemistry, state_of_charge)

    def open_circuit_voltage_function(self) -> Callable[[float], float]:
        """:meth:`open_circuit_voltage` with the table read once, the same arithmetic (a test
        holds them equal): a ride asks it at every step."""
        table, charges = _table(self.chemistry), _CHARGES[self.chemistry]
        series = self.cells_series

        def ocv(state_of_charge: float) -> float:
            if not 0.0 <= state_of_charge <= 1.0:
                raise ValueError(f"state of charge {state_of_charge!r} is outside [0, 1]")
            return series * _between(table, charges, state_of_charge)

        return ocv

    def terminal_voltage(self, current: float, state_of_charge: float) -> float:
        """V = OCV(s) - I R in V, with ``current`` A flowing out of the pack."""
        return self.open_circuit_voltage(state_of_charge) - current * self.resistance

    @property
    def full_voltage(self) -> float:
        return self.cells_series * CELL_VOLTAGES[self.chemistry].full

    @property
    def cutoff_voltage(self) -> float:
        """The chemistry's cut-off times the cells in series, in V."""
        return self.cells_series * CELL_VOLTAGES[self.chemistry].cutoff
