"""The SARIF form of a review, and where each field of a build file is written.

Outside references: the published SARIF 2.1.0 JSON schema (OASIS SARIF TC, vendored in
``tests/data/sarif-schema-2.1.0.json``, origin in ``tests/data/README.md``) for every sample's
SARIF log, and Python's own TOML parser (``tomllib``) for which field paths a file has.
"""

from __future__ import annotations

import json
import tomllib
from functools import cache
from pathlib import Path
from typing import Any

import jsonschema
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from reviewer.cli import main
from reviewer.export import flatten_fields
from reviewer.findings import Severity
from reviewer.sarif import LEVELS, artifact_uri, render_sarif
from reviewer.session import review_file
from reviewer.toml_positions import field_positions, locate

from .conftest import ROOT, SAMPLES

SCHEMA = Path(__file__).parent / "data" / "sarif-schema-2.1.0.json"
SAMPLE_FILES = sorted(SAMPLES.glob("*.toml"))
NO_GO = SAMPLES / "allotment-cargo-trike.toml"
GO = SAMPLES / "quayside-commuter.toml"
WAIVERS = SAMPLES / "records" / "allotment-cargo-trike-waivers.toml"

HAND_WRITTEN = '''\
# a comment with [brackets] and key = "value" in it
title = "a # that is no comment"   # but this is
[battery]  # a header with a comment
cells_series = 7
bms = { charge_current = "5 A", "peak current" = "40 A", limits = { cut = true } }
notes = """
[not_a_table]
cells_parallel = 3
"""
raw = \'\'\'
[[riders]]
\'\'\'
pack.  "side a" .cells = 4
[[riders]]
name = "Ana"
mass = "70 kg"

[[riders]]
name = "Ben"
[riders.helmet]
size = "M"

[[motors]]
name = "front"
[[motors]]
name = "rear"
[motors.cooling]
fan = true
wires = [
  { name = "w0" },  # a comment inside an array ]
  { name = "w1", gauge = "12 AWG" },
]
pins = ["P1", "P2"]
when = 1979-05-27 07:32:00Z
[ "odd key" . inner ]
x = 1
'''


@cache
def schema() -> dict[str, Any]:
    return json.loads(SCHEMA.read_text(encoding="utf-8"))


def sarif_of(path: Path, **options: Any) -> tuple[dict[str, Any], Any]:
    result = review_file(path, **options)
    text = render_sarif(result, path.read_text(encoding="utf-8"), result.build_path)
    return json.loads(text), result


def where(text: str, needle: str, after: str = "") -> tuple[int, int]:
    """Line and column (1-based) of ``needle`` in ``text``, searched after ``after``."""
    start = text.index(after) if after else 0
    offset = text.index(needle, start)
    line = text.count("\n", 0, offset) + 1
    return line, offset - (text.rfind("\n", 0, offset) + 1) + 1


# --- positions -------------------------------------------------------------------------------


def test_every_field_tomllib_reads_has_a_position() -> None:
    found = field_positions(HAND_WRITTEN)
    fields = flatten_fields(tomllib.loads(HAND_WRITTEN))
    assert set(fields) <= set(found), set(fields) - set(found)
    assert "battery.not_a_table" not in found and "not_a_table" not in found
    assert "battery.cells_parallel" not in found  # inside a multi-line string
    assert not any(path.startswith("riders[3]") for path in found)  # a [[riders]] in a string


@pytest.mark.parametrize(
    ("path", "needle", "after"),
    [
        ("title", "title", ""),
        ("battery", "battery]", ""),
        ("battery.cells_series", "cells_series", ""),
        ("battery.bms", "bms", ""),
        ("battery.bms.charge_current", "charge_current", ""),
        ("battery.bms.peak current", '"peak current"', ""),
        ("battery.bms.limits.cut", "cut", "limits"),
        ("battery.raw", "raw", ""),
        ("battery.pack", "pack.", ""),
        ("battery.pack.side a.cells", "cells =", "side a"),
        ("riders[0]", "riders]]", "pack."),
        ("riders[0].mass", "mass", ""),
        ("riders[1]", "riders]]", "Ana"),
        ("riders[1].name", "name", "Ana"),
        ("riders[1].helmet", "helmet", ""),
        ("riders[1].helmet.size", "size", ""),
        ("motors[0].name", "name", "[[motors]]"),
        ("motors[1]", "motors]]", "front"),
        ("motors[1].cooling", "cooling", ""),
        ("motors[1].cooling.fan", "fan", ""),
        ("motors[1].cooling.wires[1]", '{ name = "w1"', ""),
        ("motors[1].cooling.wires[1].gauge", "gauge", ""),
        ("motors[1].cooling.pins[1]", '"P2"', ""),
        ("motors[1].cooling.when", "when", ""),
        ("odd key.inner", "inner", '"odd key"'),
        ("odd key.inner.x", "x = 1", ""),
    ],
)
def test_a_fields_position_is_its_key(path: str, needle: str, after: str) -> None:
    assert field_positions(HAND_WRITTEN)[path] == where(HAND_WRITTEN, needle, after)


def test_an_absent_field_is_its_nearest_written_table() -> None:
    found = field_positions(HAND_WRITTEN)
    assert locate(found, "riders[1].helmet.colour") == found["riders[1].helmet"]
    assert locate(found, "motors[1].kv") == found["motors[1]"]
    assert locate(found, "riders[7].mass") == found["riders"]
    assert locate(found, "charger.current") == (1, 1)
    assert locate({}, "battery") == (1, 1)


def test_line_endings_and_a_byte_order_mark_change_nothing() -> None:
    plain = field_positions(HAND_WRITTEN)
    assert field_positions(HAND_WRITTEN.replace("\n", "\r\n")) == plain
    assert set(field_positions("\ufeff" + HAND_WRITTEN)) == set(plain)


@pytest.mark.parametrize(
    "text",
    [
        'a = "unclosed\n[b]\nc = 1\n',
        'a = """never closed\n' + '""x' * 200,
        "a = '''never closed\n" + "''x" * 200,
        "a = " + "[" * 5000,
        "a = " + "{ b = " * 3000,
        "[[a.b\n[c]\nd = 1\n",
        "= 1\n.a = 2\na. = 3\n[]\n[[]]\n",
        "\x00\x01\ufffd = \udcff\n",
    ],
)
def test_odd_text_never_raises(text: str) -> None:
    field_positions(text)


def test_after_an_unreadable_header_keys_are_not_misplaced() -> None:
    found = field_positions("[a]\nx = 1\n[b\ny = 2\n[c]\nz = 3\n")
    assert "a.x" in found and "c.z" in found
    assert "a.y" not in found and "y" not in found


@settings(max_examples=200, deadline=None)
@given(st.text(alphabet=st.sampled_from(list("ab=.[]{}\"'#,\n \t\\")), max_size=200))
def test_any_text_gives_positions_inside_it(text: str) -> None:
    lines = text.split("\n")
    for line, column in field_positions(text).values():
        assert 1 <= line <= len(lines)
        assert 1 <= column <= len(lines[line - 1]) + 1


@pytest.mark.parametrize("sample", SAMPLE_FILES, ids=lambda p: p.stem)
def test_every_sample_field_has_a_position(sample: Path) -> None:
    text = sample.read_text(encoding="utf-8")
    found = field_positions(text)
    assert set(flatten_fields(tomllib.loads(text))) <= set(found)
    assert found["vehicle.name"] == where(text, "name", "[vehicle]")


# --- the SARIF log ---------------------------------------------------------------------------


@pytest.mark.parametrize("sample", SAMPLE_FILES, ids=lambda p: p.stem)
def test_every_sample_validates_against_the_sarif_2_1_0_schema(sample: Path) -> None:
    log, _ = sarif_of(sample)
    jsonschema.Draft7Validator(schema()).validate(log)  # the published SARIF 2.1.0 schema


def test_a_waived_review_validates_and_carries_suppressions() -> None:
    log, result = sarif_of(NO_GO, waivers=WAIVERS)
    jsonschema.Draft7Validator(schema()).validate(log)  # the published SARIF 2.1.0 schema
    waived = [f for f in result.findings if f.waiver is not None]
    suppressed = [r for r in log["runs"][0]["results"] if "suppressions" in r]
    assert waived and len(suppressed) == len(waived)
    for finding, entry in zip(waived, suppressed, strict=True):
        assert entry["properties"]["subject"] == finding.subject
        (suppression,) = entry["suppressions"]
        assert suppression["kind"] == "external"
        assert finding.waiver.justification in suppression["justification"]


@pytest.mark.parametrize("sample", SAMPLE_FILES, ids=lambda p: p.stem)
def test_one_result_per_finding_that_is_not_a_pass(sample: Path) -> None:
    log, result = sarif_of(sample)
    results = log["runs"][0]["results"]
    counted = [f for f in result.findings if f.severity is not Severity.PASS]
    assert len(results) == len(counted)
    for finding, entry in zip(counted, results, strict=True):
        assert entry["ruleId"] == finding.rule_id
        assert entry["properties"]["subject"] == finding.subject
        assert entry["properties"]["severity"] == finding.severity.value
        assert entry["level"] == LEVELS[finding.severity]
        assert finding.subject in entry["message"]["text"]
        assert finding.rationale in entry["message"]["text"]
        if finding.remedy:
            assert finding.remedy in entry["message"]["text"]
    passes = {(f.rule_id, f.subject) for f in result.findings if f.severity is Severity.PASS}
    assert not passes & {(r["ruleId"], r["properties"]["subject"]) for r in results}


def test_levels_follow_severities() -> None:
    assert LEVELS == {
        Severity.STOP: "error",
        Severity.FIX: "error",
        Severity.ADVISE: "warning",
        Severity.UNASSESSED: "note",
    }
    log, _ = sarif_of(NO_GO)
    seen = {(r["properties"]["severity"], r["level"]) for r in log["runs"][0]["results"]}
    assert ("stop", "error") in seen and ("unassessed", "note") in seen
    assert all(LEVELS[Severity(severity)] == level for severity, level in seen)


def test_rules_are_described_with_their_documentation() -> None:
    log, result = sarif_of(GO)
    driver = log["runs"][0]["tool"]["driver"]
    assert driver["name"] == "firstride" and driver["version"] == result.tool_version
    ids = [rule["id"] for rule in driver["rules"]]
    assert ids == sorted({rule.id for rule in result.rules})
    by_id = {rule.id: rule for rule in result.rules}
    for described in driver["rules"]:
        rule = by_id[described["id"]]
        assert described["shortDescription"]["text"] == rule.title
        assert described["help"]["text"] == rule.doc.strip()
        assert described["defaultConfiguration"]["level"] in ("error", "warning", "note")
    for entry in log["runs"][0]["results"]:
        assert driver["rules"][entry["ruleIndex"]]["id"] == entry["ruleId"]


def region_of(log: dict[str, Any], rule_id: str, subject: str) -> tuple[int, int]:
    for entry in log["runs"][0]["results"]:
        if entry["ruleId"] == rule_id and entry["properties"]["subject"] == subject:
            region = entry["locations"][0]["physicalLocation"]["region"]
            return region["startLine"], region["startColumn"]
    raise AssertionError(f"no result for {rule_id} {subject}")


def test_a_rider_finding_points_at_that_riders_table() -> None:
    text = NO_GO.read_text(encoding="utf-8")
    log, _ = sarif_of(NO_GO)
    header = text.rindex("[[riders]]", 0, text.index('name = "Pip (niece)"'))
    line, column = where(text[header:], "riders")  # within the header
    expected = (text.count("\n", 0, header) + line, column)
    assert region_of(log, "speed.rider-class", "rider 'Pip (niece)'") == expected


def test_a_wire_finding_points_at_that_wires_table() -> None:
    text = NO_GO.read_text(encoding="utf-8")
    log, _ = sarif_of(NO_GO)
    header = text.rindex("[[wires]]", 0, text.index('name = "motor leads"'))
    assert region_of(log, "wiring.stall-current", "wire 'motor leads'") == (
        text.count("\n", 0, header) + 1,
        3,
    )


def test_a_missing_field_points_at_its_nearest_table() -> None:
    text = NO_GO.read_text(encoding="utf-8")
    log, result = sarif_of(NO_GO)
    (finding,) = [
        f for f in result.findings if f.missing and f.missing[0] == "wheels[0].speed_rating"
    ]
    assert region_of(log, finding.rule_id, finding.subject) == where(text, "wheels]]")


def test_a_subject_without_a_named_part_points_at_the_field_it_names() -> None:
    text = NO_GO.read_text(encoding="utf-8")
    log, _ = sarif_of(NO_GO)
    assert region_of(log, "battery.protection", "low-voltage cut-off") == where(
        text, "low_voltage_cutoff"
    )
    assert region_of(log, "battery.protection", "battery management system") == where(
        text, "bms", "[battery]"
    )


def test_the_artifact_is_the_build_file_as_given() -> None:
    log, result = sarif_of(NO_GO)
    (artifact,) = log["runs"][0]["artifacts"]
    assert artifact["location"]["uri"] == "file://" + result.build_path  # given absolute
    assert artifact["hashes"]["sha-256"] == result.build_fingerprint
    assert artifact_uri("builds/my board.toml") == "builds/my%20board.toml"
    assert artifact_uri("/srv/club/a.toml") == "file:///srv/club/a.toml"


def test_the_log_is_deterministic() -> None:
    result = review_file(NO_GO)
    text = NO_GO.read_text(encoding="utf-8")
    assert render_sarif(result, text, result.build_path) == render_sarif(
        result, text, result.build_path
    )


# --- the command line ------------------------------------------------------------------------


@pytest.mark.parametrize("sample", [GO, NO_GO], ids=lambda p: p.stem)
def test_exit_status_is_the_markdown_reviews(
    sample: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.chdir(ROOT)  # the build named relative, as in CI
    given = sample.relative_to(ROOT).as_posix()
    markdown = main(["review", given, "-o", str(tmp_path / "r.md")])
    sarif = main(["review", given, "--format", "sarif", "-o", str(tmp_path / "r.sarif")])
    assert sarif == markdown
    log = json.loads((tmp_path / "r.sarif").read_text(encoding="utf-8"))
    jsonschema.Draft7Validator(schema()).validate(log)  # the published SARIF 2.1.0 schema
    assert log["runs"][0]["artifacts"][0]["location"]["uri"] == given


def test_a_fleet_in_sarif_is_a_usage_error(tmp_path: Path, capsys: pytest.CaptureFixture) -> None:
    status = main(["review", str(GO), str(NO_GO), "--format", "sarif", "-o", str(tmp_path / "o")])
    assert status == 2
    assert "sarif is for one build file" in capsys.readouterr().err
    assert not (tmp_path / "o").exists()
