"""The command line: ``firstride review | rules | schema``.

Exit codes (naming.md): 0 go, 1 the review found stop, fix or incomplete, 2 usage or input error.
Every error a user can cause is one line on stderr; output files are written whole or not at all.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import tempfile
from collections.abc import Sequence
from pathlib import Path

from reviewer import __version__
from reviewer.errors import InputError

EXIT_GO = 0
EXIT_FINDINGS = 1
EXIT_INPUT = 2


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> None:  # one line, exit 2, as for any input error
        self.exit(EXIT_INPUT, f"firstride: {message} (see firstride --help)\n")


def _parser() -> argparse.ArgumentParser:
    parser = _Parser(
        prog="firstride",
        description="Design review of a home-built light electric vehicle before its first ride.",
    )
    parser.add_argument("--version", action="version", version=f"firstride {__version__}")
    verbs = parser.add_subparsers(dest="verb", required=True, parser_class=_Parser)

    review = verbs.add_parser("review", help="review a build file and write the report")
    review.add_argument("build", help="the build file (TOML)")
    review.add_argument("-o", "--output", help="write the review here instead of stdout")
    review.add_argument("--profile", help="a profile of limits (TOML); default: built-in")
    review.add_argument(
        "--fail-on",
        choices=["stop", "fix", "advise"],
        default="fix",
        help="lowest severity that makes the exit status 1 (default: fix); "
        "an incomplete review always exits 1",
    )

    rules = verbs.add_parser("rules", help="list the rules every loaded pack provides")
    rules.add_argument("rule_id", nargs="?", help="show one rule's documentation")

    verbs.add_parser("schema", help="print the build file's JSON Schema")
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    try:
        if args.verb == "review":
            return _review(args)
        if args.verb == "rules":
            return _rules(args)
        if args.verb == "schema":
            return _schema()
    except InputError as exc:
        print(f"firstride: {exc}", file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt:
        return 130
    return EXIT_INPUT


def _review(args: argparse.Namespace) -> int:
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
        build_path=_display_path(args.build),
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


def _display_path(path: str) -> str:
    return Path(path).as_posix()


def write_whole(path: Path, text: str) -> None:
    """Write to a temporary file beside the target, then rename: never a half-written report."""
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(str(path), "(output)", "a file in an existing folder")
    handle, temporary = tempfile.mkstemp(dir=folder, prefix=f".{path.name}.", suffix=".tmp")
    try:
        with os.fdopen(handle, "w", encoding="utf-8", newline="\n") as stream:
            stream.write(text)
        os.replace(temporary, path)
    except BaseException:
        Path(temporary).unlink(missing_ok=True)
        raise


def _rules(args: argparse.Namespace) -> int:
    from reviewer.plugins import default_manager

    manager = default_manager()
    rules = manager.rules()
    for problem in manager.problems:
        print(f"firstride: rule pack {problem.pack} failed: {problem.error}", file=sys.stderr)
    if args.rule_id:
        match = [r for r in rules if r.id == args.rule_id]
        if not match:
            known = ", ".join(r.id for r in rules)
            raise InputError("(rules)", args.rule_id, f"a known rule id ({known})")
        rule = match[0]
        print(f"{rule.id}: {rule.title}")
        print(f"pack: {rule.pack} {rule.pack_version}")
        print(f"severities: {', '.join(s.value for s in rule.severities)}")
        print(f"inputs: {', '.join(rule.inputs) or '(none listed)'}")
        print()
        print(rule.doc)
        print()
        print("sources:")
        for source in rule.sources:
            print(f"  - {source.citation} ({source.status.value})")
        return EXIT_GO
    for rule in rules:
        print(f"{rule.id}  {rule.title}  [{rule.pack} {rule.pack_version}]")
        for source in rule.sources:
            print(f"    source: {source.citation} ({source.status.value})")
    return EXIT_GO if not manager.problems else EXIT_FINDINGS


def _schema() -> int:
    from reviewer.build import build_json_schema

    print(json.dumps(build_json_schema(), indent=2, sort_keys=True))
    return EXIT_GO
