"""speed.rider-class: top speed on the flat for each rider, against the class limits."""

from __future__ import annotations

import copy
import math
import re
from typing import Any

import pytest
from firstride_rules.speed.rider_class import RULE

from reviewer.findings import Finding, Severity
from reviewer.testing import rule_outputs, run_rule_on, variant

G, RHO = 9.80665, 1.225  # CGPM standard gravity; ISA sea-level air density

# An invented kart: 10S lithium pack (42 V full), one brushed motor with no wires or pack
# resistance given, so its loop is the winding alone and the drive is easy to check by hand.
KART: dict[str, Any] = {
    "vehicle": {"name": "test kart", "kind": "kart", "mass": "20 kg"},
    "riders": [{"name": "Ada", "mass": "80 kg", "class": "adult"}],
    "battery": {"chemistry": "li-ion", "cells_series": 10},
    "motors": [
        {
            "name": "rear",
            "type": "brushed",
            "kv": "100 rpm/V",
            "winding_resistance": "0.1 ohm",
            "no_load_current": "1 A",
        }
    ],
    "controller": {"motor_current_limit": "10 A"},
    "drivetrain": {
        "motor_pulley_teeth": 12,
        "wheel_pulley_teeth": 60,
        "wheel_diameter": "200 mm",
        "efficiency": "90 %",
    },
    "usage": {"rolling_resistance": 0.01, "drag_area": "0.8 m^2"},
}


def kart(**changes: Any) -> dict[str, Any]:
    return variant(KART, **changes)


def rider(name: str, mass: str, rider_class: str) -> dict[str, str]:
    return {"name": name, "mass": mass, "class": rider_class}


def finding_for(findings: list[Finding], name: str) -> Finding:
    matches = [f for f in findings if f.subject == f"rider '{name}'"]
    assert len(matches) == 1, [f.subject for f in findings]
    return matches[0]


def kmh(finding: Finding) -> float:
    assert finding.measured is not None
    return float(finding.measured.m_as("km/h"))


def test_rule_id() -> None:
    assert RULE.id == "speed.rider-class"


def test_current_limited_top_speed_matches_the_closed_form() -> None:
    # derived from the road-load equation, ISA rho, CGPM g: where the current limit holds,
    # wheel force F = Kt (I_lim - I0) x 5 x 0.9 / 0.1 m is constant and
    # v = sqrt((F - m g Crr) / (0.5 rho CdA)); Kt = 9.5493 / Kv (SI definition of Kt and Ke)
    force = 9.5493 / 100 * (10 - 1) * 5 * 0.9 / 0.1
    expected = math.sqrt((force - 100 * G * 0.01) / (0.5 * RHO * 0.8)) * 3.6
    finding = finding_for(run_rule_on(RULE, kart()), "Ada")
    assert kmh(finding) == pytest.approx(expected, rel=1e-4)
    # the knee of the line (back-EMF = 42 V - 10 A x 0.1 ohm) lies above that speed, so the
    # closed form applies: 4100 rpm / 5 x pi x 0.2 m
    assert expected < 4100 / 5 * math.pi * 0.2 * 60 / 1000


def test_adult_a_little_over_is_fix() -> None:
    # profile limit 25 km/h (EN 17128 scope); 27.6 km/h is under 20 % over
    finding = finding_for(run_rule_on(RULE, kart()), "Ada")
    assert finding.severity is Severity.FIX
    assert 25.0 < kmh(finding) <= 30.0
    assert finding.limit.m_as("km/h") == pytest.approx(25.0)


def test_adult_more_than_a_fifth_over_is_stop() -> None:
    # common practice: an adult more than 20 % over the limit is a stop
    findings = run_rule_on(RULE, kart(usage__drag_area="0.4 m^2"))
    finding = finding_for(findings, "Ada")
    assert kmh(finding) > 30.0
    assert finding.severity is Severity.STOP


def test_adult_within_the_limit_passes() -> None:
    finding = finding_for(run_rule_on(RULE, kart(controller={"max_duty": "70 %"})), "Ada")
    assert finding.severity is Severity.PASS
    assert kmh(finding) <= 25.0
    assert finding.remedy is None


@pytest.mark.parametrize(("rider_class", "duty"), [("youth", "66 %"), ("child", "40 %")])
def test_youth_or_child_over_at_all_is_stop(rider_class: str, duty: str) -> None:
    # common practice: a youth or child rider over the class limit is a stop, even by 3 %
    data = kart(riders=[rider("Kim", "40 kg", rider_class)], controller={"max_duty": duty})
    finding = finding_for(run_rule_on(RULE, data), "Kim")
    limit = finding.limit.m_as("km/h")
    assert limit < kmh(finding) < 1.05 * limit
    assert finding.severity is Severity.STOP


def test_lighter_rider_is_clearly_faster() -> None:
    # common practice: a 25 kg rider reaches a clearly higher top speed than an 80 kg rider on
    # the same drive
    data = kart(riders=[rider("Light", "25 kg", "adult"), rider("Heavy", "80 kg", "adult")])
    data["usage"]["rolling_resistance"] = 0.02  # small scooter wheels
    findings = run_rule_on(RULE, data)
    light, heavy = kmh(finding_for(findings, "Light")), kmh(finding_for(findings, "Heavy"))
    assert light > 1.1 * heavy


def test_halving_the_pack_voltage_about_halves_no_load_speed() -> None:
    # common practice: a brushed motor on 12 V runs at about half its 24 V no-load speed
    def no_load_rpm(cells: int) -> float:
        data = kart(battery={"chemistry": "lead-acid", "cells_series": cells})
        _, figures, _ = rule_outputs(RULE, data)
        (figure,) = [f for f in figures if f.name.startswith("no-load speed at full voltage")]
        return float(figure.value.m_as("rpm"))

    assert no_load_rpm(12) / no_load_rpm(6) == pytest.approx(2.0, rel=0.05)


def test_motor_figures() -> None:
    # SI definition of Kt and Ke: Kt = 9.5493 / Kv; no-load speed (42 V - 1 A x 0.1 ohm) x Kv
    _, figures, _ = rule_outputs(RULE, kart())
    by_name = {f.name: f.value for f in figures}
    assert by_name["Kt, motor 'rear'"].m_as("N*m/A") == pytest.approx(0.095493, rel=1e-4)
    assert by_name["Kv, motor 'rear'"].m_as("rpm/V") == pytest.approx(100.0)
    assert by_name["no-load speed at full voltage, motor 'rear'"].m_as("rpm") == pytest.approx(
        4190.0
    )
    assert "top speed, rider 'Ada'" in by_name


def test_kinetic_energy_and_stopping_distance_are_reported() -> None:
    # kinematics: 0.5 m v^2 and v^2 / (2 a) at the profile's 3 m/s^2
    findings, figures, _ = rule_outputs(RULE, kart())
    speed = kmh(finding_for(findings, "Ada")) / 3.6
    by_name = {f.name: f.value for f in figures}
    energy = by_name["kinetic energy at top speed, rider 'Ada'"].m_as("J")
    distance = by_name["braking distance from top speed, rider 'Ada'"].m_as("m")
    assert energy == pytest.approx(0.5 * 100.0 * speed**2)
    assert distance == pytest.approx(speed**2 / 6.0)


def test_two_motors_add_their_wheel_force() -> None:
    # lever rule (physics): two current-limited motors give twice the wheel force
    data = kart(usage__drag_area="3 m^2")
    twin = copy.deepcopy(data)
    twin["motors"].append({**data["motors"][0], "name": "front"})
    one = kmh(finding_for(run_rule_on(RULE, data), "Ada"))
    two = kmh(finding_for(run_rule_on(RULE, twin), "Ada"))
    force = 9.5493 / 100 * (10 - 1) * 5 * 0.9 / 0.1
    expected = math.sqrt((2 * force - 100 * G * 0.01) / (0.5 * RHO * 3.0)) * 3.6
    assert two == pytest.approx(expected, rel=1e-4)
    assert two > one


def test_pulley_remedy_meets_the_limit_when_rerun() -> None:
    # re-solved with the same road-load model: the named pulley brings the rider within limit
    finding = finding_for(run_rule_on(RULE, kart()), "Ada")
    match = re.search(r"motor pulley of (\d+) teeth", finding.remedy or "")
    assert match, finding.remedy
    teeth = int(match.group(1))
    rerun = finding_for(run_rule_on(RULE, kart(drivetrain__motor_pulley_teeth=teeth)), "Ada")
    assert rerun.severity is Severity.PASS
    assert kmh(rerun) <= 25.0
    # and it is the largest such pulley: one tooth more is still too fast
    bigger = finding_for(run_rule_on(RULE, kart(drivetrain__motor_pulley_teeth=teeth + 1)), "Ada")
    assert bigger.severity is not Severity.PASS


def test_duty_remedy_meets_the_limit_when_rerun() -> None:
    data = kart(riders=[rider("Kim", "30 kg", "child")])
    finding = finding_for(run_rule_on(RULE, data), "Kim")
    assert finding.severity is Severity.STOP
    match = re.search(r"controller\.max_duty\) at or below (\d+) %", finding.remedy or "")
    assert match, finding.remedy
    percent = int(match.group(1))
    rerun = finding_for(
        run_rule_on(
            RULE,
            {**data, "controller": {"motor_current_limit": "10 A", "max_duty": f"{percent} %"}},
        ),
        "Kim",
    )
    assert rerun.severity is Severity.PASS
    assert kmh(rerun) <= 12.0
    faster = finding_for(
        run_rule_on(
            RULE,
            {**data, "controller": {"motor_current_limit": "10 A", "max_duty": f"{percent + 1} %"}},
        ),
        "Kim",
    )
    assert faster.severity is Severity.STOP


def test_ratio_remedy_meets_the_limit_when_rerun() -> None:
    data = kart(drivetrain={"ratio": 5.0, "wheel_diameter": "200 mm", "efficiency": "90 %"})
    finding = finding_for(run_rule_on(RULE, data), "Ada")
    assert finding.severity is Severity.FIX
    match = re.search(r"reduction of at least ([\d.]+):1", finding.remedy or "")
    assert match, finding.remedy
    ratio = float(match.group(1))
    rerun = finding_for(
        run_rule_on(
            RULE,
            kart(drivetrain={"ratio": ratio, "wheel_diameter": "200 mm", "efficiency": "90 %"}),
        ),
        "Ada",
    )
    assert rerun.severity is Severity.PASS


def test_profile_defaults_are_flagged() -> None:
    _, _, given = rule_outputs(RULE, kart())
    _, _, defaulted = rule_outputs(RULE, kart(usage=None, drivetrain__efficiency=None))
    texts = " ".join(a.text for a in defaulted)
    assert "usage.rolling_resistance not given" in texts
    assert "usage.drag_area not given" in texts
    assert "drivetrain.efficiency not given" in texts
    assert not any("not given" in a.text for a in given)


def test_missing_inputs_are_named() -> None:
    data = kart(vehicle={"name": "bare", "kind": "kart"}, drivetrain={"ratio": 5.0})
    data["motors"][0].pop("winding_resistance")
    findings = run_rule_on(RULE, data)
    finding = finding_for(findings, "Ada")
    assert finding.severity is Severity.UNASSESSED
    assert set(finding.missing) == {
        "vehicle.mass",
        "motors[0].winding_resistance",
        "drivetrain.wheel_diameter",
    }


def test_no_riders_is_unassessed() -> None:
    findings = run_rule_on(RULE, kart(riders=[]))
    assert len(findings) == 1
    assert findings[0].severity is Severity.UNASSESSED
    assert findings[0].missing == ("riders",)


def test_no_load_speed_and_rated_voltage_stand_in_for_kv() -> None:
    # DC motor equation V = I0 R + n0 / Kv at no load (Hughes, Electric Motors and Drives,
    # ch. 3, from memory): 1 A through 0.1 ohm leaves 23.9 V, so 2390 rpm at 24 V is 100 rpm/V
    motor = {**KART["motors"][0], "no_load_speed": "2390 rpm", "rated_voltage": "24 V"}
    motor.pop("kv")
    same = kmh(finding_for(run_rule_on(RULE, kart(motors=[motor])), "Ada"))
    assert same == pytest.approx(kmh(finding_for(run_rule_on(RULE, kart()), "Ada")))
