"""The Markdown review: well-formed tables, escaped build text, the required sections."""

from __future__ import annotations

import re
from pathlib import Path

import pytest
from markdown_it import MarkdownIt

from reviewer.loader import load_build, parse_build
from reviewer.report import markdown_text, render_markdown
from reviewer.session import open_session

from .conftest import SAMPLES

HOSTILE = "Evil | # *bold* <script>alert(1)</script> `tick` [link](x) _u_ \\ ~"


def _render(path: Path | None = None, raw: bytes | None = None) -> str:
    loaded = load_build(path) if raw is None else parse_build(raw, "hostile.toml")
    return render_markdown(open_session().review_loaded(loaded))


def _tables(text: str) -> list[list[list[str]]]:
    """Every table as rows of cell texts, parsed by markdown-it (CommonMark + GFM tables)."""
    tokens = MarkdownIt("commonmark", {"html": False}).enable("table").parse(text)
    tables, rows, row = [], [], None
    for token in tokens:
        if token.type == "table_open":
            rows = []
        elif token.type == "tr_open":
            row = []
        elif token.type == "inline" and row is not None:
            row.append(token.content)
        elif token.type == "tr_close":
            rows.append(row)
            row = None
        elif token.type == "table_close":
            tables.append(rows)
    return tables


@pytest.mark.parametrize("name", sorted(p.name for p in SAMPLES.glob("*.toml")))
def test_every_table_is_well_formed(name: str) -> None:
    text = _render(SAMPLES / name)
    expected_tables = sum(1 for line in text.splitlines() if line.startswith("|---"))
    tables = _tables(text)
    assert len(tables) == expected_tables
    for table in tables:
        widths = {len(row) for row in table}
        assert len(widths) == 1, table
        # every source line of a table has as many cells as the header: no stray pipes
    for line in text.splitlines():
        if line.startswith("|"):
            assert line.endswith("|")


def test_sections_present() -> None:
    text = _render(SAMPLES / "allotment-cargo-trike.toml")
    for heading in (
        "## What to do first",
        "## Not assessed",
        "## Derived figures",
        "## Assumptions and defaults used",
        "## Checked and within limits",
        "## References",
        "## Cautions",
        "## Sign-off",
    ):
        assert heading in text
    assert "Local regulations prevail" in text
    assert "Build fingerprint (SHA-256)" in text
    # never claim "safe"; "fail-safe" (control.fail-safe) names a trade term, not a verdict
    assert not re.search(r"(?<!fail-)\bsafe\b", text, re.IGNORECASE)


def test_hostile_build_text_cannot_break_tables_or_inject_html() -> None:
    base = (SAMPLES / "quayside-commuter.toml").read_text()
    hostile = base.replace('name = "Morgan"', f'name = "{_toml_escape(HOSTILE)}"').replace(
        'name = "Quayside Commuter"', f'name = "{_toml_escape(HOSTILE)}"'
    )
    text = _render(raw=hostile.encode())
    html = MarkdownIt("commonmark", {"html": True}).enable("table").render(text)
    assert "<script>" not in html
    assert "<em>bold</em>" not in html
    assert '<a href="x">' not in html
    for table in _tables(text):
        assert len({len(row) for row in table}) == 1
    # the heading holds the whole name on one line, not a second heading
    assert sum(1 for line in text.splitlines() if line.startswith("# ")) == 1


def _toml_escape(text: str) -> str:
    return text.replace("\\", "\\\\").replace('"', '\\"')


@pytest.mark.parametrize(
    ("raw", "escaped"),
    [
        ("a|b", "a\\|b"),
        ("<b>", "&lt;b&gt;"),
        ("line\nbreak", "line break"),
        ("# head", "\\# head"),
        ("plain 12 V", "plain 12 V"),
    ],
)
def test_markdown_text_escapes(raw: str, escaped: str) -> None:
    assert markdown_text(raw) == escaped
