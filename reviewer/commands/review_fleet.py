"""``firstride review A.toml B.toml FOLDER/ -o DIR``: the fleet form of ``review``.

Not a verb of its own: ``review`` hands over here when it is given several build files or a
folder. Each review is written to ``DIR`` under the build file's name, then the fleet summary;
the exit status is the worst of the builds' (2 when any build file could not be read).
"""

from __future__ import annotations

import argparse
import os
import sys
from collections.abc import Iterable
from pathlib import Path
from typing import Any, TypeVar

from reviewer.commands.pack_options import report_problems
from reviewer.errors import InputError

T = TypeVar("T")


def run_fleet(args: argparse.Namespace) -> int:
    from reviewer.fleet import (
        SUFFIX,
        SUMMARY_STEM,
        FleetOptions,
        collect_builds,
        output_names,
        review_fleet,
        worst_status,
    )
    from reviewer.fleet_summary import render_summary
    from reviewer.output import writable_target, write_whole

    for option in ("waivers", "since"):
        if getattr(args, option):
            raise InputError(f"--{option}", "(usage)", "one build file: it belongs to one build")
    if not args.output:
        raise InputError("-o", "(usage)", "a folder for the fleet's reviews (-o DIR)")
    folder = Path(args.output)
    if folder.exists() and not folder.is_dir():
        raise InputError(str(folder), "(output)", "a folder for the fleet's reviews")
    builds = collect_builds(args.build)
    names = output_names(builds, args.format)
    options = FleetOptions(
        profile=args.profile,
        rule_files=tuple(args.rule_files),
        blocked_packs=tuple(args.blocked_packs),
        strict_packs=args.strict_packs,
        form=args.format,
        fail_on=args.fail_on,
    )
    _check_setup(options)  # a bad profile or pack is the whole run's error, before any review
    folder.mkdir(parents=True, exist_ok=True)
    read = [*builds, args.profile, *args.rule_files]  # never written onto
    summary = folder / f"{SUMMARY_STEM}{SUFFIX[args.format]}"
    for name in [*names.values(), summary.name]:  # every output checked before any review
        writable_target(folder / name, read)
    jobs = args.jobs or (os.cpu_count() or 1)
    entries = []
    for _, text, entry in review_fleet(builds, names, options, jobs=jobs, progress=_progress):
        if entry.output:
            write_whole(folder / entry.output, text, inputs=read)
        entries.append(entry)
    write_whole(summary, render_summary(entries, args.format), inputs=read)
    bad = sum(1 for e in entries if e.error)
    print(
        f"firstride: {len(entries)} build{'' if len(entries) == 1 else 's'} reviewed into "
        f"{folder.as_posix()}"
        + (f", {bad} could not be read" if bad else "")
        + f"; summary {summary.as_posix()}",
        file=sys.stderr,
    )
    return worst_status(entries)


def _check_setup(options: Any) -> None:
    from reviewer.plugins import load_packs
    from reviewer.session import open_session

    manager = load_packs(options.rule_files, options.blocked_packs, strict=options.strict_packs)
    manager.rules()
    report_problems(manager)
    open_session(options.profile, manager)


def _progress(iterable: Iterable[T], total: int) -> Iterable[T]:
    """A progress bar on stderr when it is a terminal; nothing in a pipe or a log."""
    if total < 2 or not sys.stderr.isatty():
        return iterable
    from tqdm import tqdm

    return tqdm(iterable, total=total, unit="build", file=sys.stderr, leave=False)
