"""What a rule returns: findings with numbers, limits, sources and remedies; and the verdict."""

from __future__ import annotations

import enum
from collections.abc import Iterable
from dataclasses import dataclass, field, replace
from functools import cached_property
from typing import TYPE_CHECKING

import pint

if TYPE_CHECKING:  # imported only when a review has waivers
    from reviewer.waivers import Waiver

from reviewer.units import in_unit, in_units_of, is_offset, quantity, quantity_like

_make_instance = object.__new__


class Severity(enum.Enum):
    """Worst first. ``unassessed`` is not a severity of the build but of the review itself."""

    STOP = "stop"
    FIX = "fix"
    ADVISE = "advise"
    PASS = "pass"
    UNASSESSED = "unassessed"

    @property
    def rank(self) -> int:
        return _RANK[self]

    @property
    def meaning(self) -> str:
        return _MEANING[self]


_RANK = {
    Severity.STOP: 0,
    Severity.UNASSESSED: 1,
    Severity.FIX: 2,
    Severity.ADVISE: 3,
    Severity.PASS: 4,
}
_MEANING = {
    Severity.STOP: "do not ride until resolved",
    Severity.FIX: "resolve before regular use",
    Severity.ADVISE: "improvement",
    Severity.PASS: "checked, within limits",
    Severity.UNASSESSED: "could not be checked",
}


class SourceStatus(enum.Enum):
    PUBLISHED = "published"
    COMMON_PRACTICE = "common practice"
    FROM_MEMORY = "from memory"
    DERIVED = "derived"
    USER = "builder's datasheet"


@dataclass(frozen=True)
class Source:
    """Where a limit or formula comes from, and how sure we are of it."""

    citation: str
    status: SourceStatus = SourceStatus.PUBLISHED

    @classmethod
    def common_practice(cls, citation: str) -> Source:
        return cls(citation, SourceStatus.COMMON_PRACTICE)

    @classmethod
    def from_memory(cls, citation: str) -> Source:
        return cls(citation, SourceStatus.FROM_MEMORY)


class Comparison(enum.Enum):
    AT_MOST = "at most"
    AT_LEAST = "at least"


@dataclass(frozen=True)
class Finding:
    """One checked item: a rule's verdict on one subject (a wire, a rider, a pin...)."""

    severity: Severity
    subject: str
    rationale: str
    measured: pint.Quantity | str | None = None  # text for codes such as "IP54"
    limit: pint.Quantity | str | None = None
    comparison: Comparison = Comparison.AT_MOST
    remedy: str | None = None
    sources: tuple[Source, ...] = ()
    missing: tuple[str, ...] = ()  # build fields whose absence left this unassessed
    error: str | None = None  # a rule that raised: its error
    waiver: Waiver | None = None  # the waiver that accepted this finding
    rule_id: str = ""  # stamped by the engine from the rule that returned it
    title: str = ""  # likewise

    @cached_property
    def margin(self) -> float | None:
        """Headroom as a fraction of the limit: positive within, negative beyond.

        None for temperatures on an offset scale (degC), where a ratio means nothing; the
        review shows :attr:`headroom` in kelvin for those instead.
        """
        if not _both_quantities(self.measured, self.limit) or is_offset(self.limit):
            return None
        limit = float(self.limit.magnitude)  # a ratio: any common multiplicative unit will do
        measured = in_units_of(self.measured, self.limit)
        if limit == 0:
            return None
        if self.comparison is Comparison.AT_MOST:
            return (limit - measured) / abs(limit)
        return (measured - limit) / abs(limit)

    @cached_property
    def headroom(self) -> pint.Quantity | None:
        """Limit minus measured (measured minus limit for an at-least check), in the limit's
        unit; a temperature difference comes out in kelvin."""
        if not _both_quantities(self.measured, self.limit):
            return None
        if is_offset(self.limit):
            limit = in_unit(self.limit, "kelvin")
            measured = in_unit(self.measured, "kelvin")
            sign = 1 if self.comparison is Comparison.AT_MOST else -1
            return quantity(sign * (limit - measured), "kelvin")
        difference = float(self.limit.magnitude) - in_units_of(self.measured, self.limit)
        if self.comparison is Comparison.AT_LEAST:
            difference = -difference
        return quantity_like(difference, self.limit)

    @property
    def sort_key(self) -> tuple[int, str, str]:
        return (self.severity.rank, self.rule_id, self.subject)

    def stamped(self, rule_id: str, title: str) -> Finding:
        """A copy credited to the rule that gave it: ``replace(self, rule_id=..., title=...)``.

        ``dataclasses.replace`` walks the fields and calls ``__init__`` each time; the engine
        stamps every finding of every review, so a plain Finding (no ``__post_init__``, no
        slots) is copied attribute by attribute instead, with the same result."""
        if type(self) is not Finding:
            return replace(self, rule_id=rule_id, title=title)
        made = _make_instance(Finding)
        attributes = made.__dict__
        attributes.update(self.__dict__)
        attributes["rule_id"] = rule_id
        attributes["title"] = title
        return made


def _both_quantities(measured: object, limit: object) -> bool:
    return isinstance(measured, pint.Quantity) and isinstance(limit, pint.Quantity)


class Verdict(enum.Enum):
    GO = "go"
    NO_GO = "no-go"
    CONDITIONAL = "conditional"
    INCOMPLETE = "incomplete"

    @property
    def meaning(self) -> str:
        return {
            Verdict.GO: "no stop or fix findings, and every mandatory check was assessed",
            Verdict.NO_GO: "at least one stop finding: do not ride until it is resolved",
            Verdict.CONDITIONAL: "fix findings only: resolve them before regular use",
            Verdict.INCOMPLETE: "a mandatory check could not be assessed or failed to run",
        }[self]


def decide_verdict(findings: Iterable[Finding], mandatory_rules: Iterable[str]) -> Verdict:
    """Fail closed: a stop wins, then anything mandatory left unassessed, then fixes.

    Waived findings still show a rule ran, but their severity no longer counts. Unassessed
    findings cannot be waived (see reviewer.waivers), so they always count.
    """
    findings = list(findings)
    counted = [f for f in findings if f.waiver is None]
    mandatory = set(mandatory_rules)
    if any(f.severity is Severity.STOP for f in counted):
        return Verdict.NO_GO
    ran = {f.rule_id for f in findings if f.severity is not Severity.UNASSESSED}
    unassessed = {f.rule_id for f in findings if f.severity is Severity.UNASSESSED}
    if any(f.error for f in findings):
        return Verdict.INCOMPLETE
    if mandatory & unassessed or mandatory - ran - unassessed:
        return Verdict.INCOMPLETE
    if any(f.severity is Severity.FIX for f in counted):
        return Verdict.CONDITIONAL
    return Verdict.GO


@dataclass(frozen=True)
class Assumption:
    """A default or simplification a rule relied on; the review lists them all."""

    text: str
    source: Source | None = None


@dataclass(frozen=True)
class DerivedFigure:
    """A number the review computed and shows for reference (pack voltage, top speed...)."""

    name: str
    value: pint.Quantity | str
    note: str = ""
    order: int = field(default=100, compare=False)
    #: Time series behind the figure, for plots and the JSON review: (name, unit, values).
    series: tuple[tuple[str, str, tuple[float, ...]], ...] = field(default=(), compare=False)
