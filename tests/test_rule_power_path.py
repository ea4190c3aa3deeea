"""battery.bms, power.connectors and charging.ratings: the BMS's own ratings, every connector and
switch in the power path, and the charger against the cells, the BMS and the port."""

from __future__ import annotations

from typing import Any

import pytest
from firstride_rules.battery.bms import RULE as BMS
from firstride_rules.charging.ratings import RULE as CHARGING
from firstride_rules.power.connectors import RULE as CONNECTORS

from reviewer.findings import Finding, Severity
from reviewer.testing import run_rule_on, variant

# An invented 10S2P board (42 V full) on a 20 A battery limit, with a friction brake.
BOARD: dict[str, Any] = {
    "vehicle": {"name": "test board", "kind": "skateboard", "mass": "8 kg"},
    "riders": [{"name": "Ada", "mass": "70 kg", "class": "adult"}],
    "battery": {
        "chemistry": "li-ion",
        "cells_series": 10,
        "cells_parallel": 2,
        "cell_max_charge_current": "1.5 A",
        "charger_voltage": "42 V",
        "bms": {
            "guards_discharge": True,
            "continuous_discharge_current": "20 A",
            "peak_discharge_current": "40 A",
            "charge_current": "5 A",
            "low_temperature_charge_cutoff": True,
        },
    },
    "motors": [{"name": "rear", "type": "brushless", "winding_resistance": "0.1 ohm"}],
    "controller": {
        "drive": "field-oriented",
        "motor_current_limit": "30 A",
        "motor_current_basis": "peak",
        "battery_current_limit": "20 A",
        "regen": True,
        "regen_current_limit": "4 A",
    },
    "brakes": [{"kind": "friction", "acts_on": "front", "deceleration": "4 m/s^2"}],
    "charger": {"current": "3 A", "port_current_rating": "5 A", "port_voltage_rating": "60 V"},
    "connectors": [
        {
            "name": "loop key",
            "kind": "anti-spark",
            "circuit": "battery",
            "current_rating": "20 A",
            "voltage_rating": "60 V",
        },
        {
            "name": "motor bullets",
            "circuit": "phase",
            "current_rating": "40 A",
            "voltage_rating": "60 V",
        },
    ],
}


def findings(rule: Any, data: dict[str, Any]) -> dict[str, Finding]:
    return {f.subject: f for f in run_rule_on(rule, data)}


def board(**changes: Any) -> dict[str, Any]:
    return variant(BOARD, **changes)


# --- battery.bms ---------------------------------------------------------------------------


def test_bms_ratings_against_the_drive_and_the_charge() -> None:
    found = findings(BMS, BOARD)
    # the drive's demand is the 20 A battery limit: exactly on the continuous rating passes
    assert found["BMS continuous discharge rating"].measured.m_as("A") == pytest.approx(20.0)
    assert {f.severity for f in found.values()} == {Severity.PASS}
    # the larger of the charger's 3 A and the 4 A regen current against the 5 A charge rating
    assert found["BMS charge rating"].measured.m_as("A") == pytest.approx(4.0)


def test_a_bms_below_the_drive_is_not_a_pass() -> None:
    weak = board(battery__bms__peak_discharge_current="15 A")
    peak = findings(BMS, weak)["BMS peak discharge rating"]
    assert peak.severity is Severity.FIX  # a friction brake stays when the pack is cut
    electric = variant(weak, brakes=[{"kind": "regenerative", "acts_on": "motor"}])
    assert findings(BMS, electric)["BMS peak discharge rating"].severity is Severity.STOP
    cont = findings(BMS, board(battery__bms__continuous_discharge_current="15 A"))
    assert cont["BMS continuous discharge rating"].severity is Severity.FIX
    regen = findings(BMS, board(controller__regen_current_limit="8 A"))["BMS charge rating"]
    assert regen.severity is Severity.FIX
    assert "regenerative brake vanishes" in regen.rationale


def test_a_charge_only_bms_and_the_old_field() -> None:
    charge_only = findings(BMS, board(battery__bms={"guards_discharge": False}))
    assert charge_only["BMS discharge protection"].severity is Severity.FIX
    (none,) = run_rule_on(BMS, board(battery__bms={"fitted": False}))
    assert none.severity is Severity.PASS and "battery.protection" in none.rationale
    unstated = findings(BMS, board(battery__bms={"guards_discharge": True}))
    assert unstated["BMS peak discharge rating"].missing == ("battery.bms.peak_discharge_current",)
    with pytest.raises(ValueError, match=r"\[battery.bms\]"):
        run_rule_on(BMS, board(battery__bms=True))


# --- power.connectors ----------------------------------------------------------------------


def test_connector_currents() -> None:
    found = findings(CONNECTORS, BOARD)
    key = found["anti-spark 'loop key' current rating"]
    assert key.measured.m_as("A") == pytest.approx(20.0)  # the battery limit, exactly rated
    assert key.severity is Severity.PASS
    # brief 11: a locked rotor held at the 30 A peak phase limit (DC-equivalent 25.98 A)
    bullets = found["connector 'motor bullets' current rating"]
    assert bullets.measured.m_as("A") == pytest.approx(30.0, rel=1e-6)
    assert found["pre-charge of the controller's capacitors"].severity is Severity.PASS


def test_a_36_volt_connector_on_a_42_volt_pack_is_not_a_pass() -> None:
    # 10 x 4.2 V = 42 V full (from memory: Li-ion full charge); a 36 V-class part is below it
    low = variant(BOARD)
    low["connectors"][1]["voltage_rating"] = "36 V"
    assert findings(CONNECTORS, low)["connector 'motor bullets' voltage rating"].severity is (
        Severity.FIX
    )
    switch = variant(BOARD)
    switch["connectors"][0] = {
        **switch["connectors"][0],
        "kind": "switch",
        "voltage_rating": "36 V",
    }
    assert findings(CONNECTORS, switch)["switch 'loop key' voltage rating"].severity is (
        Severity.STOP
    )


def test_pre_charge_above_the_threshold() -> None:
    # brief 15 (P): a controller bank above about 30-40 V needs a pre-charge (30 V taken)
    plain = variant(BOARD)
    plain["connectors"][0] = {**plain["connectors"][0], "kind": "connector", "precharge": False}
    assert findings(CONNECTORS, plain)["pre-charge of the controller's capacitors"].severity is (
        Severity.FIX
    )
    small = variant(plain, battery__cells_series=7)  # 29.4 V
    assert findings(CONNECTORS, small)["pre-charge of the controller's capacitors"].severity is (
        Severity.PASS
    )
    unsaid = variant(BOARD)
    unsaid["connectors"][0] = {**unsaid["connectors"][0], "kind": "connector"}
    precharge = findings(CONNECTORS, unsaid)["pre-charge of the controller's capacitors"]
    assert precharge.missing == ("connectors[0].precharge",)


def test_connectors_unlisted_or_none() -> None:
    (unlisted,) = run_rule_on(CONNECTORS, board(connectors=None))
    assert unlisted.missing == ("connectors",)
    (none,) = run_rule_on(CONNECTORS, board(connectors=[]))
    assert none.severity is Severity.PASS


# --- charging.ratings ----------------------------------------------------------------------


def test_charger_current_into_the_cells() -> None:
    # 3 A over 2 strings is 1.5 A per cell: exactly the cells' rating passes
    found = findings(CHARGING, BOARD)
    assert found["charger current into the cells"].measured.m_as("A") == pytest.approx(1.5)
    assert found["charger current into the cells"].severity is Severity.PASS
    over = findings(CHARGING, board(charger__current="4 A"))["charger current into the cells"]
    assert over.severity is Severity.FIX
    assert "at most 3 A" in (over.remedy or "")


def test_charge_port_and_cold_charging() -> None:
    found = findings(CHARGING, board(charger__port_current_rating="2 A"))
    assert found["charge port current rating"].severity is Severity.FIX
    assert found["charge port voltage rating"].severity is Severity.PASS
    assert found["charging below 0 °C"].severity is Severity.PASS
    # lithium cell datasheets (from memory): no charge below 0 degC
    cold = findings(CHARGING, board(battery__bms__low_temperature_charge_cutoff=None))
    assert cold["charging below 0 °C"].severity is Severity.ADVISE
