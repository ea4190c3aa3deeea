"""protection.fuse on values exactly on its limits: each test answers a mutant that survived the
rule's own tests (benchmarks/mutation_score.py on rules/protection/).

The pack is 10 Li-ion cells in series, 42 V full (from memory: Linden, 4.2 V per cell). Wire
ampacity ceilings are NEC 240.4(D)'s (12 AWG at most 20 A, 18 AWG at most 7 A).
"""

from __future__ import annotations

import math

import pytest
from firstride_rules.protection.fuse import RULE

from reviewer.findings import Severity
from reviewer.testing import rule_outputs, run_rule_on

FULL = 10 * 4.2  # from memory: Linden, 4.2 V per Li-ion cell


def lead(name, gauge, circuit="battery", **extra):
    data = {"name": name, "circuit": circuit, "gauge": f"{gauge} AWG", "length": "0.5 m"}
    data.update(insulation="silicone", temperature_rating="200 degC")
    data.update(extra)
    return data


def pack_fuse(rating, **extra):
    data = {"name": "main", "location": "battery-positive", "rating": rating}
    data.update(voltage_rating="58 V", breaking_capacity="1000 A")
    data.update(extra)
    return data


def vehicle(*fuses, gauge=12, limit="12 A", motors=1, wires=None, **extra):
    data = {
        "battery": {
            "chemistry": "li-ion",
            "cells_series": 10,
            "cells_parallel": 1,
            "cell_internal_resistance": "0.03 ohm",
        },
        "motors": [
            {"name": f"drive {i}", "type": "brushed", "rated_current": "10 A"}
            for i in range(motors)
        ],
        "wires": wires
        if wires is not None
        else [lead("pack positive", gauge), lead("pack negative", gauge)],
        "fuses": list(fuses),
        "usage": {"ambient_temperature": "30 degC"},
    }
    if limit is not None:
        data["controller"] = {"motor_current_limit": limit}
    data.update(extra)
    return data


def finding(data, subject):
    return next(f for f in run_rule_on(RULE, data) if f.subject == subject)


# --- coordination: Ib <= In <= Iz, equality allowed on both sides ----------------------------


def test_a_fuse_rated_exactly_at_the_design_current_passes():
    # IEC 60364-4-43 433.1: Ib <= In; a 12 A current limit makes Ib exactly 12 A
    on_limit = finding(vehicle(pack_fuse("12 A")), "fuse 'main' rating")
    assert on_limit.limit.m_as("A") == pytest.approx(20)  # NEC 240.4(D): 12 AWG at most 20 A
    assert on_limit.severity is Severity.PASS
    # IEC 60364-4-43 433.1: In < Ib opens in normal riding
    below = finding(vehicle(pack_fuse("11.9 A")), "fuse 'main' rating")
    assert below.severity is Severity.FIX


def test_a_fuse_exactly_at_the_wire_ceiling_passes_and_a_tenth_over_does_not():
    # IEC 60364-4-43 433.1: In <= Iz; NEC 240.4(D): 12 AWG at most 20 A
    assert finding(vehicle(pack_fuse("20 A")), "fuse 'main' rating").severity is Severity.PASS
    over = finding(vehicle(pack_fuse("20.1 A")), "fuse 'main' rating")
    assert over.severity is Severity.FIX


def test_an_unlimited_drive_with_known_motor_currents_is_judged_not_unassessed():
    # IEC 60364-4-43 433.1: Ib is the motor's rated 10 A when nothing limits current; a 15 A
    # fuse on 12 AWG (NEC 240.4(D): at most 20 A) is within 10 <= 15 <= 20, and nothing the
    # judgement needs is missing
    result = finding(vehicle(pack_fuse("15 A"), limit=None), "fuse 'main' rating")
    assert result.severity is Severity.PASS
    assert result.missing == ()


def test_a_tie_between_ampacity_and_ceiling_is_worded_as_the_ampacity():
    # the rule's docstring: ties go to the ampacity. A 20 A datasheet ampacity on 12 AWG
    # equals its NEC 240.4(D) 20 A ceiling; 25 A is over both (IEC 60364-4-43 433.1: In <= Iz)
    wires = [lead(name, 12, rated_ampacity="20 A") for name in ("pack positive", "pack negative")]
    result = finding(vehicle(pack_fuse("25 A"), wires=wires), "fuse 'main' rating")
    assert result.severity is Severity.FIX
    assert result.limit.m_as("A") == pytest.approx(20)
    assert "(ampacity, " in result.rationale
    assert "NEC 240.4(D) ceiling" not in result.rationale


# --- remedies on whole amperes ------------------------------------------------------------------


def test_the_least_rating_offered_is_the_design_current_itself_when_whole():
    # IEC 60364-4-43 433.1: In >= Ib, so with Ib exactly 12 A a 12 A fuse is the least that
    # fits. 8 AWG has no NEC 240.4(D) ceiling, and without a temperature rating no ampacity
    wires = [lead(name, 8) for name in ("pack positive", "pack negative")]
    for each in wires:
        del each["temperature_rating"]
    result = finding(vehicle(wires=wires), "fuse at the battery positive")
    assert result.severity is Severity.FIX
    assert result.remedy.startswith("fit a fuse of at least 12 A (the wires' ratings set")


def test_the_per_motor_battery_limit_shares_the_wire_ceiling_after_the_small_loads():
    # IEC 60364-4-43 433.1: Ib <= Iz. Two motors limited to 12 A each draw 24 A plus a 1 A
    # logic board, over 12 AWG's 20 A (NEC 240.4(D)); the pack current the wire allows leaves
    # (20 - 1) / 2 = 9.5 A per motor, 9 A in whole amperes
    data = vehicle(pack_fuse("20 A"), motors=2, logic={"board_current": "1 A"})
    result = finding(data, "fuse 'main' rating")
    assert result.severity is Severity.FIX
    assert result.remedy.startswith("no fuse rating fits")
    assert result.remedy.endswith(
        ", or set controller.battery_current_limit at or below 9 A per motor"
    )


def test_one_motor_gets_no_per_motor_wording():
    # NEC 240.4(D): 14 AWG at most 15 A under a 20 A current limit (IEC 60364-4-43 433.1)
    result = finding(vehicle(pack_fuse("20 A"), gauge=14, limit="20 A"), "fuse 'main' rating")
    assert result.remedy.endswith(", or set controller.battery_current_limit at or below 15 A")


def test_a_per_motor_limit_of_exactly_one_ampere_is_still_offered():
    # NEC 240.4(D): 18 AWG at most 7 A; four motors limited to 2 A each need 8 A;
    # 7 / 4 = 1.75 A per motor, 1 A in whole amperes (IEC 60364-4-43 433.1: Ib <= Iz)
    result = finding(
        vehicle(pack_fuse("7 A"), gauge=18, limit="2 A", motors=4), "fuse 'main' rating"
    )
    assert result.remedy.startswith("no fuse rating fits")
    assert result.remedy.endswith("at or below 1 A per motor")


# --- interruption: I_prospective <= breaking capacity, equality allowed --------------------------


def prospective(data):
    _, derived, _ = rule_outputs(RULE, data)
    figure = next(f for f in derived if f.name == "prospective short-circuit current")
    return figure.value.m_as("A")


def test_a_breaking_capacity_exactly_at_the_prospective_current_passes():
    # IEC 60364-4-43 clause 434: breaking capacity >= prospective current, equality allowed.
    # 42 V over 300 mOhm of cells and 1 m of 12 AWG (5.211 mOhm, CRC handbook) is about 137.6 A
    amps = prospective(vehicle())
    assert amps == pytest.approx(FULL / (0.3 + 0.005211), rel=0.005)
    exact = vehicle(pack_fuse("12 A", breaking_capacity=f"{amps!r} A"))
    assert finding(exact, "fuse 'main' interrupting rating").severity is Severity.PASS
    short = vehicle(pack_fuse("12 A", breaking_capacity=f"{math.floor(amps)} A"))
    assert finding(short, "fuse 'main' interrupting rating").severity is Severity.STOP


def test_no_pack_resistance_and_no_battery_wires_names_both():
    # IEC 60364-4-43 clause 434: I = V / (R_source + R_loop) cannot be formed with neither
    # resistance known; the figure is not given as infinite, and both inputs are named
    data = vehicle(pack_fuse("12 A"), wires=[lead("lead", 12, "motor")])
    del data["battery"]["cell_internal_resistance"]
    findings, derived, _ = rule_outputs(RULE, data)
    assert not any(f.name == "prospective short-circuit current" for f in derived)
    result = next(f for f in findings if f.subject == "fuse 'main' interrupting rating")
    assert result.severity is Severity.UNASSESSED
    assert result.missing == ("battery.cell_internal_resistance", "wires")


def test_a_design_current_below_one_ampere_asks_for_a_one_ampere_fuse():
    # IEC 60364-4-43 433.1: In >= Ib; a 0.5 A motor is met by the smallest whole ampere, 1 A
    wires = [lead(name, 8) for name in ("pack positive", "pack negative")]
    for each in wires:
        del each["temperature_rating"]
    data = vehicle(limit=None, wires=wires)
    data["motors"][0]["rated_current"] = "0.5 A"
    result = finding(data, "fuse at the battery positive")
    assert result.remedy.startswith("fit a fuse of at least 1 A (the wires' ratings set")


def interrupting(data):
    return finding(data, "fuse 'main' interrupting rating")


def test_the_interrupting_finding_quotes_the_loop_it_worked_out():
    # Ohm's law: 1 m of 12 AWG is 5.211 mOhm (CRC handbook), 10 x 30 mOhm cells 300 mOhm;
    # 42 V / 305.2 mOhm = 138 A
    assert interrupting(vehicle(pack_fuse("12 A"))).rationale == (
        "A short at the controller input draws 138 A from the 42 V pack through 5.21 mΩ of "
        "battery wiring and 300 mΩ inside the pack; the fuse breaks up to 1000 A at 58 V DC."
    )


@pytest.mark.parametrize(
    ("parallel", "sentence"),
    [
        # Ohm's law: 42 V / 1000 A - 5.211 mOhm = 36.8 mOhm for the pack
        (None, "It suffices if the pack's internal resistance is at least 36.8 mΩ."),
        # and per cell x 2 strings / 10 in series = 7.36 mOhm
        (
            2,
            "It suffices if each cell's internal resistance is at least 7.36 mΩ (the pack's 36.8 mΩ).",
        ),
    ],
)
def test_the_resistance_that_suffices_is_worked_out_per_pack_and_per_cell(parallel, sentence):
    # IEC 60364-4-43 clause 434: the prospective current V / (R_pack + R_loop) within the
    # 1000 A breaking capacity; the worst case (wires only) is 42 V / 5.211 mOhm = 8060 A
    data = vehicle(pack_fuse("12 A"))
    del data["battery"]["cell_internal_resistance"]
    if parallel is None:
        del data["battery"]["cells_parallel"]
    else:
        data["battery"]["cells_parallel"] = parallel
    result = interrupting(data)
    assert result.severity is Severity.UNASSESSED
    assert "draws 8060 A from the 42 V pack" in result.rationale
    assert result.rationale.endswith(sentence)


def test_the_design_current_names_its_basis_once_per_kind_of_motor():
    # IEC 60364-4-43 433.1: Ib is the sum over the motors, here 2 x the 12 A limit
    two = finding(vehicle(pack_fuse("25 A"), motors=2), "fuse 'main' rating")
    assert "the design current is 24 A (the 12 A motor limit x 2 motors)" in two.rationale
    one = finding(vehicle(pack_fuse("20 A")), "fuse 'main' rating")
    assert "the design current is 12 A (the 12 A motor limit), and" in one.rationale
