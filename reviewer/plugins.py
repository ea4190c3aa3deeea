"""Finding and loading rule packs. The host talks to pluggy only through :class:`PackManager`.

Packs come from three places, all through the same checks:

- installed distributions with an entry point in the ``firstride.packs`` group (the entry
  point's name is the pack's name; the built-in pack ``core`` is one of them);
- local Python files given with ``--rules PATH.py`` (the pack's name is the module's
  ``PACK_NAME``, else the file's stem), for trying a pack without packaging it;
- objects a test registers with :meth:`PackManager.register`.

A pack that fails to import, implements a misspelled hook, or registers a faulty rule is
recorded as a :class:`PackProblem` naming the pack and the error; every other pack still runs.
The review lists the problems and is ``incomplete`` when the profile requires the failed pack
(``required_packs``). With ``strict=True`` (``--strict-packs``) the first problem is an input
error instead. Packs named in ``blocked`` (``--block-pack``, ``FIRSTRIDE_BLOCK_PACKS``) are not
even imported.
"""

from __future__ import annotations

import hashlib
import importlib.metadata
import importlib.util
import inspect
import os
import re
import sys
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, replace
from pathlib import Path
from typing import TYPE_CHECKING

import pluggy
from pydantic import BaseModel

from reviewer import hookspecs
from reviewer.errors import InputError
from reviewer.names import (
    BLOCK_ENVIRONMENT,
    BUILT_IN_PACK,
    ENTRY_POINT_GROUP,
    PACK_NAME_RE,
)
from reviewer.profile import Limit, Profile, parse_limits, same_kind
from reviewer.rule import Rule, rule_problems
from reviewer.rule_settings import suggest

if TYPE_CHECKING:
    from reviewer.build import Build

_HOOKS = tuple(sorted(n for n in dir(hookspecs) if n.startswith(f"{hookspecs.PROJECT}_")))


@dataclass(frozen=True)
class PackProblem:
    """A pack that failed to load or register, or was blocked, and why."""

    pack: str
    error: str
    blocked: bool = False


@dataclass(frozen=True)
class PackInfo:
    """A loaded pack: its name, version and where it came from (for ``firstride rules``)."""

    name: str
    version: str
    origin: str


class PackRefused(ValueError):
    """A pack the manager will not register; the message says why."""


class PackError(InputError):
    """A pack problem under ``--strict-packs``: one line, exit status 2."""

    def __init__(self, problem: PackProblem) -> None:
        super().__init__(f"rule pack {problem.pack}", "(load)", problem.error)
        self.problem = problem

    def __str__(self) -> str:
        return f"rule pack {self.problem.pack!r}: {self.problem.error} (--strict-packs)"


class PackManager:
    """A typed wrapper around the plugin manager, one method per hook."""

    def __init__(self, *, blocked: Iterable[str] = (), strict: bool = False) -> None:
        self._pm = pluggy.PluginManager(hookspecs.PROJECT)
        self._pm.add_hookspecs(hookspecs)
        self.blocked = frozenset(blocked)
        self.strict = strict
        self.packs: dict[str, PackInfo] = {}
        self.problems: list[PackProblem] = []
        self._rules: list[Rule] | None = None
        self._limits: dict[str, Limit] | None = None
        self._limits_digest = ""

    # --- loading ------------------------------------------------------------------------------

    def register(self, plugin: object, name: str, version: str = "", origin: str = "") -> None:
        """Register one pack; raises :class:`PackRefused` (nothing registered) if it is faulty."""
        if not PACK_NAME_RE.match(name):
            raise PackRefused(
                f"pack name {name!r} must be a lowercase slug like 'harbourclub' "
                "(letters, digits, inner hyphens): it prefixes every rule id of the pack"
            )
        if name in self.packs:
            raise PackRefused(
                f"a pack named {name!r} is already loaded from {self.packs[name].origin}"
            )
        try:
            self._pm.register(plugin, name=name)
        except (pluggy.PluginValidationError, ValueError) as exc:
            raise PackRefused(_one_line(str(exc))) from None
        try:
            self._check_hooks(plugin, name)
        except PackRefused:
            self._pm.unregister(name=name)
            raise
        self.packs[name] = PackInfo(name, version, origin or f"registered object {name}")
        self._rules = self._limits = None

    def _check_hooks(self, plugin: object, name: str) -> None:
        """A misspelled or unmarked hook is an error, never silence."""
        try:
            self._pm.check_pending()
        except pluggy.PluginValidationError as exc:
            hook = re.search(r"unknown hook '([^']+)'", str(exc))
            word = hook[1] if hook else "?"
            raise PackRefused(f"unknown hook {word!r}{_close(word, _HOOKS)}") from None
        marked = {caller.name for caller in self._pm.get_hookcallers(plugin) or []}
        for attribute in dir(plugin):
            if not attribute.startswith(f"{hookspecs.PROJECT}_") or attribute in marked:
                continue
            if inspect.isroutine(getattr(plugin, attribute, None)):
                if attribute in _HOOKS:
                    raise PackRefused(f"{attribute} is not marked with @reviewer.hookimpl")
                raise PackRefused(f"unknown hook {attribute!r}{_close(attribute, _HOOKS)}")
        if not marked:
            raise PackRefused(
                "implements no hook: define firstride_register_rules marked @reviewer.hookimpl"
            )

    def load_entry_points(self) -> None:
        """Load every installed pack; a pack that fails is recorded, not fatal."""
        points = importlib.metadata.entry_points(group=ENTRY_POINT_GROUP)
        for point in sorted(points, key=lambda p: (p.name, p.value)):
            dist = point.dist.name if point.dist else "unknown distribution"
            origin = f"{point.value}, distribution {dist}"
            loaded = self.packs.get(point.name)
            if loaded is not None:
                if loaded.origin != origin and not loaded.origin.startswith("file "):
                    self._problem(
                        point.name,
                        f"two packs are named {point.name!r}: "
                        f"{loaded.origin} was loaded, {origin} was not",
                    )
                continue
            if point.name in self.blocked:
                self._blocked(point.name)
                continue
            try:
                plugin = point.load()
                version = point.dist.version if point.dist else ""
                self.register(plugin, point.name, version, origin)
            except PackRefused as exc:
                self._problem(point.name, str(exc))
            except (Exception, SystemExit) as exc:  # noqa: BLE001 - any failure of a pack
                self._problem(point.name, _describe(exc))

    def load_file(self, path: str | Path) -> None:
        """Load a local ``.py`` file as a pack (``--rules``), without packaging it."""
        where = Path(path)
        if where.suffix != ".py" or not where.is_file():
            raise InputError(str(path), "(file)", "an existing Python file of rules (.py)")
        stem_name = where.stem.replace("_", "-")
        if stem_name in self.blocked:
            self._blocked(stem_name)
            return
        module_name = f"firstride_local_pack_{abs(hash(str(where.resolve())))}"
        spec = importlib.util.spec_from_file_location(module_name, where)
        assert spec is not None and spec.loader is not None
        module = importlib.util.module_from_spec(spec)
        sys.modules[module_name] = module  # dataclasses and typing look modules up here
        try:
            spec.loader.exec_module(module)
        except (Exception, SystemExit) as exc:  # noqa: BLE001 - any failure of a pack
            del sys.modules[module_name]
            self._problem(stem_name, _describe(exc))
            return
        name = getattr(module, "PACK_NAME", stem_name)
        if name == BUILT_IN_PACK:
            self._problem(name, f"{where}: the name {BUILT_IN_PACK!r} belongs to the built-in pack")
            return
        if name in self.blocked:
            self._blocked(name)
            return
        version = str(getattr(module, "__version__", "") or "local")
        try:
            self.register(module, str(name), version, origin=f"file {where.as_posix()}")
        except PackRefused as exc:
            self._problem(str(name), str(exc))

    def plugin(self, name: str) -> object | None:
        """The registered pack object (module) of that name."""
        return self._pm.get_plugin(name)

    def _problem(self, pack: str, error: str) -> None:
        problem = PackProblem(pack, _one_line(error))
        self.problems.append(problem)
        if self.strict:
            raise PackError(problem)

    def _blocked(self, pack: str) -> None:
        self.problems.append(
            PackProblem(pack, f"blocked by --block-pack or {BLOCK_ENVIRONMENT}", blocked=True)
        )

    # --- one method per hook ------------------------------------------------------------------

    def rules(self) -> list[Rule]:
        """Every pack's rules, validated, sorted by id. A pack with a faulty rule is refused
        whole, with a problem naming the rule and what it lacks."""
        if self._rules is None:
            self._rules = self._collect_rules()
        return list(self._rules)

    def _collect_rules(self) -> list[Rule]:
        collected: dict[str, Rule] = {}
        # Registration order (local files, then installed packs by name): deterministic, and
        # the first pack to register an id keeps it.
        for impl in self._pm.hook.firstride_register_rules.get_hookimpls():
            pack = impl.plugin_name
            try:
                returned = impl.function()
                if not isinstance(returned, list | tuple):
                    raise TypeError(f"returned {type(returned).__name__}, not a list of rules")
                items = list(returned)
            except Exception as exc:  # noqa: BLE001 - any failure of a pack is reported
                self._problem(pack, f"firstride_register_rules failed: {_describe(exc)}")
                continue
            faults: list[str] = []
            seen: set[str] = set()
            for index, item in enumerate(items):
                if not isinstance(item, Rule):
                    faults.append(f"item {index} is a {type(item).__name__}, not a Rule")
                    continue
                lacks = rule_problems(item, pack)
                if item.id in collected or item.id in seen:
                    other = collected[item.id].pack if item.id in collected else pack
                    lacks.append(f"id already registered by pack {other}")
                seen.add(item.id)
                if lacks:
                    faults.append(f"rule {item.id!r}: {'; '.join(lacks)}")
            if faults:
                self._problem(pack, f"refused: {'; '.join(faults)}")
                continue
            version = self.packs[pack].version if pack in self.packs else ""
            for item in items:
                collected[item.id] = replace(item, pack=pack, pack_version=version)
        return [collected[key] for key in sorted(collected)]

    def pack_limits(self) -> dict[str, Limit]:
        """The default limits packs ship (``firstride_pack_limits``), each under its own name;
        the built-in pack's sit under its rule areas (``speed.``, ``wiring.``, ...)."""
        if self._limits is None:
            self._limits, digests = {}, []
            for impl in self._pm.hook.firstride_pack_limits.get_hookimpls():
                pack = impl.plugin_name
                try:
                    text = impl.function()
                    if not isinstance(text, str):
                        raise TypeError(f"returned {type(text).__name__}, not TOML text")
                    limits = parse_limits(text, f"rule pack {pack} limits")
                except Exception as exc:  # noqa: BLE001 - reported as a problem
                    self._problem(pack, f"firstride_pack_limits failed: {_describe(exc)}")
                    continue
                outside = sorted(key for key in limits if not self._owns(pack, key))
                if outside:
                    self._problem(pack, f"limit {outside[0]!r} is not under limits.{pack}")
                    continue
                self._limits.update(limits)
                digests.append(f"{pack} {hashlib.sha256(text.encode()).hexdigest()}")
            self._limits_digest = "\n".join(sorted(digests))
        return dict(self._limits)

    def _owns(self, pack: str, key: str) -> bool:
        """A pack sets limits under its own name; the built-in pack under any name that is not
        another pack's (its rule areas are unprefixed)."""
        head = key.split(".", 1)[0]
        if pack == BUILT_IN_PACK:
            return head not in self.packs or head == BUILT_IN_PACK
        return head == pack

    def complete_profile(self, profile: Profile) -> Profile:
        """The profile over the packs' default limits; the profile's own limits win.

        Every limit the profile sets must be one a pack ships, of the same kind: a misspelt
        name (``max_sped``) would otherwise leave the pack's value in force unnoticed. Limits
        of a pack that is not loaded (blocked, failed, required but absent) are let through: it
        cannot say; the review reports the missing pack. The
        fingerprint then covers the packs' limits too, so a review names what it compared
        against.
        """
        limits = self.pack_limits()
        if not limits:
            return profile
        absent = {p.pack for p in self.problems} | set(self.blocked) | set(profile.required_packs)
        for key, limit in sorted(profile.limits.items()):
            shipped = limits.get(key)
            if shipped is None:
                head = key.split(".", 1)[0]
                if head in absent or (head not in self.packs and BUILT_IN_PACK not in self.packs):
                    continue  # the pack that would own it is not here to say
                hint = suggest(key, tuple(limits))
                raise InputError(profile.path, f"limits.{key}", f"a limit a rule reads{hint}")
            if not same_kind(shipped.value, limit.value):
                raise InputError(
                    profile.path,
                    f"limits.{key}.value",
                    f"the same kind of value as the pack's {shipped.value!r}",
                )
        fingerprint = hashlib.sha256(f"{profile.fingerprint}\n{self._limits_digest}".encode())
        return replace(profile.with_pack_limits(limits), fingerprint=fingerprint.hexdigest())

    def check_extensions(self, build: Build, where: str) -> None:
        """Validate each pack's ``[extensions.<pack>]`` table against the model the pack gives
        (``firstride_build_extension``): a bad value is an input error naming the field."""
        from reviewer.error_collector import Collector
        from reviewer.extensions import validate_extension

        errors = Collector(where, "")  # every pack's table, every error, before any rule runs
        for impl in self._pm.hook.firstride_build_extension.get_hookimpls():
            pack = impl.plugin_name
            try:
                model = impl.function()
                if not (isinstance(model, type) and issubclass(model, BaseModel)):
                    raise TypeError(f"returned {model!r}, not a pydantic model class")
            except Exception as exc:  # noqa: BLE001 - reported as a problem
                self._problem(pack, f"firstride_build_extension failed: {_describe(exc)}")
                continue
            errors.attempt(validate_extension, build, pack, model, where, default=None)
        errors.raise_any()


def _describe(exc: BaseException) -> str:
    return _one_line(f"{type(exc).__name__}: {exc}")


def _one_line(text: str) -> str:
    return " ".join(text.split())


def _close(word: str, known: Iterable[str]) -> str:
    import difflib  # only for a misspelt hook: not imported on every review

    close = difflib.get_close_matches(word, list(known), n=1, cutoff=0.6)
    return f"; did you mean {close[0]!r}?" if close else f"; the hooks are {', '.join(known)}"


def blocked_from_environment() -> list[str]:
    """Pack names in ``FIRSTRIDE_BLOCK_PACKS`` (comma-separated)."""
    text = os.environ.get(BLOCK_ENVIRONMENT, "")
    return [name.strip() for name in text.split(",") if name.strip()]


def load_packs(
    files: Sequence[str | Path] = (), blocked: Iterable[str] = (), strict: bool = False
) -> PackManager:
    """Local files first (a file wins over an installed pack of the same name), then every
    installed pack; ``FIRSTRIDE_BLOCK_PACKS`` adds to ``blocked``."""
    manager = PackManager(blocked=[*blocked, *blocked_from_environment()], strict=strict)
    for path in files:
        manager.load_file(path)
    manager.load_entry_points()
    return manager


def default_manager() -> PackManager:
    return load_packs()
