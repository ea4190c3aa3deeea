"""The controller's rules: its power switch's temperature, the freewheel path beside it, and the
current measurement its limit acts on. Each lives in its own module; this one gathers them.

- ``controller.switch-thermal`` (controller_thermal): junction temperature at the motor current.
- ``controller.freewheel`` (controller_freewheel): a freewheel diode, and its ratings.
- ``controller.current-sense`` (controller_sense): sensor range, averaging window, limit.
"""

from __future__ import annotations

from firstride_rules.controller_freewheel import RULE as FREEWHEEL
from firstride_rules.controller_sense import RULE as CURRENT_SENSE
from firstride_rules.controller_thermal import RULE as SWITCH_THERMAL

RULES = (SWITCH_THERMAL, FREEWHEEL, CURRENT_SENSE)

__all__ = ["CURRENT_SENSE", "FREEWHEEL", "RULES", "SWITCH_THERMAL"]
