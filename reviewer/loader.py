"""Read a build file from disk into a validated :class:`Build`, or its input errors.

A build that fails validation raises :class:`~reviewer.errors.InputErrors`: every error pydantic
found, one per field, each with the line of the file the field is on, in file order, at most
:data:`~reviewer.errors.MAX_REPORTED` of them kept (the rest counted).
"""

from __future__ import annotations

import hashlib
import re
import tomllib
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from pydantic import BaseModel, ValidationError

from reviewer.build import Build
from reviewer.errors import MAX_REPORTED, InputError, InputErrors
from reviewer.inputs import _TOML_NOISE, MAX_INPUT_BYTES, decode, load_toml, read_bytes

MAX_BUILD_BYTES = MAX_INPUT_BYTES


@dataclass(frozen=True)
class LoadedBuild:
    build: Build
    path: str
    fingerprint: str  # SHA-256 of the file's bytes
    data: dict[str, Any]  # the raw TOML tree, for change reports


def load_build(path: str | Path) -> LoadedBuild:
    return parse_build(read_bytes(path, "build file"), str(path))  # regular files only


def parse_build(raw: bytes, where: str) -> LoadedBuild:
    if len(raw) > MAX_BUILD_BYTES:
        raise InputError(where, "(file)", f"a build file of at most {MAX_BUILD_BYTES} bytes")
    text = decode(raw, where, "a build file")
    if not text.strip():
        raise InputError(where, "(file)", "a TOML build file; this one is empty")
    data = load_toml(text, where)  # its nesting checked before it is parsed
    try:
        build = Build.model_validate(data)
    except ValidationError as exc:
        raise validation_error(exc, where, Build, text) from None
    return LoadedBuild(build, where, hashlib.sha256(raw).hexdigest(), data)


def validation_error(
    exc: ValidationError, where: str, root: type[BaseModel], text: str | None = None
) -> InputErrors:
    """Every validation error as InputErrors, one per field path, each saying what was expected.

    With the file's ``text`` each error carries the line of its field (or of the nearest table
    or key above it that the file has) and the errors come in file order; without it they come
    in the model's order, with no lines. At most :data:`MAX_REPORTED` are spelt out; the rest
    are only counted, so a file of thousands of mistakes costs no more than one of twenty."""
    line_of = _line_finder(text) if text is not None else _no_line
    seen: set[tuple[Any, ...]] = set()
    located: list[tuple[int, int, dict[str, Any]]] = []
    for index, error in enumerate(exc.errors(include_url=False)):
        loc = tuple(error["loc"])
        key = (loc, error["type"], error["msg"])
        if key in seen:
            continue
        seen.add(key)
        line = line_of(loc)
        located.append((0 if line is None else line, index, error))
    located.sort(key=lambda item: item[:2])  # file order; an error of no line first
    kept = [
        _one_error(error, where, root, line or None) for line, _, error in located[:MAX_REPORTED]
    ]
    return InputErrors(kept, more=len(located) - len(kept))


def _one_error(
    error: dict[str, Any], where: str, root: type[BaseModel], line: int | None
) -> InputError:
    """One validation error as an InputError naming the field path and what was expected."""
    loc = tuple(error["loc"])
    field = _path_text(loc) or "(file)"
    kind = error["type"]
    if kind == "extra_forbidden":
        hint = _suggest(loc, root)
        return InputError(where, field, f"no such key{hint}", line)
    if kind == "missing":
        return InputError(where, field, "this field is required", line)
    message = str(error["msg"])
    for prefix in ("Value error, ", "Assertion failed, "):
        message = message.removeprefix(prefix)
    if kind.startswith("enum") or kind == "literal_error":
        message = message.replace("Input should be", "one of")
    return InputError(where, field, message, line)


def _path_text(loc: tuple[Any, ...]) -> str:
    text = ""
    for part in loc:
        if isinstance(part, int):
            text += f"[{part}]"
        else:
            text += f".{part}" if text else str(part)
    return text


def _suggest(loc: tuple[Any, ...], root: type[BaseModel]) -> str:
    """'did you mean' from the model that owns the unknown key."""
    model: type[BaseModel] | None = root
    for part in loc[:-1]:
        if model is None or isinstance(part, int):
            continue
        info = model.model_fields.get(part)
        model = _inner_model(info.annotation) if info else None
    if model is None:
        return ""
    names = set(model.model_fields)
    names |= {f.alias for f in model.model_fields.values() if f.alias}
    import difflib  # only for a misspelt key: not imported on every review

    close = difflib.get_close_matches(str(loc[-1]), sorted(names), n=1, cutoff=0.6)
    return f"; did you mean {close[0]!r}?" if close else f"; known keys: {', '.join(sorted(names))}"


def _inner_model(annotation: Any) -> type[BaseModel] | None:
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return annotation
    for arg in getattr(annotation, "__args__", ()):
        found = _inner_model(arg)
        if found is not None:
            return found
    return None


# Where a field is in the file ----------------------------------------------------------------


def _no_line(loc: tuple[Any, ...]) -> int | None:
    return None


def _line_finder(text: str) -> Callable[[tuple[Any, ...]], int | None]:
    """For a pydantic location, the line of its field in ``text``, or of the nearest table or
    key above it that the file has (a missing field: its table's header); None if none is."""
    positions = _positions(text)

    def line_of(loc: tuple[Any, ...]) -> int | None:
        for end in range(len(loc), 0, -1):
            found = positions.get(_path_text(loc[:end]))
            if found is not None:
                return int(found[0])
        return None

    return line_of


def _positions(text: str) -> dict[str, tuple[int, int]]:
    """Field path (``battery.cells_series``, ``riders[0].mass``) to (line, column), 1-based:
    the project's shared map (:mod:`reviewer.toml_positions`) where it is installed, else the
    fallback scanner below. A position only adds to an error line, so a map that fails falls
    back too, and the errors are still reported."""
    try:
        from reviewer.toml_positions import field_positions
    except ImportError:
        return _scan_positions(text)
    try:
        return dict(field_positions(text))
    except Exception:  # noqa: BLE001 - the errors must show, with or without their lines
        return _scan_positions(text)


_KEY_PART = re.compile(r"""[ \t]*(?:([A-Za-z0-9_-]+)|("(?:[^"\\\n]|\\.)*")|'([^'\n]*)')[ \t]*""")


def _scan_positions(text: str) -> dict[str, tuple[int, int]]:
    """A fallback map of field positions, found by scanning for table headers and keys.

    Strings and comments are blanked first (same length, line breaks kept), so brackets, dots
    and ``=`` inside them count for nothing; the lines of a multi-line array are skipped. Each
    ``[[array]]`` header counts its element (``brakes[1]``); a key is placed under the last
    header. Keys inside inline tables are not placed: their errors take the line of the key
    that holds the inline table. Only for error messages: a line not found is simply left out."""
    masked = _TOML_NOISE.sub(_blank, text)
    positions: dict[str, tuple[int, int]] = {}
    table: list[str | int] = []
    arrays: dict[tuple[str | int, ...], int] = {}  # elements so far of each array of tables
    depth = 0  # open brackets of a value spread over lines
    lines = zip(masked.split("\n"), text.split("\n"), strict=True)  # blanking keeps line breaks
    for number, (bare, line) in enumerate(lines, 1):
        if depth > 0:
            depth = max(0, depth + _balance(bare))
            continue
        stripped = bare.lstrip()
        column = len(bare) - len(stripped) + 1
        if stripped.startswith("["):
            double = stripped.startswith("[[")
            start = column - 1 + (2 if double else 1)
            close = bare.find("]]" if double else "]", start)
            keys = _key_parts(line[start:close]) if close > 0 else None
            if keys is None:
                continue
            path = [*_resolved(keys[:-1], arrays), keys[-1]]
            if double:
                index = arrays.get(tuple(path), -1) + 1
                arrays[tuple(path)] = index
                path.append(index)
            table = path
            for end in range(1, len(path) + 1):
                positions.setdefault(_path_text(tuple(path[:end])), (number, column))
            continue
        equals = bare.find("=")
        keys = _key_parts(line[:equals]) if equals > 0 else None
        if keys is None:
            continue
        path = table + keys
        for end in range(len(table) + 1, len(path) + 1):
            positions.setdefault(_path_text(tuple(path[:end])), (number, column))
        depth = max(0, _balance(bare[equals + 1 :]))
    return positions


def _blank(match: re.Match[str]) -> str:
    fill = " " if match.group().startswith("#") else "x"
    return re.sub(r"[^\n]", fill, match.group())


def _balance(bare: str) -> int:
    return bare.count("[") + bare.count("{") - bare.count("]") - bare.count("}")


def _resolved(keys: list[str], arrays: dict[tuple[str | int, ...], int]) -> list[str | int]:
    """A header's parent keys, each array of tables among them at its latest element."""
    path: list[str | int] = []
    for key in keys:
        path.append(key)
        if tuple(path) in arrays:
            path.append(arrays[tuple(path)])
    return path


def _key_parts(text: str) -> list[str] | None:
    """The parts of a (dotted) TOML key, quoted parts decoded; None if it is not a key."""
    parts: list[str] = []
    position = 0
    while True:
        match = _KEY_PART.match(text, position)
        if match is None:
            return None
        bare, basic, literal = match.groups()
        if basic is not None:
            try:
                bare = tomllib.loads(f"k = {basic}")["k"]
            except tomllib.TOMLDecodeError:
                return None
        parts.append(bare if bare is not None else literal)
        position = match.end()
        if position == len(text):
            return parts
        if text[position] != ".":
            return None
        position += 1
