"""The review as a SARIF 2.1.0 log, for the checkers that clubs run over build files in CI.

One run; ``tool.driver.rules`` describes every rule that ran (its title, its documentation and a
default level); one result for each finding that is not a pass, pointing at the line and column
of the build file's field the finding is about (:mod:`reviewer.toml_positions`).

Levels, from the finding's severity:

========== ========= =========================================================
severity   level     why
========== ========= =========================================================
stop       error     do not ride until resolved
fix        error     resolve before regular use: a CI check should fail on it
advise     warning   an improvement
unassessed note      the review could not judge it: the finding names what is missing
pass       (none)    checked and within limits: no result
========== ========= =========================================================

A waived finding keeps its level and carries an external suppression (the waivers file) with
the waiver's justification, who accepted it and when. The field a result points at is the finding's
first missing field when it has one; else the part its subject names (``wire 'pack positive'``
is that wire's table, a motor, rider, fuse, connector, wheel or logic load likewise, ``pin P5``
the load on that pin); else the first field the rule declares as its input that the file has;
else line 1. A field the file lacks points at the nearest table above it that it has. Columns
count Unicode code points (``run.columnKind``). Output is deterministic: keys sorted, rules by
id, results in the review's order, no timestamps.
"""

from __future__ import annotations

import json
import re
import tomllib
from collections.abc import Iterable, Mapping
from typing import Any
from urllib.parse import quote

from reviewer.engine import Review
from reviewer.export import flatten_fields, quantity_json
from reviewer.findings import Finding, Severity
from reviewer.rule import Rule
from reviewer.toml_positions import Position, field_positions, locate

SARIF_VERSION = "2.1.0"
SARIF_SCHEMA = (
    "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"
)
LEVELS = {
    Severity.STOP: "error",
    Severity.FIX: "error",
    Severity.ADVISE: "warning",
    Severity.UNASSESSED: "note",
}
_LEVEL_ORDER = ("error", "warning", "note")
_WINDOWS_DRIVE = re.compile(r"[A-Za-z]:/")
_WORD = re.compile(r"[a-z0-9]+")
_INDEX = re.compile(r"\[\d+\]")


def render_sarif(review: Review, build_text: str, build_path: str) -> str:
    """The SARIF log of ``review`` as JSON text; ``build_text`` is the build file's text (for
    line and column positions) and ``build_path`` its path as given (the artifact's uri)."""
    return json.dumps(sarif_log(review, build_text, build_path), indent=2, sort_keys=True) + "\n"


def sarif_log(review: Review, build_text: str, build_path: str) -> dict[str, Any]:
    rules = _unique_rules(review.rules)
    index = {rule.id: number for number, rule in enumerate(rules)}
    positions = field_positions(build_text)
    flat = _flat_fields(review.build_data, build_text)
    named = _named_items(flat)
    by_id = {rule.id: rule for rule in rules}
    uri = artifact_uri(build_path)
    results = []
    for finding in review.findings:
        if finding.severity is Severity.PASS:
            continue
        rule = by_id.get(finding.rule_id)
        field = finding_field(finding, rule.inputs if rule else (), positions, named, flat)
        line, column = (1, 1) if field is None else locate(positions, field)
        results.append(_result(finding, index.get(finding.rule_id), uri, line, column))
    run: dict[str, Any] = {
        "tool": {
            "driver": {
                "name": "firstride",
                "version": review.tool_version,
                "rules": [_descriptor(rule) for rule in rules],
            }
        },
        "artifacts": [
            {
                "location": {"uri": uri},
                "hashes": {"sha-256": review.build_fingerprint},
                "roles": ["analysisTarget"],
            }
            if review.build_fingerprint
            else {"location": {"uri": uri}, "roles": ["analysisTarget"]}
        ],
        "columnKind": "unicodeCodePoints",
        "results": results,
        "properties": {
            "verdict": review.verdict.value,
            "profile": {"name": review.profile.name, "sha256": review.profile.fingerprint},
            "packs": [{"name": name, "version": version} for name, version in review.packs],
        },
    }
    return {"$schema": SARIF_SCHEMA, "version": SARIF_VERSION, "runs": [run]}


def artifact_uri(path: str) -> str:
    """A relative path stays relative (percent-encoded); an absolute one becomes a file URI."""
    text = path.replace("\\", "/")
    if text.startswith("/"):
        return "file://" + quote(text, safe="/")
    if _WINDOWS_DRIVE.match(text):
        return "file:///" + quote(text, safe="/:")
    return quote(text, safe="/")


def default_level(rule: Rule) -> str:
    """The worst level a rule can give, from the severities it declares ("none": pass only)."""
    levels = {LEVELS[s] for s in rule.severities if s in LEVELS}
    return next((level for level in _LEVEL_ORDER if level in levels), "none")


# --- which field a finding is about ---------------------------------------------------------


def finding_field(
    finding: Finding,
    inputs: Iterable[str],
    positions: Mapping[str, Position],
    named: list[tuple[str, str]],
    flat: Mapping[str, Any],
) -> str | None:
    """The build field path a finding points at, or None (line 1): its first missing field,
    else the part its subject names, else the first declared input the file has."""
    if finding.missing:
        first = finding.missing[0]
        return present(first, positions) or first.replace("[]", "[0]")
    subject = subject_field(finding.subject, named, flat)
    if subject is not None:
        return subject
    return input_field(finding.subject, inputs, positions)


def input_field(
    subject: str, inputs: Iterable[str], positions: Mapping[str, Position]
) -> str | None:
    """Of the rule's declared inputs the file has, and the fields written under them, the one
    whose name shares the most words with the subject (``low-voltage cut-off`` is
    ``battery.low_voltage_cutoff``, ``battery management system`` is ``battery.bms``); with
    none in common, the first declared input present."""
    every = _WORD.findall(subject.lower())
    words = {word for word in every if len(word) >= 3}
    initials = "".join(word[0] for word in every)  # "battery management system": bms
    first: str | None = None
    best: tuple[int, str | None] = (0, None)
    for path in inputs:
        found = present(path, positions)
        if found is None:
            continue
        first = first or found
        if not words:
            break
        for candidate in positions:
            if candidate != found and not candidate.startswith((f"{found}.", f"{found}[")):
                continue
            name = _INDEX.sub("", candidate).rpartition(".")[2].lower()
            parts = _WORD.findall(name)
            score = len(words.intersection(parts))
            score += sum(len(part) for part in parts if len(part) > 2 and part in initials)
            if score > best[0]:
                best = (score, candidate)
    return best[1] or first


def present(path: str, positions: Mapping[str, Position]) -> str | None:
    """``path`` if the file has it; ``motors[].kv`` is the first motor's ``kv`` the file has."""
    if "[]" not in path:
        return path if path in positions else None
    head, _, tail = path.partition("[]")
    number = 0
    while f"{head}[{number}]" in positions:
        found = present(f"{head}[{number}]{tail}", positions)
        if found is not None:
            return found
        number += 1
    return None


def subject_field(
    subject: str, named: list[tuple[str, str]], flat: Mapping[str, Any]
) -> str | None:
    """The item a subject names: ``wire 'pack positive'``, ``motor 'rear'``, ``port group B``,
    ``pin P5`` (the first load on that pin, else that pin in ``logic.pins``)."""
    best: tuple[tuple[int, int], str] | None = None
    for item, name in named:
        at = subject.rfind(f"'{name}'")
        if at < 0:
            if not subject.endswith(f" {name}"):
                continue
            at = len(subject) - len(name) - 1
            quoted = 0
        else:
            quoted = 1
        word = subject[:at].rstrip(" ,").rpartition(" ")[2].lower()
        kind = item[: item.rindex("[")].rpartition(".")[2].lower()  # "wires", "loads"
        fits = 2 if word and kind.startswith(word) else 0
        score = (fits + quoted, at)
        if best is None or score > best[0]:
            best = (score, item)
    if best is not None:
        return best[1]
    if subject.startswith("pin "):
        return _pin_field(subject[4:].strip(), flat)
    return None


def _pin_field(pin: str, flat: Mapping[str, Any]) -> str | None:
    fallback = None
    for path, value in flat.items():
        if not path.endswith(".pins") or not isinstance(value, list) or pin not in value:
            continue
        if ".loads[" in path:
            return path.rpartition(".")[0]
        if path == "logic.pins" and fallback is None:
            fallback = f"logic.pins[{value.index(pin)}]"
    return fallback


def _flat_fields(data: Mapping[str, Any], text: str) -> dict[str, Any]:
    if not data:
        try:
            data = tomllib.loads(text)
        except (tomllib.TOMLDecodeError, RecursionError, ValueError):
            return {}
    return flatten_fields(data)


def _named_items(flat: Mapping[str, Any]) -> list[tuple[str, str]]:
    """``(item path, name)`` of every table in a list that has a ``name``, in file order."""
    return [
        (path[: -len(".name")], value)
        for path, value in flat.items()
        if path.endswith("].name") and isinstance(value, str) and value
    ]


# --- SARIF objects --------------------------------------------------------------------------


def _unique_rules(rules: Iterable[Rule]) -> list[Rule]:
    seen: dict[str, Rule] = {}
    for rule in rules:
        seen.setdefault(rule.id, rule)
    return [seen[key] for key in sorted(seen)]


def _descriptor(rule: Rule) -> dict[str, Any]:
    doc = rule.doc.strip()
    summary = " ".join(doc.split("\n\n", 1)[0].split()) or rule.title
    return {
        "id": rule.id,
        "name": _identifier(rule.title) or rule.id,
        "shortDescription": {"text": rule.title},
        "fullDescription": {"text": summary},
        "help": {"text": doc or rule.title},
        "defaultConfiguration": {"level": default_level(rule)},
        "properties": {
            "pack": rule.pack,
            "packVersion": rule.pack_version,
            "sources": [source.citation for source in rule.sources],
        },
    }


def _identifier(title: str) -> str:
    """``Top speed for each rider's class`` -> ``TopSpeedForEachRidersClass``."""
    words = re.findall(r"[A-Za-z0-9]+", title.replace("'", ""))
    return "".join(word[:1].upper() + word[1:] for word in words)


def _result(
    finding: Finding, rule_index: int | None, uri: str, line: int, column: int
) -> dict[str, Any]:
    result: dict[str, Any] = {
        "ruleId": finding.rule_id,
        "level": LEVELS[finding.severity],
        "message": {"text": message_text(finding)},
        "locations": [
            {
                "physicalLocation": {
                    "artifactLocation": {"uri": uri, "index": 0},
                    "region": {"startLine": line, "startColumn": column},
                }
            }
        ],
        "properties": {
            "severity": finding.severity.value,
            "subject": finding.subject,
            "measured": quantity_json(finding.measured),
            "limit": quantity_json(finding.limit),
            "comparison": finding.comparison.value,
            "missing": list(finding.missing),
        },
    }
    if rule_index is not None:
        result["ruleIndex"] = rule_index
    waiver = finding.waiver
    if waiver is not None:
        result["suppressions"] = [
            {
                "kind": "external",  # kept in the waivers file; no state/status: the
                # committee text and the standard name that property differently
                "justification": f"{waiver.justification} (accepted by {waiver.accepted_by}, "
                f"{waiver.date.isoformat()})",
            }
        ]
    return result


def message_text(finding: Finding) -> str:
    """Subject, rationale and remedy in one text."""
    text = f"{finding.subject}: {finding.rationale}".strip()
    if finding.remedy:
        text += f"{'' if text.endswith('.') else '.'} Remedy: {finding.remedy}"
    return text


def read_build_text(path: str, fingerprint: str) -> str:
    """The build file's text again, for positions; an input error if it is not the same bytes
    the review read (its SHA-256 differs): the positions would point into another file."""
    import hashlib

    from reviewer.errors import InputError
    from reviewer.inputs import decode, read_bytes

    raw = read_bytes(path, "build file")
    if fingerprint and hashlib.sha256(raw).hexdigest() != fingerprint:
        raise InputError(path, "(file)", "a build file that stays put while it is reviewed")
    return decode(raw, path, "a build file")
