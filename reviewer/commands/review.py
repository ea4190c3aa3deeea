"""``firstride review BUILD``: run every rule and write the review."""

from __future__ import annotations

import argparse
import sys
from dataclasses import replace
from pathlib import Path

from reviewer.commands import EXIT_FINDINGS, EXIT_GO
from reviewer.commands.pack_options import add_pack_arguments, packs_from

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
    from reviewer.engine import review
    from reviewer.findings import Severity, Verdict
    from reviewer.loader import load_build
    from reviewer.profile import load_profile

    loaded = load_build(args.build)
    profile = load_profile(args.profile)
    waivers = None
    if args.waivers:
        from reviewer.waivers import load_waivers

        waivers = load_waivers(args.waivers)
    previous = None
    if args.since:  # imported only when asked: change reports are not on every review's path
        from reviewer.changes import load_previous

        previous = load_previous(args.since)
    manager = packs_from(args)
    profile = manager.complete_profile(profile)  # packs' default limits, under the profile's
    manager.check_extensions(loaded.build, str(args.build))
    result = review(
        loaded.build,
        profile,
        manager.rules(),
        build_path=Path(args.build).as_posix(),
        build_fingerprint=loaded.fingerprint,
        problems=manager.problems,
        waivers=waivers,
    )
    if previous is not None:
        from reviewer.changes import compare

        changes = compare(previous, Path(args.since).as_posix(), result.findings, loaded.data)
        result = replace(result, changes=changes)
    text = render(result, args.format, loaded.data)
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


def render(result: object, form: str, build_data: dict[str, object]) -> str:
    """The review in the asked-for form; HTML is rendered from the same Markdown."""
    from reviewer.report import render_markdown

    if form == "json":
        from reviewer.export import render_json

        return render_json(result, build_data)  # type: ignore[arg-type]
    markdown = render_markdown(result)  # type: ignore[arg-type]
    if form == "html":
        from reviewer.html import render_html

        return render_html(result, markdown)  # type: ignore[arg-type]
    return markdown
