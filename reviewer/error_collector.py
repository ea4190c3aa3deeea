"""Every error of a hand-parsed file at once, each at its line, as a build file's are.

A profile or a rule pack's settings are checked by code, not by a pydantic model; each check
raises one :class:`~reviewer.errors.InputError`. A :class:`Collector` runs the checks that do
not depend on one another, keeps what each raises and goes on, then raises them together as
:class:`~reviewer.errors.InputErrors` in file order, at most
:data:`~reviewer.errors.MAX_REPORTED` spelt out, so a builder fixes a file in one pass.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any, TypeVar

from reviewer.errors import MAX_REPORTED, InputError, InputErrors

T = TypeVar("T")


class Collector:
    """The errors of one file (``where``, its ``text``)."""

    def __init__(self, where: str, text: str) -> None:
        self.where, self.text = where, text
        self.errors: list[InputError] = []

    def attempt(self, check: Callable[..., T], *args: Any, default: T) -> T:
        """``check(*args)``, or ``default`` after keeping the error(s) it raised."""
        try:
            return check(*args)
        except InputErrors as found:
            self.errors.extend(found.errors)
        except InputError as found:
            self.errors.append(found)
        return default

    def add(self, error: InputError) -> None:
        self.errors.append(error)

    def raise_any(self) -> None:
        """Raise what was kept, each with its line where the file has its field, in file
        order (an error of no line first); nothing if every check passed."""
        if not self.errors:
            return
        line_of = _line_finder(self.text)
        located = []
        for index, error in enumerate(self.errors):
            line = error.line if error.line is not None else line_of(error.field)
            placed = InputError(error.file, error.field, error.expected, line)
            located.append((line or 0, index, placed))
        located.sort(key=lambda item: item[:2])
        kept = [error for _, _, error in located[:MAX_REPORTED]]
        raise InputErrors(kept, more=len(located) - len(kept))


def _line_finder(text: str) -> Callable[[str], int | None]:
    """For a dotted field path, the line of the deepest part of it the file writes."""
    try:
        from reviewer.toml_positions import field_positions

        positions = field_positions(text)
    except Exception:  # noqa: BLE001 - a position only adds to an error: report it without
        positions = {}

    def line_of(field: str) -> int | None:
        parts = field.split(".")
        for end in range(len(parts), 0, -1):
            found = positions.get(".".join(parts[:end]))
            if found is not None:
                return int(found[0])
        return None

    return line_of
