"""Errors a user can cause, each turned into one clear line at the command-line edge.

The line is made safe to print here, once, so no caller has to remember: a key or value from a
hostile file may hold ANSI escape sequences, bidi overrides, line separators or thousands of
characters. Such characters are shown as visible escapes (``\\x1b``, ``\\u202e``) and long
names are cut with an ellipsis, so an error is always one short line that means what it shows.
A pint object's repr that slipped into a message is spelt as a review spells it (``25 km/h``).

An error about a place in a file carries its line (``build.toml:12: battery.cells_series: ...``).
A file with several mistakes gives :class:`InputErrors`: every one of them, in file order, up to
:data:`MAX_REPORTED` lines and then one line saying how many more there are.
"""

from __future__ import annotations

import re
import unicodedata
from collections.abc import Sequence

#: Longest key, value or path segment an error line shows whole.
MAX_SHOWN = 80
#: Longest file name, field path and expectation an error line shows.
MAX_FILE, MAX_FIELD, MAX_EXPECTED = 300, 200, 400
#: Most errors of one file reported line by line; the rest are counted on one more line.
MAX_REPORTED = 20
_HIDDEN_CATEGORIES = frozenset({"Cc", "Cf", "Cs", "Co", "Cn", "Zl", "Zp"})
#: Characters outside those categories that still show as nothing, or as a line break.
_INVISIBLE = frozenset("\u115f\u1160\u3164\uffa0\u2800\u034f\u17b4\u17b5")
_LONG = MAX_SHOWN + 1
_SEGMENT = re.compile(rf"[^.\[\] ]{{{_LONG},}}")
_QUOTED = re.compile(rf"'[^']{{{_LONG},}}'|\"[^\"]{{{_LONG},}}\"")


def _escaped(char: str) -> str:
    code = ord(char)
    if code < 0x100:
        return f"\\x{code:02x}"
    if code < 0x10000:
        return f"\\u{code:04x}"
    return f"\\U{code:08x}"


def printable(text: object) -> str:
    """``text`` with every control, format, separator or invisible character (and every
    white space but the plain space) shown as an escape, so it prints as what it is."""
    value = str(text)
    if value.isascii() and value.isprintable():
        return value
    return "".join(
        _escaped(char)
        if (
            unicodedata.category(char) in _HIDDEN_CATEGORIES
            or char in _INVISIBLE
            or (char.isspace() and char != " ")
            or 0xFE00 <= ord(char) <= 0xFE0F
            or 0xE0100 <= ord(char) <= 0xE01EF
        )
        else char
        for char in value
    )


def _cut(text: str, limit: int) -> str:
    return text if len(text) <= limit else text[: limit - 1] + "…"


def _cut_segment(match: re.Match[str]) -> str:
    return _cut(match.group(), MAX_SHOWN)


def _cut_quoted(match: re.Match[str]) -> str:
    quoted = match.group()
    return quoted[0] + _cut(quoted[1:-1], MAX_SHOWN - 2) + quoted[0]


def shown(text: object, limit: int = MAX_SHOWN) -> str:
    """``text`` as an error line shows it: escaped (:func:`printable`) and at most ``limit``
    characters."""
    return _cut(printable(text), limit)


_PINT_REPR = re.compile(r"<Quantity\(([^,()]+), '([^']*)'\)>|<Unit\('([^']*)'\)>")


def _spelt(match: re.Match[str]) -> str:
    """A pint object's repr written as a review writes it (``25 km/h``)."""
    magnitude, quantity_unit, bare_unit = match.groups()
    words = quantity_unit if bare_unit is None else bare_unit
    try:
        from reviewer.units import format_number, unit, unit_symbol

        symbol = unit_symbol(unit(words))
        number = format_number(float(magnitude)) if bare_unit is None else ""
    except Exception:  # noqa: BLE001 - the words as they are are still better than a repr
        return words if bare_unit is not None else f"{magnitude} {words}"
    return symbol if bare_unit is not None else f"{number} {symbol}"


def without_pint(text: str) -> str:
    """``text`` with any pint repr (``<Quantity(25.0, 'kilometer / hour')>``) spelt out."""
    if "<Quantity(" not in text and "<Unit(" not in text:
        return text
    return _PINT_REPR.sub(_spelt, text)


class InputError(Exception):
    """Bad input: names the file, the field path and what was expected, and the line of the
    file it is on when it is about one place in it.

    The attributes keep the text as given; ``str()`` gives the safe, short line."""

    def __init__(self, file: str, field: str, expected: str, line: int | None = None) -> None:
        # the line joins the arguments only when given, so subclasses pickle as before
        super().__init__(file, field, expected, *(() if line is None else (line,)))
        self.file = file
        self.field = field
        self.expected = expected
        self.line = line

    def __str__(self) -> str:
        file = _cut(printable(self.file), MAX_FILE)
        if self.line is not None:
            file += f":{self.line}"
        field = _cut(_SEGMENT.sub(_cut_segment, printable(self.field)), MAX_FIELD)
        expected = printable(without_pint(str(self.expected)))
        expected = _cut(_QUOTED.sub(_cut_quoted, expected), MAX_EXPECTED)
        return f"{file}: {field}: {expected}"


class InputErrors(InputError):
    """Every input error of one file, in file order: :meth:`lines` gives one safe line each.

    ``errors`` are the errors kept (a loader keeps at most :data:`MAX_REPORTED`), ``more``
    counts those found beyond them. It is an :class:`InputError` itself, naming the first error
    (file, field, expected, line), so a caller with room for one line only (a fleet summary's
    row, a sweep point) still reads one; its ``str()`` is that line with the count of the rest."""

    def __init__(self, errors: Sequence[InputError], more: int = 0) -> None:
        if not errors:
            raise ValueError("InputErrors needs at least one error")
        first = errors[0]
        super().__init__(first.file, first.field, first.expected, first.line)
        self.args = (tuple(errors), more)  # pickles as InputErrors(errors, more)
        self.errors = tuple(errors)
        self.total = len(self.errors) + more

    def lines(self, limit: int = MAX_REPORTED) -> list[str]:
        """One line per error, at most ``limit``, then ``FILE: ... and N more`` for the rest."""
        shown_lines = [str(error) for error in self.errors[:limit]]
        rest = self.total - len(shown_lines)
        if rest > 0:
            shown_lines.append(f"{_cut(printable(self.file), MAX_FILE)}: ... and {rest} more")
        return shown_lines

    def __str__(self) -> str:
        first = str(self.errors[0])
        return first if self.total == 1 else f"{first} (and {self.total - 1} more)"
