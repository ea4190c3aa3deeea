"""Waivers: findings a named person has accepted, with a justification and a date.

A waived finding stays in the review, marked and justified, but no longer counts toward the
verdict. A waiver accepts a judgement, never a gap: ``unassessed`` findings cannot be waived, and
``stop`` findings only where the profile explicitly allows it. A waiver that matches nothing, or
names a rule no pack provides, is reported so stale waivers do not linger.
"""

from __future__ import annotations

import datetime
import hashlib
import unicodedata
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Annotated

from pydantic import AfterValidator, BaseModel, ConfigDict, Field, ValidationError

from reviewer.findings import Finding, Severity
from reviewer.inputs import decode, load_toml, read_bytes
from reviewer.loader import validation_error


def _written(text: str) -> str:
    """A waiver's words must say something: not only spaces, and no control, bidi or
    zero-width characters that would make it read differently from what it holds."""
    if not text.strip():
        raise ValueError("some words, not only white space")
    hidden = next((c for c in text if unicodedata.category(c) in ("Cc", "Cf", "Zl", "Zp")), None)
    if hidden is not None:
        raise ValueError(f"plain text; U+{ord(hidden):04X} is a control or invisible character")
    return text


def _words(longest: int) -> object:
    return Annotated[str, Field(min_length=1, max_length=longest), AfterValidator(_written)]


Text = _words(400)


class Waiver(BaseModel):
    """One accepted finding. Strict types: a date is a TOML date, never a string or a number
    (``date = 0`` would otherwise read as 1970-01-01)."""

    model_config = ConfigDict(extra="forbid", frozen=True, populate_by_name=True, strict=True)

    rule_id: Annotated[_words(120), Field(alias="rule")]  # type: ignore[valid-type]
    subject: _words(200)  # type: ignore[valid-type]
    justification: Text  # type: ignore[valid-type]
    accepted_by: _words(120)  # type: ignore[valid-type]
    date: datetime.date


class WaiverFile(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, strict=True)

    waiver: list[Waiver] = Field(default_factory=list, max_length=500)


@dataclass(frozen=True)
class WaiverSet:
    path: str
    fingerprint: str
    waivers: tuple[Waiver, ...]


@dataclass(frozen=True)
class WaiverNote:
    """What became of one waiver: applied, or why not."""

    waiver: Waiver
    applied: bool
    note: str


def load_waivers(path: str | Path) -> WaiverSet:
    where = str(path)
    raw = read_bytes(path, "waivers file")  # regular files only, at most 1 MiB
    text = decode(raw, where, "a waivers file")
    data = load_toml(text, where)
    try:
        parsed = WaiverFile.model_validate(data)
    except ValidationError as exc:  # every error, each at its line, as for a build file
        raise validation_error(exc, where, WaiverFile, text) from None
    return WaiverSet(where, hashlib.sha256(raw).hexdigest(), tuple(parsed.waiver))


def apply_waivers(
    findings: Sequence[Finding],
    waivers: Iterable[Waiver],
    known_rules: set[str],
    allow_stop: bool,
) -> tuple[list[Finding], list[WaiverNote]]:
    """Mark the findings each waiver accepts; say what became of every waiver."""
    result = list(findings)
    notes: list[WaiverNote] = []
    for waiver in waivers:
        if waiver.rule_id not in known_rules:
            notes.append(WaiverNote(waiver, False, "no loaded rule has this id"))
            continue
        matches = [
            i
            for i, f in enumerate(result)
            if f.rule_id == waiver.rule_id and f.subject == waiver.subject
        ]
        if not matches:
            notes.append(WaiverNote(waiver, False, "matches no finding of this review: unused"))
            continue
        applied = False
        reasons = []
        for index in matches:
            finding = result[index]
            if finding.severity is Severity.UNASSESSED:
                reasons.append("an unassessed finding cannot be waived: supply the missing inputs")
            elif finding.severity is Severity.PASS:
                reasons.append("the finding passes: nothing to waive")
            elif finding.severity is Severity.STOP and not allow_stop:
                reasons.append("a stop finding cannot be waived under this profile")
            elif finding.waiver is not None:
                reasons.append("the finding is already waived by an earlier waiver")
            else:
                result[index] = replace(finding, waiver=waiver)
                applied = True
        note = "applied" if applied else "; ".join(dict.fromkeys(reasons))
        notes.append(WaiverNote(waiver, applied, note))
    return result, notes
