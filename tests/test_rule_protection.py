"""protection.fuse on invented builds: presence, IEC 60364-4-43 coordination with the NEC
240.4(D) ceilings, ISO 8820-3 voltage ratings and breaking capacity.

The pack is 10 Li-ion cells in series, 42 V full (from memory: Linden, 4.2 V per cell). Wire
resistances come from the CRC handbook table (ohm/km at 20 degC); ampacities from NEC Table
310.16 at 30 degC ambient, so the expected figures do not reuse the rule's code.
"""

from __future__ import annotations

import pytest
from firstride_rules.protection.fuse import RULE

from reviewer.findings import Comparison, Severity
from reviewer.testing import rule_outputs, run_rule_on

CRC_OHM_PER_KM = {10: 3.277, 12: 5.211, 18: 20.95}  # CRC handbook table
FULL = 10 * 4.2  # from memory: Linden


def wire(name, gauge, circuit="battery", length="0.5 m", **extra):
    data = {"name": name, "circuit": circuit, "gauge": f"{gauge} AWG", "length": length}
    data.update(insulation="silicone", temperature_rating="200 degC")
    data.update(extra)
    return data


def build(*fuses, gauge=12, limit="12 A", cell_resistance="0.03 ohm", parallel=1, wires=None):
    pack = {"chemistry": "li-ion", "cells_series": 10, "cells_parallel": parallel}
    if cell_resistance is not None:
        pack["cell_internal_resistance"] = cell_resistance
    data = {
        "battery": pack,
        "motors": [{"name": "drive", "type": "brushed", "rated_current": "10 A"}],
        "wires": wires
        if wires is not None
        else [wire("pack positive", gauge), wire("pack negative", gauge)],
        "fuses": list(fuses),
        "usage": {"ambient_temperature": "30 degC"},
    }
    if limit is not None:
        data["controller"] = {"motor_current_limit": limit}
    return data


def fuse(rating="20 A", voltage="58 V", breaking="1000 A", location="battery-positive", **extra):
    data = {"name": "main", "location": location, "rating": rating}
    if voltage is not None:
        data["voltage_rating"] = voltage
    if breaking is not None:
        data["breaking_capacity"] = breaking
    data.update(extra)
    return data


def by_subject(data):
    return {f.subject: f for f in run_rule_on(RULE, data)}


def loop_ohms(gauge, metres):
    return CRC_OHM_PER_KM[gauge] * metres / 1000


def test_rule_metadata():
    assert RULE.id == "protection.fuse"
    assert "Severities" in RULE.doc and RULE.sources


# --- presence ---------------------------------------------------------------------------------


def test_no_pack_fuse_and_no_current_limit_is_stop():
    finding = by_subject(build(limit=None))["fuse at the battery positive"]
    assert finding.severity is Severity.STOP
    # design current: the motor's rated 10 A; NEC 240.4(D): 12 AWG at most 20 A
    # breaking: 42 V / (10 x 30 mOhm + 1 m of 12 AWG) (Ohm's law, CRC table)
    fault = FULL / (0.3 + loop_ohms(12, 1.0))
    assert finding.remedy == (
        "fit a 10-20 A DC-rated fuse (fuses[].rating), rated at least 42 V DC, at the battery positive, "
        f"with a breaking capacity of at least {int(fault) + 1} A"
    )


def test_no_pack_fuse_behind_a_current_limit_is_fix():
    finding = by_subject(build())["fuse at the battery positive"]
    assert finding.severity is Severity.FIX
    assert finding.remedy.startswith("fit a 12-20 A DC-rated fuse")


def test_a_negative_lead_fuse_does_not_count():
    data = build(fuse(location="battery-negative"), limit=None)
    finding = by_subject(data)["fuse at the battery positive"]
    assert finding.severity is Severity.STOP
    assert "negative lead" in finding.rationale


# --- coordination -----------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("gauge", "rating", "severity", "ceiling"),
    [
        (12, "20 A", Severity.PASS, 20),  # NEC 240.4(D): 12 AWG at most 20 A
        (12, "25 A", Severity.FIX, 20),  # within NEC 310.16's 30 A, over 240.4(D)'s 20 A
        (10, "30 A", Severity.PASS, 30),  # NEC 240.4(D): 10 AWG at most 30 A
        (10, "35 A", Severity.FIX, 30),
        (8, "50 A", Severity.PASS, 55),  # no 240.4(D) ceiling; NEC 310.16 8 AWG 90 degC 55 A
        (8, "60 A", Severity.FIX, 55),
    ],
)
def test_fuse_rating_against_the_wire(gauge, rating, severity, ceiling):
    finding = by_subject(build(fuse(rating), gauge=gauge))["fuse 'main' rating"]
    assert finding.severity is severity
    assert finding.limit.m_as("A") == pytest.approx(ceiling)
    assert finding.comparison is Comparison.AT_MOST
    if severity is Severity.FIX:
        assert (
            finding.remedy == f"fit a 12-{ceiling} A DC-rated fuse (fuses[].rating)"
        )  # IEC 60364-4-43 433.1


def test_fuse_below_the_design_current_is_fix():
    # IEC 60364-4-43 433.1: Ib <= In; 12 A limit plus a 120 mA logic board
    data = build(fuse("10 A"))
    data["logic"] = {"board_current": "120 mA"}
    finding = by_subject(data)["fuse 'main' rating"]
    assert finding.severity is Severity.FIX
    assert finding.comparison is Comparison.AT_LEAST
    assert finding.limit.m_as("A") == pytest.approx(12.12)
    assert finding.remedy == "fit a 13-20 A DC-rated fuse (fuses[].rating)"


def test_no_rating_fits_when_the_wire_is_too_light():
    # 14 AWG at most 15 A (NEC 240.4(D)) under a 20 A current limit
    finding = by_subject(build(fuse("20 A"), gauge=14, limit="20 A"))["fuse 'main' rating"]
    assert finding.severity is Severity.FIX
    assert finding.remedy.startswith("no fuse rating fits")
    assert "set controller.battery_current_limit at or below 15 A" in finding.remedy


def test_motor_wires_count_only_without_a_current_limit():
    # NEC 240.4(D): 14 AWG motor wire at most 15 A; behind a current limit the controller
    # protects it (NEC 240.4(G) defers motor circuits to Article 430; from memory)
    wires = [wire("pack positive", 12), wire("pack negative", 12), wire("lead", 14, "motor")]
    limited = by_subject(build(fuse("20 A"), wires=wires))["fuse 'main' rating"]
    assert limited.severity is Severity.PASS
    unlimited = by_subject(build(fuse("20 A"), wires=wires, limit=None))["fuse 'main' rating"]
    assert unlimited.severity is Severity.FIX
    assert "'lead'" in unlimited.rationale
    assert unlimited.limit.m_as("A") == pytest.approx(15)


def test_a_fuse_protects_the_wires_it_names():
    wires = [wire("pack positive", 12), wire("pack negative", 16)]
    named = fuse("20 A", protects=["pack positive"])
    assert by_subject(build(named, wires=wires))["fuse 'main' rating"].severity is Severity.PASS
    every = by_subject(build(fuse("20 A"), wires=wires))["fuse 'main' rating"]
    assert every.severity is Severity.FIX  # 16 AWG at most 10 A (NEC 240.4(D))


def test_design_current_unknown_is_unassessed():
    data = build(fuse("20 A"), limit=None)
    del data["motors"][0]["rated_current"]
    finding = by_subject(data)["fuse 'main' rating"]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("motors[0].rated_current", "controller.battery_current_limit")


def test_wire_rating_unknown_is_unassessed():
    wires = [wire("pack positive", 12, temperature_rating=None), wire("pack negative", 12)]
    del wires[0]["temperature_rating"]
    finding = by_subject(build(fuse("20 A"), wires=wires))["fuse 'main' rating"]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("wires[0].temperature_rating",)


# --- wires thinner than the tables ------------------------------------------------------------


def thin(gauge=22, rating="60 degC", **extra):
    """Two pack wires of a size neither NEC Table 310.16 (14-8 AWG) nor FAA Table 11-9 (18-10
    AWG) lists, nor NEC 240.4(D) (18-10 AWG)."""
    return [
        wire(name, gauge, insulation="pvc", temperature_rating=rating, **extra)
        for name in ("pack positive", "pack negative")
    ]


def test_a_30_amp_fuse_on_22_awg_is_judged_not_unassessed():
    # NEC 240.4(D): 18 AWG may be protected at no more than 7 A, and its ceilings rise with
    # size, so 22 AWG at no more than 7 A (derived); 30 A is over it: the wire overheats first
    finding = by_subject(build(fuse("30 A"), wires=thin()))["fuse 'main' rating"]
    assert finding.severity is Severity.FIX
    assert finding.limit.m_as("A") == pytest.approx(7)
    assert "NEC 240.4(D) ceiling for 18 AWG" in finding.rationale
    assert "thinner 22 AWG wire" in finding.rationale
    # Ib 12 A (the current limit) over 7 A: no rating fits; a 7 A limit does
    assert finding.remedy.startswith("no fuse rating fits")
    assert "set controller.battery_current_limit at or below 7 A" in finding.remedy
    assert finding.missing == ()


def test_the_table_bound_limits_a_thin_wire_in_hot_air():
    # NEC Table 310.16: 14 AWG, 60 degC column, 15 A at 30 degC; at 55 degC ambient the
    # correction is sqrt((60 - 55) / (60 - 30)) = 0.408 (NEC 310.15(B) table: 0.41 for
    # 51-55 degC, from memory), 6.1 A: a thinner 22 AWG wire carries no more than that, below
    # the 7 A NEC 240.4(D) bound, so a 7 A fuse is too large
    data = build(fuse("7 A"), wires=thin(), limit="3 A")
    data["usage"]["ambient_temperature"] = "55 degC"
    finding = by_subject(data)["fuse 'main' rating"]
    assert finding.severity is Severity.FIX
    assert finding.limit.m_as("A") == pytest.approx(15 * 0.41, rel=0.01)
    assert "NEC Table 310.16, 14 AWG, 60 °C column: 15 A" in finding.rationale


def test_the_bound_is_worded_as_the_wiring_rule_words_it():
    from firstride_rules.wiring.stall_current import RULE as WIRING

    # a 10 A limit over the 6.1 A bound: the wiring rule fails the wire on the same bound
    data = build(fuse("7 A"), wires=thin(), limit="10 A")
    data["motors"][0]["winding_resistance"] = "1 ohm"
    data["usage"]["ambient_temperature"] = "55 degC"
    ours = by_subject(data)["fuse 'main' rating"].rationale
    wiring = next(f for f in run_rule_on(WIRING, data) if f.subject == "wire 'pack positive'")
    phrase = "an upper bound from the smallest size tabulated (NEC Table 310.16, 14 AWG, 60 °C"
    assert phrase in ours and phrase in wiring.rationale
    start = ours.index("at most ")
    assert ours[start : ours.index(")", start) + 1] in wiring.rationale


def test_a_fuse_within_the_bound_still_needs_the_thin_wires_datasheet():
    # 3 A is within 7 A (NEC 240.4(D), 18 AWG) but only the datasheet shows 22 AWG carries it
    finding = by_subject(build(fuse("3 A"), wires=thin(), limit="2 A"))["fuse 'main' rating"]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("wires[0].rated_ampacity", "wires[1].rated_ampacity")
    assert finding.remedy == (
        "fit a 2-7 A DC-rated fuse (and within the ampacity of wires 'pack positive' and "
        "'pack negative', which the build does not give) (fuses[].rating)"
    )


def test_a_thin_wire_with_a_datasheet_rating_keeps_the_240_4_d_bound():
    # its datasheet figure is known, but 22 AWG may be protected at no more than 18 AWG's 7 A
    # (NEC 240.4(D), derived for a thinner wire); 5 A passes, 10 A does not
    wires = thin(rated_ampacity="10 A")
    low = by_subject(build(fuse("5 A"), wires=wires, limit="4 A"))["fuse 'main' rating"]
    assert low.severity is Severity.PASS
    high = by_subject(build(fuse("10 A"), wires=wires, limit="4 A"))["fuse 'main' rating"]
    assert high.severity is Severity.FIX
    assert high.limit.m_as("A") == pytest.approx(7)


def test_240_4_d_applies_to_a_wire_without_a_temperature_rating():
    # NEC 240.4(D): 12 AWG at most 20 A whatever its insulation: a 30 A fuse is too large even
    # before the wire's ampacity is known
    wires = [wire("pack positive", 12), wire("pack negative", 12)]
    for each in wires:
        del each["temperature_rating"]
    finding = by_subject(build(fuse("30 A"), wires=wires))["fuse 'main' rating"]
    assert finding.severity is Severity.FIX
    assert finding.limit.m_as("A") == pytest.approx(20)


# --- interruption -----------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("voltage", "severity"),
    [
        ("32 V", Severity.STOP),  # ISO 8820-3: 32 V blade fuse invalid on a 42 V pack
        ("58 V", Severity.PASS),  # ISO 8820-3: 58 V valid
    ],
)
def test_blade_fuse_voltage_on_a_ten_cell_pack(voltage, severity):
    findings = by_subject(build(fuse(voltage=voltage)))
    finding = findings["fuse 'main' voltage rating"]
    assert finding.severity is severity
    assert finding.limit.m_as("V") == pytest.approx(FULL)
    assert finding.comparison is Comparison.AT_LEAST
    if severity is Severity.STOP:
        # its breaking capacity holds only up to its rated voltage: nothing more to judge
        assert "fuse 'main' interrupting rating" not in findings
        assert (
            finding.remedy
            == "use a fuse rated at least 42 V DC (a 58 V ISO 8820-3 blade fuse qualifies)"
        )


@pytest.mark.parametrize("voltage", ["32 V", "42 V", "58 V", None])
def test_fuse_voltage_is_judged_as_voltage_ratings_judges_it(voltage):
    # one fuse, one judgement: the same severity, limit, words and remedy in both rules
    from firstride_rules.voltage.ratings import RULE as VOLTAGE

    data = build(fuse(voltage=voltage))
    ours = by_subject(data)["fuse 'main' voltage rating"]
    theirs = next(f for f in run_rule_on(VOLTAGE, data) if f.subject == "fuse 'main'")
    assert ours.severity is theirs.severity
    assert (ours.measured, ours.limit, ours.comparison) == (
        theirs.measured,
        theirs.limit,
        theirs.comparison,
    )
    assert (ours.rationale, ours.remedy, ours.missing) == (
        theirs.rationale,
        theirs.remedy,
        theirs.missing,
    )


def test_breaking_capacity_against_the_prospective_current():
    # 10S1P, 30 mOhm cells: 300 mOhm pack + 1 m of 12 AWG; I = V / R (Ohm's law)
    expected = FULL / (0.3 + loop_ohms(12, 1.0))
    findings, figures, _ = rule_outputs(RULE, build(fuse()))
    finding = next(f for f in findings if f.subject == "fuse 'main' interrupting rating")
    assert finding.severity is Severity.PASS
    assert finding.measured.m_as("A") == pytest.approx(expected, rel=0.005)
    figure = next(f for f in figures if f.name == "prospective short-circuit current")
    assert figure.value.m_as("A") == pytest.approx(expected, rel=0.005)


def test_breaking_capacity_too_low_is_stop():
    # 10S4P, 10 mOhm cells: 25 mOhm pack + 5.2 mOhm wire = about 1390 A, over 1000 A
    data = build(fuse(), cell_resistance="0.01 ohm", parallel=4)
    finding = by_subject(data)["fuse 'main' interrupting rating"]
    expected = FULL / (0.025 + loop_ohms(12, 1.0))
    assert finding.severity is Severity.STOP
    assert finding.measured.m_as("A") == pytest.approx(expected, rel=0.005)
    assert finding.remedy.startswith(
        f"use a fuse with a breaking capacity of at least {int(expected) + 1} A"
    )


def test_unknown_pack_resistance_uses_the_wires_only():
    # worst case 42 V / 5.2 mOhm is about 8 kA: unassessed, naming the resistance that suffices:
    # 42 V / 1000 A - 5.211 mOhm = 36.8 mOhm for the pack, 3.68 mOhm per cell
    findings, _, assumptions = rule_outputs(RULE, build(fuse(), cell_resistance=None))
    finding = next(f for f in findings if f.subject == "fuse 'main' interrupting rating")
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("battery.cell_internal_resistance",)
    assert "3.68 mΩ" in finding.rationale
    assert any("cell_internal_resistance" in a.text for a in assumptions)


def test_worst_case_within_the_breaking_capacity_passes():
    # 2 x 1.5 m of 18 AWG: 62.85 mOhm, so at most 668 A even with no pack resistance
    wires = [wire("pack positive", 18, length="1.5 m"), wire("pack negative", 18, length="1.5 m")]
    finding = by_subject(build(fuse(), cell_resistance=None, wires=wires))[
        "fuse 'main' interrupting rating"
    ]
    assert finding.severity is Severity.PASS
    assert finding.measured.m_as("A") == pytest.approx(FULL / loop_ohms(18, 3.0), rel=0.005)


def test_missing_fuse_ratings_are_named():
    findings = by_subject(build(fuse(voltage=None, breaking=None)))
    voltage = findings["fuse 'main' voltage rating"]
    assert voltage.severity is Severity.UNASSESSED
    assert voltage.missing == ("fuses[0].voltage_rating",)
    breaking = findings["fuse 'main' interrupting rating"]
    assert breaking.severity is Severity.UNASSESSED
    assert breaking.missing == ("fuses[0].breaking_capacity",)


def test_no_battery_is_unassessed():
    finding = run_rule_on(RULE, {})[0]
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("battery",)


def test_window_without_a_known_design_current_gives_the_upper_bound():
    # NEC 240.4(D): 12 AWG at most 20 A, whatever the (unknown) design current
    data = build(fuse("25 A"), limit=None)
    del data["motors"][0]["rated_current"]
    finding = by_subject(data)["fuse 'main' rating"]
    assert finding.severity is Severity.FIX
    assert finding.remedy == (
        "fit a DC-rated fuse of at most 20 A, above the drive's normal current (fuses[].rating)"
    )
