"""brake.stopping, brake.regenerative and speed.descent: stopping distances against the brief's
check value and a textbook problem, the stop with the electric brake lost, regeneration into a
full pack, and the speed downhill against the road load."""

from __future__ import annotations

import math
from typing import Any

import pytest
from firstride_rules.brake._capability import stopping_distance
from firstride_rules.brake.regenerative import RULE as REGEN
from firstride_rules.brake.stopping import RULE as STOPPING
from firstride_rules.speed.descent import RULE as DESCENT

from reviewer.cli import main
from reviewer.engineering import stopping as kinematics
from reviewer.engineering.roadload import kmh_to_ms
from reviewer.findings import Finding, Severity
from reviewer.testing import rule_outputs, run_rule_on, variant

G, RHO = 9.80665, 1.225  # CGPM standard gravity; ISA sea-level air density
KT = 60 / (2 * math.pi * 100)  # N m/A = Ke in V s/rad for 100 rpm/V (SI definition)

# An invented scooter: 10S2P lithium pack (42 V full), one brushed motor held at 10 A up to its
# top speed (so the top speed has a closed form), one front friction brake of 4 m/s^2.
SCOOTER: dict[str, Any] = {
    "vehicle": {"name": "test scooter", "kind": "scooter", "mass": "20 kg"},
    "riders": [{"name": "Ada", "mass": "80 kg", "class": "adult"}],
    "battery": {
        "chemistry": "li-ion",
        "cells_series": 10,
        "cells_parallel": 2,
        "cell_internal_resistance": "0.05 ohm",
        "cell_max_charge_current": "2 A",
    },
    "motors": [
        {
            "name": "rear",
            "type": "brushed",
            "kv": "100 rpm/V",
            "winding_resistance": "0.4 ohm",
            "no_load_current": "1 A",
        }
    ],
    "controller": {"motor_current_limit": "10 A", "regen": False, "max_input_voltage": "60 V"},
    "drivetrain": {
        "motor_pulley_teeth": 12,
        "wheel_pulley_teeth": 60,
        "wheel_diameter": "200 mm",
        "efficiency": "90 %",
    },
    "brakes": [
        {
            "name": "front disc",
            "kind": "friction",
            "acts_on": "front",
            "deceleration": "4 m/s^2",
            "tested_with_mass": "100 kg",
        }
    ],
    "usage": {"rolling_resistance": 0.01, "drag_area": "1.0 m^2", "steepest_grade": "0 %"},
}
REGEN_BRAKE = {"name": "regen", "kind": "regenerative", "acts_on": "motor"}


def scooter(**changes: Any) -> dict[str, Any]:
    return variant(SCOOTER, **changes)


def by_subject(rule: Any, data: dict[str, Any]) -> dict[str, Finding]:
    return {f.subject: f for f in run_rule_on(rule, data)}


def top_speed(total_mass: float) -> float:
    # road-load equation (brief 3): the 10 A limit holds a constant wheel force
    # F = Kt (I_lim - I0) x 5 x 0.9 / 0.1 m, so v = sqrt((F - m g Crr) / (0.5 rho CdA))
    force = KT * (10 - 1) * 5 * 0.9 / 0.1
    return math.sqrt((force - total_mass * G * 0.01) / (0.5 * RHO * 1.0))


# --- the stop, integrated over speed ------------------------------------------------------


def test_flat_check_value() -> None:
    # brief 14 check value (D): a 3.0 m/s^2 brake from 25 km/h with 1 s reaction: 14.98 m
    assert stopping_distance(lambda _v: 3.0, kmh_to_ms(25.0), 1.0) == pytest.approx(
        14.98, abs=0.005
    )


def test_descent_check_value() -> None:
    # brief 14 check value (D): 3.0 m/s^2 on a 12 % descent leaves 1.83 m/s^2; with no
    # reaction the stop is v^2 / (2 x 1.83); with 1 s reaction and the speed gathered during
    # it, the closed form of reviewer.engineering.stopping (25.5 m, not the plain 20.1 m)
    v = kmh_to_ms(25.0)
    net = kinematics.net_deceleration(3.0, 12.0)
    assert net == pytest.approx(1.83, abs=0.005)
    assert stopping_distance(lambda _v: 3.0, v, 0.0, 12.0) == pytest.approx(v * v / (2 * net))
    gathered = kinematics.stopping_distance(v, 3.0, 1.0, 12.0, gravity_during_reaction=True)
    assert stopping_distance(lambda _v: 3.0, v, 1.0, 12.0) == pytest.approx(gathered)
    assert gathered == pytest.approx(25.5, abs=0.05)


def test_textbook_stopping_distance() -> None:
    # Giancoli, Physics: Principles with Applications, 7th ed., ch. 2 problem 31: 95 km/h with
    # a 0.40 s reaction stops in 126.6 m at 3.0 m/s^2
    assert stopping_distance(lambda _v: 3.0, kmh_to_ms(95.0), 0.4) == pytest.approx(126.6, abs=0.1)


def test_a_fading_brake_beside_a_constant_one_has_a_closed_form() -> None:
    # dv/ds = -(a0 + k v) / v integrates to s = v/k - (a0 / k^2) ln(1 + k v / a0) (calculus)
    a0, k, v = 2.0, 0.3, 8.0
    expected = v / k - a0 / (k * k) * math.log(1 + k * v / a0)
    assert stopping_distance(lambda s: a0 + k * s, v, 0.0) == pytest.approx(expected, rel=1e-6)


def test_a_brake_that_fades_to_nothing_never_brings_the_vehicle_to_rest() -> None:
    # physics of dynamic braking: a force in proportion to speed vanishes as the wheel stops
    assert stopping_distance(lambda s: 0.3 * s, 8.0, 1.0) == math.inf
    # a brake that does not beat the slope: g sin(atan 0.12) = 1.17 m/s^2
    assert stopping_distance(lambda _v: 1.0, 8.0, 1.0, 12.0) == math.inf


# --- brake.stopping ------------------------------------------------------------------------


def test_a_front_brake_stops_in_the_closed_form_distance() -> None:
    # s = v t_r + v^2 / (2 a) (brief 14), 4 m/s^2 under the front axle's grip of
    # 0.6 x 0.7 x g = 4.12 m/s^2 (the profile's common-practice share, from-memory friction)
    v = top_speed(100.0)
    findings, figures, _ = rule_outputs(STOPPING, scooter())
    flat = {f.subject: f for f in findings}["stopping on the flat, every brake, rider 'Ada'"]
    assert flat.measured.m_as("m") == pytest.approx(v + v * v / 8.0, rel=1e-6)
    # against a brake of exactly 3.5 m/s^2 (eKFV 4(1) no. 3, the profile's published example)
    assert flat.limit.m_as("m") == pytest.approx(v + v * v / 7.0, rel=1e-6)
    assert flat.severity is Severity.PASS
    assert any(f.name.startswith("stopping distance on the flat") for f in figures)


def test_tyre_grip_caps_a_rear_brake() -> None:
    # Coulomb friction: the rear wheel's share of the weight under braking (0.4, common
    # practice) times mu 0.7 (from memory) times g caps a 5 m/s^2 rear brake at 2.746 m/s^2
    v = top_speed(100.0)
    rear = scooter(brakes__0__acts_on="rear", brakes__0__deceleration="5 m/s^2")
    finding = by_subject(STOPPING, rear)["stopping on the flat, every brake, rider 'Ada'"]
    cap = 0.4 * 0.7 * G
    assert finding.measured.m_as("m") == pytest.approx(v + v * v / (2 * cap), rel=1e-6)
    assert finding.severity is Severity.FIX
    assert "front brake" in (finding.remedy or "")


def test_a_heavier_rider_gets_the_same_force() -> None:
    # F = m a: 4 m/s^2 measured at 100 kg is 400 N, 3.33 m/s^2 for 120 kg
    data = scooter(riders=[{"name": "Bo", "mass": "100 kg", "class": "adult"}])
    v = top_speed(120.0)
    finding = by_subject(STOPPING, data)["stopping on the flat, every brake, rider 'Bo'"]
    assert finding.measured.m_as("m") == pytest.approx(v + v * v / (2 * 400 / 120), rel=1e-6)
    assert finding.severity is Severity.FIX


def test_a_friction_brake_short_on_the_descent_is_not_a_pass() -> None:
    # brief 14: on a descent the net deceleration is a - g sin(theta); 3.6 m/s^2 passes the
    # 3.5 m/s^2 on the flat but leaves 2.82 m/s^2 down an 8 % grade
    data = scooter(brakes__0__deceleration="3.6 m/s^2", usage__steepest_grade="8 %")
    findings = by_subject(STOPPING, data)
    assert findings["stopping on the flat, every brake, rider 'Ada'"].severity is Severity.PASS
    descent = findings["stopping down the 8 % descent, every brake, rider 'Ada'"]
    assert descent.severity is Severity.FIX
    pull = G * math.sin(math.atan(0.08))
    assert f"{3.5 + pull:.3g} m/s²" in (descent.remedy or "")


def test_regenerative_braking_alone_is_a_stop() -> None:
    # brief 14 (P): regen into a full pack stops; it can never be the only brake
    data = scooter(brakes=[REGEN_BRAKE], controller__regen=True)
    data["controller"]["regen_current_limit"] = "5 A"
    stopping = by_subject(STOPPING, data)
    assert stopping["brake independent of the drive electronics"].severity is Severity.STOP
    regen = by_subject(REGEN, data)
    assert regen["regenerative braking on a full pack"].severity is Severity.STOP


def test_every_rider_gets_a_distance_with_and_without_the_electric_brake() -> None:
    data = scooter(controller__regen=True, controller__regen_current_limit="5 A")
    data["brakes"].append(REGEN_BRAKE)
    data["riders"].append({"name": "Kim", "mass": "40 kg", "class": "youth"})
    findings, figures, _ = rule_outputs(STOPPING, data)
    names = {f.name for f in figures}
    for rider in ("Ada", "Kim"):
        for which in ("every brake", "the electric brake lost"):
            assert f"stopping distance on the flat, {which}, rider '{rider}'" in names
    subjects = {f.subject: f for f in findings}
    lost = subjects["stopping on the flat, the electric brake lost, rider 'Ada'"]
    every = subjects["stopping on the flat, every brake, rider 'Ada'"]
    assert lost.measured.m_as("m") >= every.measured.m_as("m")  # a brake more never stops longer


def test_no_brakes_and_an_unlisted_brake() -> None:
    none = run_rule_on(STOPPING, scooter(brakes=[]))
    assert [f.severity for f in none] == [Severity.STOP]
    unlisted = run_rule_on(STOPPING, scooter(brakes=None))
    assert [f.missing for f in unlisted] == [("brakes",)]


def test_a_brake_of_unknown_figure_settles_no_shortfall() -> None:
    unknown = scooter(brakes=[{"kind": "friction", "acts_on": "front"}])
    finding = by_subject(STOPPING, unknown)["stopping on the flat, every brake, rider 'Ada'"]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("brakes[0].deceleration",)
    beside = scooter()
    beside["brakes"].append({"kind": "foot", "acts_on": "rear"})
    finding = by_subject(STOPPING, beside)["stopping on the flat, every brake, rider 'Ada'"]
    assert finding.severity is Severity.PASS
    assert "counted as nothing" in finding.rationale


def test_the_single_brake_table_is_an_input_error(tmp_path, capsys) -> None:
    path = tmp_path / "old.toml"
    path.write_text(
        '[vehicle]\nname = "old"\nkind = "kart"\n\n[brake]\nkind = "friction"\n',
        encoding="utf-8",
    )
    assert main(["review", str(path), "-o", str(tmp_path / "out.md")]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "brake" in err[0] and "[[brakes]]" in err[0]
    assert not (tmp_path / "out.md").exists()


# --- brake.regenerative --------------------------------------------------------------------


def test_regen_current_against_the_cells_and_the_voltage_it_lifts() -> None:
    # Ohm's law: 5 A through 10 x 0.05 / 2 = 0.25 ohm lifts the 42 V full pack to 43.25 V;
    # 5 A over 2 strings is 2.5 A per string against the cells' 2 A
    data = scooter(controller__regen=True, controller__regen_current_limit="5 A")
    findings = by_subject(REGEN, data)
    lifted = findings["pack voltage while regenerating"]
    assert lifted.measured.m_as("V") == pytest.approx(42.0 + 5 * 0.25)
    assert lifted.severity is Severity.PASS
    cells = findings["regenerative current into the cells"]
    assert cells.measured.m_as("A") == pytest.approx(2.5)
    assert cells.severity is Severity.FIX
    assert "at most 4 A" in (cells.remedy or "")
    over = by_subject(REGEN, variant(data, controller__max_input_voltage="43 V"))
    assert over["pack voltage while regenerating"].severity is Severity.STOP
    # the lowest DC rating on the terminals sets the limit, a fuse's as much as the controller's
    fuse = {"name": "main", "location": "battery-positive", "rating": "20 A"}
    fused = by_subject(REGEN, variant(data, fuses=[{**fuse, "voltage_rating": "43 V"}]))
    assert fused["pack voltage while regenerating"].severity is Severity.STOP
    assert "fuse 'main'" in fused["pack voltage while regenerating"].rationale


def test_unstated_regeneration_is_unassessed() -> None:
    findings = run_rule_on(REGEN, scooter(controller__regen=None))
    assert [f.missing for f in findings] == [("controller.regen",)]


# --- speed.descent -------------------------------------------------------------------------


def test_coasting_speed_and_back_emf_downhill() -> None:
    # terminal speed where m g sin(theta) = m g Crr cos(theta) + 0.5 rho CdA v^2 (brief 14)
    data = scooter(usage__steepest_grade="10 %")
    findings, figures, _ = rule_outputs(DESCENT, data)
    assert any(f.name.startswith("coasting speed down the 10 % descent") for f in figures)
    theta = math.atan(0.10)
    coast = math.sqrt(100 * G * (math.sin(theta) - 0.01 * math.cos(theta)) / (0.5 * RHO))
    subjects = {f.subject: f for f in findings}
    speed = subjects["speed on the steepest descent, rider 'Ada'"]
    assert speed.measured.m_as("km/h") == pytest.approx(coast * 3.6, rel=1e-6)
    assert speed.severity is Severity.ADVISE  # 33.9 km/h against the adult 25 km/h
    # E = Ke w (SI motor constants): at the coasting speed the motor turns v x 5 / 0.1 m
    emf = subjects["back-EMF on the steepest descent, motor 'rear'"]
    assert emf.measured.m_as("V") == pytest.approx(KT * coast * 5 / 0.1, rel=1e-4)
    assert emf.severity is Severity.ADVISE  # above the 42 V pack, below the 60 V controller
    low = by_subject(DESCENT, variant(data, controller__max_input_voltage="45 V"))
    assert low["back-EMF on the steepest descent, motor 'rear'"].severity is Severity.FIX


def test_downhill_the_heaviest_rider_sets_the_back_emf() -> None:
    # gravity's pull grows with mass and drag does not (brief 14): the heavier rider coasts
    # faster, so the back-EMF is worked at the heaviest rider's speed
    data = scooter(usage__steepest_grade="10 %")
    data["riders"].append({"name": "Kim", "mass": "40 kg", "class": "youth"})
    theta = math.atan(0.10)
    coast = math.sqrt(100 * G * (math.sin(theta) - 0.01 * math.cos(theta)) / (0.5 * RHO))
    emf = by_subject(DESCENT, data)["back-EMF on the steepest descent, motor 'rear'"]
    assert emf.measured.m_as("V") == pytest.approx(KT * coast * 5 / 0.1, rel=1e-4)


def test_weak_regeneration_lets_a_fast_vehicle_run_away() -> None:
    # energy balance: 1 A into a 30 V pack brakes with F = V I / v, 21.6 N at 5 km/h, below the
    # 88 N the 10 % slope pulls beyond rolling resistance: it holds nothing, and from speed the
    # vehicle runs to where drag plus V I / v meet the pull, just under the coasting speed
    data = scooter(usage__steepest_grade="10 %", controller__regen=True)
    data["controller"]["regen_current_limit"] = "1 A"
    theta = math.atan(0.10)
    pull = 100 * G * (math.sin(theta) - 0.01 * math.cos(theta))
    coast = math.sqrt(pull / (0.5 * RHO))
    _, figures, _ = rule_outputs(DESCENT, data)
    (regen,) = [f for f in figures if f.name.startswith("speed down the descent on regen")]
    runaway = regen.value.m_as("m/s")
    assert runaway < coast
    assert pull == pytest.approx(0.5 * RHO * runaway**2 + 30.0 * 1.0 / runaway, rel=1e-3)


def test_no_descent_given_is_unassessed() -> None:
    findings = run_rule_on(DESCENT, scooter(usage__steepest_grade=None))
    assert [f.missing for f in findings] == [("usage.steepest_grade",)]


def test_a_brake_exactly_at_the_minimum_stops_in_exactly_the_reference() -> None:
    # s = v t + v^2 / (2 a) (brief 14): a brake of exactly 3.5 m/s^2 (eKFV 4(1) no. 3) makes
    # exactly the reference stop, which passes (at most the reference)
    data = scooter(brakes__0__deceleration="3.5 m/s^2")
    flat = by_subject(STOPPING, data)["stopping on the flat, every brake, rider 'Ada'"]
    assert flat.measured.m_as("m") == pytest.approx(flat.limit.m_as("m"), rel=1e-12)
    assert flat.severity is Severity.PASS


def test_an_untested_mass_is_the_lightest_riders_and_heavier_riders_get_its_force() -> None:
    # F = m a: 4 m/s^2 taken at 20 + 40 kg (the lightest rider with the vehicle) is 240 N,
    # 2.4 m/s^2 for 20 + 80 kg; stated as an assumption
    data = scooter(brakes__0__tested_with_mass=None)
    data["riders"].append({"name": "Kim", "mass": "40 kg", "class": "youth"})
    findings, _, notes = rule_outputs(STOPPING, data)
    ada = {f.subject: f for f in findings}["stopping on the flat, every brake, rider 'Ada'"]
    v = top_speed(100.0)
    assert ada.measured.m_as("m") == pytest.approx(v + v * v / (2 * 240 / 100), rel=1e-6)
    assert any("tested_with_mass not given" in n.text for n in notes)


def test_no_independent_brake_names_the_share_a_friction_brake_must_reach() -> None:
    # eKFV 4(1) no. 4: each brake alone reaches 44 % of 3.5 m/s^2, 1.54 m/s^2
    data = scooter(brakes=[REGEN_BRAKE], controller__regen=True)
    data["controller"]["regen_current_limit"] = "5 A"
    finding = by_subject(STOPPING, data)["brake independent of the drive electronics"]
    assert "1.54 m/s²" in (finding.remedy or "")
    _, _, notes = rule_outputs(STOPPING, data)
    assert any("acts through the motor" in n.text for n in notes)


def flat_stop(data: dict[str, Any]) -> float:
    finding = by_subject(STOPPING, data)["stopping on the flat, every brake, rider 'Ada'"]
    return finding.measured.m_as("m")


def test_a_brake_force_and_a_tested_stop_give_their_decelerations() -> None:
    # F = m a: 400 N on 100 kg is 4 m/s^2; a tested stop from v in s is v^2 / (2 s) (constant-
    # deceleration kinematics): 25 km/h in 6 m is 4.019 m/s^2
    v = top_speed(100.0)
    force = scooter(brakes=[{"kind": "friction", "acts_on": "front", "force": "400 N"}])
    assert flat_stop(force) == pytest.approx(v + v * v / 8.0, rel=1e-9)
    tested = kmh_to_ms(25.0) ** 2 / 12.0
    stop = {
        "kind": "friction",
        "acts_on": "front",
        "tested_stopping_distance": "6 m",
        "tested_from_speed": "25 km/h",
        "tested_with_mass": "100 kg",
    }
    assert flat_stop(scooter(brakes=[stop])) == pytest.approx(v + v * v / (2 * tested), rel=1e-9)


def test_a_dynamic_brake_beside_a_friction_brake_has_a_closed_form() -> None:
    # a shorted DC motor brakes with F = Kt Ke reduction^2 v / (R r^2) (Chapman, from memory):
    # a = a0 + k v integrates to s = v/k - (a0 / k^2) ln(1 + k v / a0) (calculus); 0.4 ohm
    # winding + 2 ohm resistor, 5:1, 0.1 m wheel, 100 kg
    dynamic = {"kind": "dynamic", "acts_on": "motor", "brake_resistance": "2 ohm"}
    data = scooter()
    data["brakes"].append(dynamic)
    k = KT * KT * 25 / (2.4 * 0.01) / 100.0
    v, a0 = top_speed(100.0), 4.0
    assert k * v < 0.4 * 0.7 * 9.80665  # below the rear axle's grip: no cap
    expected = v + v / k - a0 / (k * k) * math.log(1 + k * v / a0)
    assert flat_stop(data) == pytest.approx(expected, rel=1e-6)


def test_regenerative_braking_adds_its_energy_balance_force() -> None:
    # energy balance: 5 A into the 30 V cut-off pack brakes with F = V I / v above the 5 km/h
    # fade, at most Kt I_lim reduction / r = 47.7 N by the 10 A motor limit; the stop integrates
    # v dv / (a0 + F(v)/m) (here by a fine midpoint sum)
    data = scooter(controller__regen=True, controller__regen_current_limit="5 A")
    data["brakes"].append(REGEN_BRAKE)
    v, a0, fade = top_speed(100.0), 4.0, kmh_to_ms(5.0)
    steps = 200_000
    h = v / steps
    total = 0.0
    for i in range(steps):
        s = (i + 0.5) * h
        extra = min(30.0 * 5.0 / s, KT * 10 * 5 / 0.1) / 100.0 if s > fade else 0.0
        total += s / (a0 + min(extra, 0.4 * 0.7 * 9.80665)) * h
    assert flat_stop(data) == pytest.approx(v + total, rel=1e-4)
    assert flat_stop(data) < flat_stop(scooter())
