"""The ride simulation against Newton cooling, the road-load equation, Ohm's law and the
steady-state winding model. Builds here are invented; every check names its outside source."""

from __future__ import annotations

import itertools
import math
from dataclasses import replace

import pytest

from reviewer.engineering.cells import CELL_VOLTAGES
from reviewer.engineering.ride import RideModelError, Segment, simulate
from reviewer.engineering.ride_pack import (
    OCV_TABLES,
    PackModel,
    PackPowerExceeded,
    battery_current,
    cell_open_circuit_voltage,
    max_power,
    pack_resistance,
)
from reviewer.engineering.ride_thermal import (
    COPPER_ALPHA_20,
    AirflowCooling,
    ConstantCooling,
    ThermalRunaway,
    Winding,
    first_order_step,
    runaway_current,
    thermal_capacity_from_mass,
    time_to_temperature,
    winding_from_rating,
    winding_steady_temperature,
    winding_step,
)
from reviewer.engineering.roadload import Drive, DriveMotor, kmh_to_ms, road_load_force
from reviewer.engineering.thermal import (
    calibrated_thermal_resistance,
    steady_winding_temperature,
    thermal_class,
)

from .conftest import ROOT

# alpha that makes the linear law identical to the 234.5 inferred-zero form of thermal.py
ALPHA_INFERRED_ZERO = 1.0 / (234.5 + 20.0)


def hub_drive(**changes: object) -> Drive:
    """An invented direct-drive hub motor on a 10s pack."""
    drive = Drive(
        motors=(DriveMotor(kv_rpm_per_v=10.0, branch_resistance=0.25, no_load_current=0.5),),
        full_voltage=42.0,
        reduction=1.0,
        wheel_radius=0.25,
        rolling_resistance=0.01,
        drag_area=0.5,
        shared_resistance=0.1,
        current_limit=40.0,
        efficiency=0.8,
    )
    return replace(drive, **changes)


def hub_winding(**changes: object) -> Winding:
    winding = winding_from_rating(
        rated_current=15.0, resistance_20c=0.2, rise_limit=80.0, time_constant=300.0
    )
    return replace(winding, **changes)


PACK = PackModel("li-ion", cells_series=10, capacity_ah=20.0, resistance=0.1)


# --- the winding's first-order response -------------------------------------------------------


def test_four_times_the_rated_loss_reaches_the_rated_rise_after_tau_ln_4_3() -> None:
    # brief 12 check value, derived from Newton cooling: 1 - exp(-t/tau) = 1/4 at t = tau ln(4/3)
    tau, ambient, rated_rise = 600.0, 40.0, 80.0
    t = tau * math.log(4.0 / 3.0)
    assert t == pytest.approx(0.288 * tau, abs=5e-4 * tau)
    assert first_order_step(ambient, ambient + 4 * rated_rise, t, tau) == pytest.approx(
        ambient + rated_rise, abs=1e-9
    )
    # the same through the winding model: twice the rated current, resistance change ignored
    r_th = rated_rise / (10.0**2 * 0.1)
    winding = Winding(0.1, r_th, tau, ambient_c=ambient, alpha=0.0)
    assert winding_step(ambient, 20.0, t, winding) == pytest.approx(ambient + rated_rise, abs=1e-9)
    assert time_to_temperature(ambient, 20.0, ambient + rated_rise, winding) == pytest.approx(t)


@pytest.mark.parametrize("dt", [0.1, 1.0, 7.5, 60.0, 900.0])
def test_exact_step_matches_the_analytic_exponential_at_any_step(dt: float) -> None:
    # Newton cooling with R(theta) linear in theta: theta(t) = theta_ss + (theta0 - theta_ss)
    # exp(-t / tau_eff), tau_eff = C / (1/R_th - I^2 R20 alpha); theta_ss from thermal.py
    winding = hub_winding(alpha=ALPHA_INFERRED_ZERO)
    current, total = 22.0, 1800.0
    theta_ss = steady_winding_temperature(
        current, winding.resistance_20c, winding.thermal_resistance, winding.ambient_c
    )
    assert winding_steady_temperature(current, winding) == pytest.approx(theta_ss, rel=1e-12)
    tau_eff = winding.capacity / (
        1 / winding.thermal_resistance - current**2 * winding.resistance_20c * winding.alpha
    )
    theta, steps = winding.ambient_c, round(total / dt)
    for _ in range(steps):
        theta = winding_step(theta, current, dt, winding)
    expected = theta_ss + (winding.ambient_c - theta_ss) * math.exp(-steps * dt / tau_eff)
    assert theta == pytest.approx(expected, rel=1e-9)


def test_runaway_is_reported_not_stepped_silently() -> None:
    # thermal.py's steady state has no solution (inf) past I^2 R20 alpha R_th = 1: the same bound
    winding = hub_winding(alpha=ALPHA_INFERRED_ZERO)
    limit = runaway_current(winding)
    args = (winding.resistance_20c, winding.thermal_resistance, winding.ambient_c)
    assert math.isinf(steady_winding_temperature(limit * 1.001, *args))
    assert math.isfinite(steady_winding_temperature(limit * 0.999, *args))
    assert math.isinf(winding_steady_temperature(limit * 1.001, winding))
    with pytest.raises(ThermalRunaway, match="runaway"):
        winding_step(60.0, limit * 1.1, 1.0, winding)
    grown = winding_step(60.0, limit * 1.1, 1.0, winding, allow_runaway=True)
    assert math.isfinite(grown) and grown > 60.0


def test_a_ride_times_the_runaway() -> None:
    # the same bound in the ride: 8 % at 3 m/s needs about 33 A, above this winding's runaway
    # current (about 31.6 A), 4 % about 19 A, below it; thermal.py agrees (inf, finite)
    winding = hub_winding()
    steep = [Segment(600.0, 8.0, 3.0)]
    result = simulate(hub_drive(), 110.0, steep, winding, PACK, start_speed_ms=3.0)
    (current,) = result.motor_current_a[-1]
    assert current > runaway_current(winding)
    args = (winding.resistance_20c, winding.thermal_resistance, winding.ambient_c)
    assert math.isinf(steady_winding_temperature(current, *args))
    assert result.runaway_s == pytest.approx(result.duration)
    mild = [Segment(600.0, 4.0, 3.0)]
    assert simulate(hub_drive(), 110.0, mild, winding, PACK, start_speed_ms=3.0).runaway_s == 0.0
    # a start from rest at the 40 A limit is past the runaway current for its few seconds
    assert 0.0 < simulate(hub_drive(), 110.0, mild, winding, PACK).runaway_s < 10.0


def test_a_hot_winding_climbs_slower_on_the_voltage_limited_line() -> None:
    # V = E + I R (brief 3; Chapman): at full throttle a hotter, higher-resistance winding leaves
    # less back-EMF for the same current, so the top speed up a hill falls
    route = [Segment(300.0, 3.0, None)]
    cold = simulate(hub_drive(), 110.0, route, hub_winding(start_c=40.0), PACK)
    hot = simulate(hub_drive(), 110.0, route, hub_winding(start_c=150.0), PACK)
    assert max(hot.speed_ms) < max(cold.speed_ms)
    assert hot.duration > cold.duration


def test_copper_coefficient_and_heat_capacities() -> None:
    # IEC 60228 / CRC Handbook: annealed copper 0.00393 /K at 20 degC, = 1/254.5 to 3 digits
    assert COPPER_ALPHA_20 == 0.00393
    assert round(ALPHA_INFERRED_ZERO, 5) == COPPER_ALPHA_20
    # CRC Handbook specific heats: copper 385, iron 450 J/(kg K)
    assert thermal_capacity_from_mass(2.0, copper_fraction=1.0, iron_fraction=0.0) == 770.0
    assert thermal_capacity_from_mass(2.0, copper_fraction=0.0, iron_fraction=1.0) == 900.0
    # the default split (from memory, 30 % copper, 40 % iron) is the lower, cautious estimate
    assert thermal_capacity_from_mass(1.0) == pytest.approx(0.3 * 385 + 0.4 * 450)
    assert thermal_capacity_from_mass(1.0) < 385.0


def test_a_fan_that_does_not_turn_moves_no_air() -> None:
    # brief 12 (from memory): a shaft fan at a stall cools as with no fan (IC410); forced
    # convection grows roughly with airflow^0.8
    fan = AirflowCooling(still_air_factor=0.55, reference_speed_ms=6.0)
    assert fan(0.0) == 0.55
    assert fan(3.0) == pytest.approx(0.55 + 0.45 * 0.5**0.8)
    assert fan(6.0) == pytest.approx(1.0) and fan(20.0) == 1.0  # no credit above the rating
    speeds = [0.0, 0.5, 1, 2, 4, 6, 9]
    assert [fan(v) for v in speeds] == sorted(fan(v) for v in speeds)
    assert ConstantCooling()(0.0) == 1.0


# --- energy against the road-load equation ----------------------------------------------------


def test_energy_use_check_value() -> None:
    # brief 13 check value (derived from the road-load equation, ISA rho, CGPM g):
    # 90 kg, Crr 0.01, CdA 0.5 m^2, 20 km/h, 80 % efficiency: F = 18.28 N, 6.35 Wh/km
    speed = kmh_to_ms(20.0)
    assert road_load_force(90.0, speed, 0.01, 0.5) == pytest.approx(18.28, abs=0.005)
    result = simulate(
        hub_drive(),
        90.0,
        [Segment(2000.0, 0.0, speed)],
        hub_winding(),
        PACK,
        start_speed_ms=speed,
    )
    assert result.completed and result.distance == pytest.approx(2000.0)
    assert set(result.speed_ms) == {speed}
    wheel_force = result.shaft_energy_wh * 0.8 * 3600.0 / result.distance
    assert wheel_force == pytest.approx(18.28, abs=0.005)
    assert result.wh_per_km("shaft") == pytest.approx(6.35, abs=0.005)
    # motor copper and pack losses come on top: each energy further from the wheel is larger
    assert result.wh_per_km("terminal") >= result.wh_per_km("shaft")
    assert result.wh_per_km("cell") >= result.wh_per_km("terminal")


def test_start_from_rest_at_constant_force_is_uniform_acceleration() -> None:
    # Newton's second law and the kinematics of constant acceleration: v = a t, x = a t^2 / 2.
    # No drag, current-limited from rest: drive force and rolling loss are both constant.
    drive = hub_drive(drag_area=0.0, current_limit=20.0)
    line = drive.lines()[0]
    force = line.kt * (20.0 - 0.5) * drive.efficiency / drive.wheel_radius
    accel = (force - 80.0 * 9.80665 * 0.01) / 80.0
    target = 3.0  # m/s, well inside the current-limited part of the line
    assert line.current(target / drive.wheel_radius) == 20.0
    result = simulate(drive, 80.0, [Segment(100.0, 0.0, target)], hub_winding(), PACK, dt=0.25)
    first = result.speed_ms[0]
    assert first == pytest.approx(accel * 0.25)
    reached = next(i for i, v in enumerate(result.speed_ms) if v == target)
    assert result.time_s[reached] == pytest.approx(target / accel)
    assert result.distance_m[reached] == pytest.approx(target**2 / (2 * accel))


# --- the pack under load ----------------------------------------------------------------------


def test_sag_is_ohms_law_and_the_current_is_the_smaller_root() -> None:
    # Ohm's law V = OCV - I R (brief 13). Hand calculation: OCV 37 V, R 0.1 ohm, P 740 W:
    # 0.1 I^2 - 37 I + 740 = 0, I = (37 - sqrt(1369 - 296)) / 0.2 = (37 - 32.75668) / 0.2 = 21.2166
    current = battery_current(37.0, 0.1, 740.0)
    assert current == pytest.approx((37.0 - math.sqrt(1073.0)) / 0.2, rel=1e-12)
    assert current == pytest.approx(21.2166, abs=1e-4)
    assert (37.0 - 0.1 * current) * current == pytest.approx(740.0, rel=1e-12)
    assert battery_current(37.0, 0.0, 740.0) == 20.0  # no resistance: P / V
    assert max_power(37.0, 0.1) == pytest.approx(3422.5)  # OCV^2 / (4 R)
    with pytest.raises(PackPowerExceeded, match="cannot deliver"):
        battery_current(37.0, 0.1, 3423.0)
    pack = PackModel("li-ion", 10, 10.0, pack_resistance(10, 2, 0.04))  # 10 x 0.04 / 2 = 0.2
    assert pack.resistance == pytest.approx(0.2)
    assert pack.terminal_voltage(25.0, 1.0) == pytest.approx(42.0 - 25.0 * 0.2)


def test_ocv_tables_meet_the_chemistry_voltages() -> None:
    # Linden, Handbook of Batteries (from memory, as CELL_VOLTAGES): full at 1, cut-off at 0
    for chemistry, voltages in CELL_VOLTAGES.items():
        assert cell_open_circuit_voltage(chemistry, 1.0) == voltages.full
        assert cell_open_circuit_voltage(chemistry, 0.0) == voltages.cutoff
        points = [v for _, v in OCV_TABLES[chemistry]]
        assert points == sorted(points)
        assert voltages.cutoff < cell_open_circuit_voltage(chemistry, 0.5) < voltages.full
    assert cell_open_circuit_voltage("li-ion", 0.45) == pytest.approx((3.68 + 3.74) / 2)


def test_terminal_voltage_in_the_ride_is_ocv_less_i_r() -> None:
    # Ohm's law on every step, the state of charge by coulomb counting (charge / capacity)
    pack = replace(PACK, resistance=0.3, capacity_ah=2.0)
    route = [Segment(800.0, 0.0, None), Segment(600.0, 6.0, None, stops=1)]
    result = simulate(hub_drive(shared_resistance=0.3), 100.0, route, hub_winding(), pack)
    assert result.completed
    soc_before = [pack.state_of_charge, *result.state_of_charge[:-1]]
    for soc, current, volts in zip(
        soc_before, result.battery_current_a, result.terminal_v, strict=True
    ):
        assert volts == pytest.approx(pack.open_circuit_voltage(soc) - current * 0.3, rel=1e-12)
    used = (pack.state_of_charge - result.state_of_charge[-1]) * pack.capacity_ah
    assert result.charge_ah == pytest.approx(used, rel=1e-9)
    assert result.min_terminal_v == min(result.terminal_v)
    # a cut-off above the lowest voltage under load is flagged, one below it is not
    drive, lowest = hub_drive(shared_resistance=0.3), result.min_terminal_v
    flagged = simulate(drive, 100.0, route, hub_winding(), pack, cutoff_voltage=lowest + 0.5)
    assert flagged.below_cutoff and flagged.first_below_cutoff_m is not None
    clear = simulate(drive, 100.0, route, hub_winding(), pack, cutoff_voltage=lowest - 0.5)
    assert not clear.below_cutoff


# --- heating on a hill ------------------------------------------------------------------------


def hill(length: float) -> list[Segment]:
    return [Segment(200.0, 0.0, 5.0), Segment(length, 4.0, 3.0), Segment(200.0, 0.0, 5.0)]


def test_a_long_hill_heats_more_than_a_short_one() -> None:
    # Newton cooling: under a constant loss the winding temperature only rises toward its
    # steady state, so a longer climb at the same current ends hotter
    peaks = [
        simulate(hub_drive(), 110.0, hill(n), hub_winding(), PACK).peak_winding_c
        for n in (100.0, 300.0, 1000.0, 3000.0)
    ]
    assert peaks == sorted(peaks) and len(set(peaks)) == 4
    # IEC 60034-1 class B: 40 degC coolant + 80 K rise = 120 degC: the short climb stays within
    # it, the long one does not (the hill current is above the rated 15 A)
    limit = thermal_class("B").rise_limit_temperature
    assert peaks[0] < limit < peaks[-1]


def test_a_very_long_hill_approaches_the_steady_state_model() -> None:
    # cross-check with the steady-state model of reviewer.engineering.thermal at the same current
    # (IEC 60034-1 calibration on the rated current); alpha 0.00393 against 1/254.5 differs
    # by well under 0.1 K here
    winding = hub_winding(time_constant=120.0)
    result = simulate(hub_drive(), 110.0, hill(20_000.0), winding, PACK)
    assert result.completed
    on_hill = [i for i, x in enumerate(result.distance_m) if 5000.0 < x < 20_200.0]
    currents = {result.motor_current_a[i][0] for i in on_hill}
    assert len(currents) == 1  # a target speed on the hill: the torque, so the current, is fixed
    (current,) = currents
    steady = steady_winding_temperature(
        current, winding.resistance_20c, winding.thermal_resistance, winding.ambient_c
    )
    on_hill_peak = max(result.winding_c[i][0] for i in on_hill)
    assert on_hill_peak == pytest.approx(steady, abs=0.1)
    assert on_hill_peak <= steady + 0.1
    # after the hill the drive speeds up at full throttle (40 A): the ride's peak comes there
    assert result.peak_distance_m > 20_200.0 and result.peak_winding_c > on_hill_peak
    assert calibrated_thermal_resistance(15.0, 0.2, 80.0) == winding.thermal_resistance


# --- invariants and reporting -----------------------------------------------------------------


def test_energy_balance_soc_monotonic_and_determinism() -> None:
    # conservation of energy: the pack's terminal energy is the drive's input, the cells' energy
    # exceeds it by the internal loss I^2 R (Joule's law)
    route = [*hill(1500.0), Segment(1500.0, -8.0, 6.0), Segment(500.0, 0.0, None, stops=3)]
    first = simulate(hub_drive(), 110.0, route, hub_winding(), PACK)
    second = simulate(hub_drive(), 110.0, route, hub_winding(), PACK)
    assert first == second
    assert first.completed
    socs = first.state_of_charge
    assert all(a >= b for a, b in itertools.pairwise(socs))
    dts = [b - a for a, b in itertools.pairwise([0.0, *first.time_s])]
    joule = sum(
        i * i * PACK.resistance * dt for i, dt in zip(first.battery_current_a, dts, strict=True)
    )
    terminal = sum(
        v * i * dt for v, i, dt in zip(first.terminal_v, first.battery_current_a, dts, strict=True)
    )
    assert first.terminal_energy_wh * 3600 == pytest.approx(terminal, rel=1e-9)
    assert (first.cell_energy_wh - first.terminal_energy_wh) * 3600 == pytest.approx(joule)
    assert all(math.isfinite(t) for (t,) in first.winding_c)
    # three stops: the speed falls back to rest three times (the ride starts from rest already)
    restarts = sum(1 for a, b in itertools.pairwise([0.0, *first.speed_ms]) if b < a - 2.0)
    assert restarts == 3
    # no current on the descent held at 6 m/s: the rider brakes, nothing is regenerated
    assert any(c == (0.0,) for c in first.motor_current_a)


def test_riders_sharing_the_drives_lines_ride_as_they_would_alone() -> None:
    # a state's lines depend on the pack voltage and the winding temperatures, not on who rides:
    # sharing them between riders changes nothing of either ride
    from reviewer.engineering.ride_drive import SharedLines

    route = [*hill(1500.0), Segment(2000.0, 0.0, None, stops=2)]
    winding = hub_winding()
    alone = [simulate(hub_drive(), m, route, winding, PACK) for m in (110.0, 70.0)]
    shared = SharedLines(hub_drive(), (winding,), 0.05, 5.0)
    together = [
        simulate(hub_drive(), m, route, winding, PACK, shared=shared) for m in (110.0, 70.0)
    ]
    assert together == alone
    assert shared.states  # and the second ride found the first's states
    with pytest.raises(ValueError, match="another drive"):
        simulate(hub_drive(reduction=9.0), 70.0, route, winding, PACK, shared=shared)


def test_a_ride_that_cannot_go_on_says_why() -> None:
    # a grade the drive cannot climb at all (its stall force is below the load)
    stalled = simulate(hub_drive(current_limit=5.0), 110.0, hill(300.0), hub_winding(), PACK)
    assert not stalled.completed and "cannot climb" in (stalled.stop_reason or "")
    # a pack emptied part-way: a tiny capacity
    empty = simulate(
        hub_drive(), 110.0, hill(3000.0), hub_winding(), replace(PACK, capacity_ah=0.05)
    )
    assert not empty.completed and "empty" in (empty.stop_reason or "")
    assert empty.state_of_charge[-1] == 0.0
    # a pack whose resistance cannot deliver the power the drive's line asks (no shared
    # resistance in the drive, so the line does not know of the pack's)
    weak_pack = replace(PACK, resistance=5.0)
    weak = simulate(hub_drive(shared_resistance=0.0), 110.0, hill(300.0), hub_winding(), weak_pack)
    assert not weak.completed and "cannot deliver" in (weak.stop_reason or "")


def test_the_rides_step_is_the_exact_step_and_the_runaway_test() -> None:
    # the ride reads both from one call: each must be what the two functions give alone, to
    # the last bit, on a fixed and an airflow-cooled winding
    from reviewer.engineering.ride_thermal import ride_stepper, runaway_parameter

    for winding in (hub_winding(), hub_winding(cooling=AirflowCooling(0.4, 8.0))):
        step = ride_stepper(winding)
        for current in (0.0, 5.0, 15.0, 40.0, 400.0):
            for speed in (0.0, 3.0, 9.0):
                for theta, dt in ((60.0, 10.0), (23.7, 0.37), (141.0, 1.0), (60.0, 1e7)):
                    stepped, past = step(theta, current, dt, speed)
                    assert stepped == winding_step(theta, current, dt, winding, speed, True)
                    assert past == (runaway_parameter(current, winding, speed) >= 1.0)
        assert step(60.0, 400.0, 10.0, 0.0)[1]  # far past the runaway current
        with pytest.raises(ValueError):
            step(60.0, 5.0, -1.0, 0.0)


def test_the_rides_open_circuit_voltage_is_the_packs() -> None:
    # the ride's lookup reads the table once: it must give what PackModel does, to the bit,
    # at the table's own points, between them and at both ends (brief 13's OCV tables)
    for chemistry, table in OCV_TABLES.items():
        pack = replace(PACK, chemistry=chemistry)
        ocv = pack.open_circuit_voltage_function()
        states = [point[0] for point in table] + [k / 997 for k in range(998)]
        for state in states:
            assert ocv(state) == pack.open_circuit_voltage(state), (chemistry, state)
        with pytest.raises(ValueError):
            ocv(1.01)


def test_a_coasting_cruise_with_every_motor_past_its_no_load_speed_draws_nothing() -> None:
    # Newton's first law: where the road load is nil (down a grade, at the speed where the
    # grade's pull meets drag and rolling) the motors need give nothing; a demand left by the
    # top speed's rounding (1e-9 N m) against two lines both at or past no load (torque <= 0)
    # is that case, not a drive short of torque
    from reviewer.engineering.motor import TorqueSpeedLine
    from reviewer.engineering.ride_drive import cruise_currents

    lines = [TorqueSpeedLine(100.0, 38.55, r, 0.6) for r in (1.997, 1.937)]
    omega = max((ln.voltage - ln.no_load_current * ln.loop_resistance) / ln.ke for ln in lines)
    assert cruise_currents(lines, 7.5e-10, omega) == [0.0, 0.0]
    with pytest.raises(RideModelError, match="more torque"):
        cruise_currents(lines, 0.01, omega)  # a real demand the lines cannot meet still fails


def test_one_motors_cruise_current_is_the_torque_over_kt_plus_i0() -> None:
    # T = Kt (I - I0) (brief 3): one motor gives the whole demand, I = T / Kt + I0, never
    # above its line; the one-line path keeps the shared path's arithmetic to the last bit
    from reviewer.engineering.motor import TorqueSpeedLine
    from reviewer.engineering.ride_drive import cruise_currents

    for limit, battery in ((None, None), (30.0, None), (None, 12.0), (20.0, 9.0)):
        line = TorqueSpeedLine(120.0, 42.0, 0.25, 0.7, limit, battery)
        for omega in (0.0, 50.0, 200.0, 300.0):
            most = line.current(omega)
            most_torque = line.kt * (most - 0.7)
            for share in (0.05, 0.5, 1.0):
                torque = share * most_torque
                if torque <= 1e-6:
                    continue
                kept = max(line.kt * (most - 0.7), 0.0)
                expected = min(torque * kept / kept / line.kt + 0.7, most)
                (current,) = cruise_currents([line], torque, omega)
                assert current == expected
                assert current == pytest.approx(torque / line.kt + 0.7, rel=1e-12)
            with pytest.raises(RideModelError, match="more torque"):
                cruise_currents([line], 1.01 * most_torque + 1e-3, omega)


def test_a_two_motor_ride_with_unequal_windings_runs_the_whole_route() -> None:
    # found by the scaling benchmark: the trike with two motors, one warmer than the other
    import tomllib

    from firstride_rules.ride._model import _simulate as ridden

    from reviewer.testing import default_profile, make_build

    data = tomllib.loads((ROOT / "sample_builds" / "allotment-cargo-trike.toml").read_text())
    first = data["motors"][0]
    data["motors"] = [
        dict(first, name="left"),
        dict(first, name="right", winding_resistance="1.3 ohm"),
    ]
    for wire in data["wires"]:
        if wire["circuit"] == "motor":
            wire["motor"] = "left"
    ride = ridden(make_build(data), default_profile())
    assert ride.results and all(r.time_s for r in ride.results)
