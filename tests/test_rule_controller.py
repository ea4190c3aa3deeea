"""controller.switch-thermal, controller.freewheel and controller.current-sense."""

from __future__ import annotations

import copy
import re
from typing import Any

import pytest
from firstride_rules.controller.current_sense import RULE as CURRENT_SENSE
from firstride_rules.controller.freewheel import RULE as FREEWHEEL
from firstride_rules.controller.switch_thermal import RULE as SWITCH_THERMAL

from reviewer.findings import Comparison, Finding, Severity
from reviewer.testing import rule_outputs, run_rule_on

# Invented parts: a 7S li-ion pack (29.4 V full, 4.2 V a cell, Linden, from memory), a brushed
# motor of 0.25 ohm, and a controller with a 10 mOhm switch on a heatsink.
FULL_VOLTAGE = 7 * 4.2
WINDING = 0.25
SWITCH = 0.010
STALL = FULL_VOLTAGE / (WINDING + SWITCH)  # Chapman (from memory): V / R_loop = 113.1 A
HOT_FACTOR = 1.7  # the default profile's Rds(on) rise, from memory
MOTOR: dict[str, Any] = {
    "name": "rear",
    "type": "brushed",
    "kv": "100 rpm/V",
    "winding_resistance": f"{WINDING} ohm",
    "rated_current": "20 A",
    "insulation_class": "F",
}
CONTROLLER: dict[str, Any] = {
    "motor_current_limit": "20 A",
    "current_limit_kind": "software",
    "pwm_frequency": "4 kHz",
    "switch_on_resistance": f"{SWITCH} ohm",
    "switch_max_current": "60 A",
    "switch_rise_time": "100 ns",
    "switch_fall_time": "100 ns",
    "switch_max_junction_temperature": "150 degC",
    "switch_thermal_resistance_junction_case": "1 K/W",
    "switch_thermal_resistance_case_sink": "0.5 K/W",
    "switch_thermal_resistance_sink_air": "4 K/W",
    "freewheel_diode": True,
    "diode_reverse_voltage": "60 V",
    "diode_average_current": "20 A",
    "diode_peak_current": "40 A",
    "current_sensor_range": "150 A",
    "current_samples_averaged": 200,
    "current_sample_rate": "10 kHz",
}


def build(motor: dict[str, Any] | None = None, **controller: Any) -> dict[str, Any]:
    """The base build; a controller field set to None is left out."""
    fields = {**copy.deepcopy(CONTROLLER), **controller}
    return {
        "battery": {"chemistry": "li-ion", "cells_series": 7},
        "motors": [{**copy.deepcopy(MOTOR), **(motor or {})}],
        "controller": {k: v for k, v in fields.items() if v is not None},
        "usage": {"ambient_temperature": "25 degC"},
    }


def by_subject(findings: list[Finding], subject: str) -> Finding:
    matches = [f for f in findings if f.subject == subject]
    assert len(matches) == 1, [f.subject for f in findings]
    return matches[0]


def figure(figures: list, name: str) -> float:
    matches = [f for f in figures if f.name == name]
    assert len(matches) == 1, [f.name for f in figures]
    return float(matches[0].value.magnitude)


def junction(findings: list[Finding]) -> Finding:
    """The junction-temperature finding (the switch's current rating is judged beside it)."""
    return next(f for f in findings if f.subject != "controller switch current rating")


def number_in(text: str | None, pattern: str) -> float:
    assert text is not None
    match = re.search(pattern, text)
    assert match, text
    return float(match.group(1))


def test_rule_ids() -> None:
    assert [r.id for r in (SWITCH_THERMAL, FREEWHEEL, CURRENT_SENSE)] == [
        "controller.switch-thermal",
        "controller.freewheel",
        "controller.current-sense",
    ]


# --- controller.switch-thermal ------------------------------------------------------------------


def test_switch_losses_and_junction_temperature_by_hand() -> None:
    findings, figures, _ = rule_outputs(SWITCH_THERMAL, build())
    # P = I^2 R D: 20 A through 10 mOhm x 1.7 (hot) at D = 1 is 6.8 W
    conduction = 20.0**2 * SWITCH * HOT_FACTOR
    assert figure(figures, "switch conduction loss") == pytest.approx(conduction)
    # from memory: Mohan, Undeland and Robbins, 0.5 V I (tr + tf) f_sw
    # 0.5 x 29.4 V x 20 A x 200 ns x 4 kHz = 0.2352 W
    switching = 0.5 * FULL_VOLTAGE * 20.0 * 200e-9 * 4e3
    assert figure(figures, "switch switching loss") == pytest.approx(switching)
    # from memory: JEDEC JESD51, Tj = Ta + P (1 + 0.5 + 4 K/W) = 25 + 7.035 x 5.5 = 63.7 degC
    junction = 25.0 + (conduction + switching) * 5.5
    assert figure(figures, "switch junction temperature") == pytest.approx(junction)
    finding = by_subject(findings, "controller switch")
    assert finding.severity is Severity.PASS
    assert finding.limit.m_as("degC") == pytest.approx(150.0 - 25.0)  # rating less the margin
    assert finding.remedy is None


@pytest.mark.parametrize(
    ("sink_air", "severity"),
    [
        ("4 K/W", Severity.PASS),  # JESD51 sum: 63.7 degC
        ("14.5 K/W", Severity.FIX),  # 25 + 7.035 x 16 = 137.6 degC: under 150, over 125
        ("20 K/W", Severity.STOP),  # 25 + 7.035 x 21.5 = 176.3 degC: over the 150 degC rating
    ],
)
def test_junction_against_rating_and_margin(sink_air: str, severity: Severity) -> None:
    finding = junction(
        run_rule_on(SWITCH_THERMAL, build(switch_thermal_resistance_sink_air=sink_air))
    )
    assert finding.severity is severity


def test_hot_switch_remedies_each_pass_when_rerun() -> None:
    # JEDEC JESD51 sum: each remedy value alone brings Tj to 125 degC or below
    finding = junction(
        run_rule_on(SWITCH_THERMAL, build(switch_thermal_resistance_sink_air="20 K/W"))
    )
    assert finding.severity is Severity.STOP
    sink = number_in(finding.remedy, r"heatsink of at most ([\d.]+) K/W")
    amps = number_in(finding.remedy, r"motor_current_limit at or below ([\d.]+) A")
    milliohm = number_in(finding.remedy, r"switch of at most ([\d.]+) mΩ")
    reruns = [
        build(switch_thermal_resistance_sink_air=f"{sink} K/W"),
        build(switch_thermal_resistance_sink_air="20 K/W", motor_current_limit=f"{amps} A"),
        build(switch_thermal_resistance_sink_air="20 K/W", switch_on_resistance=f"{milliohm} mohm"),
    ]
    for data in reruns:
        assert junction(run_rule_on(SWITCH_THERMAL, data)).severity is Severity.PASS
    # and the current is the highest tenth of an ampere that passes
    over = build(
        switch_thermal_resistance_sink_air="20 K/W", motor_current_limit=f"{amps + 0.1:.1f} A"
    )
    assert junction(run_rule_on(SWITCH_THERMAL, over)).severity is not Severity.PASS


def test_max_duty_scales_the_conduction_loss() -> None:
    # P = I^2 R D: half the duty, half the conduction loss
    _, full, assumptions = rule_outputs(SWITCH_THERMAL, build())
    _, half, _ = rule_outputs(SWITCH_THERMAL, build(max_duty="50 %"))
    assert figure(half, "switch conduction loss") == pytest.approx(
        0.5 * figure(full, "switch conduction loss")
    )
    assert any("D = 1" in a.text for a in assumptions)


def test_no_current_limit_checks_the_stall_current() -> None:
    # Chapman (from memory): with no limit the switch carries V / R_loop = 113 A
    findings, figures, assumptions = rule_outputs(SWITCH_THERMAL, build(motor_current_limit=None))
    assert figure(figures, "switch conduction loss") == pytest.approx(
        STALL**2 * SWITCH * HOT_FACTOR
    )
    finding = junction(findings)
    assert finding.severity is Severity.STOP  # 217 W into 5.5 K/W
    assert "fit a current limit" in finding.remedy
    assert any("No controller current limit" in a.text for a in assumptions)


def test_default_ambient_is_flagged() -> None:
    data = build()
    del data["usage"]
    _, figures, assumptions = rule_outputs(SWITCH_THERMAL, data)
    assert any("usage.ambient_temperature not given" in a.text for a in assumptions)
    # JEDEC JESD51 sum from the profile's 35 degC: 35 + 7.035 W x 5.5 K/W = 73.7 degC
    assert figure(figures, "switch junction temperature") == pytest.approx(73.69, abs=0.01)


def test_switch_thermal_names_missing_fields() -> None:
    data = build()
    data["controller"] = {"motor_current_limit": "20 A"}
    finding = junction(run_rule_on(SWITCH_THERMAL, data))
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == (
        "controller.switch_on_resistance",
        "controller.switch_rise_time",
        "controller.switch_fall_time",
        "controller.pwm_frequency",
        "controller.switch_max_junction_temperature",
        "controller.switch_thermal_resistance_junction_case",
        "controller.switch_thermal_resistance_case_sink",
        "controller.switch_thermal_resistance_sink_air",
    )


def test_switch_thermal_without_limit_or_stall_inputs() -> None:
    data = build(motor_current_limit=None)
    del data["battery"]
    finding = junction(run_rule_on(SWITCH_THERMAL, data))
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("battery", "controller.motor_current_limit")


def test_no_controller_names_every_switch_field() -> None:
    data = build()
    del data["controller"]
    finding = junction(run_rule_on(SWITCH_THERMAL, data))
    assert finding.severity is Severity.UNASSESSED
    # the eight switch fields; the current is known without a limit (the stall current)
    assert len(finding.missing) == 8
    assert "controller.motor_current_limit" not in finding.missing
    freewheel = run_rule_on(FREEWHEEL, data)[0]
    assert freewheel.severity is Severity.UNASSESSED
    assert freewheel.missing == ("controller.freewheel_diode",)


# --- controller.freewheel -----------------------------------------------------------------------


def test_freewheel_diode_keeps_the_switch_cool() -> None:
    # common practice: a freewheel diode across the motor keeps the switch cool; a build
    # without one is STOP, with one the switch thermal check passes
    without = run_rule_on(FREEWHEEL, build(freewheel_diode=False))
    assert [f.severity for f in without] == [Severity.STOP]
    assert "avalanche" in without[0].rationale
    with_diode = run_rule_on(FREEWHEEL, build())
    assert {f.severity for f in with_diode} == {Severity.PASS}
    assert junction(run_rule_on(SWITCH_THERMAL, build())).severity is Severity.PASS


def test_missing_diode_remedy_names_ratings_that_pass() -> None:
    finding = run_rule_on(FREEWHEEL, build(freewheel_diode=False))[0]
    volts = number_in(finding.remedy, r"at least (\d+) V reverse")
    average = number_in(finding.remedy, r"(\d+) A average")
    peak = number_in(finding.remedy, r"(\d+) A peak")
    assert volts == 37  # 29.4 V x 1.25 (common practice) = 36.75 V, rounded up
    assert peak == 20  # the current limit
    rerun = build(
        diode_reverse_voltage=f"{volts} V",
        diode_average_current=f"{average} A",
        diode_peak_current=f"{peak} A",
    )
    assert {f.severity for f in run_rule_on(FREEWHEEL, rerun)} == {Severity.PASS}


def test_worst_average_diode_current_at_the_limit() -> None:
    # I (1 - D) (from memory) at the duty that holds a locked rotor at the 20 A limit:
    # D = 20 A x 0.26 ohm / 29.4 V = 0.177, so 20 x 0.823 = 16.5 A
    duty = 20.0 * (WINDING + SWITCH) / FULL_VOLTAGE
    expected = 20.0 * (1 - duty)
    findings, figures, _ = rule_outputs(FREEWHEEL, build(diode_average_current="15 A"))
    assert figure(figures, "freewheel diode average current, worst duty") == pytest.approx(expected)
    finding = by_subject(findings, "freewheel diode average current")
    assert finding.severity is Severity.FIX
    assert finding.comparison is Comparison.AT_LEAST
    assert finding.limit.m_as("A") == pytest.approx(expected)
    assert "17 A average" in finding.remedy


def test_without_a_limit_the_diode_sees_a_quarter_of_the_stall_current() -> None:
    # derived from I (1 - D) with I = D I_stall: largest at D = 0.5, I_stall / 4 = 28.3 A;
    # the peak is the whole stall current (Chapman, from memory)
    findings, _, _ = rule_outputs(FREEWHEEL, build(motor_current_limit=None))
    average = by_subject(findings, "freewheel diode average current")
    assert average.limit.m_as("A") == pytest.approx(STALL / 4)
    assert average.severity is Severity.FIX  # 20 A rating
    peak = by_subject(findings, "freewheel diode peak current")
    assert peak.limit.m_as("A") == pytest.approx(STALL)
    assert peak.severity is Severity.FIX


def test_low_reverse_rating_is_fix() -> None:
    # common practice: 1.25 x the 29.4 V full pack = 36.75 V; a 35 V diode is short
    finding = by_subject(
        run_rule_on(FREEWHEEL, build(diode_reverse_voltage="35 V")),
        "freewheel diode reverse voltage",
    )
    assert finding.severity is Severity.FIX
    assert finding.limit.m_as("V") == pytest.approx(FULL_VOLTAGE * 1.25)
    assert finding.remedy == "use a diode with a reverse rating of at least 37 V"
    rerun = build(diode_reverse_voltage="37 V")
    assert by_subject(run_rule_on(FREEWHEEL, rerun), finding.subject).severity is Severity.PASS


def test_reverse_rating_below_the_full_pack_is_stop() -> None:
    # a 25 V diode under a 29.4 V full pack (4.2 V a cell, from memory) breaks down while the
    # switch conducts: a stop, as voltage.ratings judges the same diode (it was a fix here)
    finding = by_subject(
        run_rule_on(FREEWHEEL, build(diode_reverse_voltage="25 V")),
        "freewheel diode reverse voltage",
    )
    assert finding.severity is Severity.STOP
    assert "below the 29.4 V it sees" in finding.rationale


@pytest.mark.parametrize("rating", ["25 V", "29.4 V", "35 V", "36.75 V", "60 V", None])
def test_reverse_rating_is_judged_as_voltage_ratings_judges_it(rating: str | None) -> None:
    # one diode, one judgement: the same severity, limit, words and remedy in both rules
    from firstride_rules.voltage.ratings import RULE as VOLTAGE

    data = build(diode_reverse_voltage=rating)
    ours = by_subject(run_rule_on(FREEWHEEL, data), "freewheel diode reverse voltage")
    theirs = by_subject(run_rule_on(VOLTAGE, data), "freewheel diode")
    assert ours.severity is theirs.severity
    assert (ours.measured, ours.limit, ours.comparison) == (
        theirs.measured,
        theirs.limit,
        theirs.comparison,
    )
    assert (ours.rationale, ours.remedy, ours.missing) == (
        theirs.rationale,
        theirs.remedy,
        theirs.missing,
    )


def test_unknown_stall_takes_the_whole_limit_as_average() -> None:
    # I (1 - D) bounded by I as D -> 0
    data = build()
    del data["motors"][0]["winding_resistance"]
    findings, _, assumptions = rule_outputs(FREEWHEEL, data)
    average = by_subject(findings, "freewheel diode average current")
    assert average.limit.m_as("A") == pytest.approx(20.0)
    assert any("Stall current unknown" in a.text for a in assumptions)


def test_freewheel_unknown_is_unassessed() -> None:
    finding = run_rule_on(FREEWHEEL, build(freewheel_diode=None))[0]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("controller.freewheel_diode",)


def test_diode_ratings_missing_are_named() -> None:
    data = build(diode_reverse_voltage=None, diode_average_current=None, diode_peak_current=None)
    findings = run_rule_on(FREEWHEEL, data)
    assert {f.severity for f in findings} == {Severity.UNASSESSED}
    assert sorted(m for f in findings for m in f.missing) == [
        "controller.diode_average_current",
        "controller.diode_peak_current",
        "controller.diode_reverse_voltage",
    ]


def test_brushless_only_passes_and_no_motor_is_unassessed() -> None:
    # from memory: an inverter bridge's antiparallel diodes freewheel each phase
    finding = run_rule_on(FREEWHEEL, build({"type": "brushless"}, freewheel_diode=False))[0]
    assert finding.severity is Severity.PASS
    assert "brushless" in finding.rationale
    data = build()
    data["motors"] = []
    finding = run_rule_on(FREEWHEEL, data)[0]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("motors",)


# --- controller.current-sense -------------------------------------------------------------------


def test_whole_period_window_passes_and_reports_response_time() -> None:
    # common practice: 200 samples at 10 kHz = 20 ms = 80 whole periods of a 4 kHz PWM
    findings, figures, _ = rule_outputs(CURRENT_SENSE, build())
    assert by_subject(findings, "current averaging window").severity is Severity.PASS
    assert figure(figures, "current limit response time") == pytest.approx(20.0)  # ms
    assert {f.severity for f in findings} == {Severity.PASS}


def test_part_period_window_is_fix_and_its_remedies_pass() -> None:
    # common practice: 200 samples at 12 kHz = 16.67 ms = 83.3 periods of a 5 kHz PWM: fails
    data = build(current_sample_rate="12 kHz", pwm_frequency="5 kHz")
    finding = by_subject(run_rule_on(CURRENT_SENSE, data), "current averaging window")
    assert finding.severity is Severity.FIX
    assert "83.33 periods" in finding.rationale
    count = int(number_in(finding.remedy, r"average (\d+) samples"))
    assert count == 204  # 12 samples per 5 periods; 204 samples = 85 periods
    pwm = number_in(finding.remedy, r"PWM frequency to ([\d.]+) kHz")
    assert pwm == pytest.approx(4.98)  # 83 periods in 16.67 ms
    for fix in (
        build(current_sample_rate="12 kHz", pwm_frequency="5 kHz", current_samples_averaged=count),
        build(current_sample_rate="12 kHz", pwm_frequency=f"{pwm} kHz"),
    ):
        rerun = by_subject(run_rule_on(CURRENT_SENSE, fix), "current averaging window")
        assert rerun.severity is Severity.PASS


def test_window_shorter_than_one_period_is_fix() -> None:
    # common practice: 10 samples at 100 kHz = 0.1 ms, under one 0.25 ms period of 4 kHz
    data = build(current_samples_averaged=10, current_sample_rate="100 kHz")
    finding = by_subject(run_rule_on(CURRENT_SENSE, data), "current averaging window")
    assert finding.severity is Severity.FIX
    assert "shorter than one period" in finding.rationale


@pytest.mark.parametrize(
    ("sensor", "severity"),
    [
        ("150 A", Severity.PASS),  # above the 113 A stall current
        ("50 A", Severity.FIX),  # above the 20 A limit, below the stall current
        ("15 A", Severity.STOP),  # below the limit itself
    ],
)
def test_sensor_range_against_stall_and_limit(sensor: str, severity: Severity) -> None:
    # common practice: a saturated sensor hides the current the limit must see
    findings = run_rule_on(CURRENT_SENSE, build(current_sensor_range=sensor))
    finding = by_subject(findings, "current sensor range")
    assert finding.severity is severity
    if severity is not Severity.PASS:
        amps = number_in(finding.remedy, r"at least (\d+) A")
        assert amps == 114  # the stall current, 113.1 A, rounded up
        rerun = run_rule_on(CURRENT_SENSE, build(current_sensor_range=f"{amps} A"))
        assert by_subject(rerun, "current sensor range").severity is Severity.PASS


def test_limit_above_rated_current_is_advice() -> None:
    # P = I^2 R: 20 A against a 12 A rating is (20 / 12)^2 = 2.78 x the rated copper loss
    findings = run_rule_on(CURRENT_SENSE, build({"rated_current": "12 A"}))
    finding = by_subject(findings, "current limit against motor 'rear'")
    assert finding.severity is Severity.ADVISE
    assert "2.78 x" in finding.rationale
    assert "motor.cooling" in finding.rationale
    assert "at or below 12 A" in finding.remedy


def test_no_sensor_with_software_limit_is_unassessed() -> None:
    data = build(current_sensor_range=None, current_samples_averaged=None, current_sample_rate=None)
    finding = by_subject(run_rule_on(CURRENT_SENSE, data), "current sensor")
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == (
        "controller.current_sensor_range",
        "controller.current_samples_averaged",
        "controller.current_sample_rate",
    )


def test_no_sensor_and_hardware_limit_passes_with_reason() -> None:
    data = build(
        current_limit_kind="hardware",
        current_sensor_range=None,
        current_samples_averaged=None,
        current_sample_rate=None,
    )
    finding = by_subject(run_rule_on(CURRENT_SENSE, data), "current sensor")
    assert finding.severity is Severity.PASS
    assert "no sampled current measurement" in finding.rationale


def test_no_controller_has_no_sensed_limit() -> None:
    data = build()
    del data["controller"]
    findings = run_rule_on(CURRENT_SENSE, data)
    assert [(f.subject, f.severity) for f in findings] == [("current sensor", Severity.PASS)]
    assert "No controller is described" in findings[0].rationale


def test_missing_sense_inputs_are_named() -> None:
    data = build(pwm_frequency=None)
    del data["motors"][0]["rated_current"]
    findings = run_rule_on(CURRENT_SENSE, data)
    window = by_subject(findings, "current averaging window")
    assert window.severity is Severity.UNASSESSED
    assert window.missing == ("controller.pwm_frequency",)
    rating = by_subject(findings, "current limit against motor 'rear'")
    assert rating.severity is Severity.UNASSESSED
    assert rating.missing == ("motors[0].rated_current",)
