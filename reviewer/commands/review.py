"""``firstride review BUILD...``: run every rule and write the review.

One build file: its review on stdout or to ``-o FILE``. Several build files or a folder of them
(a fleet): one review each into the folder ``-o DIR``, named after each build file, and a fleet
summary beside them; a bad build file is a row of the summary and the others still run.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import TYPE_CHECKING

from reviewer.commands import EXIT_FINDINGS, EXIT_GO, EXIT_INPUT
from reviewer.commands.pack_options import add_pack_arguments, packs_from

if TYPE_CHECKING:
    from reviewer.engine import Review

NAME = "review"
HELP = "review a build file and write the report"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument(
        "build", nargs="+", help="the build file (TOML); several, or folders of them, for a fleet"
    )
    parser.add_argument(
        "-o",
        "--output",
        help="write the review here instead of stdout; for a fleet, the folder for its reviews",
    )
    parser.add_argument("--profile", help="a profile of limits (TOML); default: built-in")
    parser.add_argument(
        "--fail-on",
        choices=["stop", "fix", "advise"],
        default="fix",
        help="lowest severity that makes the exit status 1 (default: fix); "
        "an incomplete review always exits 1",
    )
    parser.add_argument(
        "--format",
        choices=["md", "html", "json", "sarif"],
        default="md",
        help="md (default; the form you sign), html (one self-contained page), json, "
        "sarif (SARIF 2.1.0 for CI checkers; one build file only)",
    )
    parser.add_argument("--waivers", help="a waivers file (TOML) of accepted findings")
    parser.add_argument(
        "--since", metavar="PREVIOUS.json", help="a previous review in JSON form: report changes"
    )
    parser.add_argument(
        "--jobs",
        type=_jobs,
        default=1,
        metavar="N",
        help="for a fleet: review in N processes (default 1; 0 = one per core)",
    )
    parser.add_argument(
        "--plots",
        metavar="DIR",
        help="write the review's charts as SVG files into DIR and link them from the Markdown "
        "review (needs the plots extra); an HTML review embeds them anyway",
    )
    parser.add_argument(
        "-q",
        "--quiet",
        action="store_true",
        help="nothing on stderr but errors (no verdict line, no summary)",
    )
    add_pack_arguments(parser)


def _jobs(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"a whole number of processes, not {text!r}") from None
    if not 0 <= value <= 256:
        raise argparse.ArgumentTypeError("between 0 (one per core) and 256 processes")
    return value


def run(args: argparse.Namespace) -> int:
    if len(args.build) > 1 or Path(args.build[0]).is_dir():
        if args.format == "sarif":
            from reviewer.errors import InputError

            raise InputError(
                "--format", "(usage)", "md, html or json for a fleet; sarif is for one build file"
            )
        from reviewer.commands.review_fleet import run_fleet

        return run_fleet(args)
    from reviewer.errors import InputErrors
    from reviewer.formats import render_review
    from reviewer.session import review_file

    try:
        result = review_file(
            args.build[0],
            profile=args.profile,
            packs=lambda: packs_from(args),
            waivers=args.waivers,
            since=args.since,
        )
    except InputErrors as errors:  # every error of the file, one line each, in file order
        for line in errors.lines():
            print(f"firstride: {line}", file=sys.stderr)
        return EXIT_INPUT
    build_text = None
    if args.format == "sarif":  # the same bytes as reviewed, for line and column positions
        from reviewer.sarif import read_build_text

        build_text = read_build_text(args.build[0], result.build_fingerprint)
    links = _write_charts(args, result) if args.plots else None
    text = render_review(result, args.format, build_text, links)
    if args.output:
        from reviewer.output import write_whole

        read = [*args.build, args.profile, args.waivers, args.since, *args.rule_files]
        write_whole(Path(args.output), text, inputs=[*read, *result.profile.extends])
    else:
        sys.stdout.write(text)
    from reviewer.terminal import report

    report(result, sys.stderr, quiet=args.quiet)
    return exit_status(result, args.fail_on)


def _write_charts(args: argparse.Namespace, result: Review) -> list[tuple[str, str]]:
    """Write the charts into ``--plots DIR`` (each a whole, guarded write) and return each
    one's title and its link as the review should write it: relative to the review's folder."""
    import os

    from reviewer.charts import review_charts
    from reviewer.errors import InputError
    from reviewer.output import output_folder, write_whole
    from reviewer.plots import INSTALL_HINT, PlotsUnavailable

    try:
        charts = review_charts(result)
    except PlotsUnavailable:
        raise InputError("--plots", "(usage)", f"charts need matplotlib: {INSTALL_HINT}") from None
    folder = output_folder(args.plots, "the charts (--plots)")
    base = Path(args.output).parent if args.output else Path()
    read = [*args.build, args.profile, args.waivers, args.since, *args.rule_files]
    links = []
    for chart in charts:
        path = folder / chart.file
        write_whole(path, chart.svg, inputs=read)
        links.append((chart.title, Path(os.path.relpath(path, base)).as_posix()))
    return links


def exit_status(result: Review, fail_on: str) -> int:
    """1 for a no-go or incomplete review, or a counting finding at ``fail_on`` or worse."""
    return EXIT_FINDINGS if result.fails(fail_on) else EXIT_GO
