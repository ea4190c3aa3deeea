"""Helpers for rule authors' tests: a build from a dict, one rule run, a fresh pack manager.

from reviewer.testing import make_build, run_rule_on

def test_my_rule():
    findings = run_rule_on(MY_RULE, {"vehicle": {"name": "t", "kind": "kart"}})
    assert findings[0].severity is Severity.UNASSESSED
"""

from __future__ import annotations

from collections.abc import Iterator, Mapping
from typing import Any

import pytest

from reviewer.build import Build
from reviewer.engine import run_rule
from reviewer.findings import Assumption, DerivedFigure, Finding
from reviewer.plugins import PackManager
from reviewer.profile import Profile, load_profile
from reviewer.rule import Rule

MINIMAL_VEHICLE = {"name": "test vehicle", "kind": "other"}


def make_build(data: Mapping[str, Any]) -> Build:
    """Validate a build from a plain dict; ``vehicle`` defaults to a minimal one."""
    tree = dict(data)
    tree.setdefault("vehicle", MINIMAL_VEHICLE)
    return Build.model_validate(tree)


def run_rule_on(
    rule: Rule, data: Mapping[str, Any] | Build, profile: Profile | None = None
) -> list[Finding]:
    """Run one rule as the engine would (fenced and stamped) and return its findings."""
    build = data if isinstance(data, Build) else make_build(data)
    outputs = run_rule(rule, build, profile or load_profile())
    return [item for item in outputs if isinstance(item, Finding)]


def rule_outputs(
    rule: Rule, data: Mapping[str, Any] | Build, profile: Profile | None = None
) -> tuple[list[Finding], list[DerivedFigure], list[Assumption]]:
    build = data if isinstance(data, Build) else make_build(data)
    outputs = run_rule(rule, build, profile or load_profile())
    return (
        [o for o in outputs if isinstance(o, Finding)],
        [o for o in outputs if isinstance(o, DerivedFigure)],
        [o for o in outputs if isinstance(o, Assumption)],
    )


@pytest.fixture
def pack_manager() -> Iterator[PackManager]:
    """A fresh pack manager with no packs loaded; register inline packs in the test."""
    yield PackManager()
