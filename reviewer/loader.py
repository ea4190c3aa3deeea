"""Read a build file from disk into a validated :class:`Build`, or one clear InputError."""

from __future__ import annotations

import hashlib
import tomllib
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from pydantic import BaseModel, ValidationError

from reviewer.build import Build
from reviewer.errors import InputError

MAX_BUILD_BYTES = 1_000_000


@dataclass(frozen=True)
class LoadedBuild:
    build: Build
    path: str
    fingerprint: str  # SHA-256 of the file's bytes
    data: dict[str, Any]  # the raw TOML tree, for change reports


def load_build(path: str | Path) -> LoadedBuild:
    where = str(path)
    try:
        raw = Path(path).read_bytes()
    except FileNotFoundError:
        raise InputError(where, "(file)", "an existing build file") from None
    except IsADirectoryError:
        raise InputError(where, "(file)", "a build file, not a folder") from None
    except OSError as exc:
        raise InputError(where, "(file)", f"a readable file ({exc.strerror})") from None
    return parse_build(raw, where)


def parse_build(raw: bytes, where: str) -> LoadedBuild:
    if len(raw) > MAX_BUILD_BYTES:
        raise InputError(where, "(file)", f"a build file under {MAX_BUILD_BYTES} bytes")
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError:
        raise InputError(where, "(file)", "UTF-8 text") from None
    if not text.strip():
        raise InputError(where, "(file)", "a TOML build file; this one is empty")
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(where, "(file)", f"valid TOML ({exc})") from None
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
