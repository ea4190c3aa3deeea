"""The rule object a pack registers: metadata plus one plain check function."""

from __future__ import annotations

import inspect
from collections.abc import Callable, Iterable
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from reviewer.findings import Assumption, DerivedFigure, Finding, Severity, Source, SourceStatus
from reviewer.names import BUILT_IN_PACK, RULE_ID_RE

if TYPE_CHECKING:
    from reviewer.build import Build
    from reviewer.profile import Profile

Output = Finding | DerivedFigure | Assumption
CheckFunction = Callable[["Build", "Profile"], Iterable[Output]]


@dataclass(frozen=True)
class Rule:
    """A check over a validated build.

    ``check(build, profile)`` yields findings (one per subject: a wire, a rider, a pin),
    derived figures for the review's table, and assumptions it relied on. It must not mutate
    the build or do I/O. ``inputs`` names the build fields it reads, for ``firstride rules``.
    """

    id: str
    title: str
    check: CheckFunction
    sources: tuple[Source, ...]
    inputs: tuple[str, ...] = ()
    severities: tuple[Severity, ...] = (Severity.STOP, Severity.FIX, Severity.PASS)
    documentation: str = field(default="")
    pack: str = field(default="", compare=False)
    pack_version: str = field(default="", compare=False)

    @property
    def doc(self) -> str:
        return self.documentation or inspect.cleandoc(self.check.__doc__ or "")


def rule_problems(rule: Rule, pack: str | None = None) -> list[str]:
    """What a rule lacks to be registered: id form (prefixed by its pack's name, except in the
    built-in pack), title, documentation, sources with their status, a callable check."""
    problems = []
    if not isinstance(rule.id, str) or not RULE_ID_RE.match(rule.id):
        problems.append("id must be a lowercase dotted slug like 'area.check-name'")
    elif pack is not None and pack != BUILT_IN_PACK and not rule.id.startswith(f"{pack}."):
        problems.append(f"id must start with the pack's name: '{pack}.{rule.id.split('.')[-1]}'")
    if not isinstance(rule.title, str) or not rule.title.strip():
        problems.append("no title")
    if not rule.doc.strip():
        problems.append("no documentation (give documentation= or a docstring on check)")
    if not rule.sources:
        problems.append("no source")
    for source in rule.sources:
        if not isinstance(source, Source) or not str(source.citation).strip():
            problems.append(f"source {source!r} is not a Source with a citation")
        elif not isinstance(source.status, SourceStatus):
            problems.append(f"source {source.citation!r} has no SourceStatus")
    if not rule.severities or not all(isinstance(s, Severity) for s in rule.severities):
        problems.append("severities must be Severity members")
    if not callable(rule.check):
        problems.append("check is not callable")
    return problems
