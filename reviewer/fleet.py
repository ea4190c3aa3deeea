"""Fleet review: many build files in one process, one review each, and a summary of them all.

A club officer before an event or a shop with a week's builds reviews them in one command: the
packs and the profile are loaded once (once per worker with ``jobs``), each build is reviewed
exactly as ``firstride review`` reviews it alone (the same bytes), and a bad build file is one
row of the summary instead of the end of the run.
"""

from __future__ import annotations

import multiprocessing
import os
import re
from collections.abc import Callable, Iterable, Iterator, Sequence
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from reviewer.commands import EXIT_FINDINGS, EXIT_GO, EXIT_INPUT
from reviewer.errors import InputError
from reviewer.findings import Severity, Verdict

#: Suffix of each review file by format.
SUFFIX = {"md": ".md", "html": ".html", "json": ".json"}
#: The summary's own file name (before the suffix); a build file of that stem gets another name.
SUMMARY_STEM = "fleet-summary"
#: The most build files one fleet review takes: a folder of a hundred thousand is a mistake.
MAX_BUILDS = 20_000
_UNSAFE = re.compile(r"[^A-Za-z0-9._-]+")


@dataclass(frozen=True)
class FleetEntry:
    """One row of the fleet summary."""

    source: str  # the build file as given
    output: str  # the review's file name in the output folder ("" when it could not be read)
    vehicle: str = ""
    revision: str = ""
    verdict: str = "input error"  # a Verdict's value, or "input error"
    counts: dict[str, int] = field(default_factory=dict)
    first_action: str = ""
    error: str = ""
    exit_status: int = EXIT_INPUT


@dataclass(frozen=True)
class FleetOptions:
    """What every worker needs to open the same session (plain data: it crosses processes)."""

    profile: str | None
    rule_files: tuple[str, ...] = ()
    blocked_packs: tuple[str, ...] = ()
    strict_packs: bool = False
    form: str = "md"
    fail_on: str = "fix"


def collect_builds(paths: Sequence[str | Path]) -> list[Path]:
    """Build files named directly, and every ``*.toml`` directly in a named folder (sorted, so the
    fleet's order and the summary never depend on the file system's)."""
    found: list[Path] = []
    for given in paths:
        path = Path(given)
        if path.is_dir():
            inside = sorted(p for p in path.glob("*.toml") if p.is_file())
            if not inside:
                raise InputError(str(path), "(folder)", "a folder with at least one .toml build")
            found.extend(inside)
        else:
            found.append(path)  # a missing or unreadable file is that build's input error
        if len(found) > MAX_BUILDS:
            raise InputError(str(path), "(fleet)", f"at most {MAX_BUILDS} build files at once")
    return list(dict.fromkeys(found))


def output_names(builds: Sequence[Path], form: str) -> dict[Path, str]:
    """A review file name for each build, from its file name; builds that share a stem are told
    apart by their folders, nearest first (``alice-board.md``, ``bob-board.md``)."""
    suffix = SUFFIX[form]
    depth: dict[Path, int] = dict.fromkeys(builds, 0)

    def name(path: Path) -> str:
        parts = [*path.parent.parts[len(path.parent.parts) - depth[path] :], path.stem]
        stem = _UNSAFE.sub("_", "-".join(p for p in parts if p not in ("", "/", ".", "..")))
        return (stem or "build") + suffix

    while True:
        names: dict[str, list[Path]] = {}
        for path in builds:
            names.setdefault(name(path), []).append(path)
        clashes = [paths for key, paths in names.items() if len(paths) > 1 or _reserved(key)]
        if not clashes:
            return {path: name(path) for path in builds}
        grown = False
        for paths in clashes:
            for path in paths:
                if depth[path] < len(path.parent.parts):
                    depth[path] += 1
                    grown = True
        if not grown:  # the same file named twice, or nothing left to tell them apart by
            raise InputError(str(clashes[0][0]), "(fleet)", "build files with distinct names")


def _reserved(name: str) -> bool:
    return name.rsplit(".", 1)[0] == SUMMARY_STEM


# --- reviewing -----------------------------------------------------------------------------

_WORKER_SESSION: Any = None


def _open(options: FleetOptions) -> Any:
    from reviewer.plugins import load_packs
    from reviewer.session import open_session

    manager = load_packs(options.rule_files, options.blocked_packs, strict=options.strict_packs)
    return open_session(options.profile, manager)


def _init_worker(options: FleetOptions) -> None:
    global _WORKER_SESSION  # one session per worker process, opened once
    _WORKER_SESSION = _open(options)


def review_one(
    session: Any, path: Path, output: str, options: FleetOptions
) -> tuple[str, FleetEntry]:
    """One build of the fleet: its review text and its summary row (an input error is a row)."""
    from reviewer.formats import render_review
    from reviewer.loader import load_build

    try:
        result = session.review_loaded(load_build(path))
    except InputError as exc:
        return "", FleetEntry(source=path.as_posix(), output="", error=str(exc))
    counts = {s.value: result.count(s) for s in Severity}
    counts["waived"] = result.waived
    entry = FleetEntry(
        source=path.as_posix(),
        output=output,
        vehicle=result.build.vehicle.name,
        revision=result.build.vehicle.revision,
        verdict=result.verdict.value,
        counts=counts,
        first_action=first_action(result),
        exit_status=EXIT_FINDINGS if result.fails(options.fail_on) else EXIT_GO,
    )
    return render_review(result, options.form), entry


def _review_in_worker(item: tuple[Path, str, FleetOptions]) -> tuple[str, FleetEntry]:
    path, output, options = item
    return review_one(_WORKER_SESSION, path, output, options)


def first_action(result: Any) -> str:
    """The first thing to do: the worst finding still counting, with its remedy."""
    for finding in result.findings:
        if finding.waiver is not None or finding.severity is Severity.PASS:
            continue
        what = finding.remedy or finding.rationale
        return f"{finding.severity.value}: {finding.rule_id} ({finding.subject}): {what}"
    return ""


def review_fleet(
    builds: Sequence[Path],
    names: dict[Path, str],
    options: FleetOptions,
    *,
    jobs: int = 1,
    progress: Callable[[Iterable[Any], int], Iterable[Any]] | None = None,
) -> Iterator[tuple[Path, str, FleetEntry]]:
    """Each build's review text and summary row, in the builds' order."""
    items = [(path, names[path], options) for path in builds]
    wrap = progress or (lambda iterable, total: iterable)
    if jobs <= 1 or len(items) < 2:
        session = _open(options)
        results: Iterable[tuple[str, FleetEntry]] = (
            review_one(session, path, output, options) for path, output, _ in items
        )
        for (path, _, _), (text, entry) in zip(items, wrap(results, len(items)), strict=True):
            yield path, text, entry
        return
    workers = min(jobs, len(items), os.cpu_count() or 1)
    chunk = max(1, len(items) // (workers * 8))
    # "spawn": a fresh interpreter per worker. A forked copy of a process that runs threads
    # (the rule watchdog's, a test runner's) can inherit a held lock and stall a rule.
    context = multiprocessing.get_context("spawn")
    with ProcessPoolExecutor(
        workers, mp_context=context, initializer=_init_worker, initargs=(options,)
    ) as pool:
        mapped = pool.map(_review_in_worker, items, chunksize=chunk)
        for (path, _, _), (text, entry) in zip(items, wrap(mapped, len(items)), strict=True):
            yield path, text, entry


def worst_status(entries: Iterable[FleetEntry]) -> int:
    return max((e.exit_status for e in entries), default=0)


def summary_counts(entries: Sequence[FleetEntry]) -> dict[str, int]:
    counts = {v.value: 0 for v in Verdict}
    counts["input error"] = 0
    for entry in entries:
        counts[entry.verdict] = counts.get(entry.verdict, 0) + 1
    return counts
