"""Between the form and a build tree, in both directions, with every field named by its path.

A form field is named by its field path exactly as an input error names it
(``battery.cells_series``, ``riders[1].mass``, ``logic.port_groups[0].pins``), so an error from
the loader lands on its field. Rows left empty are dropped when the tree is made, which moves
the rows after them up; :class:`FormTree` keeps the map from the written row back to the row of
the form, so an error about ``riders[0]`` of the file is shown at the form's ``riders[2]``.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Any

from reviewer.web.schema_form import Field, FormShape, Group

#: The most rows a repeated group takes from a form (far more than any build has).
MAX_ROWS = 200
_INTEGER = re.compile(r"[+-]?[0-9]+")
_FLOAT = re.compile(r"[+-]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][+-]?[0-9]+)?")


# From a tree to the form's values -------------------------------------------------------------


def form_values(tree: Mapping[str, Any], shape: FormShape) -> dict[str, str]:
    """The build tree (as read from a TOML file) as form values by field path. Values of a
    shape the form cannot hold are left out; validation still reports them at their field."""
    values: dict[str, str] = {}
    for section in shape.sections:
        _group_values(values, section, section.key, tree.get(section.key))
    return values


def _group_values(values: dict[str, str], group: Group, path: str, value: Any) -> None:
    if group.repeated:
        if isinstance(value, list):
            for index, row in enumerate(value[:MAX_ROWS]):
                if isinstance(row, Mapping):
                    _table_values(values, group, f"{path}[{index}]", row)
    elif isinstance(value, Mapping):
        _table_values(values, group, path, value)


def _table_values(values: dict[str, str], group: Group, path: str, table: Mapping) -> None:
    for item in group.fields:
        if item.key in table:
            text = scalar_text(table[item.key], item)
            if text is not None:
                values[f"{path}.{item.key}"] = text
    for inner in group.groups:
        _group_values(values, inner, f"{path}.{inner.key}", table.get(inner.key))


def scalar_text(value: Any, item: Field) -> str | None:
    """A value as its field shows it; None for a value no field can show."""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int | str):
        return str(value)
    if isinstance(value, float):
        return repr(value) if math.isfinite(value) else str(value)
    if isinstance(value, list) and item.kind == "list":
        parts = [scalar_text(v, item) for v in value]
        return ", ".join(p for p in parts if p is not None)
    return None


# From the form's values to a tree -------------------------------------------------------------


@dataclass
class FormTree:
    """A build tree made from a form, and where each of its rows came from."""

    tree: dict[str, Any]
    rows: dict[str, str] = field(default_factory=dict)  # written row path -> form row path

    def form_path(self, written: str) -> str:
        """An error's field path in the written file, as the path of the form's field."""
        best, end = written, 0
        for match in re.finditer(r"\]", written):
            prefix = written[: match.end()]
            if prefix in self.rows:
                best, end = self.rows[prefix], match.end()
        return best + written[end:] if end else written


def form_tree(form: Mapping[str, str], shape: FormShape) -> FormTree:
    """The build tree a submitted form describes: empty fields, tables and rows left out."""
    result = FormTree({})
    keys = list(form)
    for section in shape.sections:
        value = _group_tree(form, keys, section, section.key, section.key, result)
        if value:
            result.tree[section.key] = value
    return result


def row_indices(keys: list[str], path: str) -> list[int]:
    """The row numbers a form holds for the repeated group at ``path``, in order."""
    pattern = re.compile(re.escape(path) + r"\[([0-9]{1,4})\]\.")
    found = {int(m.group(1)) for key in keys if (m := pattern.match(key))}
    return sorted(found)[:MAX_ROWS]


def _group_tree(
    form: Mapping[str, str], keys: list[str], group: Group, path: str, out: str, result: FormTree
) -> Any:
    if not group.repeated:
        return _table_tree(form, keys, group, path, out, result)
    rows = []
    for index in row_indices(keys, path):
        written = f"{out}[{len(rows)}]"
        row = _table_tree(form, keys, group, f"{path}[{index}]", written, result)
        if row:
            result.rows[written] = f"{path}[{index}]"
            rows.append(row)
    return rows


def _table_tree(
    form: Mapping[str, str], keys: list[str], group: Group, path: str, out: str, result: FormTree
) -> dict[str, Any]:
    table: dict[str, Any] = {}
    for item in group.fields:
        text = form.get(f"{path}.{item.key}", "")
        if text.strip():
            table[item.key] = typed_value(text, item)
    for inner in group.groups:
        value = _group_tree(form, keys, inner, f"{path}.{inner.key}", f"{out}.{inner.key}", result)
        if value:
            table[inner.key] = value
    return table


def typed_value(text: str, item: Field) -> Any:
    """What a field's text stands for in the build file. Text that is not of the field's type
    is written as a string, so the loader reports it at its field as for a file."""
    bare = text.strip()
    if item.kind == "boolean":
        return {"true": True, "false": False}.get(bare, text)
    if item.kind in ("integer", "number") and len(bare) <= 40:
        if _INTEGER.fullmatch(bare):
            return int(bare)
        if _FLOAT.fullmatch(bare):
            number = float(bare)
            return number if math.isfinite(number) else text
    if item.kind in ("integer", "number"):
        return text
    if item.kind == "list":
        return [part.strip() for part in text.split(",") if part.strip()]
    return text
