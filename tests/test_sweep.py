"""The what-if sweep: every point agrees with a full review of the same build file."""

from __future__ import annotations

import json
import re
import tomllib
from pathlib import Path

import pytest

from reviewer.cli import main
from reviewer.errors import InputError
from reviewer.findings import Severity
from reviewer.session import review_file
from reviewer.sweep import envelope, parse_axis, parse_path, run_sweep

from .conftest import SAMPLES

SAMPLE = SAMPLES / "quayside-commuter.toml"
TEXT = SAMPLE.read_text(encoding="utf-8")
DATA = tomllib.loads(TEXT)
LIMIT_LINE = re.compile(r'^motor_current_limit = "[^"]*"$', re.MULTILINE)


def _full_review(tmp_path: Path, limit: str):
    """The build file itself with the field edited, reviewed from the command line's path."""
    assert LIMIT_LINE.search(TEXT)
    path = tmp_path / f"variant-{limit.replace(' ', '')}.toml"
    path.write_text(LIMIT_LINE.sub(f'motor_current_limit = "{limit}"', TEXT), encoding="utf-8")
    return review_file(path)


def _binding(result) -> str:
    for f in result.findings:
        if f.severity is not Severity.PASS and not (
            result.verdict.value == "go" and f.severity is Severity.ADVISE
        ):
            return f.rule_id
    return ""


def test_each_point_is_the_full_review_of_that_variant(tmp_path: Path) -> None:
    axis = parse_axis("controller.motor_current_limit=4 A:40 A:6 A", DATA)
    points = run_sweep(DATA, [axis])
    assert [p.values[0] for p in points] == ["4 A", "10 A", "16 A", "22 A", "28 A", "34 A", "40 A"]
    for point in points:
        full = _full_review(tmp_path, point.values[0])
        assert point.verdict == full.verdict.value, point
        assert point.binding == _binding(full), point


def test_the_envelope_edges_match_full_reviews(tmp_path: Path) -> None:
    axis = parse_axis("controller.motor_current_limit=6 A:20 A:1 A", DATA)
    points = run_sweep(DATA, [axis])
    (item,) = envelope([axis], points)
    assert item["passing"], "the sample's own 12 A lies in the range and reviews go"
    low, high = item["passing"][0]
    values = list(axis.values)
    assert _full_review(tmp_path, low).verdict.value == "go"
    assert _full_review(tmp_path, high).verdict.value == "go"
    below, above = values.index(low) - 1, values.index(high) + 1
    if below >= 0:
        assert _full_review(tmp_path, values[below]).verdict.value != "go"
    if above < len(values):
        assert _full_review(tmp_path, values[above]).verdict.value != "go"


def test_two_fields_make_a_grid_and_jobs_give_the_same_points() -> None:
    axes = [
        parse_axis("controller.motor_current_limit=8 A:16 A:4 A", DATA),
        parse_axis("wires[0].gauge=20 AWG:14 AWG:2", DATA),
    ]
    assert axes[1].values == ("20 AWG", "18 AWG", "16 AWG", "14 AWG")
    alone = run_sweep(DATA, axes)
    assert len(alone) == 12
    assert run_sweep(DATA, axes, jobs=2) == alone  # under 64 points: the same path, in order


def test_a_count_steps_by_one_and_an_invalid_variant_is_an_input_error() -> None:
    axis = parse_axis("battery.cells_series=0:2", DATA)
    assert axis.values == (0, 1, 2)
    points = run_sweep(DATA, [axis])
    assert points[0].verdict == "input error" and "cells_series" in points[0].detail
    assert not points[0].passes  # never a pass


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("controller.current_limit", "FIELD=START:STOP"),
        ("controller.motor_current_limit=10 A", "START:STOP"),
        ("controller.motor_current_limit=10 A:20 V", "the same unit"),
        ("controller.motor_current_limit=20 A:10 A:2 A", "moves from START towards STOP"),
        ("controller.motor_current_limit=1 A:1000000 A:0.001 A", "at most"),
        ("battery.cells_series=5:9:0.5", "whole numbers"),
        ("wires[0].gauge=20 AWG:10 AWG:0", "gauge STEP"),
        ("1bad.path=1:2", "a field path"),
    ],
)
def test_bad_ranges_are_one_line_input_errors(text: str, expected: str) -> None:
    with pytest.raises(InputError, match=re.escape(expected)):
        parse_axis(text, DATA)


def test_paths_parse_with_indexes() -> None:
    assert parse_path("motors[0].cooling.fan") == ("motors", 0, "cooling", "fan")


def test_the_command_writes_json_for_scripts(tmp_path: Path, capsys) -> None:
    out = tmp_path / "sweep.json"
    status = main(
        [
            "sweep",
            str(SAMPLE),
            "--vary",
            "controller.motor_current_limit=10 A:14 A:2 A",
            "--format",
            "json",
            "-o",
            str(out),
        ]
    )
    data = json.loads(out.read_text(encoding="utf-8"))
    assert status == 0 and data["format"] == "firstride-sweep"
    assert [p["verdict"] for p in data["points"]][1] == "go"  # 12 A, the sample as built
    assert "points go" in capsys.readouterr().err


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("controler.motor_current_limit=1 A:2 A", "did you mean 'controller'?"),
        ("controller.motor_curent_limit=1 A:2 A", "did you mean 'motor_current_limit'?"),
    ],
)
def test_a_misspelt_field_is_one_input_error_before_any_point(text: str, expected: str) -> None:
    with pytest.raises(InputError) as caught:
        parse_axis(text, DATA)
    assert caught.value.field == text.split("=")[0] and expected in caught.value.expected
    # a pack's own table is free-form here: its pack's model checks it in the review
    assert parse_axis("extensions.club.deck_height=80 mm:90 mm:10 mm", DATA).field.startswith(
        "extensions."
    )
