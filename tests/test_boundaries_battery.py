"""battery.discharge, battery.protection and charging.ratings (the charger voltage) on values
exactly on their limits: each test answers a mutant that survived the rules' own tests
(benchmarks/mutation_score.py on rules/battery/ and rules/charging/ratings.py).

Cell voltages are from memory (Linden, Handbook of Batteries): Li-ion and LiPo 4.2 V full,
3.0 V cut-off, 2.5 V damage floor. Stall currents are worked by hand with Ohm's law.
"""

from __future__ import annotations

import pytest
from firstride_rules.battery.discharge import RULE as DISCHARGE
from firstride_rules.battery.protection import RULE as PROTECTION
from firstride_rules.charging.ratings import RULE as CHARGING

from reviewer.findings import Comparison, Severity
from reviewer.testing import run_rule_on


def pack(chemistry="lipo", series=6, parallel=1, **extra):
    data = {"chemistry": chemistry, "cells_series": series}
    if parallel is not None:
        data["cells_parallel"] = parallel
    data.update(extra)
    return data


def motors(count=1, winding="0.3 ohm"):
    return [
        {"name": f"m{i}", "type": "brushed", "winding_resistance": winding} for i in range(count)
    ]


def discharge(battery, limit=None, count=1, winding="0.3 ohm", **extra):
    data = {"battery": battery, "motors": motors(count, winding), **extra}
    if limit is not None:
        data["controller"] = {"motor_current_limit": limit}
    (finding,) = run_rule_on(DISCHARGE, data)
    return finding


# --- battery.discharge: capability ---------------------------------------------------------------


def test_strings_in_parallel_unknown_count_as_one():
    # common practice: pack current = cell rating x strings; with the strings unknown, one
    # string (15 A) is the least the pack delivers, and a 20 A demand is over it
    finding = discharge(pack(parallel=None, cell_continuous_current="15 A"), limit="20 A")
    assert finding.limit.m_as("A") == pytest.approx(15)
    assert finding.severity is Severity.FIX
    assert "use 2 cells in parallel instead of 1" in finding.remedy
    assert "single string delivers 15 A" in finding.rationale


def test_a_limited_drive_without_windings_is_not_judged_as_a_stall():
    # the rule's docstring: stop is for no current limit and a stall over 2 x the pack; a
    # 100 A limit over a 15 A pack is a fix (common practice: cell rating x strings)
    data = {
        "battery": pack(cell_continuous_current="15 A"),
        "motors": [{"name": "m0", "type": "brushed"}],
        "controller": {"motor_current_limit": "100 A"},
    }
    (finding,) = run_rule_on(DISCHARGE, data)
    assert finding.severity is Severity.FIX
    # with the windings known the stall (Ohm's law, 25.2 V / 0.3 ohm = 84 A) caps the demand,
    # still 5.6 x the pack, and still a fix behind a limit
    limited = discharge(pack(cell_continuous_current="15 A"), limit="100 A")
    assert limited.measured.m_as("A") == pytest.approx(84.0)
    assert limited.severity is Severity.FIX


def test_two_limited_motors_are_worded_per_motor():
    # common practice: the controller's limit holds each motor; 2 x 20 A = 40 A
    finding = discharge(pack(parallel=2, cell_continuous_current="15 A"), limit="20 A", count=2)
    assert "The drive can draw 40 A: the controller's motor limit of 20 A per motor." in (
        finding.rationale
    )


# --- battery.discharge: the stop line at 2 x the capability ---------------------------------------


def stall_amps():
    # Ohm's law: 6 x 4.2 V (Linden, from memory) over 0.3 ohm = 84 A
    finding = discharge(pack(cell_continuous_current="10 A"))
    assert finding.measured.m_as("A") == pytest.approx(25.2 / 0.3)
    return float(finding.measured.m_as("A"))


def test_a_stall_exactly_twice_the_capability_to_the_last_digit_is_fix():
    # the rule's docstring (profile battery.stall_overload_stop, 2, common practice): stop only
    # for a stall "more than" 2 x the capability; here the capability is given as exactly half
    # the stall the rule works out, to the float's last digit
    half = stall_amps() / 2
    finding = discharge(pack(cell_continuous_current=f"{half!r} A"))
    assert finding.severity is Severity.FIX
    beyond = discharge(pack(cell_continuous_current=f"{half * 0.999!r} A"))
    assert beyond.severity is Severity.STOP


def test_a_stall_of_exactly_twice_a_whole_ampere_capability_is_fix():
    # Ohm's law: 6 x 4.2 V / 0.3 ohm = 84 A = 2 x 42 A exactly; the rule's docstring: stop only
    # for more than 2 x (profile battery.stall_overload_stop, common practice); 25.2 V / 0.3 ohm
    # works out to 84.00000000000001 A in floats, which must not flip it
    finding = discharge(pack(cell_continuous_current="42 A"))
    assert finding.severity is Severity.FIX


def test_a_pack_fuse_rated_exactly_at_the_capability_ends_a_sustained_stall():
    # the rule's docstring: no stop where a battery-positive fuse is rated at or below the
    # capability; 84 A stall over 3 x a 25 A pack, with a 25 A fuse
    fuse = {"name": "main", "location": "battery-positive", "rating": "25 A"}
    finding = discharge(pack(cell_continuous_current="25 A"), fuses=[fuse])
    assert finding.severity is Severity.FIX
    assert "Fuse 'main' at the battery positive ends a sustained stall" in finding.rationale
    fuse["rating"] = "25.1 A"
    assert discharge(pack(cell_continuous_current="25 A"), fuses=[fuse]).severity is Severity.STOP


def test_the_stop_states_the_overload_ratio():
    # Ohm's law: 84 A over a 10 A pack is 8.4 x its rating
    finding = discharge(pack(cell_continuous_current="10 A"))
    assert finding.severity is Severity.STOP
    assert "That is 8.4 x its rating" in finding.rationale
    assert "the stall current of the motor on the full pack" in finding.rationale


# --- battery.discharge: the battery-limit remedy ------------------------------------------------


def test_one_motor_gets_a_whole_ampere_limit_without_per_motor_wording():
    # common practice: pack current = cell rating x strings: 2 x 15 A = 30 A
    finding = discharge(pack(parallel=2, cell_continuous_current="15 A"), limit="40 A")
    assert finding.remedy.startswith("set controller.battery_current_limit at or below 30 A; or ")
    assert "The pack's 2 parallel strings deliver 30 A continuously" in finding.rationale


def test_the_per_motor_limit_shares_what_the_small_loads_leave():
    # common practice: 2 x 15 A = 30 A; a 2 A logic board leaves 28 A, 14 A per motor
    logic = {"board_current": "2000 mA"}
    battery = pack(parallel=2, cell_continuous_current="15 A")
    finding = discharge(battery, limit="20 A", count=2, logic=logic)
    assert finding.severity is Severity.FIX
    assert finding.remedy.startswith(
        "set controller.battery_current_limit at or below 14 A per motor"
    )


def test_a_limit_of_exactly_one_ampere_per_motor_is_still_offered():
    # common practice: a 3 A pack shared by 3 motors leaves 1 A each
    finding = discharge(pack(cell_continuous_current="3 A"), limit="2 A", count=3)
    assert finding.remedy.startswith(
        "set controller.battery_current_limit at or below 1 A per motor"
    )


def test_a_stall_equal_to_the_limit_is_not_worded_as_lower():
    # Ohm's law: 25.2 V / 0.3 ohm = 84 A; with the drive limited to that very current (to the
    # float's last digit) the stall is not lower
    stall = stall_amps()
    finding = discharge(pack(parallel=9, cell_continuous_current="10 A"), limit=f"{stall!r} A")
    assert "where it is lower" not in finding.rationale
    lower = discharge(pack(parallel=9, cell_continuous_current="10 A"), limit="85 A")
    assert "or the stall current where it is lower" in lower.rationale


# --- battery.protection and charging.ratings ---------------------------------------------------------------------------


def protection(rule=PROTECTION, **battery):
    findings = run_rule_on(rule, {"battery": pack("li-ion", 7, **battery)})
    return {f.subject: f for f in findings}


def test_a_cutoff_exactly_on_the_damage_floor_is_fix_not_stop():
    # from memory (Linden): Li-ion damage floor 2.5 V per cell, 7 x 2.5 = 17.5 V; the rule's
    # docstring: stop below the floor, fix between floor and cut-off
    cutoff = protection(bms={"fitted": False}, low_voltage_cutoff="17.5 V")["low-voltage cut-off"]
    assert cutoff.severity is Severity.FIX
    assert "17.5 V, 2.5 V per cell" in cutoff.rationale
    below = protection(bms={"fitted": False}, low_voltage_cutoff="17.4 V")["low-voltage cut-off"]
    assert below.severity is Severity.STOP


@pytest.mark.parametrize(
    ("charger", "severity"),
    [
        ("29.75 V", Severity.PASS),  # 7 x (4.2 + 0.05) V: the top of the band
        ("29.76 V", Severity.STOP),  # over it: overcharge
        ("29.05 V", Severity.PASS),  # 7 x (4.2 - 0.05) V: the bottom of the band
        ("29.04 V", Severity.ADVISE),  # under it: undercharge
    ],
)
def test_charger_exactly_on_each_edge_of_the_band(charger, severity):
    # from memory (Linden): 4.2 V per Li-ion cell; band 0.05 V per cell (common practice)
    finding = protection(CHARGING, bms={"fitted": True}, charger_voltage=charger)["charger voltage"]
    assert finding.severity is severity


def test_an_undercharging_charger_is_measured_against_the_bottom_of_the_band():
    # from memory (Linden): 7 x 4.2 V = 29.4 V; less 7 x 0.05 V (common practice) = 29.05 V
    finding = protection(CHARGING, bms={"fitted": True}, charger_voltage="29 V")["charger voltage"]
    assert finding.severity is Severity.ADVISE
    assert finding.comparison is Comparison.AT_LEAST
    assert finding.limit.m_as("V") == pytest.approx(29.05)
    assert "29 V, 4.14 V per cell" in finding.rationale
