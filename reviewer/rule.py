"""The rule object a pack registers: metadata plus one plain check function."""

from __future__ import annotations

import inspect
from collections.abc import Callable, Iterable
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from reviewer.findings import Assumption, DerivedFigure, Finding, Severity, Source

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
