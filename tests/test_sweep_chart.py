"""The sweep's chart: every point drawn at its values with its outcome, by shape as well as
colour, byte-identical between runs, written only where ``--plots`` asks and linked."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

pytest.importorskip("matplotlib")

from reviewer.cli import main
from reviewer.plots.sweep import OUTCOMES, outcome_of, sweep_marks, sweep_svg
from reviewer.sweep import parse_axis, run_sweep

from .test_sweep import DATA, SAMPLE

AXIS = "controller.motor_current_limit=10 A:16 A:2 A"


def test_each_outcome_has_its_own_marker_shape() -> None:
    # WCAG 2.1, success criterion 1.4.1 (use of colour): colour is not the only visual means
    shapes = [shape for shape, _, _ in OUTCOMES.values()]
    assert len(set(shapes)) == len(shapes)
    assert outcome_of("go", "") == "go"
    assert outcome_of("no-go", "stop") == "stop"
    assert outcome_of("input error", "") == "input error"
    with pytest.raises(ValueError, match="no outcome"):
        outcome_of("no-go", "severe")


def test_the_marks_are_the_points_at_their_numbers() -> None:
    axis = parse_axis(AXIS, DATA)
    points = run_sweep(DATA, [axis])
    marks = sweep_marks([axis], points)
    assert [m.numbers for m in marks] == [(10.0,), (12.0,), (14.0,), (16.0,)]
    assert [m.outcome for m in marks][1] == "go"  # 12 A: the sample as built
    assert all(m.rule == p.binding for m, p in zip(marks, points, strict=True))
    svg = sweep_svg([axis], points)
    assert svg == sweep_svg([axis], points)  # deterministic
    for rule in {p.binding for p in points if p.binding}:
        assert rule in svg  # each binding rule names its row, as text


def test_two_fields_draw_the_grid_and_a_gauge_axis_says_which_way_it_runs() -> None:
    axes = [parse_axis(AXIS, DATA), parse_axis("wires[0].gauge=16 AWG:10 AWG:2", DATA)]
    points = run_sweep(DATA, axes)
    assert len(sweep_marks(axes, points)) == 4 * 4
    assert "a larger number is a thinner wire" in sweep_svg(axes, points)


def test_plots_writes_the_chart_and_both_outputs_link_it(tmp_path: Path) -> None:
    charts = tmp_path / "charts"
    out = tmp_path / "sweep.md"
    args = ["sweep", str(SAMPLE), "--vary", AXIS, "--plots", str(charts), "-o", str(out)]
    assert main(args) == 0
    assert (charts / "sweep.svg").read_text(encoding="utf-8").lstrip().startswith("<?xml")
    assert "(charts/sweep.svg)" in out.read_text(encoding="utf-8")
    data = tmp_path / "sweep.json"
    assert main([*args[:-1], str(data), "--format", "json"]) == 0
    assert json.loads(data.read_text(encoding="utf-8"))["chart"] == "charts/sweep.svg"
    assert main(["sweep", str(SAMPLE), "--vary", AXIS, "-o", str(out)]) == 0
    assert "sweep.svg" not in out.read_text(encoding="utf-8")


def test_plots_without_matplotlib_is_a_usage_error_before_any_point(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]
) -> None:
    import reviewer.plots
    import reviewer.sweep

    monkeypatch.setattr(reviewer.plots, "available", lambda: False)
    monkeypatch.setattr(reviewer.sweep, "run_sweep", lambda *a, **k: pytest.fail("swept"))
    args = ["sweep", str(SAMPLE), "--vary", AXIS, "--plots", str(tmp_path / "c")]
    assert main(args) == 2
    assert "charts need matplotlib" in capsys.readouterr().err
    assert not (tmp_path / "c").exists()


@pytest.mark.parametrize("verb", ["sweep", "review"])
def test_plots_onto_a_file_is_one_line_and_exit_2(
    verb: str, tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    taken = tmp_path / "taken"
    taken.write_text("not a folder", encoding="utf-8")
    extra = ["--vary", AXIS] if verb == "sweep" else []
    out = tmp_path / "out.md"
    assert main([verb, str(SAMPLE), *extra, "--plots", str(taken), "-o", str(out)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "a folder for the chart" in err[0] and "this is a file" in err[0]
    assert taken.read_text(encoding="utf-8") == "not a folder" and not out.exists()


def test_the_sweep_never_writes_onto_its_build(tmp_path: Path) -> None:
    build = tmp_path / "b.toml"
    build.write_bytes(SAMPLE.read_bytes())
    assert main(["sweep", str(build), "--vary", AXIS, "-o", str(build)]) == 2
    assert build.read_bytes() == SAMPLE.read_bytes()
