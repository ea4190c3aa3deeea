"""The rule-pack options ``review`` and ``rules`` share: local packs, blocked packs, strictness.

Not a verb: :data:`reviewer.commands.VERBS` lists the verbs."""

from __future__ import annotations

import argparse
import sys
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from reviewer.plugins import PackManager


def add_pack_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument(
        "--rules",
        dest="rule_files",
        action="append",
        default=[],
        metavar="PATH.py",
        help="also load this Python file as a rule pack, without packaging it (repeatable)",
    )
    parser.add_argument(
        "--block-pack",
        dest="blocked_packs",
        action="append",
        default=[],
        metavar="NAME",
        help="do not load the installed rule pack NAME (repeatable; "
        "FIRSTRIDE_BLOCK_PACKS=name1,name2 does the same)",
    )
    parser.add_argument(
        "--strict-packs",
        action="store_true",
        help="any rule pack problem is an input error (exit 2): for pack authors",
    )


def packs_from(args: argparse.Namespace) -> PackManager:
    """Load the packs the options name; every problem is reported on stderr, one line each."""
    from reviewer.plugins import load_packs
    from reviewer.watchdog import stdout_to_stderr

    with stdout_to_stderr():  # a pack that prints while loading cannot corrupt a review
        manager = load_packs(args.rule_files, args.blocked_packs, strict=args.strict_packs)
        manager.rules()  # collect now, so rule problems are reported here too
        manager.pack_limits()
    report_problems(manager)
    return manager


def report_problems(manager: PackManager) -> None:
    for problem in manager.problems:
        if problem.blocked:
            print(
                f"firstride: rule pack {problem.pack} not loaded: {problem.error}", file=sys.stderr
            )
        else:
            print(f"firstride: rule pack {problem.pack} failed: {problem.error}", file=sys.stderr)
