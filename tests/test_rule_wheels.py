"""mechanical.wheels: each wheel's share of the load with a dynamic allowance, its speed rating
against the highest speed including the descent, and the deck's rated load."""

from __future__ import annotations

import copy
import math
from typing import Any

import pytest
from firstride_rules.mechanical.wheels import RULE

from reviewer.findings import Finding, Severity
from reviewer.testing import rule_outputs, run_rule_on, variant

from .test_rule_brake import KART

G, RHO = 9.80665, 1.225  # CGPM standard gravity; ISA sea-level air density

# An invented scooter on two rated wheels: the drive and riders of tests/test_rule_brake.py's kart.
SCOOTER: dict[str, Any] = {
    **{key: copy.deepcopy(value) for key, value in KART.items() if key != "brakes"},
    "vehicle": {"name": "test scooter", "kind": "scooter", "mass": "20 kg", "rated_load": "100 kg"},
    "wheels": [
        {"name": "front", "position": "front", "rated_load": "90 kg", "speed_rating": "60 km/h"},
        {"name": "rear", "position": "rear", "rated_load": "90 kg", "speed_rating": "60 km/h"},
    ],
    "usage": {"rolling_resistance": 0.01, "drag_area": "1.0 m^2", "steepest_grade": "10 %"},
}


def findings(data: dict[str, Any]) -> dict[str, Finding]:
    return {f.subject: f for f in run_rule_on(RULE, data)}


def test_the_load_of_each_wheel() -> None:
    # 100 kg (heaviest rider with the vehicle) x 0.6 on the more loaded axle x 1.5 for bumps
    # (the profile's common-practice figures) = 90 kg: exactly on a 90 kg rating passes
    wheel = findings(SCOOTER)["wheel 'front' load"]
    assert wheel.measured.m_as("kg") == pytest.approx(90.0)
    assert wheel.severity is Severity.PASS
    over = findings(variant(SCOOTER, wheels=[{**SCOOTER["wheels"][0], "rated_load": "89 kg"}]))
    assert over["wheel 'front' load"].severity is Severity.FIX
    pair = [{**SCOOTER["wheels"][0], "count": 2, "rated_load": "45 kg"}]
    assert findings(variant(SCOOTER, wheels=pair))["wheel 'front' load"].severity is Severity.PASS


def test_the_speed_rating_counts_the_descent() -> None:
    # terminal speed downhill where m g sin(theta) = m g Crr cos(theta) + 0.5 rho CdA v^2
    # (brief 14): downhill the heaviest rider is the fastest, 100 kg down 10 %
    theta = math.atan(0.10)
    coast = math.sqrt(100 * G * (math.sin(theta) - 0.01 * math.cos(theta)) / (0.5 * RHO))
    # above the motor's no-load ground speed (4200 rpm / 5 x pi x 0.2 m = 8.8 m/s) the drive
    # pulls nothing, so the 12 m/s it coasts to is the highest speed
    wheel = findings(SCOOTER)["wheel 'rear' speed rating"]
    assert wheel.measured.m_as("km/h") == pytest.approx(coast * 3.6, rel=1e-6)
    slow = [{**w, "speed_rating": "25 km/h"} for w in SCOOTER["wheels"]]
    assert findings(variant(SCOOTER, wheels=slow))["wheel 'rear' speed rating"].severity is (
        Severity.FIX
    )
    flat = findings(variant(SCOOTER, usage__steepest_grade=None))["wheel 'rear' speed rating"]
    assert flat.severity is Severity.UNASSESSED  # a pass on the flat speed settles nothing
    assert flat.missing == ("usage.steepest_grade",)


def test_the_deck_rated_load() -> None:
    assert findings(SCOOTER)["deck or frame load"].severity is Severity.PASS
    heavy = variant(SCOOTER, vehicle__rated_load="75 kg")
    assert findings(heavy)["deck or frame load"].severity is Severity.FIX
    _, _, notes = rule_outputs(RULE, variant(SCOOTER, vehicle__rated_load=None))
    assert any("vehicle.rated_load" in note.text for note in notes)


def test_missing_ratings_are_named() -> None:
    bare = variant(SCOOTER, wheels=[{"name": "front", "position": "front"}])
    found = findings(bare)
    assert found["wheel 'front' load"].missing == ("wheels[0].rated_load",)
    assert found["wheel 'front' speed rating"].missing == ("wheels[0].speed_rating",)
    (none,) = run_rule_on(RULE, variant(SCOOTER, wheels=None))
    assert none.missing == ("wheels",)
