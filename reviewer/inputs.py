"""Every file firstride reads goes through here: regular files only, a size cap, UTF-8, depth.

Build files, profiles (and the profiles they extend), waivers, a previous review given with
``--since``, key files and reviews to sign or verify are all read by :func:`read_bytes`, so each
of them is refused the same way, in one line, before it can do harm:

- **Not a regular file.** ``/dev/zero`` or ``/dev/urandom`` would be read until memory runs out,
  a FIFO would block for ever, a socket or a folder cannot be read at all. The path is looked at
  with ``os.stat`` before it is opened, and opened with ``O_NONBLOCK`` so a FIFO swapped in
  after the look cannot block; the opened file is looked at again (``fstat``) and must be the
  same regular file.
- **Too large.** At most :data:`MAX_INPUT_BYTES` (1 MiB) for a build, profile or waivers file,
  :data:`MAX_REVIEW_BYTES` (4 MiB) for a review, :data:`MAX_KEY_BYTES` for a key file. The
  size is checked before reading and again while reading, so a file that grows is cut off.
- **Not UTF-8.** One line naming the first bad byte and its offset.
- **Nested too deep.** Python's TOML and JSON parsers recurse into nested arrays and tables and
  end in ``RecursionError``; dotted TOML keys nested a few thousand deep cost the parser
  quadratic time and memory. :func:`nesting_depth` finds the depth by a cheap scan of the text
  (strings and comments skipped), before any parser sees it; more than :data:`MAX_NESTING`
  levels is refused.

Each refusal is an :class:`~reviewer.errors.InputError` naming the file (or the file that
referred to it) and the field that named it.
"""

from __future__ import annotations

import errno
import itertools
import json
import os
import re
import stat
import tomllib
from pathlib import Path
from typing import Any

from reviewer.errors import InputError

#: The largest input file read (1 MiB): far above any real build, profile, waivers file,
#: review or previous review, far below what would make reading it a problem.
MAX_INPUT_BYTES = 1024 * 1024
#: The largest review read (a Markdown review to sign or verify, a JSON one for ``--since``):
#: 4 MiB, as a review restates its build and grows with it (the samples' are about 70 KB).
MAX_REVIEW_BYTES = 4 * 1024 * 1024
#: The largest key file read: a PEM Ed25519 key is about 120 bytes.
MAX_KEY_BYTES = 64 * 1024
#: The deepest nesting of tables and arrays read. A build's deepest field is some five
#: levels down (``extensions.pack.table.list[0].field``); a profile's limits about six.
MAX_NESTING = 32
_FILE = "(file)"
_KINDS = (
    (stat.S_ISDIR, "a folder"),
    (stat.S_ISCHR, "a character device"),
    (stat.S_ISBLK, "a block device"),
    (stat.S_ISFIFO, "a named pipe (FIFO)"),
    (stat.S_ISSOCK, "a socket"),
)


def kind_of(mode: int) -> str:
    """What a file of this ``st_mode`` is, in words."""
    for test, name in _KINDS:
        if test(mode):
            return name
    return "a regular file" if stat.S_ISREG(mode) else "not a regular file"


def read_bytes(
    path: str | Path,
    what: str,
    *,
    field: str = _FILE,
    reported: str | None = None,
    limit: int = MAX_INPUT_BYTES,
) -> bytes:
    """The whole content of the regular file ``path``, at most ``limit`` bytes.

    ``what`` names the file for the reader ("build file"); errors name ``reported`` (default:
    the path itself) and ``field`` (the option or key that named the path)."""
    where = str(path)
    shown = where if reported is None else reported
    note = "" if reported is None else f" ({where})"
    try:
        before = os.stat(where)
    except FileNotFoundError:
        raise InputError(shown, field, f"an existing {what}{note}; there is no such file") from None
    except OSError as exc:
        raise InputError(shown, field, f"a readable {what}{note} ({_reason(exc)})") from None
    if not stat.S_ISREG(before.st_mode):
        raise InputError(
            shown, field, f"a {what} (a regular file){note}; this is {kind_of(before.st_mode)}"
        )
    if before.st_size > limit:
        raise InputError(
            shown, field, f"a {what} of at most {_size(limit)}{note}; {_too_big(before.st_size)}"
        )
    try:
        descriptor = os.open(where, os.O_RDONLY | os.O_NONBLOCK | os.O_NOCTTY | os.O_CLOEXEC)
    except OSError as exc:
        raise InputError(shown, field, f"a readable {what}{note} ({_reason(exc)})") from None
    try:
        opened = os.fstat(descriptor)
        if not stat.S_ISREG(opened.st_mode) or (opened.st_dev, opened.st_ino) != (
            before.st_dev,
            before.st_ino,
        ):
            raise InputError(
                shown, field, f"a {what} that stays put{note}; it was replaced while being read"
            )
        chunks: list[bytes] = []
        total = 0
        while total <= limit:
            chunk = os.read(descriptor, limit + 1 - total)
            if not chunk:
                break
            chunks.append(chunk)
            total += len(chunk)
    except OSError as exc:
        raise InputError(shown, field, f"a readable {what}{note} ({_reason(exc)})") from None
    finally:
        os.close(descriptor)
    if total > limit:
        raise InputError(
            shown, field, f"a {what} of at most {_size(limit)}{note}; it grew while being read"
        )
    return b"".join(chunks)


def decode(raw: bytes, where: str, what: str, field: str = _FILE) -> str:
    """``raw`` as UTF-8 text, or one line naming the first byte that is not."""
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        byte = raw[exc.start]
        raise InputError(
            where, field, f"{what} in UTF-8; byte 0x{byte:02x} at offset {exc.start} is not UTF-8"
        ) from None


def read_text(
    path: str | Path,
    what: str,
    *,
    syntax: str | None = None,
    field: str = _FILE,
    reported: str | None = None,
    limit: int = MAX_INPUT_BYTES,
) -> str:
    """A text file read as :func:`read_bytes` says and decoded; with ``syntax`` ("toml" or
    "json") its nesting is checked before any parser sees it (:func:`check_nesting`)."""
    raw = read_bytes(path, what, field=field, reported=reported, limit=limit)
    shown = str(path) if reported is None else reported
    text = decode(raw, shown, f"a {what}", field)
    if syntax is not None:
        check_nesting(text, shown, syntax, field)
    return text


def load_toml(text: str, where: str, field: str = _FILE) -> dict[str, Any]:
    """Parse TOML whose nesting :func:`check_nesting` accepts; one line for any syntax error."""
    check_nesting(text, where, "toml", field)
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:  # one error: the file cannot be read further
        raise InputError(where, field, f"valid TOML ({exc})", _toml_line(exc, text)) from None
    except RecursionError:  # cannot happen after the scan; kept so it can never show
        raise InputError(where, field, _nesting_text(MAX_NESTING + 1)) from None


_AT_LINE = re.compile(r"\(at line (\d+), column \d+\)")


def _toml_line(exc: tomllib.TOMLDecodeError, text: str) -> int:
    """The line the TOML parser names for its error; its last line at the end of the text."""
    found = getattr(exc, "lineno", None)  # Python 3.14 gives it; older ones only in the text
    if isinstance(found, int) and found > 0:
        return found
    match = _AT_LINE.search(str(exc))
    return int(match.group(1)) if match else max(1, len(text.splitlines()))


def load_json(text: str, where: str, what: str, field: str = _FILE) -> Any:
    """Parse JSON whose nesting :func:`check_nesting` accepts; one line for any syntax error."""
    check_nesting(text, where, "json", field)
    try:
        return json.loads(text)
    except json.JSONDecodeError as exc:
        raise InputError(
            where,
            field,
            f"{what} (invalid JSON at line {exc.lineno}, column {exc.colno}: {exc.msg})",
        ) from None
    except RecursionError:
        raise InputError(where, field, _nesting_text(MAX_NESTING + 1)) from None


def check_nesting(text: str, where: str, syntax: str, field: str = _FILE) -> None:
    """Refuse text nested deeper than :data:`MAX_NESTING` before it is parsed."""
    depth = nesting_depth(text, syntax, MAX_NESTING)
    if depth > MAX_NESTING:
        raise InputError(where, field, _nesting_text(depth))


def _nesting_text(depth: int) -> str:
    return f"tables and arrays nested at most {MAX_NESTING} deep; this one goes deeper"


# The depth scan ------------------------------------------------------------------------------

_TOML_NOISE = re.compile(
    r"""
    \"\"\"[^"\\]*(?:(?:\\[\s\S]|"(?!""))[^"\\]*)*"{3,5}   # a multi-line basic string
    | '{3}[^']*(?:'(?!'')[^']*)*'{3,5}                   # a multi-line literal string
    | "[^"\\\n]*(?:\\.[^"\\\n]*)*"                       # a basic string
    | '[^'\n]*'                                          # a literal string
    | \#[^\n]*                                           # a comment
    """,
    re.VERBOSE,
)
_JSON_STRING = re.compile(r'"[^"\\]*(?:\\.[^"\\]*)*"')
_ALL_BUT_BRACKETS = bytes(code for code in range(256) if code not in b"[]{}")
_BRACKET_STEP = [0] * 256
_BRACKET_STEP[ord("[")] = _BRACKET_STEP[ord("{")] = 1
_BRACKET_STEP[ord("]")] = _BRACKET_STEP[ord("}")] = -1
_STRUCTURE = re.compile(r"[\[\]{}=,.]")


def nesting_depth(text: str, syntax: str, stop_above: int = MAX_NESTING) -> int:
    """How deep the values of a TOML or JSON text nest, without parsing it: never less than
    the depth the parser would build, and exact where it matters, above ``stop_above``.

    A cheap bound settles most files; only a file whose bound is high is scanned in full, with
    strings and comments taken out first so brackets and dots inside them count for nothing.
    For text that is not valid the answer may be too high; the parser refuses it anyway."""
    if syntax == "json":
        return _json_depth(text)
    if syntax == "toml":
        return _toml_depth(text, stop_above)
    raise ValueError(f"unknown syntax {syntax!r}")


def _json_depth(text: str) -> int:
    """How many arrays and objects of a JSON text nest inside each other, at most."""
    data = text.encode("utf-8", "surrogatepass")
    depth = _bracket_depth(data)
    if depth > MAX_NESTING:  # brackets inside strings may have counted: count without them
        depth = _bracket_depth(_JSON_STRING.sub("", text).encode("utf-8", "surrogatepass"))
    return depth


def _toml_depth(text: str, stop_above: int) -> int:
    """Depth in TOML. A header ``[a.b.c]`` opens a table three deep; where the file has any
    ``[[array]]`` header each header part counts two (it may be an array of tables and the
    table in it). A key of ``p`` dotted parts in a table ``d`` deep reaches ``d + p``; an array
    or inline table as its value is that deep, its elements one more."""
    bound = _toml_depth_bound(text)
    return bound if bound <= stop_above else toml_depth_scan(text, stop_above)


def toml_depth_scan(text: str, stop_above: int = MAX_NESTING) -> int:
    """The depth :func:`_toml_depth` describes, found line by line; it stops as soon as the
    depth passes ``stop_above``."""
    bare = _TOML_NOISE.sub("", text)
    doubled = "[[" in bare
    deepest = table = 0
    frames: list[tuple[str, int]] = []  # the open "[" and "{" of values, each with its depth
    in_key, key_parts, after_eq, value_depth = False, 1, False, 0
    for line in bare.split("\n"):
        if not frames:
            stripped = line.strip()
            if not stripped:
                continue
            if stripped[0] == "[":  # a header
                parts = stripped.count(".") + 1
                table = 2 * parts if doubled else parts
                deepest = max(deepest, table)
                continue
            equals = stripped.find("=")
            if equals < 0:
                continue
            value_depth = table + stripped.count(".", 0, equals) + 1
            deepest = max(deepest, value_depth)
            rest = stripped[equals + 1 :]
            if "[" not in rest and "{" not in rest:
                if deepest > stop_above:
                    return deepest
                continue
            tokens, after_eq, in_key = _STRUCTURE.findall(rest), True, False
        else:
            tokens = _STRUCTURE.findall(line)
        for token in tokens:
            if in_key:
                if token == ".":
                    key_parts += 1
                    continue
                if token == "=":
                    value_depth = (frames[-1][1] if frames else table) + key_parts
                    deepest = max(deepest, value_depth)
                    in_key, key_parts, after_eq = False, 1, True
                    continue
            if token in "[{":
                level = frames[-1][1] + 1 if frames else table + 1
                if after_eq:
                    level = value_depth
                frames.append((token, level))
                deepest = max(deepest, level + 1 if token == "[" else level)
                if token == "{":
                    in_key, key_parts = True, 1
            elif token in "]}":
                if frames:
                    frames.pop()
                in_key = False
            elif token == "," and frames and frames[-1][0] == "{":
                in_key, key_parts = True, 1
            after_eq = False
        if deepest > stop_above:
            return deepest
    return deepest


def _toml_depth_bound(text: str) -> int:
    """A cheap bound on the depth of most files, so :func:`_toml_depth` scans only the few
    whose bound is high. With ``m`` the most dots on one line, plus one, and ``b`` the deepest
    bracket (both counted in strings and comments too, which only raises them): a header
    reaches at most ``2m``, a key ``m`` more; each of at most ``b`` containers on a path adds
    one, and its inline-table keys at most ``m``."""
    data = text.encode("utf-8", "surrogatepass")
    dots = max(map(bytes.count, data.split(b"\n"), itertools.repeat(b"."))) + 1
    depth = _bracket_depth(data)
    return 2 * dots + (depth + 1) * dots + depth


def _bracket_depth(data: bytes) -> int:
    """The deepest bracket of ``data``, counting every ``[ { ] }`` byte (C loops only)."""
    brackets = data.translate(None, _ALL_BUT_BRACKETS)
    return max(itertools.accumulate(map(_BRACKET_STEP.__getitem__, brackets)), default=0)


def _reason(exc: OSError) -> str:
    if exc.errno == errno.EACCES:
        return "permission denied"
    return (exc.strerror or type(exc).__name__).lower()


def _size(count: int) -> str:
    if count % (1024 * 1024) == 0:
        return f"{count // (1024 * 1024)} MiB"
    if count % 1024 == 0:
        return f"{count // 1024} KiB"
    return f"{count} bytes"


def _too_big(count: int) -> str:
    return f"this one is {count} bytes"
