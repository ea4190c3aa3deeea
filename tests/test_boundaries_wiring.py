"""wiring.stall-current on the bundling boundary: a mutant of rules/wiring/_model.py that
counted a wire's loaded conductors one off survived the rule's own tests
(benchmarks/mutation_score.py on rules/wiring/).

The pack is 6 Li-ion cells in series (25.2 V full; Linden, from memory); the wire is 12 AWG
silicone rated 200 degC at 30 degC ambient, behind a 20 A hardware current limit.
"""

from __future__ import annotations

import pytest
from firstride_rules.wiring.stall_current import RULE

from reviewer.testing import run_rule_on


def rated_amps(bundled_with: int) -> float:
    lead = {
        "name": "pack positive",
        "circuit": "battery",
        "gauge": "12 AWG",
        "length": "0.5 m",
        "insulation": "silicone",
        "temperature_rating": "200 degC",
        "bundled_with": bundled_with,
    }
    data = {
        "battery": {"chemistry": "li-ion", "cells_series": 6},
        "motors": [{"name": "drive", "type": "brushed", "winding_resistance": "0.3 ohm"}],
        "wires": [lead],
        "controller": {
            "motor_current_limit": "20 A",
            "current_limit_response": "10 ms",
            "current_limit_kind": "hardware",
        },
        "usage": {"ambient_temperature": "30 degC"},
    }
    (finding,) = [f for f in run_rule_on(RULE, data) if f.subject == "wire 'pack positive'"]
    return float(finding.limit.m_as("A"))


def test_three_loaded_conductors_keep_the_table_ampacity_and_four_do_not():
    # NEC 310.15(C)(1) (from memory): adjustment applies to more than three current-carrying
    # conductors, 80 % for four to six; NEC Table 310.16: 12 AWG copper, 90 degC column, 30 A
    alone = rated_amps(0)
    assert alone == pytest.approx(30.0)
    assert rated_amps(2) == pytest.approx(alone)  # with two others: three conductors
    assert rated_amps(3) < alone  # with three others: four conductors
