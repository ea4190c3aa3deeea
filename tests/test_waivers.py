"""Waivers accept findings on the record without hiding them or the gaps."""

from __future__ import annotations

import datetime
from pathlib import Path

import pytest

from reviewer.cli import main
from reviewer.engine import review
from reviewer.findings import Finding, Severity, Source, Verdict
from reviewer.profile import parse_profile
from reviewer.rule import Rule
from reviewer.testing import make_build
from reviewer.waivers import Waiver, WaiverSet, load_waivers

from .conftest import SAMPLES

DAY = datetime.date(2026, 11, 30)


def _rule(severity: Severity) -> Rule:
    def check(build, profile):
        """Yields one finding of the given severity."""
        yield Finding(severity, "pin P5", "as given")

    return Rule(id="test.rule", title="t", check=check, sources=(Source.common_practice("x"),))


def _waiver(subject: str = "pin P5", rule: str = "test.rule") -> Waiver:
    return Waiver(rule=rule, subject=subject, justification="why", accepted_by="who", date=DAY)


def _profile(extra: str = "") -> object:
    return parse_profile(
        f'[profile]\nname = "t"\nmandatory_rules = ["test.rule"]\n{extra}', "p.toml"
    )


def _run(severity: Severity, waiver: Waiver, profile_extra: str = ""):
    waivers = WaiverSet("w.toml", "0" * 64, (waiver,))
    return review(make_build({}), _profile(profile_extra), [_rule(severity)], waivers=waivers)


def test_waived_fix_no_longer_counts_but_stays_in_the_review() -> None:
    result = _run(Severity.FIX, _waiver())
    assert result.verdict is Verdict.GO
    assert result.findings[0].waiver is not None
    assert result.findings[0].severity is Severity.FIX
    assert result.waiver_notes[0].applied


def test_stop_cannot_be_waived_by_default() -> None:
    result = _run(Severity.STOP, _waiver())
    assert result.verdict is Verdict.NO_GO
    assert "cannot be waived" in result.waiver_notes[0].note


def test_profile_may_allow_stop_waivers() -> None:
    result = _run(Severity.STOP, _waiver(), "[waivers]\nallow_stop = true\n")
    assert result.verdict is Verdict.GO


def test_unassessed_cannot_be_waived() -> None:
    result = _run(Severity.UNASSESSED, _waiver())
    assert result.verdict is Verdict.INCOMPLETE
    assert not result.waiver_notes[0].applied


@pytest.mark.parametrize(
    ("waiver", "note"),
    [
        (_waiver(subject="pin P9"), "unused"),
        (_waiver(rule="other.rule"), "no loaded rule"),
    ],
)
def test_unused_or_unknown_waiver_is_reported(waiver: Waiver, note: str) -> None:
    result = _run(Severity.FIX, waiver)
    assert result.verdict is Verdict.CONDITIONAL
    assert note in result.waiver_notes[0].note


def test_bad_waivers_file_is_one_line(tmp_path: Path, capsys) -> None:
    path = tmp_path / "w.toml"
    path.write_text(
        '[[waiver]]\nrule = "x.y"\nsubject = "s"\njustification = "j"\ndate = 2026-11-30\n'
    )
    code = main(["review", str(SAMPLES / "quayside-commuter.toml"), "--waivers", str(path)])
    err = capsys.readouterr().err.strip()
    assert code == 2
    # the missing field is placed at the line of its table, [[waiver]] on line 1
    assert err == f"firstride: {path}:1: waiver[0].accepted_by: this field is required"


def test_waivers_file_round_trip(tmp_path: Path) -> None:
    path = tmp_path / "w.toml"
    path.write_text(
        '[[waiver]]\nrule = "logic.pin-current"\nsubject = "pin P5"\njustification = "j"\n'
        'accepted_by = "a"\ndate = 2026-11-30\n'
    )
    loaded = load_waivers(path)
    assert loaded.waivers[0].rule_id == "logic.pin-current"
    assert len(loaded.fingerprint) == 64
