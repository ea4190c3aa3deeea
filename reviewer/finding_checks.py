"""What the engine checks in everything a rule returns, before it can count in a review.

A rule pack is code the review did not write, and a wrong finding is worse than none: a
``pass`` with a NaN measured value, or ``inf A`` against a 10 A limit, would count as a pass;
a severity given as the string ``"pass"`` or as None would crash the sorting later. So every
finding is checked here, and one that fails any check becomes ``unassessed`` with the reason
(the engine does that), never dropped and never trusted:

- the severity is a :class:`Severity` and the comparison a :class:`Comparison`;
- subject and rationale are text, remedy and error text or nothing, sources :class:`Source`
  objects, missing inputs text, and no waiver is set (only waivers files waive);
- measured and limit are each nothing, text (a code such as ``IP54``) or a quantity with a
  finite real magnitude;
- a ``pass`` whose measured value and limit are both quantities agrees with them: the same
  kind of quantity, and within the limit the way its comparison says (a relative tolerance of
  :data:`PASS_TOLERANCE` allows for rounding in the rule's arithmetic).

A figure or an assumption is checked the same way (text where text belongs, finite numbers).

A rule gives at most :data:`MAX_FINDINGS` findings: past that, the worst ones are kept and one
``unassessed`` finding says how many were not (a runaway loop must not bury the review, nor
hide a stop among thousands of passes). At most :data:`MAX_OUTPUTS` outputs are read at all.
:func:`checked_outputs` does all this on the rule's worker thread, so even a finding whose
attributes are slow to read stays within the rule's time budget.
"""

from __future__ import annotations

import dataclasses
import itertools
import math
from collections.abc import Iterable
from typing import TYPE_CHECKING, Any

import pint

from reviewer.findings import Assumption, Comparison, DerivedFigure, Finding, Severity, Source

if TYPE_CHECKING:
    from reviewer.rule import Rule

#: How far past its limit a ``pass`` may be and still be taken as rounding (relative).
PASS_TOLERANCE = 1e-9
#: The most findings one rule may give to a review.
MAX_FINDINGS = 200
#: The most outputs (findings, figures, assumptions) read from one rule.
MAX_OUTPUTS = 10_000
_FIELDS = tuple(field.name for field in dataclasses.fields(Finding))
_NAMES = ", ".join(severity.value for severity in Severity)


def plain_finding(item: Finding) -> Finding:
    """``item`` as a plain :class:`Finding`: a subclass could answer differently each time
    it is asked (a property for a severity), so its fields are read once, here."""
    if type(item) is Finding:
        return item
    return Finding(**{name: getattr(item, name) for name in _FIELDS})


def finding_problem(finding: Finding) -> str | None:
    """Why ``finding`` cannot be trusted, or None when it can."""
    if type(finding.severity) is not Severity:
        return f"its severity is {_shown(finding.severity)}, not one of {_NAMES}"
    if type(finding.comparison) is not Comparison:
        return f"its comparison is {_shown(finding.comparison)}, not 'at most' or 'at least'"
    for name in ("subject", "rationale"):
        if not isinstance(getattr(finding, name), str):
            return f"its {name} is {_shown(getattr(finding, name))}, not text"
    for name in ("remedy", "error"):
        if getattr(finding, name) is not None and not isinstance(getattr(finding, name), str):
            return f"its {name} is {_shown(getattr(finding, name))}, not text"
    if not isinstance(finding.sources, tuple | list) or not all(
        type(source) is Source for source in finding.sources
    ):
        return "its sources are not Source objects"
    if not isinstance(finding.missing, tuple | list) or not all(
        isinstance(name, str) for name in finding.missing
    ):
        return "its missing inputs are not field names"
    if finding.waiver is not None:
        return "it carries a waiver: only a waivers file can waive a finding"
    for name in ("measured", "limit"):
        problem = value_problem(getattr(finding, name))
        if problem:
            return f"its {name} value {problem}"
    if finding.severity is Severity.PASS:
        return _pass_problem(finding)
    return None


def value_problem(value: object) -> str | None:
    """Why a measured value, limit or figure value is unusable, or None."""
    if value is None or isinstance(value, str):
        return None
    if not isinstance(value, pint.Quantity):
        return f"is {_shown(value)}, not a quantity or text"
    magnitude = value.magnitude
    if isinstance(magnitude, bool) or not isinstance(magnitude, int | float):
        try:
            magnitude = float(magnitude)
        except (TypeError, ValueError, OverflowError):
            return "is not a single real number"
    if not math.isfinite(magnitude):
        return f"is not finite ({magnitude})"
    return None


def _pass_problem(finding: Finding) -> str | None:
    measured, limit = finding.measured, finding.limit
    if not isinstance(measured, pint.Quantity) or not isinstance(limit, pint.Quantity):
        return None
    try:
        headroom = finding.headroom
    except (pint.PintError, ArithmeticError, TypeError, ValueError):
        return "it passes, but its measured value and its limit are not the same kind of quantity"
    if headroom is None:
        return None
    room = float(headroom.magnitude)
    tolerance = PASS_TOLERANCE * max(abs(float(limit.magnitude)), 1.0)
    if not math.isfinite(room) or room < -tolerance:
        word = "above" if finding.comparison is Comparison.AT_MOST else "below"
        return f"it passes, but its own measured value is {word} its limit"
    return None


def output_problem(item: DerivedFigure | Assumption) -> str | None:
    """Why a derived figure or an assumption cannot be shown, or None."""
    if isinstance(item, DerivedFigure):
        if not isinstance(item.name, str) or not isinstance(item.note, str):
            return "a derived figure's name and note must be text"
        if type(item.order) is not int:
            return "a derived figure's order must be a whole number"
        for entry in item.series:
            if not (isinstance(entry, tuple) and len(entry) == 3):
                return f"derived figure {item.name!r}: a series is (name, unit, values)"
            name, unit, values = entry
            if not (isinstance(name, str) and isinstance(unit, str)):
                return f"derived figure {item.name!r}: a series' name and unit must be text"
            if not all(type(v) is float and math.isfinite(v) for v in values):
                return f"derived figure {item.name!r}: series {name!r} holds a non-finite value"
        problem = value_problem(item.value)
        return f"derived figure {item.name!r}: its value {problem}" if problem else None
    if not isinstance(item.text, str):
        return "an assumption's text must be text"
    if item.source is not None and type(item.source) is not Source:
        return "an assumption's source must be a Source"
    return None


def _shown(value: Any) -> str:
    """A short, safe description of a value that should not be there."""
    if isinstance(value, pint.Quantity | pint.Unit):
        return "a quantity"
    try:
        text = repr(value)
    except Exception:  # noqa: BLE001 - a value that cannot even describe itself
        text = f"a {type(value).__name__}"
    return text if len(text) <= 60 else text[:59] + "…"


def unassessed(rule: Rule, error: str, subject: str = "(whole rule)") -> Finding:
    """The finding that stands for what a rule could not be trusted with."""
    return Finding(
        severity=Severity.UNASSESSED,
        subject=subject,
        rationale=error,
        error=error,
        rule_id=rule.id,
        title=rule.title,
        sources=rule.sources,
    )


def checked_outputs(rule: Rule, produced: Iterable[object]) -> list[object]:
    """What a rule's check gave, checked and credited to the rule (see the module docstring):
    findings stamped with its id and title, untrustworthy ones unassessed, figures and
    assumptions kept; anything else makes the whole rule unassessed."""
    iterator = iter(produced)
    try:
        items = list(itertools.islice(iterator, MAX_OUTPUTS + 1))
    finally:
        close = getattr(iterator, "close", None)
        if close is not None:
            close()
    cut = len(items) > MAX_OUTPUTS
    result: list[object] = []
    findings: list[Finding] = []
    for item in items[:MAX_OUTPUTS]:
        if isinstance(item, Finding):
            finding = plain_finding(item)
            problem = finding_problem(finding)
            if problem is None:
                findings.append(finding.stamped(rule.id, rule.title))
            else:
                subject = finding.subject if isinstance(finding.subject, str) else "(whole rule)"
                why = f"the rule's finding cannot be trusted: {problem}"
                findings.append(unassessed(rule, why, subject))
        elif isinstance(item, DerivedFigure | Assumption):
            problem = output_problem(item)
            if problem is not None:
                return [unassessed(rule, f"the rule returned a malformed output: {problem}")]
            result.append(item)
        else:
            kind = type(item).__name__
            return [unassessed(rule, f"the rule returned {kind}, not a finding")]
    if not findings:
        return [*result, unassessed(rule, "the rule returned no finding")]
    if len(findings) > MAX_FINDINGS or cut:
        count = f"more than {MAX_OUTPUTS} outputs" if cut else f"{len(findings)} findings"
        findings.sort(key=lambda f: f.severity.rank)  # stable: the worst first, else in order
        findings = findings[:MAX_FINDINGS]
        findings.append(
            unassessed(
                rule,
                f"the rule gave {count}; the {MAX_FINDINGS} worst are shown and the rest were "
                "not reviewed",
            )
        )
    return [*result, *findings]
