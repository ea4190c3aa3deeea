"""control.fail-safe: unintended start at power-up, a broken throttle wire, a remote's lost link
and the kill switch."""

from __future__ import annotations

from typing import Any

import pytest
from firstride_rules.control.fail_safe import RULE

from reviewer.findings import Finding, Severity
from reviewer.testing import run_rule_on, variant

# An invented board with a hall throttle and every protection stated.
BOARD: dict[str, Any] = {
    "vehicle": {"name": "test board", "kind": "skateboard"},
    "riders": [{"name": "Ada", "mass": "70 kg", "class": "adult"}],
    "control": {
        "throttle": "hall",
        "power_up_inhibit": True,
        "fault_reads_zero": True,
        "kill_switch": True,
    },
}
REMOTE = {"throttle": "wireless-remote", "power_up_inhibit": True, "kill_switch": True}


def findings(**changes: Any) -> dict[str, Finding]:
    return {f.subject: f for f in run_rule_on(RULE, variant(BOARD, **changes))}


def test_every_protection_stated_passes() -> None:
    assert {f.severity for f in findings().values()} == {Severity.PASS}
    assert set(findings()) == {"start at power-up", "broken throttle wire", "kill switch"}


@pytest.mark.parametrize(
    ("rider_class", "severity"),
    [("adult", Severity.FIX), ("youth", Severity.STOP), ("child", Severity.STOP)],
)
def test_no_power_up_inhibit(rider_class: str, severity: Severity) -> None:
    # EN 17128:2020 names protection against unintended start in its scope (figures not
    # quoted); the severity by rider class is common practice
    riders = [{"name": "Kim", "mass": "40 kg", "class": rider_class}]
    finding = findings(riders=riders, control__power_up_inhibit=False)["start at power-up"]
    assert finding.severity is severity
    assert "control.power_up_inhibit" in (finding.remedy or "")


def test_a_throttle_wire_fault_read_as_full_is_a_stop() -> None:
    # brief 15 (P): a hall throttle whose ground breaks can read full scale
    finding = findings(control__fault_reads_zero=False)["broken throttle wire"]
    assert finding.severity is Severity.STOP


def test_a_remote_without_link_loss_cutoff_is_a_stop() -> None:
    # brief 15 (P): a wireless remote that loses its link must cut drive
    lost = findings(control={**REMOTE, "link_loss_cutoff": False})["remote link loss"]
    assert lost.severity is Severity.STOP
    assert "broken throttle wire" not in findings(control={**REMOTE, "link_loss_cutoff": False})


@pytest.mark.parametrize(
    ("time", "severity"),
    [("0.5 s", Severity.PASS), ("1 s", Severity.PASS), ("1.2 s", Severity.STOP)],
)
def test_link_loss_time_against_the_profile(time: str, severity: Severity) -> None:
    # the profile's 1 s (common practice: radio fail-safes act within about a second);
    # exactly on the limit passes
    control = {**REMOTE, "link_loss_cutoff": True, "link_loss_time": time}
    assert findings(control=control)["remote link loss"].severity is severity


def test_unstated_protections_are_named() -> None:
    finding = findings(control__kill_switch=None)["kill switch"]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("control.kill_switch",)
    assert findings(control__kill_switch=False)["kill switch"].severity is Severity.FIX
    timed = findings(control={**REMOTE, "link_loss_cutoff": True})["remote link loss"]
    assert timed.missing == ("control.link_loss_time",)
    (none,) = run_rule_on(RULE, variant(BOARD, control=None))
    assert none.missing == ("control",)
