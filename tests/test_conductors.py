"""Copper conductor helpers against the handbooks and standards they come from."""

from __future__ import annotations

import itertools
import math

import pytest

from reviewer.engineering.conductors import (
    ADIABATIC_LIMIT_S,
    FAA_11_9,
    NEC_310_16,
    adiabatic_k,
    ambient_factor,
    awg_area,
    awg_diameter_mm,
    awg_for_area,
    awg_label,
    bundling_factor,
    conductor_resistance,
    conductor_temperature,
    copper_k,
    datasheet_ampacity,
    minimum_area,
    parse_awg,
    table_ampacity,
    tabulated_ampacity,
    thin_wire_ampacity_bound,
    voltage_drop,
    withstand_i2t,
    withstand_time,
)

# AWG, diameter mm, area mm^2 (D, ASTM B258 formula), ohm/km at 20 degC (C, CRC handbook table).
AWG_TABLE = [
    (8, 3.264, 8.366, 2.061),
    (10, 2.588, 5.261, 3.277),
    (12, 2.053, 3.309, 5.211),
    (14, 1.628, 2.081, 8.286),
    (16, 1.291, 1.309, 13.17),
    (18, 1.024, 0.823, 20.95),
    (20, 0.812, 0.518, 33.31),
    (22, 0.644, 0.326, 52.96),
]


@pytest.mark.parametrize(("awg", "diameter", "area", "ohm_per_km"), AWG_TABLE)
def test_awg_geometry_and_resistance(awg, diameter, area, ohm_per_km):
    assert awg_diameter_mm(awg) == pytest.approx(diameter, rel=0.005)  # ASTM B258
    assert awg_area(awg) == pytest.approx(area, rel=0.005)  # ASTM B258
    assert awg_area(f"{awg} AWG") == pytest.approx(area, rel=0.005)  # ASTM B258
    resistance = conductor_resistance(awg_area(awg), 1000.0)
    assert resistance == pytest.approx(ohm_per_km, rel=0.005)  # CRC handbook table


def test_awg_series_end_points():
    # ASTM B258: the series runs from 36 AWG = 0.005 in to 4/0 AWG = 0.4600 in.
    assert awg_diameter_mm(36) == pytest.approx(0.005 * 25.4, rel=1e-9)
    assert awg_diameter_mm(parse_awg("4/0 AWG")) == pytest.approx(0.46 * 25.4, rel=1e-9)


@pytest.mark.parametrize(
    ("text", "n", "label"),
    [
        ("12 AWG", 12, "12 AWG"),
        ("1/0 AWG", 0, "1/0 AWG"),
        ("2/0", -1, "2/0 AWG"),
        ("4/0", -3, "4/0 AWG"),
    ],
)
def test_awg_names_round_trip(text, n, label):
    # ASTM B258 numbering: m/0 is gauge 1 - m.
    assert parse_awg(text) == n
    assert awg_label(n) == label
    assert parse_awg(awg_label(n)) == n


@pytest.mark.parametrize("text", ["5/0 AWG", "41 AWG", "twelve", "12 mm2"])
def test_awg_rejects_non_sizes(text):
    with pytest.raises(ValueError):
        parse_awg(text)


def test_copper_temperature_coefficient():
    # IEC 60028: alpha = 0.00393 /K at 20 degC, so 75 degC is 1 + 0.00393 x 55 times R20.
    ratio = conductor_resistance(1.0, 1.0, 75.0) / conductor_resistance(1.0, 1.0, 20.0)
    assert ratio == pytest.approx(1 + 0.00393 * 55, rel=0.001)


@pytest.mark.parametrize(
    ("area", "awg"),
    [(4.0, 12), (2.5, 14), (6.0, 10), (10.0, 8), (1.5, 16), (3.3, 12), (3.2, 13)],
)
def test_metric_sizes_read_as_the_heaviest_awg_not_above_them(area, awg):
    # ASTM B258 areas: 12 AWG 3.309, 11 AWG 4.17, 13 AWG 2.62, 9 AWG 6.63 mm^2.
    assert awg_for_area(area) == awg
    assert awg_area(awg) <= area * 1.005


# --- adiabatic withstand -------------------------------------------------------------------


@pytest.mark.parametrize(
    ("insulation", "k", "initial", "final"),
    [
        ("pvc", 115, 70, 160),
        ("pvc-90", 100, 90, 160),
        ("rubber", 141, 60, 200),
        ("xlpe", 143, 90, 250),
        ("silicone", 132, 180, 350),
    ],
)
def test_k_by_insulation_and_general_formula(insulation, k, initial, final):
    # IEC 60364-4-43 clause 434.5.2 / IEC 60364-5-54 Annex A: tabulated k for copper, and the
    # general formula reproduces each from its temperatures.
    assert adiabatic_k(insulation) == k
    assert copper_k(initial, final) == pytest.approx(k, rel=0.01)


def test_silicone_k_from_the_general_formula():
    # IEC 60364-4-43 general form, silicone 180 -> 350 degC: about 132.
    assert copper_k(180, 350) == pytest.approx(132, abs=1)


def test_ptfe_k_uses_stated_temperatures():
    # from memory: PTFE wire 200 degC continuous, final kept below its 327 degC melt (300 degC).
    assert adiabatic_k("ptfe") == pytest.approx(copper_k(200, 300))
    assert 100 < adiabatic_k("ptfe") < 106


def test_hotter_rating_lowers_k():
    # IEC 60364-4-43 table: PVC run at 90 degC has k = 100, not the 70 degC PVC's 115.
    assert adiabatic_k("pvc", 90) == pytest.approx(100, rel=0.01)
    assert adiabatic_k("pvc", 60) == 115


def test_minimum_area_check_value():
    # Domain brief (D from IEC 60364-4-43 434.5.2): 2500 A for 0.1 s with PVC needs 6.87 mm^2.
    assert minimum_area(2500, 0.1, 115) == pytest.approx(6.87, abs=0.005)


def test_withstand_energy_check_value():
    # Domain brief (D from IEC 60364-4-43 434.5.2): 10 AWG PVC withstands 3.66e5 A^2 s.
    assert withstand_i2t(115, awg_area(10)) == pytest.approx(3.66e5, rel=0.005)
    # the same energy over 1000 A lasts 0.366 s; valid below the 5 s adiabatic limit
    assert withstand_time(115, awg_area(10), 1000) == pytest.approx(0.366, rel=0.005)
    assert ADIABATIC_LIMIT_S == 5.0


# --- ampacity ------------------------------------------------------------------------------

NEC_ENTRIES = [  # NEC Table 310.16, copper, 60/75/90 degC columns
    (14, (15, 20, 25)),
    (12, (20, 25, 30)),
    (10, (30, 35, 40)),
    (8, (40, 50, 55)),
]
FAA_ENTRIES = [  # FAA AC 43.13-1B Table 11-9, 105/150/200 degC wire, bundled, 70 degC ambient
    (18, (6, 9, 12)),
    (16, (7, 11, 14)),
    (14, (10, 14, 18)),
    (12, (13, 19, 25)),
    (10, (17, 26, 32)),
]


@pytest.mark.parametrize(("awg", "amps"), NEC_ENTRIES)
def test_nec_310_16_entries(awg, amps):
    # NEC Table 310.16 at its own 30 degC ambient and up to three conductors.
    for rating, expected in zip((60, 75, 90), amps, strict=True):
        found = table_ampacity(NEC_310_16, awg, rating, 30.0)
        assert found is not None
        assert found.current == pytest.approx(expected)
        assert found.column_c == rating


@pytest.mark.parametrize(("awg", "amps"), FAA_ENTRIES)
def test_faa_11_9_entries(awg, amps):
    # FAA AC 43.13-1B Table 11-9 at its own 70 degC ambient; already for bundles.
    for rating, expected in zip((105, 150, 200), amps, strict=True):
        found = table_ampacity(FAA_11_9, awg, rating, 70.0, loaded_conductors=12)
        assert found is not None
        assert found.current == pytest.approx(expected)
        assert found.bundling_factor == 1.0


def test_column_at_or_below_the_rating():
    # NEC Table 310.16: a wire rated 80 degC is read in the 75 degC column (12 AWG: 25 A).
    found = table_ampacity(NEC_310_16, 12, 80.0, 30.0)
    assert found is not None and found.current == 25
    # below the lowest column, and outside the rows, there is no tabulated figure
    assert table_ampacity(NEC_310_16, 12, 55.0, 30.0) is None
    assert tabulated_ampacity(20, 200.0, 30.0) is None  # thinner than both tables
    assert tabulated_ampacity(6, 90.0, 30.0) is None  # heavier than both tables


def test_odd_size_takes_the_lighter_row():
    # 11 AWG is between the NEC 12 and 10 AWG rows: read as 12 AWG (20/25/30 A).
    found = table_ampacity(NEC_310_16, 11, 90.0, 30.0)
    assert found is not None and found.current == 30 and found.row_awg == 12


def test_nec_ambient_correction():
    # NEC 310.15(B) correction table: 90 degC wire at 40 degC ambient, 0.91.
    assert ambient_factor(90, 40, 30) == pytest.approx(0.91, abs=0.005)
    # from memory, same table row (36-40 degC): 75 degC column 0.88, 60 degC column 0.82.
    assert ambient_factor(75, 40, 30) == pytest.approx(0.88, abs=0.005)
    assert ambient_factor(60, 40, 30) == pytest.approx(0.82, abs=0.005)
    assert ambient_factor(90, 95, 30) == 0.0  # no ampacity once ambient passes the rating


@pytest.mark.parametrize(
    ("count", "factor"),
    [(1, 1.0), (3, 1.0), (4, 0.80), (6, 0.80), (7, 0.70), (9, 0.70), (10, 0.50), (20, 0.50)],
)
def test_nec_bundling_factors(count, factor):
    # NEC 310.15(C)(1): more than three current-carrying conductors.
    assert bundling_factor(count) == factor


def test_corrections_multiply_the_table_figure():
    # NEC 310.16 12 AWG 90 degC 30 A, x0.91 at 40 degC (310.15(B)), x0.80 for 5 conductors.
    found = table_ampacity(NEC_310_16, 12, 90.0, 40.0, loaded_conductors=5)
    assert found is not None
    assert found.current == pytest.approx(30 * math.sqrt(50 / 60) * 0.80)
    assert found.current == pytest.approx(30 * 0.91 * 0.80, rel=0.005)


def test_higher_basis_of_the_two_tables():
    # 12 AWG rated 200 degC at 70 degC: FAA 11-9 gives 25 A; NEC 310.16's 90 degC column
    # gives 30 x sqrt(20/60) = 17.3 A. The FAA figure applies.
    found = tabulated_ampacity(12, 200.0, 70.0)
    assert found is not None
    assert found.table == FAA_11_9.name and found.current == pytest.approx(25)
    # 16 AWG is only in the FAA table, and only from its 105 degC column up
    assert tabulated_ampacity(16, 90.0, 30.0) is None


@pytest.mark.parametrize("table", [NEC_310_16, FAA_11_9])
def test_every_column_rises_with_size(table):
    # NEC Table 310.16 and FAA AC 43.13-1B Table 11-9 (entries checked above): in each column
    # a heavier size carries more, which makes the smallest size a bound for thinner wires.
    thinnest_first = sorted(table.rows, reverse=True)  # AWG 14 -> 8, or 18 -> 10
    for column in range(len(table.columns_c)):
        amps = [table.rows[awg][column] for awg in thinnest_first]
        assert all(lighter < heavier for lighter, heavier in itertools.pairwise(amps))


def test_thin_wire_bound_is_the_smallest_tabulated_size():
    # NEC Table 310.16: 14 AWG, 60 degC column, 15 A; the column at or below a 70 degC rating.
    bound = thin_wire_ampacity_bound(22, 70.0, 30.0)
    assert bound is not None
    assert (bound.table, bound.row_awg, bound.column_c) == (NEC_310_16.name, 14, 60.0)
    assert bound.current == pytest.approx(15)
    # 16 AWG has an FAA 11-9 row but no column at or below 70 degC: the NEC bound applies
    bound = thin_wire_ampacity_bound(16, 70.0, 30.0)
    assert bound is not None and bound.row_awg == 14 and bound.current == pytest.approx(15)
    # NEC 310.15(C)(1): five loaded conductors x0.80
    bound = thin_wire_ampacity_bound(22, 70.0, 30.0, loaded_conductors=5)
    assert bound is not None and bound.current == pytest.approx(15 * 0.80)


def test_thin_wire_bound_takes_the_more_generous_table():
    # 22 AWG rated 200 degC at 30 degC: NEC 14 AWG 90 degC 25 A beats FAA 18 AWG 200 degC
    # 12 A x sqrt(170/130) = 13.7 A (NEC 310.15(B) form of the ambient correction).
    bound = thin_wire_ampacity_bound(22, 200.0, 30.0)
    assert bound is not None and bound.table == NEC_310_16.name
    assert bound.current == pytest.approx(25)
    # at 80 degC: NEC 25 x sqrt(10/60) = 10.2 A, FAA 12 x sqrt(120/130) = 11.5 A
    bound = thin_wire_ampacity_bound(22, 200.0, 80.0)
    assert bound is not None and bound.table == FAA_11_9.name and bound.row_awg == 18
    assert bound.current == pytest.approx(12 * math.sqrt(120 / 130))


def test_no_thin_wire_bound_without_a_column_or_a_thinner_size():
    # below NEC 310.16's 60 degC and FAA 11-9's 105 degC columns nothing bounds the wire
    assert thin_wire_ampacity_bound(22, 50.0, 30.0) is None
    # 12 AWG is not thinner than either table's smallest row (NEC 14, FAA 18 AWG)
    assert thin_wire_ampacity_bound(12, 90.0, 30.0) is None


def test_datasheet_ampacity_read_at_30_degc():
    # A datasheet figure is corrected like an NEC one (310.15(B), (C)(1)).
    found = datasheet_ampacity(40.0, 90.0, 40.0, loaded_conductors=4)
    assert found.current == pytest.approx(40 * 0.91 * 0.80, rel=0.005)
    assert found.table == "wire datasheet"


# --- voltage drop and running temperature ---------------------------------------------------


def test_faa_voltage_drop_example():
    # FAA AC 43.13-1B worked example: 10 AWG at 0.00126 ohm/ft, 39 ft, 20 A gives 0.98 V.
    feet = 0.3048
    drop = voltage_drop(20.0, 0.00126 / feet, 39 * feet)
    assert drop == pytest.approx(0.98, abs=0.005)


def test_running_temperature_estimate():
    # FAA AC 43.13-1B para 11-66: at its rated current a wire reaches its rating; at half the
    # current, a quarter of the rise.
    assert conductor_temperature(30.0, 90.0, 20.0, 20.0) == pytest.approx(90.0)
    assert conductor_temperature(30.0, 90.0, 10.0, 20.0) == pytest.approx(45.0)
