"""performance.hill: the current the heaviest rider's climb needs, against the current limit
and the motor's rated current."""

from __future__ import annotations

import math
import re
from dataclasses import replace
from typing import Any

import pytest
from firstride_rules.performance.hill import RULE

from reviewer.findings import Finding, Severity, Source
from reviewer.profile import Limit
from reviewer.session import default_profile
from reviewer.testing import rule_outputs, run_rule_on, variant
from reviewer.units import quantity

G, RHO = 9.80665, 1.225  # CGPM standard gravity; ISA sea-level air density
KT = 60 / (2 * math.pi * 100)  # N m/A for 100 rpm/V (SI definition of Kt)

# An invented kart: 10S lithium pack, one brushed motor rated 20 A continuous, a 30 A current
# limit, 5:1 belt reduction on a 200 mm wheel, and a 10 % hill on the builder's usual route.
KART: dict[str, Any] = {
    "vehicle": {"name": "test kart", "kind": "kart", "mass": "20 kg"},
    "riders": [
        {"name": "Ada", "mass": "80 kg", "class": "adult"},
        {"name": "Kim", "mass": "40 kg", "class": "youth"},
    ],
    "battery": {"chemistry": "li-ion", "cells_series": 10},
    "motors": [
        {
            "name": "rear",
            "type": "brushed",
            "kv": "100 rpm/V",
            "winding_resistance": "0.1 ohm",
            "no_load_current": "1 A",
            "rated_current": "30 A",
        }
    ],
    "controller": {"motor_current_limit": "30 A"},
    "drivetrain": {
        "motor_pulley_teeth": 12,
        "wheel_pulley_teeth": 60,
        "wheel_diameter": "200 mm",
        "efficiency": "90 %",
    },
    "usage": {"rolling_resistance": 0.01, "drag_area": "0.5 m^2", "steepest_grade": "10 %"},
}


def kart(**changes: Any) -> dict[str, Any]:
    return variant(KART, **changes)


def climb(data: dict[str, Any], profile: Any = None) -> Finding:
    findings = run_rule_on(RULE, data, profile)
    assert len(findings) == 1, [f.subject for f in findings]
    return findings[0]


def needed_current(
    mass: float, grade: float, speed_kmh: float, reduction: float, crr: float = 0.01
) -> float:
    # road-load equation on a grade, ISA rho, CGPM g: F = m g (Crr cos + sin) + 0.5 rho CdA v^2;
    # shaft torque F r / (reduction x 0.9); I = T / Kt + I0 (T = Kt (I - I0), Chapman)
    theta = math.atan(grade / 100)
    speed = speed_kmh / 3.6
    force = mass * G * (crr * math.cos(theta) + math.sin(theta)) + 0.5 * RHO * 0.5 * speed**2
    return force * 0.1 / (reduction * 0.9) / KT + 1.0


def test_rule_id() -> None:
    assert RULE.id == "performance.hill"


def test_climb_current_of_the_heaviest_rider_matches_the_road_load() -> None:
    # Ada (100 kg with the kart) at walking pace (5 km/h, profile, common practice) up 10 %:
    # 107.9 N at the wheel, 26.1 A
    expected = needed_current(100.0, 10.0, 5.0, 5.0)
    assert expected == pytest.approx(26.12, abs=0.01)
    finding = climb(kart())
    assert "Ada" in finding.subject
    assert finding.measured.m_as("A") == pytest.approx(expected, rel=1e-6)
    assert finding.severity is Severity.PASS  # within the 30 A limit and the 30 A rating


def test_road_load_check_value_through_the_rule() -> None:
    # domain brief check value (road-load equation, ISA, CGPM): 100 kg, Crr 0.01, CdA 0.6 m^2,
    # 25 km/h on the flat takes 27.53 N; through 5:1 at 90 % on 0.1 m that is
    # 27.53 x 0.1 / 4.5 / Kt + 1 A = 7.41 A
    profile = default_profile()
    key = "performance.hill.climb_speed"
    limits = {**profile.limits, key: Limit(key, quantity(25, "km/h"), Source("test profile"))}
    data = kart(usage={"rolling_resistance": 0.01, "drag_area": "0.6 m^2", "steepest_grade": "0 %"})
    finding = climb(data, replace(profile, limits=limits))
    assert finding.measured.m_as("A") == pytest.approx(27.53 * 0.1 / 4.5 / KT + 1.0, abs=0.005)


def test_current_limit_below_the_climb_is_fix() -> None:
    # 26.1 A needed against a 20 A limit: the vehicle stalls on the hill
    finding = climb(kart(controller={"motor_current_limit": "20 A"}))
    assert finding.severity is Severity.FIX
    assert finding.limit.m_as("A") == pytest.approx(20.0)
    assert "stalls" in finding.rationale


def test_stall_remedies_climb_when_rerun() -> None:
    # torque balance: Kt (20 A - 1 A) x (60 / n) x 0.9 / 0.1 m >= 107.9 N gives n <= 9 teeth;
    # a current limit of ceil(26.1 A) = 27 A also climbs
    data = kart(controller={"motor_current_limit": "20 A"})
    finding = climb(data)
    teeth = re.search(r"motor pulley of (\d+) teeth", finding.remedy or "")
    limit = re.search(
        r"current limit \(controller\.motor_current_limit\) to at least (\d+) A",
        finding.remedy or "",
    )
    assert teeth and limit, finding.remedy
    assert int(teeth.group(1)) == 9
    assert int(limit.group(1)) == 27
    regeared = climb(
        kart(controller={"motor_current_limit": "20 A"}, drivetrain__motor_pulley_teeth=9)
    )
    assert regeared.severity is not Severity.FIX
    unchanged = climb(
        kart(controller={"motor_current_limit": "20 A"}, drivetrain__motor_pulley_teeth=10)
    )
    assert unchanged.severity is Severity.FIX
    assert climb(kart(controller={"motor_current_limit": "27 A"})).severity is not Severity.FIX
    assert climb(kart(controller={"motor_current_limit": "26 A"})).severity is Severity.FIX


def test_ratio_remedy_climbs_when_rerun() -> None:
    drivetrain = {"ratio": 5.0, "wheel_diameter": "200 mm", "efficiency": "90 %"}
    data = kart(controller={"motor_current_limit": "20 A"}, drivetrain=drivetrain)
    finding = climb(data)
    match = re.search(r"reduction of at least ([\d.]+):1", finding.remedy or "")
    assert match, finding.remedy
    ratio = float(match.group(1))
    # torque balance as above: the least reduction is 107.9 x 0.1 / (0.9 Kt x 19 A) = 6.61
    assert ratio == pytest.approx(6.61, abs=0.01)
    rerun = climb(
        kart(controller={"motor_current_limit": "20 A"}, drivetrain={**drivetrain, "ratio": ratio})
    )
    assert rerun.severity is not Severity.FIX


def test_climb_above_the_rated_current_is_advise_and_regearing_passes_when_rerun() -> None:
    # 26.1 A needed, within the 30 A limit but above a 20 A rating: copper loss (26.1/20)^2 =
    # 1.71 x the rated loss (I^2 R)
    data = kart()
    data["motors"][0]["rated_current"] = "20 A"
    finding = climb(data)
    assert finding.severity is Severity.ADVISE
    assert finding.limit.m_as("A") == pytest.approx(20.0)
    assert "1.71 x the rated copper loss" in finding.rationale
    match = re.search(r"motor pulley of (\d+) teeth", finding.remedy or "")
    assert match, finding.remedy
    # torque balance: Kt (20 A - 1 A) x (60 / n) x 0.9 / 0.1 m >= 107.9 N gives n <= 9 teeth
    assert int(match.group(1)) == 9
    data["drivetrain"]["motor_pulley_teeth"] = int(match.group(1))
    rerun = climb(data)
    assert rerun.severity is Severity.PASS
    assert rerun.measured.m_as("A") == pytest.approx(
        needed_current(100.0, 10.0, 5.0, 60 / int(match.group(1))), rel=1e-6
    )


def test_voltage_limited_drive_that_cannot_climb_at_any_gearing() -> None:
    # no current limit: a 2S pack (8.4 V) through a 0.5 ohm winding gives at most 16.8 A at
    # standstill, and less as it turns: 10 % needs far more
    data = kart(battery={"chemistry": "li-ion", "cells_series": 2}, controller=None)
    data["motors"][0]["winding_resistance"] = "0.5 ohm"
    finding = climb(data)
    assert finding.severity is Severity.FIX
    assert finding.limit.m_as("A") < 8.4 / 0.5
    assert "pack through the winding" in finding.rationale


def test_steepest_grade_figure_is_where_the_climb_just_holds() -> None:
    # the reported steepest grade, fed back as the grade ridden, needs the drive's whole
    # current at walking pace (the 20 A limit)
    data = kart(controller={"motor_current_limit": "20 A"})
    _, figures, _ = rule_outputs(RULE, data)
    (figure,) = [f for f in figures if f.name.startswith("steepest grade held")]
    grade = figure.value.m_as("percent")
    assert 0 < grade < 10
    at_limit = climb(
        kart(controller={"motor_current_limit": "20 A"}, usage__steepest_grade=f"{grade} %")
    )
    assert at_limit.measured.m_as("A") == pytest.approx(20.0, rel=1e-6)
    assert at_limit.severity is not Severity.FIX


def test_defaults_are_the_conservative_ones_for_a_hill() -> None:
    # profile defaults for hills: Crr 0.02 (common practice) and 85 % efficiency, both of
    # which raise the current a climb needs
    data = kart(usage={"steepest_grade": "10 %", "drag_area": "0.5 m^2"})
    data["drivetrain"].pop("efficiency")
    findings, _, notes = rule_outputs(RULE, data)
    texts = " ".join(note.text for note in notes)
    assert "Crr 0.02 taken for hills" in texts
    assert "85 % taken for hills" in texts
    expected = needed_current(100.0, 10.0, 5.0, 5.0 * 0.85 / 0.9, crr=0.02)
    assert findings[0].measured.m_as("A") == pytest.approx(expected, rel=1e-6)


def test_no_grade_is_unassessed() -> None:
    finding = climb(kart(usage__steepest_grade=None))
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("usage.steepest_grade",)


def test_missing_inputs_are_named() -> None:
    data = kart(riders=[], drivetrain__wheel_diameter=None)
    finding = climb(data)
    assert finding.severity is Severity.UNASSESSED
    assert set(finding.missing) == {"riders", "drivetrain.wheel_diameter"}


def test_missing_rated_current_is_unassessed_when_it_climbs() -> None:
    data = kart()
    data["motors"][0].pop("rated_current")
    finding = climb(data)
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("motors[0].rated_current",)
    # a stall needs no rating to judge
    data["controller"]["motor_current_limit"] = "20 A"
    assert climb(data).severity is Severity.FIX


def test_an_unstated_current_basis_climbs_on_the_least_torque() -> None:
    # brief 11: under field-oriented drive a peak-quoted amp gives (sqrt 3 / 2) Ke_LL of
    # torque, an rms-quoted one sqrt(3/2) Ke_LL; left unsaid, a hill is judged on the smaller
    motor = {**KART["motors"][0], "type": "brushless"}

    def brushless(**controller: str) -> dict[str, Any]:
        limits = {"drive": "field-oriented", "motor_current_limit": "22 A", **controller}
        return kart(motors=[motor], controller=limits)

    peak = climb(brushless(motor_current_basis="peak"))
    rms = climb(brushless(motor_current_basis="rms"))
    unstated = climb(brushless())
    assert unstated.severity == peak.severity and unstated.rationale == peak.rationale
    assert rms.rationale != peak.rationale
