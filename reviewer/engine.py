"""Run every rule over a validated build and gather a deterministic review."""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from reviewer import __version__
from reviewer.build import Build
from reviewer.finding_checks import checked_outputs, unassessed
from reviewer.findings import (
    Assumption,
    DerivedFigure,
    Finding,
    Severity,
    Verdict,
    decide_verdict,
)
from reviewer.profile import MissingLimit, Profile
from reviewer.rule import Rule
from reviewer.setup_checks import setup_findings
from reviewer.watchdog import (
    DEFAULT_REVIEW_BUDGET_S,
    Outcome,
    ReviewTimeout,
    RuleTimeout,
    call_each_with_budget,
    stdout_to_stderr,
)

if TYPE_CHECKING:  # waivers are imported when a review has some: most reviews have none
    from reviewer.changes import Changes
    from reviewer.plugins import PackProblem
    from reviewer.waivers import WaiverNote, WaiverSet


@dataclass(frozen=True)
class Review:
    build: Build
    build_path: str
    build_fingerprint: str
    profile: Profile
    rules: tuple[Rule, ...]
    findings: tuple[Finding, ...]
    figures: tuple[DerivedFigure, ...]
    assumptions: tuple[Assumption, ...]
    problems: tuple[PackProblem, ...]
    verdict: Verdict
    tool_version: str = __version__
    waivers: WaiverSet | None = None
    waiver_notes: tuple[WaiverNote, ...] = ()
    changes: Changes | None = None  # when reviewed --since a previous review
    build_data: dict[str, Any] = field(default_factory=dict)  # the build file's raw tree

    def count(self, severity: Severity) -> int:
        """Findings of that severity that still count (waived ones are counted apart)."""
        return sum(1 for f in self.findings if f.severity is severity and f.waiver is None)

    @property
    def waived(self) -> int:
        return sum(1 for f in self.findings if f.waiver is not None)

    def fails(self, fail_on: str = "fix") -> bool:
        """A no-go or incomplete review, or a finding of ``fail_on`` (stop, fix, advise) or
        worse: what makes ``firstride review`` exit 1."""
        if self.verdict in (Verdict.NO_GO, Verdict.INCOMPLETE):
            return True
        worst = Severity(fail_on).rank
        return any(
            f.severity is not Severity.UNASSESSED and f.severity.rank <= worst
            for f in self.findings
        )

    @property
    def packs(self) -> list[tuple[str, str]]:
        return sorted({(r.pack, r.pack_version) for r in self.rules})


def run_rule(rule: Rule, build: Build, profile: Profile) -> list[object]:
    """One rule, fenced: whatever it raises (any BaseException) or returns wrongly, a finding
    the engine cannot trust (reviewer.finding_checks), or a run over the profile's time budget
    (reviewer.watchdog), becomes an unassessed finding."""
    return run_rules([rule], build, profile)[0]


def run_rules(rules: Sequence[Rule], build: Build, profile: Profile) -> list[list[object]]:
    """Each rule's outputs, fenced as :func:`run_rule` says; the rules run in order on one
    worker thread, each within the profile's ``rule_time_budget`` and all of them within the
    review's, with stdout pointed at stderr so a printing rule cannot corrupt the review."""
    checks = [_collector(rule, build, profile) for rule in rules]
    total = getattr(profile, "review_time_budget", DEFAULT_REVIEW_BUDGET_S)
    with stdout_to_stderr():
        outcomes = call_each_with_budget(checks, profile.rule_time_budget, total)
    return [_fenced(rule, outcome) for rule, outcome in zip(rules, outcomes, strict=True)]


def _collector(rule: Rule, build: Build, profile: Profile) -> Callable[[], object]:
    # checked on the worker too, so even reading a rule's findings is within its budget
    return lambda: checked_outputs(rule, rule.check(build, profile))


def _fenced(rule: Rule, outcome: Outcome) -> list[object]:
    error = outcome.error
    if isinstance(error, RuleTimeout | ReviewTimeout):
        return [unassessed(rule, str(error))]
    if isinstance(error, MissingLimit):
        return [unassessed(rule, f"the profile lacks a limit this rule needs: {error}")]
    if error is not None:  # a crashing rule must never let a review pass
        return [unassessed(rule, f"the rule failed to run: {_described(error)}")]
    outputs = outcome.value
    if not isinstance(outputs, list):  # cannot happen: checked_outputs gives a list
        return [unassessed(rule, "the rule's outputs could not be read")]
    return outputs


def _described(error: BaseException) -> str:
    """``Type: message`` of a rule's exception, short, even if its ``str()`` fails."""
    try:
        message = str(error)
    except Exception:  # noqa: BLE001 - an exception that cannot describe itself
        message = "(its message cannot be read)"
    text = f"{type(error).__name__}: {message}" if message else type(error).__name__
    return text if len(text) <= 300 else text[:299] + "…"


def review(
    build: Build,
    profile: Profile,
    rules: Sequence[Rule],
    *,
    build_path: str = "",
    build_fingerprint: str = "",
    problems: Sequence[PackProblem] = (),
    waivers: WaiverSet | None = None,
) -> Review:
    findings: list[Finding] = []
    figures: dict[str, DerivedFigure] = {}
    assumptions: dict[str, Assumption] = {}
    rules = [rule for rule in rules if profile.runs(rule.id)]  # the review lists those off
    for outputs in run_rules(rules, build, profile):
        for item in outputs:
            if isinstance(item, Finding):
                findings.append(profile.adjust(item))  # a profile's escalate_to
            elif isinstance(item, DerivedFigure):
                figures.setdefault(item.name, item)
            elif isinstance(item, Assumption):
                assumptions.setdefault(item.text, item)
    mandatory = set(profile.mandatory_rules)
    known = {rule.id for rule in rules}
    for rule_id in sorted(mandatory - known):
        findings.append(
            Finding(
                severity=Severity.UNASSESSED,
                subject="(whole rule)",
                rationale="the profile requires this rule but no loaded pack provides it",
                error="required rule not loaded",
                rule_id=rule_id,
                title=rule_id,
            )
        )
    findings.extend(setup_findings(profile, rules, problems))  # required packs that failed
    notes: list[WaiverNote] = []
    if waivers is not None:
        from reviewer.waivers import apply_waivers

        findings, notes = apply_waivers(findings, waivers.waivers, known, _stop_waivable(profile))
    findings.sort(key=lambda f: f.sort_key)
    verdict = decide_verdict(findings, mandatory)
    return Review(
        build=build,
        build_path=build_path,
        build_fingerprint=build_fingerprint,
        profile=profile,
        rules=tuple(rules),
        findings=tuple(findings),
        figures=tuple(sorted(figures.values(), key=lambda d: (d.order, d.name))),
        assumptions=tuple(sorted(assumptions.values(), key=lambda a: a.text)),
        problems=tuple(problems),
        verdict=verdict,
        waivers=waivers,
        waiver_notes=tuple(notes),
    )


def _stop_waivable(profile: Profile) -> bool:
    """Only a profile that says so in ``[waivers] allow_stop = true`` lets a stop be waived."""
    return profile.allow_stop_waivers
