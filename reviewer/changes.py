"""What changed since a previous review: findings resolved, new and changed; build fields changed.

The previous review is read from its JSON form (``--format json``), which carries every
finding's numbers and the build's fields, so a re-review after a change needs only that file.
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from reviewer.errors import InputError
from reviewer.export import FORMAT_NAME, FORMAT_VERSION, finding_json, flatten_fields
from reviewer.findings import Finding, Severity
from reviewer.inputs import MAX_REVIEW_BYTES, load_json, read_text


@dataclass(frozen=True)
class FindingChange:
    rule_id: str
    subject: str
    before: str  # severity, or "absent"
    after: str
    measured_before: str
    measured_after: str


@dataclass(frozen=True)
class FieldChange:
    field: str
    before: str  # "(absent)" where the field was not in that build
    after: str


@dataclass(frozen=True)
class Changes:
    previous_path: str
    previous_fingerprint: str
    previous_verdict: str
    resolved: tuple[FindingChange, ...]
    new: tuple[FindingChange, ...]
    changed: tuple[FindingChange, ...]
    fields: tuple[FieldChange, ...]

    def as_json(self) -> dict[str, Any]:
        def rows(items: tuple[Any, ...]) -> list[dict[str, str]]:
            return [dict(vars(item)) for item in items]

        return {
            "previous": {
                "path": self.previous_path,
                "sha256": self.previous_fingerprint,
                "verdict": self.previous_verdict,
            },
            "resolved": rows(self.resolved),
            "new": rows(self.new),
            "changed": rows(self.changed),
            "fields": rows(self.fields),
        }


def load_previous(path: str | Path) -> dict[str, Any]:
    """A previous review's JSON form, its shape checked so comparing it cannot fail: every
    part :func:`compare` reads is there and of the right type, or one InputError names it."""
    where = str(path)
    text = read_text(path, "review in JSON form", limit=MAX_REVIEW_BYTES)
    data = load_json(text, where, "a review written with --format json")
    if not isinstance(data, dict) or data.get("format") != FORMAT_NAME:
        raise InputError(where, "format", f"{FORMAT_NAME!r}: a review written with --format json")
    if data.get("format_version") != FORMAT_VERSION:
        raise InputError(where, "format_version", f"{FORMAT_VERSION} (this firstride's format)")
    for key, kind in (("findings", list), ("build", dict), ("verdict", str)):
        if not isinstance(data.get(key), kind):
            raise InputError(where, key, f"a JSON {_JSON_NAMES[kind]}")
    build = data["build"]
    if not isinstance(build.get("fields", {}), dict):
        raise InputError(where, "build.fields", "a JSON object of field names and values")
    if not isinstance(build.get("sha256", ""), str):
        raise InputError(where, "build.sha256", "a string")
    for index, entry in enumerate(data["findings"]):
        _check_finding(entry, f"findings[{index}]", where)
    return data


_JSON_NAMES = {list: "array", dict: "object", str: "string"}
_SEVERITIES = frozenset(s.value for s in Severity)


def _check_finding(entry: object, field: str, where: str) -> None:
    if not isinstance(entry, dict):
        raise InputError(where, field, "a JSON object (a finding)")
    for key in ("rule_id", "subject"):
        if not isinstance(entry.get(key), str):
            raise InputError(where, f"{field}.{key}", "a string")
    if entry.get("severity") not in _SEVERITIES:
        raise InputError(where, f"{field}.severity", "one of " + ", ".join(sorted(_SEVERITIES)))
    measured = entry.get("measured")
    if measured is None:
        return
    if not isinstance(measured, dict):
        raise InputError(where, f"{field}.measured", "null or a JSON object")
    if "text" in measured:
        if not isinstance(measured["text"], str):
            raise InputError(where, f"{field}.measured.text", "a string")
        return
    value = measured.get("value")
    if isinstance(value, bool) or not isinstance(value, int | float) or not math.isfinite(value):
        raise InputError(where, f"{field}.measured.value", "a finite number")
    if not isinstance(measured.get("unit"), str):
        raise InputError(where, f"{field}.measured.unit", "a string")


def _measured_text(entry: dict[str, Any] | None) -> str:
    if not entry:
        return ""
    if "text" in entry:
        return str(entry["text"])
    return f"{entry.get('value', ''):.4g} {entry.get('unit', '')}".strip()


def _text(value: Any) -> str:
    if value is None:
        return "(absent)"
    return json.dumps(value, ensure_ascii=False) if not isinstance(value, str) else value


def compare(
    previous: dict[str, Any], path: str, findings: tuple[Finding, ...], build_data: dict[str, Any]
) -> Changes:
    before: dict[tuple[str, str], dict[str, Any]] = {}
    for entry in previous["findings"]:
        if isinstance(entry, dict):
            before[(str(entry.get("rule_id")), str(entry.get("subject")))] = entry
    after = {(f.rule_id, f.subject): finding_json(f) for f in findings}
    resolved, new, changed = [], [], []
    for key in sorted(set(before) | set(after)):
        old, now = before.get(key), after.get(key)
        old_severity = old.get("severity", "absent") if old else "absent"
        now_severity = now["severity"] if now else "absent"
        row = FindingChange(
            key[0],
            key[1],
            str(old_severity),
            now_severity,
            _measured_text(old.get("measured") if old else None),
            _measured_text(now["measured"] if now else None),
        )
        old_open = old_severity not in ("pass", "absent")
        now_open = now_severity not in ("pass", "absent")
        if old_open and not now_open:
            resolved.append(row)
        elif now_open and not old_open:
            new.append(row)
        elif now_open and (
            old_severity != now_severity or row.measured_before != row.measured_after
        ):
            changed.append(row)
    old_fields = previous["build"].get("fields", {})
    new_fields = flatten_fields(build_data)
    fields = [
        FieldChange(name, _text(old_fields.get(name)), _text(new_fields.get(name)))
        for name in sorted(set(old_fields) | set(new_fields))
        if old_fields.get(name) != new_fields.get(name)
    ]
    return Changes(
        previous_path=path,
        previous_fingerprint=str(previous["build"].get("sha256", "")),
        previous_verdict=str(previous["verdict"]),
        resolved=tuple(resolved),
        new=tuple(new),
        changed=tuple(changed),
        fields=tuple(fields),
    )
