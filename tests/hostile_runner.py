"""Play corpus cases (see ``hostile_corpus``) through the real command line, in this process.

Run by ``test_hostile_input`` in a process of its own, so a case that hangs (a FIFO read by
mistake) fails the test by its timeout instead of hanging the test run. Reads the cases as JSON
from the file named by the first argument, the corpus folder is the second, and a valid build
to review once first (untimed) the third; writes one JSON result per case to stdout.
"""

from __future__ import annotations

import contextlib
import io
import json
import os
import sys
import time
import traceback


def listing(folder: str, argv: list[str]) -> dict[str, tuple[int, int, int, int]]:
    """What would change if anything were written: the modification time of every folder
    under ``folder`` (a file made, removed or renamed over changes its folder's), and the
    inode, size and time of every path the case names (a file written in place)."""
    seen = {}
    for parent, _, _ in os.walk(folder):
        info = os.lstat(parent)
        seen[parent] = (info.st_ino, info.st_mode, info.st_size, info.st_mtime_ns)
    for word in argv:
        if os.path.lexists(word):
            info = os.lstat(word)
            seen[word] = (info.st_ino, info.st_mode, info.st_size, info.st_mtime_ns)
    return seen


def play(case: dict, folder: str) -> dict:
    from reviewer.cli import main

    before = listing(folder, case["argv"])
    out, err = io.StringIO(), io.StringIO()
    started = time.perf_counter()
    try:
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            try:
                code = main(case["argv"])
            except SystemExit as done:
                code = done.code
    except BaseException:  # noqa: BLE001 - the case fails with what escaped
        code = "escaped"
        err.write(traceback.format_exc())
    elapsed = time.perf_counter() - started
    after = listing(folder, case["argv"])
    changed = sorted(
        path for path in set(before) | set(after) if before.get(path) != after.get(path)
    )
    return {
        "name": case["name"],
        "code": code,
        "stdout": out.getvalue(),
        "stderr": err.getvalue(),
        "seconds": elapsed,
        "changed": changed,
    }


def main() -> None:
    with open(sys.argv[1], encoding="utf-8") as handle:
        cases = json.load(handle)
    folder = sys.argv[2]
    warm_up = {"name": "warm-up", "argv": ["review", sys.argv[3]]} if len(sys.argv) > 3 else None
    if warm_up:  # imports and first-use caches, so each case's time is its own
        play(warm_up, folder)
    for case in cases:
        print(json.dumps(play(case, folder)), flush=True)


if __name__ == "__main__":
    main()
