"""One brushless build with separate battery and motor limits tells one story across the rules:
battery wires, fuse and pack at battery current; phase leads at the motor current (issue 10).

The build is invented: a 10S li-ion pack (42 V full, 36 V nominal; Linden, from memory), a hub
motor of 0.2 ohm line to line, a controller limiting the pack to 15 A and the phase current to
35 A peak under field-oriented drive, with a hardware limit acting in 1 ms. Wire resistances
come from the CRC handbook table (ohm/km at 20 degC), not from the rule's code.
"""

from __future__ import annotations

import math

import pytest
from firstride_rules.battery.discharge import RULE as DISCHARGE
from firstride_rules.protection.fuse import RULE as FUSE
from firstride_rules.wiring.stall_current import RULE as WIRING

from reviewer.findings import Finding, Severity
from reviewer.testing import rule_outputs, run_rule_on

CRC_OHM_PER_KM = {12: 5.211, 16: 13.17}  # CRC handbook, copper at 20 degC
PACK_FULL = 10 * 4.2  # li-ion, from memory (Linden)
SQRT3_OVER_2 = math.sqrt(3) / 2  # brief 11, three-phase power balance


def lead(name: str, gauge: int, circuit: str, length: str = "0.4 m") -> dict:
    return {
        "name": name,
        "circuit": circuit,
        "gauge": f"{gauge} AWG",
        "length": length,
        "insulation": "silicone",
        "temperature_rating": "200 degC",
    }


def scooter(**controller: str) -> dict:
    limits = {
        "drive": "field-oriented",
        "motor_current_limit": "35 A",
        "motor_current_basis": "peak",
        "battery_current_limit": "15 A",
        "current_limit_kind": "hardware",
        "current_limit_response": "1 ms",
    }
    limits.update(controller)
    return {
        "battery": {
            "chemistry": "li-ion",
            "cells_series": 10,
            "cells_parallel": 3,
            "cell_continuous_current": "10 A",
        },
        "motors": [
            {
                "name": "hub",
                "type": "brushless",
                "kv": "12 rpm/V",
                "winding_resistance": "0.2 ohm",
                "rated_current": "10 A",
            }
        ],
        "controller": {k: v for k, v in limits.items() if v},
        "wires": [
            lead("pack positive", 12, "battery"),
            lead("pack negative", 12, "battery"),
            lead("phase U", 16, "phase", "0.6 m"),
            lead("phase V", 16, "phase", "0.5 m"),
            lead("phase W", 16, "phase", "0.7 m"),
        ],
        "fuses": [
            {
                "name": "main",
                "location": "battery-positive",
                "rating": "20 A",
                "voltage_rating": "58 V",
                "breaking_capacity": "1000 A",
            }
        ],
    }


def on(findings: list[Finding], subject: str) -> Finding:
    return next(f for f in findings if f.subject == subject)


def test_a_battery_wire_is_judged_at_the_battery_limit_not_the_phase_limit() -> None:
    finding = on(run_rule_on(WIRING, scooter()), "wire 'pack positive'")
    assert finding.measured.m_as("A") == pytest.approx(15.0)
    assert "draws from the pack" in finding.rationale


def test_a_phase_lead_is_judged_at_the_peak_phase_current() -> None:
    # brief 11: I_dc = (sqrt 3 / 2) I_pk, and a locked rotor holds the whole peak in one phase
    finding = on(run_rule_on(WIRING, scooter()), "wire 'phase U'")
    assert finding.measured.m_as("A") == pytest.approx(35.0)
    rms = on(run_rule_on(WIRING, scooter(motor_current_basis="rms")), "wire 'phase U'")
    assert rms.measured.m_as("A") == pytest.approx(35.0 * math.sqrt(2))  # I_pk = sqrt 2 I_rms


def test_an_unstated_basis_reads_the_larger_current_and_says_so() -> None:
    findings, _, assumptions = rule_outputs(WIRING, scooter(motor_current_basis=""))
    assert on(findings, "wire 'phase U'").measured.m_as("A") == pytest.approx(35.0 * math.sqrt(2))
    assert any("motor_current_basis" in a.text for a in assumptions)


def test_the_stall_runs_line_to_line_through_the_two_lightest_phase_leads() -> None:
    # circuit theory: a locked star winding carries its current through two phases, R_LL;
    # the 0.5 m and 0.6 m leads are the pair of least resistance
    r_battery = 2 * 0.4 * CRC_OHM_PER_KM[12] / 1000
    r_phases = (0.5 + 0.6) * CRC_OHM_PER_KM[16] / 1000
    expected = PACK_FULL / (r_battery + r_phases + 0.2)
    finding = on(run_rule_on(WIRING, scooter()), "wire 'phase U'")
    assert f"{expected:.3g}" in finding.rationale


def test_a_battery_limit_alone_holds_a_stalled_motor_far_above_itself() -> None:
    # brief 11: at a stall I_battery ~ I_motor^2 R / V, so a 15 A battery limit lets the motor
    # current rise to sqrt(15 A x V / R), peak phase current that / (sqrt 3 / 2)
    r_loop = 0.2 + 2 * 0.4 * CRC_OHM_PER_KM[12] / 1000 + (0.5 + 0.6) * CRC_OHM_PER_KM[16] / 1000
    motor = math.sqrt(15 * PACK_FULL / r_loop)
    finding = on(run_rule_on(WIRING, scooter(motor_current_limit="")), "wire 'phase U'")
    assert finding.measured.m_as("A") == pytest.approx(motor / SQRT3_OVER_2, rel=1e-3)
    assert finding.severity is Severity.FIX  # 16 AWG does not carry about 62 A
    assert "draw from the pack at a stall is the battery limit" in finding.rationale


def test_the_fuse_and_the_pack_see_the_battery_limit() -> None:
    fuse = on(run_rule_on(FUSE, scooter()), "fuse 'main' rating")
    assert "15 A" in fuse.rationale and "35 A" not in fuse.rationale
    demand = [f for f in run_rule_on(DISCHARGE, scooter()) if isinstance(f, Finding)]
    pack = next(f for f in demand if f.measured is not None and f.rule_id == DISCHARGE.id)
    assert pack.measured.m_as("A") == pytest.approx(15.0)
    assert pack.severity is Severity.PASS  # 3 strings x 10 A = 30 A


def test_a_software_limit_of_unstated_kind_is_never_credited_with_a_stated_response() -> None:
    # a limit of unknown kind is read as software: without its averaging window it acts
    # within the profile's assumed clearing time (1 s), stated, not the 1 ms the build gives
    _, _, assumptions = rule_outputs(WIRING, scooter(current_limit_kind=""))
    text = "How soon the software (kind unstated) current limit acts is not known"
    assert any(text in a.text and "1 s" in a.text for a in assumptions)
    assert any("current_limit_kind not given: taken as software" in a.text for a in assumptions)
    windowed = scooter(
        current_limit_kind="software", current_samples_averaged=20, current_sample_rate="1 kHz"
    )
    phase = on(run_rule_on(WIRING, windowed), "wire 'phase U'")
    assert "after its averaging window" in phase.rationale
    assert "0.02 s" in phase.rationale  # 20 samples / 1 kHz
