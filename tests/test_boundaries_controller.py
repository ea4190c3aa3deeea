"""controller.current-sense and controller.switch-thermal on values exactly on their limits, and
the figures their words quote: each test answers a mutant that survived the rules' own tests
(benchmarks/mutation_score.py on rules/controller/).

Invented parts: a 7S Li-ion pack (29.4 V full, 4.2 V a cell; Linden, from memory), a brushed
motor of 0.25 ohm behind a 20 A limit, a 10 mOhm switch at 4 kHz with 100 ns edges.
"""

from __future__ import annotations

import copy
from typing import Any

import pytest
from firstride_rules.controller.current_sense import RULE as CURRENT_SENSE
from firstride_rules.controller.switch_thermal import RULE as SWITCH_THERMAL

from reviewer.findings import Finding, Severity
from reviewer.testing import run_rule_on, variant

from .test_rule_controller import CONTROLLER, MOTOR
from .test_rule_sealed_controller import BUILD as SEALED_BUILD


def build(**controller: Any) -> dict[str, Any]:
    """The pack, motor and controller of tests/test_rule_controller.py, in 25 degC air."""
    return {
        "battery": {"chemistry": "li-ion", "cells_series": 7},
        "motors": [copy.deepcopy(MOTOR)],
        "controller": {**copy.deepcopy(CONTROLLER), **controller},
        "usage": {"ambient_temperature": "25 degC"},
    }


def on(rule, data: dict[str, Any], subject: str) -> Finding:
    (finding,) = [f for f in run_rule_on(rule, data) if f.subject == subject]
    return finding


# --- current-sense: the sensor's range -----------------------------------------------------------


def test_a_sensor_reading_exactly_the_limit_sees_it_but_not_the_stall():
    # the rule's docstring: stop only below the limit (the limit could never be seen); at the
    # 20 A limit it is a fix, below the 113 A cold stall (Ohm's law, 29.4 V / 0.26 ohm)
    at = on(CURRENT_SENSE, build(current_sensor_range="20 A"), "current sensor range")
    assert at.severity is Severity.FIX
    below = on(CURRENT_SENSE, build(current_sensor_range="19.9 A"), "current sensor range")
    assert below.severity is Severity.STOP


def test_a_sensor_reading_exactly_the_stall_current_passes():
    # Ohm's law: 29.4 V / (0.25 + 0.010) ohm = 113.1 A cold; a range reaching it (to the
    # float's last digit) does not saturate
    stall = on(CURRENT_SENSE, build(), "current sensor range").limit.m_as("A")
    assert stall == pytest.approx(29.4 / 0.26)
    at = on(CURRENT_SENSE, build(current_sensor_range=f"{stall!r} A"), "current sensor range")
    assert at.severity is Severity.PASS
    short = on(CURRENT_SENSE, build(current_sensor_range="113 A"), "current sensor range")
    assert short.severity is Severity.FIX


# --- current-sense: the averaging window ---------------------------------------------------------


def test_the_window_is_described_with_its_own_figures():
    # common practice: 200 samples at 10 kHz = 20 ms = 80 periods of a 4 kHz PWM
    finding = on(CURRENT_SENSE, build(), "current averaging window")
    assert finding.rationale.startswith(
        "200 samples at 10 kHz span 20 ms, 80 periods of the 4 kHz PWM: a whole number"
    )
    assert "A stall current flows up to 20 ms before the average shows it in full." in (
        finding.rationale
    )


def test_a_window_over_one_period_is_not_called_shorter_than_one():
    # common practice: 12 samples at 40 kHz = 0.3 ms = 1.2 periods of 4 kHz: 0.2 of a period
    # over a whole number, misreading a chopped average by up to 0.2 / 1.2 = 17 % of its peak
    data = build(current_samples_averaged=12, current_sample_rate="40 kHz")
    finding = on(CURRENT_SENSE, data, "current averaging window")
    assert finding.severity is Severity.FIX
    assert "shorter than one period" not in finding.rationale
    assert "0.2 of a period over a whole number" in finding.rationale
    assert "misread by up to 17 % of its peak" in finding.rationale


def test_the_window_remedy_quotes_periods_and_times_that_hold():
    # common practice: 12 samples span 5 periods of 5 kHz at 12 kHz, so 204 samples = 85
    # periods in 17 ms; or 83 whole periods in the 16.7 ms window of 200 samples at 4.98 kHz
    data = build(current_sample_rate="12 kHz", pwm_frequency="5 kHz")
    finding = on(CURRENT_SENSE, data, "current averaging window")
    assert finding.remedy == (
        "average 204 samples per update (85 whole PWM periods, 17 ms), or set the PWM "
        "frequency to 4.98 kHz (83 whole periods in the 16.7 ms window)"
    )


# --- switch-thermal: the junction on its target and on its rating --------------------------------

# Mohan, Undeland and Robbins (from memory): P = I^2 R_on,hot D + 0.5 V I (tr + tf) f_sw;
# 20^2 x 10 mOhm x 1.7 (the profile's hot factor, from memory) = 6.8 W and
# 0.5 x 29.4 V x 20 A x 200 ns x 4 kHz = 0.2352 W
LOSS_W = 20**2 * 0.010 * 1.7 + 0.5 * 29.4 * 20 * 200e-9 * 4000


def junction_with_sink(kelvin_per_watt: float) -> Finding:
    data = build(switch_thermal_resistance_sink_air=f"{kelvin_per_watt!r} K/W")
    (finding,) = [f for f in run_rule_on(SWITCH_THERMAL, data) if f.subject == "controller switch"]
    return finding


def test_a_junction_exactly_at_the_margin_target_passes():
    # JEDEC JESD51 (from memory): Tj = Ta + P (Rjc + Rcs + Rsa); 150 degC less the profile's
    # 25 K margin (common practice) is 125 degC, reached at Rsa = 100 K / P - 1.5 K/W
    finding = junction_with_sink(100.0 / LOSS_W - 1.5)
    assert finding.measured.m_as("degC") == pytest.approx(125.0)
    assert finding.severity is Severity.PASS
    assert junction_with_sink(100.5 / LOSS_W - 1.5).severity is Severity.FIX


def test_a_junction_exactly_at_its_rating_is_fix_not_stop():
    # JEDEC JESD51 (from memory): at Rsa = 125 K / P - 1.5 K/W the junction sits at its 150 degC
    # rating: within it (not a stop), but without the margin (fix)
    finding = junction_with_sink(125.0 / LOSS_W - 1.5)
    assert finding.measured.m_as("degC") == pytest.approx(150.0)
    assert finding.severity is Severity.FIX
    assert junction_with_sink(125.5 / LOSS_W - 1.5).severity is Severity.STOP


# --- switch-thermal: a sealed controller judged by its datasheet (rules/controller/_datasheet.py)

# tests/test_rule_sealed_controller.py's hub build, its limit raised to the 30 A continuous rating
SEALED = variant(SEALED_BUILD, controller__motor_current_limit="30 A")


def test_a_limit_exactly_at_the_continuous_rating_passes_and_says_it_is_held():
    # the controller's datasheet (builder's figures): a locked rotor held at the 30 A limit
    # (below sqrt(15 A x 42 V / 0.54 ohm) = 34.2 A, the battery limit's power balance) is
    # within a 30 A continuous rating; only the continuous rating is held while it stays locked
    found = {f.subject: f for f in run_rule_on(SWITCH_THERMAL, SEALED)}
    continuous = found["controller continuous rating"]
    assert continuous.measured.m_as("A") == pytest.approx(30.0)
    assert continuous.severity is Severity.PASS
    assert "(held for as long as the wheel stays locked)" in continuous.rationale
    assert "held for as long" not in found["controller peak rating"].rationale


def test_the_junction_finding_quotes_the_losses_it_worked_out():
    # Mohan, Undeland and Robbins (from memory): 20^2 x 10 mOhm x 1.7 = 6.8 W conducting at
    # 100 % duty, 0.235 W switching; JEDEC JESD51 (from memory): 25 degC + 7.04 W x 5.5 K/W
    finding = junction_with_sink(4.0)
    assert finding.rationale == (
        "At 20 A (the current limit) and 100 % duty, the switch loses 6.8 W in conduction "
        "(17 mΩ hot, 1.7 x its 25 °C figure) and 0.235 W in switching at 29.4 V and 4 kHz. "
        "7.04 W through 5.5 K/W from 25 °C puts the junction at 63.7 °C; it is rated 150 °C "
        "and the profile keeps 25 K in hand (125 °C)."
    )
