"""Charts in the review: the HTML page embeds the operating chart and speed against grade (and
the ride); --plots DIR writes them as files the Markdown review links; the same review twice
gives the same bytes, so a signed HTML review is reproducible."""

from __future__ import annotations

from pathlib import Path

import pytest

from reviewer.cli import main
from reviewer.formats import render_review
from reviewer.session import review_file

from .conftest import ROOT

pytest.importorskip("matplotlib")
SAMPLE = ROOT / "sample_builds" / "saltmarsh-hub-scooter.toml"


def test_the_html_review_embeds_its_charts_reproducibly() -> None:
    html = render_review(review_file(SAMPLE), "html")
    assert "<h2>Charts</h2>" in html
    for title in ("Drive force and road load against speed", "Steady speed against grade"):
        assert f"<figcaption>{title}</figcaption>" in html
    assert html.count("<svg") >= 3 and "<?xml" not in html and "<!DOCTYPE svg" not in html
    assert html.index("<h2>Charts</h2>") < html.index("<h2>Assumptions and defaults used</h2>")
    assert render_review(review_file(SAMPLE), "html") == html


def test_plots_dir_writes_the_files_the_markdown_links(tmp_path: Path) -> None:
    out = tmp_path / "reviews" / "review.md"
    out.parent.mkdir()
    charts = tmp_path / "charts"
    assert main(["review", str(SAMPLE), "-o", str(out), "--plots", str(charts), "-q"]) == 0
    text = out.read_text(encoding="utf-8")
    assert "## Charts" in text
    for name in ("operating.svg", "grade.svg"):
        assert (charts / name).read_text(encoding="utf-8").lstrip().startswith("<?xml")
        assert f"](../charts/{name})" in text
    plain = tmp_path / "plain.md"
    main(["review", str(SAMPLE), "-o", str(plain), "-q"])
    assert "## Charts" not in plain.read_text(encoding="utf-8")
