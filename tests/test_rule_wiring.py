"""wiring.stall-current on invented builds, checked against hand calculations from the sources.

Pack voltages are from memory (Linden, Handbook of Batteries): li-ion 4.2 V full, 3.6 V
nominal per cell; lead-acid 2.15 V full, 2.0 V nominal. Wire resistances come from the CRC
handbook table (ohm/km at 20 degC), so the expected stall currents do not reuse the rule's code.
"""

from __future__ import annotations

import math
import re

import pytest
from firstride_rules.wiring.stall_current import REMEDY_GAUGES, RULE

from reviewer.findings import Finding, Severity
from reviewer.profile import load_profile
from reviewer.testing import rule_outputs, run_rule_on
from reviewer.units import format_number

CRC_OHM_PER_KM = {  # CRC handbook table, ohm/km at 20 degC
    8: 2.061,
    10: 3.277,
    12: 5.211,
    14: 8.286,
    16: 13.17,
    18: 20.95,
    20: 33.31,
    22: 52.96,
}
PACK_FULL = 6 * 4.2  # 6S li-ion, from memory
PACK_NOMINAL = 6 * 3.6  # from memory
AMBIENT = 35.0  # the default profile's usage.default_ambient_temperature


def wire(name, gauge, circuit="battery", length="0.5 m", **extra):
    data = {"name": name, "circuit": circuit, "gauge": f"{gauge} AWG", "length": length}
    data.update(insulation="silicone", temperature_rating="200 degC")
    data.update(extra)
    return data


def build(*wires, winding="0.3 ohm", **extra):
    data = {
        "battery": {"chemistry": "li-ion", "cells_series": 6},
        "motors": [{"name": "drive", "type": "brushed", "winding_resistance": winding}],
        "wires": list(wires),
    }
    data.update(extra)
    return data


def limit(amps="20 A", response="10 ms", kind="hardware"):
    return {
        "motor_current_limit": amps,
        "current_limit_response": response,
        "current_limit_kind": kind,
    }


def on(findings: list[Finding], subject: str) -> Finding:
    return next(f for f in findings if f.subject == subject)


def ohms(gauge: int, metres: float) -> float:
    return CRC_OHM_PER_KM[gauge] * metres / 1000


def test_rule_id_is_mandatory_in_the_default_profile():
    assert RULE.id == "wiring.stall-current"
    assert RULE.id in load_profile().mandatory_rules
    assert "Severities" in RULE.doc and RULE.sources


def test_passing_wires():
    data = build(
        wire("pack positive", 10),
        wire("pack negative", 10),
        wire("motor lead", 10, circuit="motor"),
        controller=limit("20 A"),
    )
    findings = run_rule_on(RULE, data)
    assert {f.severity for f in findings} == {Severity.PASS}
    lead = on(findings, "wire 'motor lead'")
    assert lead.measured.m_as("A") == pytest.approx(20)
    # NEC Table 310.16 10 AWG 90 degC column 40 A, NEC 310.15(B) correction to 35 degC
    # (beats FAA 11-9's 32 A x sqrt(165/130) = 36.1 A for 200 degC wire)
    assert lead.limit.m_as("A") == pytest.approx(40 * math.sqrt((90 - AMBIENT) / 60))


def test_sustained_stall_on_a_thin_wire_is_stop():
    data = build(wire("pack positive", 16), wire("pack negative", 16))
    finding = on(run_rule_on(RULE, data), "wire 'pack positive'")
    assert finding.severity is Severity.STOP
    # Ohm's law: full pack over winding plus both wires (CRC table resistance)
    stall = PACK_FULL / (0.3 + 2 * ohms(16, 0.5))
    assert finding.measured.m_as("A") == pytest.approx(stall, rel=0.005)
    # FAA AC 43.13-1B Table 11-9: 16 AWG 200 degC 14 A at 70 degC, corrected to 35 degC
    assert finding.limit.m_as("A") == pytest.approx(14 * math.sqrt(165 / 130), rel=1e-6)
    assert "fuse" in finding.remedy and "hardware current limit" in finding.remedy
    assert finding.missing == ()


def test_continuous_current_over_ampacity_is_fix():
    data = build(
        wire("pack positive", 14, insulation="pvc-90", temperature_rating="90 degC"),
        wire("pack negative", 8, insulation="pvc-90", temperature_rating="90 degC"),
        controller=limit("30 A"),
    )
    finding = on(run_rule_on(RULE, data), "wire 'pack positive'")
    assert finding.severity is Severity.FIX
    assert finding.measured.m_as("A") == pytest.approx(30)
    # NEC Table 310.16: 14 AWG 90 degC 25 A x sqrt(55/60) (310.15(B)) = 23.9 A
    assert finding.limit.m_as("A") == pytest.approx(25 * math.sqrt(55 / 60))
    assert finding.remedy.startswith("use 10 AWG or heavier")


def _remedy_gauge(finding: Finding) -> int:
    match = re.match(r"use (\d+) AWG or heavier", finding.remedy or "")
    assert match, finding.remedy
    return int(match[1])


@pytest.mark.parametrize(
    ("gauge", "extra", "case"),
    [
        # FIX: 30 A limit through 14 AWG PVC 90 degC (NEC 310.16)
        (14, {"insulation": "pvc-90", "temperature_rating": "90 degC"}, "limit"),
        # STOP: a 2 s fuse clearing while 18 AWG PVC heats adiabatically (IEC 60364-4-43)
        (18, {"insulation": "pvc", "temperature_rating": "70 degC"}, "slow fuse"),
    ],
)
def test_remedy_is_the_lightest_passing_gauge(gauge, extra, case):
    controller = limit("30 A") if case == "limit" else None
    fuses = [{"name": "main", "location": "battery-positive", "rating": "10 A"}]
    fuses[0]["clearing_time"] = "2 s"

    def run(g):
        data = build(
            wire("pack positive", g, **extra),
            wire("pack negative", 8, **extra),
            controller=controller,
            fuses=fuses if case == "slow fuse" else [],
        )
        return on(run_rule_on(RULE, data), "wire 'pack positive'")

    first = run(gauge)
    assert first.severity in (Severity.STOP, Severity.FIX)
    proposed = _remedy_gauge(first)
    assert run(proposed).severity is Severity.PASS
    lighter = REMEDY_GAUGES[REMEDY_GAUGES.index(proposed) - 1]
    assert lighter > proposed
    assert run(lighter).severity is not Severity.PASS


def test_adiabatic_withstand_against_fuse_clearing_time():
    fuse = {
        "name": "main",
        "location": "battery-positive",
        "rating": "10 A",
        "clearing_time": "2 s",
    }
    pvc = {"insulation": "pvc", "temperature_rating": "70 degC"}
    data = build(wire("pack positive", 18, **pvc), wire("pack negative", 8, **pvc), fuses=[fuse])
    finding = on(run_rule_on(RULE, data), "wire 'pack positive'")
    assert finding.severity is Severity.STOP
    stall = PACK_FULL / (0.3 + ohms(18, 0.5) + ohms(8, 0.5))
    # IEC 60364-4-43 434.5.2: PVC k = 115; 18 AWG 0.823 mm^2 (ASTM B258)
    withstand = 115**2 * 0.823**2 / stall**2
    assert finding.measured.m_as("s") == pytest.approx(2.0)
    assert finding.limit.m_as("s") == pytest.approx(withstand, rel=0.01)


def test_a_fast_fuse_protects_a_thin_wire():
    fuse = {"name": "main", "location": "battery-positive", "rating": "12 A"}
    fuse["clearing_time"] = "50 ms"
    data = build(wire("pack positive", 16), wire("pack negative", 16), fuses=[fuse])
    finding = on(run_rule_on(RULE, data), "wire 'pack positive'")
    # the fuse caps the continuous current at its rating (IEC 60364-4-43 433.1, Ib <= In <= Iz),
    # within FAA 11-9's 16 AWG 200 degC 14 A corrected to 35 degC
    assert finding.severity is Severity.PASS
    assert finding.measured.m_as("A") == pytest.approx(12)


def test_fuse_rated_above_stall_current_does_not_count():
    fuse = {"name": "main", "location": "battery-positive", "rating": "200 A"}
    fuse["clearing_time"] = "10 ms"
    data = build(wire("pack positive", 16), wire("pack negative", 16), fuses=[fuse])
    finding = on(run_rule_on(RULE, data), "wire 'pack positive'")
    assert finding.severity is Severity.STOP
    assert "at or above the stall current" in finding.rationale


def test_fuse_without_clearing_time():
    # ISO 8820-3 bands (from memory): a fuse near its rating may hold for minutes, so a 30 A
    # fuse under an 81 A stall (2.7 x) is not counted on; a 10 A fuse (8 x) is, in 1 s.
    thin = (wire("pack positive", 16), wire("pack negative", 16))
    near = build(*thin, fuses=[{"name": "main", "location": "battery-positive", "rating": "30 A"}])
    finding = on(run_rule_on(RULE, near), "wire 'pack positive'")
    assert finding.severity is Severity.STOP
    assert "gives no clearing time" in finding.rationale
    far = build(*thin, fuses=[{"name": "main", "location": "battery-positive", "rating": "10 A"}])
    findings, _, assumptions = rule_outputs(RULE, far)
    assert on(findings, "wire 'pack positive'").severity is Severity.PASS
    assert any("Fuse 'main' gives no clearing_time" in a.text for a in assumptions)


def test_fuse_protects_only_the_wires_it_names():
    fuse = {"name": "lead", "location": "motor", "rating": "10 A", "clearing_time": "50 ms"}
    fuse["protects"] = ["motor lead"]
    data = build(wire("pack positive", 16), wire("motor lead", 16, circuit="motor"), fuses=[fuse])
    findings = run_rule_on(RULE, data)
    assert on(findings, "wire 'motor lead'").severity is Severity.PASS
    assert on(findings, "wire 'pack positive'").severity is Severity.STOP


def test_unassessed_names_missing_fields():
    findings = run_rule_on(RULE, {"motors": [{"type": "brushed"}]})
    assert len(findings) == 1 and findings[0].severity is Severity.UNASSESSED
    assert set(findings[0].missing) == {"battery", "motors[0].winding_resistance", "wires"}
    bare = {"name": "pack negative", "circuit": "battery", "gauge": "10 AWG", "length": "0.5 m"}
    findings = run_rule_on(RULE, build(wire("pack positive", 10), bare, controller=limit()))
    finding = on(findings, "wire 'pack negative'")
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("wires[1].insulation", "wires[1].temperature_rating")
    assert on(findings, "wire 'pack positive'").severity is Severity.PASS


def test_size_outside_the_tables_needs_a_datasheet():
    # 20 AWG is in neither NEC 310.16 (14-8) nor FAA 11-9 (18-10)
    data = build(wire("pack positive", 10), wire("sense", 20), controller=limit("5 A"))
    finding = on(run_rule_on(RULE, data), "wire 'sense'")
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("wires[1].rated_ampacity",)
    rated = wire("sense", 20, rated_ampacity="8 A")
    data = build(wire("pack positive", 10), rated, controller=limit("5 A"))
    finding = on(run_rule_on(RULE, data), "wire 'sense'")
    assert finding.severity is Severity.PASS
    assert "wire datasheet" in finding.rationale
    # read as for 30 degC, corrected like NEC 310.15(B) to 35 degC
    assert finding.limit.m_as("A") == pytest.approx(8 * math.sqrt(165 / 170))


def test_metric_wire_uses_the_awg_row_below_it():
    metric = {"name": "pack positive", "circuit": "battery", "cross_section": "4 mm^2"}
    metric.update(length="0.5 m", insulation="pvc-90", temperature_rating="90 degC")
    finding = on(run_rule_on(RULE, build(metric, controller=limit())), "wire 'pack positive'")
    # 4 mm^2 lies between 12 AWG (3.31) and 11 AWG (4.17): NEC 310.16 12 AWG 90 degC, 30 A
    assert finding.limit.m_as("A") == pytest.approx(30 * math.sqrt(55 / 60))
    assert "12 AWG" in finding.rationale


def test_shared_battery_wire_carries_every_motor():
    motors = [
        {"name": "left", "type": "brushed", "winding_resistance": "0.4 ohm"},
        {"name": "right", "type": "brushed", "winding_resistance": "0.4 ohm"},
    ]
    data = build(
        wire("pack positive", 10),
        wire("left lead", 12, circuit="motor", motor="left"),
        wire("right lead", 12, circuit="motor", motor="right"),
    )
    data["motors"] = motors
    findings, figures, _ = rule_outputs(RULE, data)
    # Ohm's law, two equal branches in parallel behind the shared wire
    branch = 0.4 + ohms(12, 0.5)
    total = PACK_FULL / (ohms(10, 0.5) + branch / 2)
    shared = on(findings, "wire 'pack positive'")
    assert shared.severity is Severity.STOP  # sustained: nothing interrupts it
    assert shared.measured.m_as("A") == pytest.approx(total, rel=0.005)
    assert on(findings, "wire 'left lead'").measured.m_as("A") == pytest.approx(total / 2, 0.005)
    figure = next(f for f in figures if f.name == "stall current, all motors")
    assert figure.value.m_as("A") == pytest.approx(total, rel=0.005)

    data["controller"] = limit("15 A")
    findings = run_rule_on(RULE, data)
    assert on(findings, "wire 'pack positive'").measured.m_as("A") == pytest.approx(30)
    assert on(findings, "wire 'right lead'").measured.m_as("A") == pytest.approx(15)


def test_stall_power_of_a_small_brushed_motor():
    # common practice: a small brushed motor on a nominal 24 V pack pulling about 24 A at stall
    # takes close to 600 W (24 V x 24 A = 576 W). Lead-acid 12 cells: 24 V nominal, 25.8 V full
    # (from memory); loop 1.075 ohm gives 24 A at full charge.
    leads = [
        wire("pack positive", 14, length="0.5 m"),
        wire("pack negative", 14, length="0.5 m"),
    ]
    winding = 25.8 / 24.0 - ohms(14, 1.0)
    data = build(*leads, winding=f"{winding:.6f} ohm", controller=limit("10 A"))
    data["battery"] = {"chemistry": "lead-acid", "cells_series": 12}
    _, figures, _ = rule_outputs(RULE, data)
    value = {f.name: f.value for f in figures}
    current = value["stall current, motor 'drive'"].m_as("A")
    power = value["stall power, motor 'drive'"].m_as("W")
    assert current == pytest.approx(24.0, rel=0.005)
    assert power == pytest.approx(25.8 * current)  # V x I at full charge
    assert power * 24.0 / 25.8 == pytest.approx(576, rel=0.005)  # at nominal voltage
    assert power == pytest.approx(600, rel=0.05)


def test_voltage_drop_over_the_profile_limit_is_advise():
    long_thin = [
        wire("pack positive", 16, length="8 m"),
        wire("pack negative", 16, length="8 m"),
    ]
    data = build(*long_thin, controller=limit("12 A"))
    finding = on(run_rule_on(RULE, data), "motor path 'drive'")
    assert finding.severity is Severity.ADVISE
    # Ohm's law over both conductors (CRC table), between 20 degC and the 200 degC rating
    cold = 12 * ohms(16, 16.0) / PACK_NOMINAL * 100
    hot = cold * (234.5 + 200) / (234.5 + 20)
    assert cold < finding.measured.m_as("percent") < hot
    assert finding.limit.m_as("percent") == pytest.approx(10)  # ABYC E-11
    match = re.match(r"use (\d+) AWG or heavier", finding.remedy)
    assert match
    heavier = int(match[1])
    fixed = build(
        wire("pack positive", heavier, length="8 m"),
        wire("pack negative", heavier, length="8 m"),
        controller=limit("12 A"),
    )
    assert on(run_rule_on(RULE, fixed), "motor path 'drive'").severity is Severity.PASS
    lighter = build(
        wire("pack positive", heavier + 2, length="8 m"),
        wire("pack negative", heavier + 2, length="8 m"),
        controller=limit("12 A"),
    )
    assert on(run_rule_on(RULE, lighter), "motor path 'drive'").severity is Severity.ADVISE


def test_default_ambient_is_an_assumption():
    data = build(wire("pack positive", 10), controller=limit())
    _, _, assumptions = rule_outputs(RULE, data)
    assert any("usage.ambient_temperature not given" in a.text for a in assumptions)
    data["usage"] = {"ambient_temperature": "20 degC"}
    _, _, assumptions = rule_outputs(RULE, data)
    assert not any("Ambient temperature" in a.text for a in assumptions)


def test_pack_fuse_sees_every_motor_current():
    # A fuse at the battery positive carries the sum of both stall currents (Kirchhoff's
    # current law), so it is judged against the total, not one motor's share.
    motors = [
        {"name": "left", "type": "brushed", "winding_resistance": "0.3 ohm"},
        {"name": "right", "type": "brushed", "winding_resistance": "0.3 ohm"},
    ]
    data = build(
        wire("pack positive", 10),
        wire("left lead", 14, circuit="motor", motor="left"),
        wire("right lead", 14, circuit="motor", motor="right"),
        fuses=[{"name": "main", "location": "battery-positive", "rating": "40 A"}],
    )
    data["motors"] = motors
    findings, figures, _ = rule_outputs(RULE, data)
    value = {f.name: f.value.m_as("A") for f in figures if f.name.startswith("stall current")}
    # each motor alone is under 3.5 x 40 A (ISO 8820-3 band, from memory); both together over
    assert value["stall current, motor 'left'"] < 3.5 * 40 <= value["stall current, all motors"]
    lead = on(findings, "wire 'left lead'")
    assert "fuse 'main' acts" in lead.rationale
    # The pack-side fuse caps the pack's current, not the lead's: at a stall the power balance
    # I_b V = I_m^2 R (brief 11) lets the lead carry sqrt(40 A x V / R) for long
    loop = 0.3 + 0.5 * CRC_OHM_PER_KM[14] / 1000 + 0.5 * CRC_OHM_PER_KM[10] / 1000
    assert lead.measured.m_as("A") == pytest.approx(math.sqrt(40 * PACK_FULL / loop), rel=1e-3)


PVC_70 = {"insulation": "pvc", "temperature_rating": "70 degC"}
# NEC Table 310.16: 14 AWG, 60 degC column, 15 A (published), corrected to 35 degC by the
# NEC 310.15(B) formula; the 60 degC column is the one at or below a 70 degC rating.
NEC_14_AWG_60C = 15 * math.sqrt((60 - AMBIENT) / 30)


def thin_pair(gauge, stall=24.0, **extra):
    """Two wires of one gauge, 0.5 m each, and a winding that makes the stall ``stall`` amperes
    from the full 6S pack (Ohm's law with the CRC table resistance)."""
    winding = PACK_FULL / stall - ohms(gauge, 1.0)
    wires = (wire("pack positive", gauge, **PVC_70), wire("pack negative", gauge, **PVC_70))
    return build(*wires, winding=f"{winding:.6f} ohm", **extra)


@pytest.mark.parametrize(
    "gauge",
    [
        22,  # thinner than both tables
        16,  # FAA Table 11-9 has the row but no column at or below 70 degC
    ],
)
def test_thin_wire_over_the_smallest_tabulated_size_is_stop(gauge):
    finding = on(run_rule_on(RULE, thin_pair(gauge)), "wire 'pack positive'")
    assert finding.severity is Severity.STOP
    assert finding.measured.m_as("A") == pytest.approx(24.0, rel=0.005)  # Ohm's law, CRC table
    assert finding.limit.m_as("A") == pytest.approx(NEC_14_AWG_60C)
    assert "upper bound" in finding.rationale
    assert "NEC Table 310.16, 14 AWG, 60 °C column: 15 A" in finding.rationale
    assert finding.missing == ()
    # a datasheet cannot rate this size above the bound, so none is asked for
    assert "datasheet ampacity of at least" not in finding.remedy

    def resized(g):  # the same motor, both wires at gauge g
        data = thin_pair(gauge)
        data["wires"] = [wire("pack positive", g, **PVC_70), wire("pack negative", g, **PVC_70)]
        return on(run_rule_on(RULE, data), "wire 'pack positive'")

    proposed = _remedy_gauge(finding)
    assert resized(proposed).severity is Severity.PASS
    lighter = REMEDY_GAUGES[REMEDY_GAUGES.index(proposed) - 1]
    assert resized(lighter).severity is not Severity.PASS


def test_thin_wire_design_current_over_the_bound_is_fix():
    data = thin_pair(22, controller=limit("20 A", "10 ms"))
    finding = on(run_rule_on(RULE, data), "wire 'pack positive'")
    assert finding.severity is Severity.FIX
    assert finding.measured.m_as("A") == pytest.approx(20)
    assert finding.limit.m_as("A") == pytest.approx(NEC_14_AWG_60C)
    assert "upper bound" in finding.rationale


def test_thin_wire_under_the_bound_needs_its_datasheet():
    data = thin_pair(22, controller=limit("0.5 A", "10 ms"))
    finding = on(run_rule_on(RULE, data), "wire 'pack positive'")
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("wires[0].rated_ampacity",)
    assert format_number(NEC_14_AWG_60C) + " A" in finding.rationale
    # NEC Table 310.16 rates nothing thinner than 14 AWG, and FAA Table 11-9 has no column at
    # or below 70 degC, so 14 AWG is the lightest size a table can vouch for
    assert _remedy_gauge(finding) == 14


def test_thin_wire_still_gets_the_adiabatic_check():
    fuse = {"name": "main", "location": "battery-positive", "rating": "10 A"}
    fuse["clearing_time"] = "3 s"
    finding = on(run_rule_on(RULE, thin_pair(22, fuses=[fuse])), "wire 'pack positive'")
    assert finding.severity is Severity.STOP
    # IEC 60364-4-43 434.5.2: PVC k = 115; 22 AWG 0.326 mm^2 (ASTM B258); 24 A by Ohm's law
    assert finding.measured.m_as("s") == pytest.approx(3.0)
    assert finding.limit.m_as("s") == pytest.approx(115**2 * 0.326**2 / 24.0**2, rel=0.01)


def test_rating_below_every_column_stays_unassessed():
    # NEC Table 310.16 starts at 60 degC and FAA Table 11-9 at 105 degC: no table bounds a
    # 50 degC wire, however much current it carries
    cool = {"insulation": "rubber", "temperature_rating": "50 degC"}
    data = thin_pair(22)
    data["wires"] = [wire("pack positive", 22, **cool), wire("pack negative", 22, **cool)]
    finding = on(run_rule_on(RULE, data), "wire 'pack positive'")
    assert finding.severity is Severity.UNASSESSED
    assert finding.missing == ("wires[0].rated_ampacity",)


def test_a_wire_exactly_at_its_ampacity_carries_it() -> None:
    # IEC 60364-4-43 433.1: Ib <= Iz, equality allowed. A datasheet ampacity read for 30 degC
    # air, at 30 degC ambient and unbundled, is the rating itself; a 20 A hardware limit (held
    # well below the stall) makes the design current exactly 20 A
    rated = wire("pack positive", 12, rated_ampacity="20 A")
    data = build(rated, controller=limit("20 A"), usage={"ambient_temperature": "30 degC"})
    finding = on(run_rule_on(RULE, data), "wire 'pack positive'")
    assert finding.measured.m_as("A") == pytest.approx(20.0)
    assert finding.limit.m_as("A") == pytest.approx(20.0)
    assert finding.severity is Severity.PASS
    over = build(rated, controller=limit("20.1 A"), usage={"ambient_temperature": "30 degC"})
    assert on(run_rule_on(RULE, over), "wire 'pack positive'").severity is Severity.FIX
