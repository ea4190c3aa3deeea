"""A sealed brushless controller, judged by what it publishes (issue 10): datasheet ratings, the
input voltage, a bridge that needs no freewheel diode, a limit of unstated kind."""

from __future__ import annotations

from typing import Any

from firstride_rules.controller.current_sense import RULE as CURRENT_SENSE
from firstride_rules.controller.freewheel import RULE as FREEWHEEL
from firstride_rules.controller.switch_thermal import RULE as SWITCH_THERMAL
from firstride_rules.voltage.ratings import RULE as VOLTAGE

from reviewer.findings import Severity
from reviewer.testing import run_rule_on, variant

# Invented parts: a 10S li-ion pack (42 V full: 10 x 4.2 V, Linden, from memory) and a hub motor.
BUILD: dict[str, Any] = {
    "battery": {
        "chemistry": "li-ion",
        "cells_series": 10,
        "cells_parallel": 1,
        "cell_internal_resistance": "0.03 ohm",
    },
    "motors": [
        {"name": "hub", "type": "brushless", "kv": "12 rpm/V", "winding_resistance": "0.24 ohm"}
    ],
    "controller": {
        "drive": "six-step",
        "motor_current_limit": "25 A",
        "battery_current_limit": "15 A",
        "current_limit_kind": "software",
        "rated_continuous_current": "30 A",
        "peak_current": "40 A",
        "max_input_voltage": "60 V",
    },
}


def _by_subject(rule, data) -> dict[str, Any]:
    return {f.subject: f for f in run_rule_on(rule, data)}


def test_a_sealed_controller_is_assessed_by_its_datasheet() -> None:
    found = _by_subject(SWITCH_THERMAL, BUILD)
    assert found["controller switch"].severity is Severity.PASS
    assert found["controller peak rating"].severity is Severity.PASS
    # a locked rotor at the 25 A limit, within 40 A peak and 30 A continuous
    assert found["controller continuous rating"].measured.m_as("A") == 25.0
    assert all(f.severity is not Severity.UNASSESSED for f in found.values())


def test_a_limit_above_the_controllers_continuous_rating_is_not_a_pass() -> None:
    data = variant(BUILD, controller__motor_current_limit="35 A")
    found = _by_subject(SWITCH_THERMAL, data)
    continuous = found["controller continuous rating"]
    assert continuous.severity is Severity.FIX
    assert "controller.motor_current_limit to 30 A or less" in continuous.remedy
    # with the battery limit the locked rotor takes only sqrt(15 x 42 / 0.54) = 34.2 A: no stop
    both = variant(BUILD, controller__motor_current_limit="45 A")
    assert _by_subject(SWITCH_THERMAL, both)["controller peak rating"].severity is Severity.PASS
    alone = variant(both, controller__battery_current_limit=None)
    assert _by_subject(SWITCH_THERMAL, alone)["controller peak rating"].severity is Severity.STOP


def test_exactly_on_the_continuous_rating_passes() -> None:
    data = variant(BUILD, controller__motor_current_limit="30 A")
    assert _by_subject(SWITCH_THERMAL, data)["controller continuous rating"].severity is (
        Severity.PASS
    )


def test_a_missing_datasheet_rating_is_named_not_passed() -> None:
    data = variant(BUILD, controller__peak_current=None)
    found = _by_subject(SWITCH_THERMAL, data)
    assert found["controller peak rating"].severity is Severity.UNASSESSED
    assert found["controller peak rating"].missing == ("controller.peak_current",)


def test_a_battery_limit_alone_is_judged_at_the_motor_current_it_lets_through() -> None:
    # R I^2 = I_b V at a stall (energy balance, brief 11): 15 A x 42 V over 0.24 ohm plus the
    # pack's 0.3 ohm -> sqrt(630 / 0.54) = 34.2 A, above the 30 A continuous rating
    data = variant(BUILD, controller__motor_current_limit=None)
    continuous = _by_subject(SWITCH_THERMAL, data)["controller continuous rating"]
    assert continuous.measured.m_as("A") > 30.0
    assert continuous.severity is Severity.FIX


def test_the_pack_above_the_controllers_input_maximum_is_a_stop() -> None:
    found = _by_subject(VOLTAGE, variant(BUILD, controller__max_input_voltage="36 V"))
    assert found["controller input"].severity is Severity.STOP
    assert _by_subject(VOLTAGE, BUILD)["controller input"].severity is Severity.PASS


def test_no_review_of_a_brushless_motor_asks_for_a_freewheel_diode() -> None:
    # Mohan, Undeland and Robbins (from memory): a three-phase bridge's antiparallel diodes carry
    # the phase current when a switch opens
    data = variant(BUILD, controller__switch_max_voltage="45 V")
    findings = run_rule_on(VOLTAGE, data) + run_rule_on(FREEWHEEL, data)
    text = " ".join(f"{f.rationale} {f.remedy or ''}" for f in findings).lower()
    assert "fit a freewheel diode" not in text
    bridge = _by_subject(VOLTAGE, data)["bridge switches"]
    # 45 V against 1.25 x 42 V = 52.5 V with the diodes clamping: a fix, not a 2 x 42 V stop
    assert bridge.severity is Severity.FIX and bridge.limit.m_as("V") < 2 * 42.0


def test_a_limit_of_unstated_kind_with_no_sensor_is_not_passed() -> None:
    data = variant(
        BUILD,
        controller__current_limit_kind=None,
        controller__rated_continuous_current=None,
        controller__peak_current=None,
    )
    (finding,) = run_rule_on(CURRENT_SENSE, data)[:1]
    assert finding.severity is Severity.UNASSESSED and "unstated kind" in finding.rationale
    sealed = run_rule_on(CURRENT_SENSE, BUILD)[0]
    assert sealed.severity is Severity.PASS and "sealed controller" in sealed.rationale
