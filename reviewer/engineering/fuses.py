"""Overcurrent protection: coordinating a fuse with the current it carries and the wire behind
it, the small-conductor ceilings, and whether it can interrupt the fault it exists for.

- Coordination (IEC 60364-4-43 clause 433.1): design current <= fuse rating <= conductor
  capacity, Ib <= In <= Iz. A fuse below Ib opens in normal service; one above Iz lets the wire
  overheat before it acts.
- Small conductors (NEC 240.4(D)): whatever their table ampacity, 18 AWG may be protected at no
  more than 7 A, 16 AWG 10 A, 14 AWG 15 A, 12 AWG 20 A, 10 AWG 30 A.
- Interruption: a fuse breaks a fault only up to its breaking capacity, and only at or below its
  rated DC voltage. The fault current from a pack is V_full / (R_internal + R_loop).
  Automotive blade fuses (ISO 8820-3) are rated 32 V or 58 V DC with 1000 A breaking capacity.

Pure functions of floats (A, V, ohm, AWG numbers); no builds, no rules.
"""

from __future__ import annotations

import math

# NEC (NFPA 70) 240.4(D): the most an overcurrent device may be rated on a small copper wire.
SMALL_CONDUCTOR_MAX_A: dict[int, float] = {18: 7.0, 16: 10.0, 14: 15.0, 12: 20.0, 10: 30.0}
# ISO 8820-3 blade fuses: DC voltage ratings and breaking capacity.
BLADE_FUSE_VOLTAGES = (32.0, 58.0)
BLADE_FUSE_BREAKING_CAPACITY = 1000.0


def small_conductor_limit(awg: int) -> float | None:
    """NEC 240.4(D) ceiling on the fuse rating for a copper wire of this AWG; None where 240.4(D)
    sets none (heavier than 10 AWG). A size lighter than 18 AWG is not in the table either:
    None, and the caller must not read that as unlimited."""
    return SMALL_CONDUCTOR_MAX_A.get(awg)


def is_coordinated(design_a: float, rating_a: float, capacity_a: float) -> bool:
    """IEC 60364-4-43 433.1: Ib <= In <= Iz."""
    return design_a <= rating_a <= capacity_a


def rating_window(design_a: float, capacity_a: float) -> tuple[int, int] | None:
    """Whole-ampere fuse ratings that satisfy Ib <= In <= Iz; None when no rating fits."""
    low = max(1, math.ceil(design_a - 1e-9))
    high = math.floor(capacity_a + 1e-9)
    return (low, high) if low <= high else None


def prospective_fault_current(
    voltage: float, source_resistance: float, loop_resistance: float
) -> float:
    """I = V / (R_source + R_loop): a bolted short at the far end of the loop. Infinite when
    no resistance is known at all (the caller must then say the figure cannot be formed)."""
    total = source_resistance + loop_resistance
    if total < 0:
        raise ValueError("resistances must not be negative")
    return math.inf if total == 0 else voltage / total


def source_resistance_needed(voltage: float, breaking_a: float, loop_resistance: float) -> float:
    """The least source (pack) resistance at which a short through ``loop_resistance`` stays
    within ``breaking_a``: V / I_break - R_loop, never below zero."""
    if breaking_a <= 0:
        raise ValueError("a breaking capacity must be positive")
    return max(0.0, voltage / breaking_a - loop_resistance)


def blade_fuse_voltage(system_v: float) -> float | None:
    """The lowest ISO 8820-3 blade-fuse voltage rating at or above the system's voltage; None
    above 58 V, where no blade fuse is rated."""
    return next((v for v in BLADE_FUSE_VOLTAGES if v >= system_v), None)
