"""Finding and loading rule packs. The host talks to pluggy only through :class:`PackManager`."""

from __future__ import annotations

import importlib.metadata
from dataclasses import dataclass, replace

import pluggy

from reviewer import hookspecs
from reviewer.rule import RULE_ID_RE, Rule

ENTRY_POINT_GROUP = "firstride.packs"


@dataclass(frozen=True)
class PackProblem:
    """A pack that failed to load or register, and why; the other packs still run."""

    pack: str
    error: str


class PackManager:
    """A typed wrapper around the plugin manager, one method per hook."""

    def __init__(self) -> None:
        self._pm = pluggy.PluginManager(hookspecs.PROJECT)
        self._pm.add_hookspecs(hookspecs)
        self._versions: dict[str, str] = {}
        self.problems: list[PackProblem] = []

    def register(self, plugin: object, name: str, version: str = "") -> None:
        self._pm.register(plugin, name=name)
        self._versions[name] = version
        self._pm.check_pending()

    def load_entry_points(self) -> None:
        """Load every installed pack; a pack that fails is recorded, not fatal."""
        for entry_point in sorted(
            importlib.metadata.entry_points(group=ENTRY_POINT_GROUP), key=lambda e: e.name
        ):
            if self._pm.has_plugin(entry_point.name):
                continue
            try:
                plugin = entry_point.load()
                version = entry_point.dist.version if entry_point.dist else ""
                self.register(plugin, entry_point.name, version)
            except Exception as exc:  # noqa: BLE001 - any failure of a pack is reported
                if self._pm.has_plugin(entry_point.name):
                    self._pm.unregister(name=entry_point.name)
                self.problems.append(PackProblem(entry_point.name, _describe(exc)))

    def rules(self) -> list[Rule]:
        """Collect and validate every pack's rules, sorted by id; refuse the faulty ones."""
        collected: dict[str, Rule] = {}
        for impl in self._pm.hook.firstride_register_rules.get_hookimpls():
            pack = impl.plugin_name
            try:
                returned = impl.function()
                pack_rules = [self._stamp(rule, pack) for rule in list(returned or [])]
            except Exception as exc:  # noqa: BLE001
                self.problems.append(PackProblem(pack, _describe(exc)))
                continue
            for rule in pack_rules:
                if rule.id in collected:
                    other = collected[rule.id].pack
                    self.problems.append(
                        PackProblem(pack, f"rule id {rule.id!r} is already registered by {other}")
                    )
                    continue
                collected[rule.id] = rule
        return [collected[key] for key in sorted(collected)]

    def _stamp(self, rule: object, pack: str) -> Rule:
        if not isinstance(rule, Rule):
            raise TypeError(f"returned {type(rule).__name__}, not a reviewer.rule.Rule")
        missing = rule_problems(rule)
        if missing:
            raise ValueError(f"rule {rule.id!r}: {'; '.join(missing)}")
        return replace(rule, pack=pack, pack_version=self._versions.get(pack, ""))


def rule_problems(rule: Rule) -> list[str]:
    """What a rule lacks to be registered: id form, title, documentation, sources."""
    problems = []
    if not RULE_ID_RE.match(rule.id or ""):
        problems.append("id must be a lowercase dotted slug like 'area.check-name'")
    if not rule.title.strip():
        problems.append("no title")
    if not rule.doc.strip():
        problems.append("no documentation (give documentation= or a docstring on check)")
    if not rule.sources:
        problems.append("no source")
    if not callable(rule.check):
        problems.append("check is not callable")
    return problems


def _describe(exc: BaseException) -> str:
    return f"{type(exc).__name__}: {exc}"


def default_manager() -> PackManager:
    manager = PackManager()
    manager.load_entry_points()
    return manager
