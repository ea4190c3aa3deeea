"""battery.discharge and battery.protection on invented packs, against the handbook values.

Cell voltages are from memory (Linden, Handbook of Batteries): Li-ion and LiPo 4.2 V full and
3.0 V cut-off (2.5 V damage floor), LiPo 3.7 V and Li-ion 3.6 V nominal; LiFePO4 3.65 V full,
2.5 V cut-off. The air-transport thresholds are IATA's (Dangerous Goods Regulations, lithium
battery guidance). Stall currents are worked by hand with Ohm's law.
"""

from __future__ import annotations

import re

import pytest
from firstride_rules.battery.discharge import RULE as DISCHARGE_RULE
from firstride_rules.battery.protection import RULE as PROTECTION_RULE
from firstride_rules.charging.ratings import RULE as CHARGING_RULE

from reviewer.engineering.cells import (
    CELL_VOLTAGES,
    AirTransportClass,
    air_transport_class,
    pack_energy_wh,
    string_continuous_current,
    strings_needed,
)
from reviewer.findings import Comparison, Severity
from reviewer.testing import rule_outputs, run_rule_on


def battery(chemistry="li-ion", series=7, parallel=1, **extra):
    """A pack; ``bms=True`` or ``False`` says whether a BMS guarding discharge is fitted."""
    data = {"chemistry": chemistry, "cells_series": series, "cells_parallel": parallel}
    data.update(extra)
    if isinstance(data.get("bms"), bool):
        data["bms"] = {"guards_discharge": True} if data["bms"] else {"fitted": False}
    return data


def drive(pack, winding="0.3 ohm", limit=None, motors=1, **extra):
    data = {
        "battery": pack,
        "motors": [
            {"name": f"m{i}", "type": "brushed", "winding_resistance": winding}
            for i in range(motors)
        ],
    }
    if limit is not None:
        data["controller"] = {"motor_current_limit": limit}
    data.update(extra)
    return data


def only(findings, subject=None):
    chosen = [f for f in findings if subject is None or f.subject == subject]
    assert len(chosen) == 1, [f.subject for f in findings]
    return chosen[0]


# --- cell and pack figures --------------------------------------------------------------------


@pytest.mark.parametrize(
    ("chemistry", "full", "cutoff"),
    [("li-ion", 4.2, 3.0), ("lipo", 4.2, 3.0), ("lifepo4", 3.65, 2.5)],
)
def test_lithium_cell_voltages(chemistry, full, cutoff):
    # from memory: Linden, Handbook of Batteries
    cell = CELL_VOLTAGES[chemistry]
    assert (cell.full, cell.cutoff) == (full, cutoff)


def test_two_three_cell_lipo_packs_in_series():
    # common practice: two 3-cell LiPo packs in series make a 6-cell pack, 22.2 V nominal,
    # 25.2 V full
    _, figures, _ = rule_outputs(DISCHARGE_RULE, {"battery": battery("lipo", 6)})
    value = {f.name: f.value for f in figures}
    assert value["pack nominal voltage"].m_as("V") == pytest.approx(22.2)
    assert value["pack full voltage"].m_as("V") == pytest.approx(25.2)


@pytest.mark.parametrize(
    ("energy", "expected"),
    [
        (99.0, AirTransportClass.ALLOWED),  # IATA DGR: not exceeding 100 Wh
        (100.0, AirTransportClass.ALLOWED),
        (100.5, AirTransportClass.AIRLINE_APPROVAL),  # IATA DGR: over 100 Wh, up to 160 Wh
        (160.0, AirTransportClass.AIRLINE_APPROVAL),
        (161.0, AirTransportClass.FORBIDDEN),  # IATA DGR: over 160 Wh
    ],
)
def test_air_transport_thresholds(energy, expected):
    assert air_transport_class(energy) is expected


def test_energy_on_a_threshold_is_not_pushed_over_by_rounding():
    # IATA DGR: Wh = V x Ah; 22.2 V x (100 / 22.2) Ah is 100 Wh, allowed
    energy = pack_energy_wh(3.7, 6, 100 / 22.2)
    assert energy == pytest.approx(100.0)
    assert air_transport_class(energy) is AirTransportClass.ALLOWED


@pytest.mark.parametrize(
    ("pack", "wh", "expected"),
    [
        # 6S LiPo 2.2 Ah: 22.2 V x 2.2 Ah = 48.84 Wh (IATA DGR Wh = V x Ah)
        (battery("lipo", 6, cell_capacity="2200 mAh"), 48.84, AirTransportClass.ALLOWED),
        # 10S4P Li-ion 3.5 Ah: 36 V x 14 Ah = 504 Wh
        (battery("li-ion", 10, 4, cell_capacity="3.5 Ah"), 504.0, AirTransportClass.FORBIDDEN),
        # 4S2P LiFePO4 2.5 Ah: 4 x 3.2 V = 12.8 V x 5 Ah = 64 Wh
        (battery("lifepo4", 4, 2, cell_capacity="2500 mAh"), 64.0, AirTransportClass.ALLOWED),
        # 10S1P Li-ion 4 Ah: 36 V x 4 Ah = 144 Wh
        (battery("li-ion", 10, cell_capacity="4 Ah"), 144.0, AirTransportClass.AIRLINE_APPROVAL),
    ],
)
def test_pack_energy_and_air_class_figures(pack, wh, expected):
    _, figures, _ = rule_outputs(DISCHARGE_RULE, {"battery": pack})
    value = {f.name: f.value for f in figures}
    assert value["pack energy"].m_as("Wh") == pytest.approx(wh)
    assert value["air transport class"] == expected.value


def test_no_air_class_for_a_lead_acid_pack():
    pack = battery("lead-acid", 6, cell_capacity="7 Ah")
    _, figures, _ = rule_outputs(DISCHARGE_RULE, {"battery": pack})
    names = {f.name for f in figures}
    assert "pack energy" in names and "air transport class" not in names


def test_string_capability_takes_the_lower_rating():
    # common practice: continuous current = C-rate x capacity; 20 C x 2.2 Ah = 44 A
    assert string_continuous_current(cell_c_rate=20, cell_capacity_ah=2.2) == pytest.approx(44)
    assert string_continuous_current(30.0, 20, 2.2) == pytest.approx(30)
    assert string_continuous_current(cell_c_rate=20) is None
    assert strings_needed(61.0, 15.0) == 5
    assert strings_needed(60.0, 15.0) == 4


# --- battery.discharge ------------------------------------------------------------------------


def test_each_rule_has_its_own_module():
    import firstride_rules.battery as area

    assert not hasattr(area, "RULE")
    rules = (DISCHARGE_RULE, PROTECTION_RULE)
    assert [r.id for r in rules] == ["battery.discharge", "battery.protection"]
    for rule in rules:
        assert "Severities" in rule.doc and rule.sources


def test_limited_demand_within_the_pack_passes():
    # 7S2P, cells 15 A each: 30 A continuous (common practice: cell rating x parallel)
    pack = battery(parallel=2, cell_continuous_current="15 A")
    finding = only(run_rule_on(DISCHARGE_RULE, drive(pack, limit="20 A")))
    assert finding.severity is Severity.PASS
    assert finding.measured.m_as("A") == pytest.approx(20)
    assert finding.limit.m_as("A") == pytest.approx(30)


def test_limited_demand_over_the_pack_is_fix_with_a_remedy_that_passes():
    pack = battery(parallel=2, cell_continuous_current="15 A")
    finding = only(run_rule_on(DISCHARGE_RULE, drive(pack, limit="40 A")))
    assert finding.severity is Severity.FIX
    assert "at or below 30 A" in finding.remedy
    assert "use 3 cells in parallel instead of 2" in finding.remedy  # 40 / 15 -> 3 strings
    assert "at least 20 A continuous" in finding.remedy  # 40 A over 2 strings
    limit = re.search(r"at or below (\d+) A", finding.remedy)[1]
    assert only(run_rule_on(DISCHARGE_RULE, drive(pack, limit=f"{limit} A"))).severity is (
        Severity.PASS
    )
    wider = battery(parallel=3, cell_continuous_current="15 A")
    assert only(run_rule_on(DISCHARGE_RULE, drive(wider, limit="40 A"))).severity is (Severity.PASS)


def test_unlimited_stall_over_twice_the_pack_is_stop():
    # 6S LiPo, 20 C x 2.2 Ah = 44 A; stall = 25.2 V / 0.1 ohm = 252 A (Ohm's law), > 2 x 44 A
    pack = battery("lipo", 6, cell_capacity="2200 mAh", cell_c_rate=20)
    finding = only(run_rule_on(DISCHARGE_RULE, drive(pack, winding="0.1 ohm")))
    assert finding.severity is Severity.STOP
    assert finding.measured.m_as("A") == pytest.approx(252)
    assert finding.limit.m_as("A") == pytest.approx(44)
    assert "at or below 44 A" in finding.remedy
    assert "use 6 cells in parallel instead of 1" in finding.remedy  # 252 / 44 -> 6


def test_unlimited_stall_within_twice_the_pack_is_fix():
    # stall = 25.2 V / 0.4 ohm = 63 A: over 44 A, under 88 A
    pack = battery("lipo", 6, cell_capacity="2200 mAh", cell_c_rate=20)
    finding = only(run_rule_on(DISCHARGE_RULE, drive(pack, winding="0.4 ohm")))
    assert finding.severity is Severity.FIX
    assert finding.measured.m_as("A") == pytest.approx(63)


def test_a_pack_fuse_below_the_capability_makes_a_sustained_stall_fix():
    pack = battery("lipo", 6, cell_capacity="2200 mAh", cell_c_rate=20)
    fuse = {"name": "main", "location": "battery-positive", "rating": "40 A"}
    data = drive(pack, winding="0.1 ohm", fuses=[fuse])
    finding = only(run_rule_on(DISCHARGE_RULE, data))
    assert finding.severity is Severity.FIX
    assert "main" in finding.rationale


def test_small_loads_are_added_to_the_demand():
    pack = battery(cell_continuous_current="30 A")
    data = drive(
        pack,
        limit="20 A",
        logic={"board_current": "120 mA"},
        brakes=[{"kind": "dynamic", "coil_current": "60 mA"}],
    )
    finding = only(run_rule_on(DISCHARGE_RULE, data))
    assert finding.severity is Severity.PASS
    assert finding.measured.m_as("A") == pytest.approx(20.18)


def test_two_limited_motors_draw_twice_the_limit():
    pack = battery(parallel=2, cell_continuous_current="20 A")
    finding = only(run_rule_on(DISCHARGE_RULE, drive(pack, limit="25 A", motors=2)))
    assert finding.severity is Severity.FIX
    assert finding.measured.m_as("A") == pytest.approx(50)
    assert "at or below 20 A per motor" in finding.remedy


def test_unknown_small_load_leaves_a_passing_pack_unassessed():
    pack = battery(cell_continuous_current="30 A")
    data = drive(pack, limit="20 A", logic={"supply_voltage": "5 V"})
    finding = only(run_rule_on(DISCHARGE_RULE, data))
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("logic.board_current",)
    over = drive(pack, limit="40 A", logic={"supply_voltage": "5 V"})
    assert only(run_rule_on(DISCHARGE_RULE, over)).severity is Severity.FIX


@pytest.mark.parametrize(
    ("data", "missing"),
    [
        ({}, ("battery",)),
        (
            drive(battery(), limit="10 A"),
            ("battery.cell_continuous_current", "battery.cell_c_rate", "battery.cell_capacity"),
        ),
        (
            drive(battery(cell_c_rate=10), limit="10 A"),
            ("battery.cell_continuous_current", "battery.cell_capacity"),
        ),
        (
            {
                "battery": battery(cell_continuous_current="10 A"),
                "motors": [{"name": "m", "type": "brushed"}],
            },
            ("motors[0].winding_resistance", "controller.battery_current_limit"),
        ),
        ({"battery": battery(cell_continuous_current="10 A")}, ("motors",)),
    ],
)
def test_discharge_unassessed_names_the_missing_fields(data, missing):
    finding = only(run_rule_on(DISCHARGE_RULE, data))
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == missing


# --- battery.protection -----------------------------------------------------------------------


def protection(pack):
    return {f.subject: f for f in run_rule_on(PROTECTION_RULE, {"battery": pack})}


def test_lithium_pack_without_bms_is_stop():
    findings = protection(battery("lipo", 6, bms=False))
    bms = findings["battery management system"]
    assert bms.severity is Severity.STOP
    assert "6S LiPo" in bms.remedy


def test_bms_not_stated_is_unassessed_and_fitted_passes():
    assert protection(battery())["battery management system"].missing == ("battery.bms",)
    assert protection(battery(bms=True))["battery management system"].severity is Severity.PASS


@pytest.mark.parametrize(
    ("setting", "bms", "severity"),
    [
        ("21 V", False, Severity.PASS),  # from memory: 7 x 3.0 V Li-ion cut-off
        ("22 V", False, Severity.PASS),
        ("20 V", False, Severity.FIX),  # below 21 V, above the 7 x 2.5 V = 17.5 V floor
        ("17 V", False, Severity.STOP),  # below the damage floor
        ("20 V", True, Severity.ADVISE),  # the BMS cuts power first, abruptly
    ],
)
def test_low_voltage_cutoff_of_a_seven_cell_pack(setting, bms, severity):
    finding = protection(battery(bms=bms, low_voltage_cutoff=setting))["low-voltage cut-off"]
    assert finding.severity is severity
    assert finding.limit.m_as("V") == pytest.approx(21.0)
    assert finding.comparison is Comparison.AT_LEAST
    if severity is not Severity.PASS:
        assert finding.remedy == "set battery.low_voltage_cutoff at or above 21 V (7 x 3 V)"


def test_lifepo4_cutoff_is_two_and_a_half_volts_per_cell():
    # from memory: Linden, LiFePO4 2.5 V cut-off; 8 x 2.5 V = 20 V
    finding = protection(battery("lifepo4", 8, bms=False, low_voltage_cutoff="19.5 V"))
    assert finding["low-voltage cut-off"].severity is Severity.FIX
    assert finding["low-voltage cut-off"].limit.m_as("V") == pytest.approx(20.0)


def test_cutoff_counts_a_bms_and_is_unassessed_without_either():
    assert protection(battery(bms=True))["low-voltage cut-off"].severity is Severity.PASS
    finding = protection(battery(bms=False))["low-voltage cut-off"]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("battery.low_voltage_cutoff",)


@pytest.mark.parametrize(
    ("pack", "charger", "severity"),
    [
        (battery("li-ion", 7), "29.4 V", Severity.PASS),  # from memory: 7 x 4.2 V
        (battery("li-ion", 7), "29.7 V", Severity.PASS),  # within 7 x 0.05 V (common practice)
        (battery("li-ion", 7), "29.8 V", Severity.STOP),  # over 29.75 V: overcharge
        (battery("li-ion", 7), "29.0 V", Severity.ADVISE),  # under 29.05 V: undercharge
        (battery("lipo", 6), "25.2 V", Severity.PASS),  # common practice: 6-cell pack 25.2 V
        (battery("lifepo4", 4), "14.6 V", Severity.PASS),  # from memory: 4 x 3.65 V
        (battery("lifepo4", 4), "16.8 V", Severity.STOP),  # a Li-ion charger on LiFePO4
    ],
)
def test_charger_voltage(pack, charger, severity):
    charged = battery(pack["chemistry"], pack["cells_series"], bms=True, charger_voltage=charger)
    finding = charging(charged)["charger voltage"]
    assert finding.severity is severity
    if severity is not Severity.PASS:
        cells = pack["cells_series"]
        full = CELL_VOLTAGES[pack["chemistry"]].full * cells
        assert finding.remedy.startswith(f"use a {full:.3g} V charger ({cells} x ")


def charging(pack):
    return {f.subject: f for f in run_rule_on(CHARGING_RULE, {"battery": pack})}


def test_charger_not_given_is_unassessed():
    finding = charging(battery(bms=True))["charger voltage"]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("battery.charger_voltage",)


def test_non_lithium_pack_passes_with_a_plain_reason():
    findings = run_rule_on(PROTECTION_RULE, {"battery": battery("lead-acid", 6)})
    finding = only(findings)
    assert finding.severity is Severity.PASS
    assert "not lithium" in finding.rationale


def test_protection_without_battery_is_unassessed():
    finding = only(run_rule_on(PROTECTION_RULE, {}))
    assert finding.severity is Severity.UNASSESSED and finding.missing == ("battery",)


def test_cutoff_figure_for_the_six_cell_pack():
    # from memory: 6 x 3.0 V = 18 V
    _, figures, _ = rule_outputs(PROTECTION_RULE, {"battery": battery("lipo", 6, bms=True)})
    value = {f.name: f.value for f in figures}
    assert value["pack cut-off voltage"].m_as("V") == pytest.approx(18.0)
