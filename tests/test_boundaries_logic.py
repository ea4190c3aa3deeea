"""logic.pin-current on currents exactly on its limits, and the loads its own tests left a
mutant alive for (benchmarks/mutation_score.py on rules/logic/pin_current.py and _tally.py).

The invented logic part: 40 mA absolute maximum per pin, 100 mA per port group, 200 mA for the
package. The profile keeps pins at half the maximum and groups and package at 80 % (common
practice), and counts the worst of paralleled pins at 1.5 x the even share (common practice).
"""

from __future__ import annotations

from typing import Any

import pytest
from firstride_rules.logic.pin_current import RULE
from firstride_rules.logic.regulator import RULE as REGULATOR

from reviewer.findings import Severity
from reviewer.testing import rule_outputs, run_rule_on


def logic(*loads: dict[str, Any], total: str = "200 mA") -> dict[str, Any]:
    return {
        "logic": {
            "pins": ["P1", "P2", "P3", "P4", "P5", "P6", "P7", "P8", "P9", "P10"],
            "pin_current_max": "40 mA",
            "total_current_max": total,
            "port_groups": [
                {"name": "BANK-A", "pins": ["P1", "P2", "P3", "P4"], "current_max": "100 mA"}
            ],
            "loads": list(loads),
        }
    }


def lamp(current: str, pins=("P9",), **extra: Any) -> dict[str, Any]:
    data = {"name": "lamp", "pins": list(pins), "current": current, "inductive": False}
    data.update(driver="pin")
    data.update(extra)
    return data


def by_subject(data: dict[str, Any]) -> dict[str, Any]:
    return {f.subject: f for f in run_rule_on(RULE, data)}


# --- grades on the limits -----------------------------------------------------------------------


@pytest.mark.parametrize(
    ("current", "severity"),
    [
        ("20 mA", Severity.PASS),  # at 50 % of 40 mA: at or below the derated limit
        ("20.5 mA", Severity.FIX),  # over it
        ("40 mA", Severity.FIX),  # at the datasheet maximum: over the derated limit only
        ("40.5 mA", Severity.STOP),  # over the datasheet absolute maximum
    ],
)
def test_a_pin_exactly_on_each_limit(current, severity):
    # the rule's docstring: stop over the absolute maximum, fix over the derated limit
    assert by_subject(logic(lamp(current)))["pin P9"].severity is severity


@pytest.mark.parametrize(
    ("current", "severity"),
    [("80 mA", Severity.PASS), ("100 mA", Severity.FIX), ("101 mA", Severity.STOP)],
)
def test_a_port_group_exactly_on_each_limit(current, severity):
    # 80 % of the group's 100 mA (common practice) and the 100 mA maximum itself, from four
    # single-pin loads on the group's four pins
    each = float(current.split()[0]) / 4
    loads = [
        {**lamp(f"{each!r} mA", pins=(pin,)), "name": f"lamp {pin}"}
        for pin in ("P1", "P2", "P3", "P4")
    ]
    found = by_subject(logic(*loads, total="2000 mA"))
    assert found["port group BANK-A"].severity is severity


@pytest.mark.parametrize(
    ("current", "severity"),
    [("160 mA", Severity.PASS), ("200 mA", Severity.FIX), ("201 mA", Severity.STOP)],
)
def test_the_package_exactly_on_each_limit(current, severity):
    # 80 % of the package's 200 mA (common practice) and the 200 mA maximum itself; a MOSFET
    # gate draws no steady current, so eight loads on eight pins each carry an eighth
    amps = float(current.split()[0]) / 8
    loads = [
        {**lamp(f"{amps!r} mA", pins=(f"P{i + 1}",)), "name": f"lamp {i}"} for i in range(2, 10)
    ]
    found = by_subject(logic(*loads))
    assert found["package total"].severity is severity


def test_the_whole_milliamps_to_move_are_at_least_one():
    # common practice: the pin limit is 20 mA; 20.5 mA is half a milliamp over, and the
    # remedy names a whole milliamp to move
    finding = by_subject(logic(lamp("20.5 mA")))["pin P9"]
    assert "move 1 mA off pin P9" in finding.remedy
    three = by_subject(logic(lamp("22.5 mA")))["pin P9"]
    assert "move 3 mA off pin P9" in three.remedy


def test_the_rationale_quotes_the_profile_fractions_in_percent():
    # common practice: pins at 50 %, port groups and the package at 80 %
    found = by_subject(logic(lamp("10 mA", pins=("P1",))))
    assert "at or below 50 % of it, 20 mA." in found["pin P1"].rationale
    assert "allows 80 % of it, 80 mA." in found["port group BANK-A"].rationale
    assert "allows 80 % of it, 160 mA." in found["package total"].rationale


def test_a_single_pin_is_not_worded_as_uneven():
    # common practice: one pin carries the whole load; there is no share to be uneven
    assert "even share" not in by_subject(logic(lamp("10 mA")))["pin P9"].rationale


# --- loads ---------------------------------------------------------------------------------------


def test_a_coil_with_its_diode_stated_absent_gets_the_diode_remedy():
    # Faraday's law (v = L di/dt): with no flyback path the turn-off spike lands on the driver;
    # Horowitz and Hill (from memory): a diode across the coil clamps it
    coil = lamp("60 mA", name="horn", inductive=True, flyback_diode=False, driver="transistor")
    finding = by_subject(logic(coil))["load 'horn'"]
    assert finding.severity is Severity.STOP
    assert finding.remedy.startswith("fit a flyback diode across the coil")


def test_a_diode_covers_a_load_of_unstated_inductance_behind_a_driver_only():
    # Horowitz and Hill (from memory): a flyback diode clamps a coil if it is one; behind a
    # transistor the load is judged, straight on a pin it stays unknown
    load = lamp("60 mA", name="horn", flyback_diode=True, driver="transistor")
    del load["inductive"]
    judged = by_subject(logic(load))["load 'horn'"]
    assert judged.severity is Severity.PASS
    assert "its flyback diode covers either case" in judged.rationale
    on_pin = {**load, "driver": "pin", "current": "10 mA"}
    unknown = by_subject(logic(on_pin))["load 'horn'"]
    assert unknown.severity is Severity.UNASSESSED
    assert unknown.missing == ("logic.loads[0].inductive",)


def test_a_paralleled_plain_load_is_told_to_use_one_pin_and_a_switch():
    # common practice: paralleled outputs do not share evenly
    finding = by_subject(logic(lamp("10 mA", pins=("P9", "P10"))))["load 'lamp'"]
    assert finding.severity is Severity.ADVISE
    assert finding.remedy.startswith("drive 'lamp' from one pin and drive it through")


# --- logic.regulator (rules/logic/regulator.py and _regulator_load.py) --------------------------


def regulated(cells: int = 10, **regulator: Any) -> dict[str, Any]:
    # an invented board: 100 mA at 5 V through a linear regulator in a small package
    part = {
        "kind": "linear",
        "input_max": "60 V",
        "output_voltage": "5 V",
        "quiescent_current": "5 mA",
        "thermal_resistance": "50 K/W",
        "max_junction_temperature": "125 degC",
    }
    part.update(regulator)
    return {
        "battery": {"chemistry": "li-ion", "cells_series": cells},
        "logic": {"supply_voltage": "5 V", "board_current": "100 mA", "regulator": part},
        "usage": {"ambient_temperature": "25 degC"},
    }


def regulator_findings(data: dict[str, Any]) -> dict[str, Any]:
    return {f.subject: f for f in run_rule_on(REGULATOR, data)}


def test_a_linear_regulator_fed_exactly_its_output_voltage_cannot_regulate():
    # Horowitz and Hill (from memory): a linear regulator needs its input above its output by
    # at least its dropout; with 5 V in and 5 V out it cannot hold the rail
    data = regulated(
        fed_from_pack=False, input_voltage="5 V", input_max="10 V", quiescent_current="1 mA"
    )
    heat = regulator_findings(data)["regulator heat"]
    assert heat.severity is Severity.FIX
    assert heat.remedy.startswith("use a boost or buck-boost switching regulator")


def test_a_junction_exactly_at_its_maximum_passes():
    # JEDEC JESD51 (from memory): Tj = Ta + P R_th; from a 3-cell pack (12.6 V, Linden, from
    # memory) P = 7.6 V x 0.1 A + 12.6 V x 5 mA = 0.823 W, Tj = 25 + 41.15 = 66.15 degC; the
    # rule's docstring: fix only above the maximum
    tj = 25.0 + (7.6 * 0.1 + 12.6 * 0.005) * 50.0
    assert tj == pytest.approx(66.15)
    at = regulator_findings(regulated(3, max_junction_temperature=f"{tj!r} degC"))
    assert at["regulator heat"].severity is Severity.PASS
    under = regulator_findings(regulated(3, max_junction_temperature="66 degC"))
    assert under["regulator heat"].severity is Severity.FIX


def test_the_heat_finding_quotes_its_figures():
    # Horowitz and Hill (from memory): P = (42 - 5) V x 0.1 A + 42 V x 5 mA = 3.91 W; JEDEC
    # JESD51: a 195.5 K rise at 50 K/W; a switcher at 85 % (profile, common practice) draws
    # 5 V x 0.1 A / 0.85 / 42 V = 14 mA and loses (1 / 0.85 - 1) x 0.5 W = 0.0882 W
    heat = regulator_findings(regulated())["regulator heat"]
    assert heat.rationale.startswith(
        "The linear regulator drops 42 V to 5 V at 100 mA (quiescent 5 mA) and so dissipates "
        "3.91 W; at 50 K/W that is a 196 K rise over 25 °C"
    )
    assert heat.remedy.startswith(
        "use a switching regulator (logic.regulator.kind) rated for at least 42 V input "
        "(logic.regulator.input_max; at about 85 % efficiency it draws 14 mA from the pack and dissipates 0.0882 W) or a separate 5 V supply; or keep "
        "this linear regulator only for a load of at most 48 mA (now 100 mA)"
    )


def test_a_switcher_quotes_its_input_current_at_the_cut_off():
    # energy balance: 5 V x 0.1 A at 85 % (profile, common practice) from the 30 V cut-off
    # (10 x 3.0 V, Linden, from memory) is 19.6 mA
    data = regulated(kind="switching")
    text = regulator_findings(data)["regulator input"].rationale
    assert (
        "At about 85 % efficiency it draws an estimated 19.6 mA from the pack at its 30 V "
        "cut-off to supply 100 mA at 5 V" in text
    )


def test_a_regulator_whose_quiescent_loss_alone_overheats_carries_no_load():
    # JEDEC JESD51 (from memory): 42 V x 5 mA = 0.21 W at 500 K/W is a 105 K rise over 25 degC,
    # past 125 degC before any load
    heat = regulator_findings(regulated(thermal_resistance="500 K/W"))["regulator heat"]
    assert "this linear regulator cannot carry any load from this pack" in heat.remedy
    assert "load of at most" not in heat.remedy


def test_a_coil_behind_a_transistor_on_paralleled_pins_is_told_to_use_one_pin():
    # common practice: paralleled outputs do not share evenly, whatever they drive; the coil
    # itself is switched by a transistor with its flyback diode (Horowitz and Hill, from memory)
    coil = lamp("60 mA", pins=("P9", "P10"), name="horn", inductive=True, flyback_diode=True)
    coil["driver"] = "transistor"
    finding = by_subject(logic(coil))["load 'horn'"]
    assert finding.severity is Severity.ADVISE
    assert finding.remedy.startswith("drive 'horn' from one pin and drive it through")


def test_a_paralleled_pin_quotes_its_even_share_and_the_imbalance():
    # common practice: 10 mA over two pins is 5 mA each evenly, 1.5 x 5 = 7.5 mA on the worst
    text = by_subject(logic(lamp("10 mA", pins=("P9", "P10"))))["pin P9"].rationale
    assert text.startswith(
        "Pin P9 carries up to 7.5 mA (even share 5 mA, x1.5 for paralleled pins)"
    )


def test_the_regulator_figures_state_how_they_were_formed():
    # Horowitz and Hill (from memory): P = (Vin - Vout) I_out + Vin I_q; energy balance for a
    # switcher at the profile's 85 % (common practice) from the 30 V cut-off (Linden, from memory)
    _, linear, _ = rule_outputs(REGULATOR, regulated())
    notes = {d.name: d.note for d in linear}
    assert notes["logic regulator dissipation"] == "linear: (42 V - 5 V) x 100 mA + 42 V x 5 mA"
    _, switching, assumptions = rule_outputs(REGULATOR, regulated(kind="switching"))
    notes = {d.name: d.note for d in switching}
    assert notes["logic regulator input current"] == (
        "switching, 85 % efficient assumed, 100 mA at 5 V, from 30 V (pack cut-off)"
    )
    assert "Switching regulator efficiency 85 % taken for its input current." in [
        a.text for a in assumptions
    ]
