"""Writing files the user asked for: whole or not at all."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

from reviewer.errors import InputError


def write_whole(path: Path, text: str | bytes) -> None:
    """Write to a temporary file beside the target, then rename: never a half-written file."""
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(str(path), "(output)", "a file in an existing folder")
    data = text.encode("utf-8") if isinstance(text, str) else text
    handle, temporary = tempfile.mkstemp(dir=folder, prefix=f".{path.name}.", suffix=".tmp")
    try:
        with os.fdopen(handle, "wb") as stream:
            stream.write(data)
        os.replace(temporary, path)
    except BaseException:
        Path(temporary).unlink(missing_ok=True)
        raise
