"""enclosure.ingress where its own tests left a mutant alive (benchmarks/mutation_score.py on
rules/enclosure/ingress.py): a housing input left out, and the IEC 60529 jets-versus-immersion
wording for a minimum of IPX6."""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from firstride_rules.enclosure.ingress import RULE

from reviewer.engineering.ingress import parse_ip_code
from reviewer.findings import Severity
from reviewer.session import default_profile
from reviewer.testing import run_rule_on

LITHIUM = {"chemistry": "li-ion", "cells_series": 10, "cells_parallel": 2}


def scooter(**enclosure: Any) -> dict[str, Any]:
    return {
        "vehicle": {"name": "boundary scooter", "kind": "scooter"},
        "battery": LITHIUM,
        "enclosure": {"electronics_ip": "IP66", "battery_ip": "IP66", **enclosure},
        "usage": {"conditions": "wet"},
    }


def by_subject(data: dict[str, Any], profile=None) -> dict[str, Any]:
    return {f.subject: f for f in run_rule_on(RULE, data, profile)}


def test_a_soft_pack_with_its_place_unstated_is_unassessed_and_named():
    # common practice: a soft lithium pack under a deck is a stop, elsewhere an advice; with
    # the place not given (and the vehicle not a skateboard) neither can be chosen
    housing = by_subject(scooter(battery_hard_case=False))["battery housing"]
    assert housing.severity is Severity.UNASSESSED
    assert housing.missing == ("enclosure.battery_under_deck",)


def wet_minimum(code: str):
    profile = default_profile()
    key = "enclosure.minimum_ip.wet"
    old = profile.limit(key)
    return replace(profile, limits={**profile.limits, key: replace(old, value=parse_ip_code(code))})


def test_an_immersion_rating_against_a_minimum_of_ipx6_says_it_does_not_cover_jets():
    # IEC 60529 clause 6: a second digit of 7 (immersion) does not imply 6 (powerful jets);
    # a part meeting both is marked with both (IPX6/IPX7)
    found = by_subject(scooter(battery_ip="IP67", battery_hard_case=True), wet_minimum("IP56"))
    battery = found["battery enclosure"]
    assert battery.severity is Severity.FIX
    assert "(an immersion rating does not cover water jets)" in battery.rationale
