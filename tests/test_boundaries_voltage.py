"""voltage.ratings and the shared voltage-rating judgement on ratings exactly on their limits:
each test answers a mutant that survived the rules' own tests (benchmarks/mutation_score.py on
rules/voltage/ratings.py and rules/_shared/voltage_rating.py).

A 10-cell Li-ion pack is 42 V full (from memory: Linden, 4.2 V per cell). The margins are the
default profile's (common practice): switch 1.25 x full with a clamp, 2 x without; motor
overspeed advise above 1.25 x, fix above 1.5 x.
"""

from __future__ import annotations

import pytest
from firstride_rules.voltage.ratings import RULE

from reviewer.findings import Severity
from reviewer.testing import rule_outputs, run_rule_on

TEN_CELL = {"chemistry": "li-ion", "cells_series": 10}  # 42 V full, from memory (Linden)


def by_subject(**parts):
    return {f.subject: f for f in run_rule_on(RULE, {"battery": TEN_CELL, **parts})}


def hub(rated):
    return {"name": "hub", "type": "brushed", "rated_voltage": rated}


# --- motor overspeed ratio: full / rated --------------------------------------------------------


@pytest.mark.parametrize(
    ("rated", "severity"),
    [
        ("33.6 V", Severity.PASS),  # common practice: 42 / 33.6 = 1.25, at the advise line
        ("33.5 V", Severity.ADVISE),  # 42 / 33.5 = 1.254, just over it
        ("28 V", Severity.ADVISE),  # common practice: 42 / 28 = 1.5, at the fix line
        ("27.9 V", Severity.FIX),  # 42 / 27.9 = 1.505, just over it
    ],
)
def test_overspeed_ratio_exactly_on_each_line(rated, severity):
    assert by_subject(motors=[hub(rated)])["motor 'hub'"].severity is severity


def test_the_cells_offered_are_the_most_that_stay_within_the_margin():
    # common practice: a 26.88 V motor may see 1.25 x 26.88 = 33.6 V, exactly 8 x 4.2 V
    # (Linden, from memory), so 8 cells in series still pass and are the figure to offer
    finding = by_subject(motors=[hub("26.88 V")])["motor 'hub'"]
    assert finding.severity is Severity.FIX  # 42 / 26.88 = 1.5625
    assert finding.remedy == (
        "use at most 8 cells in series (33.6 V full); or use a motor rated at least 34 V"
    )
    eight = {"chemistry": "li-ion", "cells_series": 8}
    result = run_rule_on(RULE, {"battery": eight, "motors": [hub("26.88 V")]})
    assert result[0].severity is Severity.PASS


def test_a_single_cell_is_still_offered():
    # common practice: 1.25 x 4 V = 5 V allows one 4.2 V cell (Linden, from memory)
    finding = by_subject(motors=[hub("4 V")])["motor 'hub'"]
    assert finding.remedy.startswith("use at most 1 cells in series (4.2 V full); or ")


# --- ratings exactly at what they see and at their margin -------------------------------------


def fuse(voltage):
    return {
        "name": "main",
        "location": "battery-positive",
        "rating": "20 A",
        "voltage_rating": voltage,
    }


def test_a_fuse_rated_exactly_at_the_full_pack_passes():
    # ISO 8820-3: a fuse interrupts at or below its rated voltage, so 42 V on 42 V holds
    assert by_subject(fuses=[fuse("42 V")])["fuse 'main'"].severity is Severity.PASS
    assert by_subject(fuses=[fuse("41.9 V")])["fuse 'main'"].severity is Severity.STOP


def test_a_switch_exactly_at_the_full_pack_is_short_of_the_margin_not_below_it():
    # common practice: the clamped switch needs 1.25 x 42 = 52.5 V; at 42 V it sees the
    # pack (not a stop) but lacks the margin (fix)
    controller = {"switch_max_voltage": "42 V", "freewheel_diode": True}
    controller["diode_reverse_voltage"] = "60 V"
    assert by_subject(controller=controller)["motor switch"].severity is Severity.FIX
    controller["switch_max_voltage"] = "52.5 V"
    assert by_subject(controller=controller)["motor switch"].severity is Severity.PASS


def bridge(rating):
    motor = {"name": "hub", "type": "brushless", "kv": "20 rpm/V"}
    return by_subject(motors=[motor], controller={"switch_max_voltage": rating})["bridge switches"]


def test_bridge_switches_need_the_clamped_margin():
    # Mohan, Undeland and Robbins (from memory): the bridge's own diodes clamp the spike, so
    # the clamped margin applies: 1.25 x 42 = 52.5 V (common practice)
    at = bridge("52.5 V")
    assert at.severity is Severity.PASS
    assert at.limit.m_as("V") == pytest.approx(52.5)
    short = bridge("50 V")
    assert short.severity is Severity.FIX
    assert short.remedy == "use bridge switches rated at least 53 V"


def test_a_switch_stated_without_a_diode_is_worded_so():
    # Mohan, Undeland and Robbins (from memory): unclamped, the spike needs 2 x 42 = 84 V
    findings, _, assumptions = rule_outputs(
        RULE,
        {
            "battery": TEN_CELL,
            "controller": {"switch_max_voltage": "60 V", "freewheel_diode": False},
        },
    )
    switch = next(f for f in findings if f.subject == "motor switch")
    assert "as no freewheel diode clamps the turn-off spike" in switch.rationale
    assert not any("freewheel_diode" in a.text for a in assumptions)


# --- the catch-all pass only where nothing else was judged ---------------------------------------


def test_no_catch_all_pass_beside_a_judged_part():
    # the rule's docstring: pass for "a build with no rated part besides the pack" only
    assert list(by_subject(fuses=[fuse("58 V")])) == ["fuse 'main'"]
    assert list(by_subject(motors=[hub("36 V")])) == ["motor 'hub'"]


def test_a_charger_exactly_at_the_full_pack_is_not_worded_as_above_it():
    # common practice: the logic may run while charging, so the regulator sees the higher of
    # charger and full pack; a 42 V charger on a 42 V pack is the pack's own voltage
    pack = {**TEN_CELL, "charger_voltage": "42 V"}
    logic = {"regulator": {"kind": "linear", "input_max": "60 V"}}
    finding = {f.subject: f for f in run_rule_on(RULE, {"battery": pack, "logic": logic})}[
        "logic regulator input"
    ]
    assert finding.severity is Severity.PASS
    assert "charger" not in finding.rationale
    assert "(the 42 V full pack)" in finding.rationale
