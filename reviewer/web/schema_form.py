"""The form's shape, read from the build file's JSON Schema, so a new field appears on the page
with no new page code.

Each top-level property that is a table or an array of tables becomes a :class:`Group` (a
section); inside it every property becomes a :class:`Field` (a string, quantity, number,
integer, boolean, choice or list of strings) or a nested group (``battery.bms`` is a table,
``logic.port_groups`` an array of tables). Properties the form cannot hold (free-form tables
such as ``extensions``) are listed in :attr:`FormShape.left_out`.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import cache
from typing import Any

#: How a scalar is typed in and read back.
KINDS = ("text", "quantity", "integer", "number", "boolean", "choice", "list")


@dataclass(frozen=True)
class Field:
    key: str
    label: str
    help: str
    kind: str  # one of KINDS
    required: bool = False
    choices: tuple[str, ...] = ()
    example: str = ""
    unit: str = ""
    default: str = ""


@dataclass(frozen=True)
class Group:
    key: str
    label: str
    help: str
    repeated: bool  # an array of tables: rows may be added and removed
    required: bool
    fields: tuple[Field, ...]
    groups: tuple[Group, ...]


@dataclass(frozen=True)
class FormShape:
    sections: tuple[Group, ...]
    left_out: tuple[str, ...]


def label_of(key: str) -> str:
    """``cell_continuous_current`` as ``Cell continuous current``."""
    words = key.replace("_", " ").replace("-", " ").strip()
    return words[:1].upper() + words[1:]


class _Reader:
    def __init__(self, schema: dict[str, Any]) -> None:
        self.defs: dict[str, Any] = schema.get("$defs", {})

    def resolve(self, node: dict[str, Any]) -> dict[str, Any]:
        """The node with its ``$ref`` (or one-element ``allOf``, or optional ``anyOf``)
        followed; the node's own description wins over the target's."""
        seen = 0
        while seen < 16:
            seen += 1
            target: dict[str, Any] | None = None
            if "$ref" in node:
                target = self.defs.get(str(node["$ref"]).rsplit("/", 1)[-1], {})
            elif len(node.get("allOf", ())) == 1:
                target = node["allOf"][0]
            elif "anyOf" in node:
                options = [o for o in node["anyOf"] if o.get("type") != "null"]
                target = options[0] if len(options) == 1 else None
            if target is None:
                return node
            merged = {k: v for k, v in node.items() if k not in ("$ref", "allOf", "anyOf")}
            node = {**target, **merged}
        return node

    def group(self, key: str, node: dict[str, Any], required: bool) -> Group | None:
        node = self.resolve(node)
        repeated = node.get("type") == "array"
        table = self.resolve(node.get("items", {})) if repeated else node
        if table.get("type") != "object" or "properties" not in table:
            return None
        needed = set(table.get("required", ()))
        fields: list[Field] = []
        groups: list[Group] = []
        for name, child in table["properties"].items():
            field = self.field(name, child, name in needed)
            if field is not None:
                fields.append(field)
                continue
            inner = self.group(name, child, name in needed)
            if inner is not None:
                groups.append(inner)
        help_text = node.get("description") or table.get("description") or ""
        return Group(
            key, label_of(key), help_text, repeated, required, tuple(fields), tuple(groups)
        )

    def field(self, key: str, node: dict[str, Any], required: bool) -> Field | None:
        node = self.resolve(node)
        kind = node.get("type")
        choices: tuple[str, ...] = ()
        if "enum" in node:
            choices, kind = tuple(str(v) for v in node["enum"]), "choice"
        elif kind == "string":
            kind = "quantity" if "x-dimension" in node else "text"
        elif kind == "array":
            items = self.resolve(node.get("items", {}))
            if items.get("type") != "string":
                return None
            kind = "list"
        elif kind not in ("integer", "number", "boolean"):
            return None
        examples = node.get("examples") or []
        example = _shown(examples[0]) if examples else ""
        default = node.get("default")
        return Field(
            key=key,
            label=label_of(key),
            help=str(node.get("description") or ""),
            kind=kind,
            required=required,
            choices=choices,
            example=example,
            unit=_unit_of(example) if kind == "quantity" else "",
            default="" if default is None or isinstance(default, dict) else _shown(default),
        )


def _shown(value: Any) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, list):
        return ", ".join(_shown(v) for v in value)
    return str(value)


_NUMBER_THEN_UNIT = re.compile(r"^\s*[-+]?[0-9.]+(?:[eE][-+]?[0-9]+)?\s*(.+?)\s*$")


def _unit_of(example: str) -> str:
    """The unit an example is written in (``"20 A"`` gives ``A``), or nothing."""
    match = _NUMBER_THEN_UNIT.match(example)
    return match.group(1) if match else ""


def form_shape(schema: dict[str, Any]) -> FormShape:
    """The form for a JSON Schema of the build file."""
    reader = _Reader(schema)
    needed = set(schema.get("required", ()))
    sections: list[Group] = []
    left_out: list[str] = []
    for key, node in schema.get("properties", {}).items():
        group = reader.group(key, node, key in needed)
        if group is None:
            left_out.append(key)
        else:
            sections.append(group)
    return FormShape(tuple(sections), tuple(left_out))


@cache
def build_form_shape() -> FormShape:
    """The form for today's build file (``reviewer.build.build_json_schema``)."""
    from reviewer.build import build_json_schema

    return form_shape(build_json_schema())
