"""What a review prints on stderr: the verdict line in a pipe; counts and the first actions on a
terminal, coloured unless NO_COLOR (no-color.org) is set; nothing with --quiet."""

from __future__ import annotations

import io

import pytest

from reviewer.cli import main
from reviewer.session import review_file
from reviewer.terminal import colour_wanted, report, summary

from .conftest import ROOT

SAMPLE = ROOT / "sample_builds" / "allotment-cargo-trike.toml"


class Terminal(io.StringIO):
    def isatty(self) -> bool:
        return True


def test_a_pipe_gets_the_verdict_line_only() -> None:
    text = summary(review_file(SAMPLE), tty=False, colour=False)
    assert text == "firstride: verdict no-go\n"


def test_a_terminal_gets_counts_and_the_first_actions() -> None:
    text = summary(review_file(SAMPLE), tty=True, colour=False)
    lines = text.splitlines()
    assert lines[0].startswith("firstride: verdict no-go (stop ")
    assert lines[1].startswith("  1. STOP ")
    assert lines[-1].startswith("  ... ") and "more in the review" in lines[-1]
    assert "\033" not in text


def test_colour_follows_no_color(monkeypatch: pytest.MonkeyPatch) -> None:
    # no-color.org: any non-empty NO_COLOR turns colour off
    monkeypatch.delenv("NO_COLOR", raising=False)
    monkeypatch.setenv("TERM", "xterm")
    assert colour_wanted(Terminal())
    assert not colour_wanted(io.StringIO())  # not a terminal
    monkeypatch.setenv("NO_COLOR", "1")
    assert not colour_wanted(Terminal())
    stream = Terminal()
    report(review_file(SAMPLE), stream)
    assert "\033" not in stream.getvalue() and "1. STOP" in stream.getvalue()


def test_quiet_prints_nothing(tmp_path, capsys) -> None:
    out = tmp_path / "review.md"
    assert main(["review", "-q", str(SAMPLE), "-o", str(out)]) == 1
    assert capsys.readouterr().err == ""
    assert out.is_file()
