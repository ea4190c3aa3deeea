"""Helpers for rule authors' tests: a build from a dict, one rule run, a pack loaded strictly.

A pack's tests in a few lines::

    import firstride_harbourclub
    from reviewer.findings import Severity
    from reviewer.testing import load_pack, severities

    PACK = load_pack(firstride_harbourclub, "harbourclub")  # refused loudly if faulty

    def test_heavy_vehicle_is_a_fix():
        findings = PACK.run("harbourclub.vehicle-mass", {"vehicle": {..., "mass": "45 kg"}})
        assert severities(findings) == [Severity.FIX]

For one rule object without a pack, :func:`run_rule_on` runs it as the engine would.
"""

from __future__ import annotations

import copy
import importlib
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from reviewer import __version__
from reviewer.build import Build
from reviewer.engine import Review, run_rule
from reviewer.findings import Assumption, DerivedFigure, Finding, Severity
from reviewer.names import BUILT_IN_PACK
from reviewer.plugins import PackManager
from reviewer.profile import Profile, load_profile, parse_profile
from reviewer.rule import Rule
from reviewer.session import Session, default_profile

MINIMAL_VEHICLE = {"name": "test vehicle", "kind": "other"}
BuildData = Mapping[str, Any] | Build


def make_build(data: Mapping[str, Any]) -> Build:
    """Validate a build from a plain dict; ``vehicle`` defaults to a minimal one."""
    tree = dict(data)
    tree.setdefault("vehicle", MINIMAL_VEHICLE)
    return Build.model_validate(tree)


def variant(base: Mapping[str, Any], **changes: Any) -> dict[str, Any]:
    """A deep copy of a build dict with fields changed by path: ``battery__cells_series=7``
    sets ``battery.cells_series``, ``brakes__0__kind="foot"`` the first brake's kind; a value
    of None removes the field."""
    data = copy.deepcopy(dict(base))
    for path, value in changes.items():
        node: Any = data
        *parents, leaf = path.split("__")
        for key in parents:
            node = node[int(key)] if isinstance(node, list) else node.setdefault(key, {})
        if isinstance(node, list):
            node[int(leaf)] = value
        elif value is None:
            node.pop(leaf, None)
        else:
            node[leaf] = value
    return data


def _build(data: BuildData) -> Build:
    return data if isinstance(data, Build) else make_build(data)


def run_rule_on(rule: Rule, data: BuildData, profile: Profile | None = None) -> list[Finding]:
    """Run one rule as the engine would (fenced and stamped) and return its findings."""
    outputs = run_rule(rule, _build(data), profile or default_profile())
    return [item for item in outputs if isinstance(item, Finding)]


def rule_outputs(
    rule: Rule, data: BuildData, profile: Profile | None = None
) -> tuple[list[Finding], list[DerivedFigure], list[Assumption]]:
    outputs = run_rule(rule, _build(data), profile or default_profile())
    return (
        [o for o in outputs if isinstance(o, Finding)],
        [o for o in outputs if isinstance(o, DerivedFigure)],
        [o for o in outputs if isinstance(o, Assumption)],
    )


def severities(findings: Iterable[Finding]) -> list[Severity]:
    """The severities of some findings, in order: ``assert severities(f) == [Severity.PASS]``."""
    return [finding.severity for finding in findings]


def profile_from(text: str, where: str = "(test profile)") -> Profile:
    """A profile from TOML text; ``extends = "default"`` builds on the built-in one."""
    return parse_profile(text, where)


@dataclass(frozen=True)
class LoadedPack:
    """One pack, registered and validated in a fresh manager of its own."""

    name: str
    manager: PackManager
    rules: dict[str, Rule]
    profile: Profile  # the given (or built-in) profile over the pack's default limits

    def rule(self, rule_id: str) -> Rule:
        try:
            return self.rules[rule_id]
        except KeyError:
            raise KeyError(
                f"pack {self.name} has no rule {rule_id!r}: {sorted(self.rules)}"
            ) from None

    def run(self, rule_id: str, data: BuildData, profile: Profile | None = None) -> list[Finding]:
        """One rule of the pack over a build (extensions validated first), fenced like the
        engine runs it; findings only."""
        return self.outputs(rule_id, data, profile)[0]

    def outputs(
        self, rule_id: str, data: BuildData, profile: Profile | None = None
    ) -> tuple[list[Finding], list[DerivedFigure], list[Assumption]]:
        build = _build(data)
        self.manager.check_extensions(build, "(test build)")
        return rule_outputs(
            self.rule(rule_id), build, self.manager.complete_profile(profile or self.profile)
        )

    def review(
        self, data: BuildData, profile: Profile | None = None, *, with_core: bool = True
    ) -> Review:
        """A whole review of the build by this pack (and the built-in pack, by default)."""
        build = _build(data)
        manager = self.manager
        if with_core and BUILT_IN_PACK not in manager.packs:
            manager = _with_core(self._plugin, self.name)
        session = Session(manager, manager.complete_profile(profile or self.profile))
        return session.review_build(build, where="(test build)")

    @property
    def _plugin(self) -> object:
        plugin = self.manager.plugin(self.name)
        assert plugin is not None
        return plugin


def load_pack(
    plugin: object, name: str, *, profile: Profile | str | Path | None = None
) -> LoadedPack:
    """Register ``plugin`` (a pack module or object) as pack ``name`` in a fresh, strict
    manager: any problem (misspelled hook, faulty rule, bad default limits) raises, naming it.

    ``profile`` is a Profile, a profile file's path, or None for the built-in profile; the
    built-in pack's and this pack's default limits sit under it, as in a real review.
    """
    manager = PackManager(strict=True)
    manager.register(plugin, name, "test")
    rules = {rule.id: rule for rule in manager.rules()}
    base = profile if isinstance(profile, Profile) else load_profile(profile)
    return LoadedPack(name, manager, rules, _with_core(plugin, name).complete_profile(base))


def _with_core(plugin: object, name: str) -> PackManager:
    """A strict manager with the built-in pack beside ``plugin``, as an installed pack has."""
    manager = PackManager(strict=True)
    manager.register(importlib.import_module("firstride_rules"), BUILT_IN_PACK, __version__)
    manager.register(plugin, name, "test")
    return manager
