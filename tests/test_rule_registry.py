"""Docs kept honest: every registered rule is complete and listed by `firstride rules`."""

from __future__ import annotations

import pytest

from reviewer.cli import main
from reviewer.plugins import default_manager
from reviewer.profile import load_profile
from reviewer.rule import rule_problems

CORE = {
    "wiring.stall-current",
    "motor.cooling",
    "speed.rider-class",
    "enclosure.ingress",
    "logic.pin-current",
}
RULES = default_manager().rules()


def test_built_in_pack_loads_through_its_entry_point() -> None:
    manager = default_manager()
    rules = manager.rules()
    assert not manager.problems
    assert {r.id for r in rules} >= CORE
    assert {r.pack for r in rules if r.id in CORE} == {"core"}


@pytest.mark.parametrize("rule", RULES, ids=lambda r: r.id)
def test_rule_is_complete(rule) -> None:
    assert rule_problems(rule) == []
    assert len(rule.doc) > 200, "documentation should say what, how, inputs and severities"
    assert rule.inputs


def test_rules_command_lists_every_rule_with_sources(capsys) -> None:
    assert main(["rules"]) == 0
    out = capsys.readouterr().out
    for rule in RULES:
        assert rule.id in out
        for source in rule.sources:
            assert source.citation in out


def test_rules_command_shows_one_rule(capsys) -> None:
    assert main(["rules", "speed.rider-class"]) == 0
    out = capsys.readouterr().out
    assert out.startswith("speed.rider-class: ")
    assert "sources:" in out


def test_unknown_rule_id_is_an_input_error(capsys) -> None:
    assert main(["rules", "no.such-rule"]) == 2
    assert len(capsys.readouterr().err.strip().splitlines()) == 1


def test_default_profile_makes_the_core_rules_mandatory() -> None:
    assert set(load_profile().mandatory_rules) >= CORE
