"""The fleet summary in Markdown, HTML (from the same Markdown) or JSON: a row per build."""

from __future__ import annotations

import json
from collections.abc import Sequence
from typing import Any

from reviewer import __version__
from reviewer.findings import Severity
from reviewer.fleet import FleetEntry, summary_counts

FORMAT_NAME = "firstride-fleet-summary"
FORMAT_VERSION = 1
_COLUMNS = ("stop", "fix", "advise", "unassessed", "waived")


def summary_json(entries: Sequence[FleetEntry]) -> dict[str, Any]:
    return {
        "format": FORMAT_NAME,
        "format_version": FORMAT_VERSION,
        "tool": {"name": "firstride", "version": __version__},
        "verdicts": summary_counts(entries),
        "builds": [
            {
                "source": e.source,
                "review": e.output,
                "vehicle": e.vehicle,
                "revision": e.revision,
                "verdict": e.verdict,
                "counts": e.counts,
                "first_action": e.first_action,
                "error": e.error,
            }
            for e in entries
        ],
    }


def render_summary(entries: Sequence[FleetEntry], form: str) -> str:
    if form == "json":
        return json.dumps(summary_json(entries), indent=2, ensure_ascii=False) + "\n"
    from reviewer.report import environment

    template = environment().get_template("fleet.md.j2")
    text = template.render(
        entries=entries,
        verdicts=[(k, v) for k, v in summary_counts(entries).items() if v],
        columns=_COLUMNS,
        tool_version=__version__,
        severities=[s.value for s in Severity],
    )
    markdown = "\n".join(line.rstrip() for line in text.splitlines()) + "\n"
    if form != "html":
        return markdown
    from reviewer.html import page_from_markdown

    return page_from_markdown(markdown, title=f"Fleet summary ({len(entries)} builds)")
