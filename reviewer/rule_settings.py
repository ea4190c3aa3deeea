"""What a profile says about one rule: ``[rules."rule.id"]`` in a profile file.

Two things, and only these: raise the rule's findings (``escalate_to``), or switch the rule off
(``enabled = false``), which needs a justification, who decided and when, so that the review can
print them. A rule is never switched off silently; lowering a severity is a waiver's job.
"""

from __future__ import annotations

import datetime
from dataclasses import dataclass

from reviewer.errors import InputError
from reviewer.findings import Severity
from reviewer.names import RULE_ID_RE

_RULE_KEYS = ("enabled", "escalate_to", "justification", "by", "date")
_ESCALATIONS = {s.value: s for s in (Severity.STOP, Severity.FIX, Severity.ADVISE)}


@dataclass(frozen=True)
class RuleSetting:
    """What a profile says about one rule: escalate its findings, or switch it off (with why)."""

    rule_id: str
    enabled: bool = True
    escalate_to: Severity | None = None
    justification: str = ""
    by: str = ""
    date: datetime.date | None = None
    profile: str = ""  # the file that said so


def parse_rule_setting(rule_id: str, table: object, where: str) -> RuleSetting:
    at = f"rules.{rule_id}"
    if not RULE_ID_RE.match(rule_id):
        raise InputError(where, at, "a rule id like 'area.check-name' (quote it: [rules.\"x.y\"])")
    if not isinstance(table, dict):
        raise InputError(where, at, "a table")
    for key in table:
        if key not in _RULE_KEYS:
            raise InputError(where, f"{at}.{key}", f"no such key{suggest(key, _RULE_KEYS)}")
    enabled = table.get("enabled", True)
    if not isinstance(enabled, bool):
        raise InputError(where, f"{at}.enabled", "true or false")
    escalate = table.get("escalate_to")
    target = None
    if escalate is not None:
        target = _ESCALATIONS.get(escalate) if isinstance(escalate, str) else None
        if target is None:
            raise InputError(where, f"{at}.escalate_to", f"one of {', '.join(_ESCALATIONS)}")
    if enabled:
        recorded = [k for k in ("justification", "by", "date") if k in table]
        if recorded:
            raise InputError(
                where, f"{at}.{recorded[0]}", "recorded only with enabled = false (a switch-off)"
            )
        if target is None:
            raise InputError(where, at, "escalate_to, or enabled = false with its justification")
        return RuleSetting(rule_id, escalate_to=target, profile=where)
    if target is not None:
        raise InputError(where, f"{at}.escalate_to", "nothing: the rule is switched off")
    texts = {}
    for key, what in (("justification", "why the rule is switched off"), ("by", "who decided")):
        value = table.get(key)
        if not isinstance(value, str) or not value.strip():
            raise InputError(
                where, f"{at}.{key}", f"{what} (text): a rule is never switched off silently"
            )
        texts[key] = value.strip()
    return RuleSetting(
        rule_id,
        enabled=False,
        justification=texts["justification"],
        by=texts["by"],
        date=_date(table.get("date"), where, f"{at}.date"),
        profile=where,
    )


def _date(value: object, where: str, at: str) -> datetime.date:
    if isinstance(value, datetime.datetime):
        return value.date()
    if isinstance(value, datetime.date):
        return value
    if isinstance(value, str):
        try:
            return datetime.date.fromisoformat(value.strip())
        except ValueError:
            pass
    raise InputError(where, at, "the date of the decision, e.g. 2025-04-30")


def suggest(word: str, known: tuple[str, ...]) -> str:
    import difflib  # only for a misspelt name: not imported on every review

    close = difflib.get_close_matches(word, known, n=1, cutoff=0.6)
    return f"; did you mean {close[0]!r}?" if close else f"; known keys: {', '.join(known)}"
