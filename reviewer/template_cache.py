"""Compiled templates kept between runs, so a review does not compile its template each time.

Jinja2 turns a template into Python source and compiles that on first use: about 50 ms for the
review template, a sixth of a whole ``firstride review``. Its bytecode cache stores the compiled
code in a folder and checks the template's source against a checksum on every load, so an
edited template is compiled afresh. Two things the checksum does not cover are added to the
key here: the Jinja2 version, whose generated code calls its own runtime, and the environment's
settings that shape the generated code (trim_blocks, finalize and the like), so two
environments, or a changed one, never share compiled code.

The folder is the user's cache folder (``platformdirs``, which pint already brings). Any
trouble with it, no platformdirs, a folder that cannot be made or written or that others may
write to, a damaged file, means templates are compiled as before: the cache can only save
time, never fail a review.
"""

from __future__ import annotations

import contextlib
import hashlib
import os
import stat
from pathlib import Path

import jinja2
from jinja2.bccache import Bucket

#: Sub-folder of the user's cache folder for firstride.
FOLDER_NAME = "templates"


def default_folder() -> Path | None:
    """``<user cache>/firstride/templates``, or None where there is no such place."""
    try:
        from platformdirs import user_cache_path
    except ImportError:
        return None
    try:
        return user_cache_path("firstride", appauthor=False) / FOLDER_NAME
    except (OSError, RuntimeError, KeyError):  # no home folder, for instance
        return None


class TemplateCache(jinja2.FileSystemBytecodeCache):
    """Jinja2's file cache, keyed also on the environment, and silent about every error."""

    def get_bucket(
        self, environment: jinja2.Environment, name: str, filename: str | None, source: str
    ) -> Bucket:
        key = self.get_cache_key(f"{settings_key(environment)}\0{name}", filename)
        bucket = Bucket(environment, key, self.get_source_checksum(source))
        self.load_bytecode(bucket)
        return bucket

    def load_bytecode(self, bucket: Bucket) -> None:
        try:
            super().load_bytecode(bucket)
        except Exception:  # noqa: BLE001 - a damaged or unreadable file: compile instead
            bucket.reset()

    def dump_bytecode(self, bucket: Bucket) -> None:
        with contextlib.suppress(OSError):  # a full disk, a folder made read-only meanwhile
            super().dump_bytecode(bucket)


def settings_key(environment: jinja2.Environment) -> str:
    """What, besides the template's source, decides the code Jinja2 generates for it."""
    finalize = environment.finalize
    autoescape = environment.autoescape
    settings = (
        jinja2.__version__,
        environment.block_start_string,
        environment.block_end_string,
        environment.variable_start_string,
        environment.variable_end_string,
        environment.comment_start_string,
        environment.comment_end_string,
        environment.line_statement_prefix,
        environment.line_comment_prefix,
        environment.trim_blocks,
        environment.lstrip_blocks,
        environment.newline_sequence,
        environment.keep_trailing_newline,
        environment.optimized,
        environment.is_async,
        sorted(environment.extensions),
        autoescape if isinstance(autoescape, bool) else _qualified(autoescape),
        None if finalize is None else _qualified(finalize),
    )
    return hashlib.sha256(repr(settings).encode()).hexdigest()


def _qualified(function: object) -> str:
    return f"{getattr(function, '__module__', '?')}.{getattr(function, '__qualname__', '?')}"


def bytecode_cache(folder: Path | None = None) -> TemplateCache | None:
    """A cache in ``folder`` (default: :func:`default_folder`), or None when that folder
    cannot be made or written, or others may write to it."""
    folder = folder if folder is not None else default_folder()
    if folder is None:
        return None
    try:
        folder.mkdir(mode=0o700, parents=True, exist_ok=True)
        if not _private(folder) or not os.access(folder, os.W_OK | os.X_OK):
            return None
    except OSError:
        return None
    return TemplateCache(str(folder))


def _private(folder: Path) -> bool:
    """A folder only its owner, this user, can write to: the cache holds code that is run, so
    a folder others could write to is not used (as Jinja2 checks for its own default folder)."""
    status = folder.stat()
    if not stat.S_ISDIR(status.st_mode):
        return False
    if not hasattr(os, "getuid"):  # Windows: the user's own profile folder
        return True
    return status.st_uid == os.getuid() and not status.st_mode & (stat.S_IWGRP | stat.S_IWOTH)
