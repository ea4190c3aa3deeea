"""Read a build file from disk into a validated :class:`Build`, or one clear InputError."""

from __future__ import annotations

import hashlib
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from pydantic import BaseModel, ValidationError

from reviewer.build import Build
from reviewer.errors import InputError
from reviewer.inputs import MAX_INPUT_BYTES, decode, load_toml, read_bytes

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
        raise validation_error(exc, where, Build) from None
    return LoadedBuild(build, where, hashlib.sha256(raw).hexdigest(), data)


def validation_error(exc: ValidationError, where: str, root: type[BaseModel]) -> InputError:
    """The first validation error as one InputError naming the field path and what was expected."""
    error = exc.errors(include_url=False)[0]
    loc = tuple(error["loc"])
    field = _path_text(loc) or "(file)"
    kind = error["type"]
    if kind == "extra_forbidden":
        hint = _suggest(loc, root)
        return InputError(where, field, f"no such key{hint}")
    if kind == "missing":
        return InputError(where, field, "this field is required")
    message = str(error["msg"])
    for prefix in ("Value error, ", "Assertion failed, "):
        message = message.removeprefix(prefix)
    if kind.startswith("enum") or kind == "literal_error":
        message = message.replace("Input should be", "one of")
    return InputError(where, field, message)


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
