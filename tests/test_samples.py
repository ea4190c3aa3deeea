"""The shipped samples give go / no-go / incomplete with the right exit codes, deterministically."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

from reviewer.cli import main
from reviewer.findings import Severity

from .conftest import SAMPLES

EXPECTED = {
    "quayside-commuter.toml": ("go", 0),
    "allotment-cargo-trike.toml": ("no-go", 1),
    "unfinished-yard-kart.toml": ("incomplete", 1),
    "saltmarsh-hub-scooter.toml": ("go", 0),  # brushless hub motor, sealed controller
    "ridgeback-belt-board.toml": ("no-go", 1),  # phase leads and cooling (issue 10)
}


@pytest.mark.parametrize("name", sorted(EXPECTED))
def test_sample_verdict_and_exit_code(name: str, tmp_path: Path, capsys) -> None:
    verdict, code = EXPECTED[name]
    output = tmp_path / "review.md"
    assert main(["review", str(SAMPLES / name), "-o", str(output)]) == code
    assert f"verdict {verdict}" in capsys.readouterr().err
    assert f"**Verdict: {verdict.upper()}**" in output.read_text()


def test_no_go_sample_has_stops_from_at_least_three_core_rules() -> None:
    from reviewer.session import review_file

    result = review_file(SAMPLES / "allotment-cargo-trike.toml")
    core = {
        "wiring.stall-current",
        "motor.cooling",
        "speed.rider-class",
        "enclosure.ingress",
        "logic.pin-current",
    }
    stopping = {f.rule_id for f in result.findings if f.severity is Severity.STOP}
    assert len(stopping & core) >= 3, stopping


def test_review_is_byte_for_byte_deterministic(tmp_path: Path) -> None:
    sample = SAMPLES / "allotment-cargo-trike.toml"
    first, second = tmp_path / "a.md", tmp_path / "b.md"
    main(["review", str(sample), "-o", str(first)])
    main(["review", str(sample), "-o", str(second)])
    assert first.read_bytes() == second.read_bytes()


def test_fail_on_threshold(tmp_path: Path) -> None:
    go = str(SAMPLES / "quayside-commuter.toml")
    incomplete = str(SAMPLES / "unfinished-yard-kart.toml")
    assert main(["review", go, "--fail-on", "stop", "-o", str(tmp_path / "x.md")]) == 0
    # an incomplete review always fails, whatever the threshold
    assert main(["review", incomplete, "--fail-on", "stop", "-o", str(tmp_path / "y.md")]) == 1


def test_module_entry_point_runs_a_review() -> None:
    done = subprocess.run(
        [sys.executable, "-m", "reviewer", "review", str(SAMPLES / "quayside-commuter.toml")],
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert done.returncode == 0, done.stderr
    assert done.stdout.startswith("# Pre-ride design review: Quayside Commuter")


def test_sample_waivers_and_history_show_in_the_review(tmp_path: Path) -> None:
    output = tmp_path / "review.md"
    code = main(
        [
            "review",
            str(SAMPLES / "allotment-cargo-trike.toml"),
            "--waivers",
            str(SAMPLES / "records" / "allotment-cargo-trike-waivers.toml"),
            "--since",
            str(SAMPLES / "records" / "allotment-cargo-trike-rev0.json"),
            "-o",
            str(output),
        ]
    )
    text = output.read_text()
    assert code == 1
    assert "## Changes since the previous review" in text
    assert "| battery.cells\\_series | 12 | 10 |" in text
    assert "## Waivers" in text
    assert "| applied |" in text
    assert "a stop finding cannot be waived under this profile" in text


def test_belt_board_sample_fails_on_its_phase_leads_and_its_cooling() -> None:
    from reviewer.findings import Severity
    from reviewer.session import review_file

    result = review_file(SAMPLES / "ridgeback-belt-board.toml")
    bad = {
        (f.rule_id, f.subject)
        for f in result.findings
        if f.severity in (Severity.STOP, Severity.FIX)
    }
    assert any(rule == "wiring.stall-current" and "phase" in subject for rule, subject in bad)
    assert any(rule == "motor.cooling" for rule, _ in bad)


def test_no_brushless_sample_is_asked_for_a_freewheel_diode() -> None:
    from reviewer.session import review_file

    for name in ("saltmarsh-hub-scooter.toml", "ridgeback-belt-board.toml"):
        result = review_file(SAMPLES / name)
        for finding in result.findings:
            text = f"{finding.rationale} {finding.remedy or ''}".lower()
            assert "fit a freewheel diode" not in text and "freewheel diode across" not in text
