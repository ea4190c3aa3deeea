"""``firstride rules [RULE_ID]``: what every loaded pack checks, and where its limits come from."""

from __future__ import annotations

import argparse

from reviewer.commands import EXIT_FINDINGS, EXIT_GO
from reviewer.commands.pack_options import add_pack_arguments, packs_from
from reviewer.errors import InputError

NAME = "rules"
HELP = "list the rules every loaded pack provides, or show one rule's documentation"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("rule_id", nargs="?", help="show one rule's documentation")
    parser.add_argument(
        "--profile", help="also show what this profile does to each rule (switched off, escalated)"
    )
    add_pack_arguments(parser)


def run(args: argparse.Namespace) -> int:
    from reviewer.findings import Severity
    from reviewer.profile import load_profile

    profile = load_profile(args.profile) if args.profile else None
    manager = packs_from(args)
    rules = manager.rules()
    if args.rule_id:
        match = [r for r in rules if r.id == args.rule_id]
        if not match:
            known = ", ".join(r.id for r in rules)
            raise InputError("(rules)", args.rule_id, f"a known rule id ({known})")
        rule = match[0]
        info = manager.packs.get(rule.pack)
        print(f"{rule.id}: {rule.title}")
        print(f"pack: {rule.pack} {rule.pack_version}{f' ({info.origin})' if info else ''}")
        if profile is not None:
            print(f"profile: {_setting(profile, rule.id) or 'runs as written'}")
        print(f"inputs: {', '.join(rule.inputs) or '(none listed)'}")
        print("severities it can give:")
        extra = () if Severity.UNASSESSED in rule.severities else (Severity.UNASSESSED,)
        for severity in (*rule.severities, *extra):
            print(f"  {severity.value}: {severity.meaning}")
        print()
        print(rule.doc)
        print()
        print("sources:")
        for source in rule.sources:
            print(f"  - {source.citation} ({source.status.value})")
        return EXIT_GO
    for rule in rules:
        note = _setting(profile, rule.id) if profile is not None else ""
        suffix = f"  ({note})" if note else ""
        print(f"{rule.id}  {rule.title}  [{rule.pack} {rule.pack_version}]{suffix}")
        for source in rule.sources:
            print(f"    source: {source.citation} ({source.status.value})")
    print()
    print("rule packs:")
    for info in sorted(manager.packs.values(), key=lambda i: i.name):
        print(f"  {info.name} {info.version}  {info.origin}")
    failed = [p for p in manager.problems if not p.blocked]
    return EXIT_GO if not failed else EXIT_FINDINGS


def _setting(profile: object, rule_id: str) -> str:
    from reviewer.profile import Profile

    assert isinstance(profile, Profile)
    setting = profile.rule_settings.get(rule_id)
    if setting is None:
        return ""
    if not setting.enabled:
        when = setting.date.isoformat() if setting.date else "?"
        return f"switched off by {setting.by} on {when}: {setting.justification}"
    assert setting.escalate_to is not None
    return f"fix and advise findings escalated to {setting.escalate_to.value}"
