"""A small TOML writer for the shapes a build file has: strings, integers, floats, booleans,
tables, arrays of tables and inline arrays of those scalars.

What it writes reads back (``tomllib``) as exactly the tree it was given. Within each table its
keys come first, then its tables, then its arrays of tables, each in the order given, because
TOML puts a table's own keys before any header below it. Strings are basic strings with every
character TOML does not allow raw escaped; a lone surrogate (which no TOML file can hold)
becomes U+FFFD.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping, Sequence
from typing import Any

_BARE_KEY = re.compile(r"[A-Za-z0-9_-]+")
_SHORT_ESCAPES = {
    "\b": "\\b",
    "\t": "\\t",
    "\n": "\\n",
    "\f": "\\f",
    "\r": "\\r",
    '"': '\\"',
    "\\": "\\\\",
}


def toml_string(text: str) -> str:
    """``text`` as a TOML basic string, quotes included."""
    out = ['"']
    for char in text:
        code = ord(char)
        if char in _SHORT_ESCAPES:
            out.append(_SHORT_ESCAPES[char])
        elif code < 0x20 or code == 0x7F:
            out.append(f"\\u{code:04X}")
        elif 0xD800 <= code <= 0xDFFF:
            out.append("\ufffd")
        else:
            out.append(char)
    out.append('"')
    return "".join(out)


def toml_key(key: str) -> str:
    return key if _BARE_KEY.fullmatch(key) else toml_string(key)


def toml_value(value: Any) -> str:
    """A scalar or an inline array (of scalars or inline tables) as TOML."""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        if math.isnan(value):
            return "nan"
        if math.isinf(value):
            return "inf" if value > 0 else "-inf"
        return repr(value)
    if isinstance(value, str):
        return toml_string(value)
    if isinstance(value, Mapping):
        inner = ", ".join(f"{toml_key(str(k))} = {toml_value(v)}" for k, v in value.items())
        return "{ " + inner + " }" if inner else "{}"
    if isinstance(value, Sequence):
        return "[" + ", ".join(toml_value(item) for item in value) + "]"
    raise TypeError(f"no TOML form for {type(value).__name__}")


def _is_table_array(value: Any) -> bool:
    return (
        isinstance(value, Sequence)
        and not isinstance(value, str)
        and bool(value)
        and all(isinstance(item, Mapping) for item in value)
    )


def dumps(tree: Mapping[str, Any]) -> str:
    """The whole tree as a TOML document (empty tables kept as bare headers)."""
    lines: list[str] = []
    _table(lines, (), tree, header=None)
    text = "\n".join(lines).strip("\n")
    return text + "\n" if text else ""


def _table(
    lines: list[str], path: tuple[str, ...], table: Mapping[str, Any], header: str | None
) -> None:
    if header is not None:
        if lines:
            lines.append("")
        lines.append(header)
    tables: list[tuple[str, Mapping[str, Any]]] = []
    arrays: list[tuple[str, Sequence[Mapping[str, Any]]]] = []
    for key, value in table.items():
        if isinstance(value, Mapping):
            tables.append((key, value))
        elif _is_table_array(value):
            arrays.append((key, value))
        else:
            lines.append(f"{toml_key(key)} = {toml_value(value)}")
    for key, value in tables:
        inner = (*path, key)
        _table(lines, inner, value, "[" + _dotted(inner) + "]")
    for key, items in arrays:
        inner = (*path, key)
        for item in items:
            _table(lines, inner, item, "[[" + _dotted(inner) + "]]")


def _dotted(path: tuple[str, ...]) -> str:
    return ".".join(toml_key(part) for part in path)
