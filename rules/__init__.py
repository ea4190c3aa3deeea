"""firstride's built-in rule pack.

Installed as ``firstride_rules`` and registered through the ``firstride.packs`` entry point,
exactly as a third-party pack would be: read this module to learn how to write one.
"""

from __future__ import annotations

from reviewer import hookimpl
from reviewer.rule import Rule


@hookimpl
def firstride_register_rules() -> list[Rule]:
    from firstride_rules import (
        battery,
        brake,
        controller,
        enclosure,
        logic,
        motor,
        performance,
        protection,
        regulator,
        speed,
        voltage,
        wiring,
    )

    return [
        # the five core checks
        wiring.RULE,
        motor.RULE,
        speed.RULE,
        enclosure.RULE,
        logic.RULE,
        # the rest of the power train
        *battery.RULES,
        voltage.RULE,
        protection.RULE,
        *controller.RULES,
        regulator.RULE,
        brake.RULE,
        performance.RULE,
    ]
