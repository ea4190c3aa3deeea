"""ride.heating, ride.energy and motor.cooling's stall cases: the same build passes a short
climb and fails a long one; energy and range on every ride; a pack that sags to its cut-off
under full power; a stall judged by what ends it."""

from __future__ import annotations

import math
from typing import Any

import pytest
from firstride_rules.motor.cooling import RULE as COOLING
from firstride_rules.ride.energy import RULE as ENERGY
from firstride_rules.ride.heating import RULE as HEATING

from reviewer.engineering.ride_pack import cell_open_circuit_voltage
from reviewer.findings import Finding, Severity
from reviewer.testing import rule_outputs, run_rule_on, variant

from .conftest import ROOT

# An invented kart: 10S2P lithium pack, one brushed motor limited to 10 A against a 6 A rating
# (so a long climb at the limit overheats it and a short one does not), a friction brake.
KART: dict[str, Any] = {
    "vehicle": {"name": "test kart", "kind": "kart", "mass": "20 kg"},
    "riders": [{"name": "Ada", "mass": "80 kg", "class": "adult"}],
    "battery": {
        "chemistry": "li-ion",
        "cells_series": 10,
        "cells_parallel": 2,
        "cell_capacity": "3000 mAh",
        "cell_internal_resistance": "0.03 ohm",
    },
    "motors": [
        {
            "name": "rear",
            "type": "brushed",
            "kv": "100 rpm/V",
            "winding_resistance": "0.4 ohm",
            "no_load_current": "1 A",
            "rated_current": "6 A",
            "insulation_class": "F",
            "thermal_time_constant": "5 min",
        }
    ],
    "controller": {"motor_current_limit": "10 A", "current_limit_kind": "hardware"},
    "drivetrain": {
        "motor_pulley_teeth": 12,
        "wheel_pulley_teeth": 60,
        "wheel_diameter": "200 mm",
        "efficiency": "90 %",
    },
    "brakes": [{"kind": "friction", "acts_on": "front", "deceleration": "4 m/s^2"}],
    "usage": {
        "rolling_resistance": 0.01,
        "drag_area": "1.0 m^2",
        "ambient_temperature": "25 degC",
    },
}


def hill(length: str) -> dict[str, Any]:
    segments = [
        {"length": "0.5 km", "grade": "0 %"},
        {"length": length, "grade": "2 %"},
    ]
    return variant(KART, route={"name": "hill", "segments": segments})


def heat(data: dict[str, Any]) -> Finding:
    (finding,) = [f for f in run_rule_on(HEATING, data) if f.subject.startswith("winding heat")]
    return finding


def test_a_short_climb_passes_and_a_long_one_does_not() -> None:
    # first-order heating (brief 12): the winding approaches its steady temperature with the
    # time constant, so the same current is harmless for a minute and too much for half an hour
    short, long = heat(hill("0.2 km")), heat(hill("8 km"))
    assert short.severity is Severity.PASS
    assert long.severity in (Severity.FIX, Severity.STOP)
    assert long.measured.m_as("degC") > short.measured.m_as("degC")
    assert "rise limit after" in long.rationale  # the time at full load before the limit
    assert long.remedy and "climb" in long.remedy


def test_the_peak_is_in_the_json_series() -> None:
    _, figures, _ = rule_outputs(HEATING, hill("1 km"))
    (peak,) = [f for f in figures if f.name.startswith("peak winding temperature")]
    series = {name: values for name, _, values in peak.series}
    assert set(series) >= {"time", "speed", "motor current", "winding temperature", "pack voltage"}
    assert max(series["winding temperature"]) == pytest.approx(peak.value.m_as("degC"))
    assert len({len(v) for v in series.values()}) == 1


def test_energy_and_range_on_every_ride() -> None:
    findings, figures, _ = rule_outputs(ENERGY, hill("1 km"))
    names = {f.name for f in figures}
    assert {"energy use, rider 'Ada'", "range to the reserve, rider 'Ada'"} <= names
    (use,) = [f for f in figures if f.name == "energy use, rider 'Ada'"]
    # a climb costs at least its potential energy: m g h / 3600 Wh over the route's length
    height = 1000 * 0.06 / math.sqrt(1 + 0.06**2)
    assert use.value.m_as("Wh/km") >= 100 * 9.80665 * height / 3600 / 1.5
    assert {f.severity for f in findings} == {Severity.PASS}


def test_a_pack_that_sags_to_its_cutoff_under_full_power() -> None:
    # Ohm's law on the pack (Linden, from memory): V = OCV(s) - I R. One string of 0.2 ohm cells
    # is 2 ohm; at a 10 A battery limit the 30 V cut-off is reached where OCV = 50 V... above
    # full charge, so at every state of charge: a cut at speed
    weak = variant(
        KART,
        battery__cells_parallel=1,
        battery__cell_internal_resistance="0.2 ohm",
        controller__battery_current_limit="10 A",
    )
    findings = {f.subject: f for f in run_rule_on(ENERGY, weak)}
    sag = findings["pack voltage at full power"]
    assert sag.severity is Severity.FIX  # a friction brake is fitted
    assert sag.measured.m_as("percent") == pytest.approx(100.0)
    electric = variant(weak, brakes=[{"kind": "regenerative", "acts_on": "motor"}])
    electric["controller"]["regen"] = True
    electric["controller"]["regen_current_limit"] = "2 A"
    only = {f.subject: f for f in run_rule_on(ENERGY, electric)}
    assert only["pack voltage at full power"].severity is Severity.STOP
    # a stiffer pack: 0.03 ohm cells, 2 strings, 0.15 ohm: 1.5 V of sag, reached only where the
    # open-circuit voltage is within 1.5 V of the cut-off
    stiff = {f.subject: f for f in run_rule_on(ENERGY, variant(KART))}
    state = stiff["pack voltage at full power"].measured.m_as("percent") / 100
    ocv = 10 * cell_open_circuit_voltage("li-ion", state)
    assert ocv - 10 * 0.15 == pytest.approx(30.0, abs=0.01)


def cooling(**changes: Any) -> Finding:
    (finding,) = [f for f in run_rule_on(COOLING, variant(KART, **changes))]
    return finding


def test_the_stall_case_depends_on_what_ends_it() -> None:
    # held for ever in still air: the steady state of motor.cooling (IEC 60034-1 rise limits)
    forever = cooling()
    assert forever.severity is not Severity.PASS
    assert "held for ever" in forever.rationale
    # a 3 s stall cut-off from a winding at its 145 degC rise limit: the exact first-order step
    # (brief 12) at 10 A over a 5 min time constant stays far below class F's 155 degC
    short = cooling(controller__stall_cutoff_time="3 s")
    assert short.severity is Severity.PASS
    assert "cuts a stall after 3 s" in short.rationale
    assert short.limit.m_as("degC") == pytest.approx(155.0)
    # a cut-off long enough for the winding to pass its class is a stop
    slow = cooling(controller__stall_cutoff_time="30 min")
    assert slow.severity is Severity.STOP
    sensed = cooling(motors=[{**KART["motors"][0], "temperature_sensor": True}])
    assert sensed.severity is Severity.PASS and "sensor" in sensed.rationale


def test_the_ride_converges_with_its_step() -> None:
    # numerical analysis: a midpoint step on speed is second order, so the 1 s steps the profile
    # uses give the energy and peak of steps twenty times shorter, within 0.2 % and 0.5 K
    import tomllib

    from firstride_rules.ride._model import _simulate as ridden
    from firstride_rules.ride._model import route_segments

    from reviewer.engineering import ride
    from reviewer.testing import default_profile, make_build

    build = make_build(
        tomllib.loads((ROOT / "sample_builds" / "saltmarsh-hub-scooter.toml").read_text())
    )
    profile = default_profile()
    coarse = ridden(build, profile)
    segments, _, _ = route_segments(build, profile)
    fine = ride.simulate(
        coarse.drive,
        15.0 + 84.0,
        segments,
        coarse.windings,
        coarse.pack,
        0.05,
        cruise_dt=0.5,
    )
    result = coarse.results[0]
    assert result.wh_per_km() == pytest.approx(fine.wh_per_km(), rel=2e-3)
    assert result.peak_winding_c == pytest.approx(fine.peak_winding_c, abs=0.5)


def test_the_growing_full_throttle_step_keeps_the_fixed_steps_answer() -> None:
    # numerical analysis (Hairer, Norsett & Wanner, "Solving ODEs I", II.4, from memory): the
    # Euler / midpoint pair's difference estimates the error, so growing the step only where it
    # is small gives the fixed 1 s steps' energy, peak and time with fewer steps; a tolerance of
    # zero never grows the step
    import tomllib

    from firstride_rules.ride._model import _simulate as ridden

    from reviewer.engineering import ride
    from reviewer.testing import default_profile, make_build

    build = make_build(
        tomllib.loads((ROOT / "sample_builds" / "quayside-commuter.toml").read_text())
    )
    coarse = ridden(build, default_profile())
    mass = build.vehicle.mass.m_as("kg") + build.riders[0].mass.m_as("kg")

    def run(tolerance: float) -> ride.RideResult:
        return ride.simulate(
            coarse.drive,
            mass,
            coarse.segments,
            coarse.windings,
            coarse.pack,
            1.0,
            cruise_dt=10.0,
            accel_tolerance=tolerance,
        )

    fixed, grown = run(0.0), run(0.01)
    # the controller: h (tol / estimate)^(1/2) x 0.9, at most doubling, within [1 s, 10 s]
    assert ride._next_step(1.0, 0.0025, 0.01, 1.0, 10.0) == pytest.approx(1.8)
    assert ride._next_step(4.0, 0.0, 0.01, 1.0, 10.0) == 8.0
    assert ride._next_step(8.0, 0.0, 0.01, 1.0, 10.0) == 10.0
    assert ride._next_step(3.0, 0.5, 0.0, 1.0, 10.0) == 1.0
    assert len(grown.time_s) < 0.9 * len(fixed.time_s)
    assert grown.wh_per_km() == pytest.approx(fixed.wh_per_km(), rel=1e-3)
    assert grown.peak_winding_c == pytest.approx(fixed.peak_winding_c, abs=0.1)
    assert grown.time_s[-1] == pytest.approx(fixed.time_s[-1], abs=1.0)


def test_severity_follows_the_peak_against_the_class_limits() -> None:
    # IEC 60034-1 class F: 40 degC + 105 K = 145 degC rise limit; IEC 60085: 155 degC class
    def judged(km: float) -> Severity:
        finding = heat(hill(f"{km!r} km"))
        peak = finding.measured.m_as("degC")
        expected = Severity.PASS if peak <= 145 else Severity.FIX if peak <= 155 else Severity.STOP
        assert finding.severity is expected, (km, peak)
        return expected

    # between a climb that passes and one that stops lies one whose peak is in the 10 K band
    low, high = 0.2, 8.0
    assert judged(low) is Severity.PASS and judged(high) is Severity.STOP
    for _ in range(30):
        middle = 0.5 * (low + high)
        found = judged(middle)
        if found is Severity.FIX:
            break
        low, high = (middle, high) if found is Severity.PASS else (low, middle)
    assert found is Severity.FIX


def test_the_full_load_time_on_the_climb_against_the_exact_solution() -> None:
    # brief 12: C dtheta/dt = I^2 R20 (1 + a (theta - 20)) - (theta - theta_amb) / R_th, linear in
    # theta, so theta(t) = theta_ss + (theta_0 - theta_ss) exp(-t / tau'), tau' = C / (1/R_th -
    # I^2 R20 a); R_th from the 6 A rating reaching 145 degC at 40 degC (motor.cooling's
    # calibration), C = tau / R_th with tau = 5 min, at the 10 A limit, from 25 degC
    from reviewer.engineering.thermal import calibrated_thermal_resistance

    _, figures, _ = rule_outputs(HEATING, hill("8 km"))
    (hold,) = [f for f in figures if f.name.startswith("full-load time on the steepest climb")]
    r_th = calibrated_thermal_resistance(6.0, 0.4, 105.0)
    capacity, alpha, loss = 300.0 / r_th, 0.00393, 10.0**2 * 0.4
    b = loss * alpha - 1 / r_th
    a = loss * (1 - 20 * alpha) + 25.0 / r_th
    steady = -a / b
    seconds = capacity / b * math.log((145.0 - steady) / (25.0 - steady))
    assert hold.value.m_as("min") == pytest.approx(seconds / 60, rel=1e-6)
    # the hill it makes: that time at the climb's steady speed
    speed = float(hold.note.split(" km/h")[0].split(" and ")[-1]) / 3.6
    length = float(hold.note.split(" km climb")[0].split(" a ")[-1])
    assert length == pytest.approx(seconds * speed / 1000, rel=0.05)
