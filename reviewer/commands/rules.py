"""``firstride rules [RULE_ID]``: what every loaded pack checks, and where its limits come from."""

from __future__ import annotations

import argparse
import sys

from reviewer.commands import EXIT_FINDINGS, EXIT_GO
from reviewer.errors import InputError

NAME = "rules"
HELP = "list the rules every loaded pack provides, or show one rule's documentation"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("rule_id", nargs="?", help="show one rule's documentation")


def run(args: argparse.Namespace) -> int:
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
