"""Errors a user can cause, each turned into one clear line at the command-line edge.

The line is made safe to print here, once, so no caller has to remember: a key or value from a
hostile file may hold ANSI escape sequences, bidi overrides, line separators or thousands of
characters. Such characters are shown as visible escapes (``\\x1b``, ``\\u202e``) and long
names are cut with an ellipsis, so an error is always one short line that means what it shows.
A pint object's repr that slipped into a message is spelt as a review spells it (``25 km/h``).
"""

from __future__ import annotations

import re
import unicodedata

#: Longest key, value or path segment an error line shows whole.
MAX_SHOWN = 80
#: Longest file name, field path and expectation an error line shows.
MAX_FILE, MAX_FIELD, MAX_EXPECTED = 300, 200, 400
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
    """Bad input: names the file, the field path and what was expected.

    The attributes keep the text as given; ``str()`` gives the safe, short line."""

    def __init__(self, file: str, field: str, expected: str) -> None:
        super().__init__(file, field, expected)
        self.file = file
        self.field = field
        self.expected = expected

    def __str__(self) -> str:
        file = _cut(printable(self.file), MAX_FILE)
        field = _cut(_SEGMENT.sub(_cut_segment, printable(self.field)), MAX_FIELD)
        expected = printable(without_pint(str(self.expected)))
        expected = _cut(_QUOTED.sub(_cut_quoted, expected), MAX_EXPECTED)
        return f"{file}: {field}: {expected}"
