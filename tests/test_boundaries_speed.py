"""speed.rider-class on top speeds exactly on the class limit and exactly 20 % over it, and the
figures its wording quotes: each test answers a mutant that survived the rule's own tests
(benchmarks/mutation_score.py on rules/speed/rider_class.py).

The kart is invented: a 10S Li-ion pack (42 V full; Linden, from memory), one brushed motor of
100 rpm/V and 0.1 ohm behind a 10 A limit, a 12:60 belt and a 200 mm wheel.
"""

from __future__ import annotations

import re
from dataclasses import replace
from typing import Any

import pytest
from firstride_rules.speed.rider_class import RULE

from reviewer.findings import Finding, Severity
from reviewer.profile import Profile
from reviewer.session import default_profile
from reviewer.testing import rule_outputs, run_rule_on, variant
from reviewer.units import format_number, quantity

from .test_rule_speed import KART as BASE_KART

# The kart of tests/test_rule_speed.py with one rider of our own.
KART: dict[str, Any] = variant(
    BASE_KART, riders=[{"name": "Noor", "mass": "80 kg", "class": "adult"}]
)


def kart(**changes: Any) -> dict[str, Any]:
    return variant(KART, **changes)


def with_limit(key: str, kmh: float) -> Profile:
    """The default profile with one speed limit moved to ``kmh``."""
    profile = default_profile()
    old = profile.limit(key)
    limits = {**profile.limits, key: replace(old, value=quantity(kmh, "km/h"))}
    return replace(profile, limits=limits)


def only(findings: list[Finding]) -> Finding:
    (finding,) = [f for f in findings if f.subject.startswith("rider ")]
    return finding


def top_kmh(data: dict[str, Any]) -> float:
    return float(only(run_rule_on(RULE, data)).measured.m_as("km/h"))


def quoted_kmh(text: str, after: str) -> float:
    match = re.search(re.escape(after) + r".*?\(([\d.]+) km/h\)", text)
    assert match, text
    return float(match.group(1))


# --- severities on the limit ------------------------------------------------------------------


@pytest.mark.parametrize("rider_class", ["adult", "youth", "child"])
def test_a_top_speed_exactly_on_the_class_limit_passes(rider_class: str) -> None:
    # the rule's docstring: pass at or below the limit (EN 17128:2020 sets the adult 25 km/h
    # scope; the youth and child limits are common practice); the limit is moved onto the
    # kart's own top speed
    data = kart(riders=[{"name": "Noor", "mass": "80 kg", "class": rider_class}])
    speed = top_kmh(data)
    profile = with_limit(f"speed.max_speed.{rider_class}", speed)
    finding = only(run_rule_on(RULE, data, profile))
    assert finding.limit.m_as("km/h") == pytest.approx(speed)
    assert finding.severity is Severity.PASS
    assert finding.remedy is None


def test_an_adult_exactly_a_fifth_over_is_fix_and_a_little_more_is_stop() -> None:
    # common practice: an adult more than 20 % over the limit is a stop; 20 % or less a fix
    speed = top_kmh(kart())
    exact = only(run_rule_on(RULE, kart(), with_limit("speed.max_speed.adult", speed / 1.2)))
    assert exact.severity is Severity.FIX
    beyond = only(run_rule_on(RULE, kart(), with_limit("speed.max_speed.adult", speed / 1.21)))
    assert beyond.severity is Severity.STOP


def test_an_adult_a_quarter_over_is_stop() -> None:
    # common practice: more than 20 % over is a stop; 25 % over is clearly beyond it
    speed = top_kmh(kart())
    finding = only(run_rule_on(RULE, kart(), with_limit("speed.max_speed.adult", speed / 1.25)))
    assert finding.severity is Severity.STOP


# --- what the wording quotes --------------------------------------------------------------------


def test_full_duty_is_not_worded_as_a_duty_limit() -> None:
    # common practice: a controller with no max duty set runs to 100 %, which is no limit
    assert "max duty" not in only(run_rule_on(RULE, kart())).rationale
    limited = only(run_rule_on(RULE, kart(controller__max_duty="70 %")))
    assert "at 70% max duty" in limited.rationale


def test_the_rationale_quotes_the_kinetic_energy_in_kilojoules() -> None:
    # kinematics: E = 0.5 m v^2 for 100 kg of rider and vehicle
    findings, _, _ = rule_outputs(RULE, kart())
    finding = only(findings)
    speed = float(finding.measured.m_as("m/s"))
    kilojoules = 0.5 * 100.0 * speed**2 / 1000.0
    assert f"carry {format_number(kilojoules)} kJ" in finding.rationale


def test_the_pulley_remedy_quotes_the_speed_the_new_pulley_gives() -> None:
    # road load re-solved (the rule's docstring): the quoted speed is the rerun's top speed
    finding = only(run_rule_on(RULE, kart()))
    teeth = int(re.search(r"motor pulley of (\d+) teeth", finding.remedy).group(1))
    quoted = quoted_kmh(finding.remedy, "wheel pulley")
    rerun = top_kmh(kart(drivetrain__motor_pulley_teeth=teeth))
    assert quoted == pytest.approx(rerun, rel=0.01)


def test_the_duty_remedy_quotes_the_speed_the_new_duty_gives() -> None:
    # road load re-solved (the rule's docstring): the quoted speed is the rerun's top speed
    finding = only(run_rule_on(RULE, kart()))
    percent = int(re.search(r"at or below (\d+) %", finding.remedy).group(1))
    quoted = quoted_kmh(finding.remedy, "speed setting")
    rerun = top_kmh(kart(controller__max_duty=f"{percent} %"))
    assert quoted == pytest.approx(rerun, rel=0.01)
