"""Waivers: findings a named person has accepted, with a justification and a date.

A waived finding stays in the review, marked and justified, but no longer counts toward the
verdict. A waiver accepts a judgement, never a gap: ``unassessed`` findings cannot be waived, and
``stop`` findings only where the profile explicitly allows it. A waiver that matches nothing, or
names a rule no pack provides, is reported so stale waivers do not linger.
"""

from __future__ import annotations

import datetime
import hashlib
import tomllib
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Annotated

from pydantic import BaseModel, ConfigDict, Field, ValidationError

from reviewer.errors import InputError
from reviewer.findings import Finding, Severity
from reviewer.loader import validation_error

Text = Annotated[str, Field(min_length=1, max_length=400)]


class Waiver(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, populate_by_name=True)

    rule_id: Annotated[str, Field(min_length=1, max_length=120, alias="rule")]
    subject: Annotated[str, Field(min_length=1, max_length=200)]
    justification: Text
    accepted_by: Annotated[str, Field(min_length=1, max_length=120)]
    date: datetime.date


class WaiverFile(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)

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
    try:
        raw = Path(path).read_bytes()
    except FileNotFoundError:
        raise InputError(where, "(file)", "an existing waivers file") from None
    except OSError as exc:
        raise InputError(where, "(file)", f"a readable file ({exc.strerror})") from None
    try:
        data = tomllib.loads(raw.decode("utf-8"))
    except UnicodeDecodeError:
        raise InputError(where, "(file)", "UTF-8 text") from None
    except tomllib.TOMLDecodeError as exc:
        raise InputError(where, "(file)", f"valid TOML ({exc})") from None
    try:
        parsed = WaiverFile.model_validate(data)
    except ValidationError as exc:
        raise validation_error(exc, where, WaiverFile) from None
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
