"""What battery.discharge and battery.protection share: the cell voltages they both cite and
the tolerance they compare on a limit with."""

from __future__ import annotations

from reviewer.findings import Source

CELL_LIMITS = Source.from_memory(
    "Linden, Handbook of Batteries: Li-ion and LiPo 4.2 V full, 3.0 V cut-off; LiFePO4 3.65 V "
    "full, 2.5 V cut-off"
)
EPSILON = 1e-9  # volts and amps compared on the limit must not flip on float noise
