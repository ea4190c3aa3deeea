"""Writing files the user asked for: whole or not at all, and only where a file belongs.

Every file firstride writes goes through here, and each write is refused, in one line, before
anything is touched, when the target is

- not a regular file or a new path: a folder, a device (run as root, a rename onto
  ``/dev/null`` would replace the device node with a plain file), a FIFO, a socket, or a
  symbolic link to any of those or to nothing;
- one of the run's own inputs (the build, profile, waivers, previous review, a key), however
  it is spelt: compared by device and inode, so a hard link or ``./`` path is caught too;
- a private key file of any run.

A write goes to a temporary file beside the target, is flushed to the disk (``fsync``) and
then renamed over the target, so a full disk or a crash leaves the old file whole and no
half-written one. A new file gets the permissions the umask allows (``0o666 & ~umask``, as a
shell redirection would); a file replaced keeps its own. :func:`locked` serialises writers of
one file (``firstride sign`` holds it from reading the review to writing it back).
"""

from __future__ import annotations

import contextlib
import errno
import fcntl
import os
import stat
import tempfile
import threading
import time
from collections.abc import Iterable, Iterator
from pathlib import Path

from reviewer.errors import InputError
from reviewer.inputs import kind_of

FIELD = "(output)"
#: How long :func:`locked` waits for another writer of the same file before giving up.
LOCK_WAIT_S = 30.0
_PRIVATE_KEY_START = b"-----BEGIN"
_umask_lock = threading.Lock()


def current_umask() -> int:
    """The process's umask, read without changing it where the system says it
    (``/proc/self/status`` on Linux), else set and restored at once."""
    try:
        with open("/proc/self/status", encoding="ascii") as status:
            for line in status:
                if line.startswith("Umask:"):
                    return int(line.split()[1], 8)
    except (OSError, ValueError, IndexError):
        pass
    with _umask_lock:
        mask = os.umask(0o077)
        os.umask(mask)
    return mask


def write_whole(
    path: str | Path, text: str | bytes, *, inputs: Iterable[str | Path | None] = ()
) -> None:
    """Write ``text`` to ``path`` whole or not at all; never onto any of ``inputs``.

    ``inputs`` are the paths the run read (None and built-in names such as
    ``(built-in) default.toml`` are skipped); a target that is one of them, by device and
    inode, is refused."""
    data = text.encode("utf-8") if isinstance(text, str) else text
    where = str(path)
    target, mode = writable_target(path, inputs)
    folder = target.parent
    try:
        handle, temporary = tempfile.mkstemp(dir=folder, prefix=f".{target.name}.", suffix=".tmp")
    except OSError as exc:
        raise InputError(where, FIELD, f"{_cannot(exc)}; nothing was written") from None
    try:
        try:
            os.fchmod(handle, mode)
            _write_all(handle, data)
            os.fsync(handle)
        finally:
            os.close(handle)
        _still_writable(target, where)  # not swapped for a device since it was looked at
        os.replace(temporary, target)
    except OSError as exc:
        _remove(temporary)
        raise InputError(where, FIELD, f"{_cannot(exc)}; nothing was written") from None
    except BaseException:
        _remove(temporary)
        raise
    _sync_folder(folder)


def write_new(path: str | Path, data: bytes, mode: int) -> None:
    """Create ``path`` (it must not exist, not even as a dangling link) holding ``data``, with
    ``mode`` less the umask, in the call that creates it; on any failure nothing is left."""
    where = str(path)
    flags = os.O_WRONLY | os.O_CREAT | os.O_EXCL | os.O_NOFOLLOW | os.O_CLOEXEC
    try:
        handle = os.open(where, flags, mode)
    except FileExistsError:
        raise InputError(where, FIELD, "a new path; it already exists") from None
    except OSError as exc:
        raise InputError(where, FIELD, f"{_cannot(exc)}; nothing was written") from None
    try:
        try:
            _write_all(handle, data)
            os.fsync(handle)
        finally:
            os.close(handle)
    except OSError as exc:
        _remove(where)
        raise InputError(where, FIELD, f"{_cannot(exc)}; nothing was written") from None
    except BaseException:
        _remove(where)
        raise
    _sync_folder(Path(where).parent)


def writable_target(path: str | Path, inputs: Iterable[str | Path | None] = ()) -> tuple[Path, int]:
    """The file to write for ``path`` (a link to a regular file is followed) and the mode to
    give it; an InputError when writing there is refused (see the module's docstring)."""
    where = str(path)
    target = Path(path)
    try:
        seen = os.lstat(target)
    except FileNotFoundError:
        seen = None
    except OSError as exc:
        raise InputError(where, FIELD, _cannot(exc)) from None
    if seen is not None and stat.S_ISLNK(seen.st_mode):
        try:
            seen = os.stat(target)
        except OSError:
            raise InputError(where, FIELD, _expected("a symbolic link to nothing")) from None
        if not stat.S_ISREG(seen.st_mode):
            raise InputError(where, FIELD, _expected(f"a symbolic link to {kind_of(seen.st_mode)}"))
        target = Path(os.path.realpath(target))
    if seen is None:
        folder = target.parent
        try:
            is_folder = stat.S_ISDIR(os.stat(folder).st_mode)
        except OSError:
            is_folder = False
        if not is_folder:
            raise InputError(where, FIELD, f"a file in an existing folder; {folder} is not one")
        return target, 0o666 & ~current_umask()
    if not stat.S_ISREG(seen.st_mode):
        raise InputError(where, FIELD, _expected(kind_of(seen.st_mode)))
    for source in inputs:
        if _same_file(seen, source):
            raise InputError(
                where, FIELD, f"a file that is not an input of this run; it is {source}"
            )
    if _holds_private_key(target):
        raise InputError(where, FIELD, "a file that is not a key; it holds a private key")
    return target, stat.S_IMODE(seen.st_mode)


@contextlib.contextmanager
def locked(path: str | Path, wait_s: float = LOCK_WAIT_S) -> Iterator[None]:
    """Hold an exclusive lock on ``path`` for writing: a ``flock`` on the file
    ``.NAME.lock`` beside it (beside the file a link points to). Another firstride process
    locking the same file waits; after ``wait_s`` seconds it gives up with an InputError.

    The lock file is left in place: removing it would let a third writer lock a new file
    while the second still waits on the old one."""
    where = str(path)
    target = Path(os.path.realpath(path))
    lock_path = target.parent / f".{target.name}.lock"
    flags = os.O_RDWR | os.O_CREAT | os.O_NOFOLLOW | os.O_NONBLOCK | os.O_CLOEXEC
    try:
        handle = os.open(lock_path, flags, 0o666 & ~current_umask())
    except OSError as exc:
        raise InputError(where, FIELD, f"{_cannot(exc)} (for its lock file)") from None
    try:
        if not stat.S_ISREG(os.fstat(handle).st_mode):
            raise InputError(where, FIELD, f"a lock file {lock_path} that is a regular file")
        deadline = time.monotonic() + wait_s
        while True:
            try:
                fcntl.flock(handle, fcntl.LOCK_EX | fcntl.LOCK_NB)
                break
            except BlockingIOError:
                if time.monotonic() >= deadline:
                    raise InputError(
                        where,
                        FIELD,
                        f"a file no one else is writing; still locked after {wait_s:g} s",
                    ) from None
                time.sleep(0.02)
        yield
    finally:
        os.close(handle)  # closing releases the lock


def _expected(found: str) -> str:
    return f"a regular file or a new path; this is {found}"


def _same_file(seen: os.stat_result, source: str | Path | None) -> bool:
    if source is None or str(source).startswith("("):
        return False
    try:
        other = os.stat(source)
    except OSError:
        return False
    return (other.st_dev, other.st_ino) == (seen.st_dev, seen.st_ino)


def _holds_private_key(target: Path) -> bool:
    """True for a file that starts as a PEM private key does: never overwritten by a review."""
    try:
        with open(target, "rb") as existing:
            head = existing.read(64)
    except OSError:
        return False
    return head.startswith(_PRIVATE_KEY_START) and b"PRIVATE KEY" in head.split(b"\n")[0]


def _still_writable(target: Path, where: str) -> None:
    try:
        seen = os.lstat(target)
    except FileNotFoundError:
        return
    if not stat.S_ISREG(seen.st_mode):
        raise InputError(where, FIELD, _expected(kind_of(seen.st_mode)))


def _write_all(handle: int, data: bytes) -> None:
    view = memoryview(data)
    while view:
        written = os.write(handle, view)
        view = view[written:]


def _remove(path: str) -> None:
    with contextlib.suppress(OSError):
        os.unlink(path)


def _sync_folder(folder: Path) -> None:
    """Flush the rename to the disk as well (best effort: not every system allows it)."""
    try:
        handle = os.open(folder, os.O_RDONLY | os.O_DIRECTORY | os.O_CLOEXEC)
    except OSError:
        return
    try:
        os.fsync(handle)
    except OSError:
        pass
    finally:
        os.close(handle)


_REASONS = {
    errno.ENOSPC: "room on the disk (no space left on the device)",
    errno.EDQUOT: "room within the disk quota (quota exceeded)",
    errno.EROFS: "a place that can be written (a read-only file system)",
    errno.EACCES: "a folder you may write to (permission denied)",
    errno.EPERM: "a folder you may write to (operation not permitted)",
    errno.EISDIR: "a file, not a folder",
    errno.ENOENT: "a file in an existing folder",
    errno.ENOTDIR: "a file in an existing folder",
}


def _cannot(exc: OSError) -> str:
    return _REASONS.get(exc.errno or 0, f"a writable file ({(exc.strerror or 'error').lower()})")


def output_folder(path: str | Path, what: str) -> Path:
    """``path`` as a folder to write into, made with its parents if it is missing; an
    :class:`InputError` naming it (``what``: what the folder is for) when it is a file or
    cannot be made."""
    folder = Path(path)
    if folder.exists() and not folder.is_dir():
        raise InputError(str(folder), "(output)", f"a folder for {what}; this is a file")
    try:
        folder.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        reason = (exc.strerror or "error").lower()
        raise InputError(str(folder), "(output)", f"a folder for {what} ({reason})") from None
    return folder
