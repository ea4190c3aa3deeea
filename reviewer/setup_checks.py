"""Findings about a review's own setup: required packs that are missing, escalations of rules
that no loaded pack provides. Each is an ``unassessed`` error, so the review is ``incomplete``."""

from __future__ import annotations

from collections.abc import Sequence
from typing import TYPE_CHECKING

from reviewer.findings import Finding, Severity

if TYPE_CHECKING:
    from reviewer.plugins import PackProblem
    from reviewer.profile import Profile
    from reviewer.rule import Rule


def setup_findings(
    profile: Profile, rules: Sequence[Rule], problems: Sequence[PackProblem]
) -> list[Finding]:
    """Findings about the review's own setup, each an ``unassessed`` error (so the review is
    ``incomplete``): a required pack that failed, was blocked or is absent; a profile that
    escalates a rule no loaded pack provides."""
    findings = []
    failed = {p.pack: p for p in problems}
    loaded = {rule.pack for rule in rules}
    for pack in profile.required_packs:
        problem = failed.get(pack)
        if problem is not None:
            verb = "was blocked" if problem.blocked else "failed"
            reason = f"the profile requires rule pack {pack}, which {verb}: {problem.error}"
        elif pack not in loaded:
            reason = f"the profile requires rule pack {pack}, which is not installed"
        else:
            continue
        findings.append(_setup_finding(pack, f"rule pack {pack}", "(whole pack)", reason))
    known = {rule.id for rule in rules}
    for setting in profile.escalations:
        if setting.rule_id not in known:
            reason = (
                f"the profile escalates rule {setting.rule_id}, which no loaded pack provides: "
                "check the rule id"
            )
            findings.append(_setup_finding(setting.rule_id, setting.rule_id, "(profile)", reason))
    return findings


def _setup_finding(rule_id: str, title: str, subject: str, reason: str) -> Finding:
    return Finding(
        severity=Severity.UNASSESSED,
        subject=subject,
        rationale=reason,
        error=reason,
        rule_id=rule_id,
        title=title,
    )
