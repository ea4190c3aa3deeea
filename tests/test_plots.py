"""The charts (reviewer.plots): their numbers against the road-load physics, their SVG against
itself (byte-identical renders, escaped build text) and matplotlib imported only when drawing."""

from __future__ import annotations

import itertools
import math
import os
import subprocess
import sys
import textwrap
import tomllib
import xml.etree.ElementTree as ET
from typing import Any

import pytest
from firstride_rules.speed.rider_class import RULE as SPEED_RULE

from reviewer import plots
from reviewer.engineering.roadload import Drive, DriveMotor
from reviewer.session import default_profile
from reviewer.testing import make_build, rule_outputs, variant
from reviewer.units import format_number

from .conftest import ROOT, SAMPLES

G = 9.80665  # m/s^2, CGPM standard gravity
RHO = 1.225  # kg/m^3, ISA sea-level air density
QUAYSIDE: dict[str, Any] = tomllib.loads(
    (SAMPLES / "quayside-commuter.toml").read_text(encoding="utf-8")
)
HOSTILE = "<script>alert(1)</script> & $x$"

# An invented hub drive, easy to follow by hand: 42 V, Kv 100 rpm/V, 0.1 ohm, 20 A limit,
# 5:1 onto a 200 mm wheel. Wheel force under the limit: 20 A x 9.5493/100 x 5 / 0.1 m = 95.5 N.
TEST_DRIVE = Drive(
    motors=(DriveMotor(kv_rpm_per_v=100.0, branch_resistance=0.1),),
    full_voltage=42.0,
    reduction=5.0,
    wheel_radius=0.1,
    rolling_resistance=0.01,
    drag_area=0.6,
    current_limit=20.0,
)


def _svg_texts(svg: str) -> list[str]:
    """Every text element's content, parsed as XML (which also proves the SVG well formed)."""
    root = ET.fromstring(svg)
    return ["".join(el.itertext()) for el in root.iter("{http://www.w3.org/2000/svg}text")]


def _run(code: str, **env: str) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-c", textwrap.dedent(code)],
        capture_output=True,
        text=True,
        cwd=ROOT,
        env={**os.environ, **env},
        timeout=120,
        check=False,
    )


# --- Numbers, no matplotlib needed -----------------------------------------------------------


def test_road_load_curve_meets_the_brief_check_value() -> None:
    # Domain brief section 3, check value (D): 100 kg, Crr 0.01, CdA 0.6 m^2, 25 km/h: 27.53 N.
    data = plots.operating_data_for(TEST_DRIVE, [("check", 100.0)])
    index = data.speeds_kmh.index(25.0)
    assert data.loads[0].force_n[index] == pytest.approx(27.53, abs=0.005)


def test_top_speed_is_where_drive_force_meets_road_load() -> None:
    # Brief section 3: top speed is the v where the drive's wheel force equals the road load
    # F = m g (Crr cos(theta) + sin(theta)) + 0.5 rho CdA v^2, written out here on its own.
    data = plots.operating_data_for(TEST_DRIVE, [("check", 100.0)], 4.0)
    force = plots.operating.full_throttle_force(TEST_DRIVE)
    for load in data.loads:
        v = load.top_speed_kmh / 3.6
        theta = math.atan(load.grade_percent / 100.0)
        by_hand = 100.0 * G * (0.01 * math.cos(theta) + math.sin(theta)) + 0.5 * RHO * 0.6 * v * v
        assert force(v) == pytest.approx(by_hand, rel=1e-6)
        assert load.top_force_n == pytest.approx(by_hand, rel=1e-6)


def test_operating_chart_top_speed_is_the_speed_rules() -> None:
    build, profile = make_build(QUAYSIDE), default_profile()
    _, figures, _ = rule_outputs(SPEED_RULE, build, profile)
    rule_kmh = next(f for f in figures if f.name == "top speed, rider 'Morgan'").value.magnitude
    data = plots.operating_data(build, profile)
    assert data is not None
    flat = next(load for load in data.loads if load.grade_percent == 0)
    assert flat.top_speed_kmh == pytest.approx(rule_kmh, rel=1e-9)
    assert [load.grade_percent for load in data.loads] == [0.0, 2.5]  # usage.steepest_grade
    pytest.importorskip("matplotlib")
    svg = plots.operating_svg(data)
    assert f"Morgan, flat: {format_number(rule_kmh)} km/h" in _svg_texts(svg)


def test_speed_against_grade_never_rises_and_stops_where_the_drive_cannot_hold() -> None:
    riders = [("light", 70.0), ("heavy", 140.0)]
    data = plots.grade_data_for(TEST_DRIVE, riders)  # no steepest grade: 0-15 %
    assert data.grades_percent[0] == 0 and data.grades_percent[-1] == 15.0
    for curve in data.curves:
        speeds = curve.speeds_kmh
        assert all(b <= a for a, b in itertools.pairwise(speeds))
    # The heaviest steady climb under the 20 A limit, from the road load alone (brief section
    # 3 at walking speed, drag nil): m g (Crr cos(theta) + sin(theta)) = 95.49 N.
    pull = 20.0 * 60 / (2 * math.pi * 100.0) * 5.0 / 0.1
    k = pull / (140.0 * G)
    theta = math.asin(k / math.hypot(1.0, 0.01)) - math.atan(0.01)
    limit_grade = 100.0 * math.tan(theta)  # 5.97 %
    heavy = data.curves[1]
    stall = heavy.first_stall(data.grades_percent)
    assert stall is not None and limit_grade <= stall < limit_grade + 15.0 / 60 + 1e-9
    below = [v for g, v in zip(data.grades_percent, heavy.speeds_kmh, strict=True) if g < stall]
    assert below and all(v > 0 for v in below)


def test_speed_against_grade_of_a_sample_starts_at_the_flat_top_speed() -> None:
    build, profile = make_build(QUAYSIDE), default_profile()
    grade, operating = plots.grade_data(build, profile), plots.operating_data(build, profile)
    assert grade is not None and operating is not None
    assert grade.grades_percent[-1] == 2.5 and grade.steepest_given == 2.5
    speeds = grade.curves[0].speeds_kmh
    assert speeds[0] == pytest.approx(operating.loads[0].top_speed_kmh, rel=1e-12)
    assert speeds[-1] == pytest.approx(operating.loads[1].top_speed_kmh, rel=1e-12)
    assert all(b <= a for a, b in itertools.pairwise(speeds))


def test_charts_of_a_build_without_the_drive_inputs_are_none() -> None:
    build = make_build(variant(QUAYSIDE, riders=[]))
    assert plots.operating_data(build, default_profile()) is None
    assert plots.grade_data(build, default_profile()) is None


def test_budget_helper_skips_unknown_ratings() -> None:
    data = variant(QUAYSIDE)
    data["connectors"][0].pop("current_rating")  # pack plug: rating not known
    data["wires"][1].pop("temperature_rating")  # pack negative: no ampacity without it
    items = plots.budget_items(make_build(data), default_profile())
    names = [item.name for item in items]
    assert "connector 'pack plug'" not in names and "wire 'pack negative'" not in names
    assert "wire 'pack positive'" in names and "fuse 'main fuse'" in names
    assert all(item.rating_a is not None for item in items)
    fuse = next(item for item in items if item.name == "fuse 'main fuse'")
    assert fuse.rating_a == 20.0  # the build's fuse rating, as given


def test_budget_of_the_sample_uses_the_rules_pack_demand() -> None:
    from firstride_rules._shared.demand import pack_demand

    build = make_build(QUAYSIDE)
    items = plots.budget_items(build, default_profile())
    pack = next(item for item in items if item.name == "pack (cells, continuous)")
    assert pack.carried_a == pack_demand(build).current
    assert pack.rating_a == pytest.approx(15.0 * 3)  # 15 A cells x 3 strings, as given


def test_ride_series_are_checked() -> None:
    with pytest.raises(ValueError, match="differ in length"):
        plots.RideSeries.of([0, 1], [20, 21], [29])
    with pytest.raises(ValueError, match="must not decrease"):
        plots.RideSeries.of([0, 2, 1], [20, 21, 22], [29, 29, 29])
    assert plots.RideSeries.of([0, 1, 2], [20, 25, 24], [29, 28, 28]).peak_temperature() == (
        1.0,
        25.0,
    )


# --- Import discipline ------------------------------------------------------------------------


def test_importing_the_package_does_not_import_matplotlib() -> None:
    result = _run(
        """
        import sys
        import reviewer.plots
        from reviewer.plots import operating_data
        print("matplotlib" in sys.modules, "matplotlib.pyplot" in sys.modules)
        """
    )
    assert result.returncode == 0, result.stderr
    assert result.stdout.split() == ["False", "False"]


def test_without_matplotlib_the_charts_name_the_extra() -> None:
    result = _run(
        """
        import sys
        sys.modules["matplotlib"] = None  # as if it were not installed
        from reviewer import plots
        assert not plots.available()
        try:
            plots.ride_svg([0, 1], [20, 21], [29, 28])
        except plots.PlotsUnavailable as error:
            print(error)
        """
    )
    assert result.returncode == 0, result.stderr
    assert "pip install 'firstride[plots]'" in result.stdout


# --- The SVG ----------------------------------------------------------------------------------


def _all_charts(riders: list[dict[str, Any]] | None = None) -> dict[str, str]:
    data = variant(QUAYSIDE) if riders is None else variant(QUAYSIDE, riders=riders)
    build, profile = make_build(data), default_profile()
    charts = {
        "operating": plots.operating_chart(build, profile),
        "grade": plots.grade_chart(build, profile),
        "budget": plots.budget_chart(build, profile),
        "ride": plots.ride_svg(
            [60.0 * i for i in range(31)],
            [30.0 + 60.0 * (1 - math.exp(-i / 8)) for i in range(31)],
            [29.0 - 0.1 * i for i in range(31)],
            insulation_limit_c=155.0,
            cutoff_v=21.0,
        ),
    }
    assert all(svg is not None for svg in charts.values())
    return {name: svg for name, svg in charts.items() if svg is not None}


def test_two_renders_are_byte_identical() -> None:
    pytest.importorskip("matplotlib")
    first, second = _all_charts(), _all_charts()
    assert first == second


def test_renders_in_other_processes_are_byte_identical() -> None:
    pytest.importorskip("matplotlib")
    here = plots.operating_chart(make_build(QUAYSIDE), default_profile())
    code = """
        import sys, tomllib
        from reviewer import plots
        from reviewer.session import default_profile
        from reviewer.testing import make_build
        with open("sample_builds/quayside-commuter.toml", "rb") as f:
            build = make_build(tomllib.load(f))
        sys.stdout.write(plots.operating_chart(build, default_profile()))
    """
    for seed in ("1", "2"):
        result = _run(code, PYTHONHASHSEED=seed)
        assert result.returncode == 0, result.stderr
        assert result.stdout == here


def test_svg_has_text_as_text_and_no_date_or_creator() -> None:
    pytest.importorskip("matplotlib")
    for name, svg in _all_charts().items():
        assert "<dc:date>" not in svg and "<dc:creator>" not in svg, name
        assert "Matplotlib" not in svg, name
        assert "<text" in svg and 'id="DejaVuSans-' not in svg, name  # no glyph outlines
        assert _svg_texts(svg), name
    texts = _svg_texts(_all_charts()["ride"])
    assert "insulation limit 155 °C" in texts
    assert "low-voltage cut-off 21 V" in texts


def test_build_text_is_escaped() -> None:
    pytest.importorskip("matplotlib")
    riders = [{"name": HOSTILE, "mass": "78 kg", "class": "adult"}]
    charts = _all_charts(riders)
    charts["budget"] = plots.budget_svg([(HOSTILE, 10.0, None), ("fuse", 25.0, 20.0)], HOSTILE)
    for name in ("operating", "grade", "budget"):
        svg = charts[name]
        assert "<script" not in svg, name
        assert "&lt;script&gt;" in svg, name
        assert any(HOSTILE in text for text in _svg_texts(svg)), name  # and $x$ is no mathtext


def test_budget_marks_a_part_over_its_rating_in_words() -> None:
    pytest.importorskip("matplotlib")
    svg = plots.budget_svg([("fuse", 25.0, 20.0), ("wire", 10.0, 30.0), ("plug", 10.0, None)])
    texts = _svg_texts(svg)
    assert "25 A of 20 A (125 %) OVER" in texts
    assert "10 A of 30 A (33.3 %)" in texts
    assert "10 A, rating not known" in texts
    with pytest.raises(ValueError):
        plots.budget_svg([])
    with pytest.raises(ValueError):
        plots.budget_svg([("fuse", math.nan, 20.0)])
