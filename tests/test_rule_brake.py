"""brake.dynamic: a motor-shorting brake's contact current, its deceleration, and the friction
brake it needs beside it."""

from __future__ import annotations

import math
import re
from typing import Any

import pytest
from firstride_rules.brake.dynamic import RULE

from reviewer.findings import Finding, Severity
from reviewer.testing import rule_outputs, run_rule_on, variant

G, RHO = 9.80665, 1.225  # CGPM standard gravity; ISA sea-level air density
KT = 60 / (2 * math.pi * 100)  # N m/A = Ke in V s/rad for 100 rpm/V (SI definition)

# An invented kart: 10S lithium pack (42 V full), one brushed motor with no wires or pack
# resistance given, a 10 A current limit that holds up to the top speed of both riders, so the
# top speeds have a closed form, and a relay that shorts the motor to brake.
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
            "winding_resistance": "0.4 ohm",
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
    "brakes": [{"kind": "dynamic", "relay_contact_rating": "10 A", "coil_current": "60 mA"}],
    "usage": {"rolling_resistance": 0.01, "drag_area": "1.0 m^2", "steepest_grade": "0 %"},
}
# An invented friction brake to put beside the dynamic one.
FRICTION = {"kind": "friction", "acts_on": "front", "deceleration": "4 m/s^2"}


def kart(friction: bool = False, **changes: Any) -> dict[str, Any]:
    """The kart with ``brake__X`` changing its dynamic brake, a friction brake beside it."""
    paths = {key.replace("brake__", "brakes__0__", 1): value for key, value in changes.items()}
    data = variant(KART, **paths)
    if friction:
        data["brakes"].append(dict(FRICTION))
    return data


def by_subject(data: dict[str, Any]) -> dict[str, Finding]:
    findings = run_rule_on(RULE, data)
    subjects = [f.subject for f in findings]
    assert len(subjects) == len(set(subjects)), "one finding per subject"
    return {f.subject: f for f in findings}


def top_speed(total_mass: float) -> float:
    # road-load equation, ISA rho, CGPM g: with the current limit holding, the wheel force
    # F = Kt (I_lim - I0) x 5 x 0.9 / 0.1 m is constant and v = sqrt((F - m g Crr) / (0.5 rho CdA))
    force = KT * (10 - 1) * 5 * 0.9 / 0.1
    speed = math.sqrt((force - total_mass * G * 0.01) / (0.5 * RHO * 1.0))
    # the knee (back-EMF 42 V - 10 A x 0.4 ohm = 38 V, 3800 rpm) lies above it
    assert speed < 3800 / 5 * 2 * math.pi * 0.1 / 60
    return speed


def braking_current(speed: float, loop_ohm: float) -> float:
    # shorted DC machine (Chapman, from memory): I = Ke w / R_loop, w = v x 5 / 0.1 m
    return KT * speed * 5 / 0.1 / loop_ohm


CONTACTS = "brake relay contacts, motor 'rear'"


def test_rule_id() -> None:
    assert RULE.id == "brake.dynamic"


def test_braking_current_at_the_lightest_riders_top_speed() -> None:
    # Kim (60 kg with the kart) is the fastest: 7.32 m/s, 366 rad/s, 34.9 V, 87.3 A at 0.4 ohm
    expected = braking_current(top_speed(60.0), 0.4)
    findings, figures, _ = rule_outputs(RULE, kart())
    (current,) = [f for f in figures if f.name == "braking current at top speed, motor 'rear'"]
    assert current.value.m_as("A") == pytest.approx(expected, rel=1e-4)
    assert "Kim" in current.note
    contacts = {f.subject: f for f in findings}[CONTACTS]
    assert contacts.measured.m_as("A") == pytest.approx(expected, rel=1e-4)
    assert contacts.limit.m_as("A") == pytest.approx(10.0)


def test_speed_at_contact_rating_check_value() -> None:
    # domain brief check value (derived from E = Ke w, I = E / R): 30 A, 0.2 ohm, 100 rpm/V
    # gives n* = 600 rpm; through 5:1 on a 0.2 m wheel that is 120 rpm, 4.52 km/h
    data = kart(brake__relay_contact_rating="30 A")
    data["motors"][0]["winding_resistance"] = "0.2 ohm"
    _, figures, _ = rule_outputs(RULE, data)
    name = "speed at which the braking current equals the contact rating, motor 'rear'"
    (figure,) = [f for f in figures if f.name == name]
    assert "600 rpm" in figure.note
    assert figure.value.m_as("km/h") == pytest.approx(120 * math.pi * 0.2 * 60 / 1000)


def test_over_rated_contacts_on_the_only_brake_is_stop() -> None:
    # common practice: a relay with a coil near 60 mA and contacts rated 10 A, shorting a
    # kart motor at speed, carries many times its rating; as the only brake that is a stop
    findings = by_subject(kart())
    assert findings[CONTACTS].severity is Severity.STOP


def test_over_rated_contacts_beside_a_friction_brake_is_fix() -> None:
    findings = by_subject(kart(friction=True))
    assert findings[CONTACTS].severity is Severity.FIX


def test_contacts_within_their_rating_pass() -> None:
    findings = by_subject(kart(brake__relay_contact_rating="100 A", friction=True))
    assert findings[CONTACTS].severity is Severity.PASS
    assert findings[CONTACTS].remedy is None


def test_brake_resistor_in_the_remedy_passes_when_rerun() -> None:
    # I = E / (R_loop + R_added): 34.9 V held to 10 A needs 3.49 ohm in all, 3.10 ohm added
    finding = by_subject(kart())[CONTACTS]
    match = re.search(r"brake resistor of at least ([\d.]+) ohm", finding.remedy or "")
    assert match, finding.remedy
    resistor = float(match.group(1))
    emf = KT * top_speed(60.0) * 5 / 0.1
    assert resistor == pytest.approx(math.ceil((emf / 10 - 0.4) * 100) / 100)
    rerun = by_subject(kart(brake__brake_resistance=f"{resistor} ohm"))
    assert rerun[CONTACTS].severity is Severity.PASS
    assert rerun[CONTACTS].measured.m_as("A") <= 10.0
    assert "at least 88 A DC" in (finding.remedy or "")  # contacts rated for 87.3 A, rounded up


def test_brake_wires_count_in_the_loop() -> None:
    # CRC handbook table via the domain brief: 20 AWG is 33.31 ohm/km at 20 degC, so 0.5 m
    # adds 0.01666 ohm to the 0.4 ohm winding
    wire = {"name": "brake loop", "circuit": "brake", "gauge": "20 AWG", "length": "0.5 m"}
    data = kart()
    data["wires"] = [wire]
    expected = braking_current(top_speed(60.0), 0.4 + 0.03331 * 0.5)
    finding = by_subject(data)[CONTACTS]
    assert finding.measured.m_as("A") == pytest.approx(expected, rel=1e-3)


def test_deceleration_of_each_rider_at_their_own_top_speed() -> None:
    # F = Kt Ke reduction^2 v / (R r^2) (Chapman, from memory) over the mass; Ada, the
    # heaviest, gets the least: 0.0091189 x 25 / (0.4 x 0.01) x 6.87 m/s / 100 kg = 3.91 m/s^2
    findings = by_subject(kart(brake__relay_contact_rating="100 A"))
    for name, mass in (("Ada", 100.0), ("Kim", 60.0)):
        finding = findings[f"dynamic braking, rider '{name}'"]
        expected = KT * KT * 25 / (0.4 * 0.01) * top_speed(mass) / mass
        assert finding.measured.m_as("m/s**2") == pytest.approx(expected, rel=1e-4)
        # eKFV section 4(1) no. 3: at least 3.5 m/s^2 (the profile's published example)
        assert finding.limit.m_as("m/s**2") == pytest.approx(3.5)
        assert finding.severity is Severity.PASS


def test_weak_only_brake_is_fix_and_weak_second_brake_is_advise() -> None:
    # a 1 ohm brake resistor cuts the force by 1.4 / 0.4 ohm: Ada gets 1.12 m/s^2, under
    # 3.5 m/s^2 (eKFV 4(1) no. 3) as the only brake and under 44 % of it, 1.54 m/s^2
    # (eKFV 4(1) no. 4), beside a friction brake
    data = kart(brake__brake_resistance="1 ohm", brake__relay_contact_rating="100 A")
    alone = by_subject(data)["dynamic braking, rider 'Ada'"]
    expected = KT * KT * 25 / (1.4 * 0.01) * top_speed(100.0) / 100.0
    assert alone.measured.m_as("m/s**2") == pytest.approx(expected, rel=1e-4)
    assert alone.severity is Severity.FIX
    assert "friction brake" in (alone.remedy or "")
    data["brakes"].append(dict(FRICTION))
    beside = by_subject(data)["dynamic braking, rider 'Ada'"]
    assert beside.severity is Severity.ADVISE
    assert beside.limit.m_as("m/s**2") == pytest.approx(0.44 * 3.5)


def test_lower_resistor_in_the_advice_passes_when_rerun() -> None:
    data = kart(
        brake__brake_resistance="1 ohm",
        brake__relay_contact_rating="100 A",
        friction=True,
    )
    finding = by_subject(data)["dynamic braking, rider 'Ada'"]
    match = re.search(
        r"brake resistor \(brakes\[\]\.brake_resistance\) to at most ([\d.]+) ohm",
        finding.remedy or "",
    )
    assert match, finding.remedy
    data["brakes"][0]["brake_resistance"] = f"{match.group(1)} ohm"
    assert by_subject(data)["dynamic braking, rider 'Ada'"].severity is Severity.PASS


def test_no_dynamic_brake_passes_and_says_why() -> None:
    findings = run_rule_on(RULE, kart(brakes=[FRICTION]))
    assert [f.severity for f in findings] == [Severity.PASS]
    assert "brake.stopping" in findings[0].rationale


def test_no_brakes_list_is_unassessed_naming_it() -> None:
    findings = run_rule_on(RULE, kart(brakes=None))
    assert [f.missing for f in findings] == [("brakes",)]
    assert findings[0].severity is Severity.UNASSESSED


def test_contacts_are_judged_at_the_descent_speed() -> None:
    # the road load on a descent (brief 3, gravity's pull m g sin theta added): downhill the
    # vehicle runs faster than on the flat, so the braking current I = Ke w / R is higher
    flat = by_subject(kart(brake__relay_contact_rating="300 A"))[CONTACTS]
    steep = by_subject(kart(brake__relay_contact_rating="300 A", usage__steepest_grade="8 %"))[
        CONTACTS
    ]
    assert steep.measured.m_as("A") > flat.measured.m_as("A")
    assert "steepest descent" in steep.rationale
    unknown = by_subject(kart(brake__relay_contact_rating="300 A", usage__steepest_grade=None))
    assert unknown[CONTACTS].severity is Severity.UNASSESSED
    assert unknown[CONTACTS].missing == ("usage.steepest_grade",)


def test_missing_inputs_are_named() -> None:
    contacts = by_subject(kart(brake__relay_contact_rating=None))[CONTACTS]
    assert contacts.severity is Severity.UNASSESSED
    assert contacts.missing == ("brakes[0].relay_contact_rating",)
    data = kart(riders=[], drivetrain__wheel_diameter=None)
    finding = by_subject(data)["braking current and deceleration"]
    assert finding.severity is Severity.UNASSESSED
    assert set(finding.missing) == {"riders", "drivetrain.wheel_diameter"}


def test_a_shorted_brushless_motor_brakes_less_once_its_inductance_counts() -> None:
    # brief 14 (AC circuit theory): a shorted winding carries I = E / |R + j w_e L| and brakes
    # with its I^2 R, so the resistive force falls by (R / |Z|)^2 at w_e = pole pairs x w
    brushless = {**KART["motors"][0], "type": "brushless"}
    data = kart(motors=[brushless], brake__relay_contact_rating="100 A")
    upper = by_subject(data)["dynamic braking, rider 'Ada'"]
    assert upper.severity is Severity.UNASSESSED  # an upper bound settles no pass
    assert set(upper.missing) == {"motors[0].winding_inductance", "motors[0].pole_pairs"}
    # the resistive figure F = Kt Ke reduction^2 v / (R r^2) gives the top speed it was taken at
    per_speed = KT * KT * 25 / (0.4 * 0.01) / 100.0
    resistive = upper.measured.m_as("m/s**2")
    speed = resistive / per_speed
    known = {**brushless, "winding_inductance": "300 uH", "pole_pairs": 7}
    finding = by_subject(kart(motors=[known], brake__relay_contact_rating="100 A"))[
        "dynamic braking, rider 'Ada'"
    ]
    omega = speed / 0.1 * 5  # motor rad/s: wheel radius 0.1 m, 5:1 reduction
    share = 1 / (1 + (7 * omega * 300e-6 / 0.4) ** 2)
    assert finding.measured.m_as("m/s**2") == pytest.approx(resistive * share, rel=1e-4)
    assert finding.severity is Severity.FIX  # about 1.6 m/s^2 against 3.5 as the only brake


def test_contacts_exactly_at_their_rating_pass() -> None:
    # the relay's DC rating is a maximum: a current exactly at it is within it
    current = by_subject(kart())[CONTACTS].measured.m_as("A")
    exact = by_subject(kart(brake__relay_contact_rating=f"{current!r} A"))[CONTACTS]
    assert exact.severity is Severity.PASS
    assert "on the flat" in exact.rationale  # a 0 % descent is no faster than the flat


def test_the_fade_speed_is_where_the_force_meets_the_requirement() -> None:
    # F = c v (Chapman, from memory), so the deceleration falls under a_req below
    # v = a_req m / c; beside a friction brake a_req is 44 % of 3.5 m/s^2 (eKFV 4(1) no. 4)
    finding = by_subject(kart(friction=True, brake__relay_contact_rating="100 A"))[
        "dynamic braking, rider 'Ada'"
    ]
    c = KT * KT * 25 / (0.4 * 0.01)
    fade = 0.44 * 3.5 * 100.0 / c * 3.6
    assert f"below {fade:.3g} km/h it gives under 1.54 m/s²" in finding.rationale
    assert "44 % of 3.5 m/s²" in finding.rationale


def test_a_dynamic_brake_just_short_of_its_requirement_is_not_a_pass() -> None:
    # the requirement is a minimum: just under it is short (a boundary of a >= comparison)
    c = KT * KT * 25 / (0.4 * 0.01)
    decel = c * top_speed(100.0) / 100.0
    # a brake resistor that brings Ada's deceleration a hair under 3.5 m/s^2
    resistor = 0.4 * decel / 3.499 - 0.4
    data = kart(brake__relay_contact_rating="200 A", brake__brake_resistance=f"{resistor} ohm")
    finding = by_subject(data)["dynamic braking, rider 'Ada'"]
    assert finding.measured.m_as("m/s**2") < 3.5
    assert finding.severity is Severity.FIX


def test_several_motors_and_several_dynamic_brakes_are_told_apart() -> None:
    second = {**KART["motors"][0], "name": "front"}
    data = kart(motors=[KART["motors"][0], second])
    findings, _, notes = rule_outputs(RULE, data)
    assert any("its own relay contacts" in n.text for n in notes)
    assert {f"brake relay contacts, motor '{m}'" for m in ("rear", "front")} <= {
        f.subject for f in findings
    }
    data = kart(brakes=[KART["brakes"][0], {**KART["brakes"][0], "name": "spare"}])
    subjects = {f.subject for f in run_rule_on(RULE, data)}
    assert "brake relay contacts, motor 'rear', brakes[0] (dynamic)" in subjects
    assert "brake relay contacts, motor 'rear', brake 'spare'" in subjects
