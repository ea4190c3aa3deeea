"""voltage.ratings: every part's voltage rating against the full pack, on invented builds.

Full pack voltages are from memory (Linden, Handbook of Batteries): 4.2 V per Li-ion or LiPo
cell, so a 10-cell Li-ion pack is 42 V full and a 6-cell LiPo pack 25.2 V. The blade-fuse
ratings are ISO 8820-3's (32 V and 58 V DC). Margins are the default profile's (common
practice): switch 1.25 x full with a freewheel diode, 2 x without; diode 1.25 x; motor overspeed
advise above 1.25 x, fix above 1.5 x. A part rated below what it sees is a stop, one short of
its margin a fix.
"""

from __future__ import annotations

import pytest
from firstride_rules.voltage.ratings import RULE

from reviewer.findings import Severity
from reviewer.testing import rule_outputs, run_rule_on

TEN_CELL = {"chemistry": "li-ion", "cells_series": 10}  # 42 V full, from memory
SIX_CELL_LIPO = {"chemistry": "lipo", "cells_series": 6}  # 25.2 V full, common practice


def findings(pack=TEN_CELL, **parts):
    outputs = run_rule_on(RULE, {"battery": pack, **parts})
    subjects = [f.subject for f in outputs]
    assert len(subjects) == len(set(subjects)), "one finding per part"
    return {f.subject: f for f in outputs}


def fuse(voltage=None, name="main"):
    data = {"name": name, "location": "battery-positive", "rating": "20 A"}
    if voltage is not None:
        data["voltage_rating"] = voltage
    return data


def test_rule_metadata():
    assert RULE.id == "voltage.ratings"
    assert "Severities" in RULE.doc and RULE.sources


@pytest.mark.parametrize(
    ("rating", "severity"),
    [
        ("32 V", Severity.STOP),  # ISO 8820-3: a 32 V blade fuse is invalid on a 42 V pack
        ("58 V", Severity.PASS),  # ISO 8820-3: the 58 V blade fuse is valid
    ],
)
def test_blade_fuse_on_a_ten_cell_lithium_pack(rating, severity):
    finding = findings(fuses=[fuse(rating)])["fuse 'main'"]
    assert finding.severity is severity
    assert finding.limit.m_as("V") == pytest.approx(42.0)
    if severity is Severity.STOP:
        assert "at least 42 V DC" in finding.remedy and "58 V" in finding.remedy


def test_a_32_volt_blade_fuse_suits_the_six_cell_pack():
    # common practice: 6-cell LiPo 25.2 V full; ISO 8820-3 32 V rating suffices
    assert findings(SIX_CELL_LIPO, fuses=[fuse("32 V")])["fuse 'main'"].severity is Severity.PASS


def test_each_fuse_is_its_own_finding_and_a_missing_rating_is_named():
    result = findings(fuses=[fuse("58 V"), fuse(name="logic")])
    assert result["fuse 'main'"].severity is Severity.PASS
    assert result["fuse 'logic'"].severity is Severity.UNASSESSED
    assert result["fuse 'logic'"].missing == ("fuses[1].voltage_rating",)


@pytest.mark.parametrize(
    ("diode", "rating", "severity"),
    [
        (True, "60 V", Severity.PASS),  # needs 42 x 1.25 = 52.5 V
        (True, "50 V", Severity.FIX),  # above 42 V, short of 52.5 V
        (True, "40 V", Severity.STOP),  # below the full pack
        (False, "60 V", Severity.FIX),  # needs 42 x 2 = 84 V without a diode
        (False, "100 V", Severity.PASS),
    ],
)
def test_motor_switch_margin(diode, rating, severity):
    controller = {"switch_max_voltage": rating, "freewheel_diode": diode}
    if diode:
        controller["diode_reverse_voltage"] = "100 V"
    finding = findings(controller=controller)["motor switch"]
    assert finding.severity is severity
    assert finding.limit.m_as("V") == pytest.approx(42 * (1.25 if diode else 2.0))


def test_switch_remedy_offers_a_freewheel_diode():
    controller = {"switch_max_voltage": "60 V", "freewheel_diode": False}
    remedy = findings(controller=controller)["motor switch"].remedy
    # 84 V without a diode; 52.5 V rounds up to 53 V with one
    assert remedy == (
        "use a switch rated at least 84 V (controller.switch_max_voltage), or fit a freewheel "
        "diode across the motor (controller.freewheel_diode), after which 53 V suffices"
    )
    clamped = {
        "switch_max_voltage": "53 V",
        "freewheel_diode": True,
        "diode_reverse_voltage": "60 V",
    }
    assert findings(controller=clamped)["motor switch"].severity is Severity.PASS


def test_diode_not_stated_is_held_to_the_unclamped_margin():
    findings_, _, assumptions = rule_outputs(
        RULE, {"battery": TEN_CELL, "controller": {"switch_max_voltage": "60 V"}}
    )
    switch = next(f for f in findings_ if f.subject == "motor switch")
    assert switch.severity is Severity.FIX
    assert any("freewheel_diode" in a.text for a in assumptions)


@pytest.mark.parametrize(
    ("rating", "severity"),
    # 42 V full; 1.25 x 42 = 52.5 V with the margin (common practice). Between the two is a
    # fix, as controller.freewheel judges the same diode (it was an advice here before).
    [
        ("60 V", Severity.PASS),
        ("52.5 V", Severity.PASS),
        ("45 V", Severity.FIX),
        ("40 V", Severity.STOP),
    ],
)
def test_freewheel_diode_reverse_rating(rating, severity):
    controller = {
        "switch_max_voltage": "100 V",
        "freewheel_diode": True,
        "diode_reverse_voltage": rating,
    }
    finding = findings(controller=controller)["freewheel diode"]
    assert finding.severity is severity
    assert finding.limit.m_as("V") == pytest.approx(52.5)
    if severity is not Severity.PASS:
        assert finding.remedy == "use a diode with a reverse rating of at least 53 V"


def test_missing_switch_and_diode_ratings_are_named():
    result = findings(controller={"freewheel_diode": True})
    assert result["motor switch"].missing == ("controller.switch_max_voltage",)
    assert result["freewheel diode"].missing == ("controller.diode_reverse_voltage",)


def test_regulator_fed_from_the_pack():
    logic = {"regulator": {"kind": "linear", "input_max": "35 V"}}
    assert findings(logic=logic)["logic regulator input"].severity is Severity.STOP
    assert findings(SIX_CELL_LIPO, logic=logic)["logic regulator input"].severity is Severity.PASS
    separate = {"regulator": {"kind": "linear", "input_max": "35 V", "fed_from_pack": False}}
    assert "logic regulator input" not in findings(logic=separate)


def test_regulator_sees_a_charger_above_the_full_pack():
    # 6-cell LiPo 25.2 V full (from memory); a 29.4 V charger (7 x 4.2 V) feeds the logic while
    # charging, as logic.regulator counts it
    logic = {"regulator": {"kind": "linear", "input_max": "28 V"}}
    pack = {**SIX_CELL_LIPO, "charger_voltage": "29.4 V"}
    finding = findings(pack, logic=logic)["logic regulator input"]
    assert finding.severity is Severity.STOP
    assert finding.limit.m_as("V") == pytest.approx(29.4)
    assert finding.remedy == "use a regulator rated for at least 30 V input"


def test_brake_relay_contacts():
    brake = {"kind": "dynamic", "relay_contact_rating": "30 A", "relay_contact_voltage": "30 V"}
    assert findings(brakes=[brake])["brake relay contacts"].severity is Severity.STOP
    assert findings(SIX_CELL_LIPO, brakes=[brake])["brake relay contacts"].severity is Severity.PASS
    unrated = findings(brakes=[{"kind": "dynamic", "coil_current": "60 mA"}])
    assert unrated["brake relay contacts"].missing == ("brakes[0].relay_contact_voltage",)
    assert "brake relay contacts" not in findings(brakes=[{"kind": "friction"}])


def test_two_brake_relays_are_judged_each_by_name() -> None:
    # each relay's contacts against the 42 V full pack (10 x 4.2 V, from memory), named apart
    front = {"name": "front short", "kind": "dynamic", "relay_contact_voltage": "30 V"}
    rear = {"kind": "dynamic", "relay_contact_voltage": "60 V"}
    found = findings(brakes=[front, rear])
    assert found["brake relay contacts 'front short'"].severity is Severity.STOP
    assert found["brake relay contacts 'brakes[1]'"].severity is Severity.PASS
    assert "brake relay contacts" not in found


@pytest.mark.parametrize(
    ("rated", "severity"),
    [
        ("36 V", Severity.PASS),  # 42 / 36 = 1.17
        ("30 V", Severity.ADVISE),  # 42 / 30 = 1.4
        ("24 V", Severity.FIX),  # 42 / 24 = 1.75
    ],
)
def test_motor_overspeed_ratio(rated, severity):
    motor = {"name": "hub", "type": "brushed", "rated_voltage": rated}
    finding = findings(motors=[motor])["motor 'hub'"]
    assert finding.severity is severity
    ratio = 42 / float(rated.split()[0])
    assert f"{ratio:.2f} x" in finding.rationale


def test_overspeed_remedy_names_the_cells_in_series():
    motor = {"name": "hub", "type": "brushed", "rated_voltage": "24 V"}
    finding = findings(motors=[motor])["motor 'hub'"]
    # 1.25 x 24 V = 30 V; 7 x 4.2 V = 29.4 V fits, 8 x 4.2 V = 33.6 V does not
    assert finding.remedy == (
        "use at most 7 cells in series (29.4 V full); or use a motor rated at least 34 V"
    )
    seven = {"chemistry": "li-ion", "cells_series": 7}
    assert findings(seven, motors=[motor])["motor 'hub'"].severity is Severity.PASS


def test_six_cell_pack_on_a_24_volt_motor_passes():
    # common practice: 25.2 V full on a 24 V motor is 1.05 x
    motor = {"name": "drive", "type": "brushed", "rated_voltage": "24 V"}
    assert findings(SIX_CELL_LIPO, motors=[motor])["motor 'drive'"].severity is Severity.PASS


def test_motor_without_rated_voltage_is_unassessed():
    motor = {"name": "hub", "type": "brushless", "kv": "100 rpm/V"}
    finding = findings(motors=[motor])["motor 'hub'"]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("motors[0].rated_voltage",)


def test_no_battery_is_unassessed_and_no_parts_pass():
    finding = run_rule_on(RULE, {})[0]
    assert finding.severity is Severity.UNASSESSED and finding.missing == ("battery",)
    only = findings()
    assert list(only) == ["voltage ratings"]
    assert only["voltage ratings"].severity is Severity.PASS
