"""``firstride review BUILD``: run every rule and write the review."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import TYPE_CHECKING

from reviewer.commands import EXIT_FINDINGS, EXIT_GO
from reviewer.commands.pack_options import add_pack_arguments, packs_from

if TYPE_CHECKING:
    from reviewer.engine import Review

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
    parser.add_argument(
        "--format",
        choices=["md", "html", "json"],
        default="md",
        help="md (default; the form you sign), html (one self-contained page), json",
    )
    parser.add_argument("--waivers", help="a waivers file (TOML) of accepted findings")
    parser.add_argument(
        "--since", metavar="PREVIOUS.json", help="a previous review in JSON form: report changes"
    )
    add_pack_arguments(parser)


def run(args: argparse.Namespace) -> int:
    from reviewer.findings import Severity, Verdict
    from reviewer.session import review_file

    result = review_file(
        args.build,
        profile=args.profile,
        packs=lambda: packs_from(args),
        waivers=args.waivers,
        since=args.since,
    )
    text = render(result, args.format)
    if args.output:
        from reviewer.output import write_whole

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


def render(result: Review, form: str) -> str:
    """The review in the asked-for form; HTML is rendered from the same Markdown."""
    from reviewer.report import render_markdown

    if form == "json":
        from reviewer.export import render_json

        return render_json(result, result.build_data)
    markdown = render_markdown(result)
    if form == "html":
        from reviewer.html import render_html

        return render_html(result, markdown)
    return markdown
