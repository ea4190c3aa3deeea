"""The review people read: what to do first, then figures, then a compact table of passes and the
references, each cited once; shorter than before with nothing lost against the JSON review."""

from __future__ import annotations

import json
import re

from reviewer.formats import render_review
from reviewer.report import markdown_text, remedy_fields
from reviewer.session import review_file

from .conftest import ROOT

FIRST_ATTEMPT = ROOT / "sample_builds" / "allotment-cargo-trike.toml"
# The first-attempt sample's Markdown review before this layout (commit 5b457d1, same rules):
# 610 lines. The layout must at most halve it.
LINES_BEFORE = 610


def _both() -> tuple[str, dict]:
    result = review_file(FIRST_ATTEMPT)
    return render_review(result, "md"), json.loads(render_review(result, "json"))


def test_at_most_half_as_long() -> None:
    markdown, _ = _both()
    assert len(markdown.splitlines()) <= LINES_BEFORE // 2


def test_nothing_lost_against_the_json() -> None:
    markdown, data = _both()
    for finding in data["findings"]:
        assert markdown_text(finding["subject"]) in markdown, finding["subject"]
        assert finding["rule_id"] in markdown
    for figure in data["figures"]:
        assert markdown_text(figure["name"]) in markdown, figure["name"]
    citations = {s["citation"] for f in data["findings"] for s in f["sources"]}
    citations |= {a["source"]["citation"] for a in data["assumptions"] if a.get("source")}
    for citation in citations:
        listed = re.findall(rf"^\d+\. {re.escape(markdown_text(citation))} \(", markdown, re.M)
        assert len(listed) == 1, citation  # listed once, by number


def test_actions_come_first_in_severity_order_with_their_references() -> None:
    markdown, _ = _both()
    headings = [line for line in markdown.splitlines() if line.startswith("## ")]
    assert headings[:3] == ["## What to do first", "## Not assessed", "## Derived figures"]
    assert headings.index("## Checked and within limits") < headings.index("## References")
    actions = re.findall(r"^\d+\. \*\*(STOP|FIX|ADVISE)\*\*", markdown, re.M)
    order = {"STOP": 0, "FIX": 1, "ADVISE": 2}
    assert actions == sorted(actions, key=order.__getitem__)
    references = len(
        re.findall(
            r"^\d+\. .*\((?:published|common practice|from memory|derived"
            r"|builder's datasheet)\)$",
            markdown,
            re.M,
        )
    )
    cited = {int(n) for group in re.findall(r"\[([\d, ]+)\]", markdown) for n in group.split(",")}
    assert cited and max(cited) <= references


def test_a_remedy_names_the_field_it_changes() -> None:
    assert remedy_fields("set controller.regen_current_limit to at most 4 A") == (
        "controller.regen_current_limit",
    )
    assert remedy_fields("lower wires[0].gauge, then brakes[1].deceleration") == (
        "wires[0].gauge",
        "brakes[1].deceleration",
    )
    assert remedy_fields("use a 42 V charger (10 x 4.2 V), e.g. no.field here") == ()


#: Rules whose remedy is the rider's conduct, with no value in the build file to change.
CONDUCT_REMEDIES = {"speed.descent"}


def test_every_remedy_in_the_samples_names_the_fields_to_change() -> None:
    # a builder edits the build file after a review: each stop, fix and advice says where
    from reviewer.findings import Severity

    unnamed = []
    for path in sorted((ROOT / "sample_builds").glob("*.toml")):
        for finding in review_file(path).findings:
            acted = finding.severity in (Severity.STOP, Severity.FIX, Severity.ADVISE)
            counted = acted and finding.rule_id not in CONDUCT_REMEDIES
            if counted and finding.remedy and not remedy_fields(finding.remedy):
                unnamed.append((path.name, finding.rule_id, finding.remedy[:80]))
    assert not unnamed
