"""logic.regulator: the logic supply's input rating and a linear regulator's heat."""

from __future__ import annotations

import re
from typing import Any

import pytest
from firstride_rules.logic.regulator import RULE

from reviewer.findings import Comparison, Finding, Severity
from reviewer.testing import rule_outputs, run_rule_on, variant

# An invented scooter: 10S lithium pack (42 V full, 30 V cut-off), a logic board with a sensor
# and a radio drawing 100 mA, fed by a linear regulator in a small package.
BUILD: dict[str, Any] = {
    "battery": {"chemistry": "li-ion", "cells_series": 10},
    "logic": {
        "supply_voltage": "5 V",
        "board_current": "100 mA",
        "regulator": {
            "kind": "linear",
            "input_max": "60 V",
            "output_voltage": "5 V",
            "quiescent_current": "5 mA",
            "thermal_resistance": "50 K/W",
            "max_junction_temperature": "125 degC",
        },
    },
    "usage": {"ambient_temperature": "25 degC"},
}


def build(**changes: Any) -> dict[str, Any]:
    return variant(BUILD, **changes)


def by_subject(data: dict[str, Any]) -> dict[str, Finding]:
    findings = run_rule_on(RULE, data)
    subjects = [f.subject for f in findings]
    assert len(subjects) == len(set(subjects)), "one finding per subject"
    return {f.subject: f for f in findings}


def figure(data: dict[str, Any], name: str) -> Any:
    _, figures, _ = rule_outputs(RULE, data)
    (match,) = [f for f in figures if f.name == name]
    return match.value


def test_rule_id() -> None:
    assert RULE.id == "logic.regulator"


def test_check_value_42_v_to_5_v_overheats() -> None:
    # domain brief check value (derived from P = (Vin - Vout) I_out + Vin I_q): 42 V to 5 V
    # at 0.1 A is 3.7 W, plus 42 V x 5 mA quiescent = 3.91 W; at 50 K/W a 195.5 K rise
    # (JEDEC JESD51 Tj = Ta + P R_th, from memory) puts the junction at 220.5 degC
    data = build()
    assert figure(data, "logic regulator dissipation").m_as("W") == pytest.approx(3.91)
    heat = by_subject(data)["regulator heat"]
    assert heat.severity is Severity.FIX
    assert heat.measured.m_as("degC") == pytest.approx(25.0 + 3.91 * 50.0)
    assert heat.limit.m_as("degC") == pytest.approx(125.0)
    assert "3.91 W" in heat.rationale


def test_linear_regulator_for_sensor_and_radio_overheats_and_remedy_names_alternatives() -> None:
    # common practice: a linear regulator that has to supply a sensor and a radio from a high
    # pack voltage overheats, and a separate 5 V supply (or a switching regulator) solves it
    heat = by_subject(build())["regulator heat"]
    assert heat.severity is Severity.FIX
    assert heat.remedy is not None
    assert "switching regulator" in heat.remedy
    assert "separate 5 V supply" in heat.remedy
    assert "85 %" in heat.remedy  # the profile's switching efficiency, common practice


def test_load_budget_in_the_remedy_passes_when_rerun() -> None:
    # inverting Tj = Ta + P R_th: (100 K / 50 K/W - 0.21 W) / 37 V = 48.4 mA, whole mA down
    heat = by_subject(build())["regulator heat"]
    match = re.search(r"load of at most (\d+) mA", heat.remedy or "")
    assert match, heat.remedy
    budget = int(match.group(1))
    assert budget == 48
    assert by_subject(build(logic__board_current=f"{budget} mA"))["regulator heat"].severity is (
        Severity.PASS
    )
    over = build(logic__board_current=f"{budget + 1} mA")
    assert by_subject(over)["regulator heat"].severity is Severity.FIX


def test_heatsink_in_the_remedy_passes_when_rerun() -> None:
    # Tj = Ta + P R_th: 100 K over 3.91 W allows 25.5 K/W junction to air
    heat = by_subject(build())["regulator heat"]
    match = re.search(r"thermal resistance is at most ([\d.]+) K/W", heat.remedy or "")
    assert match, heat.remedy
    r_th = float(match.group(1))
    assert r_th == pytest.approx(25.5, abs=0.05)
    rerun = by_subject(build(logic__regulator__thermal_resistance=f"{r_th} K/W"))
    assert rerun["regulator heat"].severity is Severity.PASS


def test_low_pack_voltage_passes() -> None:
    # P = (Vin - Vout) I_out + Vin I_q: a 3S pack (12.6 V full) gives 0.76 + 0.063 W, a 41 K
    # rise: a linear regulator is fine from a low voltage
    data = build(battery={"chemistry": "li-ion", "cells_series": 3})
    heat = by_subject(data)["regulator heat"]
    assert heat.severity is Severity.PASS
    assert heat.measured.m_as("degC") == pytest.approx(25.0 + (7.6 * 0.1 + 12.6 * 0.005) * 50.0)
    assert heat.remedy is None


def test_input_over_the_regulator_maximum_is_stop_and_remedy_passes_when_rerun() -> None:
    # the regulator's datasheet maximum input against the 10S pack's 42 V (4.2 V per cell,
    # Linden, Handbook of Batteries, from memory)
    findings = by_subject(build(logic__regulator__input_max="35 V"))
    finding = findings["regulator input"]
    assert finding.severity is Severity.STOP
    # the rating is measured against what it must reach, as voltage.ratings states it
    assert finding.measured.m_as("V") == pytest.approx(35.0)
    assert finding.limit.m_as("V") == pytest.approx(42.0)
    assert finding.comparison is Comparison.AT_LEAST
    match = re.search(r"rated for at least (\d+) V input", finding.remedy or "")
    assert match, finding.remedy
    rerun = by_subject(build(logic__regulator__input_max=f"{match.group(1)} V"))
    assert rerun["regulator input"].severity is Severity.PASS


def test_charger_voltage_above_full_is_what_the_regulator_sees() -> None:
    # the logic may run while charging: a charger set to 43 V is then the input voltage
    data = build(battery={"chemistry": "li-ion", "cells_series": 10, "charger_voltage": "43 V"})
    data["logic"]["regulator"]["input_max"] = "42.5 V"
    finding = by_subject(data)["regulator input"]
    assert finding.severity is Severity.STOP
    assert finding.limit.m_as("V") == pytest.approx(43.0)
    assert "43 V charger" in finding.rationale


def test_switching_regulator_passes_and_reports_its_input_current() -> None:
    # energy balance: 5 V x 0.1 A at 85 % (profile, common practice) from the 30 V cut-off
    # (3.0 V per cell, from memory) is 19.6 mA
    data = build(logic__regulator={"kind": "switching", "input_max": "60 V"})
    findings = by_subject(data)
    assert set(findings) == {"regulator input"}
    finding = findings["regulator input"]
    assert finding.severity is Severity.PASS
    current = figure(data, "logic regulator input current").m_as("mA")
    assert current == pytest.approx(0.5 / 0.85 / 30.0 * 1000.0)
    assert "19.6 mA" in finding.rationale


def test_switching_regulator_over_its_input_rating_is_stop() -> None:
    data = build(logic__regulator={"kind": "switching", "input_max": "36 V"})
    assert by_subject(data)["regulator input"].severity is Severity.STOP


def test_brake_coil_on_the_rail_is_added() -> None:
    # P = (Vin - Vout) I_out + Vin I_q with a 60 mA relay coil (common practice: a relay
    # with a coil near 60 mA) on the rail besides the 100 mA board
    data = build(brakes=[{"kind": "dynamic", "coil_current": "60 mA"}])
    assert figure(data, "logic rail current").m_as("mA") == pytest.approx(160.0)
    assert figure(data, "logic regulator dissipation").m_as("W") == pytest.approx(
        37.0 * 0.16 + 42.0 * 0.005
    )


def test_brake_coil_listed_as_a_logic_load_is_counted_once() -> None:
    coil = {"name": "brake relay", "pins": ["P5"], "current": "60 mA", "inductive": True}
    lamp = {"name": "lamp", "pins": ["P6"], "current": "10 mA"}
    data = build(brakes=[{"kind": "dynamic", "coil_current": "60 mA"}])
    data["logic"]["loads"] = [coil, lamp]
    assert figure(data, "logic rail current").m_as("mA") == pytest.approx(170.0)
    _, _, notes = rule_outputs(RULE, data)
    assert any("counted once" in note.text for note in notes)


def test_defaults_are_flagged() -> None:
    data = build()
    for key in ("quiescent_current", "max_junction_temperature"):
        data["logic"]["regulator"].pop(key)
    data["usage"] = {}
    _, _, notes = rule_outputs(RULE, data)
    texts = " ".join(note.text for note in notes)
    assert "quiescent current not given: 5 mA" in texts
    assert "junction temperature not given: 125 °C" in texts
    assert "usage.ambient_temperature not given: 35 °C" in texts


def test_a_board_said_absent_passes_with_nothing_to_check() -> None:
    findings = run_rule_on(RULE, {"battery": BUILD["battery"], "logic": {"present": False}})
    assert len(findings) == 1
    assert findings[0].severity is Severity.PASS
    assert "no separate logic board" in findings[0].rationale


def test_a_board_left_out_is_unassessed_not_a_pass() -> None:
    # an absent input never takes the favourable value: no [logic] is not "no logic board"
    findings = run_rule_on(RULE, {"battery": BUILD["battery"]})
    assert [f.severity for f in findings] == [Severity.UNASSESSED]
    assert findings[0].missing == ("logic",)


def test_a_board_said_absent_cannot_also_have_loads() -> None:
    import pytest

    with pytest.raises(Exception, match="present = false"):
        run_rule_on(RULE, {"logic": {"present": False, "board_current": "40 mA"}})


def test_logic_board_without_regulator_is_unassessed() -> None:
    findings = run_rule_on(RULE, build(logic__regulator=None))
    assert len(findings) == 1
    assert findings[0].severity is Severity.UNASSESSED
    assert findings[0].missing == ("logic.regulator",)


def test_missing_linear_inputs_are_named() -> None:
    data = build(logic__board_current=None, logic__regulator__thermal_resistance=None)
    heat = by_subject(data)["regulator heat"]
    assert heat.severity is Severity.UNASSESSED
    assert set(heat.missing) == {"logic.regulator.thermal_resistance", "logic.board_current"}


def test_output_voltage_falls_back_to_the_logic_supply() -> None:
    data = build(logic__regulator__output_voltage=None)
    assert by_subject(data)["regulator heat"].severity is Severity.FIX
    data["logic"].pop("supply_voltage")
    heat = by_subject(data)["regulator heat"]
    assert heat.severity is Severity.UNASSESSED
    assert heat.missing == ("logic.regulator.output_voltage",)


def test_missing_input_rating_and_pack_are_unassessed() -> None:
    finding = by_subject(build(logic__regulator__input_max=None))["regulator input"]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("logic.regulator.input_max",)
    no_pack = run_rule_on(RULE, build(battery=None))
    assert [f.missing for f in no_pack] == [("battery",)]
    off_pack = run_rule_on(RULE, build(logic__regulator__fed_from_pack=False))
    assert [f.severity for f in off_pack] == [Severity.UNASSESSED]


def test_input_is_judged_as_voltage_ratings_judges_it() -> None:
    # one judgement for one part: the same severity, limit and words in both rules
    from firstride_rules.voltage.ratings import RULE as VOLTAGE

    for input_max in ("35 V", "42 V", "60 V", None):  # 42 V full: 10 x 4.2 V (from memory)
        for charger in (None, "43 V"):
            data = build(logic__regulator__input_max=input_max)
            if charger is not None:
                data["battery"]["charger_voltage"] = charger
            ours = by_subject(data)["regulator input"]
            theirs = next(
                f for f in run_rule_on(VOLTAGE, data) if f.subject == "logic regulator input"
            )
            assert ours.severity is theirs.severity
            assert (ours.measured, ours.limit, ours.remedy) == (
                theirs.measured,
                theirs.limit,
                theirs.remedy,
            )
            assert ours.rationale.startswith(theirs.rationale)


def test_separate_supply_input_voltage_is_judged() -> None:
    # 42 V to 5 V at 0.1 A is 3.7 W (domain brief, derived); fed from a 12 V supply instead,
    # P = (12 - 5) x 0.1 = 0.7 W (P = (Vin - Vout) I, the linear regulator's loss)
    from firstride_rules.logic.regulator import RULE

    from reviewer.testing import run_rule_on

    data = {
        "battery": {"chemistry": "li-ion", "cells_series": 10},
        "logic": {
            "board_current": "100 mA",
            "regulator": {
                "kind": "linear",
                "fed_from_pack": False,
                "input_voltage": "12 V",
                "input_max": "10 V",
                "output_voltage": "5 V",
                "quiescent_current": "0.001 mA",
                "thermal_resistance": "50 K/W",
                "max_junction_temperature": "125 degC",
            },
        },
        "usage": {"ambient_temperature": "25 degC"},
    }
    findings = {f.subject: f for f in run_rule_on(RULE, data)}
    assert findings["regulator input"].severity.value == "stop"  # 10 V rating, fed 12 V
    data["logic"]["regulator"]["input_max"] = "16 V"
    findings = {f.subject: f for f in run_rule_on(RULE, data)}
    assert findings["regulator input"].severity.value == "pass"
