"""The review as JSON: every finding with numbers and units, figures and fingerprints.

The shape is documented in README.md ("JSON format") and versioned by ``format_version``; a
change that removes or renames a key bumps it. Output is deterministic: no timestamps.
"""

from __future__ import annotations

import datetime
import json
from collections.abc import Mapping
from functools import lru_cache
from typing import Any

import pint

from reviewer.engine import Review
from reviewer.findings import DerivedFigure, Finding, Severity
from reviewer.units import unit_symbol

FORMAT_NAME = "firstride-review"
FORMAT_VERSION = 1


@lru_cache(maxsize=256)
def _unit_text(units: pint.Unit) -> str:
    return unit_symbol(units, compact=True)  # the project's table, not pint's formatter


def quantity_json(value: object) -> dict[str, Any] | None:
    if value is None:
        return None
    if isinstance(value, pint.Quantity):
        return {"value": float(value.magnitude), "unit": _unit_text(value.units)}
    return {"text": str(value)}


def flatten_fields(tree: Mapping[str, Any], prefix: str = "") -> dict[str, Any]:
    """``{"battery": {"cells_series": 6}}`` -> ``{"battery.cells_series": 6}``; lists by index."""
    flat: dict[str, Any] = {}
    for key, value in tree.items():
        path = f"{prefix}.{key}" if prefix else str(key)
        _flatten_value(path, value, flat)
    return flat


def _flatten_value(path: str, value: Any, flat: dict[str, Any]) -> None:
    if isinstance(value, Mapping):
        flat.update(flatten_fields(value, path))
    elif isinstance(value, list) and any(isinstance(v, Mapping | list) for v in value):
        for index, item in enumerate(value):
            _flatten_value(f"{path}[{index}]", item, flat)
    elif isinstance(value, datetime.date | datetime.time):
        flat[path] = value.isoformat()
    else:
        flat[path] = value


def finding_json(finding: Finding) -> dict[str, Any]:
    waiver = finding.waiver
    return {
        "rule_id": finding.rule_id,
        "title": finding.title,
        "severity": finding.severity.value,
        "subject": finding.subject,
        "measured": quantity_json(finding.measured),
        "limit": quantity_json(finding.limit),
        "comparison": finding.comparison.value,
        "margin": finding.margin,
        "headroom": quantity_json(finding.headroom),
        "rationale": finding.rationale,
        "remedy": finding.remedy,
        "sources": [{"citation": s.citation, "status": s.status.value} for s in finding.sources],
        "missing": list(finding.missing),
        "error": finding.error,
        "waiver": None
        if waiver is None
        else {
            "justification": waiver.justification,
            "accepted_by": waiver.accepted_by,
            "date": waiver.date.isoformat(),
        },
    }


def _figure_json(figure: DerivedFigure) -> dict[str, Any]:
    data: dict[str, Any] = {
        "name": figure.name,
        "value": quantity_json(figure.value),
        "note": figure.note,
    }
    if figure.series:
        data["series"] = [
            {"name": name, "unit": unit, "values": list(values)}
            for name, unit, values in figure.series
        ]
    return data


def review_json(review: Review, build_data: Mapping[str, Any]) -> dict[str, Any]:
    vehicle = review.build.vehicle
    counts = {s.value: review.count(s) for s in Severity}
    counts["waived"] = review.waived
    document: dict[str, Any] = {
        "format": FORMAT_NAME,
        "format_version": FORMAT_VERSION,
        "tool": {"name": "firstride", "version": review.tool_version},
        "packs": [{"name": name, "version": version} for name, version in review.packs],
        "vehicle": {"name": vehicle.name, "kind": vehicle.kind.value, "revision": vehicle.revision},
        "build": {
            "path": review.build_path,
            "sha256": review.build_fingerprint,
            "fields": flatten_fields(build_data),
        },
        "profile": {
            "name": review.profile.name,
            "path": review.profile.path,
            "sha256": review.profile.fingerprint,
        },
        "verdict": review.verdict.value,
        "counts": counts,
        "findings": [finding_json(f) for f in review.findings],
        "figures": [_figure_json(d) for d in review.figures],
        "assumptions": [
            {
                "text": a.text,
                "source": None
                if a.source is None
                else {"citation": a.source.citation, "status": a.source.status.value},
            }
            for a in review.assumptions
        ],
        "pack_problems": [{"pack": p.pack, "error": p.error} for p in review.problems],
        "waivers": None
        if review.waivers is None
        else {
            "path": review.waivers.path,
            "sha256": review.waivers.fingerprint,
            "notes": [
                {
                    "rule_id": n.waiver.rule_id,
                    "subject": n.waiver.subject,
                    "applied": n.applied,
                    "note": n.note,
                }
                for n in review.waiver_notes
            ],
        },
        "changes": None if review.changes is None else review.changes.as_json(),
    }
    return document


def render_json(review: Review, build_data: Mapping[str, Any]) -> str:
    return json.dumps(review_json(review, build_data), indent=2, ensure_ascii=False) + "\n"
