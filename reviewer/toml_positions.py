"""Where each field of a build file is written: field path -> (line, column) of its key.

Paths are written as the rest of the project writes them (``reviewer.export.flatten_fields``):
``battery.cells_series``, ``riders[0].mass``, ``motors[1].cooling.fan``, and keys of inline
tables the same way (``battery.bms.charge_current``). Tables get a position too: ``riders[1]``
is its ``[[riders]]`` header, ``battery`` its ``[battery]`` header, ``battery.bms`` the ``bms``
key of an inline table.

This is a scanner of TOML's structure, not a parser: it reads table headers (``[a.b]``), arrays
of tables (``[[a]]``, numbered as they come, per parent), dotted and quoted keys, inline tables
and arrays (their elements numbered), and skips comments and every kind of string, multi-line
ones included, so nothing inside them is taken for structure. It never raises: on text it cannot
follow it keeps what it found so far and goes on at the next line. Lines and columns are
1-based; a column counts Unicode code points (SARIF's ``unicodeCodePoints``).
"""

from __future__ import annotations

import re
from bisect import bisect_right
from contextlib import suppress

Position = tuple[int, int]

_BLANK = re.compile(r"[ \t]*")
_SPACE = re.compile(r"(?:[ \t\r\n]++|#[^\n]*+)*+")  # blanks, newlines and comments
_LINE_REST = re.compile(r"[^\n]*\n?")
_BARE = re.compile(r"[A-Za-z0-9_-]+")
_BASIC = re.compile(r'"(?:[^"\\\n]|\\.)*+"')
_LITERAL = re.compile(r"'[^'\n]*'")
# possessive loops (*+): an unclosed string costs one pass, never a backtracking storm
_ML_BASIC = re.compile(r'"""(?:[^"\\]|\\.|""?(?!"))*+"""(?:""?)?', re.S)
_ML_LITERAL = re.compile(r"'''(?:[^']|''?(?!'))*+'''(?:''?)?", re.S)
_SCALAR = re.compile(r"[^,\]}#\n]*")  # numbers, booleans, dates (a space may separate time)
# the common line, read in one match: ``bare_key = "one-line string" | 'literal' | scalar``
_PLAIN_LINE = re.compile(
    r"""([A-Za-z0-9_-]+)[ \t]*=[ \t]*"""
    r"""(?:"(?:[^"\\\n]|\\.)*+"|'[^'\n]*'|[^\s"'\[{#,\]}][^#\n,\]}"'\[{]*)"""
    r"""[ \t]*(?:#[^\n]*)?\r?(?:\n|\Z)"""
)
_ESCAPE = re.compile(r"\\(u[0-9A-Fa-f]{4}|U[0-9A-Fa-f]{8}|.)", re.S)
_SIMPLE_ESCAPES = {"b": "\b", "t": "\t", "n": "\n", "f": "\f", "r": "\r", '"': '"', "\\": "\\"}
_MAX_DEPTH = 64  # deeper values are skipped whole, not descended into


def field_positions(text: str) -> dict[str, Position]:
    """Every key, table and array element of a TOML text, by field path, at its first writing."""
    scanner = _Scanner(text)
    with suppress(RecursionError, IndexError, ValueError, TypeError):  # odd text: keep what
        scanner.run()  # was found
    return scanner.found


def parent_path(path: str) -> str:
    """The path one level up: ``motors[1].cooling.fan`` -> ``motors[1].cooling`` ->
    ``motors[1]`` -> ``motors`` -> ``""``."""
    if path.endswith("]") and "[" in path:
        return path[: path.rindex("[")]
    return path.rpartition(".")[0]


def locate(positions: dict[str, Position], path: str) -> Position:
    """The position of ``path``; for a field not in the file, that of its nearest written table
    (or key) above it; line 1, column 1 when none is."""
    while path:
        found = positions.get(path)
        if found is not None:
            return found
        path = parent_path(path)
    return (1, 1)


def _join(prefix: str, key: str) -> str:
    return f"{prefix}.{key}" if prefix else key


def _unescape(body: str) -> str:
    if "\\" not in body:
        return body

    def one(match: re.Match[str]) -> str:
        code = match.group(1)
        if code[0] in "uU" and len(code) > 1:
            value = int(code[1:], 16)
            return chr(value) if value <= 0x10FFFF else match.group(0)
        return _SIMPLE_ESCAPES.get(code, match.group(0))

    return _ESCAPE.sub(one, body)


class _Scanner:
    def __init__(self, text: str) -> None:
        self.text = text
        self.pos = 0
        self.found: dict[str, Position] = {}
        self.arrays: dict[str, int] = {}  # array of tables (its path) -> tables so far
        self.table: str | None = ""  # the current table's path; None after a broken header
        self.starts = [0] + [m.end() for m in re.finditer("\n", text)]

    # --- positions ---------------------------------------------------------------------------

    def record(self, path: str, offset: int) -> None:
        if path not in self.found:
            line = bisect_right(self.starts, offset)
            self.found[path] = (line, offset - self.starts[line - 1] + 1)

    # --- lines -------------------------------------------------------------------------------

    def run(self) -> None:
        text = self.text
        self.pos = 1 if text.startswith("\ufeff") else 0  # a byte-order mark is no key
        while True:
            self.pos = _SPACE.match(text, self.pos).end()
            if self.pos >= len(text):
                return
            start = self.pos
            plain = None if self.table is None else _PLAIN_LINE.match(text, start)
            if plain is not None:
                self.record(_join(self.table, plain.group(1)), start)
                self.pos = plain.end()
                continue
            if text[start] == "[":
                self.header()
            elif self.table is not None:
                self.key_value(self.table, 0)
            self.end_line()
            if self.pos <= start:  # no progress: go on at the next line
                self.pos = _LINE_REST.match(text, start).end()
                if self.pos <= start:
                    return

    def end_line(self) -> None:
        """Past the rest of this line: blanks, a comment, or text this scanner cannot follow."""
        self.pos = _LINE_REST.match(self.text, self.pos).end()

    def header(self) -> None:
        text = self.text
        double = text.startswith("[[", self.pos)
        self.pos += 2 if double else 1
        keys = self.keys()
        self.pos = _BLANK.match(text, self.pos).end()
        closing = "]]" if double else "]"
        if not keys or not text.startswith(closing, self.pos):
            self.table = None  # keys below a header we cannot read are not placed anywhere
            return
        self.pos += len(closing)
        path = ""
        for index, (name, offset) in enumerate(keys):
            path = _join(path, name)
            last = index == len(keys) - 1
            if last and double:
                self.record(path, offset)
                count = self.arrays.get(path, 0)
                self.arrays[path] = count + 1
                path = f"{path}[{count}]"
            elif path in self.arrays:  # a table inside the latest table of that array
                self.record(path, offset)
                path = f"{path}[{self.arrays[path] - 1}]"
            self.record(path, offset)
        self.table = path

    # --- keys and values ---------------------------------------------------------------------

    def keys(self) -> list[tuple[str, int]]:
        """A dotted key's parts with their offsets; empty when there is no key here."""
        text = self.text
        parts: list[tuple[str, int]] = []
        while True:
            self.pos = _BLANK.match(text, self.pos).end()
            offset = self.pos
            name = self.key_part()
            if name is None:
                return []  # no key here, or a dangling dot
            parts.append((name, offset))
            self.pos = _BLANK.match(text, self.pos).end()
            if not text.startswith(".", self.pos):
                return parts
            self.pos += 1

    def key_part(self) -> str | None:
        text = self.text
        for pattern, strip, escaped in ((_BARE, 0, False), (_BASIC, 1, True), (_LITERAL, 1, False)):
            match = pattern.match(text, self.pos)
            if match:
                self.pos = match.end()
                body = match.group(0)[strip : len(match.group(0)) - strip]
                return _unescape(body) if escaped else body
        return None

    def key_value(self, prefix: str, depth: int) -> bool:
        """``key = value`` under ``prefix``; False when there is none here."""
        keys = self.keys()
        if not keys:
            return False
        self.pos = _BLANK.match(self.text, self.pos).end()
        if not self.text.startswith("=", self.pos):
            return False
        self.pos += 1
        path = prefix
        for name, offset in keys:
            path = _join(path, name)
            self.record(path, offset)
        self.value(path, depth)
        return True

    def value(self, path: str, depth: int) -> None:
        text = self.text
        self.pos = _BLANK.match(text, self.pos).end()
        if self.pos >= len(text):
            return
        char = text[self.pos]
        if char == "[" or char == "{":
            if depth >= _MAX_DEPTH:
                self.skip_nested()
            elif char == "[":
                self.array(path, depth + 1)
            else:
                self.inline_table(path, depth + 1)
            return
        for pattern in (_ML_BASIC, _BASIC, _ML_LITERAL, _LITERAL, _SCALAR):
            match = pattern.match(text, self.pos)
            if match and match.end() > self.pos:
                self.pos = match.end()
                return

    def array(self, path: str, depth: int) -> None:
        text = self.text
        self.pos += 1  # the "["
        index = 0
        while self.pos < len(text):
            self.pos = _SPACE.match(text, self.pos).end()
            if self.pos >= len(text):
                return
            char = text[self.pos]
            if char == "]":
                self.pos += 1
                return
            if char == ",":
                self.pos += 1
                index += 1
                continue
            start = self.pos
            element = f"{path}[{index}]"
            self.record(element, start)
            self.value(element, depth)
            if self.pos <= start:  # nothing this scanner can read: leave the array
                return

    def inline_table(self, path: str, depth: int) -> None:
        text = self.text
        self.pos += 1  # the "{"
        while self.pos < len(text):
            self.pos = _SPACE.match(text, self.pos).end()
            if self.pos >= len(text):
                return
            char = text[self.pos]
            if char == "}":
                self.pos += 1
                return
            if char == ",":
                self.pos += 1
                continue
            if not self.key_value(path, depth):
                return

    def skip_nested(self) -> None:
        """Past a bracketed value too deep to descend into, strings honoured, without recursion."""
        text = self.text
        level = 0
        while self.pos < len(text):
            char = text[self.pos]
            if char in "[{":
                level += 1
            elif char in "]}":
                level -= 1
                if level == 0:
                    self.pos += 1
                    return
            elif char in "\"'":
                for pattern in (_ML_BASIC, _BASIC, _ML_LITERAL, _LITERAL):
                    match = pattern.match(text, self.pos)
                    if match:
                        self.pos = match.end() - 1
                        break
            elif char == "#":
                self.pos = _LINE_REST.match(text, self.pos).end() - 1
            self.pos += 1
