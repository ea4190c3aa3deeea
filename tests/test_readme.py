"""The README stays honest: its review excerpt is what the tool prints today, and its quick start
holds exactly two commands, one of which is the test command CI runs."""

from __future__ import annotations

import re
from pathlib import Path

from reviewer.cli import main

from .conftest import ROOT

README = (ROOT / "README.md").read_text(encoding="utf-8")


def test_review_excerpt_matches_a_real_review(tmp_path: Path, monkeypatch) -> None:
    excerpt = re.search(r"<!-- excerpt:start -->\n```markdown\n(.*?)```", README, re.S)
    assert excerpt
    monkeypatch.chdir(ROOT)
    output = tmp_path / "review.md"
    main(["review", "sample_builds/allotment-cargo-trike.toml", "-o", str(output)])
    review = output.read_text(encoding="utf-8").splitlines()
    for line in excerpt.group(1).splitlines():
        if line and line != "...":
            assert line in review, f"README excerpt line not in today's review: {line}"


def test_quick_start_has_two_commands_and_ci_runs_the_test_command() -> None:
    quick = re.search(r"## Quick start\n.*?```sh\n(.*?)```", README, re.S)
    assert quick
    commands = [line for line in quick.group(1).splitlines() if line.strip()]
    assert len(commands) == 2
    assert "pytest" in commands[1]
    test_command = commands[1].split("&& ")[-1]
    ci = (ROOT / ".ci" / "run").read_text(encoding="utf-8")
    assert test_command in ci
