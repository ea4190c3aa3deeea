"""Current through a logic part's pins: how a load divides over paralleled outputs, and what
current a driver stage draws from the pin that switches it.

Paralleled outputs do not share a load evenly: each output's on-resistance differs from part
to part and with temperature, and the pin with the lowest resistance takes more than its even
share. The worst pin is therefore counted at an imbalance factor times its even share, never
more than the whole load. All currents are in one unit of the caller's choosing (mA in the
rules); the functions are unit-agnostic.
"""

from __future__ import annotations

from typing import Literal

Driver = Literal["pin", "transistor", "mosfet", "driver-ic"]


def even_share(load_current: float, pin_count: int) -> float:
    """Current per pin if the load divided perfectly evenly over ``pin_count`` outputs."""
    if pin_count < 1:
        raise ValueError("a load needs at least one pin")
    return load_current / pin_count


def worst_pin_current(load_current: float, pin_count: int, imbalance: float) -> float:
    """The most one of ``pin_count`` paralleled pins may carry: imbalance x even share,
    capped at the whole load (one pin cannot carry more than all of it)."""
    _check_imbalance(imbalance)
    if pin_count == 1:
        return load_current
    return min(load_current, imbalance * even_share(load_current, pin_count))


def worst_group_current(
    load_current: float, pins_in_group: int, pin_count: int, imbalance: float
) -> float:
    """The most a port group holding ``pins_in_group`` of the load's ``pin_count`` pins may
    carry: imbalance x its even share, capped at the whole load; all of it when the group
    holds every pin of the load."""
    _check_imbalance(imbalance)
    if not 0 <= pins_in_group <= pin_count:
        raise ValueError("a port group cannot hold more of a load's pins than the load has")
    if pins_in_group == 0:
        return 0.0
    if pins_in_group == pin_count:
        return load_current
    return min(load_current, imbalance * load_current * pins_in_group / pin_count)


def allowed_current(absolute_maximum: float, fraction: float) -> float:
    """The design ceiling: a fraction of the datasheet's absolute maximum."""
    if not 0 < fraction <= 1:
        raise ValueError(f"a derating fraction lies in (0, 1], not {fraction}")
    return absolute_maximum * fraction


def pin_side_current(load_current: float, driver: Driver, forced_gain: float) -> float:
    """Current the switching pin itself supplies for a load of ``load_current``.

    - ``pin``: the pin carries the whole load.
    - ``transistor``: base current of a saturated bipolar switch, load / forced gain.
    - ``mosfet``, ``driver-ic``: the gate or logic input draws no steady current to speak of
      (a MOSFET gate only charges on switching), counted as 0.
    """
    if driver == "pin":
        return load_current
    if driver == "transistor":
        if forced_gain <= 0:
            raise ValueError("a transistor's forced gain must be positive")
        return load_current / forced_gain
    if driver in ("mosfet", "driver-ic"):
        return 0.0
    raise ValueError(f"unknown driver {driver!r}")


def _check_imbalance(imbalance: float) -> None:
    if imbalance < 1:
        raise ValueError(f"an imbalance factor is at least 1 (even sharing), not {imbalance}")
