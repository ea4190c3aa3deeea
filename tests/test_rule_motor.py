"""motor.cooling: winding temperature at continuous current, against IEC 60085 / IEC 60034-1."""

from __future__ import annotations

import copy
import re
from typing import Any

import pytest
from firstride_rules.motor.cooling import RULE

from reviewer import units as u
from reviewer.findings import Finding, Severity
from reviewer.testing import rule_outputs, run_rule_on

# An invented brushed motor: 0.3 ohm, 10 A rated, class F insulation, with a fan of its own
# drive (it keeps turning at a stall; a shaft fan does not: see the tests at the end).
MOTOR: dict[str, Any] = {
    "name": "rear",
    "type": "brushed",
    "kv": "150 rpm/V",
    "winding_resistance": "0.3 ohm",
    "rated_current": "10 A",
    "insulation_class": "F",
    "cooling": {"fan": True, "fan_independent": True},
}


def build(current_limit: str | None = "10 A", ambient: str = "35 degC", **motor: Any) -> dict:
    data: dict[str, Any] = {
        "battery": {"chemistry": "lead-acid", "cells_series": 12},  # 24 V nominal
        "motors": [{**copy.deepcopy(MOTOR), **motor}],
        "usage": {"ambient_temperature": ambient},
    }
    if current_limit is not None:
        data["controller"] = {"motor_current_limit": current_limit}
    return data


def only(findings: list[Finding]) -> Finding:
    assert len(findings) == 1, findings
    return findings[0]


def figure(figures: list, prefix: str) -> float:
    matches = [f for f in figures if f.name.startswith(prefix)]
    assert len(matches) == 1, [f.name for f in figures]
    return float(matches[0].value.magnitude)


def remedy_amps(finding: Finding, pattern: str) -> float:
    assert finding.remedy is not None
    match = re.search(pattern, finding.remedy)
    assert match, finding.remedy
    return float(match.group(1))


def test_rule_id() -> None:
    assert RULE.id == "motor.cooling"


def test_rated_current_at_40_degc_sits_exactly_on_the_rise_limit() -> None:
    # IEC 60034-1: rated current at 40 degC coolant brings class F to 40 + 105 = 145 degC
    finding = only(run_rule_on(RULE, build("10 A", ambient="40 degC")))
    assert finding.severity is Severity.PASS
    assert finding.measured.m_as("degC") == pytest.approx(145.0)
    assert finding.limit.m_as("degC") == pytest.approx(145.0)


def test_rated_current_on_a_cooler_day_passes() -> None:
    # IEC 60034-1: below 40 degC coolant the same current stays under the rise limit
    finding = only(run_rule_on(RULE, build("10 A", ambient="25 degC")))
    assert finding.severity is Severity.PASS
    assert finding.measured.m_as("degC") < 145.0
    assert finding.remedy is None
    assert "155 °C" in finding.rationale  # the class temperature is reported (IEC 60085 F)


def test_slightly_over_rated_is_fix() -> None:
    # IEC 60034-1 / IEC 60085: over 40 + 105 = 145 degC but under class F's 155 degC
    finding = only(run_rule_on(RULE, build("10.4 A")))
    assert finding.severity is Severity.FIX
    assert 145.0 < finding.measured.m_as("degC") <= 155.0


def test_well_over_rated_is_stop() -> None:
    # IEC 60085: beyond class F's 155 degC the insulation ages fast (life halves per 10 K)
    finding = only(run_rule_on(RULE, build("11 A")))
    assert finding.severity is Severity.STOP
    assert 155.0 < finding.measured.m_as("degC") < 205.0
    assert "insulation life falls to about" in finding.rationale
    far = only(run_rule_on(RULE, build("12 A")))
    assert far.severity is Severity.STOP
    assert "past its insulation rating" in far.rationale


def test_thermal_runaway_is_stop_without_a_temperature() -> None:
    # derived: a = R_th I^2 R20 / 254.5 >= 1 has no steady state
    data = build("30 A")
    del data["battery"]  # with a pack, its voltage caps the current and a steady state exists
    finding = only(run_rule_on(RULE, data))
    assert finding.severity is Severity.STOP
    assert finding.measured is None
    assert "no steady temperature" in finding.rationale


@pytest.mark.parametrize("limit", ["10.4 A", "12 A", "30 A"])
def test_remedy_current_passes_when_rerun(limit: str) -> None:
    # IEC 60034-1: the remedied current keeps the winding within 40 degC + rise limit
    finding = only(run_rule_on(RULE, build(limit)))
    amps = remedy_amps(finding, r"current_limit at or below ([\d.]+) A")
    again = only(run_rule_on(RULE, build(f"{amps} A")))
    assert again.severity is Severity.PASS
    # and it is the highest such tenth of an ampere: 0.1 A more no longer passes
    over = only(run_rule_on(RULE, build(f"{amps + 0.1:.1f} A")))
    assert over.severity is not Severity.PASS


def test_blocked_vents_run_hotter_and_allow_less() -> None:
    # common practice: a fan-cooled motor with blocked vents runs hotter and is allowed less
    # continuous current (IEC 60034-6 IC411 towards IC410)
    open_findings, open_figures, _ = rule_outputs(RULE, build("9 A"))
    blocked_findings, blocked_figures, assumptions = rule_outputs(
        RULE, build("9 A", cooling={"fan": True, "fan_independent": True, "inlet_blocked": True})
    )
    assert blocked_findings[0].measured > open_findings[0].measured
    allowed_open = figure(open_figures, "highest continuous current")
    allowed_blocked = figure(blocked_figures, "highest continuous current")
    assert allowed_blocked < allowed_open
    assert any("blocked fan airflow" in a.text for a in assumptions)


def test_unblocking_remedy_passes_when_rerun() -> None:
    # common practice: clearing the vents restores the rated cooling
    finding = only(
        run_rule_on(
            RULE,
            build("9 A", cooling={"fan": True, "fan_independent": True, "outlet_blocked": True}),
        )
    )
    assert finding.severity is not Severity.PASS
    assert "unblock" in finding.remedy
    amps = remedy_amps(finding, r"then up to ([\d.]+) A")
    assert amps >= 9.0
    assert only(run_rule_on(RULE, build(f"{amps} A"))).severity is Severity.PASS


def test_builder_cooling_factor_replaces_the_default() -> None:
    data = build(
        "9 A",
        cooling={
            "fan": True,
            "fan_independent": True,
            "inlet_blocked": True,
            "blocked_cooling_factor": 0.8,
        },
    )
    findings, _, assumptions = rule_outputs(RULE, data)
    assert not any("blocked fan airflow" in a.text for a in assumptions)
    default_findings = run_rule_on(
        RULE, build("9 A", cooling={"fan": True, "fan_independent": True, "inlet_blocked": True})
    )
    assert findings[0].measured < default_findings[0].measured


def test_blocked_flags_without_a_fan_change_nothing() -> None:
    # IEC 60034-6: a motor with no fan (IC410) has no airflow to block
    plain = only(run_rule_on(RULE, build("9 A", cooling={"fan": False})))
    flagged = only(run_rule_on(RULE, build("9 A", cooling={"fan": False, "inlet_blocked": True})))
    assert flagged.measured == plain.measured


@pytest.mark.parametrize("limit", ["8 A", "40 A", "100 A"])
def test_copper_loss_never_exceeds_the_input(limit: str) -> None:
    # conservation of energy: a locked rotor does no work, so the winding's copper loss is at
    # most what the pack delivers; a held current above what the pack (12 x 2.15 V lead-acid
    # full, from memory: Linden) drives through the hot winding is never credited (100 A here)
    findings, figures, _ = rule_outputs(RULE, build(limit))
    loss, power = figure(figures, "copper loss"), figure(figures, "input power")
    assert loss <= power * (1 + 1e-9)
    hot = 0.3 * (234.5 + findings[0].measured.m_as("degC")) / 254.5  # copper, IEC 60028 basis
    current = (loss / hot) ** 0.5
    assert current <= 12 * 2.15 / hot * (1 + 1e-6)
    assert current <= float(limit.split()[0]) * (1 + 1e-9)


def test_no_current_limit_means_a_stall_and_stops() -> None:
    # from memory: Chapman; a locked rotor draws V / R and the winding takes all of it as heat
    findings, figures, assumptions = rule_outputs(RULE, build(None))
    finding = only(findings)
    assert finding.severity is Severity.STOP
    assert "stall" in finding.rationale
    assert "fit a current limit" in finding.remedy
    # energy balance: the winding cannot dissipate more than the pack delivers
    assert figure(figures, "copper loss") <= figure(figures, "input power")
    assert any("No controller current limit" in a.text for a in assumptions)


def test_default_ambient_is_flagged() -> None:
    data = build("10 A")
    del data["usage"]
    findings, _, assumptions = rule_outputs(RULE, data)
    assert any("usage.ambient_temperature not given" in a.text for a in assumptions)
    assert "35 °C" in findings[0].rationale


def test_missing_motor_fields_are_named() -> None:
    motor = {"name": "front", "type": "brushed", "kv": "150 rpm/V"}
    finding = only(
        run_rule_on(RULE, {"motors": [motor], "controller": {"motor_current_limit": "5 A"}})
    )
    assert finding.severity is Severity.UNASSESSED
    assert set(finding.missing) == {
        "motors[0].winding_resistance",
        "motors[0].rated_current",
        "motors[0].insulation_class",
    }


def test_no_limit_and_no_battery_names_both_ways_to_a_current() -> None:
    data = build(None)
    del data["battery"]
    finding = only(run_rule_on(RULE, data))
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("controller.motor_current_limit", "battery")


def test_no_motor_is_unassessed() -> None:
    finding = only(run_rule_on(RULE, {}))
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("motors",)


def test_one_finding_per_motor() -> None:
    data = build("9 A")
    data["motors"].append({**MOTOR, "name": "front", "rated_current": "6 A"})
    findings = run_rule_on(RULE, data)
    assert [f.subject for f in findings] == ["motor 'rear'", "motor 'front'"]
    assert [f.severity for f in findings] == [Severity.PASS, Severity.STOP]


@pytest.mark.parametrize(
    ("letter", "limit_c", "class_c"),
    [
        ("B", 120.0, 130.0),  # IEC 60034-1 B 80 K; IEC 60085 B 130 degC
        ("F", 145.0, 155.0),  # IEC 60034-1 F 105 K; IEC 60085 F 155 degC
        ("H", 165.0, 180.0),  # IEC 60034-1 H 125 K; IEC 60085 H 180 degC
        ("A", 100.0, 105.0),  # from memory: IEC 60034-1 A 60 K; IEC 60085 A 105 degC
    ],
)
def test_each_class_is_held_to_its_own_limit(letter: str, limit_c: float, class_c: float) -> None:
    finding = only(run_rule_on(RULE, build("10 A", ambient="40 degC", insulation_class=letter)))
    assert finding.limit == u.Quantity(limit_c, "degC")
    assert finding.measured.m_as("degC") == pytest.approx(limit_c)
    assert finding.severity is Severity.PASS
    assert f"rated {class_c:g} °C" in finding.rationale


def test_a_shaft_fan_does_not_cool_a_locked_rotor() -> None:
    # brief 12 (IEC 60034-6: IC411 becomes IC410 when the shaft stops): held at 9 A against a
    # stall, a shaft-fan motor is judged with the profile's still-air factor 0.5. By hand, with
    # R_th from the 10 A rating (145 degC at 40 degC coolant, class F, IEC 60034-1):
    # R_th = 105 / (10^2 x 0.3 x 379.5 / 254.5); a = (R_th / k) 9^2 0.3 / 254.5;
    # theta = (35 + 234.5 a) / (1 - a)
    r_th = 105 / (100 * 0.3 * (234.5 + 145) / 254.5)

    def theta(k: float) -> float:
        a = (r_th / k) * 81 * 0.3 / 254.5
        return (35 + 234.5 * a) / (1 - a)

    turning = only(run_rule_on(RULE, build("9 A")))  # a fan of its own drive
    assert turning.severity is Severity.PASS
    assert turning.measured.m_as("degC") == pytest.approx(theta(1.0), rel=1e-4)  # about 113
    findings, _, assumptions = rule_outputs(RULE, build("9 A", cooling={"fan": True}))
    still = only(findings)
    assert still.measured.m_as("degC") == pytest.approx(theta(0.5), rel=1e-4)  # about 254
    assert still.severity is Severity.STOP
    assert any("shaft fan does not turn" in a.text for a in assumptions)
    assert "stall cut-off" in still.remedy


def test_a_battery_limit_alone_holds_the_pack_power_not_the_current() -> None:
    # brief 11: at a locked rotor I_b V = I_m^2 R, so a 2 A battery limit on a 25.8 V pack
    # lets I_m = sqrt(2 x 25.8 / R_hot) flow; the copper loss is then the pack's 51.6 W
    data = build(None)
    data["controller"] = {"battery_current_limit": "2 A"}
    findings, figures, _ = rule_outputs(RULE, data)
    assert figure(figures, "input power") == pytest.approx(2 * 12 * 2.15, rel=1e-6)
    assert figure(figures, "copper loss") == pytest.approx(2 * 12 * 2.15, rel=1e-6)
    assert "battery current limit" in findings[0].rationale


def test_the_loop_outside_the_winding_counts_in_the_power_drawn() -> None:
    # energy balance at a locked rotor: the pack delivers I^2 (R_hot + R_series), with R_series
    # the motor's own leads (CRC handbook: 14 AWG 8.286 ohm/km at 20 degC) and the pack
    # (12 cells x 0.01 ohm / 1 string); the winding takes only its I^2 R_hot share of it
    lead = {"name": "lead", "circuit": "motor", "gauge": "14 AWG", "length": "1 m"}
    data = build(None)
    data["battery"].update(cell_internal_resistance="0.01 ohm", cells_parallel=1)
    data["wires"] = [lead]
    findings, figures, _ = rule_outputs(RULE, data)
    series = 8.286e-3 + 12 * 0.01
    hot = 0.3 * (234.5 + findings[0].measured.m_as("degC")) / 254.5  # IEC 60028 basis
    current = 12 * 2.15 / (hot + series)  # voltage-fed: no limit (Linden, from memory)
    assert figure(figures, "input power") == pytest.approx(current**2 * (hot + series), rel=1e-4)
    assert figure(figures, "copper loss") == pytest.approx(current**2 * hot, rel=1e-4)


def test_the_cold_stall_current_is_quoted_at_20_degc() -> None:
    # Chapman (from memory): a locked rotor draws V / R cold; 25.8 V over 0.3 ohm is 86 A
    finding = only(run_rule_on(RULE, build(None)))
    assert "draws 86 A cold" in finding.rationale


def test_another_motors_missing_winding_is_named_for_the_stall() -> None:
    # the stall loop shares the pack between motors: each one's current needs every winding
    second = {**copy.deepcopy(MOTOR), "name": "front"}
    del second["winding_resistance"]
    data = build(None)
    data["motors"].append(second)
    findings = run_rule_on(RULE, data)
    rear = next(f for f in findings if f.subject == "motor 'rear'")
    assert rear.severity is Severity.UNASSESSED
    assert "motors[1].winding_resistance" in rear.missing
    assert "motors[0].winding_resistance" not in rear.missing
