"""firstride's built-in rule pack.

Installed as ``firstride_rules`` and registered through the ``firstride.packs`` entry point,
exactly as a third-party pack would be: read this module to learn how to write one.

Layout: one package per rule area, one public module per rule named from its id
(``wiring.stall-current`` lives in ``firstride_rules.wiring.stall_current``) with a ``RULE``;
private helpers sit beside it, named by role with a leading underscore. Helpers that rules of
several areas share live in ``firstride_rules._shared``. The pack's own limits are in
``limits.toml`` beside this module and reach every profile through the same hook a third-party
pack uses.
"""

from __future__ import annotations

import importlib
from importlib import resources

from reviewer import hookimpl
from reviewer.rule import Rule

#: Every built-in rule, in the order ``firstride rules`` has always listed them.
RULE_IDS = (
    # the five core checks
    "wiring.stall-current",
    "motor.cooling",
    "speed.rider-class",
    "enclosure.ingress",
    "logic.pin-current",
    # the rest of the power train
    "battery.discharge",
    "battery.protection",
    "voltage.ratings",
    "protection.fuse",
    "controller.switch-thermal",
    "controller.freewheel",
    "controller.current-sense",
    "logic.regulator",
    "brake.dynamic",
    "performance.hill",
    # stopping
    "brake.stopping",
    "brake.regenerative",
    "speed.descent",
    # what else hurts riders
    "control.fail-safe",
    "battery.bms",
    "power.connectors",
    "charging.ratings",
    "mechanical.wheels",
    # a ride, not a moment
    "ride.heating",
    "ride.energy",
)


def module_for(rule_id: str) -> str:
    """The module a built-in rule lives in, found from its id alone."""
    area, name = rule_id.split(".", 1)
    return f"{__name__}.{area}.{name.replace('-', '_')}"


@hookimpl
def firstride_register_rules() -> list[Rule]:
    return [importlib.import_module(module_for(rule_id)).RULE for rule_id in RULE_IDS]


@hookimpl
def firstride_pack_limits() -> str:
    """The limits the built-in rules compare against (``limits.toml``), each with its source."""
    return resources.files(__name__).joinpath("limits.toml").read_text("utf-8")
