"""Every field of the build file is read by some rule: a field no rule reads gives a builder the
false comfort that it was checked (issue 11). Each built-in rule declares the fields it reads in
``Rule.inputs``; this walks the build model's fields and finds each among them.

Only what names or identifies a part is exempt, each with its reason below.
"""

from __future__ import annotations

import re
import typing

from pydantic import BaseModel

from reviewer.build import Build
from reviewer.session import built_in_session

#: Fields that name a part or the vehicle: they label findings, no rule judges them.
IDENTITY = {
    "vehicle.name": "the review's title",
    "vehicle.revision": "the review's title",
    "vehicle.builder": "the review's header",
    "motors.name": "labels findings; wires and fuses refer to it",
    "wires.name": "labels findings; fuses refer to it",
    "fuses.name": "labels findings",
    "riders.name": "labels findings",
    "brakes.name": "labels findings",
    "brake": "the retired single [brake] table: read only to explain [[brakes]] as an error",
    "extensions": "a pack's own table, validated by that pack",
}


def field_paths(model: type[BaseModel], prefix: str = "") -> list[str]:
    """Every leaf field of ``model`` as a dotted path, lists without their index."""
    paths = []
    for name, field in model.model_fields.items():
        key = field.alias or name
        nested, stack = None, [field.annotation]
        while stack:
            kind = stack.pop()
            if isinstance(kind, type) and issubclass(kind, BaseModel):
                nested = kind
            stack.extend(typing.get_args(kind))
        if nested is not None and key != "extensions":
            paths += field_paths(nested, f"{prefix}{key}.")
        else:
            paths.append(f"{prefix}{key}")
    return paths


def test_every_build_field_is_an_input_of_some_rule() -> None:
    rules = built_in_session().manager.rules()
    declared = {re.sub(r"\[\d*\]", "", name) for rule in rules for name in rule.inputs}

    def read(path: str) -> bool:
        parts = path.split(".")
        return any(".".join(parts[:k]) in declared for k in range(1, len(parts) + 1))

    unread = [p for p in field_paths(Build) if p not in IDENTITY and not read(p)]
    assert unread == [], f"fields no rule reads: {unread}"


def test_the_walk_sees_nested_fields() -> None:
    paths = field_paths(Build)
    assert "motors.cooling.fan_independent" in paths and "controller.motor_current_limit" in paths
    assert len(paths) > 100
