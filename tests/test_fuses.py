"""Overcurrent-protection helpers against NEC 240.4(D), ISO 8820-3 and IEC 60364-4-43.

Wire resistances in the hand calculations come from the CRC handbook table (ohm/km at 20 degC),
not from the project's own conductor code.
"""

from __future__ import annotations

import math

import pytest

from reviewer.engineering.fuses import (
    blade_fuse_voltage,
    is_coordinated,
    prospective_fault_current,
    rating_window,
    small_conductor_limit,
    source_resistance_needed,
)

CRC_OHM_PER_KM = {10: 3.277, 12: 5.211, 18: 20.95}  # CRC handbook table


@pytest.mark.parametrize(
    ("awg", "amps"),
    [(18, 7), (16, 10), (14, 15), (12, 20), (10, 30)],  # NEC 240.4(D)
)
def test_small_conductor_ceilings(awg, amps):
    assert small_conductor_limit(awg) == amps


@pytest.mark.parametrize("awg", [8, 6, 20, 22])
def test_no_ceiling_outside_the_small_conductor_table(awg):
    # NEC 240.4(D) lists 18 to 10 AWG only
    assert small_conductor_limit(awg) is None


def test_blade_fuse_voltages_against_a_ten_cell_lithium_pack():
    # ISO 8820-3: blade fuses are rated 32 V or 58 V DC
    ten_cell_full = 10 * 4.2  # from memory: Linden, 4.2 V per Li-ion cell at full charge
    assert ten_cell_full == pytest.approx(42.0)
    assert blade_fuse_voltage(ten_cell_full) == 58.0  # a 32 V fuse is invalid at 42 V
    six_cell_full = 6 * 4.2  # common practice: two 3-cell LiPo packs in series, 25.2 V full
    assert blade_fuse_voltage(six_cell_full) == 32.0
    assert blade_fuse_voltage(58.0) == 58.0
    assert blade_fuse_voltage(58.1) is None  # no blade fuse above 58 V


def test_coordination_order():
    # IEC 60364-4-43 clause 433.1: Ib <= In <= Iz
    assert is_coordinated(12.0, 20.0, 30.0)
    assert is_coordinated(20.0, 20.0, 20.0)
    assert not is_coordinated(25.0, 20.0, 30.0)  # opens in normal service
    assert not is_coordinated(12.0, 35.0, 30.0)  # wire overloaded before the fuse acts


def test_rating_window_in_whole_amperes():
    # IEC 60364-4-43 clause 433.1, rounded inwards so every rating in the window complies
    assert rating_window(12.2, 20.0) == (13, 20)
    assert rating_window(12.0, 20.9) == (12, 20)
    assert rating_window(20.0, 20.0) == (20, 20)
    assert rating_window(20.5, 20.9) is None


def test_prospective_fault_current_from_ohms_law():
    # I = V / (R_source + R_loop); 1 m of 10 AWG in the loop (CRC table)
    loop = CRC_OHM_PER_KM[10] / 1000
    assert prospective_fault_current(42.0, 0.010, loop) == pytest.approx(42.0 / 0.013277)
    assert math.isinf(prospective_fault_current(42.0, 0.0, 0.0))
    with pytest.raises(ValueError):
        prospective_fault_current(42.0, -1.0, 0.0)


def test_source_resistance_a_blade_fuse_needs():
    # ISO 8820-3 blade fuse breaks 1000 A: at 42 V the loop must total at least 42 mOhm
    loop = 2 * 0.5 * CRC_OHM_PER_KM[12] / 1000  # 5.211 mOhm
    assert source_resistance_needed(42.0, 1000.0, loop) == pytest.approx(0.042 - 0.005211)
    long_thin = 3 * CRC_OHM_PER_KM[18] / 1000  # 62.85 mOhm of 18 AWG: already enough
    assert source_resistance_needed(42.0, 1000.0, long_thin) == 0.0
