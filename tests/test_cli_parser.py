"""The command line builds only the parser it needs: the invoked verb's, or every verb's for
help and for a word that is no verb."""

from __future__ import annotations

import subprocess
import sys

import pytest

from reviewer import cli
from reviewer.commands import VERBS


def test_a_verb_gets_only_its_own_parser() -> None:
    _, modules = cli._parser(["review", "build.toml", "--format", "json"])
    assert list(modules) == ["review"]
    _, modules = cli._parser(["--version"])
    assert list(modules) == list(VERBS)


def test_help_lists_every_verb(capsys: pytest.CaptureFixture[str]) -> None:
    with pytest.raises(SystemExit):
        cli.main(["--help"])
    shown = capsys.readouterr()
    for verb in VERBS:
        assert verb in shown.out + shown.err


def test_a_mistyped_verb_is_a_usage_error_naming_the_verbs() -> None:
    done = subprocess.run(
        [sys.executable, "-m", "reviewer", "revew", "a.toml"],
        capture_output=True,
        text=True,
        check=False,
    )
    assert done.returncode == 2
    assert "invalid choice: 'revew'" in done.stderr and "sweep" in done.stderr
    assert done.stderr.count("\n") == 1  # one line, no traceback
