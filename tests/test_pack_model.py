"""The pack under load: OCV tables, Ohm's-law sag, energy use and range against the brief's
check value and the energy balance."""

from __future__ import annotations

import itertools

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from reviewer.engineering.cells import CELL_VOLTAGES
from reviewer.engineering.pack import (
    OCV_TABLES,
    cell_open_circuit_voltage,
    delivered_energy_wh,
    energy_per_km,
    lowest_charge_for_peak,
    mean_open_circuit_voltage,
    pack_open_circuit_voltage,
    pack_resistance,
    range_km,
    state_of_charge_at,
    terminal_voltage,
    usable_energy_wh,
)
from reviewer.engineering.roadload import AIR_DENSITY_ISA, kmh_to_ms, road_load_force


@pytest.mark.parametrize("chemistry", sorted(OCV_TABLES))
def test_table_ends_are_the_cell_full_and_cutoff_voltages(chemistry: str) -> None:
    # from memory (Linden, Handbook of Batteries), as held in reviewer.engineering.cells
    cell = CELL_VOLTAGES[chemistry]
    assert cell_open_circuit_voltage(chemistry, 0.0) == cell.cutoff
    assert cell_open_circuit_voltage(chemistry, 1.0) == cell.full


@pytest.mark.parametrize("chemistry", sorted(OCV_TABLES))
def test_open_circuit_voltage_rises_with_charge(chemistry: str) -> None:
    # from memory (Linden): the OCV of every lithium chemistry rises monotonically with charge
    volts = [v for _, v in OCV_TABLES[chemistry]]
    charges = [s for s, _ in OCV_TABLES[chemistry]]
    assert all(b > a for a, b in itertools.pairwise(volts))
    assert all(b > a for a, b in itertools.pairwise(charges))


@pytest.mark.parametrize("chemistry", sorted(OCV_TABLES))
def test_mean_ocv_sits_just_above_the_nominal_voltage(chemistry: str) -> None:
    # from memory (Linden): the nominal voltage is a mean under a slow discharge, so the OCV
    # averaged over charge lies a little (under 0.15 V) above it
    nominal = CELL_VOLTAGES[chemistry].nominal
    assert 0.0 <= mean_open_circuit_voltage(chemistry) - nominal < 0.15


def test_lifepo4_plateau_is_flat() -> None:
    # from memory (Linden): iron phosphate holds within about 0.1 V from 20 % to 90 % charge
    assert (
        cell_open_circuit_voltage("lifepo4", 0.9) - cell_open_circuit_voltage("lifepo4", 0.2) < 0.1
    )


def test_interpolation_and_its_inverse() -> None:
    # linear interpolation between table points 0.2 (3.56 V) and 0.3 (3.63 V)
    assert cell_open_circuit_voltage("li-ion", 0.25) == pytest.approx(3.595)
    assert state_of_charge_at("li-ion", 3.595) == pytest.approx(0.25)
    assert state_of_charge_at("li-ion", 2.0) == 0.0
    assert state_of_charge_at("li-ion", 4.3) is None
    assert pack_open_circuit_voltage("li-ion", 1.0, 10) == pytest.approx(42.0)
    with pytest.raises(ValueError):
        cell_open_circuit_voltage("nimh", 0.5)
    with pytest.raises(ValueError):
        cell_open_circuit_voltage("li-ion", 1.2)


def test_pack_resistance_series_over_parallel() -> None:
    # circuit theory: resistors in series add, n equal ones in parallel divide by n;
    # 10s4p of 20 milliohm cells is 10 x 0.02 / 4 = 0.05 ohm
    assert pack_resistance(0.020, 10, 4) == pytest.approx(0.05)
    with pytest.raises(ValueError):
        pack_resistance(0.02, 0, 1)


def test_terminal_voltage_is_ohms_law_sag() -> None:
    # Ohm's law: 42 V open circuit, 20 A through 0.05 ohm drops 1.0 V
    assert terminal_voltage(42.0, 20.0, 0.05) == pytest.approx(41.0)
    assert terminal_voltage(42.0, 0.0, 0.05) == pytest.approx(42.0)


def test_lowest_charge_for_a_peak() -> None:
    # Ohm's law: 10s li-ion, 0.15 ohm, 40 A needs OCV >= 30 + 6 = 36 V, 3.6 V a cell: between
    # the table's 0.2 (3.56 V) and 0.3 (3.63 V) at 0.2 + 0.1 x 0.04 / 0.07 = 0.2571
    charge = lowest_charge_for_peak("li-ion", 10, 0.15, 40.0)
    assert charge == pytest.approx(0.2 + 0.1 * 0.04 / 0.07)
    at = terminal_voltage(pack_open_circuit_voltage("li-ion", charge, 10), 40.0, 0.15)
    assert at == pytest.approx(30.0)
    below = terminal_voltage(pack_open_circuit_voltage("li-ion", charge - 0.01, 10), 40.0, 0.15)
    assert below < 30.0


def test_a_pack_that_sags_below_cutoff_even_when_full() -> None:
    # Ohm's law: 42 V - 50 A x 0.3 ohm = 27 V, below a 30 V cut-off at any charge
    assert lowest_charge_for_peak("li-ion", 10, 0.3, 50.0) is None
    assert usable_energy_wh("li-ion", 10, 10.0, 0.3, 10.0, peak_current=50.0) == 0.0


def test_energy_use_check_value() -> None:
    # brief 13 check value (D): 90 kg, Crr 0.01, CdA 0.5 m^2, 20 km/h, 80 %: F = 18.28 N,
    # 6.35 Wh/km, with ISA sea-level air density 1.225 kg/m^3
    assert AIR_DENSITY_ISA == 1.225
    force = road_load_force(90.0, kmh_to_ms(20.0), 0.01, 0.5)
    assert force == pytest.approx(18.28, abs=0.005)
    assert energy_per_km(force, 0.8) == pytest.approx(6.35, abs=0.005)


def test_range_with_reserve() -> None:
    # definition (brief 13): range = usable energy less reserve over Wh/km;
    # 500 Wh with 10 % kept back at 6.35 Wh/km is 450 / 6.35 = 70.87 km
    assert range_km(500.0, 6.35, 0.10) == pytest.approx(70.87, abs=0.005)
    with pytest.raises(ValueError):
        range_km(500.0, 0.0)


def test_mean_ocv_of_one_linear_piece_is_its_midpoint() -> None:
    # trapezoid rule, exact for a straight line
    assert mean_open_circuit_voltage("li-ion", 0.3, 0.2) == pytest.approx((3.56 + 3.63) / 2)


@settings(max_examples=200, deadline=None)
@given(
    current=st.floats(0.0, 40.0),
    resistance=st.floats(0.0, 0.3),
    upper=st.floats(0.5, 1.0),
    lower=st.floats(0.0, 0.45),
)
def test_delivered_energy_plus_pack_loss_is_the_ocv_energy(
    current: float, resistance: float, upper: float, lower: float
) -> None:
    # conservation of energy: OCV x charge = energy at the terminals + I^2 R over the time
    # Q / I it takes, i.e. I R Q (when the terminals still see a positive voltage)
    capacity = 10.0
    charge = capacity * (upper - lower)
    ocv_energy = charge * 10 * mean_open_circuit_voltage("li-ion", upper, lower)
    delivered = delivered_energy_wh("li-ion", 10, capacity, resistance, current, upper, lower)
    assert delivered + current * resistance * charge == pytest.approx(ocv_energy)
    assert delivered <= ocv_energy * (1 + 1e-12)


def test_usable_energy_stops_where_the_peak_trips_the_cutoff() -> None:
    # Ohm's law and the definition of usable energy (brief 13): a 40 A peak on 0.15 ohm ends
    # the ride at 25.7 % charge, so a 10 Ah 10s pack at 10 A gives up the charge above that only
    end = lowest_charge_for_peak("li-ion", 10, 0.15, 40.0)
    usable = usable_energy_wh("li-ion", 10, 10.0, 0.15, 10.0, peak_current=40.0)
    expected = 10.0 * (1.0 - end) * (10 * mean_open_circuit_voltage("li-ion", 1.0, end) - 1.5)
    assert usable == pytest.approx(expected)
    assert usable < usable_energy_wh("li-ion", 10, 10.0, 0.15, 10.0)
