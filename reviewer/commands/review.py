"""``firstride review BUILD``: run every rule and write the review."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from reviewer.commands import EXIT_FINDINGS, EXIT_GO
from reviewer.output import write_whole

NAME = "review"
HELP = "review a build file and write the report"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("build", help="the build file (TOML)")
    parser.add_argument("-o", "--output", help="write the review here instead of stdout")
    parser.add_argument("--profile", help="a profile of limits (TOML); default: built-in")
    parser.add_argument(
        "--fail-on",
        choices=["stop", "fix", "advise"],
        default="fix",
        help="lowest severity that makes the exit status 1 (default: fix); "
        "an incomplete review always exits 1",
    )


def run(args: argparse.Namespace) -> int:
    from reviewer.engine import review
    from reviewer.findings import Severity, Verdict
    from reviewer.loader import load_build
    from reviewer.plugins import default_manager
    from reviewer.profile import load_profile
    from reviewer.report import render_markdown

    loaded = load_build(args.build)
    profile = load_profile(args.profile)
    manager = default_manager()
    result = review(
        loaded.build,
        profile,
        manager.rules(),
        build_path=Path(args.build).as_posix(),
        build_fingerprint=loaded.fingerprint,
        problems=manager.problems,
    )
    text = render_markdown(result)
    if args.output:
        write_whole(Path(args.output), text)
    else:
        sys.stdout.write(text)
    print(f"firstride: verdict {result.verdict.value}", file=sys.stderr)
    if result.verdict in (Verdict.NO_GO, Verdict.INCOMPLETE):
        return EXIT_FINDINGS
    threshold = {"stop": Severity.STOP, "fix": Severity.FIX, "advise": Severity.ADVISE}
    worst = threshold[args.fail_on].rank
    failing = [
        f
        for f in result.findings
        if f.severity is not Severity.UNASSESSED and f.severity.rank <= worst
    ]
    return EXIT_FINDINGS if failing else EXIT_GO
