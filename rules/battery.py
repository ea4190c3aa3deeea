"""The battery's rules: what the drive asks of the pack, and what keeps a lithium pack within its
cells' limits. Each lives in its own module; this one gathers them.

- ``battery.discharge`` (battery_discharge): the drive's peak current against the pack's
  continuous rating; pack voltages, energy and air-transport class.
- ``battery.protection`` (battery_protection): management system, cut-off, charger voltage.
"""

from __future__ import annotations

from firstride_rules.battery_discharge import RULE as DISCHARGE_RULE
from firstride_rules.battery_protection import RULE as PROTECTION_RULE

RULES = (DISCHARGE_RULE, PROTECTION_RULE)

__all__ = ["DISCHARGE_RULE", "PROTECTION_RULE", "RULES"]
