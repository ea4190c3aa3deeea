"""JSON and HTML forms of the review, and re-review after a change (--since)."""

from __future__ import annotations

import json
import re
from pathlib import Path

from reviewer.cli import main

from .conftest import SAMPLES

NO_GO = SAMPLES / "allotment-cargo-trike.toml"


def test_json_carries_numbers_units_verdict_and_fingerprints(tmp_path: Path) -> None:
    out = tmp_path / "r.json"
    assert main(["review", str(NO_GO), "--format", "json", "-o", str(out)]) == 1
    data = json.loads(out.read_text())
    assert data["format"] == "firstride-review" and data["format_version"] == 1
    assert data["verdict"] == "no-go"
    assert re.fullmatch(r"[0-9a-f]{64}", data["build"]["sha256"])
    assert data["build"]["fields"]["battery.cells_series"] == 10
    measured = [f["measured"] for f in data["findings"] if f["measured"]]
    assert measured and all(("value" in m and "unit" in m) or "text" in m for m in measured)
    assert any(f["severity"] == "stop" for f in data["findings"])
    assert data["figures"]


def test_html_is_one_inert_self_contained_page(tmp_path: Path) -> None:
    build = tmp_path / "b.toml"
    text = NO_GO.read_text().replace(
        'name = "Allotment Cargo Trike"', 'name = "<script>alert(1)</script><img src=x onerror=y>"'
    )
    build.write_text(text)
    out = tmp_path / "r.html"
    main(["review", str(build), "--format", "html", "-o", str(out)])
    page = out.read_text()
    assert page.startswith("<!DOCTYPE html>")
    assert "<script" not in page.lower()
    assert not re.search(r"<[^>]+\son\w+\s*=", page, re.IGNORECASE)  # no event attribute
    assert "&lt;script&gt;" in page
    assert not re.search(r"""(src|href)\s*=\s*["']?(https?:)?//""", page)  # nothing fetched
    assert "@media print" in page
    assert "<table>" in page


def test_since_reports_resolved_new_and_changed_fields(tmp_path: Path) -> None:
    previous = tmp_path / "prev.json"
    main(["review", str(NO_GO), "--format", "json", "-o", str(previous)])
    changed = tmp_path / "b.toml"
    # fit a hard case and a proper enclosure; the rest stays
    changed.write_text(
        NO_GO.read_text()
        .replace("battery_hard_case = false", "battery_hard_case = true")
        .replace('battery_ip = "IP21"', 'battery_ip = "IP54"')
    )
    out = tmp_path / "r.json"
    main(["review", str(changed), "--since", str(previous), "--format", "json", "-o", str(out)])
    changes = json.loads(out.read_text())["changes"]
    resolved = {(c["rule_id"], c["subject"]) for c in changes["resolved"]}
    assert ("enclosure.ingress", "battery housing") in resolved
    assert ("enclosure.ingress", "battery enclosure") in resolved
    fields = {c["field"]: (c["before"], c["after"]) for c in changes["fields"]}
    assert fields == {
        "enclosure.battery_hard_case": ("false", "true"),
        "enclosure.battery_ip": ("IP21", "IP54"),
    }
    md = tmp_path / "r.md"
    main(["review", str(changed), "--since", str(previous), "-o", str(md)])
    assert "## Changes since the previous review" in md.read_text()


def test_since_rejects_a_file_that_is_not_a_json_review(tmp_path: Path, capsys) -> None:
    bogus = tmp_path / "prev.json"
    bogus.write_text('{"format": "something else"}')
    assert main(["review", str(NO_GO), "--since", str(bogus)]) == 2
    assert "format" in capsys.readouterr().err
