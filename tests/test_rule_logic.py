"""logic.pin-current: pins, port groups and the package against the part's own datasheet limits,
uneven sharing over paralleled pins, and coils switched from logic."""

from __future__ import annotations

from dataclasses import replace
from typing import Any

import pytest
from firstride_rules.logic.pin_current import RULE

from reviewer.engineering.pins import (
    allowed_current,
    even_share,
    pin_side_current,
    worst_group_current,
    worst_pin_current,
)
from reviewer.findings import Severity, Source
from reviewer.profile import Limit, Profile
from reviewer.session import default_profile
from reviewer.testing import rule_outputs, run_rule_on

PINS = ["P1", "P2", "P3", "P4", "P5", "P6", "P7", "P8", "P9", "P10"]


def _logic(loads: list[dict[str, Any]], **limits: Any) -> dict[str, Any]:
    logic: dict[str, Any] = {
        "pins": PINS,
        "pin_current_max": "40 mA",
        "total_current_max": "200 mA",
        "port_groups": [
            {"name": "BANK-A", "pins": ["P1", "P2", "P3", "P4"], "current_max": "100 mA"},
            {"name": "BANK-B", "pins": ["P5", "P6", "P7", "P8"], "current_max": "100 mA"},
        ],
        "loads": loads,
    }
    logic.update(limits)
    return {"logic": {k: v for k, v in logic.items() if v is not None}}


def _by_subject(data: dict[str, Any], profile: Profile | None = None) -> dict[str, Any]:
    findings = run_rule_on(RULE, data, profile)
    subjects = [f.subject for f in findings]
    assert len(subjects) == len(set(subjects)), "one finding per subject"
    return {f.subject: f for f in findings}


def _profile_with(key: str, value: float) -> Profile:
    profile = default_profile()
    limits = {**profile.limits, key: Limit(key, value, Source.common_practice("test profile"))}
    return replace(profile, limits=limits)


def _ma(finding: Any) -> float:
    return float(finding.measured.m_as("mA"))


# --- pure helpers -----------------------------------------------------------------------------


def test_relay_coil_over_three_outputs_is_twenty_milliamps_each() -> None:
    assert even_share(60.0, 3) == pytest.approx(20.0)  # common practice: 60 mA coil / 3 pins


def test_worst_pin_is_imbalance_times_even_share_capped_at_the_load() -> None:
    assert worst_pin_current(60.0, 3, 1.5) == pytest.approx(30.0)  # common practice: 1.5 x 20
    assert worst_pin_current(60.0, 2, 2.5) == pytest.approx(60.0)  # capped: 75 > the whole 60
    assert worst_pin_current(25.0, 1, 1.5) == pytest.approx(25.0)  # one pin carries it all


def test_worst_group_share() -> None:
    assert worst_group_current(60.0, 1, 3, 1.5) == pytest.approx(30.0)  # 1.5 x 60 x 1/3
    assert worst_group_current(60.0, 2, 3, 1.5) == pytest.approx(60.0)  # 1.5 x 40 capped at 60
    assert worst_group_current(60.0, 3, 3, 1.5) == pytest.approx(60.0)
    assert worst_group_current(60.0, 0, 3, 1.5) == 0.0
    with pytest.raises(ValueError):
        worst_group_current(60.0, 4, 3, 1.5)


def test_helpers_reject_nonsense() -> None:
    with pytest.raises(ValueError):
        worst_pin_current(60.0, 3, 0.8)  # an imbalance below 1 would be better than even
    with pytest.raises(ValueError):
        even_share(60.0, 0)
    with pytest.raises(ValueError):
        allowed_current(40.0, 1.5)


def test_allowed_current_is_a_fraction_of_the_absolute_maximum() -> None:
    assert allowed_current(40.0, 0.5) == pytest.approx(20.0)  # common practice: half of max


def test_pin_side_current_per_driver() -> None:
    assert pin_side_current(60.0, "pin", 10) == 60.0
    # from memory (Horowitz and Hill): saturated switch, base current about Ic / 10
    assert pin_side_current(60.0, "transistor", 10) == pytest.approx(6.0)
    assert pin_side_current(60.0, "mosfet", 10) == 0.0


# --- the rule ---------------------------------------------------------------------------------


def test_rule_identity() -> None:
    assert RULE.id == "logic.pin-current"
    assert "flyback" in RULE.doc
    assert RULE.sources


def test_relay_coil_spread_over_three_pins_is_flagged() -> None:
    coil = {"name": "brake relay coil", "pins": ["P1", "P2", "P3"], "current": "60 mA"}
    coil |= {"inductive": True, "flyback_diode": True, "driver": "pin"}
    found = _by_subject(_logic([coil]))
    load = found["load 'brake relay coil'"]
    # common practice: ~20 mA per output even share, but paralleled pins and a coil on pins
    assert load.severity is Severity.FIX
    assert "paralleled" in load.rationale
    assert "20 mA" in load.rationale and "30 mA" in load.rationale
    assert "MOSFET or NPN transistor" in (load.remedy or "")
    assert "flyback diode" in (load.remedy or "")
    for pin in ("P1", "P2", "P3"):
        finding = found[f"pin {pin}"]
        assert _ma(finding) == pytest.approx(30.0)  # 1.5 x 20 mA worst case
        assert finding.severity is Severity.FIX  # over 50 % of 40 mA, under 40 mA
        assert "20 mA" in (finding.remedy or "")
    assert found["port group BANK-A"].severity is Severity.PASS  # 60 mA <= 80 % of 100 mA
    assert _ma(found["package total"]) == pytest.approx(60.0)


def test_coil_without_flyback_diode_is_stop_whatever_drives_it() -> None:
    for driver in ("pin", "mosfet", "transistor"):
        coil = {"name": "horn relay", "pins": ["P9"], "current": "15 mA", "inductive": True}
        coil["driver"] = driver
        load = _by_subject(_logic([coil]))["load 'horn relay'"]
        assert load.severity is Severity.STOP, driver  # v = L di/dt at turn-off
        assert "flyback diode" in (load.remedy or "")


def test_per_pin_limit_pass_fix_stop() -> None:
    cases = [("15 mA", Severity.PASS), ("25 mA", Severity.FIX), ("45 mA", Severity.STOP)]
    for current, severity in cases:
        led = {"name": "tail lamp", "pins": ["P10"], "current": current}
        pin = _by_subject(_logic([led]))["pin P10"]
        assert pin.severity is severity, current  # 20 mA derated, 40 mA absolute maximum
        assert pin.limit.m_as("mA") == pytest.approx(20.0)
    assert "keep each pin at or below 20 mA" in (pin.remedy or "")
    assert "move 25 mA off pin P10" in (pin.remedy or "")


def test_port_group_limit() -> None:
    loads = [{"name": f"lamp {i}", "pins": [f"P{5 + i}"], "current": "18 mA"} for i in range(2)]
    data = _logic(loads)
    data["logic"]["port_groups"][1]["current_max"] = "40 mA"
    found = _by_subject(data)
    group = found["port group BANK-B"]
    assert _ma(group) == pytest.approx(36.0)
    assert group.severity is Severity.FIX  # 36 mA over 80 % of 40 mA = 32 mA
    assert "move 4 mA off port group BANK-B" in (group.remedy or "")
    assert found["pin P5"].severity is Severity.PASS  # 18 mA <= 20 mA
    data["logic"]["port_groups"][1]["current_max"] = "30 mA"
    assert _by_subject(data)["port group BANK-B"].severity is Severity.STOP  # 36 > 30 absolute


def test_load_on_two_port_groups_counts_uneven_sharing() -> None:
    bar = {"name": "light bar", "pins": ["P4", "P8"], "current": "30 mA", "inductive": False}
    data = _logic([bar])
    for group in data["logic"]["port_groups"]:
        group["current_max"] = "25 mA"
    found = _by_subject(data)
    for name in ("BANK-A", "BANK-B"):
        group = found[f"port group {name}"]
        # even share 15 mA would pass 20 mA; 1.5 x 15 = 22.5 mA does not
        assert _ma(group) == pytest.approx(22.5)
        assert group.severity is Severity.FIX
    assert found["load 'light bar'"].severity is Severity.ADVISE  # paralleled, not inductive


def test_package_total_limit() -> None:
    loads = [{"name": f"lamp {p}", "pins": [p], "current": "19 mA"} for p in PINS[:9]]
    found = _by_subject(_logic(loads))
    total = found["package total"]
    assert _ma(total) == pytest.approx(171.0)
    assert total.severity is Severity.FIX  # over 80 % of 200 mA = 160 mA
    assert "move 11 mA" in (total.remedy or "")
    found = _by_subject(_logic(loads, total_current_max="150 mA"))
    assert found["package total"].severity is Severity.STOP


def test_imbalance_comes_from_the_profile() -> None:
    bar = {"name": "light bar", "pins": ["P1", "P2"], "current": "36 mA"}
    even = _by_subject(_logic([bar]))["pin P1"]
    assert _ma(even) == pytest.approx(27.0)  # default profile 1.5 x 18 mA
    mild = _by_subject(_logic([bar]), _profile_with("logic.parallel_pin_imbalance", 1.1))
    assert _ma(mild["pin P1"]) == pytest.approx(19.8)  # 1.1 x 18 mA
    assert mild["pin P1"].severity is Severity.PASS
    harsh = _by_subject(_logic([bar]), _profile_with("logic.parallel_pin_imbalance", 3.0))
    assert _ma(harsh["pin P1"]) == pytest.approx(36.0)  # 3 x 18 = 54, capped at the 36 mA load


def test_pass_with_mosfet_driver_and_flyback_diode() -> None:
    coil = {"name": "brake relay coil", "pins": ["P1"], "current": "60 mA", "inductive": True}
    coil |= {"flyback_diode": True, "driver": "mosfet"}
    findings, _, assumptions = rule_outputs(RULE, _logic([coil]))
    assert findings and all(f.severity is Severity.PASS for f in findings)
    assert any("MOSFET gate" in a.text for a in assumptions)


def test_transistor_driver_counts_base_current() -> None:
    coil = {"name": "brake relay coil", "pins": ["P1"], "current": "60 mA", "inductive": True}
    coil |= {"flyback_diode": True, "driver": "transistor"}
    found = _by_subject(_logic([coil]))
    assert _ma(found["pin P1"]) == pytest.approx(6.0)  # from memory: Ic / 10
    assert found["load 'brake relay coil'"].severity is Severity.PASS


def test_missing_logic_section_is_unassessed() -> None:
    findings = run_rule_on(RULE, {})
    assert [f.severity for f in findings] == [Severity.UNASSESSED]
    assert set(findings[0].missing) == {
        "logic.loads",
        "logic.pin_current_max",
        "logic.total_current_max",
    }


def test_missing_limits_are_unassessed_and_named() -> None:
    led = {"name": "tail lamp", "pins": ["P10"], "current": "15 mA"}
    found = _by_subject(_logic([led], pin_current_max=None, total_current_max=None))
    assert found["each pin"].severity is Severity.UNASSESSED
    assert found["each pin"].missing == ("logic.pin_current_max",)
    assert found["package total"].missing == ("logic.total_current_max",)
    assert "pin P10" not in found


def test_no_loads_is_unassessed() -> None:
    findings = run_rule_on(RULE, _logic([]))
    assert [f.missing for f in findings] == [("logic.loads",)]


def test_a_board_said_absent_settles_the_pin_checks() -> None:
    findings = run_rule_on(RULE, {"logic": {"present": False}})
    assert [(f.subject, f.severity) for f in findings] == [("logic pins", Severity.PASS)]
    assert "no separate logic board" in findings[0].rationale


def test_a_load_of_unstated_inductance_is_never_passed_as_resistive() -> None:
    # Horowitz and Hill, The Art of Electronics (from memory): a coil switched off without a
    # flyback path spikes; a load that may be one is not passed until the build says
    lamp = {"name": "lamp", "pins": ["P2"], "current": "8 mA"}
    found = _by_subject(_logic([lamp]))["load 'lamp'"]
    assert found.severity is Severity.UNASSESSED
    assert found.missing == ("logic.loads[0].inductive",)
    said = _by_subject(_logic([{**lamp, "inductive": False}]))["load 'lamp'"]
    assert said.severity is Severity.PASS
