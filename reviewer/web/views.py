"""The form laid out for its template: every section, row and field with its path, its value and
the input errors that belong to it.

Every error is placed once: at the field its path names, else at the nearest row or section
above it on the page (with the rest of its path in front of the message, ``bogus: no such
key``), else in the list at the top of the page. Nothing of a view is HTML: the template,
autoescaped, writes it all.
"""

from __future__ import annotations

import re
from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field

from reviewer.web.form_data import row_indices
from reviewer.web.schema_form import Field, FormShape, Group


@dataclass
class FieldView:
    field: Field
    name: str
    id: str
    value: str
    errors: list[str] = field(default_factory=list)


@dataclass
class RowView:
    path: str
    id: str
    number: str  # as shown: "1", "2"; the placeholder in a blank row
    fields: list[FieldView]
    groups: list[GroupView]
    errors: list[str] = field(default_factory=list)


@dataclass
class GroupView:
    group: Group
    path: str
    id: str
    rows: list[RowView]
    blank: RowView | None = None  # what an added row copies (repeated groups only)
    placeholder: str = ""
    next_index: int = 0
    errors: list[str] = field(default_factory=list)
    filled: bool = False  # a value or an error inside: the section opens


def dom_id(path: str) -> str:
    """An element id from a field path (``riders[0].mass`` gives ``f-riders-0--mass``)."""
    return "f-" + re.sub(r"[^A-Za-z0-9_]", "-", path)


class _Layout:
    def __init__(self, values: Mapping[str, str]) -> None:
        self.values = values
        self.keys = list(values)
        self.slots: dict[str, list[str]] = {}

    def group(self, group: Group, path: str, depth: int, live: bool) -> GroupView:
        view = GroupView(group, path, dom_id(path), [])
        if live:
            self.slots[path] = view.errors
        if not group.repeated:
            view.rows = [self.row(group, path, "", depth, live)]
            return view
        indices = (row_indices(self.keys, path) if live else []) or [0]
        view.rows = [
            self.row(group, f"{path}[{i}]", str(n), depth, live) for n, i in enumerate(indices, 1)
        ]
        view.placeholder = f"__ROW{depth}__"
        view.blank = self.row(group, f"{path}[{view.placeholder}]", "", depth, live=False)
        view.next_index = indices[-1] + 1
        return view

    def row(self, group: Group, path: str, number: str, depth: int, live: bool) -> RowView:
        fields = []
        for item in group.fields:
            name = f"{path}.{item.key}"
            shown = FieldView(item, name, dom_id(name), self.values.get(name, "") if live else "")
            if live:
                self.slots[name] = shown.errors
            fields.append(shown)
        groups = [self.group(g, f"{path}.{g.key}", depth + 1, live) for g in group.groups]
        row = RowView(path, dom_id(path), number, fields, groups)
        if live and group.repeated:
            self.slots[path] = row.errors
        return row

    def place(self, path: str, message: str) -> str | None:
        """Put the error at its field or the nearest row or section above; where it went."""
        at = path
        while at:
            slot = self.slots.get(at)
            if slot is not None:
                rest = path[len(at) :].lstrip(".")
                slot.append(f"{rest}: {message}" if rest else message)
                return at
            at = _parent(at)
        return None


def _parent(path: str) -> str:
    if path.endswith("]"):
        return path[: path.rfind("[")]
    cut = max(path.rfind("."), path.rfind("["))
    return path[:cut] if cut > 0 else ""


def _mark_filled(view: GroupView, values: Mapping[str, str]) -> bool:
    filled = bool(view.errors)
    for row in view.rows:
        filled |= bool(row.errors)
        for item in row.fields:
            filled |= bool(item.value.strip() or item.errors)
        for inner in row.groups:
            filled |= _mark_filled(inner, values)
    view.filled = filled
    return filled


@dataclass(frozen=True)
class Placed:
    """One error as the list at the top of the page shows it."""

    path: str
    message: str
    anchor: str | None  # the element id of where it is shown; None: only in the list


def layout(
    shape: FormShape, values: Mapping[str, str], errors: Iterable[tuple[str, str]] = ()
) -> tuple[list[GroupView], list[Placed]]:
    """The sections with their values and placed errors, and every error for the list at the
    top, each linked to where it is shown."""
    builder = _Layout(values)
    sections = [builder.group(section, section.key, 0, live=True) for section in shape.sections]
    placed = []
    for path, message in errors:
        at = builder.place(path, message)
        placed.append(Placed(path, message, None if at is None else dom_id(at)))
    for view in sections:
        _mark_filled(view, values)
    return sections, placed
